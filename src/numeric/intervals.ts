/**
 * Sets of time (or any real) intervals [start, end] as sorted lists of
 * disjoint intervals: their union and intersection (common practice, no
 * source).
 */

/** A closed interval [start, end], start ≤ end. */
export type Interval = [number, number];

/** The union of any intervals, as a sorted list of disjoint intervals (touching ones merged). */
export function intervalUnion(iv: readonly Interval[]): Interval[] {
  const s = [...iv].sort((p, q) => p[0] - q[0]);
  const out: Interval[] = [];
  for (const [x, y] of s) {
    if (out.length && x <= out[out.length - 1][1]) out[out.length - 1][1] = Math.max(out[out.length - 1][1], y);
    else out.push([x, y]);
  }
  return out;
}

/** The intersection of two sorted lists of disjoint intervals (empty pieces left out). */
export function intervalIntersection(p: readonly Interval[], q: readonly Interval[]): Interval[] {
  const out: Interval[] = [];
  let i = 0;
  let j = 0;
  while (i < p.length && j < q.length) {
    const x = Math.max(p[i][0], q[j][0]);
    const y = Math.min(p[i][1], q[j][1]);
    if (y > x) out.push([x, y]);
    if (p[i][1] < q[j][1]) i++;
    else j++;
  }
  return out;
}

/**
 * The cheapest grid index at which a monotone test passes: indices
 * 0…count−1 run from the cheapest to the most demanding value, and the test
 * is assumed to pass from some index on (monotonicity is assumed, not
 * checked). From a starting guess (the forecast's answer) it gallops, with
 * steps 1, 2, 4, … away from the guess until the answer is bracketed by a
 * failing and a passing index, then bisects the bracket: about
 * 2·log2(distance from the guess) + 1 evaluations, and never more than
 * `maxEvaluations` (exponential search: Bentley & Yao 1976, Inf. Process.
 * Lett. 5, 82).
 */

export interface MonotoneSearchOutcome {
  /** Cheapest passing index found (null: no index passes, or none was found within the evaluation cap). */
  answer: number | null;
  /** Most demanding index known to fail, below the answer (-1: none evaluated / answer is index 0). */
  failing: number;
  /** Indices in evaluation order. */
  evaluated: number[];
  /** True when the cap stopped the search before the bracket closed. */
  capped: boolean;
}

export function searchCheapestPassing(count: number, start: number, passes: (index: number) => boolean, maxEvaluations = 64): MonotoneSearchOutcome {
  if (!Number.isInteger(count) || count < 1) throw new RangeError(`count must be an integer ≥ 1, got ${count}`);
  if (!Number.isInteger(maxEvaluations) || maxEvaluations < 1) throw new RangeError(`maxEvaluations must be an integer ≥ 1, got ${maxEvaluations}`);
  const s = Math.min(count - 1, Math.max(0, Math.round(Number.isFinite(start) ? start : 0)));
  const seen = new Map<number, boolean>();
  const evaluated: number[] = [];
  let capped = false;
  const test = (i: number): boolean | null => {
    const hit = seen.get(i);
    if (hit !== undefined) return hit;
    if (evaluated.length >= maxEvaluations) {
      capped = true;
      return null;
    }
    const r = passes(i);
    seen.set(i, r);
    evaluated.push(i);
    return r;
  };
  let lo = -1; // known to fail (or below the grid)
  let hi = count; // known to pass (or beyond the grid)
  const first = test(s);
  if (first === true) {
    hi = s;
    for (let step = 1; hi > 0; step *= 2) {
      const j = Math.max(0, hi - step);
      const r = test(j);
      if (r === null) break;
      if (r) hi = j;
      else {
        lo = j;
        break;
      }
    }
  } else if (first === false) {
    lo = s;
    for (let step = 1; lo < count - 1; step *= 2) {
      const j = Math.min(count - 1, lo + step);
      const r = test(j);
      if (r === null) break;
      if (r) {
        hi = j;
        break;
      }
      lo = j;
    }
  }
  while (hi < count && hi - lo > 1 && !capped) {
    const mid = (lo + hi) >> 1;
    const r = test(mid);
    if (r === null) break;
    if (r) hi = mid;
    else lo = mid;
  }
  return { answer: hi < count ? hi : null, failing: lo, evaluated, capped };
}

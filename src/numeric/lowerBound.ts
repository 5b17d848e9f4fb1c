/**
 * Bisection on a sorted array: the first index k in [a, b) with v[k] ≥ x, or
 * b if there is none (v ascending on [a, b)). Common practice, no source.
 */
export function lowerBound(v: Float64Array, a: number, b: number, x: number): number {
  while (a < b) {
    const m = (a + b) >>> 1;
    if (v[m] < x) a = m + 1;
    else b = m;
  }
  return a;
}

/**
 * Medians and quantiles of samples (kernel convention: NaN for an empty
 * sample or an out-of-range probability).
 */

/**
 * Median of the finite values of `values` (NaN if none): the middle value of
 * the ascending sort, or the mean of the two middle values for an even count
 * (the usual sample median; Hyndman & Fan 1996, Am. Stat. 50, 361, definition 7 at p = ½).
 */
export function medianOfFinite(values: ArrayLike<number>): number {
  const v = Array.from(values).filter(Number.isFinite).sort((a, b) => a - b);
  if (v.length === 0) return NaN;
  const h = v.length >> 1;
  return v.length % 2 ? v[h] : 0.5 * (v[h - 1] + v[h]);
}

/**
 * Hyndman & Fan 1996 definition-7 quantile of an ascending-sorted sample (precondition in the
 * name: not checked). NaN for an empty sample or p outside [0, 1] (kernel convention).
 */
export function quantileSortedType7(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0 || !(p >= 0 && p <= 1)) return NaN;
  const h = (n - 1) * p;
  const j = Math.floor(h);
  if (j >= n - 1) return sorted[n - 1];
  return sorted[j] + (h - j) * (sorted[j + 1] - sorted[j]);
}

/**
 * Wald–Wolfowitz runs test for serial correlation of residuals ordered by
 * epoch (Wald & Wolfowitz 1940, Ann. Math. Stat. 11, 147): with n₊ positive
 * and n₋ negative residuals (n = n₊ + n₋) and R runs of equal sign, under
 * independence
 *   E[R] = 2n₊n₋/n + 1,   Var[R] = (E[R] − 1)(E[R] − 2)/(n − 1),
 * and z = (R − E[R])/sqrt(Var[R]) is approximately standard normal. Too few
 * runs (z ≪ 0) means neighbouring epochs scatter together, as red noise or
 * slow systematics do. The normal approximation is rough below ~10 points.
 * Zero residuals are skipped. With residuals of one sign only (or none) the
 * number of runs is fixed given n₊ and n₋, so the test says nothing: z and the
 * p-value are then null.
 * The one-sided p-value is Φ(z), exact (numeric/normal.ts).
 */
import { normalCdf } from '../numeric/normal.js';

export interface RunsTest {
  runs: number;
  expectedRuns: number;
  /** null when the test cannot be made (residuals of one sign only, or all zero). */
  z: number | null;
  /** One-sided p-value Pr(Z ≤ z): small when there are too few runs; null when untestable. */
  pValueFewRuns: number | null;
}

export function runsTest(residuals: ArrayLike<number>): RunsTest {
  let nPos = 0;
  let nNeg = 0;
  let runs = 0;
  let last = 0;
  for (let i = 0; i < residuals.length; i++) {
    const r = residuals[i];
    if (!Number.isFinite(r)) throw new RangeError(`residuals[${i}] must be finite; got ${r}`);
    if (r === 0) continue;
    const s = r > 0 ? 1 : -1;
    if (s > 0) nPos++;
    else nNeg++;
    if (s !== last) runs++;
    last = s;
  }
  const n = nPos + nNeg;
  if (nPos === 0 || nNeg === 0) return { runs, expectedRuns: runs, z: null, pValueFewRuns: null };
  const mean = (2 * nPos * nNeg) / n + 1;
  const variance = ((mean - 1) * (mean - 2)) / (n - 1);
  if (!(variance > 0)) return { runs, expectedRuns: mean, z: null, pValueFewRuns: null };
  const z = (runs - mean) / Math.sqrt(variance);
  return { runs, expectedRuns: mean, z, pValueFewRuns: normalCdf(z) };
}

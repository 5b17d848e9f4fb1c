/**
 * Time-averaging ("β") factor for correlated noise in fit residuals.
 *
 * Method (Pont, Zucker & Queloz 2006, MNRAS 373, 231, §3; in the β form of
 * Winn et al. 2008, ApJ 683, 1076, §3; the exact expression below is from
 * memory, not re-checked against the papers): bin the residuals into M bins
 * of N consecutive points; for white noise the rms of the bin means is
 *   σ_N,white = (σ₁/√N)·√(M/(M − 1)),
 * with σ₁ the rms of the unbinned residuals. The factor for that bin size is
 *   β_N = σ_N,observed / σ_N,white,
 * and β is the median of β_N over bin sizes near the ingress duration (Winn
 * et al. 2008 use averaging times close to the ingress duration). Uncertainties
 * from a white-noise fit are multiplied by β. β is floored at 1 unless
 * `floorAtOne` is false (common practice, no source: correlated noise never
 * makes a measurement better than its white-noise bound).
 *
 * Residuals come in segments (one per transit window): a bin never spans two
 * segments, and the incomplete tail bin of a segment is dropped. Pooling
 * every segment's bins gives M large, so β is well determined even when
 * each transit holds only ~20 bins.
 */
import { medianOfFinite } from '../numeric/quantiles.js';

export interface BetaFactorResult {
  /** Median of β_N over the bin sizes (floored at 1 when asked). */
  beta: number;
  /** Bin sizes used, points. */
  binSizes: Int32Array;
  /** β_N for each bin size (NaN when fewer than 2 bins). */
  betaPerBin: Float64Array;
  /** Number of bins M for each bin size. */
  binCounts: Int32Array;
}

/**
 * β_N for one bin size (points) and the bin count M, pooled over segments.
 * `segmentStarts` holds the first index of each segment followed by the
 * total length (length = segments + 1, non-decreasing). Kernel: NaN when
 * fewer than 2 bins or σ₁ = 0.
 */
export function betaForBinSize(residuals: Float64Array, segmentStarts: Int32Array, binSize: number): { beta: number; bins: number } {
  let sum1 = 0;
  let n1 = 0;
  let sumN = 0;
  let bins = 0;
  for (let s = 0; s + 1 < segmentStarts.length; s++) {
    const a = segmentStarts[s];
    const b = segmentStarts[s + 1];
    for (let i = a; i < b; i++) {
      sum1 += residuals[i] * residuals[i];
      n1++;
    }
    for (let i = a; i + binSize <= b; i += binSize) {
      let m = 0;
      for (let k = 0; k < binSize; k++) m += residuals[i + k];
      m /= binSize;
      sumN += m * m;
      bins++;
    }
  }
  if (bins < 2 || n1 === 0 || !(sum1 > 0)) return { beta: NaN, bins };
  const sigma1 = Math.sqrt(sum1 / n1);
  const sigmaN = Math.sqrt(sumN / bins);
  // White expectation (σ₁/√N)·√(M/(M − 1)) (Winn et al. 2008, §3; from memory).
  const white = (sigma1 / Math.sqrt(binSize)) * Math.sqrt(bins / (bins - 1));
  return { beta: sigmaN / white, bins };
}

/**
 * Bin sizes (points) spanning averaging times from `loS` to `hiS` at the given
 * cadence: every integer from round(loS/cadence) to round(hiS/cadence), at
 * least 2, thinned to at most `maxSizes` roughly log-spaced values.
 */
export function binSizesForTimescale(loS: number, hiS: number, cadenceS: number, maxSizes = 12): Int32Array {
  if (!(cadenceS > 0) || !Number.isFinite(cadenceS)) throw new RangeError(`cadenceS must be a positive finite number, got ${cadenceS}`);
  if (!(loS > 0) || !(hiS >= loS) || !Number.isFinite(hiS)) throw new RangeError(`need 0 < loS ≤ hiS, got loS = ${loS}, hiS = ${hiS}`);
  const lo = Math.max(2, Math.round(loS / cadenceS));
  const hi = Math.max(lo, Math.round(hiS / cadenceS));
  const set = new Set<number>();
  if (hi - lo + 1 <= maxSizes) for (let k = lo; k <= hi; k++) set.add(k);
  else for (let j = 0; j < maxSizes; j++) set.add(Math.round(lo * Math.pow(hi / lo, j / (maxSizes - 1))));
  return Int32Array.from([...set].sort((a, b) => a - b));
}

/**
 * β over several bin sizes (see the file header).
 * @throws RangeError on an empty or non-integer bin size list or malformed segments.
 */
export function betaFactor(
  residuals: Float64Array,
  segmentStarts: Int32Array,
  binSizes: Int32Array,
  opts: { floorAtOne?: boolean } = {},
): BetaFactorResult {
  if (binSizes.length === 0) throw new RangeError('binSizes must not be empty');
  for (const n of binSizes) if (!(n >= 1)) throw new RangeError(`binSizes must be integers ≥ 1, got ${n}`);
  if (segmentStarts.length < 2) throw new RangeError(`segmentStarts needs at least 2 entries, got ${segmentStarts.length}`);
  for (let s = 0; s + 1 < segmentStarts.length; s++) {
    if (!(segmentStarts[s] <= segmentStarts[s + 1]) || segmentStarts[s] < 0) {
      throw new RangeError(`segmentStarts must be non-decreasing and ≥ 0, got ${segmentStarts[s]} before ${segmentStarts[s + 1]}`);
    }
  }
  if (segmentStarts[segmentStarts.length - 1] > residuals.length) {
    throw new RangeError(`segmentStarts ends at ${segmentStarts[segmentStarts.length - 1]}, beyond residuals.length ${residuals.length}`);
  }
  const betaPerBin = new Float64Array(binSizes.length);
  const binCounts = new Int32Array(binSizes.length);
  for (let j = 0; j < binSizes.length; j++) {
    const r = betaForBinSize(residuals, segmentStarts, binSizes[j]);
    betaPerBin[j] = r.beta;
    binCounts[j] = r.bins;
  }
  let beta = medianOfFinite(betaPerBin);
  if ((opts.floorAtOne ?? true) && !(beta >= 1)) beta = 1;
  return { beta, binSizes: Int32Array.from(binSizes), betaPerBin, binCounts };
}

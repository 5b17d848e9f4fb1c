/**
 * Detection thresholds calibrated on no-moon simulations, and binomial
 * confidence intervals for rates (false alarms, detection probabilities).
 *
 * Method
 * - Threshold: the empirical (1 − α) quantile of the null statistics, by one
 *   of two stated definitions:
 *   · 'type7' (default): Hyndman & Fan 1996 (Am. Stat. 50, 361) definition 7,
 *     linear interpolation between order statistics at h = (n − 1)p:
 *     Q(p) = x_(⌊h⌋+1) + (h − ⌊h⌋)(x_(⌊h⌋+2) − x_(⌊h⌋+1)) (1-based order
 *     statistics); the default of R and numpy.
 *   · 'orderStatistic' (conservative): x_(k) with k = ⌈(n + 1)(1 − α)⌉. For n
 *     exchangeable, continuous null statistics a further null statistic
 *     exceeds x_(k) with probability (n + 1 − k)/(n + 1) ≤ α exactly (the
 *     rank argument of Monte Carlo tests, e.g. Davison & Hinkley 1997,
 *     Bootstrap Methods and their Application, ch. 4). If k > n no order
 *     statistic guarantees α: the threshold is +∞ (never detect).
 *   A detection is a statistic strictly greater than the threshold.
 * - Threshold uncertainty (approximate): the calibration set estimates the
 *   exceedance fraction α from n trials; its Wilson interval [α₋, α₊] maps to
 *   the thresholds Q(1 − α₊) ≤ Q(1 − α) ≤ Q(1 − α₋).
 * - Measured false-alarm rate: the null set is split by index parity (even
 *   indices calibrate, odd indices validate; the null realizations are
 *   independent and identically distributed, so parity is an arbitrary but
 *   reproducible split), and the fraction of validation statistics above the
 *   threshold is reported with its Wilson interval, beside the requested α.
 * - Wilson 1927 (JASA 22, 209) score interval for k successes in n trials:
 *   centre (k + z²/2)/(n + z²), half-width z·sqrt(k(n − k)/n + z²/4)/(n + z²).
 * - Tail-fit thresholds (tailThresholdSorted) and their bootstrap rate in
 *   force (tailRateInForce): see their comments at the end of this file.
 */
import { quantileSortedType7 } from '../numeric/quantiles.js';
import { betaQuantile } from '../numeric/betaDistribution.js';
import { fitGpd, fitUpperTail, gpdSurvivalQuantile, tailQuantile, tailSurvival, type TailFit, type UniformSource } from '../numeric/generalizedPareto.js';

/** z for a two-sided 95 % interval, Φ⁻¹(0.975) = 1.959963984540054 (scipy.stats.norm.ppf(0.975)). */
export const Z_95 = 1.959963984540054;

/** A binomial proportion with its Wilson score interval. */
export interface ProportionInterval {
  /** k/n. */
  estimate: number;
  lower: number;
  upper: number;
}

/**
 * Wilson (1927, JASA 22, 209) score interval for k successes in n trials at normal quantile z
 * (default 1.95996…, two-sided 95 %). k may be non-integer (an expected count).
 * @throws RangeError for n ≤ 0, k outside [0, n], or z ≤ 0.
 */
export function wilsonInterval(k: number, n: number, z: number = Z_95): ProportionInterval {
  if (!(n > 0) || !Number.isFinite(n)) throw new RangeError(`n must be finite and > 0, got ${n}`);
  if (!(k >= 0 && k <= n)) throw new RangeError(`k must be in [0, n = ${n}], got ${k}`);
  if (!(z > 0) || !Number.isFinite(z)) throw new RangeError(`z must be finite and > 0, got ${z}`);
  const z2 = z * z;
  const denom = n + z2;
  const centre = (k + z2 / 2) / denom;
  const half = (z * Math.sqrt((k * (n - k)) / n + z2 / 4)) / denom;
  // Exact ends at k = 0 and k = n (the formula gives them up to rounding).
  const lower = k === 0 ? 0 : Math.max(0, centre - half);
  const upper = k === n ? 1 : Math.min(1, centre + half);
  return { estimate: k / n, lower, upper };
}

/** Hyndman & Fan 1996 definition-7 quantile of an ascending-sorted sample (numeric/quantiles.ts). */
export { quantileSortedType7 };

/**
 * Conservative order-statistic threshold x_(k), k = ⌈(n + 1)(1 − α)⌉, of an ascending-sorted
 * sample; +∞ when k > n. NaN for an empty sample or α outside (0, 1).
 */
export function orderStatisticThresholdSorted(sorted: Float64Array, alpha: number): number {
  const n = sorted.length;
  if (n === 0 || !(alpha > 0 && alpha < 1)) return NaN;
  // Guard the ceiling against rounding just above an integer, e.g. (n+1)(1−α) = 95.00000000000001.
  const k = orderStatisticRank(n, alpha);
  if (k > n) return Infinity;
  return sorted[Math.max(1, k) - 1];
}

/** The order-statistic rank k = ⌈(n + 1)(1 − α)⌉ (guarded against rounding just above an integer). */
export function orderStatisticRank(n: number, alpha: number): number {
  const kReal = (n + 1) * (1 - alpha);
  return Math.ceil(kReal - 1e-9 * kReal);
}

/** The false-alarm rate in force of a threshold and its central 95 % interval. */
export interface RateInForce {
  mean: number;
  lower: number;
  upper: number;
  /** Expected no-moon exceedances the threshold rests on, n + 1 − k. */
  exceedances: number;
}

/**
 * The false-alarm rate in force of the order-statistic threshold x_(k), k = ⌈(n + 1)(1 − α)⌉, of n
 * exchangeable continuous no-moon statistics: the exceedance probability 1 − F(x_(k)) is distributed
 * as the (n + 1 − k)-th of n uniform order statistics, Beta(n + 1 − k, k) (David & Nagaraja 2003,
 * Order Statistics, 3rd ed., §2.2, eq. 2.2.1 with U = 1 − F), mean (n + 1 − k)/(n + 1); the interval
 * holds its 2.5 % and 97.5 % quantiles. k > n (too few realizations): the threshold is +∞, rate 0.
 */
export function rateInForce(n: number, alpha: number): RateInForce {
  if (!(Number.isInteger(n) && n >= 1)) throw new RangeError(`n must be an integer ≥ 1, got ${n}`);
  if (!(alpha > 0 && alpha < 1)) throw new RangeError(`alpha must be in (0, 1), got ${alpha}`);
  const k = Math.max(1, orderStatisticRank(n, alpha));
  if (k > n) return { mean: 0, lower: 0, upper: 0, exceedances: 0 };
  const a = n + 1 - k;
  return { mean: a / (n + 1), lower: betaQuantile(0.025, a, k), upper: betaQuantile(0.975, a, k), exceedances: a };
}

/** Number of statistics strictly above the threshold (NaN statistics never count). */
export function countExceedances(stats: Float64Array, threshold: number): number {
  let k = 0;
  for (let i = 0; i < stats.length; i++) if (stats[i] > threshold) k++;
  return k;
}

export type QuantileMethod = 'type7' | 'orderStatistic';

export interface CalibrationOptions {
  /** Quantile definition (default 'type7'). */
  method?: QuantileMethod;
  /** Normal quantile for the Wilson intervals (default Z_95). */
  z?: number;
  /**
   * true (default): calibrate on even indices and measure the false-alarm rate on odd indices.
   * false: calibrate on all statistics and measure on the same set (optimistic; no validation).
   */
  holdOut?: boolean;
}

/** A calibrated threshold and its measured false-alarm rate. */
export interface ThresholdCalibration {
  threshold: number;
  /** Approximate interval of the (1 − α) quantile (see the file comment). */
  thresholdLower: number;
  thresholdUpper: number;
  /** 'tail': set by a tail fit (calibrateDetection's tail method); the other fields are the order statistic's. */
  method: QuantileMethod | 'tail';
  requestedAlpha: number;
  /** Exceedance fraction on the validation set, with its Wilson interval. */
  measuredAlpha: number;
  measuredAlphaLower: number;
  measuredAlphaUpper: number;
  calibrationCount: number;
  validationCount: number;
  validationExceedances: number;
  /** α × calibrationCount: below ~10 the quantile rests on very few null exceedances. */
  expectedCalibrationExceedances: number;
  /** true when the validation set is independent of the calibration set. */
  heldOut: boolean;
}

function thresholdOf(sorted: Float64Array, alpha: number, method: QuantileMethod): number {
  return method === 'type7' ? quantileSortedType7(sorted, 1 - alpha) : orderStatisticThresholdSorted(sorted, alpha);
}

/**
 * Calibrate a detection threshold at false-alarm rate α on null (no-moon) statistics.
 * @throws RangeError for α outside (0, 1), a NaN or infinite null statistic (a failed fit must be
 *   handled by the caller), fewer than 2 statistics (4 with holdOut), or a bad method / z.
 */
export function calibrateThreshold(
  nullStats: Float64Array,
  alpha: number,
  options: CalibrationOptions = {},
): ThresholdCalibration {
  if (!(alpha > 0 && alpha < 1)) throw new RangeError(`alpha must be in (0, 1), got ${alpha}`);
  const method = options.method ?? 'type7';
  if (method !== 'type7' && method !== 'orderStatistic') {
    throw new RangeError(`method must be 'type7' or 'orderStatistic', got ${String(method)}`);
  }
  const z = options.z ?? Z_95;
  if (!(z > 0) || !Number.isFinite(z)) throw new RangeError(`z must be finite and > 0, got ${z}`);
  const holdOut = options.holdOut ?? true;
  const n = nullStats.length;
  if (n < (holdOut ? 4 : 2)) {
    throw new RangeError(`nullStats must hold at least ${holdOut ? 4 : 2} statistics, got ${n}`);
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(nullStats[i])) throw new RangeError(`nullStats[${i}] must be finite, got ${nullStats[i]}`);
  }
  let calibration: Float64Array;
  let validation: Float64Array;
  if (holdOut) {
    calibration = new Float64Array(Math.ceil(n / 2));
    validation = new Float64Array(Math.floor(n / 2));
    for (let i = 0; i < n; i++) {
      if ((i & 1) === 0) calibration[i >> 1] = nullStats[i];
      else validation[i >> 1] = nullStats[i];
    }
  } else {
    calibration = Float64Array.from(nullStats);
    validation = calibration;
  }
  calibration.sort();
  const nc = calibration.length;
  const threshold = thresholdOf(calibration, alpha, method);
  const band = wilsonInterval(alpha * nc, nc, z);
  const thresholdLower = band.upper < 1 ? thresholdOf(calibration, band.upper, method) : calibration[0];
  const thresholdUpper = band.lower > 0 ? thresholdOf(calibration, band.lower, method) : Infinity;
  const k = countExceedances(validation, threshold);
  const measured = wilsonInterval(k, validation.length, z);
  return {
    threshold,
    thresholdLower: Math.min(thresholdLower, threshold),
    thresholdUpper: Math.max(thresholdUpper, threshold),
    method,
    requestedAlpha: alpha,
    measuredAlpha: measured.estimate,
    measuredAlphaLower: measured.lower,
    measuredAlphaUpper: measured.upper,
    calibrationCount: nc,
    validationCount: validation.length,
    validationExceedances: k,
    expectedCalibrationExceedances: alpha * nc,
    heldOut: holdOut,
  };
}

/**
 * Tail-fit threshold (issue 17, item 3; measured in bench/tailFit.ts): the value exceeded with
 * probability α under a generalised Pareto fit of the null statistics' upper tail (Knijnenburg et al.
 * 2009, Bioinformatics 25, i161; numeric/generalizedPareto.ts: PWM fit, Hosking & Wallis 1987, exceedance
 * count from min(250, n/2) down by 10 until the Anderson–Darling bootstrap check passes at 5 %). Used
 * only where the tail holds at least 2αn values (TAIL_MARGIN), so that the fit interpolates or
 * extrapolates from enough exceedances; otherwise (and if no fit is possible) the order statistic.
 */
export const TAIL_MARGIN = 2;

export interface TailThreshold {
  threshold: number;
  /** The fit, or null when the order statistic was used. */
  fit: TailFit | null;
}

/** Tail-fit threshold of an ascending-sorted sample at α (see TAIL_MARGIN); `rng` drives the fit's check. */
export function tailThresholdSorted(sorted: Float64Array, alpha: number, rng: UniformSource): TailThreshold {
  const n = sorted.length;
  if (n < 40 || !(alpha > 0 && alpha < 1)) return { threshold: orderStatisticThresholdSorted(sorted, alpha), fit: null };
  let fit: TailFit;
  try {
    fit = fitUpperTail(sorted, { rng });
  } catch {
    return { threshold: orderStatisticThresholdSorted(sorted, alpha), fit: null };
  }
  if (fit.exceedances < TAIL_MARGIN * alpha * n) return { threshold: orderStatisticThresholdSorted(sorted, alpha), fit: null };
  const t = tailQuantile(fit, alpha);
  return Number.isFinite(t) ? { threshold: t, fit } : { threshold: orderStatisticThresholdSorted(sorted, alpha), fit: null };
}

/** P(X > x) of a fitted tail above its threshold, else the sample's fraction above x (ascending `sorted`). */
export function tailOrEmpiricalSurvival(sorted: Float64Array, fit: TailFit, x: number): number {
  if (x >= fit.threshold) return tailSurvival(fit, x);
  return countAboveSorted(sorted, x) / sorted.length;
}

/** Values of an ascending-sorted sample strictly above x. */
function countAboveSorted(sorted: Float64Array, x: number): number {
  let a = 0;
  let b = sorted.length;
  while (a < b) {
    const m = (a + b) >>> 1;
    if (sorted[m] <= x) a = m + 1;
    else b = m;
  }
  return sorted.length - a;
}

/**
 * The false-alarm rate in force of a tail-fit threshold, by bootstrap (Efron & Tibshirani 1993, An
 * Introduction to the Bootstrap, ch. 13, percentile interval): `replicates` resamples of the n values with
 * replacement; in each, the values above the fit's threshold u (their count varies, which carries the
 * uncertainty of the tail fraction) are refitted by the same estimator, giving a threshold t*; taking the
 * original fit as the truth, each has rate S(t*) (tail survival above u, the sample's fraction below).
 * Mean and central 95 % interval of those rates. Approximate: it holds the spread of the threshold given
 * the fitted tail, not the error of the GPD model itself (bench/tailFit.ts measures both).
 */
export function tailRateInForce(sorted: Float64Array, alpha: number, fit: TailFit, replicates: number, rng: UniformSource): RateInForce {
  const n = sorted.length;
  const rates = new Float64Array(replicates);
  const sample = new Float64Array(n);
  const excess = new Float64Array(n);
  for (let b = 0; b < replicates; b++) {
    let m = 0;
    for (let i = 0; i < n; i++) {
      const v = sorted[Math.min(n - 1, Math.floor(rng.uniform() * n))];
      sample[i] = v;
      if (v > fit.threshold) excess[m++] = v - fit.threshold;
    }
    let t = NaN;
    if (m >= 3 && alpha * n <= m) {
      try {
        const f = fitGpd(excess.subarray(0, m), fit.estimator);
        t = fit.threshold + gpdSurvivalQuantile((alpha * n) / m, f.shape, f.scale);
      } catch {
        t = NaN; // all excesses equal: the order statistic below
      }
    }
    if (!Number.isFinite(t)) t = orderStatisticThresholdSorted(sample.sort(), alpha);
    rates[b] = tailOrEmpiricalSurvival(sorted, fit, t);
  }
  rates.sort();
  let mean = 0;
  for (let b = 0; b < replicates; b++) mean += rates[b];
  mean /= replicates;
  return { mean, lower: quantileSortedType7(rates, 0.025), upper: quantileSortedType7(rates, 0.975), exceedances: alpha * n };
}

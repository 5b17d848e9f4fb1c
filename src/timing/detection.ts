/**
 * The detection decision for one simulated realization.
 *
 * Four channels, each a scalar statistic where larger means more moon-like
 * (`ttv` = −log10 p of the TTV χ², `tdv` = −log10 p of the TDV χ², `dip` =
 * stacked moon-dip SNR, `template` = the photodynamical template bank's
 * matched-filter maximum, templateSearch.ts); the decision does not care
 * which, as long as the thresholds were calibrated on the same statistic from
 * no-moon simulations of the same scenario.
 *
 * - Per channel: detected when the statistic is strictly above that
 *   channel's threshold, the order statistic x_(k), k = ⌈(n + 1)(1 − α)⌉, of
 *   all n no-moon statistics (falseAlarmCalibration.ts).
 * - Combined: the minimum of the channels' (weighted) empirical p-values,
 *   calibrated directly on the same no-moon set (a Monte Carlo test of the
 *   min-p statistic: Westfall & Young 1993, Resampling-Based Multiple
 *   Testing, §2.6 "minP"; the rank argument of Monte Carlo tests, Davison &
 *   Hinkley 1997, Bootstrap Methods and their Application, ch. 4, eq. 4.11
 *   for p̂). Per channel c, with N the no-moon statistics it is compared to
 *   (n; for a no-moon realization itself the other n − 1, so that it is
 *   scored as a new realization would be) and B_c those strictly below it,
 *   p̂_c = (N − B_c + 1)/(N + 1); the statistic is M = max_c w_c/p̂_c, i.e.
 *   min_c p̂_c/w_c (weighted p-values: Genovese, Roeder & Wasserman 2006,
 *   Biometrika 93, 509; equal weights by default), ties broken by
 *   1e-9·Σ_c w_c B_c/N (a secondary statistic; the order stays a valid test
 *   statistic). The threshold is the order statistic x_(k) of the n no-moon
 *   M, so the combined false-alarm rate is α (up to the discreteness of k)
 *   whatever the correlation between channels; it replaces the Bonferroni
 *   union at α/m, which was conservative when channels correlate and could
 *   make "combined" weaker than one channel alone. When all channels carry
 *   the same information the combined rule equals each channel's.
 * - A channel whose statistic is NaN (not measured, or its fit failed) or
 *   whose calibration is absent is not detected and scores u = 0.
 * - Tail method (calibrateDetection's option, the sweep's default): each
 *   channel's threshold is the α point of a generalised Pareto fit of its
 *   no-moon upper tail (Knijnenburg et al. 2009, Bioinformatics 25, i161;
 *   falseAlarmCalibration.ts), p̂_c above the fit's threshold is the fitted
 *   tail's survival (the empirical p̂_c below), and the combined threshold is
 *   the α point of the fitted tail of the no-moon ln M; where a tail is too
 *   short for α, the order statistic as above. Its rate in force is a
 *   bootstrap (tailRateInForce), not the Beta distribution.
 */
import {
  calibrateThreshold,
  orderStatisticThresholdSorted,
  rateInForce,
  tailRateInForce,
  tailThresholdSorted,
  type RateInForce,
  type ThresholdCalibration,
} from './falseAlarmCalibration.js';
import { lowerBound } from '../numeric/lowerBound.js';
import { tailSurvival, type TailFit, type UniformSource } from '../numeric/generalizedPareto.js';

export const DETECTION_CHANNELS = ['ttv', 'tdv', 'dip', 'template'] as const;
export type DetectionChannel = (typeof DETECTION_CHANNELS)[number];

/** Per-channel statistics of one realization (NaN = not available). */
export type DetectionStatistics = Record<DetectionChannel, number>;

/** Thresholds: `single` at α per channel (absent = channel unused) and the combined min-p rule. */
export interface DetectionThresholds {
  single: Partial<Record<DetectionChannel, number>>;
  combined: {
    /** The no-moon statistics of each used channel, ascending. */
    sorted: Partial<Record<DetectionChannel, Float64Array>>;
    /** Threshold on M (see the file comment). */
    threshold: number;
    /** Tail method: each channel's tail fit, whose survival gives p̂_c above its threshold. */
    tails?: Partial<Record<DetectionChannel, TailFit>>;
    /** Channel weights, summing to 1 over the used channels. */
    weights: ChannelWeights;
  };
}

export interface DetectionDecision {
  ttv: boolean;
  tdv: boolean;
  dip: boolean;
  template: boolean;
  combined: boolean;
}

const TIE_BREAK = 1e-9;

/** Channel weights of the combined rule (relative; normalised to sum 1 over the channels used). */
export type ChannelWeights = Partial<Record<DetectionChannel, number>>;

/** M of statistics against sorted null sets (see the file comment); weights sum to 1 over the used channels. */
function minPScore(stats: DetectionStatistics, sorted: Partial<Record<DetectionChannel, Float64Array>>, weights: ChannelWeights, leaveOneOut: boolean, tails?: Partial<Record<DetectionChannel, TailFit>>): number {
  let max = 0;
  let sum = 0;
  for (const ch of DETECTION_CHANNELS) {
    const s = sorted[ch];
    if (s === undefined) continue;
    const w = weights[ch] ?? 0;
    const v = stats[ch];
    const n = s.length;
    const N = leaveOneOut ? n - 1 : n;
    const below = Number.isNaN(v) ? 0 : Math.min(N, lowerBound(s, 0, n, v));
    const tail = tails?.[ch];
    // Tail method: above the channel's tail threshold p̂_c is the fitted tail's survival (Knijnenburg et al. 2009).
    const score = tail !== undefined && v >= tail.threshold ? w / Math.max(tailSurvival(tail, v), 1e-300) : (w * (N + 1)) / (N - below + 1);
    if (score > max) max = score;
    sum += (w * below) / Math.max(1, N);
  }
  return max + TIE_BREAK * sum;
}

/** Decide detection per channel and combined (see the file comment). Pure; never throws on NaN. */
export function decideDetection(stats: DetectionStatistics, thresholds: DetectionThresholds): DetectionDecision {
  const over = (value: number, threshold: number | undefined): boolean =>
    threshold !== undefined && !Number.isNaN(threshold) && value > threshold;
  return {
    ttv: over(stats.ttv, thresholds.single.ttv),
    tdv: over(stats.tdv, thresholds.single.tdv),
    dip: over(stats.dip, thresholds.single.dip),
    template: over(stats.template, thresholds.single.template),
    combined: minPScore(stats, thresholds.combined.sorted, thresholds.combined.weights, false, thresholds.combined.tails) > thresholds.combined.threshold,
  };
}

/** Null statistics per channel, aligned by realization index (same length); omit a channel to leave it unused. */
export type NullStatistics = Partial<Record<DetectionChannel, Float64Array>>;

/** How calibrateDetection sets its thresholds. */
export interface DetectionCalibrationOptions {
  /**
   * 'orderStatistic' (default): the order statistic x_(k) (distribution-free, Beta rate in force).
   * 'tail': a generalised Pareto fit of each channel's upper tail and of ln M (falseAlarmCalibration.ts,
   * tailThresholdSorted), falling back to the order statistic where the tail is too short or no fit
   * is possible; the rate in force of the combined rule is then a bootstrap (tailRateInForce).
   */
  method?: 'orderStatistic' | 'tail';
  /** Uniform deviates for the tail method's fit checks and bootstrap (required with 'tail'). */
  rng?: UniformSource;
  /** Bootstrap replicates of the tail method's rate in force (default 200). */
  replicates?: number;
}

export interface DetectionCalibration {
  /** How the combined rule's threshold was set ('tail' only when its fit was used). */
  method: 'orderStatistic' | 'tail';
  thresholds: DetectionThresholds;
  /** Calibration details per used channel, at α. */
  single: Partial<Record<DetectionChannel, ThresholdCalibration>>;
  /** Channels used. */
  channels: DetectionChannel[];
  requestedAlpha: number;
  /** No-moon realizations the thresholds rest on (all of them). */
  calibrationCount: number;
  /**
   * Exceedance probability of the combined rule's threshold in force. Order statistic (every threshold
   * is the same order statistic of n no-moon values): its mean (n + 1 − k)/(n + 1) and central 95 %
   * interval of Beta(n + 1 − k, k). Tail method: the bootstrap mean and percentile interval of
   * tailRateInForce.
   */
  falseAlarmInForce: number;
  falseAlarmInForceLower: number;
  falseAlarmInForceUpper: number;
  /** Fraction of the no-moon realizations (each scored against the others) where the combined rule fires. */
  measuredCombinedAlpha: number;
}

/**
 * Calibrate single-channel thresholds (α each) and the combined min-p rule (α) on all the null
 * statistics (distribution-free order statistic; with too few realizations for it, k > n, the
 * threshold is +∞ and nothing is detected).
 * @throws RangeError if no channel is given, arrays differ in length, or calibrateThreshold throws.
 */
export function calibrateDetection(nullStats: NullStatistics, alpha: number, weights: ChannelWeights = {}, options: DetectionCalibrationOptions = {}): DetectionCalibration {
  const method = options.method ?? 'orderStatistic';
  if (method !== 'orderStatistic' && method !== 'tail') throw new RangeError(`method must be 'orderStatistic' or 'tail', got ${String(method)}`);
  if (method === 'tail' && options.rng === undefined) throw new RangeError('the tail method needs options.rng (its fit check and interval are bootstraps)');
  const channels = DETECTION_CHANNELS.filter((ch) => nullStats[ch] !== undefined);
  if (channels.length === 0) throw new RangeError('nullStats must hold at least one channel (ttv, tdv, dip or template)');
  const n = nullStats[channels[0]]!.length;
  for (const ch of channels) {
    const len = nullStats[ch]!.length;
    if (len !== n) throw new RangeError(`nullStats.${ch} must have length ${n} like nullStats.${channels[0]}, got ${len}`);
  }
  const single: DetectionCalibration['single'] = {};
  // Weights: given ones (≥ 0, missing = 1), normalised over the used channels.
  let wSum = 0;
  for (const ch of channels) {
    const w = weights[ch] ?? 1;
    if (!(w >= 0) || !Number.isFinite(w)) throw new RangeError(`weights.${ch} must be a finite number ≥ 0, got ${w}`);
    wSum += w;
  }
  if (!(wSum > 0)) throw new RangeError('weights must not all be 0 over the channels used');
  const norm: ChannelWeights = {};
  for (const ch of channels) norm[ch] = (weights[ch] ?? 1) / wSum;
  const thresholds: DetectionThresholds = { single: {}, combined: { sorted: {}, threshold: Infinity, weights: norm } };
  const tails: Partial<Record<DetectionChannel, TailFit>> = {};
  for (const ch of channels) {
    single[ch] = calibrateThreshold(nullStats[ch]!, alpha, { method: 'orderStatistic', holdOut: false });
    thresholds.single[ch] = single[ch]!.threshold;
    thresholds.combined.sorted[ch] = Float64Array.from(nullStats[ch]!).sort();
    if (method === 'tail') {
      const t = tailThresholdSorted(thresholds.combined.sorted[ch]!, alpha, options.rng!);
      if (t.fit !== null) {
        tails[ch] = t.fit;
        const c = single[ch]!;
        let above = 0;
        for (let i = 0; i < n; i++) if (nullStats[ch]![i] > t.threshold) above++;
        single[ch] = { ...c, threshold: t.threshold, method: 'tail', thresholdLower: Math.min(c.thresholdLower, t.threshold), thresholdUpper: Math.max(c.thresholdUpper, t.threshold), measuredAlpha: above / n, validationExceedances: above };
        thresholds.single[ch] = t.threshold;
      }
    }
  }
  if (method === 'tail') thresholds.combined.tails = tails;
  // M of every no-moon realization, scored against the other n − 1 (tail method: against the fits, which hold it).
  const scores = new Float64Array(n);
  const row = { ttv: NaN, tdv: NaN, dip: NaN, template: NaN } as DetectionStatistics;
  for (let i = 0; i < n; i++) {
    for (const ch of channels) row[ch] = nullStats[ch]![i];
    scores[i] = minPScore(row, thresholds.combined.sorted, norm, true, thresholds.combined.tails);
  }
  const sortedScores = Float64Array.from(scores).sort();
  thresholds.combined.threshold = orderStatisticThresholdSorted(sortedScores, alpha);
  let inForce: RateInForce = rateInForce(n, alpha);
  let combinedMethod: 'orderStatistic' | 'tail' = 'orderStatistic';
  if (method === 'tail') {
    // ln M: M ~ w/p has a Pareto-like tail (ξ ≈ 1), ln M an exponential-like one, which the fit handles well.
    const logScores = new Float64Array(n);
    for (let i = 0; i < n; i++) logScores[i] = Math.log(sortedScores[i]);
    const t = tailThresholdSorted(logScores, alpha, options.rng!);
    if (t.fit !== null) {
      thresholds.combined.threshold = Math.exp(t.threshold);
      inForce = tailRateInForce(logScores, alpha, t.fit, options.replicates ?? 200, options.rng!);
      combinedMethod = 'tail';
    }
  }
  let fired = 0;
  for (let i = 0; i < n; i++) if (scores[i] > thresholds.combined.threshold) fired++;
  return {
    method: combinedMethod,
    thresholds,
    single,
    channels: [...channels],
    requestedAlpha: alpha,
    calibrationCount: n,
    falseAlarmInForce: inForce.mean,
    falseAlarmInForceLower: inForce.lower,
    falseAlarmInForceUpper: inForce.upper,
    measuredCombinedAlpha: fired / n,
  };
}

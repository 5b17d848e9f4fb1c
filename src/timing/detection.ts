/**
 * The detection decision for one simulated realization.
 *
 * Three channels, each a scalar statistic where larger means more
 * moon-like (suggested: `ttv` = TTV χ² excess or periodogram peak power,
 * `tdv` = TDV χ² excess, `dip` = stacked moon-dip SNR; the decision does not
 * care which, as long as the thresholds were calibrated on the same
 * statistic from no-moon simulations of the same scenario).
 *
 * - Per channel: detected when the statistic is strictly above that
 *   channel's threshold calibrated at false-alarm rate α.
 * - Combined: detected when **any** used channel is above its threshold
 *   calibrated at α/m, m the number of channels used (Bonferroni 1936, Pubbl.
 *   R. Ist. Sup. Sci. Econ. Commer. Firenze 8, 3; the union bound
 *   Pr(any null exceedance) ≤ Σ α/m = α). This holds whatever the correlation
 *   between channels and is conservative when they are correlated; the
 *   measured combined false-alarm rate on the validation half is reported so
 *   the conservatism can be seen. (We chose Bonferroni over a calibrated max
 *   statistic because it needs no joint standardisation of the channels.)
 * - A channel whose statistic is NaN (not measured, or its fit failed) or
 *   whose threshold is absent is not detected; a NaN statistic is never
 *   counted as a detection.
 */
import {
  calibrateThreshold,
  wilsonInterval,
  Z_95,
  type CalibrationOptions,
  type ThresholdCalibration,
} from './falseAlarmCalibration.js';

export const DETECTION_CHANNELS = ['ttv', 'tdv', 'dip'] as const;
export type DetectionChannel = (typeof DETECTION_CHANNELS)[number];

/** Per-channel statistics of one realization (NaN = not available). */
export type DetectionStatistics = Record<DetectionChannel, number>;

/** Thresholds: `single` at α per channel, `combined` at α/m per channel; absent = channel unused. */
export interface DetectionThresholds {
  single: Partial<Record<DetectionChannel, number>>;
  combined: Partial<Record<DetectionChannel, number>>;
}

export interface DetectionDecision {
  ttv: boolean;
  tdv: boolean;
  dip: boolean;
  combined: boolean;
}

/** Decide detection per channel and combined (see the file comment). Pure; never throws on NaN. */
export function decideDetection(stats: DetectionStatistics, thresholds: DetectionThresholds): DetectionDecision {
  const over = (value: number, threshold: number | undefined): boolean =>
    threshold !== undefined && !Number.isNaN(threshold) && value > threshold;
  let combined = false;
  for (const ch of DETECTION_CHANNELS) {
    if (over(stats[ch], thresholds.combined[ch])) combined = true;
  }
  return {
    ttv: over(stats.ttv, thresholds.single.ttv),
    tdv: over(stats.tdv, thresholds.single.tdv),
    dip: over(stats.dip, thresholds.single.dip),
    combined,
  };
}

/** Null statistics per channel, aligned by realization index (same length); omit a channel to leave it unused. */
export type NullStatistics = Partial<Record<DetectionChannel, Float64Array>>;

export interface DetectionCalibration {
  thresholds: DetectionThresholds;
  /** Calibration details per used channel, at α (single) and α/m (combined). */
  single: Partial<Record<DetectionChannel, ThresholdCalibration>>;
  combined: Partial<Record<DetectionChannel, ThresholdCalibration>>;
  /** Channels used (m = channels.length). */
  channels: DetectionChannel[];
  requestedAlpha: number;
  /** Fraction of validation realizations where the combined rule fires, with its Wilson interval. */
  measuredCombinedAlpha: number;
  measuredCombinedAlphaLower: number;
  measuredCombinedAlphaUpper: number;
}

/**
 * Calibrate single-channel (α) and Bonferroni combined (α/m) thresholds on null statistics,
 * and measure the combined rule's false-alarm rate on the validation half (odd indices, or the
 * whole set when options.holdOut is false).
 * @throws RangeError if no channel is given, arrays differ in length, or calibrateThreshold throws.
 */
export function calibrateDetection(
  nullStats: NullStatistics,
  alpha: number,
  options: CalibrationOptions = {},
): DetectionCalibration {
  const channels = DETECTION_CHANNELS.filter((ch) => nullStats[ch] !== undefined);
  if (channels.length === 0) throw new RangeError('nullStats must hold at least one channel (ttv, tdv or dip)');
  const n = nullStats[channels[0]]!.length;
  for (const ch of channels) {
    const len = nullStats[ch]!.length;
    if (len !== n) throw new RangeError(`nullStats.${ch} must have length ${n} like nullStats.${channels[0]}, got ${len}`);
  }
  const m = channels.length;
  const thresholds: DetectionThresholds = { single: {}, combined: {} };
  const single: DetectionCalibration['single'] = {};
  const combined: DetectionCalibration['combined'] = {};
  for (const ch of channels) {
    single[ch] = calibrateThreshold(nullStats[ch]!, alpha, options);
    combined[ch] = calibrateThreshold(nullStats[ch]!, alpha / m, options);
    thresholds.single[ch] = single[ch]!.threshold;
    thresholds.combined[ch] = combined[ch]!.threshold;
  }
  // Combined rule on the validation realizations (same parity split as calibrateThreshold).
  const holdOut = options.holdOut ?? true;
  let fired = 0;
  let count = 0;
  for (let i = holdOut ? 1 : 0; i < n; i += holdOut ? 2 : 1) {
    count++;
    for (const ch of channels) {
      if (nullStats[ch]![i] > thresholds.combined[ch]!) {
        fired++;
        break;
      }
    }
  }
  const measured = wilsonInterval(fired, count, options.z ?? Z_95);
  return {
    thresholds,
    single,
    combined,
    channels: [...channels],
    requestedAlpha: alpha,
    measuredCombinedAlpha: measured.estimate,
    measuredCombinedAlphaLower: measured.lower,
    measuredCombinedAlphaUpper: measured.upper,
  };
}

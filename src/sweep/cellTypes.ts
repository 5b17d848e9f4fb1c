/**
 * The contract between the sweep engine and the per-cell computation.
 * The engine owns the grid, dispatch, seeding keys, checkpoints and outputs;
 * a `CellRunner` turns one cell of the grid into one JSON-serialisable result.
 */
import type { Scenario } from '../scenario/types.js';
import type { NullSet } from './nullSet.js';

/** One cell of the grid, as handed to a runner. */
export interface CellTask {
  /** Row-major cell index over the sweep axes (last axis fastest). */
  index: number;
  /** The cell's value on each axis, SI (the axis `unit`). */
  coords: number[];
  /** The cell's scenario: the sweep's scenario with this cell's axis values applied and validated (`applyAxes`, `CELL_PARSE`). */
  scenario: Scenario;
}

/** The detection probabilities of one channel (or the combined rule) in a simulated cell. */
type ChannelProbabilities<C extends string> = {
  [K in `pdet_${C}` | `pdet_${C}_lo` | `pdet_${C}_hi`]: number | null;
};

/**
 * One cell's result, as `runCell` writes it (cells.json, one line per cell;
 * names in docs/vocabulary.md, schema schemas/cells.schema.json). The engine
 * rewrites `index` and `coords` from the task and passes the result through
 * JSON once, so NaN and ±Infinity become null everywhere (in memory,
 * checkpoint and output alike): every number may be null. The fields after
 * `skipped_reason` are present only in a simulated cell (`simulated: true`).
 */
export interface CellResult extends Partial<ChannelProbabilities<'ttv' | 'tdv' | 'dip' | 'template' | 'combined'>> {
  /** Row-major cell index over the sweep axes. */
  index: number;
  /** The cell's value on each axis, SI. */
  coords: number[];
  /** Where the moon can orbit: "stable", or the reasons it cannot joined with "; " (computeLimits' moon_placement), "no moon" without one. */
  placement: string;
  /** Whether the moon is physically allowed (placement exactly "stable": Roche, stability and tidal survival). */
  allowed: boolean;
  /** Energy-budget verdict of the moon ("too hot", "temperate", "too cold"), null without a moon. */
  habitability: string | null;
  /** The energy term that dominates the moon's budget, null without a moon. */
  habitability_dominant: string | null;
  /** Moon mass, kg (null without a moon). */
  moon_mass_kg: number | null;
  /** Planet–moon semi-major axis, m (null without a moon). */
  moon_separation_m: number | null;
  /** The separation in Hill radii of the planet (null without a moon). */
  moon_separation_hill: number | null;
  /** Analytic rms of the barycentric TTV, s. */
  ttv_rms_s: number | null;
  /** Analytic rms of the TDV, s. */
  tdv_rms_s: number | null;
  /** Depth of the moon's own transit, a fraction of the stellar flux. */
  moon_depth: number | null;
  /** Per-transit mid-time precision, s (Carter et al. 2008). */
  timing_precision_s: number | null;
  /** Per-transit duration precision, s (Carter et al. 2008). */
  duration_precision_s: number | null;
  /** Analytic detection probability of the TTV channel (noncentral χ², white noise). */
  pdet_forecast_ttv: number | null;
  /** Analytic detection probability of the TDV channel. */
  pdet_forecast_tdv: number | null;
  /** Analytic detection probability of the joint TTV + TDV test. */
  pdet_forecast_joint: number | null;
  /** Analytic forecast of the Monte Carlo's combined rule, averaged over the drawn moon angles (detectionForecast.ts). */
  pdet_forecast_combined: number | null;
  /** Known-template bound: the detection probability no analysis of this light curve can beat (knownTemplateBound.ts); null without a modelled orbit or noise. */
  pdet_bound: number | null;
  /** Whether the forecast's assumptions hold for this moon (photocentric ratio below its limit), null without a moon. */
  forecast_regime_ok: boolean | null;
  /** Which channels the planned transit count leaves out and why, null without a moon ('' when none). */
  channels_note: string | null;
  /** (R_S/R_P)² / (M_S/M_P): the moon's photocentric TTV relative to the barycentric one (Szabó et al. 2006). */
  photocentric_ratio: number | null;
  /** Total energy flux on the moon, W/m² (null without a moon). */
  energy_total_w_m2: number | null;
  /** Whether the cell was simulated (Monte Carlo). */
  simulated: boolean;
  /** Why not, when it was not ("no moon in the scenario", "forecast only", "not simulated: <placement>"). */
  skipped_reason?: string;
  /** Moon realizations simulated. */
  realizations?: number;
  /** No-moon realizations that calibrated the thresholds. */
  no_moon_realizations?: number;
  /** The channels combined by the weighted min-p rule, space-separated ("ttv tdv dip template"). */
  channels_used?: string;
  /** Realizations in which every transit was lost (gaps, missed transits). */
  no_transit_observed?: number;
  /** Whether the TTV forecast lies outside the Monte Carlo TTV Wilson interval (where the forecast applies). */
  forecast_ttv_outside_interval?: boolean;
  /** Median over the realizations of the fitted TTV rms, s. */
  median_fitted_ttv_rms_s?: number | null;
  /** Median over the realizations of the fitted TDV rms, s. */
  median_fitted_tdv_rms_s?: number | null;
  /** Median over the realizations of the stacked moon-dip depth (a fraction). */
  median_dip_depth?: number | null;
  /** Median over the realizations of the transits fitted. */
  median_transits_fitted?: number | null;
  /** The requested false-alarm probability per channel. */
  false_alarm?: number;
  /** Whether the no-moon set gives fewer expected exceedances at α than the method needs ((n + 1)·α < 25, order statistic; < 15, tail fit: nullSet.ts). */
  calibration_limited?: boolean;
  /** Fraction of the no-moon realizations the combined rule flags (in-sample: they set its threshold). */
  false_alarm_measured_combined?: number | null;
  /**
   * Mean of the combined rule's false-alarm rate in force: order statistic, Beta(n + 1 − k, k) over the
   * calibration draw (David & Nagaraja 2003); tail fit, the bootstrap mean (timing/falseAlarmCalibration.ts).
   */
  false_alarm_in_force?: number | null;
  /** 2.5 % point of that distribution. */
  false_alarm_in_force_lo?: number | null;
  /** 97.5 % point of that distribution. */
  false_alarm_in_force_hi?: number | null;
  /** How the combined rule's threshold was set: 'tail' (generalised Pareto tail fit) or 'order_statistic' (also the tail method's fallback). */
  calibration_method?: 'tail' | 'order_statistic' | null;
  /** Templates in the cell's photodynamical bank (phases × orientations). */
  template_bank_size?: number;
  /** Calibrated threshold of the template statistic (phase-marginalised likelihood ratio). */
  threshold_template?: number | null;
  /** Fraction of no-moon realizations the template channel alone flags. */
  false_alarm_measured_template?: number | null;
  /** Calibrated threshold of the TTV statistic (−log10 p), null when the channel does not exist. */
  threshold_ttv?: number | null;
  /** Calibrated threshold of the TDV statistic (−log10 p), null when the channel does not exist. */
  threshold_tdv?: number | null;
  /** Calibrated threshold of the moon-dip SNR. */
  threshold_dip?: number | null;
  /** Measured false-alarm rate of the TTV channel alone. */
  false_alarm_measured_ttv?: number | null;
  /** Measured false-alarm rate of the TDV channel alone. */
  false_alarm_measured_tdv?: number | null;
  /** Measured false-alarm rate of the moon-dip channel alone. */
  false_alarm_measured_dip?: number | null;
}

/** What every cell of a sweep shares. */
export interface CellContext {
  /** The scenario seed; realization r of cell i draws from createRng(seed, i, r). */
  seed: number;
  realizations: number;
  simulateUnstable: boolean;
  forecastOnly: boolean;
  /** No-moon calibration realizations per cell (default: `defaultNullRealizations` of the cell's α and R). */
  nullRealizations?: number;
}

/**
 * What the engine may hand a runner besides the task: null sets computed once
 * for the whole sweep (the calibration pre-pass), keyed by `NullClass.key`.
 * A runner that finds no set for its class computes one itself.
 */
export interface CellShared {
  nullSets?: ReadonlyMap<string, NullSet>;
  /** Called when `nullSets` was given but lacks the cell's class (the runner then computes it). */
  onNullMiss?: (key: string) => void;
}

export type CellRunner = (task: CellTask, ctx: CellContext, shared?: CellShared) => CellResult;

/**
 * TTV and TDV series from per-transit fits, and `recoverTimings`, the whole
 * recovery of one observation: global shape fit → per-transit fits (with β)
 * → linear ephemeris → TTV_n = t_c,n − (T0 + nP) and TDV_n = D_n − ⟨D⟩.
 *
 * Errors: a TTV carries its mid-time's measurement error (`errS`); the
 * ephemeris' own uncertainty at that epoch (from the covariance of T0 and P,
 * linearEphemeris.ts) is given separately (`ephemerisErrS`), because it is
 * common to all points and is absorbed by any detection statistic that fits
 * its own line. ⟨D⟩ is the inverse-variance weighted mean duration; a TDV
 * carries its duration's error, and ⟨D⟩'s error is returned once.
 */
import type { Scenario } from '../scenario/types.js';
import type { Observation } from '../noise/observe.js';
import { globalTransitFit, type GlobalFitWorkspace, type GlobalTransitFit } from './globalTransitFit.js';
import { scenarioDurations } from '../photometry/transitWindows.js';
import { fitTransits, type PerTransitFitResult, type TransitFit } from './perTransitFit.js';
import { ephemerisTime, fitLinearEphemeris, type LinearEphemeris } from './linearEphemeris.js';
import { templateGeometryFromScenario } from './transitTemplate.js';
import type { BetaFactorResult } from './betaFactor.js';

export interface TtvPoint {
  epoch: number;
  /** t_c − (T0 + nP), s. */
  ttvS: number;
  /** Measurement error of t_c, s. */
  errS: number;
  /** 1σ of the ephemeris prediction at this epoch, s. */
  ephemerisErrS: number;
}

export interface TdvPoint {
  epoch: number;
  /** D − ⟨D⟩, s. */
  tdvS: number;
  errS: number;
}

export interface TdvSeries {
  /** Weighted mean duration ⟨D⟩, s. */
  meanDurationS: number;
  meanDurationErrS: number;
  points: TdvPoint[];
}

/** TTVs of the successful fits against an ephemeris. */
export function ttvSeries(fits: readonly TransitFit[], eph: LinearEphemeris): TtvPoint[] {
  const out: TtvPoint[] = [];
  for (const f of fits) {
    if (f.status !== 'ok') continue;
    const e = ephemerisTime(eph, f.epoch);
    out.push({ epoch: f.epoch, ttvS: f.tcS - e.timeS, errS: f.tcErrS, ephemerisErrS: e.errS });
  }
  return out;
}

/** Whether a fit measured the duration (ok, with both contacts: a one-contact fit holds it at the global fit's). */
export function measuresDuration(f: TransitFit): boolean {
  return f.status === 'ok' && Number.isFinite(f.durationErrS);
}

/** TDVs of the successful fits that measured a duration, about their inverse-variance weighted mean duration. */
export function tdvSeries(fits: readonly TransitFit[]): TdvSeries {
  let sw = 0;
  let swd = 0;
  for (const f of fits) {
    if (!measuresDuration(f)) continue;
    const w = 1 / (f.durationErrS * f.durationErrS);
    sw += w;
    swd += w * f.durationS;
  }
  const mean = sw > 0 ? swd / sw : NaN;
  const points: TdvPoint[] = [];
  for (const f of fits) {
    if (!measuresDuration(f)) continue;
    points.push({ epoch: f.epoch, tdvS: f.durationS - mean, errS: f.durationErrS });
  }
  return { meanDurationS: mean, meanDurationErrS: sw > 0 ? 1 / Math.sqrt(sw) : NaN, points };
}

/** Per-point σ assumed when the instrument has no noise (errors then refer to 1 ppm per point). */
export const NOMINAL_SIGMA = 1e-6;

export interface RecoverOptions {
  /** Fit the impact parameter in the global fit (default true). */
  fitImpact?: boolean;
  /** Use this global fit instead of fitting one (e.g. a template from a noiseless run). */
  global?: GlobalTransitFit;
  /** β inflation of the per-transit errors (default 'pooled'). */
  beta?: 'pooled' | 'off';
  /** Fit each window's baseline level (default true). */
  fitBaseline?: boolean;
  /** Scratch for the global fit, reused between calls (default: allocate). */
  workspace?: GlobalFitWorkspace;
}

export interface TimingRecovery {
  /** Null when no transit was observed (see `noTransitObserved`). */
  global: GlobalTransitFit | null;
  /**
   * True when the observation holds no sample inside any transit, or fewer
   * samples than the global shape fit needs (GLOBAL_FIT_MIN_POINTS): every
   * transit was lost to missed transits or gaps. Every fit is then
   * 'skipped-no-data' and the series are empty: an answer (nothing measured),
   * not an error.
   */
  noTransitObserved: boolean;
  fits: TransitFit[];
  beta: BetaFactorResult | null;
  /** Null when fewer than two transits were fitted. */
  ephemeris: LinearEphemeris | null;
  ttv: TtvPoint[];
  tdv: TdvSeries;
}

/** Fewest samples globalTransitFit accepts. */
export const GLOBAL_FIT_MIN_POINTS = 10;

/** Why a realization measured nothing. */
export const NO_TRANSIT_OBSERVED = 'no transit observed in this realization';

/** Samples inside a predicted planet transit, |t − nP| < T14/2 (the barycentre ephemeris). */
function inTransitSamples(scenario: Scenario, observation: Observation): number {
  const half = 0.5 * scenarioDurations(scenario).t14S;
  const P = scenario.planet.periodS;
  let n = 0;
  for (let i = 0; i < observation.timeS.length; i++) if (Math.abs(observation.timeS[i] - observation.epoch[i] * P) < half) n++;
  return n;
}

/** The recovery of an observation in which no transit was observed. */
function nothingObserved(scenario: Scenario, observation: Observation): TimingRecovery {
  const fits: TransitFit[] = [];
  for (let e = 0; e < scenario.observation.transits; e++) {
    let nPoints = 0;
    for (let i = 0; i < observation.epoch.length; i++) if (observation.epoch[i] === e) nPoints++;
    fits.push({ epoch: e, tcS: NaN, tcErrS: NaN, durationS: NaN, durationErrS: NaN, baseline: NaN, chi2: NaN, nPoints, status: 'skipped-no-data', reason: NO_TRANSIT_OBSERVED });
  }
  return { global: null, noTransitObserved: true, fits, beta: null, ephemeris: null, ttv: [], tdv: tdvSeries([]) };
}

/**
 * Recover transit times, durations, the linear ephemeris and the TTV/TDV
 * series from one observation of a scenario. Times in s since t0. An
 * observation without any in-transit sample, or with fewer samples than the
 * global fit needs, gives `noTransitObserved` (nothing fitted), not an error.
 */
export function recoverTimings(scenario: Scenario, observation: Observation, opts: RecoverOptions = {}): TimingRecovery {
  if (!opts.global && (observation.timeS.length < GLOBAL_FIT_MIN_POINTS || inTransitSamples(scenario, observation) === 0)) {
    return nothingObserved(scenario, observation);
  }
  // A noise-free instrument (σ = 0): weight by a nominal 1 ppm per point, so the
  // fitted values are unchanged and the errors are those of 1 ppm noise.
  const o = observation.sigma > 0 ? observation : { ...observation, sigma: NOMINAL_SIGMA };
  const geometry = templateGeometryFromScenario(scenario);
  const global =
    opts.global ??
    globalTransitFit(o.timeS, o.flux, o.sigma, o.epoch, geometry, {
      ephemeris: { t0S: 0, periodS: scenario.planet.periodS },
      fitImpact: opts.fitImpact ?? true,
      workspace: opts.workspace,
    });
  const per: PerTransitFitResult = fitTransits(o.timeS, o.flux, o.sigma, o.epoch, global.template, {
    ephemeris: { t0S: global.offsetS, periodS: scenario.planet.periodS },
    cadenceS: scenario.instrument.cadenceS,
    epochs: scenario.observation.transits,
    beta: opts.beta ?? 'pooled',
    fitBaseline: opts.fitBaseline ?? true,
    pointSigma: o.sigmaPoint ?? null,
  });
  const ok = per.fits.filter((f) => f.status === 'ok');
  let ephemeris: LinearEphemeris | null = null;
  if (ok.length >= 2) {
    ephemeris = fitLinearEphemeris(
      ok.map((f) => f.epoch),
      ok.map((f) => f.tcS),
      ok.map((f) => f.tcErrS),
    );
  }
  return {
    global,
    noTransitObserved: false,
    fits: per.fits,
    beta: per.beta,
    ephemeris,
    ttv: ephemeris ? ttvSeries(per.fits, ephemeris) : [],
    tdv: tdvSeries(per.fits),
  };
}

/**
 * One realization of the injection–recovery experiment, as one library call:
 * draw the moon's unknown orbital phase (and node, periapsis where they
 * matter), simulate the observation with noise, recover the transit times and
 * durations, and compute the detection statistics of every channel:
 *   ttv — χ² of the fitted mid-times against a weighted linear ephemeris;
 *   tdv — χ² of the fitted durations against their weighted mean;
 *   dip — the stacked residuals, from which the moon-dip matched-filter SNR
 *         (orbital sampling effect, Heller 2014) is computed for a given moon.
 * Seeded: the caller passes the generator for (seed, cell, realization).
 */
import type { Scenario } from '../scenario/types.js';
import type { Rng } from '../noise/rng.js';
import { observeScenario, type Observation } from '../noise/observe.js';
import { LightCurveWorkspace } from '../photometry/lightCurve.js';
import { GlobalFitWorkspace } from './globalTransitFit.js';
import { measuresDuration, recoverTimings, type TimingRecovery } from './timingSeries.js';
import { withCampaignEpochs } from '../noise/observingPlan.js';
import { ttvExcess, tdvExcess } from './chiSquareStatistics.js';
import { lombScargle } from './lombScargle.js';
import { stackResiduals, type ResidualStack } from './residualStack.js';
import { windowHalfWidthS } from '../photometry/transitWindows.js';

export interface RealizationRecord {
  transitsFitted: number;
  /** Every transit lost to missed transits or gaps: nothing measured, a non-detection in every channel. */
  noTransitObserved: boolean;
  ttvChi2: number;
  ttvDof: number;
  tdvChi2: number;
  tdvDof: number;
  /** Rms of the fitted TTVs and TDVs, s. */
  ttvRmsS: number;
  tdvRmsS: number;
  /** Lomb–Scargle peak of the TTVs, cycles per epoch, and its Baluev (2008) false-alarm probability. */
  periodogramPeakPerEpoch: number;
  periodogramFap: number;
  /** Residuals of the planet-only fits, stacked on the fitted mid-times (moon-dip channel). */
  stack: ResidualStack;
}

/** Scratch reused from one realization to the next (not shared between threads): the light curve's and the global fit's. */
export class RealizationWorkspace {
  readonly lightCurve = new LightCurveWorkspace();
  readonly globalFit = new GlobalFitWorkspace();
}

/** The moon's orbital angles that a realization does not know: drawn uniformly per realization. */
export function drawMoonOrientation(s: Scenario, rng: Rng): Scenario {
  if (!s.moon) return s;
  const twoPi = 2 * Math.PI;
  const phaseRad = twoPi * rng.uniform();
  // Node and periapsis only matter for inclined and eccentric moon orbits respectively;
  // they are drawn every time so the stream layout is the same for every cell.
  const nodeDraw = twoPi * rng.uniform();
  const periDraw = twoPi * rng.uniform();
  return {
    ...s,
    moon: {
      ...s.moon,
      phaseRad,
      nodeRad: s.moon.inclinationRad > 0 ? nodeDraw : s.moon.nodeRad,
      periapsisRad: s.moon.eccentricity > 0 ? periDraw : s.moon.periapsisRad,
    },
  };
}

function rms(xs: number[]): number {
  if (xs.length === 0) return NaN;
  let a = 0;
  for (const x of xs) a += x * x;
  return Math.sqrt(a / xs.length);
}

/** Detection statistics of one recovered observation. */
export function realizationStatistics(s: Scenario, obs: Observation, rec: TimingRecovery): RealizationRecord {
  const ok = rec.fits.filter((f) => f.status === 'ok');
  const n = ok.length;
  const epochs = Float64Array.from(ok, (f) => f.epoch);
  let ttvChi2 = NaN;
  let tdvChi2 = NaN;
  let peak = NaN;
  let fap = NaN;
  if (n >= 3) {
    const t = ttvExcess(epochs, Float64Array.from(ok, (f) => f.tcS), Float64Array.from(ok, (f) => f.tcErrS));
    ttvChi2 = t.chiSquare;
    if (n >= 4) {
      const ls = lombScargle(epochs, Float64Array.from(rec.ttv, (p) => p.ttvS), Float64Array.from(rec.ttv, (p) => p.errS));
      peak = ls.peakFrequency;
      fap = ls.falseAlarmProbability;
    }
  }
  // The TDV channel: the fits that measured a duration (both contacts; perTransitFit.ts).
  const dur = ok.filter(measuresDuration);
  if (dur.length >= 2) {
    tdvChi2 = tdvExcess(Float64Array.from(dur, (f) => f.epoch), Float64Array.from(dur, (f) => f.durationS), Float64Array.from(dur, (f) => f.durationErrS)).chiSquare;
  }
  const stack = stackResiduals(obs.timeS, obs.flux, obs.epoch, rec.fits, rec.global?.template ?? null, obs.sigma, s.instrument.cadenceS, windowHalfWidthS(s));
  return {
    transitsFitted: n,
    noTransitObserved: rec.noTransitObserved,
    ttvChi2,
    ttvDof: Math.max(0, n - 2),
    tdvChi2,
    tdvDof: Math.max(0, dur.length - 1),
    ttvRmsS: rms(rec.ttv.map((p) => p.ttvS)),
    tdvRmsS: rms(rec.tdv.points.map((p) => p.tdvS)),
    periodogramPeakPerEpoch: peak,
    periodogramFap: fap,
    stack,
  };
}

/**
 * Simulate → recover → statistics for one realization. With `withMoon` false
 * the moon is removed (a no-moon realization for false-alarm calibration).
 */
export function runRealization(
  s: Scenario,
  rng: Rng,
  opts: { withMoon?: boolean; workspace?: RealizationWorkspace } = {},
): { record: RealizationRecord; scenario: Scenario; observation: Observation; recovery: TimingRecovery } {
  // With a ground campaign its transits are the epochs (observingPlan.ts), whatever observation.transits says.
  const base = withCampaignEpochs(s);
  const drawn = opts.withMoon === false ? { ...base, moon: null } : drawMoonOrientation(base, rng);
  const observation = observeScenario(drawn, rng, opts.workspace?.lightCurve);
  const recovery = recoverTimings(drawn, observation, { workspace: opts.workspace?.globalFit });
  return { record: realizationStatistics(drawn, observation, recovery), scenario: drawn, observation, recovery };
}

/**
 * One synthetic observation of a scenario: the photodynamical model sampled
 * at the instrument's cadence in the transit windows, plus white noise at the
 * instrument's level (σ scaled by √t from its stated timescale to the
 * exposure). Pass `rng = null` for the noiseless model.
 */
import type { Scenario } from '../scenario/types.js';
import { DEFAULT_SMEARING_TOLERANCE, lightCurveModel, LightCurveWorkspace, modelFlux, type LightCurveModel } from '../photometry/lightCurve.js';
import { sampleWindows, transitWindows, type TransitWindow } from '../photometry/transitWindows.js';
import type { Rng } from './rng.js';
import { whiteNoiseSigma } from './whiteNoise.js';

export interface Observation {
  windows: TransitWindow[];
  /** Mid-exposure times, s since t0. */
  timeS: Float64Array;
  epoch: Int32Array;
  /** Noiseless model flux (relative). */
  model: Float64Array;
  /** Observed flux: model plus noise (equal to the model when noiseless). */
  flux: Float64Array;
  /** Per-point white-noise standard deviation (relative flux). */
  sigma: number;
  lightCurve: LightCurveModel;
}

export function observeScenario(s: Scenario, rng: Rng | null, ws: LightCurveWorkspace = new LightCurveWorkspace()): Observation {
  const windows = transitWindows(s);
  const { timeS, epoch } = sampleWindows(windows, s.instrument.cadenceS);
  const sigma = whiteNoiseSigma(s.instrument.noiseFraction, s.instrument.noiseTimescaleS, s.instrument.exposureS);
  // Supersampling is chosen so the model's smearing error stays below 2 % of the per-point
  // noise (and below 1 ppm when that is stricter), where it cannot bias the recovery.
  const lc = lightCurveModel(s, { tolerance: Math.max(DEFAULT_SMEARING_TOLERANCE, 0.02 * sigma) });
  const model = modelFlux(timeS, lc, new Float64Array(timeS.length), ws);
  const flux = Float64Array.from(model);
  if (rng !== null && sigma > 0) {
    const noise = new Float64Array(flux.length);
    rng.fillNormal(noise, sigma);
    for (let i = 0; i < flux.length; i++) flux[i] += noise[i];
  }
  return { windows, timeS, epoch, model, flux, sigma, lightCurve: lc };
}

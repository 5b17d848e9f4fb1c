/**
 * One synthetic observation of a scenario: the photodynamical model sampled
 * at the instrument's cadence in the transit windows, with the scenario's
 * gaps (whole transits missed, random gaps within windows), white noise at
 * the instrument's level (σ scaled by √t from its stated timescale to the
 * exposure) and, if stated, correlated noise (power law, Timmer & König 1995,
 * generated per contiguous window; or a damped random walk, Kelly et al.
 * 2009, on the time stamps). Pass `rng = null` for the noiseless, gap-free model.
 * Random draws, in order: white noise, red noise, missed transits, gaps
 * (then, with a campaign, the weather).
 *
 * With a site, a target and a campaign (a ground campaign, observingPlan.ts)
 * the exposures are those of the calendar's observable stretches of the
 * campaign's transits at each site (partial transits included), each with
 * the white noise of the ground budget at its own air mass (or the stated
 * level when the noise is given directly), red noise drawn per site, and
 * each site's nights lost to weather with probability 1 − clear_fraction.
 * The campaign's transits are the epochs (`withCampaignEpochs`); missed
 * transits and random gaps apply on top, as scheduling losses.
 */
import type { RedNoiseSpec, Scenario } from '../scenario/types.js';
import { randomGapMask, selectObservedEpochs } from './gaps.js';
import { powerLawNoise } from './powerLawNoise.js';
import { dampedRandomWalkNoise } from './dampedRandomWalkNoise.js';
import { DEFAULT_SMEARING_TOLERANCE, lightCurveModel, LightCurveWorkspace, modelFlux, type LightCurveModel } from '../photometry/lightCurve.js';
import { sampleWindows, transitWindows, type TransitWindow } from '../photometry/transitWindows.js';
import type { Rng } from './rng.js';
import { observingPlan, type ObservingPlan } from './observingPlan.js';
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
  /** White-noise standard deviation (relative flux): every point's, or with a campaign the rms of `sigmaPoint`. */
  sigma: number;
  /** With a campaign and a ground budget: each point's own white-noise standard deviation (its air mass and site); else null (every point has `sigma`). */
  sigmaPoint: Float64Array | null;
  /** With a campaign: each point's site (index in `scenario.sky.sites`); else null. */
  site: Int32Array | null;
  /** Ephemeris epoch (t0 + nP) of epoch 0 and of time 0: the campaign's first transit, else 0. */
  firstEpoch: number;
  lightCurve: LightCurveModel;
}

export function observeScenario(s: Scenario, rng: Rng | null, ws: LightCurveWorkspace = new LightCurveWorkspace()): Observation {
  const plan = observingPlan(s);
  if (plan !== null) return observeCampaign(s, plan, rng, ws);
  const windows = transitWindows(s);
  const grid = sampleWindows(windows, s.instrument.cadenceS);
  const sigma = whiteNoiseSigma(s.instrument.noiseFraction, s.instrument.noiseTimescaleS, s.instrument.exposureS);
  // Supersampling is chosen so the model's smearing error stays below 2 % of the per-point
  // noise (and below 1 ppm when that is stricter), where it cannot bias the recovery.
  const lc = lightCurveModel(s, { tolerance: Math.max(DEFAULT_SMEARING_TOLERANCE, 0.02 * sigma) });
  const full = modelFlux(grid.timeS, lc, new Float64Array(grid.timeS.length), ws);
  const fullFlux = Float64Array.from(full);
  if (rng !== null && sigma > 0) {
    const noise = new Float64Array(fullFlux.length);
    rng.fillNormal(noise, sigma);
    addInto(fullFlux, noise);
  }
  if (rng !== null && s.instrument.redNoise) addRedNoise(fullFlux, grid.timeS, s.instrument.cadenceS, s.instrument.redNoise, rng);
  if (rng === null) return { windows, timeS: grid.timeS, epoch: grid.epoch, model: full, flux: fullFlux, sigma, sigmaPoint: null, site: null, firstEpoch: 0, lightCurve: lc };
  const keep = gapMask(s, grid.timeS, grid.epoch, rng);
  return { windows, ...subset(keep, grid.timeS, grid.epoch, full, fullFlux), sigma, sigmaPoint: null, site: null, firstEpoch: 0, lightCurve: lc };
}

/** Root mean square of the values. */
function rmsOf(x: Float64Array): number {
  let a = 0;
  for (let i = 0; i < x.length; i++) a += x[i] * x[i];
  return x.length > 0 ? Math.sqrt(a / x.length) : NaN;
}

/** a[i] *= b[i] (top-level loop; see addInto). */
function multiplyInto(a: Float64Array, b: Float64Array): void {
  for (let i = 0; i < a.length; i++) a[i] *= b[i];
}

/** A ground campaign's observation (see the file header and observingPlan.ts). */
function observeCampaign(s: Scenario, plan: ObservingPlan, rng: Rng | null, ws: LightCurveWorkspace): Observation {
  const P = s.planet.periodS;
  const windows: TransitWindow[] = [];
  for (let k = 0; k < plan.epochs; k++) windows.push({ epoch: k, centreS: k * P, startS: k * P - plan.halfWindowS, endS: k * P + plan.halfWindowS });
  // No observable exposure at all (a target that never rises high enough): the scenario's own level.
  const sigmaRms = plan.sigma.length > 0 ? rmsOf(plan.sigma) : whiteNoiseSigma(s.instrument.noiseFraction, s.instrument.noiseTimescaleS, s.instrument.exposureS);
  // The smearing tolerance of the lowest per-point noise (see observeScenario).
  let sigmaMin = Infinity;
  for (let i = 0; i < plan.sigma.length; i++) sigmaMin = Math.min(sigmaMin, plan.sigma[i]);
  const lc = lightCurveModel(s, { tolerance: Math.max(DEFAULT_SMEARING_TOLERANCE, 0.02 * (Number.isFinite(sigmaMin) ? sigmaMin : 0)) });
  const full = modelFlux(plan.timeS, lc, new Float64Array(plan.timeS.length), ws);
  const fullFlux = Float64Array.from(full);
  const nEpochs = { ...s, observation: { ...s.observation, transits: plan.epochs } };
  if (rng === null) {
    return { windows, timeS: plan.timeS, epoch: plan.epoch, model: full, flux: fullFlux, sigma: sigmaRms, sigmaPoint: plan.sigmaVaries ? plan.sigma : null, site: plan.site, firstEpoch: plan.firstEpoch, lightCurve: lc };
  }
  if (sigmaRms > 0) {
    const noise = new Float64Array(fullFlux.length);
    if (plan.sigmaVaries) {
      rng.fillNormal(noise, 1);
      multiplyInto(noise, plan.sigma);
    } else {
      rng.fillNormal(noise, sigmaRms);
    }
    addInto(fullFlux, noise);
  }
  if (s.instrument.redNoise) {
    // Each site its own atmosphere: an independent red-noise series per site, on its own time stamps.
    const sites = Math.max(1, s.sky!.sites.length); // a space instrument: one series
    for (let j = 0; j < sites; j++) addSiteRedNoise(fullFlux, plan, j, s.instrument.cadenceS, s.instrument.redNoise, rng);
  }
  let keep = gapMask(nEpochs, plan.timeS, plan.epoch, rng);
  const clear = s.sky!.constraints.clearFraction;
  if (clear < 1) {
    // Weather: one draw per (site, night), in the plan's order.
    const clearNight = new Uint8Array(plan.nights);
    for (let k = 0; k < plan.nights; k++) clearNight[k] = rng.uniform() < clear ? 1 : 0;
    if (keep === null) keep = new Uint8Array(plan.timeS.length).fill(1);
    for (let i = 0; i < keep.length; i++) if (!clearNight[plan.night[i]]) keep[i] = 0;
  }
  const kept = subset(keep, plan.timeS, plan.epoch, full, fullFlux);
  const sigmaPoint = !plan.sigmaVaries ? null : keep === null ? plan.sigma : pick(keep, plan.sigma);
  const site = keep === null ? plan.site : pickInt(keep, plan.site);
  return { windows, ...kept, sigma: sigmaRms, sigmaPoint, site, firstEpoch: plan.firstEpoch, lightCurve: lc };
}

function pick(keep: Uint8Array, x: Float64Array): Float64Array {
  let n = 0;
  for (let i = 0; i < keep.length; i++) n += keep[i];
  const out = new Float64Array(n);
  for (let i = 0, j = 0; i < keep.length; i++) if (keep[i]) out[j++] = x[i];
  return out;
}

function pickInt(keep: Uint8Array, x: Int32Array): Int32Array {
  let n = 0;
  for (let i = 0; i < keep.length; i++) n += keep[i];
  const out = new Int32Array(n);
  for (let i = 0, j = 0; i < keep.length; i++) if (keep[i]) out[j++] = x[i];
  return out;
}

/** Red noise of one site: generated on that site's exposures (in time order) and added to them. */
function addSiteRedNoise(flux: Float64Array, plan: ObservingPlan, site: number, cadenceS: number, red: RedNoiseSpec, rng: Rng): void {
  let n = 0;
  for (let i = 0; i < plan.site.length; i++) if (plan.site[i] === site) n++;
  if (n === 0) return;
  const idx = new Int32Array(n);
  const t = new Float64Array(n);
  for (let i = 0, j = 0; i < plan.site.length; i++) {
    if (plan.site[i] !== site) continue;
    idx[j] = i;
    t[j++] = plan.timeS[i];
  }
  const f = new Float64Array(n);
  addRedNoise(f, t, cadenceS, red, rng);
  for (let j = 0; j < n; j++) flux[idx[j]] += f[j];
}

/**
 * a[i] += b[i]. A top-level loop: inside observeScenario it ran as on-stack
 * replacement code that V8 discarded at every call (a "wrong map" deoptimization
 * on the next scenario object, measured once per realization).
 */
function addInto(a: Float64Array, b: Float64Array): void {
  for (let i = 0; i < a.length; i++) a[i] += b[i];
}

/** Keep the samples where `keep` is 1. */
function subset(keep: Uint8Array | null, timeS: Float64Array, epoch: Int32Array, model: Float64Array, flux: Float64Array) {
  if (keep === null) return { timeS, epoch, model, flux };
  let n = 0;
  for (let i = 0; i < keep.length; i++) n += keep[i];
  const out = { timeS: new Float64Array(n), epoch: new Int32Array(n), model: new Float64Array(n), flux: new Float64Array(n) };
  for (let i = 0, j = 0; i < keep.length; i++) {
    if (!keep[i]) continue;
    out.timeS[j] = timeS[i];
    out.epoch[j] = epoch[i];
    out.model[j] = model[i];
    out.flux[j++] = flux[i];
  }
  return out;
}

/** Samples lost to missed transits and random gaps within windows (gaps.ts); null when none. */
function gapMask(s: Scenario, timeS: Float64Array, epoch: Int32Array, rng: Rng): Uint8Array | null {
  const { missedFraction, dutyCycle, gapLengthS } = s.observation;
  if (!(missedFraction > 0) && !(dutyCycle < 1)) return null;
  const keep = new Uint8Array(timeS.length).fill(1);
  if (missedFraction > 0) {
    const observed = new Set(selectObservedEpochs(s.observation.transits, missedFraction, rng));
    for (let i = 0; i < timeS.length; i++) if (!observed.has(epoch[i])) keep[i] = 0;
  }
  if (dutyCycle < 1) {
    const mask = randomGapMask(timeS, dutyCycle, gapLengthS, rng);
    for (let i = 0; i < timeS.length; i++) if (!mask[i]) keep[i] = 0;
  }
  return keep;
}

/**
 * Correlated noise, on the full (gap-free) grid. A power law needs an even
 * grid: each contiguous run of samples (one window, or windows that touch)
 * gets its own independent realization, generated at least as long as the
 * stated timescale, so that the rms of means over that timescale is the stated
 * one (powerLawNoise.ts), and cropped to the run (Timmer & König 1995, A&A
 * 300, 707, Sect. 3: generate a longer series and cut it). Nothing beyond the
 * run is kept: the part of a block longer than its window would otherwise be
 * added to the following windows, raising their variance and correlating them
 * (issue 17). A damped random walk is stationary and runs on the time stamps
 * with its exact covariance, so windows days apart are independent draws.
 */
function addRedNoise(flux: Float64Array, timeS: Float64Array, cadenceS: number, red: RedNoiseSpec, rng: Rng): void {
  if (red.model === 'drw') {
    addInto(flux, dampedRandomWalkNoise(timeS, red.tauS, red.rmsFraction, rng));
    return;
  }
  let start = 0;
  for (let i = 1; i <= timeS.length; i++) {
    if (i < timeS.length && Math.abs(timeS[i] - timeS[i - 1] - cadenceS) < 1e-6 * cadenceS) continue;
    const run = i - start;
    const block = new Float64Array(Math.max(run, Math.ceil(red.timescaleS / cadenceS)));
    powerLawNoise(block, { dtS: cadenceS, beta: red.beta, rmsFraction: red.rmsFraction, timescaleS: red.timescaleS }, rng);
    for (let k = 0; k < run; k++) flux[start + k] += block[k]; // crop to this run
    start = i;
  }
}

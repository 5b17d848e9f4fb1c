/**
 * `simulate` as a library call: one observation of the scenario (noisy or
 * noiseless) and the planet's true transit times and durations, plus the
 * tables the CLI writes.
 */
import type { Scenario } from '../scenario/types.js';
import { observeScenario, type Observation } from '../noise/observe.js';
import { withCampaignEpochs } from '../noise/observingPlan.js';
import { createRng } from '../noise/rng.js';
import { planetTransitTruth, type PlanetTransitTruth } from '../physics/planetTransitTruth.js';
import { windowHalfWidthS } from '../photometry/transitWindows.js';
import { recoverTimings, type TimingRecovery } from '../timing/timingSeries.js';
import type { TableColumn } from '../io/ecsv.js';
import { DAY_S } from '../physics/constants.js';
import { VERSION } from '../version.js';

export interface Simulation {
  observation: Observation;
  truth: PlanetTransitTruth[];
  /** The recovery of the simulated data: fitted mid-times, durations, ephemeris, TTV/TDV series. */
  recovery: TimingRecovery;
}

export function simulateScenario(given: Scenario, opts: { noiseless?: boolean; realization?: number } = {}): Simulation {
  // With a ground campaign the campaign's transits are the epochs (noise/observingPlan.ts).
  const s = withCampaignEpochs(given);
  const rng = opts.noiseless ? null : createRng(s.seed, 0, opts.realization ?? 0);
  const observation = observeScenario(s, rng);
  const truth = planetTransitTruth(observation.lightCurve.sys, observation.lightCurve.rp, s.observation.transits, windowHalfWidthS(s));
  return { observation, truth, recovery: recoverTimings(s, observation) };
}

/** The fit of each epoch (in epoch order), or undefined. */
export function fitOf(sim: Simulation) {
  const by = new Map(sim.recovery.fits.map((f) => [f.epoch, f]));
  return sim.truth.map((t) => by.get(t.epoch));
}

/** Fitted TTV and TDV of an epoch, s (NaN where the transit was not fitted). */
export function ttvOf(sim: Simulation, epoch: number): number {
  return sim.recovery.ttv.find((p) => p.epoch === epoch)?.ttvS ?? NaN;
}
export function tdvOf(sim: Simulation, epoch: number): number {
  return sim.recovery.tdv.points.find((p) => p.epoch === epoch)?.tdvS ?? NaN;
}

export function simulationTables(s: Scenario, sim: Simulation, noiseless: boolean) {
  const o = sim.observation;
  const bjd = new Float64Array(o.timeS.length);
  // Time 0 is the conjunction of ephemeris epoch o.firstEpoch (a ground campaign's first transit; else 0).
  for (let i = 0; i < bjd.length; i++) bjd[i] = s.observation.t0BjdTdb + (o.firstEpoch * s.planet.periodS + o.timeS[i]) / DAY_S;
  const err = o.sigmaPoint ? Float64Array.from(o.sigmaPoint) : new Float64Array(o.timeS.length).fill(o.sigma);
  const meta = {
    moonsieve_version: VERSION,
    scenario: s.name,
    seed: s.seed,
    time_standard: 'BJD_TDB',
    noiseless,
    exposure_s: s.instrument.exposureS,
    supersample: o.lightCurve.supersample,
  };
  const lightCurve: { columns: TableColumn[]; meta: Record<string, unknown> } = {
    columns: [
      { name: 'time', datatype: 'float64', description: 'Mid-exposure time, BJD_TDB (days)', values: bjd },
      { name: 'epoch', datatype: 'int64', description: 'Transit epoch (0 = first)', values: o.epoch },
      { name: 'flux', datatype: 'float64', description: noiseless ? 'Relative flux, noiseless model' : 'Relative flux, model plus white noise', values: o.flux },
      { name: 'flux_err', datatype: 'float64', description: 'White-noise standard deviation per exposure', values: err },
      { name: 'model', datatype: 'float64', description: 'Noiseless relative flux (exposure-averaged model)', values: o.model },
    ],
    meta,
  };
  const meanDur = sim.truth.reduce((a, t) => a + t.durationS, 0) / sim.truth.length;
  const transits: { columns: TableColumn[]; meta: Record<string, unknown> } = {
    columns: [
      { name: 'epoch', datatype: 'int64', values: sim.truth.map((t) => t.epoch) },
      { name: 'mid_time', datatype: 'float64', description: 'Planet mid-transit (t1+t4)/2 from the model, BJD_TDB (days)', values: sim.truth.map((t) => s.observation.t0BjdTdb + t.midS / DAY_S) },
      { name: 'ttv', datatype: 'float64', unit: 's', description: 'Planet mid-time minus barycentre ephemeris t0 + n P (model truth)', values: sim.truth.map((t) => t.midS - t.epoch * s.planet.periodS) },
      { name: 'duration', datatype: 'float64', unit: 's', description: 'Planet first-to-last-contact duration (model truth)', values: sim.truth.map((t) => t.durationS) },
      { name: 'tdv', datatype: 'float64', unit: 's', description: 'Duration minus its mean over the epochs (model truth)', values: sim.truth.map((t) => t.durationS - meanDur) },
      { name: 'fit_status', datatype: 'string', description: 'Per-transit fit: ok, skipped-partial, skipped-no-data or failed', values: fitOf(sim).map((f) => f?.status ?? 'skipped-no-data') },
      { name: 'fit_mid_time', datatype: 'float64', description: 'Fitted mid-time, BJD_TDB (days)', values: fitOf(sim).map((f) => (f && f.status === 'ok' ? s.observation.t0BjdTdb + f.tcS / DAY_S : NaN)) },
      { name: 'fit_mid_time_err', datatype: 'float64', unit: 's', description: 'Its 1-sigma error (Fisher matrix, times beta)', values: fitOf(sim).map((f) => (f && f.status === 'ok' ? f.tcErrS : NaN)) },
      { name: 'fit_ttv', datatype: 'float64', unit: 's', description: 'Fitted mid-time minus the fitted linear ephemeris', values: sim.truth.map((t) => ttvOf(sim, t.epoch)) },
      { name: 'fit_duration', datatype: 'float64', unit: 's', description: 'Fitted first-to-last-contact duration', values: fitOf(sim).map((f) => (f && f.status === 'ok' ? f.durationS : NaN)) },
      { name: 'fit_duration_err', datatype: 'float64', unit: 's', description: 'Its 1-sigma error', values: fitOf(sim).map((f) => (f && f.status === 'ok' ? f.durationErrS : NaN)) },
      { name: 'fit_tdv', datatype: 'float64', unit: 's', description: 'Fitted duration minus the weighted mean duration', values: sim.truth.map((t) => tdvOf(sim, t.epoch)) },
    ],
    meta,
  };
  return { lightCurve, transits };
}

/**
 * Light-curve and recovery benchmarks: one noiseless 13-hour transit window at
 * 2-minute cadence with 15-fold supersampling; recovered transits per second;
 * and the cost of one realization of the demo scenario against the cost of
 * only drawing its Gaussian noise (the floor no injection–recovery can beat).
 */
import { parseScenarioText, loadScenario } from '../src/scenario/loadScenario.js';
import { lightCurveModel, LightCurveWorkspace, modelFlux } from '../src/photometry/lightCurve.js';
import { observeScenario } from '../src/noise/observe.js';
import { createRng } from '../src/noise/rng.js';
import { recoverTimings } from '../src/timing/timingSeries.js';
import { RealizationWorkspace, runRealization } from '../src/timing/realization.js';
import { timeMs, type BenchMedian } from './measure.js';

/** An invented system whose transit lasts about 13 h (Sun-like star, 1-yr orbit, Earth-size planet). */
const thirteenHour = `
name: bench 13-hour transit
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, limb_darkening: {u1: 0.4, u2: 0.26}}
planet: {mass: 1 Mearth, radius: 1 Rearth, period: 365.25 d}
moon: {mass: 0.0123 Mearth, radius: 0.27 Rearth, separation: 60 Rp}
instrument: {cadence: 2 min, noise: 100 ppm per 2 min}
observation: {transits: 1, baseline: 0 h}
`;

export function benchLightCurveWindow(repeats = 9): BenchMedian[] {
  const s = parseScenarioText(thirteenHour);
  const m = { ...lightCurveModel(s), supersample: 15 };
  const n = Math.round((13 * 3600) / 120);
  const t = Float64Array.from({ length: n }, (_, i) => (i - n / 2) * 120);
  const out = new Float64Array(n);
  const ws = new LightCurveWorkspace();
  return [timeMs(`one noiseless 13-h window, 2-min cadence (${n} points), 15× supersampling, planet + moon`, repeats, () => modelFlux(t, m, out, ws))];
}

export function benchRecovery(scenarioPath = 'scenarios/demo-observer.yaml', repeats = 7): BenchMedian[] {
  const s = loadScenario(scenarioPath);
  // A different noise realization for each timed call, so one unlucky fit does not set the figure.
  const observations = Array.from({ length: repeats + 10 }, (_, r) => observeScenario(s, createRng(s.seed, 0, r)));
  let k = 0;
  const rec = timeMs('recoverTimings (global fit + per-transit fits), demo scenario', repeats, () => recoverTimings(s, observations[k++ % observations.length]), 10);
  const obs = observations[0];
  const perTransit: BenchMedian = {
    label: 'recovered transits per second (demo scenario, global fit included)',
    median: (s.observation.transits / rec.median) * 1000,
    unit: '/s',
    repeats,
  };
  const ws = new RealizationWorkspace();
  let r = 0;
  const one = timeMs('one realization of the demo scenario (simulate → recover → statistics)', repeats, () => runRealization(s, createRng(s.seed, 0, r++), { workspace: ws }), 10);
  const noise = new Float64Array(obs.timeS.length);
  const rng = createRng(s.seed, 0, 0);
  const floor = timeMs(`only drawing its ${noise.length} Gaussian samples (xoroshiro128+, ziggurat)`, Math.max(repeats, 21), () => rng.fillNormal(noise, 1e-3));
  const ratio: BenchMedian = { label: 'realization cost / noise-drawing cost (goal < 30)', median: one.median / floor.median, unit: '×', repeats };
  return [rec, perTransit, one, floor, ratio];
}

import { describe, it, expect } from 'vitest';
import { parseScenarioText } from '../../src/scenario/loadScenario.js';
import { lightCurveModel, modelFlux } from '../../src/photometry/lightCurve.js';
import { transitFluxScalar } from '../../src/photometry/transitFlux.js';
import { scenarioDurations, sampleWindows, transitWindows, windowHalfWidthS } from '../../src/photometry/transitWindows.js';
import { planetTransitTruth } from '../../src/physics/planetTransitTruth.js';
import { timingSignals } from '../../src/physics/timingSignals.js';
import { observeScenario } from '../../src/noise/observe.js';
import { createRng } from '../../src/noise/rng.js';

// An invented test system: a warm Jupiter-like planet around a Sun-like star.
const base = `
name: Lightcurve test
seed: 11
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, limb_darkening: {u1: 0.4, u2: 0.26}}
planet: {mass: 1 Mjup, radius: 1 Rjup, period: 60 d, impact_parameter: 0.3}
instrument: {cadence: 1 min, exposure: 1 min, noise: 100 ppm per 1 h}
observation: {transits: 3, baseline: 2 h}
`;

describe('photodynamical light curve', () => {
  it('planet alone: mid-transit flux is Mandel & Agol at z = b, and first contact matches Winn (2010) T14', () => {
    const s = parseScenarioText(base);
    const m = { ...lightCurveModel(s), supersample: 1 };
    const t = new Float64Array([0]);
    const f = modelFlux(t, m);
    // At conjunction the planet sits at sky separation b (Winn 2010 eq. 7), circular orbit.
    expect(f[0]).toBeCloseTo(transitFluxScalar(s.planet.impactParameter, m.rp, 0.4, 0.26), 12);
    // Contact points: flux leaves 1 exactly at ±T14/2 for a circular orbit (Winn 2010 eq. 14, exact for e = 0).
    const t14 = scenarioDurations(s).t14S;
    const probe = new Float64Array([t14 / 2 - 1, t14 / 2 + 1, -t14 / 2 + 1, -t14 / 2 - 1]);
    const fp = modelFlux(probe, m);
    expect(fp[0]).toBeLessThan(1);
    expect(fp[1]).toBe(1);
    expect(fp[2]).toBeLessThan(1);
    expect(fp[3]).toBe(1);
  });

  it('exposure smearing: the supersampled flux equals a fine numerical average over the exposure (Kipping 2010)', () => {
    const s = parseScenarioText(base.replace('cadence: 1 min, exposure: 1 min', 'cadence: 30 min, exposure: 29.4 min'));
    const m = lightCurveModel(s);
    expect(m.supersample).toBeGreaterThan(1);
    const t14 = scenarioDurations(s).t14S;
    const times = new Float64Array([t14 / 2 - 600, t14 / 2, 0, -t14 / 2 + 300]);
    const smeared = modelFlux(times, m);
    // Reference: 4001-point midpoint average computed here (common practice, no source).
    const fine = { ...m, supersample: 4001, supersampleEverywhere: true };
    const ref = modelFlux(times, fine);
    for (let i = 0; i < times.length; i++) expect(Math.abs(smeared[i] - ref[i])).toBeLessThan(1e-6);
  });

  it('sub-exposures only where needed: within the smearing tolerance of 65 sub-exposures everywhere', () => {
    // An invented warm-Saturn system with a moon (2-min cadence, 100-s exposure), moon phases every 30°
    // so that some transits have the moon crossing in front of the planet. Reference: the midpoint rule
    // with 65 sub-exposures in every exposure (Kipping 2010, MNRAS 408, 1758, §3), computed here.
    const text = `
name: Adaptive smearing test
seed: 3
star: {mass: 0.74 Msun, radius: 0.71 Rsun, teff: 4650 K, limb_darkening: {u1: 0.55, u2: 0.17}}
planet: {mass: 0.32 Mjup, radius: 0.84 Rjup, period: 148.3 d, impact_parameter: 0.25}
moon: {mass: 1 Mearth, density: 4.0 g/cm^3, separation: 8 Rp, phase: PHASE deg}
instrument: {cadence: 2 min, exposure: 100 s, noise: 450 ppm per 2 min}
observation: {transits: 3, baseline: 2.5 h}
`;
    let worst = 0;
    let singles = 0;
    let total = 0;
    for (let phase = 0; phase < 360; phase += 30) {
      const s = parseScenarioText(text.replace('PHASE', String(phase)));
      const grid = sampleWindows(transitWindows(s), s.instrument.cadenceS);
      const m = lightCurveModel(s, { tolerance: 1e-6 });
      expect(m.supersample).toBeGreaterThan(1);
      const adaptive = modelFlux(grid.timeS, m);
      const dense = modelFlux(grid.timeS, { ...m, supersample: 65, supersampleEverywhere: true });
      const same = modelFlux(grid.timeS, { ...m, supersampleEverywhere: true });
      for (let i = 0; i < adaptive.length; i++) {
        worst = Math.max(worst, Math.abs(adaptive[i] - dense[i]));
        if (adaptive[i] !== same[i]) singles++;
      }
      total += adaptive.length;
    }
    // Within the tolerance the sub-exposure count was chosen for (measured 2.5e-7 of 1e-6).
    expect(worst).toBeLessThan(1e-6);
    // And it does save work: most in-transit exposures are evaluated once (measured 51 % of all exposures).
    expect(singles / total).toBeGreaterThan(0.2);
  });

  it('windows cover each transit plus the baseline, and sampling stays on the cadence grid', () => {
    const s = parseScenarioText(base + 'moon: {mass: 1 Mearth, radius: 1 Rearth, separation: 20 Rp}\n');
    const w = transitWindows(s);
    expect(w).toHaveLength(3);
    const half = windowHalfWidthS(s);
    expect(half).toBeCloseTo(scenarioDurations(s).t14S / 2 + s.observation.baselineS, 9);
    const { timeS, epoch } = sampleWindows(w, s.instrument.cadenceS);
    for (let i = 0; i < timeS.length; i++) {
      expect(Math.abs(timeS[i] - w[epoch[i]].centreS)).toBeLessThanOrEqual(half);
      expect(Math.abs(timeS[i] % 60)).toBe(0); // on the 1-min cadence grid t_k = k·cadence
    }
  });

  it('the nested-Kepler TTVs match the Kipping (2009a) barycentric amplitude (two independent computations)', () => {
    // Many epochs sample the moon phase; the rms of the planet's true mid-times about the barycentre
    // ephemeris must equal A_TTV/√2 for a circular coplanar moon (Kipping 2009a; timingSignals.ts).
    const s = parseScenarioText(base.replace('transits: 3', 'transits: 60') + 'moon: {mass: 2 Mearth, radius: 1.2 Rearth, separation: 25 Rp, phase: 17 deg}\n');
    const m = lightCurveModel(s);
    const truth = planetTransitTruth(m.sys, m.rp, s.observation.transits, windowHalfWidthS(s));
    const ttv = truth.map((t) => t.midS - t.epoch * s.planet.periodS);
    const rms = Math.sqrt(ttv.reduce((a, x) => a + x * x, 0) / ttv.length);
    const sig = timingSignals({
      planetMassKg: s.planet.massKg, moonMassKg: s.moon!.massKg, moonSeparationM: s.moon!.separationM,
      moonEccentricity: 0, moonInclinationRad: 0, moonNodeRad: 0, moonPeriapsisRad: 0,
      barycentreSemiMajorAxisM: s.planet.semiMajorAxisM, barycentrePeriodS: s.planet.periodS,
      barycentreEccentricity: 0, barycentreOmegaRad: Math.PI / 2, durationS: scenarioDurations(s).t14S,
    });
    // 60 samples of a sinusoid at an irrational phase step: rms within 5 % of A/√2 (sampling scatter).
    expect(rms / sig.ttvRmsS).toBeGreaterThan(0.95);
    expect(rms / sig.ttvRmsS).toBeLessThan(1.05);
  });

  it('noise is seeded: same (seed, cell, realization) gives the same light curve, another realization differs', () => {
    const s = parseScenarioText(base);
    const a = observeScenario(s, createRng(s.seed, 0, 0));
    const b = observeScenario(s, createRng(s.seed, 0, 0));
    const c = observeScenario(s, createRng(s.seed, 0, 1));
    expect(Array.from(a.flux)).toEqual(Array.from(b.flux));
    expect(a.flux[10]).not.toBe(c.flux[10]);
    // White noise at 100 ppm per hour scales to 100·√60 ppm per 1-min exposure (√t law; common practice).
    expect(a.sigma).toBeCloseTo(100e-6 * Math.sqrt(60), 12);
  });
});

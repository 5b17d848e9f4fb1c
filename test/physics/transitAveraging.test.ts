import { describe, it, expect } from 'vitest';
import { parseScenarioText } from '../../src/scenario/loadScenario.js';
import { transitAveraging } from '../../src/physics/transitAveraging.js';
import { planetTransitTruth } from '../../src/physics/planetTransitTruth.js';
import { orbitSystemFromScenario } from '../../src/physics/skyPositions.js';
import { scenarioDurations, windowHalfWidthS } from '../../src/photometry/transitWindows.js';
import { timingSignals } from '../../src/physics/timingSignals.js';

describe('transitAveraging', () => {
  it('tends to Kipping (2009a) frozen-planet amplitudes as D/P_S → 0 (limit, derived)', () => {
    const f = transitAveraging(1, 1e6);
    expect(f.ttvFactor).toBeCloseTo(1, 10);
    expect(f.tdvFactor).toBeCloseTo(1, 10);
  });

  it('matches the TTV and TDV of the nested-Kepler truth for a moon of 3.9-d period and a 14-h transit', () => {
    // An invented Jupiter-like planet at 1 au with a dense 0.5-Mearth moon at 10 Rp: πD/P_S ≈ 0.48,
    // where the frozen-planet formula overstates the TTV by ~12 %. Truth: contact times root-found on
    // the nested Kepler orbits over 300 epochs (physics/planetTransitTruth.ts).
    const s = parseScenarioText(`
name: averaging test (invented)
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, limb_darkening: {u1: 0.4, u2: 0.26}}
planet: {mass: 1 Mjup, radius: 1 Rjup, period: 365.25 d, impact_parameter: 0.2}
moon: {mass: 0.5 Mearth, radius: 0.1 Rearth, separation: 10 Rp}
instrument: {cadence: 30 min, noise: 30 ppm per 6.5 h}
observation: {transits: 300, baseline: 5 h}
`);
    const truth = planetTransitTruth(orbitSystemFromScenario(s), s.planet.radiusM / s.star.radiusM, 300, windowHalfWidthS(s));
    const ttv = truth.map((t) => t.midS - t.epoch * s.planet.periodS);
    const dur = truth.map((t) => t.durationS);
    const rms = (xs: number[]) => {
      const m = xs.reduce((a, x) => a + x, 0) / xs.length;
      return Math.sqrt(xs.reduce((a, x) => a + (x - m) ** 2, 0) / xs.length);
    };
    const t14 = scenarioDurations(s).t14S;
    const sig = timingSignals({
      planetMassKg: s.planet.massKg, moonMassKg: s.moon!.massKg, moonSeparationM: s.moon!.separationM,
      moonEccentricity: 0, moonInclinationRad: 0, moonNodeRad: 0, moonPeriapsisRad: 0,
      barycentreSemiMajorAxisM: s.planet.semiMajorAxisM, barycentrePeriodS: s.planet.periodS,
      barycentreEccentricity: 0, barycentreOmegaRad: Math.PI / 2, durationS: t14,
    });
    const f = transitAveraging(t14, sig.moonPeriodS);
    expect(f.ttvFactor).toBeLessThan(0.92);
    // 300 stroboscopic samples of a sinusoid: rms good to ~2 %.
    expect(rms(ttv) / (sig.ttvRmsS * f.ttvFactor)).toBeCloseTo(1, 1);
    expect(Math.abs(rms(ttv) / (sig.ttvRmsS * f.ttvFactor) - 1)).toBeLessThan(0.03);
    expect(Math.abs(rms(dur) / (sig.tdvRmsS * f.tdvFactor) - 1)).toBeLessThan(0.05);
  });
});

import { describe, it, expect } from 'vitest';
import { parseScenarioText } from '../../src/scenario/loadScenario.js';
import { observeScenario } from '../../src/noise/observe.js';
import { createRng } from '../../src/noise/rng.js';
import { InputError } from '../../src/scenario/errors.js';

// An invented short-period system so that many transits are cheap.
const base = (instrument: string, observation: string) => `
name: observe test (invented)
seed: 3
star: {mass: 0.8 Msun, radius: 0.8 Rsun, teff: 5000 K, limb_darkening: {u1: 0.5, u2: 0.2}}
planet: {mass: 0.5 Mjup, radius: 0.9 Rjup, period: 5 d, impact_parameter: 0.2}
instrument: ${instrument}
observation: ${observation}
`;

describe('observeScenario noise models and gaps', () => {
  it('a ground budget sets the white level from photon, scintillation and floor terms, and names the dominant one', () => {
    const s = parseScenarioText(base('{cadence: 2 min, exposure: 100 s, ground: {aperture: 1 m, magnitude: 12, throughput: 0.4, airmass: 1.2, altitude: 2000 m, floor: 100 ppm per 10 min}}', '{transits: 2}'));
    const g = s.instrument.ground!;
    // Quadrature sum of the terms (common practice: independent noise sources add in variance).
    expect(g.terms.total).toBeCloseTo(Math.hypot(g.terms.photon, g.terms.scintillation, g.terms.floor), 12);
    expect(s.instrument.noiseFraction).toBe(g.terms.total);
    expect(s.instrument.noiseTimescaleS).toBe(100);
    expect(['photon', 'scintillation', 'floor']).toContain(g.terms.dominant);
  });

  it('refuses noise and ground together, and a red-noise block without a model', () => {
    expect(() => parseScenarioText(base('{cadence: 2 min, noise: 100 ppm per 1 h, ground: {aperture: 1 m, magnitude: 12}}', '{transits: 2}'))).toThrow(InputError);
    expect(() => parseScenarioText(base('{cadence: 2 min, noise: 100 ppm per 1 h, red_noise: {amplitude: 100 ppm per 30 min}}', '{transits: 2}'))).toThrow(/red_noise\.model/);
  });

  it('missed transits and random gaps remove the stated fractions (law of large numbers; common practice)', () => {
    const s = parseScenarioText(base('{cadence: 2 min, noise: 100 ppm per 1 h}', '{transits: 300, baseline: 2 h, missed_fraction: 0.3, duty_cycle: 0.7, gap_length: 15 min}'));
    const full = observeScenario(s, null).timeS.length;
    const o = observeScenario(s, createRng(1, 0, 0));
    const epochs = new Set(o.epoch).size;
    // Observed transits ~ Binomial(300, 0.7): mean 210, sd 7.9; allow 4 sd.
    expect(Math.abs(epochs - 210)).toBeLessThan(32);
    // Points kept: 0.7 of transits × 0.7 of each window.
    expect(o.timeS.length / full).toBeGreaterThan(0.42);
    expect(o.timeS.length / full).toBeLessThan(0.56);
  });

  it('power-law red noise has the stated rms when binned to its timescale (Timmer & König 1995 amplitude convention)', () => {
    const s = parseScenarioText(base('{cadence: 2 min, noise: 0 ppm, red_noise: {model: power_law, amplitude: 300 ppm per 30 min, slope: 1}}', '{transits: 200, baseline: 3 h}'));
    const o = observeScenario(s, createRng(2, 0, 0));
    // Residual = flux − model is pure red noise; rms of 15-point (30-min) means within each window.
    const means: number[] = [];
    for (let i = 0; i + 15 <= o.timeS.length; i += 15) {
      if (o.epoch[i] !== o.epoch[i + 14]) continue;
      let a = 0;
      for (let k = 0; k < 15; k++) a += o.flux[i + k] - o.model[i + k];
      means.push(a / 15);
    }
    const rms = Math.sqrt(means.reduce((a, x) => a + x * x, 0) / means.length);
    expect(rms / 300e-6).toBeGreaterThan(0.8);
    expect(rms / 300e-6).toBeLessThan(1.2);
  });

  it('damped-random-walk red noise is correlated over its timescale (Kelly et al. 2009 covariance)', () => {
    const s = parseScenarioText(base('{cadence: 2 min, noise: 0 ppm, red_noise: {model: drw, amplitude: 200 ppm, timescale: 60 min}}', '{transits: 100, baseline: 3 h}'));
    const o = observeScenario(s, createRng(3, 0, 0));
    let c0 = 0;
    let c1 = 0;
    let n = 0;
    for (let i = 0; i + 1 < o.timeS.length; i++) {
      if (o.epoch[i] !== o.epoch[i + 1]) continue;
      const x = o.flux[i] - o.model[i];
      const y = o.flux[i + 1] - o.model[i + 1];
      c0 += x * x;
      c1 += x * y;
      n++;
    }
    // Lag-1 autocorrelation e^{−2 min / 60 min} = 0.967; stationary rms 200 ppm.
    expect(c1 / c0).toBeGreaterThan(0.93);
    expect(Math.sqrt(c0 / n) / 200e-6).toBeGreaterThan(0.8);
    expect(Math.sqrt(c0 / n) / 200e-6).toBeLessThan(1.2);
  });
});

import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { aliasFamily, baluevFalseAlarm, lombScargle, lombScarglePower } from '../../src/timing/lombScargle.js';
import { createRng } from '../../src/noise/rng.js';

// Reference values generated once by test/fixtures/detectionStatistics.py (scipy 1.17.1, numpy 2.4.6):
// gls = numpy.linalg.lstsq weighted sine fit; baluev = Baluev 2008 formulas written independently in Python.
const fixture = JSON.parse(readFileSync(new URL('../fixtures/detectionStatistics.json', import.meta.url), 'utf8')) as {
  gls: { epochs: number[]; values: number[]; errors: number[]; points: { frequency: number; power: number }[] };
  baluev: { epochs: number[]; errors: number[]; fmax: number; Z: number; single: number; tau: number; W: number; fap: number; davies: number }[];
};
const f64 = (a: number[]): Float64Array => Float64Array.from(a);

/** Weighted variance of the epochs (weights σ⁻²), as Baluev's effective timespan needs. */
function weightedVar(t: number[], s: number[]): number {
  const w = s.map((v) => 1 / (v * v));
  const sw = w.reduce((a, b) => a + b, 0);
  const m = t.reduce((a, v, i) => a + w[i] * v, 0) / sw;
  return t.reduce((a, v, i) => a + w[i] * (v - m) ** 2, 0) / sw;
}

describe('generalised Lomb–Scargle power', () => {
  const { epochs, values, errors, points } = fixture.gls;

  it('equals 1 − χ²_fit/χ²_const of a direct weighted least-squares sine fit (numpy lstsq), |Δ| ≤ 1e-12', () => {
    const freqs = f64(points.map((p) => p.frequency));
    const power = lombScarglePower(f64(epochs), f64(values), f64(errors), freqs);
    points.forEach((p, k) => expect(Math.abs(power[k] - p.power)).toBeLessThan(1e-12));
  });

  it('returned sinusoid coefficients reproduce the peak power (χ² recomputed in the test)', () => {
    const r = lombScargle(f64(epochs), f64(values), f64(errors));
    const w = errors.map((s) => 1 / (s * s));
    const sw = w.reduce((a, b) => a + b, 0);
    const ybar = values.reduce((a, v, i) => a + w[i] * v, 0) / sw;
    let chi0 = 0;
    let chi = 0;
    epochs.forEach((t, i) => {
      const x = 2 * Math.PI * r.peakFrequency * t;
      const m = r.offset + r.cosAmplitude * Math.cos(x) + r.sinAmplitude * Math.sin(x);
      chi += w[i] * (values[i] - m) ** 2;
      chi0 += w[i] * (values[i] - ybar) ** 2;
    });
    expect(Math.abs(1 - chi / chi0 - r.peakPower)).toBeLessThan(1e-12);
    // injected signal in the fixture: amplitude 1.7 at ν = 0.31, offset 3.0 (noise σ ≈ 0.5–1.5, 23 points)
    expect(Math.abs(r.peakFrequency - 0.31)).toBeLessThan(0.01);
    expect(r.peakPower).toBeGreaterThanOrEqual(Math.max(...r.power) - 1e-15);
  });

  // The peak search maximises a function flat to second order, so ν is found to ~sqrt(ε) and the
  // amplitude, which depends on ν through the fit, to ~1e-8 (measured 2e-9).
  it('recovers a noiseless sinusoid: ν to 1e-6 cycles/epoch, amplitude and offset to 1e-7, Z = 1 (by construction)', () => {
    const e = f64([0, 1, 2, 3, 5, 6, 9, 10, 11, 14, 15, 16, 20, 21, 25, 26]);
    const nu = 0.3687;
    const y = e.map((E) => 0.2 + 2.5 * Math.cos(2 * Math.PI * nu * E - 1.1));
    const r = lombScargle(e, y, new Float64Array(e.length).fill(0.1));
    expect(Math.abs(r.peakFrequency - nu)).toBeLessThan(1e-6);
    expect(Math.abs(r.amplitude - 2.5)).toBeLessThan(1e-7);
    expect(Math.abs(r.offset - 0.2)).toBeLessThan(1e-7);
    expect(r.peakPower).toBeCloseTo(1, 12);
    expect(r.frequency[r.frequency.length - 1]).toBe(0.5);
    expect(r.frequency.length).toBe(Math.ceil(0.5 * 10 * 26));
  });

  it('handles ν = ½ on integer epochs (sin πE ≡ 0): an alternating TTV is found with Z = 1', () => {
    const e = f64([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11]);
    const y = e.map((E) => (E % 2 === 0 ? 1 : -1) * 3 + 0.5);
    const r = lombScargle(e, y, new Float64Array(12).fill(1));
    expect(r.peakFrequency).toBeCloseTo(0.5, 6);
    expect(r.peakPower).toBeCloseTo(1, 10);
    expect(r.amplitude).toBeCloseTo(3, 6);
  });

  it('rejects bad input', () => {
    expect(() => lombScargle(f64([0, 1, 2]), f64([0, 1, 2]), f64([1, 1, 1]))).toThrow(/epochs/);
    expect(() => lombScargle(f64([0, 1, 2, 3]), f64([0, 1, 2, 3]), f64([1, 1, 0, 1]))).toThrow(/errors\[2\]/);
    expect(() => lombScargle(f64([1, 1, 1, 1]), f64([0, 1, 2, 3]), f64([1, 1, 1, 1]))).toThrow(/epochs/);
    expect(() => lombScargle(f64([0, 1, 2, 3]), f64([0, 1, 2, 3]), f64([1, 1, 1, 1]), { oversample: 0.5 })).toThrow(/oversample/);
  });
});

describe('Baluev 2008 false-alarm probability', () => {
  it('reproduces the check values t = 0…19, ν_max = ½, Z = 0.6: Φ = 4.145e-4, W = 10.220, τ = 0.015350, FAP = 0.015641 (computed by an independent Python implementation of Baluev 2008; also regenerated in the fixture)', () => {
    const b = baluevFalseAlarm(0.6, 20, 0.5, 399 / 12); // Var of 0..19 = (20² − 1)/12
    expect(b.singleFrequencyFap).toBeCloseTo(4.145e-4, 7);
    expect(b.effectiveWidth).toBeCloseTo(10.220, 3);
    expect(b.tau).toBeCloseTo(0.015350, 6);
    expect(b.falseAlarmProbability).toBeCloseTo(0.015641, 6);
    expect(b.daviesBound).toBeCloseTo(0.015765, 6);
  });

  it('matches the Python reference for unequal errors and other N (relative ≤ 1e-12)', () => {
    for (const c of fixture.baluev) {
      const b = baluevFalseAlarm(c.Z, c.epochs.length, c.fmax, weightedVar(c.epochs, c.errors));
      expect(Math.abs(b.singleFrequencyFap / c.single - 1)).toBeLessThan(1e-12);
      expect(Math.abs(b.tau / c.tau - 1)).toBeLessThan(1e-12);
      expect(Math.abs(b.effectiveWidth / c.W - 1)).toBeLessThan(1e-12);
      expect(Math.abs(b.falseAlarmProbability / c.fap - 1)).toBeLessThan(1e-12);
      expect(Math.abs(b.daviesBound / c.davies - 1)).toBeLessThan(1e-12);
    }
  });

  it('single-frequency term (1 − Z)^{(N−3)/2}: N = 23, Z = ½ → 0.5¹⁰ (computed by hand)', () => {
    expect(baluevFalseAlarm(0.5, 23, 0.5, 10).singleFrequencyFap).toBe(Math.pow(0.5, 10));
  });

  it('the periodogram uses the same FAP (fixture data, weighted epoch variance)', () => {
    const { epochs, values, errors } = fixture.gls;
    const r = lombScargle(f64(epochs), f64(values), f64(errors));
    const b = baluevFalseAlarm(r.peakPower, epochs.length, 0.5, weightedVar(epochs, errors));
    expect(r.falseAlarmProbability).toBeCloseTo(b.falseAlarmProbability, 15);
  });

  it('is calibrated on pure noise: N = 20 with a gap, 3000 trials, Pr(FAP < 0.05) within 4 binomial σ of 0.05 (Monte Carlo; measured 0.049)', () => {
    const n = 20;
    const rng = createRng(3, n, 0);
    const trials = 3000;
    const e = Float64Array.from({ length: n }, (_, i) => i + (i > n / 2 ? 3 : 0));
    const s = new Float64Array(n).fill(1);
    const y = new Float64Array(n);
    let hits = 0;
    for (let k = 0; k < trials; k++) {
      for (let i = 0; i < n; i++) y[i] = rng.normal();
      if (lombScargle(e, y, s).falseAlarmProbability < 0.05) hits++;
    }
    const sd = Math.sqrt((0.05 * 0.95) / trials);
    expect(Math.abs(hits / trials - 0.05)).toBeLessThan(4 * sd);
  });

  it('returns NaN out of domain (kernel convention)', () => {
    expect(baluevFalseAlarm(1.2, 20, 0.5, 30).falseAlarmProbability).toBeNaN();
    expect(baluevFalseAlarm(0.5, 3, 0.5, 30).falseAlarmProbability).toBeNaN();
  });
});

describe('alias family', () => {
  it('Earth–Moon: P_B/P_S = 365.256363/27.321661 gives ν = 0.3687…, and P_S is a member (k = 13, +) (computed from the periods in the test)', () => {
    const pB = 365.256363;
    const pS = 27.321661;
    const ratio = pB / pS;
    const nu = Math.abs(ratio - Math.round(ratio));
    expect(nu).toBeCloseTo(0.36875, 4);
    const fam = aliasFamily(nu, pB, 5, 20);
    const hit = fam.find((c) => Math.abs(c.moonPeriod - pS) < 1e-9);
    expect(hit).toBeDefined();
    expect(hit!.k).toBe(13);
    expect(hit!.sign).toBe(1);
    // 5 ≤ k ± ν ≤ 20: k − ν for k = 6…20 (15) and k + ν for k = 5…19 (15)
    expect(fam.length).toBe(30);
    for (let i = 1; i < fam.length; i++) expect(fam[i].ratio).toBeGreaterThan(fam[i - 1].ratio);
    // every member aliases back to ν (definition)
    for (const c of fam) expect(Math.abs(Math.abs(c.ratio - Math.round(c.ratio)) - nu)).toBeLessThan(1e-12);
  });

  it('ν = ½ lists each half-integer ratio once', () => {
    const fam = aliasFamily(0.5, 10, 2, 5);
    expect(fam.map((c) => c.ratio)).toEqual([2.5, 3.5, 4.5]);
  });

  it('rejects ν outside [0, ½] and inverted ratio bounds', () => {
    expect(() => aliasFamily(0.6, 10, 2, 5)).toThrow(/nu/);
    expect(() => aliasFamily(0.2, 10, 5, 2)).toThrow(/maxRatio/);
    expect(() => aliasFamily(0.2, -1, 2, 5)).toThrow(/planetPeriod/);
  });
});

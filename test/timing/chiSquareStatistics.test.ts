import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { jointTimingExcess, tdvExcess, ttvExcess } from '../../src/timing/chiSquareStatistics.js';
import { createRng } from '../../src/noise/rng.js';

// scipy.stats.chi2.sf values for the hand-made cases, generated once by test/fixtures/detectionStatistics.py.
const fixture = JSON.parse(readFileSync(new URL('../fixtures/detectionStatistics.json', import.meta.url), 'utf8')) as {
  chi2: { x: number; df: number; sf: number }[];
};
const sf = (x: number, df: number): number => fixture.chi2.find((c) => c.x === x && c.df === df)!.sf;

/** KS statistic of a sample against U(0, 1). */
function ksUniform(sample: Float64Array): number {
  const s = Float64Array.from(sample).sort();
  const n = s.length;
  let d = 0;
  for (let i = 0; i < n; i++) d = Math.max(d, (i + 1) / n - s[i], s[i] - i / n);
  return d;
}
/** KS critical value at α = 0.001, asymptotic Kolmogorov distribution: sqrt(−ln(α/2)/2)/√n (common practice). */
const ksCritical = (n: number): number => Math.sqrt(-Math.log(0.0005) / 2) / Math.sqrt(n);

const f64 = (a: number[]): Float64Array => Float64Array.from(a);

describe('ttvExcess', () => {
  it('hand case: residual pattern (+1,−1,−1,+1) is orthogonal to the line, so χ² = Σ(r/σ)² = 16 (computed by hand)', () => {
    const epochs = f64([0, 1, 2, 3]);
    const times = f64([100 + 1, 100 + 7 - 1, 100 + 14 - 1, 100 + 21 + 1]);
    const res = new Float64Array(4);
    const r = ttvExcess(epochs, times, f64([0.5, 0.5, 0.5, 0.5]), res);
    expect(r.chiSquare).toBeCloseTo(16, 12);
    expect(r.dof).toBe(2);
    // χ²(2) survival = e^{−x/2} (closed form, DLMF 8.4.8 with a = 1); scipy.stats.chi2.sf(16, 2) agrees.
    expect(r.pValue).toBeCloseTo(Math.exp(-8), 15);
    expect(r.pValue).toBeCloseTo(sf(16, 2), 15);
    expect(r.period).toBeCloseTo(7, 12);
    expect(r.referenceTime).toBeCloseTo(100, 12);
    expect(Array.from(res).map((v) => Math.round(v * 1e9) / 1e9)).toEqual([1, -1, -1, 1]);
  });

  it('ephemeris errors: equal σ, epochs 0..3 → var(P) = σ²/Σ(E−Ē)² = σ²/5 (straight-line fit, computed by hand)', () => {
    const r = ttvExcess(f64([0, 1, 2, 3]), f64([0, 1, 2, 3]), f64([2, 2, 2, 2]));
    expect(r.periodError).toBeCloseTo(Math.sqrt(4 / 5), 14);
    // var(T0) = σ²(1/N + Ē²/Σ(E−Ē)²) = 4(1/4 + 2.25/5) = 2.8; cov = −Ē var(P) = −1.5·0.8
    expect(r.referenceTimeError).toBeCloseTo(Math.sqrt(2.8), 14);
    expect(r.covariance).toBeCloseTo(-1.2, 14);
    expect(r.chiSquare).toBeCloseTo(0, 20);
  });

  it('keeps precision with BJD-sized times in seconds (residuals to 1e-4 s; computed from the injected pattern)', () => {
    const bjd0S = 2_460_000.5 * 86400;
    const periodS = 12.345678 * 86400;
    const pattern = [3, -1, 4, -1, -5, 9, -2, -6, 5, -3];
    const epochs = f64(pattern.map((_, i) => i * 2 + 5));
    // pattern made orthogonal to (1, E) first, so the fit must return it unchanged
    const n = pattern.length;
    const e = Array.from(epochs);
    const eMean = e.reduce((s, v) => s + v, 0) / n;
    const pMean = pattern.reduce((s, v) => s + v, 0) / n;
    const slope = e.reduce((s, v, i) => s + (v - eMean) * (pattern[i] - pMean), 0) / e.reduce((s, v) => s + (v - eMean) ** 2, 0);
    const orth = pattern.map((p, i) => p - pMean - slope * (e[i] - eMean));
    const times = f64(e.map((E, i) => bjd0S + periodS * E + orth[i]));
    const res = new Float64Array(n);
    const r = ttvExcess(epochs, times, new Float64Array(n).fill(1), res);
    for (let i = 0; i < n; i++) expect(Math.abs(res[i] - orth[i])).toBeLessThan(1e-4);
    expect(Math.abs(r.period - periodS)).toBeLessThan(1e-6);
    // The inputs themselves are rounded to half an ulp (≈ 1.5e-5 s at 2e11 s), so χ² can move by
    // ≈ 2Σ|r|·1.5e-5 ≈ 1.5e-3 (computed from the pattern above).
    expect(Math.abs(r.chiSquare - orth.reduce((s, v) => s + v * v, 0))).toBeLessThan(3e-3);
  });

  it('rejects bad input with RangeError naming the argument', () => {
    expect(() => ttvExcess(f64([0, 1]), f64([0, 1]), f64([1, 1]))).toThrow(/epochs/);
    expect(() => ttvExcess(f64([0, 1, 2]), f64([0, 1]), f64([1, 1, 1]))).toThrow(/midTimes/);
    expect(() => ttvExcess(f64([0, 1, 2]), f64([0, 1, 2]), f64([1, 0, 1]))).toThrow(/midTimeErrors\[1\]/);
    expect(() => ttvExcess(f64([0, 1, 2]), f64([0, NaN, 2]), f64([1, 1, 1]))).toThrow(/midTimes\[1\]/);
    expect(() => ttvExcess(f64([2, 2, 2]), f64([0, 1, 2]), f64([1, 1, 1]))).toThrow(/epochs/);
  });
});

describe('tdvExcess', () => {
  it('hand case: durations (1,3,1,3), σ = 1 → mean 2, χ² = 4, 3 dof (computed by hand; p from scipy chi2.sf)', () => {
    const res = new Float64Array(4);
    const r = tdvExcess(f64([0, 1, 2, 3]), f64([1, 3, 1, 3]), f64([1, 1, 1, 1]), res);
    expect(r.chiSquare).toBeCloseTo(4, 14);
    expect(r.dof).toBe(3);
    expect(r.meanDuration).toBeCloseTo(2, 14);
    expect(r.meanDurationError).toBeCloseTo(0.5, 14);
    expect(r.pValue).toBeCloseTo(sf(4, 3), 13);
    expect(Array.from(res)).toEqual([-1, 1, -1, 1]);
  });

  it('weighted mean: durations (1, 3) with σ (1, 2) → mean (1 + 3/4)/(1 + 1/4) = 1.4, χ² = 0.16 + 0.64 = 0.8 (by hand)', () => {
    const r = tdvExcess(f64([0, 1]), f64([1, 3]), f64([1, 2]));
    expect(r.meanDuration).toBeCloseTo(1.4, 14);
    expect(r.chiSquare).toBeCloseTo(0.8, 14);
    expect(r.dof).toBe(1);
  });

  it('rejects N < 2 and bad errors', () => {
    expect(() => tdvExcess(f64([0]), f64([1]), f64([1]))).toThrow(RangeError);
    expect(() => tdvExcess(f64([0, 1]), f64([1, 1]), f64([1, -1]))).toThrow(/durationErrors\[1\]/);
  });
});

describe('jointTimingExcess', () => {
  it('adds χ² and dof: 16 (2 dof) + 4 (3 dof) = 20 with 5 dof = 2N − 3 for N = 4 (p from scipy chi2.sf)', () => {
    const epochs = f64([0, 1, 2, 3]);
    const ttv = ttvExcess(epochs, f64([1, 6, 13, 22]), f64([0.5, 0.5, 0.5, 0.5]));
    const tdv = tdvExcess(epochs, f64([1, 3, 1, 3]), f64([1, 1, 1, 1]));
    const j = jointTimingExcess(ttv, tdv);
    expect(j.chiSquare).toBeCloseTo(20, 12);
    expect(j.dof).toBe(2 * 4 - 3);
    expect(j.pValue).toBeCloseTo(sf(20, 5), 13);
  });
});

describe('p-values of pure noise are uniform (Monte Carlo; KS test at α = 0.001, common practice)', () => {
  it('TTV, TDV and joint p-values for N = 9 transits with unequal errors, 4000 realizations', () => {
    const trials = 4000;
    const n = 9;
    const epochs = f64([0, 1, 2, 4, 5, 7, 8, 11, 12]);
    const sig = f64([1, 2, 0.5, 1, 1.5, 3, 1, 0.7, 2]);
    const pT = new Float64Array(trials);
    const pD = new Float64Array(trials);
    const pJ = new Float64Array(trials);
    const rng = createRng(7, 0, 0);
    const t = new Float64Array(n);
    const d = new Float64Array(n);
    for (let k = 0; k < trials; k++) {
      for (let i = 0; i < n; i++) {
        t[i] = 5e10 + 86400 * 3.7 * epochs[i] + sig[i] * rng.normal();
        d[i] = 7200 + sig[i] * rng.normal();
      }
      const a = ttvExcess(epochs, t, sig);
      const b = tdvExcess(epochs, d, sig);
      pT[k] = a.pValue;
      pD[k] = b.pValue;
      pJ[k] = jointTimingExcess(a, b).pValue;
    }
    expect(ksUniform(pT)).toBeLessThan(ksCritical(trials));
    expect(ksUniform(pD)).toBeLessThan(ksCritical(trials));
    expect(ksUniform(pJ)).toBeLessThan(ksCritical(trials));
  });

  it('the KS check can fail: errors underestimated by 20 % give non-uniform TTV p-values', () => {
    const trials = 4000;
    const epochs = f64([0, 1, 2, 3, 4, 5, 6, 7, 8, 9]);
    const sig = new Float64Array(10).fill(1);
    const p = new Float64Array(trials);
    const rng = createRng(8, 0, 0);
    const t = new Float64Array(10);
    for (let k = 0; k < trials; k++) {
      for (let i = 0; i < 10; i++) t[i] = 10 * epochs[i] + 1.2 * rng.normal();
      p[k] = ttvExcess(epochs, t, sig).pValue;
    }
    expect(ksUniform(p)).toBeGreaterThan(ksCritical(trials));
  });
});

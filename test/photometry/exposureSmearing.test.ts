import { describe, it, expect } from 'vitest';
import { integrateExposure, supersampleCount, supersampleOffsets } from '../../src/photometry/exposureSmearing.js';
import { uniformFluxScalar } from '../../src/photometry/uniformFlux.js';

describe('supersampleCount', () => {
  it('is the smallest N with depth·T/(8N²τ) ≤ tolerance (bound derived in exposureSmearing.ts)', () => {
    // Expected: computed from the bound in the test: 0.01·1800/(8·N²·600) ≤ 1e-6 ⇒ N ≥ √3750 = 61.2 ⇒ 62.
    expect(supersampleCount(1800, 600, 0.01, 1e-6)).toBe(62);
    const n = supersampleCount(1800, 600, 0.01, 1e-6);
    expect((0.01 * 1800) / (8 * (n - 1) ** 2 * 600)).toBeGreaterThan(1e-6);
    expect(supersampleCount(60, 600, 0.01, 1e-3)).toBe(1); // bound already met (computed in the test)
    expect(supersampleCount(0, 600, 0.01, 1e-6)).toBe(1);
  });

  it('throws RangeError naming the argument', () => {
    expect(() => supersampleCount(-1, 600, 0.01, 1e-6)).toThrow(/exposureS/);
    expect(() => supersampleCount(60, 0, 0.01, 1e-6)).toThrow(/ingressS/);
    expect(() => supersampleCount(60, 600, NaN, 1e-6)).toThrow(/depth/);
    expect(() => supersampleCount(60, 600, 0.01, 0)).toThrow(/tolerance/);
  });
});

describe('supersampleOffsets', () => {
  it('are the centred midpoints (j − (n−1)/2)·T/n (midpoint rule, common practice)', () => {
    expect(Array.from(supersampleOffsets(60, 3))).toEqual([-20, 0, 20]);
    expect(Array.from(supersampleOffsets(60, 4))).toEqual([-22.5, -7.5, 7.5, 22.5]);
    expect(Array.from(supersampleOffsets(60, 1))).toEqual([0]);
    expect(() => supersampleOffsets(60, 0)).toThrow(/n must be/);
    expect(() => supersampleOffsets(60, 2.5)).toThrow(RangeError);
  });
});

describe('integrateExposure on a uniform-disc transit', () => {
  // Central transit (b = 0) of p = 0.1 crossing at speed v: z(t) = |v·t|,
  // ingress τ = 2p/v = 600 s, exposure T = 1800 s (Kepler long cadence-like).
  const p = 0.1;
  const tauS = 600;
  const v = (2 * p) / tauS;
  const T = 1800;
  const t0 = 1 / v; // contact region centred on z = 1
  const flux = (t: number): number => uniformFluxScalar(Math.abs(v * t), p);
  const model = (t: Float64Array, out: Float64Array): void => {
    for (let i = 0; i < t.length; i++) out[i] = flux(t[i]);
  };
  // Reference: the exact exposure mean by composite Simpson with 200 000 panels
  // (the integrand is continuous with bounded slope; its error is < 1e-12 here).
  const exactMean = (tc: number): number => {
    const m = 200_000;
    const h = T / m;
    let s = flux(tc - T / 2) + flux(tc + T / 2);
    for (let k = 1; k < m; k++) s += (k % 2 ? 4 : 2) * flux(tc - T / 2 + k * h);
    return (s * h) / 3 / T;
  };
  const times = new Float64Array(41);
  for (let i = 0; i < times.length; i++) times[i] = t0 - 2400 + 120 * i;

  for (const tol of [1e-5, 1e-6]) {
    it(`error stays below the stated bound, tolerance ${tol}`, () => {
      const n = supersampleCount(T, tauS, p * p, tol);
      const out = integrateExposure(times, T, n, model, new Float64Array(times.length));
      let worst = 0;
      for (let i = 0; i < times.length; i++) worst = Math.max(worst, Math.abs(out[i] - exactMean(times[i])));
      expect(worst).toBeLessThan(tol);
      // and the unsmeared model really differs by far more (the test can fail):
      let raw = 0;
      for (let i = 0; i < times.length; i++) raw = Math.max(raw, Math.abs(flux(times[i]) - exactMean(times[i])));
      expect(raw).toBeGreaterThan(100 * tol);
    });
  }

  it('n = 1 returns the model at the mid-times; rejects out aliasing times', () => {
    const out = integrateExposure(times, T, 1, model, new Float64Array(times.length));
    for (let i = 0; i < times.length; i++) expect(out[i]).toBe(flux(times[i]));
    expect(() => integrateExposure(times, T, 3, model, times)).toThrow(/share memory/);
    expect(() => integrateExposure(times, T, 3, model, new Float64Array(2))).toThrow(/out.length/);
  });
});

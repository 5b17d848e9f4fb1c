import { describe, it, expect } from 'vitest';
import { createRng } from '../../src/noise/rng.js';
import { dampedRandomWalkKernel, dampedRandomWalkNoise } from '../../src/noise/dampedRandomWalkNoise.js';

describe('dampedRandomWalkNoise (Kelly, Bechtold & Siemiginowska 2009)', () => {
  it('lag autocorrelation equals exp(−Δt/τ)', () => {
    // Expected ρ(Δt) = e^{−Δt/τ}: exponential covariance of the DRW (Kelly et al. 2009, ApJ 698, 895, Sect. 2).
    // Ensemble of 400 series × 500 points; tolerance 5 SE from Bartlett's (1946, J. R. Stat. Soc. Suppl. 8, 27)
    // large-sample variance of a sample autocorrelation, AR(1) form with φ = e^{−Δt/τ}:
    // Var(r_L) ≈ [(1 + φ²)(1 − φ^{2L})/(1 − φ²) − 2Lφ^{2L}] / N.
    const dt = 60;
    const tau = 600;
    const n = 500;
    const t = Float64Array.from({ length: n }, (_, k) => k * dt);
    const x = new Float64Array(n);
    const rng = createRng(21, 0, 0);
    const lags = [1, 5, 10, 20];
    const cov = new Float64Array(lags.length);
    let v = 0;
    let cnt = 0;
    const cnts = new Float64Array(lags.length);
    for (let r = 0; r < 400; r++) {
      dampedRandomWalkNoise(t, tau, 1e-3, rng, x);
      for (let k = 0; k < n; k++) { v += x[k] * x[k]; cnt++; }
      lags.forEach((L, i) => {
        for (let k = 0; k + L < n; k++) { cov[i] += x[k] * x[k + L]; cnts[i]++; }
      });
    }
    v /= cnt;
    const phi = Math.exp(-dt / tau);
    lags.forEach((L, i) => {
      const p2L = phi ** (2 * L);
      const se = Math.sqrt(((1 + phi * phi) * (1 - p2L) / (1 - phi * phi) - 2 * L * p2L) / cnt);
      expect(Math.abs(cov[i] / cnts[i] / v - Math.exp(-(L * dt) / tau))).toBeLessThan(5 * se);
    });
  });

  it('is stationary: variance σ² at the first point, mid-series and after a long gap', () => {
    // Stationary start x_0 ~ N(0, σ²) and exact update keep Var = σ² at every time (Kelly et al. 2009, eq. 4
    // with the stationary variance). 4000 realizations: SE of the variance ratio 2.2 %; allow 10 %.
    const sigma = 5e-4;
    const t = Float64Array.of(0, 10, 20, 30, 1e6, 1e6 + 10, 1e6 + 20, 1e6 + 1e4);
    const x = new Float64Array(t.length);
    const rng = createRng(22, 0, 0);
    const s2 = new Float64Array(t.length);
    const R = 4000;
    for (let r = 0; r < R; r++) {
      dampedRandomWalkNoise(t, 300, sigma, rng, x);
      for (let k = 0; k < t.length; k++) s2[k] += x[k] * x[k];
    }
    for (let k = 0; k < t.length; k++) expect(Math.abs(s2[k] / R / (sigma * sigma) - 1)).toBeLessThan(0.1);
  });

  it('decorrelates across a gap much longer than τ and keeps points with equal times identical', () => {
    // ρ(Δt ≫ τ) = e^{−Δt/τ} ≈ 0 and ρ(0) = 1 (Kelly et al. 2009). 4000 realizations: SE 0.016; allow 0.08.
    const t = Float64Array.of(0, 0, 1e5);
    const x = new Float64Array(3);
    const rng = createRng(23, 0, 0);
    let c = 0, v = 0;
    for (let r = 0; r < 4000; r++) {
      dampedRandomWalkNoise(t, 100, 1, rng, x);
      expect(x[1]).toBe(x[0]);
      c += x[0] * x[2];
      v += x[0] * x[0];
    }
    expect(Math.abs(c / v)).toBeLessThan(0.08);
  });

  it('kernel returns NaN out of domain; the public function throws RangeError', () => {
    const t = Float64Array.of(0, 2, 1);
    const out = new Float64Array(3);
    dampedRandomWalkKernel(3, out, t, 10, 1, createRng(1, 0, 0));
    expect(Number.isNaN(out[2])).toBe(true);
    expect(Number.isNaN(out[1])).toBe(false);
    dampedRandomWalkKernel(3, out, Float64Array.of(0, 1, 2), -1, 1, createRng(1, 0, 0));
    expect(Array.from(out).every(Number.isNaN)).toBe(true);
    expect(() => dampedRandomWalkNoise(t, 10, 1, createRng(1, 0, 0))).toThrow(/timeS/);
    expect(() => dampedRandomWalkNoise(Float64Array.of(0, 1), 0, 1, createRng(1, 0, 0))).toThrow(/tauS/);
    expect(() => dampedRandomWalkNoise(Float64Array.of(0, 1), 1, -1, createRng(1, 0, 0))).toThrow(/sigma/);
  });
});

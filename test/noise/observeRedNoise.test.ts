/**
 * Correlated noise across transit windows (issue 17, item 5): every window is
 * its own stretch of the stated noise process. Many seeded realizations of an
 * invented system, the residual flux − model (white noise off) per window.
 */
import { describe, it, expect } from 'vitest';
import { parseScenarioText } from '../../src/scenario/loadScenario.js';
import { observeScenario } from '../../src/noise/observe.js';
import { powerLawTransformSize } from '../../src/noise/powerLawNoise.js';
import { createRng } from '../../src/noise/rng.js';

const scenario = (red: string) => `
name: red noise across windows (invented)
seed: 5
star: {mass: 0.8 Msun, radius: 0.8 Rsun, teff: 5000 K, limb_darkening: {u1: 0.5, u2: 0.2}}
planet: {mass: 0.5 Mjup, radius: 0.9 Rjup, period: 5 d, impact_parameter: 0.2}
instrument: {cadence: 2 min, noise: 0 ppm, red_noise: ${red}}
observation: {transits: 6, baseline: 1 h}
`;

/** Residuals per realization and window: res[r][w] (flux − model of window w's samples). */
function residuals(text: string, realizations: number, cell: number): Float64Array[][] {
  const s = parseScenarioText(text);
  const out: Float64Array[][] = [];
  for (let r = 0; r < realizations; r++) {
    const o = observeScenario(s, createRng(s.seed, cell, r));
    const perWindow: Float64Array[] = [];
    let start = 0;
    for (let i = 1; i <= o.timeS.length; i++) {
      if (i < o.timeS.length && o.epoch[i] === o.epoch[start]) continue;
      const x = new Float64Array(i - start);
      for (let k = start; k < i; k++) x[k - start] = o.flux[k] - o.model[k];
      perWindow.push(x);
      start = i;
    }
    out.push(perWindow);
  }
  return out;
}

const mean = (x: Float64Array) => x.reduce((a, v) => a + v, 0) / x.length;
const meanSquare = (x: Float64Array) => x.reduce((a, v) => a + v * v, 0) / x.length;

/**
 * Expected variance of a k-point mean of the power-law noise, relative to that of an m-point mean,
 * for a transform of length n: the Timmer & König (1995, A&A 300, 707, Sect. 3) spectrum S_j ∝ j^−β
 * (Re and Im each of variance S_j/2, Nyquist term real) through the power transfer of a k-point
 * boxcar mean, the Fejér kernel [sin(πjk/n)/(k sin(πj/n))]² (standard result, from the geometric sum).
 */
function binnedVarianceRatio(beta: number, k: number, m: number, n: number): number {
  const g = (b: number) => {
    let v = 0;
    for (let j = 1; j <= n / 2; j++) {
      const f = b === 1 ? 1 : (Math.sin((Math.PI * j * b) / n) / (b * Math.sin((Math.PI * j) / n))) ** 2;
      v += (j === n / 2 ? 1 : 2) * j ** -beta * f;
    }
    return v;
  };
  return g(k) / g(m);
}

describe('power-law red noise: one independent block per window (issue 17)', () => {
  const R = 2000;
  const W = 6;
  const rms = 300e-6;
  const timescaleS = 12 * 3600; // 12 h: longer than the ~4.5-h windows, the case that used to spill
  const cadenceS = 120;
  for (const beta of [1, 2]) {
    it(`β = ${beta}: equal per-window variance, uncorrelated windows, stated rms at the stated timescale`, () => {
      const res = residuals(scenario(`{model: power_law, amplitude: 300 ppm per 12 h, slope: ${beta}}`), R, beta);
      expect(res[0].length).toBe(W);
      const L = res[0].map((x) => x.length);
      expect(Math.max(...L)).toBeLessThan(timescaleS / cadenceS); // the windows are shorter than the timescale

      // (1) Per-point variance of each window, over R realizations. A window's mean square is an average of
      // Gaussian squares, so its variance is at most 2v² (Cauchy–Schwarz): relative standard error ≤ sqrt(2/R)
      // = 3.2 % for R = 2000. Allow 4 standard errors (common practice, no source).
      const v = Array.from({ length: W }, (_, w) => res.reduce((a, r) => a + meanSquare(r[w]), 0) / R);
      const vAll = v.reduce((a, x) => a + x, 0) / W;
      for (let w = 0; w < W; w++) expect(Math.abs(v[w] / vAll - 1)).toBeLessThan(4 * Math.sqrt(2 / R));

      // (2) Correlation of the window means between adjacent windows. For independent windows each estimate has
      // standard error 1/sqrt(R) = 0.022 and the W − 1 estimates are uncorrelated, so their mean has 1/sqrt(R(W − 1));
      // allow 4 standard errors (common practice, no source).
      const means = res.map((r) => r.map(mean));
      const rho: number[] = [];
      for (let w = 0; w + 1 < W; w++) {
        let xy = 0, xx = 0, yy = 0;
        for (const m of means) {
          xy += m[w] * m[w + 1];
          xx += m[w] * m[w];
          yy += m[w + 1] * m[w + 1];
        }
        rho.push(xy / Math.sqrt(xx * yy));
      }
      for (const c of rho) expect(Math.abs(c)).toBeLessThan(4 / Math.sqrt(R));
      expect(Math.abs(rho.reduce((a, c) => a + c, 0) / rho.length)).toBeLessThan(4 / Math.sqrt(R * (W - 1)));

      // (3) Amplitude. A window is shorter than the stated 12-h timescale, so its longest average, the window
      // mean, is compared with the variance the stated rms implies for an L-point mean (binnedVarianceRatio, the
      // spectrum as generated: transform length for max(L, 12 h) points). Window means are Gaussian and, by (2),
      // independent: the pooled mean square of R·W of them has relative standard error sqrt(2/(R·W)) = 1.3 %;
      // allow 4 standard errors (common practice, no source).
      const m = Math.round(timescaleS / cadenceS);
      let measured = 0;
      let expected = 0;
      for (let w = 0; w < W; w++) {
        const n = powerLawTransformSize(Math.max(L[w], Math.ceil(timescaleS / cadenceS)));
        expected += rms * rms * binnedVarianceRatio(beta, L[w], m, n);
        measured += means.reduce((a, r) => a + r[w] * r[w], 0) / R;
      }
      expect(Math.abs(measured / expected - 1)).toBeLessThan(4 * Math.sqrt(2 / (R * W)));
    });
  }
});

describe('damped random walk: windows are draws of one stationary process', () => {
  it('equal per-window variance σ², and adjacent windows correlated as e^{−P/τ} (Kelly et al. 2009)', () => {
    // τ = 5 d = the period, so points one period apart correlate as e^{−1} = 0.368 (Kelly, Bechtold &
    // Siemiginowska 2009, ApJ 698, 895: covariance σ² e^{−|Δt|/τ}); the windows' samples sit exactly one period
    // apart (5 d is a whole number of 2-min cadences).
    const R = 2000;
    const W = 6;
    const sigma = 200e-6;
    const res = residuals(scenario('{model: drw, amplitude: 200 ppm, timescale: 5 d}'), R, 7);
    // Per-window variance σ² (stationary start, Kelly et al. 2009): relative SE ≤ sqrt(2/R) as above; 4 SE.
    for (let w = 0; w < W; w++) {
      const v = res.reduce((a, r) => a + meanSquare(r[w]), 0) / R;
      expect(Math.abs(v / (sigma * sigma) - 1)).toBeLessThan(4 * Math.sqrt(2 / R));
    }
    // Point-by-point correlation one period apart, pooled over the window's points (strongly correlated with
    // each other, so counted as one draw per realization): SE ≈ (1 − ρ²)/sqrt(R) = 0.019 (Fisher 1915, large-sample
    // variance of a correlation coefficient); 4 SE.
    const expected = Math.exp(-1);
    for (let w = 0; w + 1 < W; w++) {
      let xy = 0, xx = 0, yy = 0;
      for (const r of res) {
        const a = r[w];
        const b = r[w + 1];
        expect(b.length).toBe(a.length);
        for (let k = 0; k < a.length; k++) {
          xy += a[k] * b[k];
          xx += a[k] * a[k];
          yy += b[k] * b[k];
        }
      }
      expect(Math.abs(xy / Math.sqrt(xx * yy) - expected)).toBeLessThan((4 * (1 - expected ** 2)) / Math.sqrt(R));
    }
  });
});

import { describe, it, expect } from 'vitest';
import FFT from 'fft.js';
import { createRng } from '../../src/noise/rng.js';
import {
  PowerLawNoiseWorkspace,
  powerLawNoise,
  powerLawNoisePeriodic,
  powerLawTransformSize,
} from '../../src/noise/powerLawNoise.js';

/** Least-squares slope of log10(P) against log10(j) for j in [j0, j1). */
function logLogSlope(p: Float64Array, j0: number, j1: number): number {
  let sx = 0, sy = 0, sxx = 0, sxy = 0, n = 0;
  for (let j = j0; j < j1; j++) {
    const x = Math.log10(j);
    const y = Math.log10(p[j]);
    sx += x; sy += y; sxx += x * x; sxy += x * y; n++;
  }
  return (n * sxy - sx * sy) / (n * sxx - sx * sx);
}

/** Add |DFT(x·w)|² for j = 0 … n/2 into acc (x real, n a power of two). */
function accumulatePeriodogram(x: Float64Array, w: Float64Array | null, fft: FFT, acc: Float64Array): void {
  const n = x.length;
  const input = new Float64Array(n);
  for (let k = 0; k < n; k++) input[k] = w ? x[k] * w[k] : x[k];
  const out = new Float64Array(2 * n);
  fft.realTransform(out, input);
  for (let j = 0; j <= n / 2; j++) acc[j] += out[2 * j] ** 2 + out[2 * j + 1] ** 2;
}

describe('powerLawNoisePeriodic (Timmer & König 1995)', () => {
  for (const beta of [0, 1, 2]) {
    it(`mean periodogram has log-log slope −β for β = ${beta}`, () => {
      // Expected slope −β: Timmer & König 1995, A&A 300, 707, Sect. 3 (the generated spectrum is S ∝ f^−β).
      // 64 realizations of N = 1024: the slope's scatter is ≈ 0.01; allow 0.05.
      const n = 1024;
      const ws = new PowerLawNoiseWorkspace(n);
      const fft = new FFT(n);
      const acc = new Float64Array(n / 2 + 1);
      const rng = createRng(11, beta, 0);
      const x = new Float64Array(n);
      for (let r = 0; r < 64; r++) {
        const series = powerLawNoisePeriodic(ws, beta, 1, 1e-3, rng);
        for (let k = 0; k < n; k++) x[k] = series[2 * k];
        accumulatePeriodogram(x, null, fft, acc);
      }
      expect(acc[0]).toBeLessThan(1e-20); // zero-mean term set to 0 (Timmer & König 1995, step 3)
      expect(Math.abs(logLogSlope(acc, 1, n / 2) + beta)).toBeLessThan(0.05);
    });
  }

  it('produces a real series (imaginary parts vanish: Hermitian spectrum)', () => {
    const ws = new PowerLawNoiseWorkspace(256);
    const s = powerLawNoisePeriodic(ws, 1.5, 4, 1e-3, createRng(1, 1, 1));
    let maxIm = 0, maxRe = 0;
    for (let k = 0; k < 256; k++) {
      maxIm = Math.max(maxIm, Math.abs(s[2 * k + 1]));
      maxRe = Math.max(maxRe, Math.abs(s[2 * k]));
    }
    expect(maxIm).toBeLessThan(1e-12 * maxRe);
  });
});

describe('powerLawNoise (cropped output)', () => {
  for (const beta of [0, 1, 2]) {
    it(`keeps slope −β after cropping (Hann-windowed periodogram), β = ${beta}`, () => {
      // Timmer & König 1995, Sect. 3: crop a longer series. The Hann window's side lobes fall as f^−6, so leakage
      // does not flatten β ≤ 2 (common practice, no source). Bins 4 … n/4 avoid the window's main lobe at low j and
      // aliasing near Nyquist; allow 0.1.
      const n = 1024;
      const fft = new FFT(n);
      const w = new Float64Array(n);
      for (let k = 0; k < n; k++) w[k] = Math.sin((Math.PI * k) / n) ** 2;
      const acc = new Float64Array(n / 2 + 1);
      const ws = new PowerLawNoiseWorkspace(powerLawTransformSize(n));
      const x = new Float64Array(n);
      const rng = createRng(12, beta, 0);
      for (let r = 0; r < 64; r++) {
        powerLawNoise(x, { dtS: 60, beta, rmsFraction: 1e-3, timescaleS: 60 }, rng, ws);
        accumulatePeriodogram(x, w, fft, acc);
      }
      expect(Math.abs(logLogSlope(acc, 4, n / 4) + beta)).toBeLessThan(0.1);
    });

    it(`ensemble rms of means over the stated timescale equals rmsFraction, β = ${beta}`, () => {
      // The amplitude convention in powerLawNoise.ts (rms of m-point means about zero). 2000 realizations,
      // 32 blocks each; the blocks of one realization are correlated for red noise, so the effective sample is
      // ≥ 2000: relative SE of the variance ≤ sqrt(2/2000) = 3 %; allow 15 % (5 SE).
      const n = 512;
      const m = 16;
      const target = 2e-4;
      const ws = new PowerLawNoiseWorkspace(powerLawTransformSize(n));
      const x = new Float64Array(n);
      const rng = createRng(13, beta, 0);
      let sum = 0;
      let count = 0;
      for (let r = 0; r < 2000; r++) {
        powerLawNoise(x, { dtS: 120, beta, rmsFraction: target, timescaleS: m * 120 }, rng, ws);
        for (let b = 0; b < n / m; b++) {
          let mean = 0;
          for (let k = 0; k < m; k++) mean += x[b * m + k];
          sum += (mean / m) ** 2;
          count++;
        }
      }
      expect(Math.abs(sum / count / (target * target) - 1)).toBeLessThan(0.15);
    });
  }

  it('β = 0 reduces to white noise with the √t law: per-point sd = rmsFraction·sqrt(m)', () => {
    // White-noise scaling (Pont, Zucker & Queloz 2006, eq. 1, white term). 1e5 points: SE of sd ≈ 0.2 %; allow 1.5 %.
    const n = 1 << 15;
    const x = new Float64Array(n);
    let ss = 0;
    let cnt = 0;
    const rng = createRng(14, 0, 0);
    for (let r = 0; r < 4; r++) {
      powerLawNoise(x, { dtS: 60, beta: 0, rmsFraction: 1e-4, timescaleS: 3600 }, rng);
      for (const v of x) { ss += v * v; cnt++; }
    }
    expect(Math.abs(Math.sqrt(ss / cnt) / (1e-4 * Math.sqrt(60)) - 1)).toBeLessThan(0.015);
  });

  it('is reproducible from the seed and validates its arguments', () => {
    const opts = { dtS: 60, beta: 1, rmsFraction: 1e-4, timescaleS: 600 };
    const a = powerLawNoise(new Float64Array(300), opts, createRng(5, 0, 0));
    const b = powerLawNoise(new Float64Array(300), opts, createRng(5, 0, 0));
    expect(Array.from(b)).toEqual(Array.from(a));
    expect(powerLawTransformSize(300)).toBe(1024);
    expect(powerLawTransformSize(1)).toBe(4);
    expect(() => powerLawNoise(new Float64Array(10), { ...opts, beta: -1 }, createRng(1, 0, 0))).toThrow(/beta/);
    expect(() => powerLawNoise(new Float64Array(10), { ...opts, dtS: 0 }, createRng(1, 0, 0))).toThrow(/dtS/);
    expect(() => powerLawNoise(new Float64Array(10), { ...opts, rmsFraction: NaN }, createRng(1, 0, 0))).toThrow(/rmsFraction/);
    expect(() => powerLawNoise(new Float64Array(0), opts, createRng(1, 0, 0))).toThrow(/out/);
    expect(() => powerLawNoise(new Float64Array(10), opts, createRng(1, 0, 0), new PowerLawNoiseWorkspace(64))).toThrow(/workspace/);
  });
});

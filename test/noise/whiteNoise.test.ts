import { describe, it, expect } from 'vitest';
import { createRng } from '../../src/noise/rng.js';
import { addWhiteNoise, whiteNoiseSigma } from '../../src/noise/whiteNoise.js';

describe('whiteNoiseSigma', () => {
  it('scales a stated precision by sqrt(t_ref / t_exp)', () => {
    // Expected values computed by hand from σ_ref·sqrt(t_ref/t_exp) (Pont, Zucker & Queloz 2006, eq. 1, white term):
    // 60 ppm per 1 h → 2-min exposures: 60e-6·sqrt(30) = 3.286335345e-4.
    expect(whiteNoiseSigma(60e-6, 3600, 120)).toBeCloseTo(3.286335345030997e-4, 15);
    // 800 ppm per 2 min → 1 h: 800e-6/sqrt(30) = 1.460593486e-4.
    expect(whiteNoiseSigma(800e-6, 120, 3600)).toBeCloseTo(1.4605934866804428e-4, 15);
    // 30 ppm per 6.5 h → 1 h: 30e-6·sqrt(6.5) = 76.49 ppm.
    expect(whiteNoiseSigma(30e-6, 6.5 * 3600, 3600)).toBeCloseTo(7.648529270389178e-5, 15);
    expect(whiteNoiseSigma(0, 3600, 60)).toBe(0);
  });

  it('round-trips: binning the per-exposure noise back to the stated timescale recovers the stated level', () => {
    // Property of the √t law (common practice, no source).
    for (const [level, tRef, tExp] of [[1e-3, 60, 2], [5e-5, 3600, 58.85], [2e-4, 1800, 1800]]) {
      const s = whiteNoiseSigma(level, tRef, tExp);
      expect(whiteNoiseSigma(s, tExp, tRef)).toBeCloseTo(level, 15);
    }
  });

  it('throws RangeError naming the bad argument', () => {
    expect(() => whiteNoiseSigma(-1e-6, 3600, 60)).toThrow(/noiseFraction/);
    expect(() => whiteNoiseSigma(1e-6, 0, 60)).toThrow(/timescaleS/);
    expect(() => whiteNoiseSigma(1e-6, 3600, NaN)).toThrow(/exposureS/);
  });
});

describe('addWhiteNoise', () => {
  it('adds noise of the requested standard deviation, binned rms following 1/sqrt(N)', () => {
    // Sample sd within 5 standard errors (sd of the sample sd ≈ σ/sqrt(2n)); binned rms of 60-point
    // means ≈ σ/sqrt(60) within 5 SE (common practice, no source).
    const n = 240_000;
    const sigma = whiteNoiseSigma(60e-6, 3600, 60);
    const flux = new Float64Array(n).fill(1);
    addWhiteNoise(flux, sigma, createRng(1, 2, 3));
    let ss = 0;
    for (const f of flux) ss += (f - 1) ** 2;
    const sd = Math.sqrt(ss / n);
    expect(Math.abs(sd / sigma - 1)).toBeLessThan(5 / Math.sqrt(2 * n));
    const m = 60;
    const nb = n / m;
    let sb = 0;
    for (let b = 0; b < nb; b++) {
      let mean = 0;
      for (let k = 0; k < m; k++) mean += flux[b * m + k] - 1;
      sb += (mean / m) ** 2;
    }
    const binned = Math.sqrt(sb / nb);
    expect(Math.abs(binned / 60e-6 - 1)).toBeLessThan(5 / Math.sqrt(2 * nb));
  });

  it('is reproducible, equals Rng.fillNormal for a scalar sigma, and accepts per-point sigma', () => {
    const a = addWhiteNoise(new Float64Array(500), 1e-3, createRng(4, 4, 4));
    const b = new Float64Array(500);
    createRng(4, 4, 4).fillNormal(b, 1e-3);
    expect(Array.from(a)).toEqual(Array.from(b));
    const per = new Float64Array(500).fill(1e-3);
    const c = addWhiteNoise(new Float64Array(500), per, createRng(4, 4, 4));
    expect(Array.from(c)).toEqual(Array.from(a));
    expect(() => addWhiteNoise(new Float64Array(3), new Float64Array(2), createRng(1, 1, 1))).toThrow(/sigma/);
    expect(() => addWhiteNoise(new Float64Array(3), -1, createRng(1, 1, 1))).toThrow(/sigma/);
  });
});

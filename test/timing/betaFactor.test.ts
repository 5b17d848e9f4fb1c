import { describe, it, expect } from 'vitest';
import { betaFactor, betaForBinSize, binSizesForTimescale } from '../../src/timing/betaFactor.js';
import { createRng } from '../../src/noise/rng.js';

describe('betaFactor (time-averaging method)', () => {
  it('gives √2·√((M−1)/M) for residuals +1, +1, −1, −1, … binned in pairs', () => {
    // Hand computation from the definition (Winn et al. 2008, §3; from memory): bin means ±1 so σ_N = 1,
    // σ₁ = 1, M = 100 bins, white expectation (1/√2)·√(M/(M − 1)).
    const r = new Float64Array(200);
    for (let i = 0; i < 200; i++) r[i] = (i >> 1) % 2 === 0 ? 1 : -1;
    const b = betaForBinSize(r, Int32Array.of(0, 200), 2);
    expect(b.bins).toBe(100);
    expect(b.beta).toBeCloseTo(Math.SQRT2 * Math.sqrt(99 / 100), 14);
  });

  it('floors at 1 unless asked not to; alternating residuals average to 0 in pairs', () => {
    // Hand computation: +1, −1, … binned in pairs gives σ_N = 0, so β_N = 0.
    const r = new Float64Array(100);
    for (let i = 0; i < 100; i++) r[i] = i % 2 === 0 ? 1 : -1;
    expect(betaFactor(r, Int32Array.of(0, 100), Int32Array.of(2)).beta).toBe(1);
    expect(betaFactor(r, Int32Array.of(0, 100), Int32Array.of(2), { floorAtOne: false }).beta).toBe(0);
  });

  it('never lets a bin span two segments', () => {
    // Hand computation: segments [1, 1, 1] and [−1, −1, −1] with N = 2: bins (1, 1) and (−1, −1) only
    // (the tail points are dropped), σ_N = 1, σ₁ = 1, M = 2 → β = √2·√(1/2) = 1.
    const r = Float64Array.of(1, 1, 1, -1, -1, -1);
    const b = betaForBinSize(r, Int32Array.of(0, 3, 6), 2);
    expect(b.bins).toBe(2);
    expect(b.beta).toBeCloseTo(1, 14);
  });

  it('is 1 for white noise (to its sampling error)', () => {
    // Statistical: M = 20 000 bins of 10 → relative standard error of σ_N ≈ 1/√(2M) = 0.5 %; tolerance 3 %.
    const r = new Float64Array(200_000);
    createRng(11, 0, 0).fillNormal(r, 1);
    const b = betaFactor(r, Int32Array.of(0, r.length), Int32Array.of(8, 10, 12), { floorAtOne: false });
    expect(Math.abs(b.beta - 1)).toBeLessThan(0.03);
  });

  it('recovers sqrt(σw²/N + σr²)/sqrt((σw² + σr²)/N) for a red component constant over long blocks', () => {
    // Pont, Zucker & Queloz 2006 (MNRAS 373, 231): σ_N² = σ_w²/N + σ_r² (from memory). Red part constant
    // over blocks of 100 points (bins of 10 never straddle a block); σw = 1, σr = 0.5, N = 10 → β = 1.6733.
    // Statistical tolerance 5 %: the red variance is estimated from 2000 blocks (≈ 3 % relative on β).
    const n = 200_000;
    const r = new Float64Array(n);
    const rng = createRng(12, 0, 0);
    rng.fillNormal(r, 1);
    for (let k = 0; k < n; k += 100) {
      const red = 0.5 * rng.normal();
      for (let j = k; j < k + 100; j++) r[j] += red;
    }
    const expected = Math.sqrt(1 / 10 + 0.25) / Math.sqrt(1.25 / 10);
    const b = betaFactor(r, Int32Array.of(0, n), Int32Array.of(10));
    expect(Math.abs(b.beta / expected - 1)).toBeLessThan(0.05);
  });

  it('chooses bin sizes spanning the requested timescales', () => {
    // Common practice, no source: 0.5–2 ingress durations at the cadence (here 15 min at 2 min: 4…15 points).
    expect(Array.from(binSizesForTimescale(450, 1800, 120, 20))).toEqual([4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15]);
    const thinned = binSizesForTimescale(450, 18_000, 120, 5);
    expect(thinned.length).toBe(5);
    expect(thinned[0]).toBe(4);
    expect(thinned[4]).toBe(150);
  });

  it('rejects malformed input', () => {
    expect(() => betaFactor(new Float64Array(4), Int32Array.of(0, 4), new Int32Array(0))).toThrow(/binSizes/);
    expect(() => betaFactor(new Float64Array(4), Int32Array.of(0, 5), Int32Array.of(2))).toThrow(/segmentStarts/);
    expect(() => binSizesForTimescale(1, 2, 0)).toThrow(/cadenceS/);
  });
});

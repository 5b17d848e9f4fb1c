import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { ephemerisTime, fitLinearEphemeris } from '../../src/timing/linearEphemeris.js';

interface Case {
  epochs: number[];
  timesS: number[];
  errS: number[];
  periodS: number;
  t0S: number;
  varPeriod: number;
  varT0: number;
  covT0Period: number;
  chi2: number;
}
const fixture = JSON.parse(readFileSync(new URL('../fixtures/linearEphemeris.json', import.meta.url), 'utf8')) as { cases: Case[] };

describe('fitLinearEphemeris', () => {
  it('solves a three-point case by the normal equations', () => {
    // Hand-solved (common practice, no source): n = 0, 1, 2; t = 10, 20, 31; σ = 1.
    // S = 3, Sx = 3, Sxx = 5, Sy = 61, Sxy = 82, Δ = 6 → T0 = 59/6, P = 21/2,
    // var T0 = 5/6, var P = 1/2, cov = −1/2; residuals 1/6, −1/3, 1/6 → χ² = 1/6.
    const e = fitLinearEphemeris([0, 1, 2], [10, 20, 31], [1, 1, 1]);
    expect(e.t0S).toBeCloseTo(59 / 6, 12);
    expect(e.periodS).toBeCloseTo(10.5, 12);
    expect(e.t0ErrS).toBeCloseTo(Math.sqrt(5 / 6), 12);
    expect(e.periodErrS).toBeCloseTo(Math.sqrt(0.5), 12);
    expect(e.covT0PeriodS2).toBeCloseTo(-0.5, 12);
    expect(e.chi2).toBeCloseTo(1 / 6, 12);
    expect(e.dof).toBe(1);
    // Prediction variance at n = 3: 5/6 + 2·3·(−1/2) + 9·(1/2) = 7/3 (same hand computation).
    const p = ephemerisTime(e, 3);
    expect(p.timeS).toBeCloseTo(59 / 6 + 31.5, 12);
    expect(p.errS).toBeCloseTo(Math.sqrt(7 / 3), 12);
  });

  it('weights points by 1/σ²: a point with a huge error is ignored', () => {
    // Computed in the test: the line through (0, 100) and (10, 1100) is exact; the outlier has σ = 1e9.
    const e = fitLinearEphemeris([0, 5, 10], [100, 1e6, 1100], [1, 1e9, 1]);
    expect(e.periodS).toBeCloseTo(100, 6);
    expect(e.t0S).toBeCloseTo(100, 6);
  });

  it('matches numpy.polyfit(deg=1, w=1/σ, cov="unscaled")', () => {
    // Reference: test/fixtures/linearEphemeris.json from numpy 2.4.6 (generator committed beside it).
    for (const c of fixture.cases) {
      const e = fitLinearEphemeris(c.epochs, c.timesS, c.errS);
      // Times ~1e7 s: agreement to ~1e-9 s absolute (rounding of the two algorithms).
      expect(Math.abs(e.t0S - c.t0S)).toBeLessThan(1e-8 * Math.max(1, Math.abs(c.t0S)));
      expect(Math.abs(e.periodS - c.periodS) / c.periodS).toBeLessThan(1e-13);
      expect(e.t0ErrS ** 2 / c.varT0).toBeCloseTo(1, 10);
      expect(e.periodErrS ** 2 / c.varPeriod).toBeCloseTo(1, 10);
      expect(e.covT0PeriodS2 / c.covT0Period).toBeCloseTo(1, 10);
      expect(e.chi2 / c.chi2).toBeCloseTo(1, 8);
    }
  });

  it('rejects bad input with RangeError naming the argument', () => {
    expect(() => fitLinearEphemeris([1, 1], [5, 6], [1, 1])).toThrow(/two distinct epochs/);
    expect(() => fitLinearEphemeris([0, 1], [5, 6], [1, 0])).toThrow(/errS\[1\]/);
    expect(() => fitLinearEphemeris([0, 1], [5, NaN], [1, 1])).toThrow(/timesS\[1\]/);
    expect(() => fitLinearEphemeris([0, 1, 2], [5, 6], [1, 1])).toThrow(RangeError);
  });
});

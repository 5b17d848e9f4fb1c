import { describe, it, expect } from 'vitest';
import { createRng } from '../../src/noise/rng.js';
import {
  periodicGapMask,
  randomGapMask,
  randomObservingWindow,
  selectObservedEpochs,
  transitCoverageFraction,
  windowMask,
} from '../../src/noise/gaps.js';

const grid = (n: number, dt: number): Float64Array => Float64Array.from({ length: n }, (_, k) => k * dt);
const fraction = (m: Uint8Array): number => m.reduce((a, b) => a + b, 0) / m.length;

describe('randomGapMask', () => {
  it('observed fraction converges to the duty cycle and mean gap to the typical gap', () => {
    // Long-run fraction of an alternating renewal process = mean on/(mean on + mean off) (Cox 1962).
    // 1e6 one-minute samples with 3-h gaps and d = 0.7: ≈ 1600 on/off cycles; the fraction's SE ≈ 0.006 and the
    // mean gap's relative SE ≈ 2.5 %; allow 0.03 and 12 % (common practice, no source).
    const t = grid(1_000_000, 60);
    const gapS = 3 * 3600;
    const m = randomGapMask(t, 0.7, gapS, createRng(31, 0, 0));
    expect(Math.abs(fraction(m) - 0.7)).toBeLessThan(0.03);
    let runs = 0;
    let lost = 0;
    for (let k = 0; k < m.length; k++) {
      if (m[k] === 0) {
        lost++;
        if (k > 0 && m[k - 1] === 1) runs++;
      }
    }
    // Sampled gaps are quantised to 60 s; mean length ≈ typicalGapS.
    expect(Math.abs((lost * 60) / runs / gapS - 1)).toBeLessThan(0.12);
  });

  it('handles d = 0 and d = 1, is reproducible, and rejects bad input', () => {
    const t = grid(100, 10);
    expect(fraction(randomGapMask(t, 1, 50, createRng(1, 0, 0)))).toBe(1);
    expect(fraction(randomGapMask(t, 0, 50, createRng(1, 0, 0)))).toBe(0);
    const a = randomGapMask(t, 0.5, 30, createRng(2, 0, 0));
    const b = randomGapMask(t, 0.5, 30, createRng(2, 0, 0));
    expect(Array.from(b)).toEqual(Array.from(a));
    expect(() => randomGapMask(t, 1.2, 50, createRng(1, 0, 0))).toThrow(/dutyCycle/);
    expect(() => randomGapMask(t, 0.5, 0, createRng(1, 0, 0))).toThrow(/typicalGapS/);
    expect(() => randomGapMask(Float64Array.of(2, 1), 0.5, 1, createRng(1, 0, 0))).toThrow(/timeS/);
  });
});

describe('periodicGapMask', () => {
  it('observed fraction is on/(on + off) exactly over whole periods', () => {
    // Computed from the definition: 8 h on, 16 h off, 1-min grid over 10 days → 1/3 exactly.
    const t = grid(14_400, 60);
    expect(fraction(periodicGapMask(t, 8 * 3600, 16 * 3600))).toBeCloseTo(1 / 3, 12);
    const shifted = periodicGapMask(t, 8 * 3600, 16 * 3600, -3600);
    expect(shifted[0]).toBe(1);
    expect(shifted[7 * 60]).toBe(0); // t = 7 h: phase 8 h, just off
    expect(() => periodicGapMask(t, 0, 1)).toThrow(/onS/);
  });
});

describe('selectObservedEpochs', () => {
  it('missed fraction converges to the stated fraction (binomial, 5 SE)', () => {
    const n = 100_000;
    const kept = selectObservedEpochs(n, 0.3, createRng(32, 0, 0));
    const se = Math.sqrt((0.3 * 0.7) / n);
    expect(Math.abs(1 - kept.length / n - 0.3)).toBeLessThan(5 * se);
    let unordered = 0;
    for (let i = 1; i < kept.length; i++) if (!(kept[i] > kept[i - 1])) unordered++;
    expect(unordered).toBe(0);
    expect(selectObservedEpochs(5, 0, createRng(1, 0, 0))).toEqual(Int32Array.of(0, 1, 2, 3, 4));
    expect(selectObservedEpochs(5, 1, createRng(1, 0, 0)).length).toBe(0);
    expect(() => selectObservedEpochs(-1, 0.1, createRng(1, 0, 0))).toThrow(/nTransits/);
    expect(() => selectObservedEpochs(3, 2, createRng(1, 0, 0))).toThrow(/missedFraction/);
  });
});

describe('partial transit coverage', () => {
  it('mean coverage of a window of one duration, offset uniformly within ±1 duration, is 1/2', () => {
    // Computed analytically in this test: coverage = max(0, 1 − |o|/T) with o ~ U(−T, T) has mean 1/2;
    // 20 000 draws, sd of coverage 1/√12·… ≤ 0.3 → SE ≤ 0.0021; allow 0.011.
    const T = 3 * 3600;
    const rng = createRng(33, 0, 0);
    let sum = 0;
    const R = 20_000;
    for (let r = 0; r < R; r++) sum += transitCoverageFraction(randomObservingWindow(1e6, T, T, rng), 1e6, T);
    expect(Math.abs(sum / R - 0.5)).toBeLessThan(0.011);
  });

  it('centred windows longer than the transit cover it fully; masks select the window', () => {
    const w = randomObservingWindow(5000, 4000, 0, createRng(1, 0, 0));
    expect(w).toEqual({ startS: 3000, endS: 7000 });
    expect(transitCoverageFraction(w, 5000, 3000)).toBe(1);
    expect(transitCoverageFraction({ startS: 0, endS: 1000 }, 5000, 3000)).toBe(0);
    expect(transitCoverageFraction({ startS: 0, endS: 5000 }, 5000, 3000)).toBe(0.5);
    const m = windowMask(Float64Array.of(2999, 3000, 7000, 7001, 9000), [w, { startS: 8500, endS: 9500 }]);
    expect(Array.from(m)).toEqual([0, 1, 1, 0, 1]);
  });
});

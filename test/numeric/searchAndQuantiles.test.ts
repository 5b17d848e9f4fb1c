import { describe, expect, it } from 'vitest';
import { goldenSectionMaximum } from '../../src/numeric/goldenSection.js';
import { medianOfFinite, quantileSortedType7 } from '../../src/numeric/quantiles.js';

describe('goldenSectionMaximum', () => {
  it('finds the peak of a parabola to the tolerance', () => {
    // Exact answer: −(x − 0.3)² + 2 peaks at x = 0.3 with value 2 (algebra, no source).
    const r = goldenSectionMaximum({ valueAt: (x) => 2 - (x - 0.3) ** 2 }, 0, 1, 1e-10);
    // Near a smooth peak values differ by (Δx)², so x is found only to about √ε ≈ 1.5e-8 (Press et al. 2007, §10.2).
    expect(Math.abs(r.x - 0.3)).toBeLessThan(1e-7);
    expect(r.value).toBeCloseTo(2, 15);
  });
  it('stops after maxIterations: the bracket shrinks by 0.618… per step (Kiefer 1953)', () => {
    const calls: number[] = [];
    goldenSectionMaximum({ valueAt: (x) => (calls.push(x), -Math.abs(x - 0.9)) }, 0, 1, 0, 5);
    expect(calls.length).toBe(2 + 5);
  });
});

describe('medianOfFinite / quantileSortedType7', () => {
  it('middle value, mean of the two middle values, and non-finite values skipped (common practice, no source)', () => {
    expect(medianOfFinite([3, 1, 2])).toBe(2);
    expect(medianOfFinite(new Float64Array([4, 1, 3, 2]))).toBe(2.5);
    expect(medianOfFinite([NaN, 5, Infinity, 1])).toBe(3);
    expect(medianOfFinite([NaN])).toBeNaN();
  });
  it('definition 7 agrees with numpy.quantile (linear): [1,2,4,8] at 0.25 → 1.75, at 0.9 → 6.8', () => {
    // numpy.quantile([1, 2, 4, 8], [0.25, 0.9]) = [1.75, 6.8] (h = 3p: 0.75 → 1 + 0.75·1; 2.7 → 4 + 0.7·4)
    const s = new Float64Array([1, 2, 4, 8]);
    expect(quantileSortedType7(s, 0.25)).toBeCloseTo(1.75, 15);
    expect(quantileSortedType7(s, 0.9)).toBeCloseTo(6.8, 14);
    expect(quantileSortedType7(s, 1)).toBe(8);
    expect(quantileSortedType7(s, 1.5)).toBeNaN();
  });
});

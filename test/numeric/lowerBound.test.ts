import { describe, it, expect } from 'vitest';
import { lowerBound } from '../../src/numeric/lowerBound.js';

describe('lowerBound', () => {
  it('finds the first index with v[k] ≥ x, within [a, b), against a linear scan (common practice, no source)', () => {
    const v = Float64Array.from([-3, -1, -1, 0, 2, 2, 2, 5, 9]);
    for (const x of [-4, -3, -2, -1, 0, 1, 2, 3, 9, 10, NaN]) {
      for (const [a, b] of [[0, v.length], [2, 7], [4, 4]]) {
        let k = a;
        while (k < b && v[k] < x) k++;
        // NaN compares false: the scan and the bisection both stop at once.
        expect(lowerBound(v, a, b, x), `x=${x} [${a}, ${b})`).toBe(Number.isNaN(x) ? a : k);
      }
    }
  });
});

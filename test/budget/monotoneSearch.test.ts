/**
 * The bracketing search against its definition: on a monotone test (fails
 * below a threshold index, passes from it on) it must return the threshold,
 * from any start, within the evaluation count of exponential search
 * (Bentley & Yao 1976, Inf. Process. Lett. 5, 82: ≈ 2·log2(distance) + 1),
 * and it must stop at the cap however the test behaves.
 */
import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { searchCheapestPassing } from '../../src/budget/monotoneSearch.js';

describe('searchCheapestPassing', () => {
  it('returns the first passing index of any monotone test, from any start (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 300 }), fc.nat(), fc.nat(), (count, tRaw, sRaw) => {
        const threshold = tRaw % (count + 1); // count = nothing passes
        const start = sRaw % count;
        const calls: number[] = [];
        const out = searchCheapestPassing(count, start, (i) => {
          calls.push(i);
          return i >= threshold;
        });
        expect(out.answer).toBe(threshold === count ? null : threshold);
        expect(out.capped).toBe(false);
        // No index is evaluated twice; the count is that of exponential search (common practice, no source for the +3 slack).
        expect(new Set(calls).size).toBe(calls.length);
        const distance = Math.abs(Math.min(threshold, count - 1) - start) + 1;
        expect(calls.length).toBeLessThanOrEqual(2 * Math.ceil(Math.log2(distance + 1)) + 3);
        if (out.answer !== null && out.answer > 0) expect(out.failing).toBe(out.answer - 1);
      }),
      { numRuns: 400, seed: 20260101 },
    );
  });

  it('stops at the evaluation cap, even when the test is not monotone', () => {
    let n = 0;
    const out = searchCheapestPassing(1000, 500, (i) => {
      n++;
      return (i * 7919) % 3 === 0; // erratic
    }, 5);
    expect(n).toBeLessThanOrEqual(5);
    expect(out.evaluated.length).toBe(n);
  });

  it('a one-value grid: one evaluation', () => {
    expect(searchCheapestPassing(1, 0, () => true).answer).toBe(0);
    expect(searchCheapestPassing(1, 0, () => false).answer).toBe(null);
  });

  it('rejects a bad count or cap', () => {
    expect(() => searchCheapestPassing(0, 0, () => true)).toThrow(RangeError);
    expect(() => searchCheapestPassing(5, 0, () => true, 0)).toThrow(/maxEvaluations/);
  });
});

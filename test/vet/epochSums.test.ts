import { describe, it, expect } from 'vitest';
import { epochTrigSums } from '../../src/vet/epochSums.js';

/** Direct O(N·L) sums: the definition the FFT route must reproduce. */
function direct(epochs: number[], w: number[], L: number) {
  const c = new Float64Array(L);
  const s = new Float64Array(L);
  for (let j = 0; j < L; j++) {
    for (let i = 0; i < epochs.length; i++) {
      const r = (((j * epochs[i]) % L) + L) % L; // exact phase reduction
      c[j] += w[i] * Math.cos((2 * Math.PI * r) / L);
      s[j] += w[i] * Math.sin((2 * Math.PI * r) / L);
    }
  }
  return { c, s };
}

describe('epochTrigSums (Bluestein DFT over integer epochs)', () => {
  it('matches the direct sums (definition) for gapped, shifted and negative epochs and odd L', () => {
    const cases: Array<[number[], number]> = [
      [[0, 1, 2, 3, 5, 8, 13], 130],
      [[-7, -3, 0, 4, 9, 10, 11, 20], 271],
      [[1000003, 1000004, 1000010, 1000012], 97],
    ];
    for (const [epochs, L] of cases) {
      // Three weight sets: two share one complex transform, the third has its own.
      const sets = [0, 1, 2].map((q) => epochs.map((_, i) => Math.sin(1.7 * i + q) + 0.3 * i * (q - 1)));
      const got = epochTrigSums(Float64Array.from(epochs), sets.map((w) => Float64Array.from(w)), L);
      sets.forEach((w, q) => {
        const ref = direct(epochs, w, L);
        const scale = w.reduce((a, x) => a + Math.abs(x), 0);
        for (let j = 0; j < L; j++) {
          expect(Math.abs(got.cos[q][j] - ref.c[j])).toBeLessThan(1e-12 * scale);
          expect(Math.abs(got.sin[q][j] - ref.s[j])).toBeLessThan(1e-12 * scale);
        }
      });
    }
  });

  it('refuses an L not above the epoch span and non-integer epochs', () => {
    expect(() => epochTrigSums(Float64Array.from([0, 10]), [Float64Array.from([1, 1])], 10)).toThrow(RangeError);
    expect(() => epochTrigSums(Float64Array.from([0, 1.5]), [Float64Array.from([1, 1])], 10)).toThrow(RangeError);
  });
});

import { describe, expect, it } from 'vitest';
import { invertSymmetricPositive, solveSymmetricPositive } from '../../src/numeric/linearAlgebra.js';

describe('Cholesky inverse and solve', () => {
  it('A·A⁻¹ = I for a symmetric positive-definite 3×3, and the solve matches (algebra, no source)', () => {
    const a = new Float64Array([4, 2, 0.6, 2, 5, 1, 0.6, 1, 3]);
    const inv = new Float64Array(9);
    expect(invertSymmetricPositive(a, 3, inv)).toBe(true);
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) {
        let s = 0;
        for (let k = 0; k < 3; k++) s += a[i * 3 + k] * inv[k * 3 + j];
        expect(s).toBeCloseTo(i === j ? 1 : 0, 14);
      }
    }
    const x = new Float64Array(3);
    expect(solveSymmetricPositive(a, 3, new Float64Array([1, 2, 3]), x)).toBe(true);
    for (let i = 0; i < 3; i++) expect(a[i * 3] * x[0] + a[i * 3 + 1] * x[1] + a[i * 3 + 2] * x[2]).toBeCloseTo(i + 1, 13);
  });
  it('refuses a matrix that is not positive definite, filling the output with NaN', () => {
    const inv = new Float64Array(4);
    expect(invertSymmetricPositive(new Float64Array([1, 2, 2, 1]), 2, inv)).toBe(false);
    expect(Number.isNaN(inv[0])).toBe(true);
  });
});

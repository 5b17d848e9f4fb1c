/** Small dense symmetric positive-definite systems: Cholesky inverse and solve (row-major, caller-owned scratch). */

/**
 * Invert a small symmetric positive-definite matrix (row-major n×n) by
 * Cholesky factorisation (Golub & Van Loan 2013, Matrix Computations, 4th
 * ed., Alg. 4.2.1). Writes the inverse into `out`; returns false (and fills
 * `out` with NaN) if the matrix is not positive definite.
 */
export function invertSymmetricPositive(
  a: Float64Array,
  n: number,
  out: Float64Array,
  work: Float64Array = new Float64Array(n * n + n),
): boolean {
  // work: the factor L (n×n, row-major) then one column y (n). A caller-owned
  // `work` saves an allocation per call (arrays over 64 bytes live outside the
  // V8 heap and cost the garbage collector more than their size).
  const l = work;
  const y0 = n * n;
  for (let j = 0; j < n; j++) {
    let d = a[j * n + j];
    for (let k = 0; k < j; k++) d -= l[j * n + k] * l[j * n + k];
    if (!(d > 0)) {
      out.fill(NaN, 0, n * n);
      return false;
    }
    const ljj = Math.sqrt(d);
    l[j * n + j] = ljj;
    for (let i = j + 1; i < n; i++) {
      let s = a[i * n + j];
      for (let k = 0; k < j; k++) s -= l[i * n + k] * l[j * n + k];
      l[i * n + j] = s / ljj;
    }
  }
  // Columns of the inverse: solve L Lᵀ x = e_c.
  for (let c = 0; c < n; c++) {
    for (let i = 0; i < n; i++) {
      let s = i === c ? 1 : 0;
      for (let k = 0; k < i; k++) s -= l[i * n + k] * work[y0 + k];
      work[y0 + i] = s / l[i * n + i];
    }
    for (let i = n - 1; i >= 0; i--) {
      let s = work[y0 + i];
      for (let k = i + 1; k < n; k++) s -= l[k * n + i] * out[k * n + c];
      out[i * n + c] = s / l[i * n + i];
    }
  }
  return true;
}

/**
 * Solve the symmetric positive-definite system a·x = b (n ≤ ~10) via its
 * inverse; false if not positive definite. `inv` (n²) and `work` (n² + n)
 * are scratch, as in invertSymmetricPositive.
 */
export function solveSymmetricPositive(
  a: Float64Array,
  n: number,
  b: Float64Array,
  x: Float64Array,
  inv: Float64Array = new Float64Array(n * n),
  work: Float64Array = new Float64Array(n * n + n),
): boolean {
  if (!invertSymmetricPositive(a, n, inv, work)) return false;
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let k = 0; k < n; k++) s += inv[i * n + k] * b[k];
    x[i] = s;
  }
  return true;
}

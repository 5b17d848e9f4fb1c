/**
 * Occultation of a uniform stellar disc by an opaque disc: the blocked
 * fraction λᵉ(p, z) of Mandel & Agol (2002, ApJ 580, L171, eq. 1), with
 * p the radius ratio and z the sky-projected centre separation, both in
 * stellar radii. The relative flux is 1 − λᵉ.
 *
 *   λᵉ = 0                                                z ≥ 1 + p
 *   λᵉ = (1/π)[p²κ₀ + κ₁ − ½√(4z² − (1 + z² − p²)²)]     |1 − p| < z < 1 + p
 *   λᵉ = p²                                               z ≤ 1 − p
 *   λᵉ = 1                                                z ≤ p − 1
 *
 * with cos κ₀ = (p² + z² − 1)/(2pz), cos κ₁ = (1 − p² + z²)/(2z). Numerics
 * (ours): the square root is factored as √X with
 * X = (1 − (z − p)²)((z + p)² − 1) = 4z² − (1 + z² − p²)², and the angles are
 * taken as κ₀ = atan2(√X, p² + z² − 1), κ₁ = atan2(√X, 1 − p² + z²) (since
 * sin κ₀ = √X/(2pz), sin κ₁ = √X/(2z)); near the contact points this keeps
 * the three terms consistent so that their cancellation stays at rounding
 * level, where arccos would lose half the digits.
 */

/** Blocked fraction λᵉ(p, z) of a uniform disc (MA02 eq. 1). NaN for z < 0, p < 0 or NaN. */
export function uniformBlockedFraction(z: number, p: number): number {
  if (!(z >= 0) || !(p >= 0)) return NaN;
  if (z >= 1 + p || p === 0) return 0;
  if (z <= p - 1) return 1;
  if (z <= 1 - p) return p * p;
  // Partial overlap, |1 − p| < z < 1 + p (MA02 eq. 1, second line).
  const x = (1 - z + p) * (1 + z - p) * ((z + p - 1) * (z + p + 1));
  const s = Math.sqrt(x > 0 ? x : 0);
  const zz = z * z;
  const pp = p * p;
  const kappa0 = Math.atan2(s, pp + zz - 1);
  const kappa1 = Math.atan2(s, 1 - pp + zz);
  return (pp * kappa0 + kappa1 - 0.5 * s) / Math.PI;
}

/** Relative flux 1 − λᵉ(p, z) of a uniform disc at one separation (MA02 eq. 1). */
export function uniformFluxScalar(z: number, p: number): number {
  return 1 - uniformBlockedFraction(z, p);
}

/**
 * Relative flux of a uniform stellar disc occulted by a disc of radius ratio
 * p, at each separation z[i] (stellar radii). Writes into `out` if given
 * (length ≥ z.length), else allocates. Per-point domain errors give NaN.
 * @throws RangeError if p is negative or not finite, or `out` is too short.
 */
export function uniformFlux(z: Float64Array, p: number, out?: Float64Array): Float64Array {
  if (!(p >= 0) || !Number.isFinite(p)) throw new RangeError(`p must be a finite number ≥ 0, got ${p}`);
  const n = z.length;
  const res = out ?? new Float64Array(n);
  if (res.length < n) throw new RangeError(`out.length must be ≥ z.length (${n}), got ${res.length}`);
  const outside = 1 + p;
  for (let i = 0; i < n; i++) {
    const zi = z[i];
    res[i] = zi >= outside ? 1 : 1 - uniformBlockedFraction(zi, p);
  }
  return res;
}

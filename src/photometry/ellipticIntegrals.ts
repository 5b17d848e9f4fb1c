/**
 * Complete elliptic integrals of the first, second and third kinds.
 *
 * Convention (as in Mandel & Agol 2002, ApJ 580, L171, §4, and DLMF §19.2):
 * the argument is the **modulus k**, not the parameter m = k² (stdlib's
 * `ellipk(m)` and scipy's `ellipk(m)` take m). The characteristic n enters
 * with a minus sign:
 *
 *   K(k)    = ∫₀^{π/2} dθ / √(1 − k² sin²θ)
 *   E(k)    = ∫₀^{π/2} √(1 − k² sin²θ) dθ
 *   Π(n, k) = ∫₀^{π/2} dθ / ((1 − n sin²θ) √(1 − k² sin²θ))
 *
 * Domain: |k| < 1 (K(±1) = +∞, E(±1) = 1), n < 1. NaN outside.
 * Method: Bulirsch's cel (Bulirsch 1965, Numer. Math. 7, 78; 1969, Numer.
 * Math. 13, 305), K = cel(kc,1,1,1), E = cel(kc,1,1,kc²), Π = cel(kc,1−n,1,1)
 * with kc = √(1 − k²). Carlson's symmetric forms (DLMF 19.25.1) are in
 * carlson.ts as the independent cross-check. Accuracy: ≤ 1e-15 relative
 * against Carlson duplication and stdlib over the tested grid.
 */
import { cel } from './bulirschCel.js';

function complementary(k: number): number {
  // kc = √((1 − k)(1 + k)) keeps relative accuracy as k → 1.
  const ak = Math.abs(k);
  return Math.sqrt((1 - ak) * (1 + ak));
}

/** K(k), modulus k, |k| ≤ 1. */
export function ellipticK(k: number): number {
  if (!(Math.abs(k) <= 1)) return NaN;
  if (Math.abs(k) === 1) return Infinity;
  return cel(complementary(k), 1, 1, 1);
}

/** E(k), modulus k, |k| ≤ 1. */
export function ellipticE(k: number): number {
  if (!(Math.abs(k) <= 1)) return NaN;
  if (Math.abs(k) === 1) return 1;
  const kc = complementary(k);
  return cel(kc, 1, 1, kc * kc);
}

/** Π(n, k), characteristic n < 1 (sign as in the integral above), modulus |k| < 1. */
export function ellipticPi(n: number, k: number): number {
  if (!(Math.abs(k) < 1) || !(n < 1)) return NaN;
  return cel(complementary(k), 1 - n, 1, 1);
}

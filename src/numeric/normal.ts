/**
 * The complementary error function and the standard normal CDF, exact to
 * the accuracy of the incomplete gamma functions (gammaFunctions.ts):
 *   erfc(x) = Γ(½, x²)/√π = Q(½, x²) for x ≥ 0 (NIST DLMF 7.11.2 with 8.2.4),
 *   erfc(x) = 2 − erfc(−x) = 1 + P(½, x²) for x < 0 (DLMF 7.4.2),
 *   Φ(z) = ½ erfc(−z/√2) (DLMF 7.18.2 / Abramowitz & Stegun 26.2.29).
 * Each tail keeps its relative accuracy (no 1 − Φ of a number near 1).
 */
import { regularizedGammaP, regularizedGammaQ } from './gammaFunctions.js';

/** Complementary error function; NaN for NaN. */
export function erfc(x: number): number {
  if (Number.isNaN(x)) return NaN;
  return x >= 0 ? regularizedGammaQ(0.5, x * x) : 1 + regularizedGammaP(0.5, x * x);
}

/** Standard normal cumulative distribution Φ(z) = Pr(Z ≤ z). */
export function normalCdf(z: number): number {
  return 0.5 * erfc(-z / Math.SQRT2);
}

/**
 * Bulirsch's general complete elliptic integral
 *
 *   cel(kc, p, a, b) = ∫₀^{π/2} (a cos²θ + b sin²θ) dθ
 *                      / ((cos²θ + p sin²θ) √(cos²θ + kc² sin²θ)),
 *
 * (Bulirsch 1965, Numer. Math. 7, 78, eq. 1.1.1; 1969, Numer. Math. 13, 305,
 * algorithm "cel"), evaluated by his Gauss/Landen transformation, which
 * converges quadratically like the arithmetic-geometric mean. With the
 * complementary modulus kc = √(1 − k²) (k the modulus) and characteristic n,
 *
 *   K(k)    = cel(kc, 1, 1, 1),
 *   E(k)    = cel(kc, 1, 1, kc²),
 *   Π(n, k) = cel(kc, 1 − n, 1, 1)   with Π(n,k) = ∫ dθ / ((1 − n sin²θ)√(1 − k² sin²θ)),
 *
 * and cel is linear in (a, b), so any combination αK + βE is one call with
 * a = α + β, b = α + β kc². moonsieve uses this in the transit hot path
 * because it measured faster than Carlson's RF/RD/RJ (see bench/photometry.ts).
 *
 * Domain: kc ≠ 0 (kc = 0 is the logarithmic singularity of K; the loop would
 * never end, so it returns ±∞/NaN rather than loop), p > 0 here (MA02 only
 * needs n ≤ 0, i.e. p ≥ 1; the p ≤ 0 branch of Bulirsch is not implemented).
 * Accuracy: the loop stops when the AGM pair agrees to CA = 1e-9 relative;
 * the error is then O(CA²), below rounding (checked against Carlson's
 * duplication and stdlib's K, E in test/photometry/ellipticIntegrals.test.ts).
 */

/** Stopping tolerance on the AGM pair (Bulirsch 1969: the result error is ~CA²). */
const CA = 1e-9;
/** Iteration cap (quadratic convergence: ~6 steps for kc = 1e-8). */
const MAX_STEPS = 60;
const HALF_PI = Math.PI / 2;

/** cel(kc, p, a, b) for kc ≠ 0, p > 0 (Bulirsch 1969). NaN outside that domain. */
export function cel(kc: number, p: number, a: number, b: number): number {
  if (!(kc !== 0) || !(p > 0) || Number.isNaN(kc)) return NaN;
  return celPair(kc, 0, 0, Math.sqrt(p), a, b);
}

/**
 * cel(kc, 1, a1, b1) + cel(kc, P, a2, b2) in one loop (the kc recursion is
 * shared; the p, a, b recursions of Bulirsch 1969 are run side by side).
 * The second characteristic is passed as its square root `sqrtP` (> 0) so
 * that callers with P = 1/(z−p)² can pass 1/|z−p| without overflow or loss.
 * Allocation-free; the hot path of the quadratic limb-darkened transit.
 */
export function celPair(
  kc: number,
  a1: number,
  b1: number,
  sqrtP: number,
  a2: number,
  b2: number,
): number {
  let qc = Math.abs(kc);
  let e = qc;
  let em = 1;
  // Track 1: p = 1, so √p = 1 and b/√p = b.
  let p1 = 1;
  let aa1 = a1;
  let bb1 = b1;
  // Track 2: p = sqrtP².
  let p2 = sqrtP;
  let aa2 = a2;
  let bb2 = b2 / sqrtP;
  for (let step = 0; step < MAX_STEPS; step++) {
    const inv1 = 1 / p1;
    const inv2 = 1 / p2;
    let f = aa1;
    aa1 += bb1 * inv1;
    let g = e * inv1;
    bb1 = 2 * (bb1 + f * g);
    p1 += g;
    f = aa2;
    aa2 += bb2 * inv2;
    g = e * inv2;
    bb2 = 2 * (bb2 + f * g);
    p2 += g;
    g = em;
    em += qc;
    if (Math.abs(g - qc) <= g * CA) break;
    qc = 2 * Math.sqrt(e);
    e = qc * em;
  }
  return (
    (HALF_PI * (bb1 + aa1 * em)) / (em * (em + p1)) +
    (HALF_PI * (bb2 + aa2 * em)) / (em * (em + p2))
  );
}

/**
 * Exact relative flux of a quadratically limb-darkened star occulted by an
 * opaque disc (Mandel & Agol 2002, ApJ 580, L171, §4, eqs. 7-10 and Table 1).
 *
 * Inputs: z, sky-projected centre separation in stellar radii (≥ 0); p,
 * occulter radius / stellar radius (≥ 0); quadratic limb darkening
 * I(μ)/I(1) = 1 − u1(1 − μ) − u2(1 − μ)², μ = √(1 − r²) (u1, u2 as in MA02 §4,
 * not Kipping's q1, q2). Output: F = observed / unocculted flux, in [0, 1] for
 * physical limb darkening.
 *
 * MA02 write the law with c₀ = 1 − u1 − u2, c₂ = u1 + 2u2, c₄ = −u2 and
 * 4Ω = 4Σcₙ/(n+4) = 1 − u1/3 − u2/6; their eq. (10) is
 *
 *   F = 1 − [(1 − c₂)λᵉ + c₂(λᵈ + ⅔Θ(p − z)) − c₄ηᵈ] / (4Ω),
 *
 * with λᵉ the uniform-disc blocked fraction (eq. 1, uniformFlux.ts) and λᵈ,
 * ηᵈ from Table 1 through the complete elliptic integrals K, E, Π of
 * modulus k (ellipticIntegrals.ts), a = (z−p)², b = (z+p)², q = p² − z²:
 *
 *   - partial overlap, z + p > 1 (Table 1 cases 2 and 8): λ₁ and η₁, with k² = (1 − a)/(4zp);
 *   - planet inside the disc, z + p < 1 (cases 3 and 9): λ₂ and η₂, with modulus 1/k;
 *   - z = 0 (case 10): λ₆; z = p (cases 5, 7): λ₄ for p < ½, λ₃ for p > ½;
 *   - z = 1 − p (case 4): λ₅; p = z = ½ (case 6): λᵈ = ⅓ − 4/(9π), ηᵈ = 3/32;
 *   - z ≥ 1 + p: F = 1 (case 1); z ≤ p − 1: F = 0 (case 11).
 *
 * Numerics (ours, not in MA02):
 *   - each λ₁/λ₂ needs αK + βE + γΠ; cel is linear in its last two arguments,
 *     so the sum is one fused Bulirsch loop (bulirschCel.ts, celPair);
 *   - Π(n) enters as −3(q/a)Π with n = (a−1)/a or (a−b)/a → −∞ as z → p;
 *     the characteristic is passed as √(1−n) = 1/|z−p| or (z+p)/|z−p|, so
 *     the product stays finite and accurate down to |z − p| ~ 1e-300;
 *   - k → 1 at z = 1 − p (log singularity of K; cel would not terminate at
 *     kc = 0): kc² is formed as (z+p−1)(z+p+1)/(4zp) from the same rounded
 *     z + p that selects the case, and |z + p − 1| < CONTACT_WINDOW routes to
 *     case 4, so kc is never 0 in the general branches;
 *   - the equality cases use windows |z − p| < ZP_WINDOW and
 *     |p − ½|, |z − ½| < HALF_WINDOW. The flux is continuous with |dF/dz| ≲ 2p,
 *     so a window of width w adds at most ~2p·w; w = 1e-13 keeps that below
 *     the 1e-12 target (test/photometry/transitFlux.test.ts checks continuity).
 *   - when the occulter leaves only a rim thinner than 1e-5 (p ≈ 1), the rim's
 *     flux is integrated directly (thinRimFlux), as λ₁/λ₂ lose digits there.
 * Accuracy: worst 1.8e-13 absolute over 8400 points (p from 1e-3 to 2, z at
 * and 1e-16…1e-3 around every contact point, two limb-darkening laws) against
 * a 40-digit mpmath evaluation of MA02's equations (development check); ≤ 1e-13
 * against the independent brute-force radial integral in the tests.
 */
import { cel, celPair } from './bulirschCel.js';
import { gaussLegendreRule } from '../numeric/gaussLegendre.js';
import { uniformFlux } from './uniformFlux.js';

/** Half-width of the z = p window (stellar radii). */
const ZP_WINDOW = 1e-13;
/** Half-width of the z = 1 − p window (stellar radii). */
const CONTACT_WINDOW = 1e-13;
/** Half-width of the p = z = ½ window. */
const HALF_WINDOW = 1e-13;
/**
 * Rim width 1 − (p − z) below which the uncovered rim is integrated directly
 * (thinRimFlux): there p ≈ 1 and, for small z, the prefactors 1/√(pz) of λ₁
 * and 1/√(1 − a) of λ₂ amplify rounding to ~1e-16/√z (measured 4e-11 at
 * p = 1, z = 1e-9), while the rim flux is ≲ 1e-5 and the quadrature is exact
 * to far below 1e-12 absolute.
 */
const THIN_RIM = 1e-5;
/** 32-point Gauss–Legendre rule for the rim (module constant, never mutated). */
const THIN_RIM_RULE = gaussLegendreRule(32);

const INV_PI = 1 / Math.PI;
const TWO_THIRDS = 2 / 3;
/** MA02 Table 1 case 6: λᵈ at p = z = ½. */
const LAMBDA_HALF = 1 / 3 - 4 / (9 * Math.PI);

/** λ₃ (MA02 Table 1, case 7: z = p > ½), modulus 1/(2p). */
function lambda3(p: number): number {
  const kc = Math.sqrt((2 * p - 1) * (2 * p + 1)) / (2 * p);
  const pp = p * p;
  const cE = ((16 * p) / 3) * (2 * pp - 1); // times 1/(3π) below
  const cK = -((1 - 4 * pp) * (3 - 8 * pp)) / (3 * p);
  return 1 / 3 + cel(kc, 1, cK + cE, cK + cE * kc * kc) / (3 * Math.PI);
}

/** λ₄ (MA02 Table 1, case 5: z = p < ½), modulus 2p. */
function lambda4(p: number): number {
  const kc = Math.sqrt((1 - 2 * p) * (1 + 2 * p));
  const pp = p * p;
  const cE = 4 * (2 * pp - 1);
  const cK = 1 - 4 * pp;
  return 1 / 3 + (2 * cel(kc, 1, cK + cE, cK + cE * kc * kc)) / (9 * Math.PI);
}

/**
 * λ₅ + ⅔Θ(p − z) at z = 1 − p (MA02 Table 1, case 4). λ₅ carries −⅔Θ(p − ½),
 * which cancels Θ(p − z) there; both are dropped so the sum is continuous.
 */
function lambda5PlusTheta(p: number): number {
  return (
    TWO_THIRDS * INV_PI * Math.acos(1 - 2 * p) -
    ((4 / 9) * INV_PI * (3 + 2 * p - 8 * p * p)) * Math.sqrt(p * (1 - p))
  );
}

/**
 * Flux left when the occulter covers all but a thin rim of the star,
 * w = 1 − (p − z) < THIN_RIM (so p ≈ 1 and, when z is small, λ₁'s 1/√(pz)
 * or λ₂'s 1/√(1 − a) would amplify rounding). Direct evaluation of the flux
 * integral of MA02 §2, F = (4πΩ)⁻¹∫ I(r)·ℓ(r) dr, ℓ the uncovered arc length:
 *   - r ∈ [p − z, min(p + z, 1)], partly covered: ℓ = 2r(π − θ(r)) with, for
 *     r = p − z + s, cos θ·2rz = (s − z)(r + p) + z² and
 *     sin θ·2rz = √((2z − s)(p + r − z)·s·(r + z + p)) (no cancellation);
 *     32-point Gauss–Legendre after s = L(1 − cos t)/2, which removes the
 *     square-root end points;
 *   - r ∈ [p + z, 1], uncovered: closed form 2π∫₀^{μ₁} I(μ)μ dμ.
 */
function thinRimFlux(z: number, p: number, u1: number, u2: number, omega4: number): number {
  const w = 1 - p + z; // width of [p − z, 1]
  const r0 = p - z;
  const twoZ = 2 * z;
  const len = twoZ < w ? twoZ : w; // partly covered band [r0, r0 + len]
  const half = 0.5 * len;
  const { nodes, weights } = THIN_RIM_RULE;
  let sum = 0;
  for (let i = 0; i < nodes.length; i++) {
    const t = 0.5 * Math.PI * (nodes[i] + 1);
    const s = half * (1 - Math.cos(t));
    const r = r0 + s;
    const c = (s - z) * (r + p) + z * z;
    const sin2 = (twoZ - s) * (p + r - z) * s * (r + z + p);
    const outsideAngle = Math.atan2(Math.sqrt(sin2 > 0 ? sin2 : 0), -c); // π − θ
    const mu = Math.sqrt((w - s) * (1 + r)); // √(1 − r²), 1 − r = w − s
    const om = 1 - mu;
    sum += weights[i] * (1 - u1 * om - u2 * om * om) * 2 * r * outsideAngle * half * Math.sin(t);
  }
  let flux = 0.5 * Math.PI * sum; // dt = (π/2) dx
  if (twoZ < w) {
    // uncovered annulus r ∈ [p + z, 1]: μ₁² = (1 − r₁)(1 + r₁), 1 − r₁ = w − 2z
    const m2 = (w - twoZ) * (2 - w + twoZ);
    const m = Math.sqrt(m2);
    const m3 = m2 * m;
    flux += 2 * Math.PI * (m2 / 2 - u1 * (m2 / 2 - m3 / 3) - u2 * (m2 / 2 - (2 * m3) / 3 + (m2 * m2) / 4));
  }
  return flux / (Math.PI * omega4);
}

/**
 * Relative flux at one separation (MA02 §4). Kernel: NaN for z < 0, p < 0,
 * non-finite u1/u2, 4Ω = 1 − u1/3 − u2/6 ≤ 0, or NaN input. Allocates one
 * one-element array: hot loops call `transitFlux` or `fluxKernelAt` instead.
 */
export function transitFluxScalar(z: number, p: number, u1: number, u2: number): number {
  if (!Number.isFinite(u1) || !Number.isFinite(u2)) return NaN;
  const omega4 = 1 - u1 / 3 - u2 / 6;
  if (!(omega4 > 0)) return NaN;
  const zz = Float64Array.of(z);
  fluxKernelAt(zz, 0, p, u1, u2, omega4, zz);
  return zz[0];
}

/**
 * out[i] = relative flux at separation z[i] (MA02 §4), with validated u1, u2
 * and precomputed 4Ω = 1 − u1/3 − u2/6 > 0; `out` may be `z`. It reads and
 * writes arrays rather than taking and returning a number because V8 cannot
 * inline it (too large), and a call that passes or returns a computed double
 * allocates a heap number for it: `transitFlux` over a whole transit measured
 * 76 → 24 bytes and 0.44 → 0.16 µs per point (with the λ₁/λ₂ block below
 * written in, so that its one celPair call is inlined).
 */
export function fluxKernelAt(zs: Float64Array, i: number, p: number, u1: number, u2: number, omega4: number, out: Float64Array): void {
  const z = zs[i];
  if (!(z >= 0) || !(p >= 0)) {
    out[i] = NaN;
    return;
  }
  if (z >= 1 + p || p === 0) {
    out[i] = 1; // case 1
    return;
  }
  if (z <= p - 1) {
    out[i] = 0; // case 11
    return;
  }
  const c2 = u1 + 2 * u2;
  const c4 = -u2;
  const pp = p * p;
  const zz = z * z;
  const zpp = z + p;
  // z + p − 1, formed so that the subtraction near contact is exact (Sterbenz):
  // near z = 1 − p the larger of z, p lies in [½, 2], so 1 − max(z, p) is exact.
  const contact = p >= z ? z - (1 - p) : p - (1 - z);
  if (1 - p + z < THIN_RIM) {
    out[i] = thinRimFlux(z, p, u1, u2, omega4);
    return;
  }
  const zmp = z - p;
  const eta2 = 0.5 * pp * (pp + 2 * zz); // MA02 Table 1, η₂

  // Uniform part λᵉ (MA02 eq. 1) and ηᵈ: η₂ inside the disc, η₁ on the limb.
  let lamE: number;
  let etaD: number;
  if (contact <= 0) {
    lamE = pp;
    etaD = eta2;
  } else {
    const x = (1 - zmp) * (1 + zmp) * (contact * (zpp + 1)); // (1 − a)(b − 1)
    const s = Math.sqrt(x > 0 ? x : 0);
    const kappa0 = Math.atan2(s, pp + zz - 1);
    const kappa1 = Math.atan2(s, 1 - pp + zz);
    lamE = (pp * kappa0 + kappa1 - 0.5 * s) * INV_PI;
    // η₁ = (1/2π)[κ₁ + 2η₂κ₀ − ¼(1 + 5p² + z²)√((1 − a)(b − 1))]
    etaD = 0.5 * INV_PI * (kappa1 + 2 * eta2 * kappa0 - 0.25 * (1 + 5 * pp + zz) * s);
  }

  // λᵈ + ⅔Θ(p − z) by MA02 Table 1 case.
  let lamD: number;
  if (Math.abs(p - 0.5) < HALF_WINDOW && Math.abs(z - 0.5) < HALF_WINDOW) {
    lamD = LAMBDA_HALF; // case 6 (z = p, Θ = 0)
    etaD = 0.09375; // 3/32
  } else if (Math.abs(zmp) < ZP_WINDOW) {
    lamD = p < 0.5 ? lambda4(p) : lambda3(p); // cases 5 and 7 (Θ = 0)
  } else if (Math.abs(contact) < CONTACT_WINDOW) {
    lamD = lambda5PlusTheta(p); // case 4
  } else if (z === 0) {
    lamD = -TWO_THIRDS * (1 - pp) * Math.sqrt(1 - pp) + TWO_THIRDS; // case 10: λ₆ + ⅔
  } else {
    // Cases 2, 8 (λ₁, contact > 0) and 3, 9 (λ₂, contact < 0). Each is one
    // αK + βE + γΠ, and cel is linear in its last two arguments, so the sum is
    // one fused Bulirsch loop: αK + βE = cel(kc, 1, α + β, α + βkc²),
    // γΠ(n, k) = cel(kc, 1 − n, γ, γ). Written here rather than in λ₁ and λ₂
    // functions so that V8 inlines the one celPair call: separate functions
    // exceeded its inlining budget, and each call then boxed its numbers.
    const a = zmp * zmp;
    const q = -zmp * zpp; // p² − z² = (p − z)(p + z)
    const cPi = (-3 * q) / a;
    let kc: number;
    let cK: number;
    let cE: number;
    let sqrtOneMinusN: number;
    let scale: number;
    if (contact > 0) {
      // λ₁: k² = (1 − a)/(4zp); 1 − n = 1/a.
      const b = zpp * zpp;
      const bm1 = contact * (zpp + 1); // b − 1, from the accurately formed z + p − 1
      const pz4 = 4 * p * z;
      kc = Math.sqrt(bm1 / pz4); // √(1 − k²) = √((b − 1)/(4zp))
      cK = -bm1 * (2 * b + a - 3) - 3 * q * (b - 2);
      cE = pz4 * (zz + 7 * pp - 4);
      sqrtOneMinusN = 1 / Math.abs(zmp);
      scale = 1 / (9 * Math.PI * Math.sqrt(p * z));
    } else {
      // λ₂: modulus 1/k with 1/k² = 4zp/(1 − a), kc'² = (1 − b)/(1 − a); Π((a − b)/a, 1/k), 1 − n = b/a.
      const oneMinusA = (1 - zmp) * (1 + zmp);
      kc = Math.sqrt((-contact * (1 + zpp)) / oneMinusA);
      cK = 1 - 5 * zz + pp + q * q;
      cE = oneMinusA * (zz + 7 * pp - 4);
      sqrtOneMinusN = zpp / Math.abs(zmp);
      scale = 2 / (9 * Math.PI * Math.sqrt(oneMinusA));
    }
    lamD = scale * celPair(kc, cK + cE, cK + cE * kc * kc, sqrtOneMinusN, cPi, cPi) + (zmp < 0 ? TWO_THIRDS : 0);
  }
  out[i] = 1 - ((1 - c2) * lamE + c2 * lamD - c4 * etaD) / omega4;
}

function checkLimbDarkening(u1: number, u2: number): void {
  if (!Number.isFinite(u1)) throw new RangeError(`u1 must be finite, got ${u1}`);
  if (!Number.isFinite(u2)) throw new RangeError(`u2 must be finite, got ${u2}`);
  if (!(1 - u1 / 3 - u2 / 6 > 0)) {
    throw new RangeError(
      `limb darkening (u1 = ${u1}, u2 = ${u2}) gives a non-positive disc-integrated intensity 1 − u1/3 − u2/6`,
    );
  }
}

/**
 * Relative flux of a quadratically limb-darkened star occulted by one opaque
 * disc of radius ratio p, at each sky separation z[i] (stellar radii).
 * Exact (MA02 §4); uniform-disc fast path (MA02 eq. 1) when u1 = u2 = 0;
 * points with z ≥ 1 + p are set to 1 without further work. Writes into `out`
 * when given (length ≥ z.length; it may be z itself), else allocates one
 * array. A negative or NaN z[i] gives NaN at that point.
 * @throws RangeError naming the argument for non-finite or negative p,
 *   non-finite u1/u2, 1 − u1/3 − u2/6 ≤ 0, or a short `out`.
 */
export function transitFlux(
  z: Float64Array,
  p: number,
  u1: number,
  u2: number,
  out?: Float64Array,
): Float64Array {
  if (!(p >= 0) || !Number.isFinite(p)) throw new RangeError(`p must be a finite number ≥ 0, got ${p}`);
  checkLimbDarkening(u1, u2);
  const n = z.length;
  if (out !== undefined && out.length < n) {
    throw new RangeError(`out.length must be ≥ z.length (${n}), got ${out.length}`);
  }
  if (u1 === 0 && u2 === 0) return uniformFlux(z, p, out);
  const res = out ?? new Float64Array(n);
  const outside = 1 + p;
  const omega4 = 1 - u1 / 3 - u2 / 6;
  for (let i = 0; i < n; i++) {
    const zi = z[i];
    if (zi >= outside) res[i] = 1;
    else fluxKernelAt(z, i, p, u1, u2, omega4, res);
  }
  return res;
}

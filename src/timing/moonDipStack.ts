/**
 * The moon's own dip, stacked in the planet's frame: the orbital sampling
 * effect (OSE; Heller 2014, ApJ 787, 14). Folding many transits on the
 * planet's mid-times averages the moon's dip over its orbital phase into a
 * shallow, wide profile around the planet's transit. We model that profile
 * and measure its amplitude in the residuals of a planet-only fit with a
 * weighted least-squares matched filter.
 *
 * Profile (derived here; the concept is Heller 2014's). For a circular moon
 * orbit seen edge-on along the planet's chord, at uniformly distributed
 * orbital phase θ, the moon's offset from the planet along the chord is
 * x = a·cos θ, whose density is 1/(π·sqrt(a² − x²)) on |x| < a (the arcsine
 * law). A point-like moon of depth δ_S = (R_S/R*)² blocks light only while its
 * centre lies on the chord |X| < L, L = sqrt(1 − b²) (stellar radii, b the
 * impact parameter). With the planet at X_P the folded dip is δ_S·f with, for
 * a uniform star,
 *   f(X_P) = [arccos(clip((−L − X_P)/a)) − arccos(clip((L − X_P)/a))]/π,
 * clip to [−1, 1] (the arcsine CDF evaluated at the chord ends). With
 * quadratic limb darkening the blocked light is weighted by I(r)/(4Ω),
 * I(r) = 1 − u1(1 − μ) − u2(1 − μ)², μ = sqrt(1 − r²), 4Ω = 1 − u1/3 − u2/6
 * (Mandel & Agol 2002, ApJ 580, L171, §5, small-planet limit), and
 *   f(X_P) = (1/π)∫ I(r(θ))/(4Ω) dθ over the θ with the moon on the star,
 * r(θ)² = (X_P + a cos θ)² + b², evaluated by Gauss–Legendre quadrature after
 * the substitution θ = θ1 + (θ2 − θ1)(3s² − 2s³), which removes the
 * square-root behaviour of μ at a limb crossing.
 * Neglected: the moon's finite size (ingress smearing over 2R_S), its offset
 * across the chord (inclined moon orbits), mutual planet–moon eclipses, and
 * eccentric moon orbits.
 *
 * Amplitude: residual_i = c − δ·f(x_i) + noise (c optional), weights σ_i⁻²;
 * δ̂ = −Σ w r f / Σ w f², σ_δ = (Σ w f²)^{−1/2} (weighted linear least squares,
 * e.g. Press et al. 2007, Numerical Recipes 3rd ed., §15.4), SNR = δ̂/σ_δ.
 * Including the planet's in-transit points needs care: a planet-only fit
 * absorbs part of the moon's in-transit dip (a slightly deeper planet), so
 * those residuals under-report the moon. `excludeWithinS` drops points with
 * |t − t_mid| below it (e.g. half the planet's T14), at some cost in SNR.
 */
import { gaussLegendreRule } from '../numeric/gaussLegendre.js';

/**
 * Folded OSE profile for a uniform star on a central chord of half-length 1:
 * f(xP; a) = [arccos(clip((−1 − xP)/a)) − arccos(clip((1 − xP)/a))]/π (derived here).
 * xP and a in chord half-lengths. a = 0 gives the point-moon step (½ at |xP| = 1).
 * NaN for a < 0 or NaN input.
 */
export function oseProfile(xP: number, a: number): number {
  if (!(a >= 0) || Number.isNaN(xP) || a === Infinity) return NaN;
  if (a === 0) {
    const ax = Math.abs(xP);
    return ax < 1 ? 1 : ax === 1 ? 0.5 : 0;
  }
  const lo = Math.min(1, Math.max(-1, (-1 - xP) / a));
  const hi = Math.min(1, Math.max(-1, (1 - xP) / a));
  return (Math.acos(lo) - Math.acos(hi)) / Math.PI;
}

/** Geometry of the stack: planet sky speed, impact parameter, moon separation, limb darkening. */
export interface MoonDipGeometry {
  /** Planet's sky-plane speed across the star, stellar radii per second. */
  skySpeed: number;
  /** Impact parameter b of the planet's chord, stellar radii, 0 ≤ b < 1. */
  impact: number;
  /** Moon's (projected) orbital radius about the planet, stellar radii. */
  separation: number;
  /** Quadratic limb-darkening coefficients (0, 0 for a uniform star). */
  u1: number;
  u2: number;
}

/** Number of Gauss–Legendre nodes for the limb-darkened profile (accuracy checked in the tests). */
export const OSE_QUADRATURE_NODES = 24;

/** Precomputed quadrature for the limb-darkened profile; build once, reuse. */
export interface OseQuadrature {
  nodes: Float64Array;
  weights: Float64Array;
}

/** Gauss–Legendre rule mapped to s ∈ [0, 1] with the smoothstep Jacobian folded into the weights. */
export function oseQuadrature(n: number = OSE_QUADRATURE_NODES): OseQuadrature {
  const rule = gaussLegendreRule(n);
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const s = 0.5 * (rule.nodes[i] + 1);
    nodes[i] = s * s * (3 - 2 * s); // θ fraction: 3s² − 2s³
    weights[i] = 0.5 * rule.weights[i] * 6 * s * (1 - s); // ds/dξ · dθ-fraction/ds
  }
  return { nodes, weights };
}

/**
 * Folded OSE profile f at planet position xP (stellar radii along the chord, 0 at mid-transit),
 * moon separation a (stellar radii), impact parameter b, quadratic limb darkening (u1, u2).
 * Multiply by (R_S/R*)² for the dip. Uniform star: closed form; otherwise quadrature `q`.
 * NaN for a < 0, b outside [0, 1), or NaN input (kernel convention).
 */
export function foldedMoonDip(xP: number, a: number, b: number, u1: number, u2: number, q: OseQuadrature): number {
  if (!(a >= 0) || !(b >= 0 && b < 1) || Number.isNaN(xP) || Number.isNaN(u1) || Number.isNaN(u2)) return NaN;
  const L = Math.sqrt(1 - b * b);
  if (u1 === 0 && u2 === 0) return oseProfile(xP / L, a / L);
  // θ range with the moon's centre on the chord: cos θ ∈ ((−L − xP)/a, (L − xP)/a).
  let th1 = 0;
  let th2 = Math.PI;
  if (a > 0) {
    const cHi = Math.min(1, Math.max(-1, (L - xP) / a));
    const cLo = Math.min(1, Math.max(-1, (-L - xP) / a));
    th1 = Math.acos(cHi);
    th2 = Math.acos(cLo);
  } else if (!(Math.abs(xP) < L)) {
    return 0;
  }
  if (!(th2 > th1)) return 0;
  const norm = 1 - u1 / 3 - u2 / 6; // 4Ω (Mandel & Agol 2002, §5)
  if (a === 0) {
    const mu = Math.sqrt(Math.max(0, 1 - xP * xP - b * b));
    return (1 - u1 * (1 - mu) - u2 * (1 - mu) * (1 - mu)) / norm;
  }
  const span = th2 - th1;
  let sum = 0;
  const { nodes, weights } = q;
  for (let i = 0; i < nodes.length; i++) {
    const th = th1 + span * nodes[i];
    const x = xP + a * Math.cos(th);
    const mu = Math.sqrt(Math.max(0, 1 - x * x - b * b));
    const om = 1 - mu;
    sum += weights[i] * (1 - u1 * om - u2 * om * om);
  }
  return (sum * span) / (Math.PI * norm);
}

/** Result of the matched-filter fit of the moon's stacked dip. */
export interface MoonDipFit {
  /** Fitted moon depth δ_S ≈ (R_S/R*)² (relative flux; positive = a dip). */
  depth: number;
  depthError: number;
  /** depth / depthError. */
  snr: number;
  /** Fitted constant offset (0 unless fitOffset). */
  offset: number;
  chiSquare: number;
  /** Points used and degrees of freedom (used − fitted parameters). */
  pointsUsed: number;
  dof: number;
}

export interface MoonDipOptions {
  /** Drop points with |time from planet mid-transit| < this (s); default 0 (keep all). */
  excludeWithinS?: number;
  /** Fit a constant offset together with the depth (default false). */
  fitOffset?: boolean;
  /** Caller-owned buffer (length N) that receives the profile f at each point (0 where excluded). */
  profileOut?: Float64Array;
  /** Quadrature rule for limb-darkened profiles (default oseQuadrature()). */
  quadrature?: OseQuadrature;
}

function checkGeometry(g: MoonDipGeometry): void {
  if (!(g.skySpeed > 0) || !Number.isFinite(g.skySpeed)) {
    throw new RangeError(`geometry.skySpeed must be finite and > 0 (stellar radii per s), got ${g.skySpeed}`);
  }
  if (!(g.impact >= 0 && g.impact < 1)) throw new RangeError(`geometry.impact must be in [0, 1), got ${g.impact}`);
  if (!(g.separation >= 0) || !Number.isFinite(g.separation)) {
    throw new RangeError(`geometry.separation must be finite and ≥ 0 (stellar radii), got ${g.separation}`);
  }
  if (!Number.isFinite(g.u1)) throw new RangeError(`geometry.u1 must be finite, got ${g.u1}`);
  if (!Number.isFinite(g.u2)) throw new RangeError(`geometry.u2 must be finite, got ${g.u2}`);
}

/**
 * Matched-filter amplitude of the folded moon dip in residual flux (data − planet-only model)
 * stacked on the planet's mid-transit times. `timeFromMidS`: time from the planet's own
 * mid-transit (s); `residual`: relative flux; `sigma`: per-point σ (array or one number).
 * @throws RangeError for mismatched lengths, non-finite data, σ not > 0, bad geometry, or a
 *   profile that vanishes at every used point (the moon never crosses the star in the data).
 */
export function fitMoonDip(
  timeFromMidS: Float64Array,
  residual: Float64Array,
  sigma: Float64Array | number,
  geometry: MoonDipGeometry,
  options: MoonDipOptions = {},
): MoonDipFit {
  const n = timeFromMidS.length;
  if (residual.length !== n) throw new RangeError(`residual must have length ${n}, got ${residual.length}`);
  if (typeof sigma !== 'number' && sigma.length !== n) throw new RangeError(`sigma must have length ${n}, got ${sigma.length}`);
  if (typeof sigma === 'number' && (!(sigma > 0) || !Number.isFinite(sigma))) {
    throw new RangeError(`sigma must be finite and > 0, got ${sigma}`);
  }
  checkGeometry(geometry);
  const exclude = options.excludeWithinS ?? 0;
  if (!(exclude >= 0)) throw new RangeError(`excludeWithinS must be ≥ 0, got ${exclude}`);
  const fitOffset = options.fitOffset ?? false;
  const profileOut = options.profileOut;
  if (profileOut !== undefined && profileOut.length !== n) {
    throw new RangeError(`profileOut must have length ${n}, got ${profileOut.length}`);
  }
  const q = options.quadrature ?? oseQuadrature();
  // Profile values kept for the χ² pass (one buffer per call, none per point).
  const prof = profileOut ?? new Float64Array(n);
  const { skySpeed, impact, separation, u1, u2 } = geometry;
  // Weighted normal-equation sums for r = c − δ f.
  let sw = 0;
  let swf = 0;
  let swff = 0;
  let swr = 0;
  let swrf = 0;
  let used = 0;
  for (let i = 0; i < n; i++) {
    const t = timeFromMidS[i];
    const r = residual[i];
    const s = typeof sigma === 'number' ? sigma : sigma[i];
    if (!Number.isFinite(t)) throw new RangeError(`timeFromMidS[${i}] must be finite, got ${t}`);
    if (!Number.isFinite(r)) throw new RangeError(`residual[${i}] must be finite, got ${r}`);
    if (!(s > 0) || !Number.isFinite(s)) throw new RangeError(`sigma[${i}] must be finite and > 0, got ${s}`);
    if (Math.abs(t) < exclude) {
      prof[i] = 0;
      continue;
    }
    const f = foldedMoonDip(skySpeed * t, separation, impact, u1, u2, q);
    prof[i] = f;
    const w = 1 / (s * s);
    sw += w;
    swf += w * f;
    swff += w * f * f;
    swr += w * r;
    swrf += w * r * f;
    used++;
  }
  // Model r = c + β f with β = −δ; solve the 1- or 2-parameter normal equations.
  let beta: number;
  let c = 0;
  let varBeta: number;
  if (fitOffset) {
    const det = sw * swff - swf * swf;
    if (!(det > 1e-12 * sw * swff)) {
      throw new RangeError('the moon-dip profile is constant over the used points: depth and offset are degenerate');
    }
    beta = (sw * swrf - swf * swr) / det;
    c = (swff * swr - swf * swrf) / det;
    varBeta = sw / det;
  } else {
    if (!(swff > 0)) throw new RangeError('the moon-dip profile is zero at every used point (no moon crossing in the data)');
    beta = swrf / swff;
    varBeta = 1 / swff;
  }
  let chi2 = 0;
  for (let i = 0; i < n; i++) {
    if (Math.abs(timeFromMidS[i]) < exclude) continue;
    const s = typeof sigma === 'number' ? sigma : sigma[i];
    const z = (residual[i] - c - beta * prof[i]) / s;
    chi2 += z * z;
  }
  const depth = -beta;
  const depthError = Math.sqrt(varBeta);
  const k = fitOffset ? 2 : 1;
  return { depth, depthError, snr: depth / depthError, offset: c, chiSquare: chi2, pointsUsed: used, dof: used - k };
}

/**
 * Relative flux of a quadratically limb-darkened star occulted by two opaque
 * discs at once (a planet and its moon), their mutual overlap counted once.
 *
 * Inputs: sky-plane centres (xp, yp), (xm, ym) and radii rp, rm, all in
 * stellar radii, star at the origin; limb darkening as in transitFlux.ts
 * (I(μ)/I(1) = 1 − u1(1 − μ) − u2(1 − μ)²).
 *
 * Method: the blocked flux of a union is additive over its parts,
 *   deficit(P ∪ M) = deficit(P) + deficit(M) − deficit(P ∩ M),
 * with each single-disc deficit exact (Mandel & Agol 2002, ApJ 580, L171, §4;
 * transitFlux.ts). The lens P ∩ M clipped by the stellar disc has no closed
 * form under limb darkening, so its deficit is the flux integral of MA02 §2
 * in polar coordinates about the star centre,
 *   deficit(P ∩ M) = (4πΩ)⁻¹ ∫ I(r)·r·φ(r) dr,
 * where φ(r) is the angle of the circle of radius r lying inside both discs
 * (the intersection of two arcs, computed exactly). φ(r) is smooth except at
 * the radii where a circle touches a disc edge (|dᵢ ± rᵢ|), where the two disc
 * edges cross, and at r = 1 (I ∝ √(1 − r²) there); the integral is split at
 * those radii and each piece is done by 20-point Gauss–Legendre after the
 * substitution r = r₀ + L(1 − cos t)/2, which turns the square-root end
 * behaviour into a smooth one; a piece is further graded geometrically
 * towards an end that has another singular radius just outside it.
 * Measured error of the lens deficit: ≤ 2e-16 of the stellar flux over
 * 200 000 random overlapping configurations (rp ≤ 0.2, rm ≤ 0.05, three
 * limb-darkening laws) against the same integral with 200 nodes per piece
 * (without the grading it was 1.3e-10); an independent 2-D integration in
 * test/photometry/pairTransitFlux.test.ts agrees to < 1e-10. Far under the
 * 1 ppm goal.
 *
 * Special cases are exact: discs apart → sum of single deficits; moon wholly
 * behind the planet (or the planet behind the moon) → the larger disc's flux;
 * either disc off the star → sum of deficits (the lens is off the star too).
 */
import { gaussLegendreRule } from '../numeric/gaussLegendre.js';
import { fluxKernelAt } from './transitFlux.js';

/** 20-point rule per radial segment (module constant, never mutated). */
const LENS_RULE = gaussLegendreRule(20);
const TWO_PI = 2 * Math.PI;

/** √(x² + y²); Math.hypot's overflow guard is not needed for stellar-radius units and is slow. */
function len2(x: number, y: number): number {
  return Math.sqrt(x * x + y * y);
}

/** Half-angle of the circle of radius r that lies inside a disc (centre distance d, radius rd). */
function halfAngleInside(r: number, d: number, rd: number): number {
  if (r <= rd - d) return Math.PI; // circle wholly inside the disc (also d = 0, r < rd)
  if (r >= d + rd || r <= d - rd) return 0;
  const c = (r * r + d * d - rd * rd) / (2 * r * d); // law of cosines
  return c >= 1 ? 0 : c <= -1 ? Math.PI : Math.acos(c);
}

/** Overlap length of arcs [−h1, h1] and [D − h2, D + h2] on a circle (D ∈ [0, π]). */
function arcOverlap(h1: number, h2: number, delta: number): number {
  // the second arc's lifts centred at D and D − 2π can meet [−h1, h1]
  let hi = Math.min(h1, delta + h2);
  let lo = Math.max(-h1, delta - h2);
  let s = hi > lo ? hi - lo : 0;
  hi = Math.min(h1, delta - TWO_PI + h2);
  lo = Math.max(-h1, delta - TWO_PI - h2);
  if (hi > lo) s += hi - lo;
  return s;
}

/** ∫ I(r)·r·φ(r) dr over [r0, r1] (Gauss–Legendre after r = r0 + L(1 − cos t)/2). */
function lensSegment(
  r0: number,
  r1: number,
  dp: number,
  rp: number,
  dm: number,
  rm: number,
  delta: number,
  u1: number,
  u2: number,
): number {
  const half = 0.5 * (r1 - r0);
  if (!(half > 0)) return 0;
  const { nodes, weights } = LENS_RULE;
  let sum = 0;
  for (let i = 0; i < nodes.length; i++) {
    const t = 0.5 * Math.PI * (nodes[i] + 1);
    const r = r0 + half * (1 - Math.cos(t));
    const ang = arcOverlap(halfAngleInside(r, dp, rp), halfAngleInside(r, dm, rm), delta);
    if (ang === 0) continue;
    const mu = Math.sqrt(r < 1 ? (1 - r) * (1 + r) : 0);
    const om = 1 - mu;
    sum += weights[i] * (1 - u1 * om - u2 * om * om) * r * ang * half * Math.sin(t);
  }
  return 0.5 * Math.PI * sum; // dt = (π/2) dx
}

/** Smallest of c0…c6 strictly above x (+∞ if none). */
function nextAbove(x: number, c0: number, c1: number, c2: number, c3: number, c4: number, c5: number, c6: number): number {
  let m = Infinity;
  if (c0 > x && c0 < m) m = c0;
  if (c1 > x && c1 < m) m = c1;
  if (c2 > x && c2 < m) m = c2;
  if (c3 > x && c3 < m) m = c3;
  if (c4 > x && c4 < m) m = c4;
  if (c5 > x && c5 < m) m = c5;
  if (c6 > x && c6 < m) m = c6;
  return m;
}

/** Largest of c0…c6 strictly below x (−∞ if none). */
function prevBelow(x: number, c0: number, c1: number, c2: number, c3: number, c4: number, c5: number, c6: number): number {
  let m = -Infinity;
  if (c0 < x && c0 > m) m = c0;
  if (c1 < x && c1 > m) m = c1;
  if (c2 < x && c2 > m) m = c2;
  if (c3 < x && c3 > m) m = c3;
  if (c4 < x && c4 > m) m = c4;
  if (c5 < x && c5 > m) m = c5;
  if (c6 < x && c6 > m) m = c6;
  return m;
}

/** Limb-darkened flux blocked by the lens P ∩ M inside the stellar disc, relative to the total (4πΩ). */
function lensDeficit(
  xp: number,
  yp: number,
  rp: number,
  xm: number,
  ym: number,
  rm: number,
  u1: number,
  u2: number,
  omega4: number,
): number {
  const dp = len2(xp, yp);
  const dm = len2(xm, ym);
  // angle between the two centres as seen from the star centre, in [0, π]
  const delta = Math.atan2(Math.abs(xp * ym - yp * xm), xp * xm + yp * ym);
  const lo = Math.max(dp - rp, dm - rm, 0);
  const hi = Math.min(dp + rp, dm + rm, 1);
  if (!(hi > lo)) return 0;
  // Radii where the integrand is not smooth: circles touching a disc edge
  // (|d − r|, d + r), circles through the two edge crossings, and the limb.
  const ex = xm - xp;
  const ey = ym - yp;
  const dpm = len2(ex, ey);
  const along = (dpm * dpm + rp * rp - rm * rm) / (2 * dpm); // crossing chord, from the planet centre
  const h2 = rp * rp - along * along;
  const h = Math.sqrt(h2 > 0 ? h2 : 0);
  const cx = xp + (along * ex) / dpm;
  const cy = yp + (along * ey) / dpm;
  const c0 = Math.abs(dp - rp);
  const c1 = dp + rp;
  const c2 = Math.abs(dm - rm);
  const c3 = dm + rm;
  const c4 = len2(cx - (h * ey) / dpm, cy + (h * ex) / dpm);
  const c5 = len2(cx + (h * ey) / dpm, cy - (h * ex) / dpm);
  const c6 = 1;
  // Integrate knot to knot. A knot just outside a piece (e.g. a disc edge a
  // hair beyond an edge crossing) slows Gauss–Legendre down, so each piece is
  // graded geometrically (×4) towards an end whose nearest outside singular
  // radius is closer than a quarter of the piece length.
  let sum = 0;
  let a = lo;
  while (a < hi) {
    let b = nextAbove(a, c0, c1, c2, c3, c4, c5, c6);
    if (b > hi) b = hi;
    const len = b - a;
    const mid = a + 0.5 * len;
    const floor = 1e-12 * len;
    let left = a;
    let e = a - prevBelow(a, c0, c1, c2, c3, c4, c5, c6);
    if (e < 0.25 * len) {
      for (e = e > floor ? e : floor; a + e < mid; e *= 4) {
        sum += lensSegment(left, a + e, dp, rp, dm, rm, delta, u1, u2);
        left = a + e;
      }
    }
    let right = b;
    e = nextAbove(b, c0, c1, c2, c3, c4, c5, c6) - b;
    if (e < 0.25 * len) {
      for (e = e > floor ? e : floor; b - e > mid; e *= 4) {
        sum += lensSegment(b - e, right, dp, rp, dm, rm, delta, u1, u2);
        right = b - e;
      }
    }
    sum += lensSegment(left, right, dp, rp, dm, rm, delta, u1, u2);
    a = b;
  }
  return sum / (Math.PI * omega4);
}

/**
 * Writes each disc's own flux (MA02; fluxKernelAt) at the centres (x[i], y[i])
 * into out[i], i < n. In passes over arrays, because V8 does not inline the
 * MA02 kernel and every call that passed or returned a number allocated a heap
 * number for it (pairTransitFluxArray measured 196 → 38 bytes and 0.94 → 0.35 µs
 * per point over a planet–moon transit).
 */
function discFluxes(x: Float64Array, y: Float64Array, n: number, r: number, u1: number, u2: number, omega4: number, out: Float64Array): void {
  const outside = 1 + r;
  for (let i = 0; i < n; i++) {
    const d = len2(x[i], y[i]);
    out[i] = d;
    if (d >= outside) out[i] = 1;
    else fluxKernelAt(out, i, r, u1, u2, omega4, out);
  }
}

/**
 * Given the single-disc fluxes fp (in `out`) and fm, the pair's flux into
 * out[i]: their deficits add, less the lens both cover (lensDeficit) where
 * the discs overlap on the star. NaN where a position is not finite.
 */
function combinePair(
  xp: Float64Array,
  yp: Float64Array,
  rp: number,
  xm: Float64Array,
  ym: Float64Array,
  rm: number,
  u1: number,
  u2: number,
  omega4: number,
  n: number,
  fm: Float64Array,
  out: Float64Array,
): void {
  for (let i = 0; i < n; i++) {
    const fp = out[i];
    const fmi = fm[i];
    const dpm = len2(xp[i] - xm[i], yp[i] - ym[i]);
    if (!(dpm >= 0) || Number.isNaN(fp) || Number.isNaN(fmi)) out[i] = NaN;
    else if (fp === 1 || fmi === 1 || dpm >= rp + rm) out[i] = fp + fmi - 1; // no lens on the star
    else if (dpm + rm <= rp) out[i] = fp; // moon wholly behind the planet
    else if (dpm + rp <= rm) out[i] = fmi; // planet wholly behind the moon
    else out[i] = fp + fmi - 1 + lensDeficit(xp[i], yp[i], rp, xm[i], ym[i], rm, u1, u2, omega4);
  }
}

function checkArgs(rp: number, rm: number, u1: number, u2: number): number {
  if (!(rp >= 0) || !Number.isFinite(rp)) throw new RangeError(`rp must be a finite number ≥ 0, got ${rp}`);
  if (!(rm >= 0) || !Number.isFinite(rm)) throw new RangeError(`rm must be a finite number ≥ 0, got ${rm}`);
  if (!Number.isFinite(u1)) throw new RangeError(`u1 must be finite, got ${u1}`);
  if (!Number.isFinite(u2)) throw new RangeError(`u2 must be finite, got ${u2}`);
  const omega4 = 1 - u1 / 3 - u2 / 6;
  if (!(omega4 > 0)) {
    throw new RangeError(
      `limb darkening (u1 = ${u1}, u2 = ${u2}) gives a non-positive disc-integrated intensity 1 − u1/3 − u2/6`,
    );
  }
  return omega4;
}

/**
 * Relative flux with a planet disc (centre (xp, yp), radius rp) and a moon
 * disc (centre (xm, ym), radius rm) in front of the star, stellar radii,
 * star centred at the origin; overlap counted once. Non-finite positions give NaN.
 * @throws RangeError for negative or non-finite radii, non-finite u1/u2,
 *   or 1 − u1/3 − u2/6 ≤ 0.
 */
export function pairTransitFlux(
  xp: number,
  yp: number,
  rp: number,
  xm: number,
  ym: number,
  rm: number,
  u1: number,
  u2: number,
): number {
  const out = new Float64Array(1);
  pairTransitFluxArray(Float64Array.of(xp), Float64Array.of(yp), rp, Float64Array.of(xm), Float64Array.of(ym), rm, u1, u2, out);
  return out[0];
}

/**
 * pairTransitFlux at each index i of the position arrays (same length n),
 * written to out[i] (length ≥ n). `work` (length ≥ n, distinct from `out`)
 * is scratch for the moon's own flux; without it one array is allocated.
 * @throws RangeError as pairTransitFlux, or for mismatched lengths.
 */
export function pairTransitFluxArray(
  xp: Float64Array,
  yp: Float64Array,
  rp: number,
  xm: Float64Array,
  ym: Float64Array,
  rm: number,
  u1: number,
  u2: number,
  out: Float64Array,
  work?: Float64Array,
): Float64Array {
  const omega4 = checkArgs(rp, rm, u1, u2);
  const n = xp.length;
  if (yp.length !== n || xm.length !== n || ym.length !== n) {
    throw new RangeError(
      `xp, yp, xm, ym must have equal lengths, got ${xp.length}, ${yp.length}, ${xm.length}, ${ym.length}`,
    );
  }
  if (out.length < n) throw new RangeError(`out.length must be ≥ ${n}, got ${out.length}`);
  if (work !== undefined && (work.length < n || work.buffer === out.buffer)) {
    throw new RangeError(`work must be a separate array of length ≥ ${n}, got length ${work.length}${work.buffer === out.buffer ? ' sharing out\'s buffer' : ''}`);
  }
  const fm = work ?? new Float64Array(n);
  discFluxes(xp, yp, n, rp, u1, u2, omega4, out);
  discFluxes(xm, ym, n, rm, u1, u2, omega4, fm);
  combinePair(xp, yp, rp, xm, ym, rm, u1, u2, omega4, n, fm, out);
  return out;
}

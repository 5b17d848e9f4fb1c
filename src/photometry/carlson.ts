/**
 * Carlson's symmetric elliptic integrals RF, RD, RJ, RC for real arguments,
 * by the duplication algorithms of Carlson (1995, Numer. Algorithms 10, 13,
 * §2, arXiv:math/9409227), also given as NIST DLMF §19.36(i).
 *
 * Method: each argument is replaced by (x + λ)/4 with λ = √x√y + √x√z + √y√z
 * (DLMF 19.26.18, the duplication theorem) until the arguments agree to the
 * requested relative tolerance r; the remainder is a fifth- or seventh-order
 * Taylor polynomial in the deviations (Carlson 1995 eqs. 2.2, 2.8, 2.13, 2.19,
 * DLMF 19.36.1-19.36.2). With r = 1e-16 the truncation error is below one
 * rounding error, so the accuracy is set by rounding (a few ulp).
 *
 * Use: moonsieve evaluates complete integrals with Bulirsch's `cel` in the hot
 * path (it measured faster, see bench/photometry.ts); these functions are the
 * independent second implementation the tests use as reference.
 *
 * Domain (Carlson 1995 §2): RF needs x, y, z ≥ 0 with at most one zero;
 * RD needs x, y ≥ 0 (not both zero), z > 0; RJ needs x, y, z ≥ 0 (at most one
 * zero) and p ≠ 0 (p < 0 is the Cauchy principal value); RC needs x ≥ 0,
 * y ≠ 0 (y < 0 is the Cauchy principal value). Out-of-domain input gives NaN,
 * and RF with two zero arguments is +∞ (the duplication loop would not end).
 */

/** Relative tolerance r of Carlson (1995); 1e-16 puts truncation below rounding. */
const TOL = 1e-16;
/** Q-scale factors of Carlson (1995) §2: (3r)^(-1/6), (r/4)^(-1/6), (3r)^(-1/8). */
const Q_RF = Math.pow(3 * TOL, -1 / 6);
const Q_RDJ = Math.pow(TOL / 4, -1 / 6);
const Q_RC = Math.pow(3 * TOL, -1 / 8);
/** Hard cap on duplication steps: convergence needs < 30 for any finite input. */
const MAX_STEPS = 100;

/** RF(x, y, z) = ½∫₀^∞ dt / √((t+x)(t+y)(t+z)) (Carlson 1995 eq. 2.1, algorithm eqs. 2.2-2.4). */
export function carlsonRF(x: number, y: number, z: number): number {
  if (!(x >= 0 && y >= 0 && z >= 0)) return NaN;
  if ((x === 0 ? 1 : 0) + (y === 0 ? 1 : 0) + (z === 0 ? 1 : 0) >= 2) return Infinity;
  const a0 = (x + y + z) / 3;
  let a = a0;
  const q = Q_RF * Math.max(Math.abs(a0 - x), Math.abs(a0 - y), Math.abs(a0 - z));
  let xm = x;
  let ym = y;
  let zm = z;
  let f = 1; // 4^{-m}
  for (let m = 0; m < MAX_STEPS && f * q >= Math.abs(a); m++) {
    const sx = Math.sqrt(xm);
    const sy = Math.sqrt(ym);
    const sz = Math.sqrt(zm);
    const lam = sx * sy + sx * sz + sy * sz;
    xm = (xm + lam) * 0.25;
    ym = (ym + lam) * 0.25;
    zm = (zm + lam) * 0.25;
    a = (a + lam) * 0.25;
    f *= 0.25;
  }
  const X = ((a0 - x) * f) / a;
  const Y = ((a0 - y) * f) / a;
  const Z = -X - Y;
  const e2 = X * Y - Z * Z;
  const e3 = X * Y * Z;
  // Carlson 1995 eq. 2.4 / DLMF 19.36.1
  return (1 - e2 / 10 + e3 / 14 + (e2 * e2) / 24 - (3 * e2 * e3) / 44) / Math.sqrt(a);
}

/** RC(x, y) = ½∫₀^∞ dt / (√(t+x)(t+y)) (Carlson 1995 eq. 2.12, algorithm eqs. 2.13-2.15). */
export function carlsonRC(x: number, y: number): number {
  if (!(x >= 0) || !(y !== 0) || Number.isNaN(y)) return NaN;
  if (y < 0) {
    // Cauchy principal value: RC(x, y) = √(x/(x−y))·RC(x−y, −y) (Carlson 1995 eq. 2.14).
    if (x === 0) return 0;
    return Math.sqrt(x / (x - y)) * carlsonRC(x - y, -y);
  }
  const a0 = (x + 2 * y) / 3;
  let a = a0;
  const q = Q_RC * Math.abs(a0 - x);
  let xm = x;
  let ym = y;
  let f = 1;
  for (let m = 0; m < MAX_STEPS && f * q >= Math.abs(a); m++) {
    const lam = 2 * Math.sqrt(xm) * Math.sqrt(ym) + ym;
    xm = (xm + lam) * 0.25;
    ym = (ym + lam) * 0.25;
    a = (a + lam) * 0.25;
    f *= 0.25;
  }
  const s = ((y - a0) * f) / a;
  const s2 = s * s;
  // Carlson 1995 eq. 2.15: 1 + 3s²/10 + s³/7 + 3s⁴/8 + 9s⁵/22 + 159s⁶/208 + 9s⁷/8
  const poly =
    1 + s2 * (3 / 10 + s * (1 / 7 + s * (3 / 8 + s * (9 / 22 + s * (159 / 208 + s * (9 / 8))))));
  return poly / Math.sqrt(a);
}

/**
 * RC(1, 1 + e) in closed form, e > −1: arctan(√e)/√e for e > 0 and
 * artanh(√−e)/√−e for e < 0 (DLMF 19.2.18-19.2.19 with x = 1, y = 1 + e),
 * with the Taylor series 1 − e/3 + e²/5 − … for |e| small. This is the term
 * Carlson (1995) eq. 2.19 accumulates in the RJ loop.
 */
function rc1(e: number): number {
  if (Math.abs(e) < 1e-4) return 1 + e * (-1 / 3 + e * (1 / 5 + e * (-1 / 7 + e * (1 / 9))));
  if (e > 0) {
    const s = Math.sqrt(e);
    return Math.atan(s) / s;
  }
  const s = Math.sqrt(-e);
  return Math.atanh(s) / s;
}

/** Taylor remainder shared by RD and RJ (Carlson 1995 eqs. 2.8 and 2.19, DLMF 19.36.2). */
function rdjPoly(e2: number, e3: number, e4: number, e5: number): number {
  return (
    1 -
    (3 * e2) / 14 +
    e3 / 6 +
    (9 * e2 * e2) / 88 -
    (3 * e4) / 22 -
    (9 * e2 * e3) / 52 +
    (3 * e5) / 26
  );
}

/** RD(x, y, z) = RJ(x, y, z, z) (Carlson 1995 eq. 2.5, algorithm eqs. 2.6-2.8). */
export function carlsonRD(x: number, y: number, z: number): number {
  if (!(x >= 0 && y >= 0 && z > 0) || x + y === 0) return NaN;
  const a0 = (x + y + 3 * z) / 5;
  let a = a0;
  const q = Q_RDJ * Math.max(Math.abs(a0 - x), Math.abs(a0 - y), Math.abs(a0 - z));
  let xm = x;
  let ym = y;
  let zm = z;
  let f = 1;
  let sum = 0;
  for (let m = 0; m < MAX_STEPS && f * q >= Math.abs(a); m++) {
    const sx = Math.sqrt(xm);
    const sy = Math.sqrt(ym);
    const sz = Math.sqrt(zm);
    const lam = sx * sy + sx * sz + sy * sz;
    sum += f / (sz * (zm + lam));
    xm = (xm + lam) * 0.25;
    ym = (ym + lam) * 0.25;
    zm = (zm + lam) * 0.25;
    a = (a + lam) * 0.25;
    f *= 0.25;
  }
  const X = ((a0 - x) * f) / a;
  const Y = ((a0 - y) * f) / a;
  const Z = -(X + Y) / 3;
  const xy = X * Y;
  const z2 = Z * Z;
  const e2 = xy - 6 * z2;
  const e3 = (3 * xy - 8 * z2) * Z;
  const e4 = 3 * (xy - z2) * z2;
  const e5 = xy * z2 * Z;
  return (f * rdjPoly(e2, e3, e4, e5)) / (a * Math.sqrt(a)) + 3 * sum;
}

/** RJ for p > 0 (Carlson 1995 eqs. 2.17-2.19). */
function rjPositive(x: number, y: number, z: number, p: number): number {
  const a0 = (x + y + z + 2 * p) / 5;
  let a = a0;
  const delta = (p - x) * (p - y) * (p - z);
  const q =
    Q_RDJ *
    Math.max(Math.abs(a0 - x), Math.abs(a0 - y), Math.abs(a0 - z), Math.abs(a0 - p));
  let xm = x;
  let ym = y;
  let zm = z;
  let pm = p;
  let f = 1; // 4^{-m}
  let f3 = 1; // 4^{-3m}
  let sum = 0;
  for (let m = 0; m < MAX_STEPS && f * q >= Math.abs(a); m++) {
    const sx = Math.sqrt(xm);
    const sy = Math.sqrt(ym);
    const sz = Math.sqrt(zm);
    const sp = Math.sqrt(pm);
    const lam = sx * sy + sx * sz + sy * sz;
    const d = (sp + sx) * (sp + sy) * (sp + sz);
    const e = (f3 * delta) / (d * d);
    sum += (f * rc1(e)) / d;
    xm = (xm + lam) * 0.25;
    ym = (ym + lam) * 0.25;
    zm = (zm + lam) * 0.25;
    pm = (pm + lam) * 0.25;
    a = (a + lam) * 0.25;
    f *= 0.25;
    f3 *= 1 / 64;
  }
  const X = ((a0 - x) * f) / a;
  const Y = ((a0 - y) * f) / a;
  const Z = ((a0 - z) * f) / a;
  const P = -(X + Y + Z) / 2;
  const P2 = P * P;
  const e2 = X * Y + X * Z + Y * Z - 3 * P2;
  const xyz = X * Y * Z;
  const e3 = xyz + 2 * e2 * P + 4 * P2 * P;
  const e4 = (2 * xyz + e2 * P + 3 * P2 * P) * P;
  const e5 = xyz * P2;
  return (f * rdjPoly(e2, e3, e4, e5)) / (a * Math.sqrt(a)) + 6 * sum;
}

/**
 * RJ(x, y, z, p) = (3/2)∫₀^∞ dt / ((t+p)√((t+x)(t+y)(t+z))) (Carlson 1995
 * eq. 2.16). For p < 0 the Cauchy principal value comes from the p > 0 value
 * at q = y + (z−y)(y−x)/(y−p) with x ≤ y ≤ z (Carlson 1995 §2, eq. 2.22; cf.
 * DLMF 19.20.14): (y−p)RJ(x,y,z,p) = (q−y)RJ(x,y,z,q) − 3RF(x,y,z) + 3√y·RC(xz, pq),
 * RC taken as its principal value since pq < 0. (This form reproduces
 * Carlson's published test values RJ(2,3,4,−0.5) and RJ(2,3,4,−5).)
 */
export function carlsonRJ(x: number, y: number, z: number, p: number): number {
  if (!(x >= 0 && y >= 0 && z >= 0) || !(p !== 0) || Number.isNaN(p)) return NaN;
  if ((x === 0 ? 1 : 0) + (y === 0 ? 1 : 0) + (z === 0 ? 1 : 0) >= 2) return NaN;
  if (p > 0) return rjPositive(x, y, z, p);
  // Sort so that xs ≤ ys ≤ zs (RJ is symmetric in x, y, z).
  const xs = Math.min(x, y, z);
  const zs = Math.max(x, y, z);
  const ys = x + y + z - xs - zs;
  const q = ys + ((zs - ys) * (ys - xs)) / (ys - p);
  const rc = Math.sqrt(ys) * carlsonRC(xs * zs, p * q);
  return ((q - ys) * rjPositive(xs, ys, zs, q) - 3 * carlsonRF(xs, ys, zs) + 3 * rc) / (ys - p);
}

/**
 * Complete integrals K, E, Π from Carlson forms (DLMF 19.25.1):
 * K(k) = RF(0, 1−k², 1); E(k) = K − (k²/3)RD(0, 1−k², 1);
 * Π(n, k) = K + (n/3)RJ(0, 1−k², 1, 1−n). Modulus k, characteristic n with
 * Π(n, k) = ∫₀^{π/2} dθ / ((1 − n sin²θ)√(1 − k² sin²θ)). Writes [K, E, Π] to `out`.
 */
export function completeCarlson(kc2: number, n: number, out: Float64Array): Float64Array {
  const k2 = 1 - kc2;
  const K = carlsonRF(0, kc2, 1);
  out[0] = K;
  out[1] = K - (k2 / 3) * carlsonRD(0, kc2, 1);
  out[2] = K + (n / 3) * carlsonRJ(0, kc2, 1, 1 - n);
  return out;
}

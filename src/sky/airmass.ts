/**
 * Relative air mass from altitude, Kasten & Young (1989, Applied Optics 28,
 * 4735, eq. 3): X = 1 / [sin h + 0.50572 (h + 6.07995°)^−1.6364], h in
 * degrees. Fitted to their ray-traced tables over the whole range 0°–90°, so
 * it holds down to the horizon (X ≈ 38 at h = 0) unlike sec z. Applied here to
 * the geometric (unrefracted) altitude; refraction is not modelled, which
 * changes X by under 0.5 % above airmass 3 (Kasten & Young 1989, Table 1).
 */

/** Air mass at altitude `altDeg` (degrees); +∞ below −6.07995° where the formula has no meaning. */
export function airmassKastenYoung(altDeg: number): number {
  if (!(altDeg > -6.07995)) return Number.POSITIVE_INFINITY;
  const x = 1 / (Math.sin((altDeg * Math.PI) / 180) + 0.50572 * (altDeg + 6.07995) ** -1.6364);
  return x > 0 ? x : Number.POSITIVE_INFINITY;
}

/**
 * The altitude (degrees) at which the air mass equals `airmass` (≥ 1): the
 * lowest altitude a target may have under an air-mass limit. Bisection on the
 * monotone Kasten–Young curve (X falls as h rises over 0°–90°).
 */
export function altitudeForAirmass(airmass: number): number {
  if (!(airmass >= 1)) throw new RangeError(`altitudeForAirmass: airmass must be ≥ 1, got ${airmass}`);
  let lo = 0;
  let hi = 90;
  if (airmassKastenYoung(lo) <= airmass) return lo;
  for (let i = 0; i < 60; i++) {
    const mid = 0.5 * (lo + hi);
    if (airmassKastenYoung(mid) > airmass) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

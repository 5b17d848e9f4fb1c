/**
 * Hill radius of a planet orbiting a star.
 *
 * Method: the radius of the Hill sphere in the circular restricted three-body
 * problem, R_H = a_P (M_P / (3 M*))^{1/3} (Hamilton & Burns 1992, Icarus 96,
 * 43 — "Orbital stability zones about asteroids II: the destabilizing
 * effects of eccentric orbits"). For an eccentric planetary orbit the sphere is
 * smallest at pericentre, R_H,peri = a_P (1 − e_P)(M_P / (3 M*))^{1/3}; Hamilton
 * & Burns (1992) find that stability zones scale with this pericentre distance
 * (from memory of the paper; not re-checked).
 *
 * Which one to use: the stability fits of Domingos, Winter & Yokoyama (2006)
 * express the critical semi-major axis "in units of Hill's radius" with the
 * planet's eccentricity inside the fit, (1 − 1.0305 e_P − …). That factor
 * already carries the eccentricity, so their unit is the circular form
 * `hillRadius` (no (1 − e) factor) — our reading of the paper, from memory; the
 * abstract (checked) says only "in the units of Hill's radius".
 * `stableSeparationLimit` therefore uses `hillRadius`.
 *
 * Units: SI (m, kg). Domain: a > 0, M_P > 0, M* > 0, 0 ≤ e < 1. M_P ≪ M* is
 * assumed (the formula is the leading term in (M_P/M*)^{1/3}).
 */

function requirePositive(name: string, value: number): void {
  if (!(value > 0) || !Number.isFinite(value)) {
    throw new RangeError(`${name} must be a positive finite number, got ${value}`);
  }
}

/**
 * Circular Hill radius R_H = a (M_P/(3 M*))^{1/3}, m
 * (Hamilton & Burns 1992, Icarus 96, 43).
 * @param semiMajorAxisM planet's semi-major axis around the star, m
 * @param planetMassKg planet mass, kg
 * @param starMassKg star mass, kg
 */
export function hillRadius(semiMajorAxisM: number, planetMassKg: number, starMassKg: number): number {
  requirePositive('semiMajorAxisM', semiMajorAxisM);
  requirePositive('planetMassKg', planetMassKg);
  requirePositive('starMassKg', starMassKg);
  return semiMajorAxisM * Math.cbrt(planetMassKg / (3 * starMassKg));
}

/**
 * Pericentre Hill radius a (1 − e)(M_P/(3 M*))^{1/3}, m: the Hill radius at the
 * planet's closest approach to the star (Hamilton & Burns 1992, Icarus 96, 43).
 * Not the unit of the Domingos et al. (2006) fits; see the module comment.
 * @param semiMajorAxisM planet's semi-major axis, m
 * @param eccentricity planet's orbital eccentricity, 0 ≤ e < 1
 */
export function hillRadiusPericentre(
  semiMajorAxisM: number,
  eccentricity: number,
  planetMassKg: number,
  starMassKg: number,
): number {
  if (!(eccentricity >= 0 && eccentricity < 1)) {
    throw new RangeError(`eccentricity must be in [0, 1), got ${eccentricity}`);
  }
  return (1 - eccentricity) * hillRadius(semiMajorAxisM, planetMassKg, starMassKg);
}

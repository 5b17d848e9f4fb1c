/**
 * Tidal migration of a moon and the largest moon that survives it.
 *
 * Migration law (planet tide, constant Q, planet spinning faster than the moon
 * orbits; Goldreich & Soter 1966, Icarus 5, 375; Murray & Dermott 1999, Solar
 * System Dynamics, eq. 4.213 [equation number from memory]; used in this form by
 * Barnes & O'Brien 2002, ApJ 575, 1087):
 *
 *   da/dt = 3 k2p M_S R_P⁵ sqrt(G/M_P) / (Q_P a^{11/2})
 *
 * Largest surviving moon (Barnes & O'Brien 2002, ApJ 575, 1087; derived here
 * from the law above). Write C = 3 k2p R_P⁵ sqrt(G/M_P)/Q_P, so that
 * a^{11/2} da = C M_S dt. Integrating from the starting separation a0 to the
 * stability limit a_crit = f R_H:
 *
 *   (2/13) (a_crit^{13/2} − a0^{13/2}) = C M_S t_escape.
 *
 * The moon is still bound after the system age T when t_escape ≥ T, i.e.
 *
 *   M_S ≤ M_S,max = (2/13) (a_crit^{13/2} − a0^{13/2}) / (C T).
 *
 * With a0 → 0 (a moon formed close in; a0^{13/2} is negligible once a0 ≪ a_crit)
 * and R_H = a_P (M_P/(3M*))^{1/3}:
 *
 *   M_S,max = (2/13) (f a_P)^{13/2} (M_P/(3M*))^{13/6} Q_P M_P^{1/2} / (3 k2p T G^{1/2} R_P⁵).
 *
 * f is the stable fraction of the Hill radius; the default is the Domingos,
 * Winter & Yokoyama (2006, MNRAS 373, 1227) prograde value 0.4895 for circular
 * orbits; Barnes & O'Brien used a smaller fraction (≈ 0.36, from memory).
 * Limitations: ignores the planet's despinning by the star (which B&O also
 * model), inward migration once the planet spins slower than the moon orbits,
 * and the moon's own tide. Units: SI.
 */
import { G } from './constants.js';
import { hillRadius } from './hillRadius.js';
import { DWY06_PROGRADE } from './stability.js';

function requirePositive(name: string, value: number): void {
  if (!(value > 0) || !Number.isFinite(value)) {
    throw new RangeError(`${name} must be a positive finite number, got ${value}`);
  }
}

/**
 * Rate of outward tidal migration da/dt, m s^-1 (Goldreich & Soter 1966;
 * Murray & Dermott 1999; Barnes & O'Brien 2002, ApJ 575, 1087).
 * Kernel: no validation, NaN propagates.
 */
export function tidalMigrationRate(
  separationM: number,
  moonMassKg: number,
  planetMassKg: number,
  planetRadiusM: number,
  planetK2: number,
  planetTidalQ: number,
): number {
  return (
    (3 * planetK2 * moonMassKg * planetRadiusM ** 5 * Math.sqrt(G / planetMassKg)) /
    (planetTidalQ * separationM ** 5.5)
  );
}

export interface TidalSurvivalInput {
  planetMassKg: number;
  planetRadiusM: number;
  /** Planet tidal Love number k2. */
  planetK2: number;
  /** Planet tidal quality factor Q. */
  planetTidalQ: number;
  starMassKg: number;
  /** Planet's semi-major axis around the star, m. */
  planetSemiMajorAxisM: number;
  /** Time available for migration (system age), s. */
  ageS: number;
  /** Fraction f of the Hill radius at which the moon is lost; default 0.4895 (DWY06 prograde). */
  stableFraction?: number;
  /** Separation at which the moon starts, m; default 0 (formed close in). */
  initialSeparationM?: number;
}

/**
 * Largest moon mass that survives outward tidal migration over `ageS`, kg
 * (Barnes & O'Brien 2002, ApJ 575, 1087; derivation in the module comment).
 * Throws RangeError for out-of-domain input.
 */
export function tidalSurvivalMassMax(input: TidalSurvivalInput): number {
  const {
    planetMassKg,
    planetRadiusM,
    planetK2,
    planetTidalQ,
    starMassKg,
    planetSemiMajorAxisM,
    ageS,
    stableFraction = DWY06_PROGRADE.c0,
    initialSeparationM = 0,
  } = input;
  requirePositive('planetMassKg', planetMassKg);
  requirePositive('starMassKg', starMassKg);
  requirePositive('planetSemiMajorAxisM', planetSemiMajorAxisM);
  requirePositive('planetRadiusM', planetRadiusM);
  requirePositive('planetK2', planetK2);
  requirePositive('planetTidalQ', planetTidalQ);
  requirePositive('ageS', ageS);
  if (!(stableFraction > 0 && stableFraction <= 1)) {
    throw new RangeError(`stableFraction must be in (0, 1], got ${stableFraction}`);
  }
  const aCrit = stableFraction * hillRadius(planetSemiMajorAxisM, planetMassKg, starMassKg);
  if (!(initialSeparationM >= 0 && initialSeparationM < aCrit)) {
    throw new RangeError(
      `initialSeparationM must be in [0, ${aCrit} m) (below the stability limit), got ${initialSeparationM}`,
    );
  }
  const c = (3 * planetK2 * planetRadiusM ** 5 * Math.sqrt(G / planetMassKg)) / planetTidalQ;
  // (a^{13/2} − a0^{13/2}) written as a^{13/2}(1 − (a0/a)^{13/2}) to avoid overflow.
  const span = aCrit ** 6.5 * (1 - (initialSeparationM / aCrit) ** 6.5);
  return ((2 / 13) * span) / (c * ageS);
}

/**
 * Time for a moon of mass M_S to migrate from a0 to a1 (a1 > a0), s:
 * t = (2/13)(a1^{13/2} − a0^{13/2}) / (C M_S), the integral of the migration law
 * (Barnes & O'Brien 2002, ApJ 575, 1087; derived in the module comment).
 */
export function tidalMigrationTime(
  fromSeparationM: number,
  toSeparationM: number,
  moonMassKg: number,
  planetMassKg: number,
  planetRadiusM: number,
  planetK2: number,
  planetTidalQ: number,
): number {
  if (!(fromSeparationM >= 0)) throw new RangeError(`fromSeparationM must be ≥ 0, got ${fromSeparationM}`);
  if (!(toSeparationM > fromSeparationM) || !Number.isFinite(toSeparationM)) {
    throw new RangeError(`toSeparationM must be finite and > fromSeparationM (${fromSeparationM}), got ${toSeparationM}`);
  }
  requirePositive('moonMassKg', moonMassKg);
  requirePositive('planetMassKg', planetMassKg);
  requirePositive('planetRadiusM', planetRadiusM);
  requirePositive('planetK2', planetK2);
  requirePositive('planetTidalQ', planetTidalQ);
  const c = (3 * planetK2 * planetRadiusM ** 5 * Math.sqrt(G / planetMassKg)) / planetTidalQ;
  const span = toSeparationM ** 6.5 * (1 - (fromSeparationM / toSeparationM) ** 6.5);
  return ((2 / 13) * span) / (c * moonMassKg);
}

/**
 * Outer limit of long-term stable moon orbits.
 *
 * Method: the empirical fits of Domingos, Winter & Yokoyama (2006, MNRAS 373,
 * 1227, "Stable satellites around extrasolar giant planets", eqs. 3–4 [equation
 * numbers from memory]) to numerical integrations of the restricted elliptic
 * three-body problem. The critical semi-major axis beyond which a moon does not
 * remain stable, in units of the Hill radius R_H = a_P (M_P/(3M*))^{1/3}:
 *
 *   prograde    a_crit = 0.4895 R_H (1.0000 − 1.0305 e_P − 0.2738 e_S)
 *   retrograde  a_crit = 0.9309 R_H (1.0000 − 1.0764 e_P − 0.9812 e_S)
 *
 * The coefficients were checked against the paper's published abstract
 * (MNRAS 373, 1227). R_H is the circular Hill radius (no (1 − e_P) factor),
 * since the fit carries e_P itself (see hillRadius.ts).
 *
 * Domain: the fits were made for moderate eccentricities (roughly e ≲ 0.5, from
 * memory); beyond that they are an extrapolation. Where the bracket becomes
 * ≤ 0 no stable orbit is predicted and the limit is returned as 0.
 * Independent check: Shen & Tremaine (2008, AJ 136, 2453) find prograde moons
 * surviving to ~0.5 R_H and retrograde ones to ~0.7 R_H (abstract).
 */
import { hillRadius } from './hillRadius.js';

/** DWY06 prograde coefficients: a_crit/R_H = c0 (1 − cP e_P − cS e_S). */
export const DWY06_PROGRADE = { c0: 0.4895, cP: 1.0305, cS: 0.2738 } as const;
/** DWY06 retrograde coefficients: a_crit/R_H = c0 (1 − cP e_P − cS e_S). */
export const DWY06_RETROGRADE = { c0: 0.9309, cP: 1.0764, cS: 0.9812 } as const;

export interface StableSeparationInput {
  /** Planet's semi-major axis around the star, m. */
  planetSemiMajorAxisM: number;
  /** Planet's orbital eccentricity around the star, 0 ≤ e < 1. */
  planetEccentricity: number;
  planetMassKg: number;
  starMassKg: number;
  /** Moon's orbital eccentricity around the planet, 0 ≤ e < 1. */
  moonEccentricity: number;
}

export interface StableSeparationLimit {
  /** Critical semi-major axis for a prograde moon, m (0 if none is stable). */
  prograde: number;
  /** Critical semi-major axis for a retrograde moon, m (0 if none is stable). */
  retrograde: number;
  /** The Hill radius used (circular form), m. */
  hillRadiusM: number;
}

/**
 * Fraction of the Hill radius within which a moon stays stable
 * (Domingos, Winter & Yokoyama 2006, MNRAS 373, 1227). Kernel: NaN outside
 * 0 ≤ e < 1; 0 where the fit predicts no stable orbit.
 */
export function stableHillFraction(
  planetEccentricity: number,
  moonEccentricity: number,
  retrograde: boolean,
): number {
  if (!(planetEccentricity >= 0 && planetEccentricity < 1)) return NaN;
  if (!(moonEccentricity >= 0 && moonEccentricity < 1)) return NaN;
  const k = retrograde ? DWY06_RETROGRADE : DWY06_PROGRADE;
  const f = k.c0 * (1 - k.cP * planetEccentricity - k.cS * moonEccentricity);
  return f > 0 ? f : 0;
}

/**
 * Critical semi-major axes (prograde and retrograde) beyond which a moon is not
 * long-term stable, m (Domingos, Winter & Yokoyama 2006, MNRAS 373, 1227).
 * Throws RangeError for out-of-domain input.
 */
export function stableSeparationLimit(input: StableSeparationInput): StableSeparationLimit {
  const { planetSemiMajorAxisM, planetEccentricity, planetMassKg, starMassKg, moonEccentricity } = input;
  if (!(planetEccentricity >= 0 && planetEccentricity < 1)) {
    throw new RangeError(`planetEccentricity must be in [0, 1), got ${planetEccentricity}`);
  }
  if (!(moonEccentricity >= 0 && moonEccentricity < 1)) {
    throw new RangeError(`moonEccentricity must be in [0, 1), got ${moonEccentricity}`);
  }
  const rH = hillRadius(planetSemiMajorAxisM, planetMassKg, starMassKg);
  return {
    prograde: rH * stableHillFraction(planetEccentricity, moonEccentricity, false),
    retrograde: rH * stableHillFraction(planetEccentricity, moonEccentricity, true),
    hillRadiusM: rH,
  };
}

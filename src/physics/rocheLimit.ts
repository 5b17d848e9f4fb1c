/**
 * Roche limit: the closest distance at which a moon held together only by its
 * own gravity survives the planet's tide.
 *
 * Method: d = k R_P (ρ_P/ρ_S)^{1/3}, with
 * - fluid (strengthless, tidally deformed) moon: k = 2.44, the classical Roche
 *   (1849) value as given in standard texts (e.g. Murray & Dermott 1999, Solar
 *   System Dynamics, §4.11 [section number from memory]); Chandrasekhar (1969,
 *   Ellipsoidal Figures of Equilibrium) refines it to k ≈ 2.455 (from memory),
 *   exposed as ROCHE_K_FLUID_CHANDRASEKHAR.
 * - rigid spherical moon: k = 2^{1/3} ≈ 1.26 (balance of the tidal and
 *   self-gravitational accelerations at the sub-planet point; Murray & Dermott
 *   1999, Solar System Dynamics, §4.11, or any textbook).
 *
 * Units: SI (m, kg m^-3). Domain: all arguments > 0.
 */

/** Classical fluid Roche coefficient (Roche 1849, as in standard texts). */
export const ROCHE_K_FLUID = 2.44;
/** Chandrasekhar's (1969) refined fluid coefficient (from memory). */
export const ROCHE_K_FLUID_CHANDRASEKHAR = 2.455;
/** Rigid-sphere coefficient 2^{1/3}. */
export const ROCHE_K_RIGID = Math.cbrt(2);

function requirePositive(name: string, value: number): void {
  if (!(value > 0) || !Number.isFinite(value)) {
    throw new RangeError(`${name} must be a positive finite number, got ${value}`);
  }
}

/** Mean density of a sphere, 3M/(4πR³), kg m^-3. */
export function meanDensity(massKg: number, radiusM: number): number {
  requirePositive('massKg', massKg);
  requirePositive('radiusM', radiusM);
  return (3 * massKg) / (4 * Math.PI * radiusM ** 3);
}

export interface RocheLimit {
  /** Fluid-moon Roche limit (k = 2.44), m. */
  fluidM: number;
  /** Rigid-moon Roche limit (k = 2^{1/3}), m. */
  rigidM: number;
}

/**
 * Roche limits for a fluid and a rigid moon, m: d = k R_P (ρ_P/ρ_S)^{1/3}
 * (Roche 1849; see the module comment for k).
 * @param planetRadiusM planet radius, m
 * @param planetDensityKgM3 planet mean density, kg m^-3
 * @param moonDensityKgM3 moon mean density, kg m^-3
 */
export function rocheLimit(planetRadiusM: number, planetDensityKgM3: number, moonDensityKgM3: number): RocheLimit {
  requirePositive('planetRadiusM', planetRadiusM);
  requirePositive('planetDensityKgM3', planetDensityKgM3);
  requirePositive('moonDensityKgM3', moonDensityKgM3);
  const scale = planetRadiusM * Math.cbrt(planetDensityKgM3 / moonDensityKgM3);
  return { fluidM: ROCHE_K_FLUID * scale, rigidM: ROCHE_K_RIGID * scale };
}

/**
 * Runaway-greenhouse flux limit of a water-rich world, with its dependence on
 * surface gravity.
 *
 * Method: the semi-analytic limit of Pierrehumbert (2010, Principles of
 * Planetary Climate, Cambridge University Press, §4.6 [section from memory]),
 * in the form used by Heller & Barnes (2013, Astrobiology 13, 18) for exomoons:
 *
 *   F_RG = o σ_SB [ l / (R ln( P* / sqrt(2 P0 g / k0) )) ]⁴
 *
 * o = 0.7344 (fit factor), l = 2.425e6 J kg^-1 (latent heat of water),
 * R = 461.5 J kg^-1 K^-1 (gas constant of water vapour), P* = 1.4e11 Pa,
 * P0 = 1e4 Pa, k0 = 0.055 m² kg^-1 (grey absorption coefficient at P0).
 * The constants are from memory (not re-checked against the book); with them
 * Earth's gravity gives ≈ 294 W m^-2, matching the ≈ 295 W m^-2 that Heller &
 * Barnes (2013) quote (also from memory).
 *
 * F_RG is an absorbed, globally averaged flux: compare it with the total of
 * moonEnergyBudget (energyBudget.ts). Units: SI. Domain: g > 0 and
 * sqrt(2 P0 g/k0) < P* (true for any planet-sized body: g < ~5e19 m s^-2).
 */
import { G, SIGMA_SB } from './constants.js';

/** Constants of Pierrehumbert (2010) as used by Heller & Barnes (2013) (from memory). */
export const PIERREHUMBERT_RUNAWAY = {
  o: 0.7344,
  latentHeatJKg: 2.425e6,
  gasConstantJKgK: 461.5,
  pStarPa: 1.4e11,
  p0Pa: 1e4,
  k0M2Kg: 0.055,
} as const;

/** Surface gravity G M / R², m s^-2 (Newton). */
export function surfaceGravity(massKg: number, radiusM: number): number {
  if (!(massKg > 0) || !Number.isFinite(massKg)) {
    throw new RangeError(`massKg must be a positive finite number, got ${massKg}`);
  }
  if (!(radiusM > 0) || !Number.isFinite(radiusM)) {
    throw new RangeError(`radiusM must be a positive finite number, got ${radiusM}`);
  }
  return (G * massKg) / (radiusM * radiusM);
}

/**
 * Runaway-greenhouse limit on the absorbed, globally averaged flux, W m^-2
 * (Pierrehumbert 2010, as used by Heller & Barnes 2013, Astrobiology 13, 18).
 * @param surfaceGravityMS2 surface gravity, m s^-2
 */
export function runawayGreenhouseFlux(surfaceGravityMS2: number): number {
  const { o, latentHeatJKg, gasConstantJKgK, pStarPa, p0Pa, k0M2Kg } = PIERREHUMBERT_RUNAWAY;
  const g = surfaceGravityMS2;
  if (!(g > 0) || !Number.isFinite(g)) {
    throw new RangeError(`surfaceGravityMS2 must be a positive finite number, got ${g}`);
  }
  const logArg = pStarPa / Math.sqrt((2 * p0Pa * g) / k0M2Kg);
  if (!(logArg > 1)) {
    throw new RangeError(`surfaceGravityMS2 = ${g} is too large for the Pierrehumbert (2010) limit`);
  }
  const t = latentHeatJKg / (gasConstantJKgK * Math.log(logArg));
  return o * SIGMA_SB * t ** 4;
}

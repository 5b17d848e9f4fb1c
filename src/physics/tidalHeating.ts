/**
 * Tidal heating of an eccentric, synchronously rotating moon.
 *
 * Method: constant-phase-lag (constant Q) dissipation to lowest order in the
 * eccentricity (Peale, Cassen & Reynolds 1979, Science 203, 892; Segatz et al.
 * 1988, Icarus 75, 187, with Im(k2) = k2/Q):
 *
 *   Ė = (21/2) (k2/Q) G M_P² R_S⁵ n e² / a⁶
 *
 * and the globally averaged surface heat flux h = Ė / (4π R_S²).
 * n is the moon's mean motion, from Kepler's third law n² a³ = G (M_P + M_S).
 *
 * Domain and accuracy: e ≪ 1 (the e² law underestimates by ~8 % at e = 0.1 and
 * ×2 at e = 0.3, relative to constant-time-lag eccentricity functions, e.g.
 * Leconte et al. 2010, A&A 516, A64); synchronous rotation, zero obliquity,
 * homogeneous k2/Q. Checked against Io (test/physics/tidalHeating.test.ts).
 * Units: SI (W, W m^-2).
 */
import { G } from './constants.js';

export interface TidalHeatingInput {
  planetMassKg: number;
  moonMassKg: number;
  moonRadiusM: number;
  /** Semi-major axis of the planet–moon orbit, m. */
  separationM: number;
  /** Moon's orbital eccentricity, 0 ≤ e < 1 (the formula assumes e ≪ 1). */
  eccentricity: number;
  /** Moon's tidal Love number k2. */
  moonK2: number;
  /** Moon's tidal quality factor Q. */
  moonTidalQ: number;
}

function requirePositive(name: string, value: number): void {
  if (!(value > 0) || !Number.isFinite(value)) {
    throw new RangeError(`${name} must be a positive finite number, got ${value}`);
  }
}

/**
 * Total tidal heating power of the moon, W
 * (Peale, Cassen & Reynolds 1979, Science 203, 892; Segatz et al. 1988, Icarus 75, 187).
 */
export function tidalHeatingPower(input: TidalHeatingInput): number {
  const { planetMassKg, moonMassKg, moonRadiusM, separationM, eccentricity, moonK2, moonTidalQ } = input;
  requirePositive('planetMassKg', planetMassKg);
  if (!(moonMassKg >= 0) || !Number.isFinite(moonMassKg)) {
    throw new RangeError(`moonMassKg must be a finite number ≥ 0, got ${moonMassKg}`);
  }
  requirePositive('moonRadiusM', moonRadiusM);
  requirePositive('separationM', separationM);
  if (!(eccentricity >= 0 && eccentricity < 1)) {
    throw new RangeError(`eccentricity must be in [0, 1), got ${eccentricity}`);
  }
  if (!(moonK2 >= 0) || !Number.isFinite(moonK2)) {
    throw new RangeError(`moonK2 must be a finite number ≥ 0, got ${moonK2}`);
  }
  requirePositive('moonTidalQ', moonTidalQ);
  const n = Math.sqrt((G * (planetMassKg + moonMassKg)) / separationM ** 3);
  return (
    ((21 / 2) * (moonK2 / moonTidalQ) * G * planetMassKg ** 2 * moonRadiusM ** 5 * n * eccentricity ** 2) /
    separationM ** 6
  );
}

/** Globally averaged tidal surface heat flux Ė/(4πR_S²), W m^-2. */
export function tidalHeatFlux(input: TidalHeatingInput): number {
  return tidalHeatingPower(input) / (4 * Math.PI * input.moonRadiusM ** 2);
}

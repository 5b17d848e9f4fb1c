/**
 * Kepler's third law for a two-body orbit, Newtonian form
 * P² = 4π² a³ / (G (m1 + m2)) (Murray & Dermott 1999, "Solar System Dynamics",
 * eq. 2.22). `a` is the semi-major axis of the relative orbit (for the
 * planet–moon pair: the moon's orbit about the planet), SI units throughout.
 */

import { G } from './constants.js';

function requirePositive(fn: string, name: string, value: number): void {
  if (!(value > 0) || !Number.isFinite(value)) {
    throw new RangeError(`${fn}: ${name} must be a positive finite number, got ${value}`);
  }
}

/**
 * Semi-major axis (m) of the relative orbit with period `periodS` (s) about a
 * total mass `totalMassKg` (kg): a = (G M P² / 4π²)^(1/3) (Murray & Dermott 1999, eq. 2.22).
 * @throws RangeError if either argument is not a positive finite number.
 */
export function semiMajorAxis(periodS: number, totalMassKg: number): number {
  requirePositive('semiMajorAxis', 'periodS', periodS);
  requirePositive('semiMajorAxis', 'totalMassKg', totalMassKg);
  return Math.cbrt((G * totalMassKg * periodS * periodS) / (4 * Math.PI * Math.PI));
}

/**
 * Orbital period (s) of a relative orbit with semi-major axis `aM` (m) about a
 * total mass `totalMassKg` (kg): P = 2π √(a³ / (G M)) (Murray & Dermott 1999, eq. 2.22).
 * @throws RangeError if either argument is not a positive finite number.
 */
export function orbitalPeriod(aM: number, totalMassKg: number): number {
  requirePositive('orbitalPeriod', 'aM', aM);
  requirePositive('orbitalPeriod', 'totalMassKg', totalMassKg);
  return 2 * Math.PI * Math.sqrt((aM * aM * aM) / (G * totalMassKg));
}

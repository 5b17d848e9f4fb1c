/**
 * Transit durations and impact parameter of a body on a Keplerian orbit
 * (closed forms; no moon).
 *
 * Definitions (Winn 2010, "Transits and Occultations", arXiv:1001.2010, §2.3):
 * - t14: first to fourth contact (total duration).
 * - t23: second to third contact (full, flat-bottomed part). For a grazing
 *   transit (no second and third contacts, b > |1 − p|) t23 = 0.
 * - ingressS: (t14 − t23)/2, the mean of ingress and egress durations.
 * - tMidS: (t14 + t23)/2, mid-ingress to mid-egress, ≈ T0 √(1 − b²) with
 *   T0 = (R* P / π a) √(1 − e²)/(1 + e sin ω) (Winn 2010 eqs. 18–19) when
 *   p ≪ 1 and b is not near 1.
 * - No transit (b ≥ 1 + p): every duration is 0.
 *
 * Accuracy: exact for circular orbits; for eccentric orbits Winn's eq. 16
 * factor assumes the sky velocity is constant across the transit. Measured in
 * test/physics/transitDuration.test.ts against root-finding on the Keplerian
 * sky separation: P = 10 d, a/R* = 20, p = 0.1, e = 0.3, ω = 90°, i = 89°
 * gives t14 2.6 s short of the exact 3.00879 h (relative 2.4e-4); other
 * orientations with e ≤ 0.6 at a/R* = 20 err by 1e-5 to 8e-4 (relative).
 */
import type { Scenario } from '../scenario/types.js';

export interface TransitGeometry {
  /** Orbital period, s. */
  periodS: number;
  /** Semi-major axis in stellar radii, a/R* (> 1). */
  aOverRstar: number;
  /** Radius ratio p = R_p/R* (> 0). */
  radiusRatio: number;
  /** Impact parameter b at conjunction, stellar radii (Winn 2010 eq. 7), ≥ 0. */
  impactParameter: number;
  /** Orbital inclination to the sky plane, rad (π/2 = edge-on); must be consistent with b. */
  inclinationRad: number;
  eccentricity: number;
  /** Argument of periastron, rad (Winn 2010 convention: transit at f = π/2 − ω). */
  omegaRad: number;
}

export interface TransitDurations {
  /** First to fourth contact, s. */
  t14S: number;
  /** Second to third contact, s (0 for a grazing transit). */
  t23S: number;
  /** Mid-ingress to mid-egress, (t14 + t23)/2, s. */
  tMidS: number;
  /** Mean ingress/egress duration, (t14 − t23)/2, s. */
  ingressS: number;
}

function fail(fn: string, name: string, value: number, allowed: string): never {
  throw new RangeError(`${fn}: ${name} must be ${allowed}, got ${value}`);
}

/**
 * Impact parameter at conjunction, stellar radii:
 * b = (a cos i / R*) (1 − e²)/(1 + e sin ω) (Winn 2010, arXiv:1001.2010, eq. 7).
 * @throws RangeError on a non-positive a/R*, i outside [0, π], e outside [0, 1) or non-finite ω.
 */
export function impactParameter(aOverRstar: number, inclinationRad: number, e: number, omegaRad: number): number {
  const fn = 'impactParameter';
  if (!(aOverRstar > 0) || !Number.isFinite(aOverRstar)) fail(fn, 'aOverRstar', aOverRstar, 'a positive finite number');
  if (!(inclinationRad >= 0 && inclinationRad <= Math.PI)) fail(fn, 'inclinationRad', inclinationRad, 'in [0, π]');
  if (!(e >= 0 && e < 1)) fail(fn, 'e', e, 'in [0, 1)');
  if (!Number.isFinite(omegaRad)) fail(fn, 'omegaRad', omegaRad, 'a finite angle');
  return (aOverRstar * Math.cos(inclinationRad) * (1 - e * e)) / (1 + e * Math.sin(omegaRad));
}

/**
 * Inclination (rad, in [0, π/2]) that gives impact parameter b ≥ 0: the inverse of
 * Winn 2010 eq. 7, i = arccos[b (1 + e sin ω) / ((a/R*)(1 − e²))].
 * @throws RangeError on invalid arguments or when b exceeds the value for i = 0.
 */
export function inclinationFromImpact(impact: number, aOverRstar: number, e: number, omegaRad: number): number {
  const fn = 'inclinationFromImpact';
  if (!(impact >= 0) || !Number.isFinite(impact)) fail(fn, 'impactParameter', impact, 'a non-negative finite number');
  if (!(aOverRstar > 0) || !Number.isFinite(aOverRstar)) fail(fn, 'aOverRstar', aOverRstar, 'a positive finite number');
  if (!(e >= 0 && e < 1)) fail(fn, 'e', e, 'in [0, 1)');
  if (!Number.isFinite(omegaRad)) fail(fn, 'omegaRad', omegaRad, 'a finite angle');
  const cosI = (impact * (1 + e * Math.sin(omegaRad))) / (aOverRstar * (1 - e * e));
  if (cosI > 1) {
    fail(fn, 'impactParameter', impact, `at most ${(aOverRstar * (1 - e * e)) / (1 + e * Math.sin(omegaRad))} (the value for i = 0) for this orbit`);
  }
  return Math.acos(cosI);
}

/**
 * One Winn (2010) duration: (P/π) arcsin[√(c² − b²) / ((a/R*) sin i)] times the
 * eccentric factor √(1 − e²)/(1 + e sin ω) (Winn 2010 eqs. 14–16; circular form
 * also Seager & Mallén-Ornelas 2003, ApJ 585, 1038, eqs. 3–4). c = 1 ± p.
 * The arcsin argument is clipped at 1 (a chord longer than the orbit allows).
 */
function winnDuration(periodS: number, aOverRstar: number, c: number, b: number, sinI: number, ecc: number): number {
  const chord2 = c * c - b * b;
  if (!(chord2 > 0)) return 0;
  const arg = Math.min(1, Math.sqrt(chord2) / (aOverRstar * sinI));
  return (periodS / Math.PI) * Math.asin(arg) * ecc;
}

/**
 * Closed-form transit durations (Winn 2010 eqs. 14–16; Seager & Mallén-Ornelas
 * 2003 eqs. 3–4); definitions and accuracy in the file header. `impactParameter`
 * sets the chord and `inclinationRad` the sin i factor; pass consistent values
 * (see `impactParameter`).
 * @throws RangeError naming the first invalid field.
 */
export function transitDurations(g: TransitGeometry): TransitDurations {
  const fn = 'transitDurations';
  const { periodS, aOverRstar, radiusRatio: p, impactParameter: b, inclinationRad, eccentricity: e, omegaRad } = g;
  if (!(periodS > 0) || !Number.isFinite(periodS)) fail(fn, 'periodS', periodS, 'a positive finite number');
  if (!(aOverRstar > 1) || !Number.isFinite(aOverRstar)) fail(fn, 'aOverRstar', aOverRstar, 'a finite number > 1');
  if (!(p > 0) || !Number.isFinite(p)) fail(fn, 'radiusRatio', p, 'a positive finite number');
  if (!(b >= 0) || !Number.isFinite(b)) fail(fn, 'impactParameter', b, 'a non-negative finite number');
  if (!(inclinationRad > 0 && inclinationRad < Math.PI)) fail(fn, 'inclinationRad', inclinationRad, 'in (0, π)');
  if (!(e >= 0 && e < 1)) fail(fn, 'eccentricity', e, 'in [0, 1)');
  if (!Number.isFinite(omegaRad)) fail(fn, 'omegaRad', omegaRad, 'a finite angle');

  const sinI = Math.sin(inclinationRad);
  // Eccentric factor (Winn 2010 eq. 16).
  const ecc = Math.sqrt(1 - e * e) / (1 + e * Math.sin(omegaRad));
  const t14S = winnDuration(periodS, aOverRstar, 1 + p, b, sinI, ecc);
  const t23S = winnDuration(periodS, aOverRstar, 1 - p, b, sinI, ecc);
  return { t14S, t23S, tMidS: 0.5 * (t14S + t23S), ingressS: 0.5 * (t14S - t23S) };
}

/** Planet-only closed-form durations of the scenario (Winn 2010 eqs. 14–16). */
export function scenarioDurations(s: Scenario): TransitDurations {
  return transitDurations({
    periodS: s.planet.periodS,
    aOverRstar: s.planet.semiMajorAxisM / s.star.radiusM,
    radiusRatio: s.planet.radiusM / s.star.radiusM,
    impactParameter: s.planet.impactParameter,
    inclinationRad: s.planet.inclinationRad,
    eccentricity: s.planet.eccentricity,
    omegaRad: s.planet.omegaRad,
  });
}

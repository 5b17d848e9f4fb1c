/**
 * The moon implied by TTV and TDV amplitudes: the inverse of Kipping's
 * barycentric timing relations (Kipping 2009a, MNRAS 392, 181; 2009b, MNRAS
 * 396, 1797), as written in physics/timingSignals.ts for a circular moon
 * orbit:
 *   A_TTV = a_PB/v_B,   A_TDV = τ̄·v_PB/v_B,   v_PB = 2π a_PB/P_S,
 *   a_PB = a_S·M_S/(M_P + M_S),   a_S³ = G(M_P + M_S)P_S²/(4π²) (Kepler III),
 * A the semi-amplitudes for a coplanar orbit, v_B the barycentre's sky speed,
 * τ̄ the transit duration. The planet keeps moving during the transit, so the
 * observed amplitudes are these times cos w (TTV) and sin w / w (TDV),
 * w = πτ̄/P_S (physics/transitAveraging.ts, derived there). Hence
 *   η = A_TDV/A_TTV = 2 tan w  ⇒  P_S = πτ̄/atan(η/2)   (→ 2πτ̄/η, Kipping 2009a, as w → 0),
 *   a_PB = A_TTV·v_B / cos w, and M_S solves M_S(M_P + M_S)^{−2/3} = a_PB/K^{1/3},
 *   K = G P_S²/(4π²) (the exact relation; its small-ratio limit is
 *   M_S ≈ A_TTV v_B M_P/a_S), then a_S = (K(M_P + M_S))^{1/3}.
 * Orientation: for a circular orbit both signals see the same projection
 * Φ = sqrt(α² + β²) = sqrt(1 − (n̂·x̂)²) of the reflex motion on the chord
 * (timingShapeFactors in timingSignals.ts with e = 0: Φ_TTV = Φ_TDV), so η,
 * P_S and a_S do not depend on it but the mass scales as 1/Φ; the coplanar
 * value (Φ = 1) is the minimum mass. With an isotropic orbit normal n̂,
 * n̂·x̂ is uniform on [−1, 1].
 * With only one of the two amplitudes the pair (M_S, a_S) is degenerate:
 *   TTV only: M_S = a_PB·M_P/(a_S − a_PB)                       (from a_PB = a_S M_S/(M_P + M_S)),
 *   TDV only: M_S = (q² + sqrt(q⁴ + 4q²M_P))/2, q = v_PB·sqrt(a_S/G)
 *             (from v_PB = M_S·sqrt(G/(a_S(M_P + M_S)))).
 */
import { G } from '../physics/constants.js';
import { transitAveraging } from '../physics/transitAveraging.js';

function requirePositive(name: string, v: number): void {
  if (!(v > 0) || !Number.isFinite(v)) throw new RangeError(`${name} must be a positive finite number; got ${v}`);
}

/**
 * Moon period from the observed TDV/TTV amplitude ratio η = 2 tan(πτ̄/P_S): P_S = πτ̄/atan(η/2)
 * (Kipping 2009a's 2πτ̄/η with the transit averaging of transitAveraging.ts). Kernel: NaN out of domain.
 */
export function moonPeriodFromRatio(eta: number, durationS: number): number {
  if (!(eta > 0) || !(durationS > 0)) return NaN;
  return (Math.PI * durationS) / Math.atan(eta / 2);
}

/**
 * Transit-averaging factors (TTV, TDV) of a moon at separation a_S around a planet of mass M_P
 * (period from Kepler III with M_P alone; transitAveraging.ts): what the observed amplitudes are
 * divided by to recover the frozen-planet ones.
 */
export function averagingAtSeparation(separationM: number, planetMassKg: number, durationS: number): { ttv: number; tdv: number } {
  const periodS = 2 * Math.PI * Math.sqrt(separationM ** 3 / (G * planetMassKg));
  const f = transitAveraging(durationS, periodS);
  return { ttv: f.ttvFactor, tdv: f.tdvFactor };
}

/**
 * Moon mass and separation from the planet's barycentric offset a_PB and the moon's period,
 * solving a_PB = a_S M_S/(M_P + M_S) with Kepler's third law exactly (see the file header).
 */
export function moonFromOffsetAndPeriod(offsetM: number, moonPeriodS: number, planetMassKg: number): { massKg: number; separationM: number } {
  requirePositive('offsetM', offsetM);
  requirePositive('moonPeriodS', moonPeriodS);
  requirePositive('planetMassKg', planetMassKg);
  const k = (G * moonPeriodS * moonPeriodS) / (4 * Math.PI * Math.PI);
  // x = M_S/M_P solves x(1 + x)^{−2/3} = c, increasing in x (derivative (1 + x/3)(1 + x)^{−5/3} > 0).
  const c = offsetM / Math.cbrt(k * planetMassKg);
  const g = (x: number) => x * Math.pow(1 + x, -2 / 3) - c;
  let lo = 0;
  let hi = Math.max(c, 1e-300);
  while (g(hi) < 0) hi *= 2;
  let x = Math.min(hi, c);
  // Newton steps kept inside the bracket, bisection otherwise.
  for (let it = 0; it < 200; it++) {
    const gx = g(x);
    if (gx === 0) break;
    if (gx < 0) lo = x;
    else hi = x;
    const dg = (1 + x / 3) * Math.pow(1 + x, -5 / 3);
    let next = x - gx / dg;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - x) <= 1e-15 * Math.max(x, 1e-300)) {
      x = next;
      break;
    }
    x = next;
  }
  const massKg = x * planetMassKg;
  return { massKg, separationM: Math.cbrt(k * (planetMassKg + massKg)) };
}

/** TTV-only degeneracy: moon mass at separation a_S for a barycentric offset a_PB (NaN where a_S ≤ a_PB). */
export function massFromOffsetAtSeparation(offsetM: number, separationM: number, planetMassKg: number): number {
  if (!(separationM > offsetM) || !(offsetM > 0) || !(planetMassKg > 0)) return NaN;
  return (offsetM * planetMassKg) / (separationM - offsetM);
}

/** TDV-only degeneracy: moon mass at separation a_S for a planet reflex speed v_PB (m/s). */
export function massFromReflexSpeedAtSeparation(reflexSpeedMS: number, separationM: number, planetMassKg: number): number {
  if (!(reflexSpeedMS > 0) || !(separationM > 0) || !(planetMassKg > 0)) return NaN;
  const q = reflexSpeedMS * Math.sqrt(separationM / G);
  const q2 = q * q;
  return (q2 + Math.sqrt(q2 * q2 + 4 * q2 * planetMassKg)) / 2;
}

/** Semi-amplitudes of a coplanar circular moon, s (what the inversion takes). */
export interface CoplanarAmplitudes {
  ttvSemiS: number;
  tdvSemiS: number;
}

export interface ImpliedMoonPoint {
  moonPeriodS: number;
  massKg: number;
  separationM: number;
}

/**
 * Invert coplanar semi-amplitudes to the moon (Kipping 2009a; file header).
 * @param barycentreVelocityMS v_B, m/s
 * @param durationS τ̄, the duration whose variation A_TDV is, s
 */
export function invertAmplitudes(a: CoplanarAmplitudes, barycentreVelocityMS: number, durationS: number, planetMassKg: number): ImpliedMoonPoint {
  requirePositive('ttvSemiS', a.ttvSemiS);
  requirePositive('tdvSemiS', a.tdvSemiS);
  requirePositive('barycentreVelocityMS', barycentreVelocityMS);
  requirePositive('durationS', durationS);
  const eta = a.tdvSemiS / a.ttvSemiS;
  const moonPeriodS = moonPeriodFromRatio(eta, durationS);
  // The observed TTV is the frozen-planet one times cos w, w = atan(η/2) (transitAveraging.ts).
  const offsetM = (a.ttvSemiS * barycentreVelocityMS) / Math.cos(Math.atan(eta / 2));
  const { massKg, separationM } = moonFromOffsetAndPeriod(offsetM, moonPeriodS, planetMassKg);
  return { moonPeriodS, massKg, separationM };
}

/** Projection factor Φ = sqrt(1 − u²) of a circular orbit whose normal has direction cosine u with the chord. */
export function projectionFactor(u: number): number {
  return Math.sqrt(Math.max(0, 1 - u * u));
}

/**
 * Barycentric transit timing (TTV) and velocity-induced duration (TDV) signals
 * of a planet carrying one moon.
 *
 * The planet orbits the planet–moon barycentre B at a_PB = a_S·M_S/(M_P + M_S)
 * (a_S the relative semi-major axis), so each transit is displaced by the
 * planet's reflex offset along the transit chord divided by the barycentre's
 * sky velocity v_B (Sartoretti & Schneider 1999, A&AS 134, 553; Kipping 2009a,
 * MNRAS 392, 181), and its duration changes by −τ̄·v_x/v_B, v_x the planet's
 * reflex velocity along the chord (Kipping 2009a; the "V" component of
 * Kipping 2009b, MNRAS 396, 1797). For a circular coplanar moon orbit
 *   A_TTV = a_PB / v_B,   A_TDV = τ̄·v_PB / v_B,   v_PB = 2π a_PB / P_S,
 * with TTV_n = A_TTV sin ψ_n and TDV_n = −A_TDV cos ψ_n (ψ_n the moon's orbital
 * phase at transit n): TDV lags TTV by a quarter period (π/2, Kipping 2009a).
 * v_B at conjunction: v_B = (2π a_B / P_B)(1 + e_B sin ω_B)/sqrt(1 − e_B²)
 * (Winn 2010, "Transits and Occultations", arXiv:1001.2010, in Exoplanets ed.
 * Seager).
 *
 * Eccentric and inclined moon orbits (derived here; reduces to Kipping 2009a for
 * e_S = 0 and a coplanar orbit; checked by Monte Carlo in
 * test/physics/timingSignals.test.ts). Let α = P̂·x̂ and β = Q̂·x̂ be the
 * components along the chord direction x̂ of the unit vectors towards the moon
 * orbit's periapsis (P̂) and 90° ahead of it in the orbit (Q̂). Averaging over
 * the moon's mean anomaly (what stroboscopic sampling gives when P_B/P_S is not
 * a ratio of small integers), with time averages ⟨r cos f⟩ = −3ea/2,
 * ⟨r² cos² f⟩ = a²(1 + 4e²)/2, ⟨r² sin² f⟩ = a²(1 − e²)/2 and
 * ⟨sin² f⟩ = (1 − e²)·g, g = (1 − sqrt(1 − e²))/e²:
 *   rms TTV = (A_TTV/√2)·Φ_TTV,  Φ_TTV² = α²(1 − e²/2) + β²(1 − e²),
 *   rms TDV = (A_TDV/√2)·Φ_TDV,  Φ_TDV² = 2[α² g + β²(1 − g)].
 * For a coplanar orbit whose periapsis makes angle ω with the chord (α = cos ω,
 * β = −sin ω) these are Φ_TTV = sqrt(1 − (e²/2)(1 + sin²ω)) and
 * Φ_TDV = sqrt(2[g cos²ω + (1 − g) sin²ω]). The TTV rms is about the mean: an
 * eccentric orbit also shifts the mean offset by (3/2)e·|α|·a_PB/v_B, which a
 * fitted ephemeris absorbs. For an inclined circular orbit α² + β² =
 * cos²Ω + sin²Ω cos²i, the fraction of the reflex motion projected on the chord.
 *
 * Frame: x̂ is the direction of the barycentre's sky motion at conjunction,
 * which for a transiting planet is the planet orbit's line of nodes on the sky
 * (the ±X axis of skyPositions.ts, whose moon node Ω_S is measured from the
 * same line; only α² and β² enter, so the sign of x̂ does not matter);
 * the moon's orbit is given relative to the planet's orbital plane by its
 * inclination i_S, its ascending node Ω_S measured in that plane from x̂, and
 * its argument of periapsis ω_S from that node (Murray & Dermott 1999, Solar
 * System Dynamics, §2.8 rotation sequence). A retrograde orbit (i_S → π − i_S)
 * has the same rms values. The transit-impact-parameter (TIP) part of the TDV
 * of inclined moons (Kipping 2009b) is not included.
 *
 * Reported semi-amplitudes are √2 × rms, i.e. the amplitude of the sinusoid
 * with the same rms; for circular orbits that is the true semi-amplitude.
 */

import { G } from './constants.js';

export interface TimingSignalInput {
  planetMassKg: number;
  moonMassKg: number;
  /** Semi-major axis of the planet–moon relative orbit a_S, m. */
  moonSeparationM: number;
  moonEccentricity: number;
  /** Inclination of the moon's orbit to the planet's orbital plane, rad (0 = coplanar). */
  moonInclinationRad: number;
  /** Ascending node of the moon's orbit in the planet's orbital plane, measured from the chord direction, rad. */
  moonNodeRad: number;
  /** Argument of periapsis of the moon's orbit from its ascending node, rad. */
  moonPeriapsisRad: number;
  /** Semi-major axis of the barycentre's orbit around the star, m. */
  barycentreSemiMajorAxisM: number;
  /** Orbital period of the barycentre around the star, s. */
  barycentrePeriodS: number;
  barycentreEccentricity: number;
  /** Argument of periastron of the barycentre orbit, rad (Winn 2010 convention). */
  barycentreOmegaRad: number;
  /** Transit duration τ̄ whose variation is wanted (T14 or mid-ingress to mid-egress), s. */
  durationS: number;
}

export interface TimingSignals {
  /** √2 × TTV rms, s (= a_PB/v_B for a circular coplanar moon). */
  ttvSemiAmplitudeS: number;
  /** TTV rms about the mean over the moon's orbital phase, s. */
  ttvRmsS: number;
  /** √2 × TDV rms, s (= τ̄ v_PB/v_B for a circular coplanar moon). */
  tdvSemiAmplitudeS: number;
  /** TDV rms over the moon's orbital phase, s. */
  tdvRmsS: number;
  /** Phase by which TDV lags TTV, rad (π/2). */
  phaseOffsetRad: number;
  /** Moon's orbital period P_S = 2π sqrt(a_S³/(G(M_P + M_S))), s (Kepler's third law). */
  moonPeriodS: number;
  /** Planet's distance from the planet–moon barycentre a_PB, m. */
  planetBarycentreOffsetM: number;
  /** Sky velocity of the barycentre at conjunction v_B, m/s. */
  barycentreVelocityMS: number;
  /** Eccentricity/inclination factors Φ_TTV and Φ_TDV (1 for a circular coplanar orbit). */
  phiTtv: number;
  phiTdv: number;
}

/**
 * Sky-plane speed of the barycentre at conjunction,
 * v_B = (2π a/P)(1 + e sin ω)/sqrt(1 − e²) (Winn 2010, arXiv:1001.2010). Kernel: NaN out of domain.
 */
export function barycentreSkyVelocity(semiMajorAxisM: number, periodS: number, eccentricity: number, omegaRad: number): number {
  if (!(semiMajorAxisM > 0) || !(periodS > 0) || !(eccentricity >= 0 && eccentricity < 1)) return NaN;
  return ((2 * Math.PI * semiMajorAxisM) / periodS) * (1 + eccentricity * Math.sin(omegaRad)) / Math.sqrt(1 - eccentricity * eccentricity);
}

/**
 * Φ_TTV and Φ_TDV for a moon orbit with eccentricity e whose periapsis and 90°-ahead
 * unit vectors have chord components α, β (derived here; see the file header).
 * Kernel: NaN for e outside [0, 1).
 */
export function timingShapeFactors(eccentricity: number, alpha: number, beta: number): { phiTtv: number; phiTdv: number } {
  const e = eccentricity;
  if (!(e >= 0 && e < 1)) return { phiTtv: NaN, phiTdv: NaN };
  const e2 = e * e;
  // g = (1 − sqrt(1 − e²))/e², written as 1/(1 + sqrt(1 − e²)) to avoid cancellation (→ ½ + e²/8).
  const g = 1 / (1 + Math.sqrt(1 - e2));
  const a2 = alpha * alpha;
  const b2 = beta * beta;
  return {
    phiTtv: Math.sqrt(a2 * (1 - e2 / 2) + b2 * (1 - e2)),
    phiTdv: Math.sqrt(2 * (a2 * g + b2 * (1 - g))),
  };
}

function requireFinite(name: string, v: number, ok: boolean, allowed: string): void {
  if (!ok || !Number.isFinite(v)) throw new RangeError(`${name} must be ${allowed}; got ${v}`);
}

/** TTV and TDV amplitudes and rms of a planet with one moon (see the file header). */
export function timingSignals(input: TimingSignalInput): TimingSignals {
  const {
    planetMassKg: mp, moonMassKg: ms, moonSeparationM: aS, moonEccentricity: eS,
    moonInclinationRad: iS, moonNodeRad: nodeS, moonPeriapsisRad: wS,
    barycentreSemiMajorAxisM: aB, barycentrePeriodS: pB, barycentreEccentricity: eB,
    barycentreOmegaRad: wB, durationS,
  } = input;
  requireFinite('planetMassKg', mp, mp > 0, 'positive');
  requireFinite('moonMassKg', ms, ms >= 0, '≥ 0');
  requireFinite('moonSeparationM', aS, aS > 0, 'positive');
  requireFinite('moonEccentricity', eS, eS >= 0 && eS < 1, 'in [0, 1)');
  requireFinite('moonInclinationRad', iS, true, 'finite');
  requireFinite('moonNodeRad', nodeS, true, 'finite');
  requireFinite('moonPeriapsisRad', wS, true, 'finite');
  requireFinite('barycentreSemiMajorAxisM', aB, aB > 0, 'positive');
  requireFinite('barycentrePeriodS', pB, pB > 0, 'positive');
  requireFinite('barycentreEccentricity', eB, eB >= 0 && eB < 1, 'in [0, 1)');
  requireFinite('barycentreOmegaRad', wB, true, 'finite');
  requireFinite('durationS', durationS, durationS > 0, 'positive');

  // Planet's distance from the barycentre (Kipping 2009a, MNRAS 392, 181).
  const aPB = (aS * ms) / (mp + ms);
  // Kepler's third law for the planet–moon pair.
  const moonPeriodS = 2 * Math.PI * Math.sqrt((aS * aS * aS) / (G * (mp + ms)));
  const vB = barycentreSkyVelocity(aB, pB, eB, wB);
  // Circular-coplanar amplitudes (Sartoretti & Schneider 1999; Kipping 2009a).
  const aTtv = aPB / vB;
  const vPB = (2 * Math.PI * aPB) / moonPeriodS;
  const aTdv = (durationS * vPB) / vB;
  // Chord components of the periapsis (P̂) and 90°-ahead (Q̂) unit vectors,
  // rotation R_z(Ω) R_x(i) R_z(ω) (Murray & Dermott 1999, §2.8).
  const cO = Math.cos(nodeS), sO = Math.sin(nodeS);
  const cw = Math.cos(wS), sw = Math.sin(wS);
  const ci = Math.cos(iS);
  const alpha = cO * cw - sO * sw * ci;
  const beta = -cO * sw - sO * cw * ci;
  const { phiTtv, phiTdv } = timingShapeFactors(eS, alpha, beta);
  const ttvRmsS = (aTtv * phiTtv) / Math.SQRT2;
  const tdvRmsS = (aTdv * phiTdv) / Math.SQRT2;
  return {
    ttvSemiAmplitudeS: ttvRmsS * Math.SQRT2,
    ttvRmsS,
    tdvSemiAmplitudeS: tdvRmsS * Math.SQRT2,
    tdvRmsS,
    phaseOffsetRad: Math.PI / 2,
    moonPeriodS,
    planetBarycentreOffsetM: aPB,
    barycentreVelocityMS: vB,
    phiTtv,
    phiTdv,
  };
}

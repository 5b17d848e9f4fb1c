import { describe, it, expect } from 'vitest';
import { G, AU_M, M_EARTH_KG, M_JUP_KG, M_SUN_KG, DAY_S } from '../../src/physics/constants.js';
import { timingSignals } from '../../src/physics/timingSignals.js';
import { transitAveraging } from '../../src/physics/transitAveraging.js';

/** Observed semi-amplitudes: the frozen-planet ones (Kipping 2009a) times the transit averaging. */
function observed(input: Parameters<typeof timingSignals>[0]) {
  const f = timingSignals(input);
  const a = transitAveraging(input.durationS, f.moonPeriodS);
  return { ...f, ttvSemiAmplitudeS: f.ttvSemiAmplitudeS * a.ttvFactor, tdvSemiAmplitudeS: f.tdvSemiAmplitudeS * a.tdvFactor };
}
import {
  invertAmplitudes,
  massFromOffsetAtSeparation,
  massFromReflexSpeedAtSeparation,
  moonFromOffsetAndPeriod,
  moonPeriodFromRatio,
} from '../../src/vet/impliedMoon.js';

// Earth–Moon seen from afar (values computed from constants in the test):
// a_S = 384 399 km (mean distance, from memory), GM_moon = 4.9028e12 m³/s² (from memory), GM_earth from constants.ts.
const earthMoon = {
  planetMassKg: M_EARTH_KG,
  moonMassKg: 4.9028e12 / G,
  moonSeparationM: 3.84399e8,
  moonEccentricity: 0,
  moonInclinationRad: 0,
  moonNodeRad: 0,
  moonPeriapsisRad: 0,
  barycentreSemiMajorAxisM: AU_M,
  barycentrePeriodS: 365.25636 * DAY_S,
  barycentreEccentricity: 0,
  barycentreOmegaRad: Math.PI / 2,
  durationS: 13.0955 * 3600,
};

describe('inverting the barycentric timing relations (Kipping 2009a)', () => {
  it('recovers the mass, separation and period of the forward model exactly (Earth–Moon)', () => {
    // Forward: physics/timingSignals.ts with the transit averaging; the inverse must undo it to rounding.
    const f = observed(earthMoon);
    const m = invertAmplitudes({ ttvSemiS: f.ttvSemiAmplitudeS, tdvSemiS: f.tdvSemiAmplitudeS }, f.barycentreVelocityMS, earthMoon.durationS, M_EARTH_KG);
    expect(m.massKg / earthMoon.moonMassKg - 1).toBeLessThan(1e-9);
    expect(Math.abs(m.separationM / earthMoon.moonSeparationM - 1)).toBeLessThan(1e-9);
    expect(Math.abs(m.moonPeriodS / f.moonPeriodS - 1)).toBeLessThan(1e-12);
  });

  it('recovers a heavy moon (mass ratio 0.3) where the small-ratio formula is 30 % off', () => {
    // Computed from constants in the test: a 0.3 M_P companion of a Jupiter-mass planet at 0.5 AU.
    const input = { ...earthMoon, planetMassKg: M_JUP_KG, moonMassKg: 0.3 * M_JUP_KG, moonSeparationM: 2e9, barycentreSemiMajorAxisM: 0.5 * AU_M, barycentrePeriodS: 2 * Math.PI * Math.sqrt((0.5 * AU_M) ** 3 / (G * M_SUN_KG)) };
    const f = timingSignals(input);
    const m = moonFromOffsetAndPeriod(f.planetBarycentreOffsetM, f.moonPeriodS, M_JUP_KG);
    expect(Math.abs(m.massKg / input.moonMassKg - 1)).toBeLessThan(1e-10);
    expect(Math.abs(m.separationM / input.moonSeparationM - 1)).toBeLessThan(1e-10);
    // Small-ratio limit M_S ≈ a_PB M_P / a_S (Kipping 2009a) is off by the factor 1/(1 + M_S/M_P)-ish: not used.
    const approx = (f.planetBarycentreOffsetM * M_JUP_KG) / input.moonSeparationM;
    expect(Math.abs(approx / input.moonMassKg - 1)).toBeGreaterThan(0.2);
  });

  it('small mass ratios agree with M_S ≈ A_TTV v_B M_P / a_S (Kipping 2009a)', () => {
    const f = timingSignals({ ...earthMoon, moonMassKg: 1e-6 * M_EARTH_KG });
    const m = moonFromOffsetAndPeriod(f.planetBarycentreOffsetM, f.moonPeriodS, M_EARTH_KG);
    const approx = (f.ttvSemiAmplitudeS * f.barycentreVelocityMS * M_EARTH_KG) / m.separationM;
    expect(Math.abs(m.massKg / approx - 1)).toBeLessThan(1e-5);
  });

  it('P_S = πτ̄/atan(η/2), which tends to Kipping’s (2009a) 2πτ̄/η for small η', () => {
    expect(moonPeriodFromRatio(0.5, 1000)).toBeCloseTo((1000 * Math.PI) / Math.atan(0.25), 9);
    expect(moonPeriodFromRatio(1e-4, 1000) / ((2 * Math.PI * 1000) / 1e-4)).toBeCloseTo(1, 8);
    expect(Number.isNaN(moonPeriodFromRatio(0, 1000))).toBe(true);
  });

  it('recovers a short-period moon, where the transit averaging matters (14 % on the TTV)', () => {
    // A moon with a 4-day period and a 14-h transit: w = πτ̄/P_S ≈ 0.46 (computed from constants in the test).
    const input = { ...earthMoon, planetMassKg: M_JUP_KG, moonMassKg: 0.5 * M_EARTH_KG, moonSeparationM: 7.15e8, durationS: 14 * 3600 };
    const f = observed(input);
    const m = invertAmplitudes({ ttvSemiS: f.ttvSemiAmplitudeS, tdvSemiS: f.tdvSemiAmplitudeS }, f.barycentreVelocityMS, input.durationS, M_JUP_KG);
    expect(Math.abs(m.massKg / input.moonMassKg - 1)).toBeLessThan(1e-9);
    expect(Math.abs(m.separationM / input.moonSeparationM - 1)).toBeLessThan(1e-9);
  });

  it('single-amplitude degeneracy curves pass through the true moon', () => {
    const f = timingSignals(earthMoon);
    const viaTtv = massFromOffsetAtSeparation(f.planetBarycentreOffsetM, earthMoon.moonSeparationM, M_EARTH_KG);
    expect(Math.abs(viaTtv / earthMoon.moonMassKg - 1)).toBeLessThan(1e-12);
    const vPB = (f.tdvSemiAmplitudeS * f.barycentreVelocityMS) / earthMoon.durationS;
    const viaTdv = massFromReflexSpeedAtSeparation(vPB, earthMoon.moonSeparationM, M_EARTH_KG);
    expect(Math.abs(viaTdv / earthMoon.moonMassKg - 1)).toBeLessThan(1e-9);
    // TTV-only: heavier moons closer in (M_S ∝ 1/(a_S − a_PB)); TDV-only: heavier moons farther out.
    expect(massFromOffsetAtSeparation(f.planetBarycentreOffsetM, 2e8, M_EARTH_KG)).toBeGreaterThan(viaTtv);
    expect(massFromReflexSpeedAtSeparation(vPB, 2e8, M_EARTH_KG)).toBeLessThan(viaTdv);
    expect(Number.isNaN(massFromOffsetAtSeparation(1e7, 5e6, M_EARTH_KG))).toBe(true);
  });
});

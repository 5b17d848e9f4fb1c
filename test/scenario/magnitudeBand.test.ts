import { describe, it, expect } from 'vitest';
import { BAND_ZERO_POINTS, bandZeroPointPhotons, V_BAND_ZERO_POINT_PHOTONS_PER_S_M2 } from '../../src/noise/groundBudget.js';
import { parseScenarioText } from '../../src/scenario/loadScenario.js';
import { R_EARTH_M } from '../../src/physics/constants.js';
import { chenKippingRadius } from '../../src/physics/massRadius.js';

const withGround = (band: string) => `star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, limb_darkening: {u1: 0.4, u2: 0.26}}
planet: {mass: 1 Mjup, radius: 1 Rjup, period: 365.25 d}
instrument:
  cadence: 2 min
  ground: {aperture: 1 m, ${band}magnitude: 11}
observation: {transits: 4}
`;

describe('magnitude bands of the ground budget (Bessell 1979 zero points)', () => {
  it('reproduces the worked example of the tabulation: 2.42 photons/s on 1 m² from V = 23.90', () => {
    // Huchra, "Magnitudes" notes (Bessell 1979 table): 3640 Jy × 10^(−0.4·23.90) × 1.51e7 × 0.16 = 2.42 s⁻¹ m⁻².
    expect(V_BAND_ZERO_POINT_PHOTONS_PER_S_M2 * 10 ** (-0.4 * 23.9)).toBeCloseTo(2.42, 2);
  });

  it('uses 1 Jy·(Δλ/λ)/h = 1.51e7 photons s⁻¹ m⁻² in every band', () => {
    for (const band of Object.keys(BAND_ZERO_POINTS) as Array<keyof typeof BAND_ZERO_POINTS>) {
      const z = BAND_ZERO_POINTS[band];
      // The tabulation's identity 1 Jy = 1.51e7 photons s⁻¹ m⁻² (dλ/λ)⁻¹ (h = 6.62607015e-34 J s, SI 2019).
      expect(bandZeroPointPhotons(band) / (z.fluxJy * z.dLambdaOverLambda) / 1.51e7).toBeCloseTo(1, 2);
    }
    // Published zero-magnitude fluxes, Jy (Bessell 1979): U 1810, B 4260, V 3640, R 3080, I 2550.
    expect(Object.values(BAND_ZERO_POINTS).map((z) => z.fluxJy)).toEqual([1810, 4260, 3640, 3080, 2550]);
  });

  it('scales the photon term by the band zero point (photon noise ∝ N^−1/2)', () => {
    const v = parseScenarioText(withGround('')).instrument.ground!;
    const r = parseScenarioText(withGround('band: R, ')).instrument.ground!;
    expect(v.band).toBe('V');
    expect(r.band).toBe('R');
    expect(r.terms.photon / v.terms.photon).toBeCloseTo(Math.sqrt(bandZeroPointPhotons('V') / bandZeroPointPhotons('R')), 10);
  });

  it('refuses an unknown band, naming the allowed ones', () => {
    expect(() => parseScenarioText(withGround('band: K, '))).toThrow(/instrument\.ground\.band.*"U", "B", "V", "R", "I"/);
  });
});

describe('planet.mass_radius', () => {
  const scen = (planet: string) => `star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, limb_darkening: {u1: 0.4, u2: 0.26}}
planet: {${planet}, period: 365.25 d}
instrument: {cadence: 2 min, noise: 100 ppm per 1 h}
observation: {transits: 4}
`;
  it('gives the radius from the mass when the radius is omitted', () => {
    const s = parseScenarioText(scen('mass: 5 Mearth, mass_radius: chen_kipping_2017'));
    expect(s.planet.radiusM).toBe(chenKippingRadius(s.planet.massKg));
    expect(s.planet.radiusM / R_EARTH_M).toBeGreaterThan(1.5);
    expect(s.planet.massRadiusRelation).toBe('chen_kipping_2017');
  });
  it('refuses a radius and a relation together, and neither', () => {
    expect(() => parseScenarioText(scen('mass: 5 Mearth, radius: 2 Rearth, mass_radius: chen_kipping_2017'))).toThrow(/planet\.mass_radius.*not both/);
    expect(() => parseScenarioText(scen('mass: 5 Mearth'))).toThrow(/planet\.radius.*mass_radius: chen_kipping_2017/);
  });
});

import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { stableHillFraction, stableSeparationLimit } from '../../src/physics/stability.js';
import { hillRadius } from '../../src/physics/hillRadius.js';
import { AU_M, M_EARTH_KG, M_JUP_KG, M_SUN_KG } from '../../src/physics/constants.js';

describe('stableHillFraction (Domingos, Winter & Yokoyama 2006)', () => {
  it('matches the fit at e_P = e_S = 0.1', () => {
    // Expected 0.42565 and 0.73936: computed by hand from the DWY06 coefficients in their abstract
    // (MNRAS 373, 1227): 0.4895(1 − 0.10305 − 0.02738), 0.9309(1 − 0.10764 − 0.09812).
    expect(stableHillFraction(0.1, 0.1, false)).toBeCloseTo(0.42565, 5);
    expect(stableHillFraction(0.1, 0.1, true)).toBeCloseTo(0.73936, 5);
  });

  it('circular orbits: prograde ≈ 0.49 R_H, retrograde ≈ 0.93 R_H', () => {
    // Expected: DWY06 abstract coefficients 0.4895 and 0.9309; Shen & Tremaine 2008 (AJ 136, 2453, abstract)
    // independently find prograde moons to ~0.5 R_H and some coplanar retrograde ones to ~R_H.
    expect(stableHillFraction(0, 0, false)).toBe(0.4895);
    expect(stableHillFraction(0, 0, true)).toBe(0.9309);
  });

  it('returns 0 where the fit predicts no stable orbit, NaN outside 0 ≤ e < 1', () => {
    // Expected: bracket 1 − 1.0305·0.99 < 0 (computed from the coefficients); kernel NaN convention.
    expect(stableHillFraction(0.99, 0, false)).toBe(0);
    expect(stableHillFraction(-0.1, 0, false)).toBeNaN();
    expect(stableHillFraction(0, 1, true)).toBeNaN();
  });

  it('shrinks as either eccentricity grows, and retrograde stays wider for e ≤ 0.2 (property)', () => {
    // Expected: all DWY06 coefficients are positive, so the fit decreases in e_P and e_S.
    fc.assert(
      fc.property(fc.double({ min: 0, max: 0.2, noNaN: true }), fc.double({ min: 0, max: 0.2, noNaN: true }), (eP, eS) => {
        expect(stableHillFraction(eP + 0.05, eS, false)).toBeLessThan(stableHillFraction(eP, eS, false));
        expect(stableHillFraction(eP, eS + 0.05, true)).toBeLessThan(stableHillFraction(eP, eS, true));
        expect(stableHillFraction(eP, eS, true)).toBeGreaterThan(stableHillFraction(eP, eS, false));
      }),
    );
  });
});

describe('stableSeparationLimit', () => {
  it('uses the circular Hill radius (the DWY06 unit)', () => {
    const lim = stableSeparationLimit({
      planetSemiMajorAxisM: 5.2038 * AU_M,
      planetEccentricity: 0.0489,
      planetMassKg: M_JUP_KG,
      starMassKg: M_SUN_KG,
      moonEccentricity: 0,
    });
    // Expected: R_H from hillRadius (no (1 − e) factor) times the fit; 24.70 Gm and 46.87 Gm computed by hand (Python).
    expect(lim.hillRadiusM).toBe(hillRadius(5.2038 * AU_M, M_JUP_KG, M_SUN_KG));
    expect(lim.prograde / 1e9).toBeCloseTo(24.70, 1);
    expect(lim.retrograde / 1e9).toBeCloseTo(46.87, 1);
  });

  it("places the Moon inside Earth's prograde band", () => {
    // Orbits from memory: Earth a = 1 au, e = 0.0167; Moon a = 384,399 km, e = 0.0549.
    const lim = stableSeparationLimit({
      planetSemiMajorAxisM: AU_M,
      planetEccentricity: 0.0167,
      planetMassKg: M_EARTH_KG,
      starMassKg: M_SUN_KG,
      moonEccentricity: 0.0549,
    });
    expect(384_399e3).toBeLessThan(lim.prograde);
    // Expected ratio ≈ 0.26 R_H (computed by hand): well inside, not marginal.
    expect(384_399e3 / lim.hillRadiusM).toBeCloseTo(0.257, 2);
  });

  it("places the four Galilean moons inside Jupiter's prograde band", () => {
    // Semi-major axes and eccentricities from memory (Io, Europa, Ganymede, Callisto).
    const moons: Array<[string, number, number]> = [
      ['Io', 421_700e3, 0.0041],
      ['Europa', 671_034e3, 0.009],
      ['Ganymede', 1_070_412e3, 0.0013],
      ['Callisto', 1_882_709e3, 0.0074],
    ];
    for (const [, a, e] of moons) {
      const lim = stableSeparationLimit({
        planetSemiMajorAxisM: 5.2038 * AU_M,
        planetEccentricity: 0.0489,
        planetMassKg: M_JUP_KG,
        starMassKg: M_SUN_KG,
        moonEccentricity: e,
      });
      expect(a).toBeLessThan(lim.prograde);
    }
  });

  it('throws RangeError naming the field', () => {
    const base = {
      planetSemiMajorAxisM: AU_M,
      planetEccentricity: 0,
      planetMassKg: M_JUP_KG,
      starMassKg: M_SUN_KG,
      moonEccentricity: 0,
    };
    expect(() => stableSeparationLimit({ ...base, planetEccentricity: 1.2 })).toThrow(/planetEccentricity/);
    expect(() => stableSeparationLimit({ ...base, moonEccentricity: Number.NaN })).toThrow(/moonEccentricity/);
    expect(() => stableSeparationLimit({ ...base, planetMassKg: -1 })).toThrow(RangeError);
  });
});

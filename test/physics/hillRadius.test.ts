import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { hillRadius, hillRadiusPericentre } from '../../src/physics/hillRadius.js';
import { AU_M, M_EARTH_KG, M_JUP_KG, M_SUN_KG } from '../../src/physics/constants.js';

// Jupiter's semi-major axis 5.2038 au and eccentricity 0.0489: from memory.
const A_JUPITER_M = 5.2038 * AU_M;

describe('hillRadius (Hamilton & Burns 1992)', () => {
  it("gives Jupiter's Hill radius ≈ 0.355 au", () => {
    // Expected 0.35527 au: computed by hand (Python) from IAU 2015 B3 GM_J, GM_sun and a = 5.2038 au (from memory).
    expect(hillRadius(A_JUPITER_M, M_JUP_KG, M_SUN_KG) / AU_M).toBeCloseTo(0.35527, 4);
  });

  it("gives Earth's Hill radius ≈ 0.0100 au", () => {
    // Expected 0.010004 au: computed by hand (Python) from IAU 2015 B3 GM_E, GM_sun and a = 1 au.
    expect(hillRadius(AU_M, M_EARTH_KG, M_SUN_KG) / AU_M).toBeCloseTo(0.010004, 5);
  });

  it('pericentre form is (1 − e) times the circular form', () => {
    // Expected: definition R_H,peri = a(1 − e)(M_P/3M*)^{1/3}; 0.35527 × (1 − 0.0489) computed in the test.
    expect(hillRadiusPericentre(A_JUPITER_M, 0.0489, M_JUP_KG, M_SUN_KG) / AU_M).toBeCloseTo(0.35527 * (1 - 0.0489), 4);
    expect(hillRadiusPericentre(A_JUPITER_M, 0, M_JUP_KG, M_SUN_KG)).toBe(hillRadius(A_JUPITER_M, M_JUP_KG, M_SUN_KG));
  });

  it('scales as a and as the cube root of the mass ratio (property)', () => {
    // Expected: the scaling of R_H = a (M_P/3M*)^{1/3} itself (Hamilton & Burns 1992).
    fc.assert(
      fc.property(
        fc.double({ min: 1e9, max: 1e13, noNaN: true }),
        fc.double({ min: 1e22, max: 1e28, noNaN: true }),
        fc.double({ min: 1.1, max: 10, noNaN: true }),
        (a, m, k) => {
          const r = hillRadius(a, m, M_SUN_KG);
          expect(hillRadius(k * a, m, M_SUN_KG) / r).toBeCloseTo(k, 10);
          expect(hillRadius(a, k * k * k * m, M_SUN_KG) / r).toBeCloseTo(k, 10);
        },
      ),
    );
  });

  it('throws RangeError naming the argument for bad input', () => {
    expect(() => hillRadius(-1, M_JUP_KG, M_SUN_KG)).toThrow(/semiMajorAxisM/);
    expect(() => hillRadius(AU_M, Number.NaN, M_SUN_KG)).toThrow(RangeError);
    expect(() => hillRadius(AU_M, M_JUP_KG, 0)).toThrow(/starMassKg/);
    expect(() => hillRadiusPericentre(AU_M, 1, M_JUP_KG, M_SUN_KG)).toThrow(/eccentricity/);
  });
});

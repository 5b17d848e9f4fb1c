import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  tidalMigrationRate,
  tidalMigrationTime,
  tidalSurvivalMassMax,
  type TidalSurvivalInput,
} from '../../src/physics/tidalMigration.js';
import { hillRadius } from '../../src/physics/hillRadius.js';
import { AU_M, JULIAN_YEAR_S, M_EARTH_KG, M_JUP_KG, M_SUN_KG, R_JUP_M } from '../../src/physics/constants.js';

// HD 209458b-like inputs as Barnes & O'Brien (2002) would have used them, all from memory (not checked
// against the paper): M_P = 0.69 M_J, R_P = 1.35 R_J, a = 0.045 au, M* = 1.1 M_sun, age 5 Gyr,
// Q_P = 1e5, k2p = 0.51, stable fraction f = 0.36.
const HOT_JUPITER: TidalSurvivalInput = {
  planetMassKg: 0.69 * M_JUP_KG,
  planetRadiusM: 1.35 * R_JUP_M,
  planetK2: 0.51,
  planetTidalQ: 1e5,
  starMassKg: 1.1 * M_SUN_KG,
  planetSemiMajorAxisM: 0.045 * AU_M,
  ageS: 5e9 * JULIAN_YEAR_S,
  stableFraction: 0.36,
};

describe('tidalSurvivalMassMax (Barnes & O\'Brien 2002)', () => {
  it('reproduces the published hot-Jupiter limit to within an order of magnitude', () => {
    // Expected: "no primordial satellites with masses greater than 7×10⁻⁷ M_Earth ... could have survived
    // around HD209458b" (Barnes & O'Brien 2002, ApJ 575, 1087, abstract). Inputs from memory, so only the
    // order of magnitude is tested.
    const mMaxEarth = tidalSurvivalMassMax(HOT_JUPITER) / M_EARTH_KG;
    expect(mMaxEarth).toBeGreaterThan(7e-8);
    expect(mMaxEarth).toBeLessThan(7e-6);
  });

  it('places no meaningful limit on a Jupiter at 1 au', () => {
    // Expected: B&O 2002 abstract: "No meaningful mass limits can be placed on moons orbiting Jovian planets
    // more than ~0.6 AU from their parent stars" — the limit exceeds any plausible moon (here > 100 M_Earth).
    const m = tidalSurvivalMassMax({
      ...HOT_JUPITER,
      planetMassKg: M_JUP_KG,
      planetRadiusM: R_JUP_M,
      starMassKg: M_SUN_KG,
      planetSemiMajorAxisM: AU_M,
    });
    expect(m / M_EARTH_KG).toBeGreaterThan(100);
  });

  it('agrees with a numerical integration of the migration ODE', () => {
    // Expected: RK4 integration of da/dt (computed in the test) from a0 = a_crit/2 with M_S = M_max must reach
    // a_crit = f R_H exactly at t = age. (For this hot Jupiter a_crit is only ≈ 1.5 R_P.)
    const aCrit = 0.36 * hillRadius(HOT_JUPITER.planetSemiMajorAxisM, HOT_JUPITER.planetMassKg, HOT_JUPITER.starMassKg);
    const a0 = aCrit / 2;
    const input = { ...HOT_JUPITER, initialSeparationM: a0 };
    const mS = tidalSurvivalMassMax(input);
    const rate = (a: number) =>
      tidalMigrationRate(a, mS, input.planetMassKg, input.planetRadiusM, input.planetK2, input.planetTidalQ);
    let a = a0;
    let t = 0;
    const T = input.ageS;
    while (t < T) {
      // Step limited to a 1e-3 relative change of a.
      const h = Math.min(T - t, (1e-3 * a) / rate(a));
      const k1 = rate(a);
      const k2 = rate(a + 0.5 * h * k1);
      const k3 = rate(a + 0.5 * h * k2);
      const k4 = rate(a + h * k3);
      a += (h / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
      t += h;
    }
    expect(a / aCrit).toBeCloseTo(1, 7);
  });

  it('is the inverse of tidalMigrationTime', () => {
    // Expected: both are the same integral (2/13)(a1^{13/2} − a0^{13/2})/(C M_S) (derivation in the source).
    const aCrit = 0.36 * hillRadius(HOT_JUPITER.planetSemiMajorAxisM, HOT_JUPITER.planetMassKg, HOT_JUPITER.starMassKg);
    const mS = tidalSurvivalMassMax(HOT_JUPITER);
    const t = tidalMigrationTime(0, aCrit, mS, HOT_JUPITER.planetMassKg, HOT_JUPITER.planetRadiusM, 0.51, 1e5);
    expect(t / HOT_JUPITER.ageS).toBeCloseTo(1, 12);
  });

  it('scales as Q/(k2 T) and as f^{13/2} (property)', () => {
    // Expected: the closed form M_max ∝ f^{13/2} Q/(k2 T) (derived in the source).
    const base = tidalSurvivalMassMax(HOT_JUPITER);
    fc.assert(
      fc.property(fc.double({ min: 0.2, max: 5, noNaN: true }), (k) => {
        expect(tidalSurvivalMassMax({ ...HOT_JUPITER, planetTidalQ: 1e5 * k }) / base).toBeCloseTo(k, 10);
        expect(tidalSurvivalMassMax({ ...HOT_JUPITER, ageS: HOT_JUPITER.ageS * k }) / base).toBeCloseTo(1 / k, 10);
        expect(tidalSurvivalMassMax({ ...HOT_JUPITER, planetK2: 0.51 * k }) / base).toBeCloseTo(1 / k, 10);
      }),
    );
    expect(tidalSurvivalMassMax({ ...HOT_JUPITER, stableFraction: 0.72 }) / base).toBeCloseTo(2 ** 6.5, 8);
  });

  it('defaults to the DWY06 prograde fraction 0.4895', () => {
    // Expected: (0.4895/0.36)^{13/2} times the f = 0.36 value (computed in the test).
    const { stableFraction: _unused, ...rest } = HOT_JUPITER;
    expect(tidalSurvivalMassMax(rest) / tidalSurvivalMassMax(HOT_JUPITER)).toBeCloseTo((0.4895 / 0.36) ** 6.5, 8);
  });

  it('throws RangeError naming the field', () => {
    expect(() => tidalSurvivalMassMax({ ...HOT_JUPITER, planetTidalQ: 0 })).toThrow(/planetTidalQ/);
    expect(() => tidalSurvivalMassMax({ ...HOT_JUPITER, stableFraction: 1.5 })).toThrow(/stableFraction/);
    expect(() => tidalSurvivalMassMax({ ...HOT_JUPITER, initialSeparationM: AU_M })).toThrow(/initialSeparationM/);
    expect(() => tidalSurvivalMassMax({ ...HOT_JUPITER, ageS: Number.NaN })).toThrow(/ageS/);
    expect(() => tidalMigrationTime(2, 1, 1, 1, 1, 1, 1)).toThrow(/toSeparationM/);
  });
});

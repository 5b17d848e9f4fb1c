import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { tidalHeatFlux, tidalHeatingPower, type TidalHeatingInput } from '../../src/physics/tidalHeating.js';
import { M_JUP_KG } from '../../src/physics/constants.js';

// Io: a = 421,700 km, e = 0.0041, R = 1821.6 km, M = 8.932e22 kg (orbital elements and size from memory);
// k2/Q = 0.015 ± 0.003 (Lainey et al. 2009, Nature 459, 957, abstract, checked); Jupiter mass from IAU 2015 GM_J.
const IO: TidalHeatingInput = {
  planetMassKg: M_JUP_KG,
  moonMassKg: 8.932e22,
  moonRadiusM: 1821.6e3,
  separationM: 421_700e3,
  eccentricity: 0.0041,
  moonK2: 0.015,
  moonTidalQ: 1,
};

describe('tidalHeatingPower (Peale et al. 1979; Segatz et al. 1988)', () => {
  it("gives Io's measured heat flow within a factor of two", () => {
    // Expected: Io's heat flow ≈ 1e14 W, ≈ 2.5 W m⁻² (Veeder et al. 1994, JGR 99, 17095; values from memory).
    const p = tidalHeatingPower(IO);
    expect(p).toBeGreaterThan(0.5e14);
    expect(p).toBeLessThan(2e14);
    const h = tidalHeatFlux(IO);
    expect(h).toBeGreaterThan(2.5 / 2);
    expect(h).toBeLessThan(2.5 * 2);
  });

  it('matches the closed form for Io to 1 %', () => {
    // Expected 9.33e13 W: computed by hand (Python) with n = 2π/P, P = 1.769138 d (from memory); our n comes
    // from Kepler's law, so agreement is to ~0.1 %, tested at 1 %.
    expect(tidalHeatingPower(IO) / 9.33e13).toBeCloseTo(1, 2);
  });

  it('scales as e² and, for a massless moon, as a^{-15/2} (property)', () => {
    // Expected: Ė ∝ n e²/a⁶ with n ∝ a^{-3/2} (the formula itself).
    const base = { ...IO, moonMassKg: 0 };
    const p0 = tidalHeatingPower(base);
    fc.assert(
      fc.property(fc.double({ min: 0.5, max: 3, noNaN: true }), (k) => {
        expect(tidalHeatingPower({ ...base, eccentricity: IO.eccentricity * k }) / p0).toBeCloseTo(k * k, 10);
        expect(tidalHeatingPower({ ...base, separationM: IO.separationM * k }) / p0).toBeCloseTo(k ** -7.5, 10);
      }),
    );
  });

  it('vanishes on a circular orbit', () => {
    // Expected: Ė ∝ e² (the formula itself).
    expect(tidalHeatingPower({ ...IO, eccentricity: 0 })).toBe(0);
  });

  it('throws RangeError naming the field', () => {
    expect(() => tidalHeatingPower({ ...IO, eccentricity: 1 })).toThrow(/eccentricity/);
    expect(() => tidalHeatingPower({ ...IO, moonTidalQ: 0 })).toThrow(/moonTidalQ/);
    expect(() => tidalHeatingPower({ ...IO, separationM: Number.NaN })).toThrow(/separationM/);
    expect(() => tidalHeatFlux({ ...IO, moonRadiusM: -1 })).toThrow(/moonRadiusM/);
  });
});

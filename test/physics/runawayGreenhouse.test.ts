import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { runawayGreenhouseFlux, surfaceGravity } from '../../src/physics/runawayGreenhouse.js';
import { G, M_EARTH_KG, R_EARTH_M } from '../../src/physics/constants.js';

describe('runawayGreenhouseFlux (Pierrehumbert 2010, as used by Heller & Barnes 2013)', () => {
  it("gives ≈ 295 W m⁻² at Earth's gravity", () => {
    // Expected ≈ 295 W m⁻²: the value Heller & Barnes (2013, Astrobiology 13, 18) quote for Earth (from memory);
    // computed here 294.4 W m⁻² with g = 9.798 m s⁻² (IAU 2015 GM_E and equatorial radius).
    const g = surfaceGravity(M_EARTH_KG, R_EARTH_M);
    expect(g).toBeCloseTo(9.798, 3);
    const f = runawayGreenhouseFlux(g);
    expect(Math.abs(f - 295)).toBeLessThan(2);
  });

  it('gives ≈ 243 W m⁻² for the Moon', () => {
    // Expected 242.6 W m⁻²: computed by hand (Python) from the same formula and constants with the Moon's
    // GM = 4902.8 km³ s⁻² and R = 1737.4 km (from memory): an independent evaluation of the formula.
    expect(runawayGreenhouseFlux(surfaceGravity(4.9028e12 / G, 1737.4e3))).toBeCloseTo(242.6, 1);
  });

  it('rises with surface gravity (property)', () => {
    // Expected: d F_RG / d g > 0 — heavier worlds resist the runaway (Pierrehumbert 2010).
    fc.assert(
      fc.property(fc.double({ min: 0.1, max: 100, noNaN: true }), (g) => {
        expect(runawayGreenhouseFlux(g * 1.1)).toBeGreaterThan(runawayGreenhouseFlux(g));
      }),
    );
  });

  it('throws RangeError naming the argument', () => {
    expect(() => runawayGreenhouseFlux(0)).toThrow(/surfaceGravityMS2/);
    expect(() => runawayGreenhouseFlux(Number.NaN)).toThrow(RangeError);
    expect(() => runawayGreenhouseFlux(1e30)).toThrow(/too large/);
    expect(() => surfaceGravity(1, 0)).toThrow(/radiusM/);
  });
});

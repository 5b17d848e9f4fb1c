import { describe, it, expect } from 'vitest';
import { meanDensity, rocheLimit, ROCHE_K_RIGID } from '../../src/physics/rocheLimit.js';
import { G, M_EARTH_KG, M_JUP_KG, R_EARTH_M, R_JUP_M } from '../../src/physics/constants.js';

// Moon: GM = 4902.80 km³ s⁻², R = 1737.4 km (from memory).
const M_MOON_KG = 4.9028e12 / G;
const R_MOON_M = 1737.4e3;

describe('rocheLimit', () => {
  const rhoEarth = meanDensity(M_EARTH_KG, R_EARTH_M);
  const rhoMoon = meanDensity(M_MOON_KG, R_MOON_M);

  it('mean densities of Earth and Moon', () => {
    // Expected ≈ 5495 and 3344 kg m⁻³: computed by hand from IAU 2015 B3 GM_E, R_E (equatorial) and the Moon values above.
    expect(rhoEarth).toBeCloseTo(5495, -1);
    expect(rhoMoon).toBeCloseTo(3344, -1);
  });

  it('Earth–Moon fluid Roche limit ≈ 18,000–19,000 km', () => {
    // Expected: common textbook value (≈ 18,400 km for a fluid Moon); computed here 18,365 km.
    const { fluidM } = rocheLimit(R_EARTH_M, rhoEarth, rhoMoon);
    expect(fluidM / 1e3).toBeGreaterThan(18_000);
    expect(fluidM / 1e3).toBeLessThan(19_000);
  });

  it('Earth–Moon rigid Roche limit ≈ 9,500 km', () => {
    // Expected: common textbook value (≈ 9,500 km for a rigid Moon); computed by hand 9,483 km.
    const { rigidM } = rocheLimit(R_EARTH_M, rhoEarth, rhoMoon);
    expect(rigidM / 1e3).toBeCloseTo(9_483, -1);
  });

  it('fluid/rigid ratio is 2.44/2^{1/3}, and equal densities give k R_P', () => {
    // Expected: the definitions d = k R_P (ρ_P/ρ_S)^{1/3} with k = 2.44 and 2^{1/3} (computed in the test).
    const r = rocheLimit(R_JUP_M, 1000, 1000);
    expect(r.fluidM).toBeCloseTo(2.44 * R_JUP_M, 3);
    expect(r.rigidM / R_JUP_M).toBeCloseTo(1.259921, 6);
    expect(ROCHE_K_RIGID).toBeCloseTo(1.2599210498948732, 15);
  });

  it("Jupiter–Io fluid limit ≈ 1.72 R_J, inside Io's orbit", () => {
    // Io mass 8.932e22 kg, R = 1821.6 km, a = 421,700 km (from memory); 1.722 R_J computed by hand.
    const rho = meanDensity(8.932e22, 1821.6e3);
    const r = rocheLimit(R_JUP_M, meanDensity(M_JUP_KG, R_JUP_M), rho);
    expect(r.fluidM / R_JUP_M).toBeCloseTo(1.722, 2);
    expect(r.fluidM).toBeLessThan(421_700e3);
  });

  it('throws RangeError naming the argument', () => {
    expect(() => rocheLimit(0, 1000, 1000)).toThrow(/planetRadiusM/);
    expect(() => rocheLimit(1, Number.NaN, 1000)).toThrow(/planetDensityKgM3/);
    expect(() => rocheLimit(1, 1000, -5)).toThrow(/moonDensityKgM3/);
    expect(() => meanDensity(1, 0)).toThrow(/radiusM/);
  });
});

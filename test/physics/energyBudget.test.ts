import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { eclipseFraction, moonEnergyBudget, type MoonEnergyBudgetInput } from '../../src/physics/energyBudget.js';
import { AU_M, L_SUN_W, R_JUP_M, SIGMA_SB } from '../../src/physics/constants.js';

// A Jupiter twin at 1 au around the Sun with an Earth-like moon at 10 R_J (invented example, no source).
// Jupiter's Bond albedo 0.343 is from memory (Jupiter planetary fact sheet).
const BASE: MoonEnergyBudgetInput = {
  starLuminosityW: L_SUN_W,
  planetSemiMajorAxisM: AU_M,
  planetEccentricity: 0,
  planetRadiusM: R_JUP_M,
  planetAlbedo: 0.343,
  moonSeparationM: 10 * R_JUP_M,
  moonAlbedo: 0.3,
  tidalHeatFluxWm2: 0,
};

describe('eclipseFraction', () => {
  it('matches a brute-force count of shadowed orbit positions', () => {
    // Expected: computed in the test by sampling a coplanar circular orbit uniformly in time and counting
    // positions behind the planet (x < 0) within the cylinder |y| < R_P.
    for (const ratio of [1.5, 5, 10, 20, 30]) {
      const n = 200_000;
      let shadowed = 0;
      for (let i = 0; i < n; i++) {
        const th = (2 * Math.PI * (i + 0.5)) / n;
        if (Math.cos(th) < 0 && Math.abs(ratio * Math.sin(th)) < 1) shadowed++;
      }
      expect(eclipseFraction(1, ratio)).toBeCloseTo(shadowed / n, 4);
    }
  });

  it('is NaN inside the planet', () => {
    // Expected: kernel NaN convention for out-of-domain input.
    expect(eclipseFraction(2, 1)).toBeNaN();
  });
});

describe('moonEnergyBudget', () => {
  it('stellar term far from the planet equals the planetary (1 − α)F/4', () => {
    // Expected: 1361 W m⁻² × 0.7/4 = 238.2 W m⁻² (IAU 2015 nominal L_sun and the au; computed in the test),
    // reduced here by the eclipse fraction only.
    const b = moonEnergyBudget({ ...BASE, moonSeparationM: 1e6 * R_JUP_M });
    const fStar = L_SUN_W / (4 * Math.PI * AU_M * AU_M);
    expect(fStar).toBeCloseTo(1361.2, 1);
    expect(b.stellarWm2 / ((fStar * 0.7) / 4)).toBeCloseTo(1 - b.eclipseFraction, 12);
    expect(b.stellarWm2).toBeCloseTo(238.2, 1);
    expect(moonEnergyBudget({ ...BASE, includeEclipses: false }).stellarWm2).toBeCloseTo(238.2, 1);
  });

  it("gives Jupiter's equilibrium temperature ≈ 110 K at 5.2 au", () => {
    // Expected: Jupiter's black-body temperature 109.9 K for Bond albedo 0.343 (Jupiter planetary fact sheet,
    // from memory); a = 5.2038 au from memory.
    const b = moonEnergyBudget({ ...BASE, planetSemiMajorAxisM: 5.2038 * AU_M });
    expect(b.planetEquilibriumTempK).toBeCloseTo(109.9, 0);
  });

  it('planet reflected + thermal light conserves the intercepted starlight (property)', () => {
    // Expected: energy conservation, derived in the test: an equilibrium planet re-radiates all it intercepts,
    // F* π R_P², so the incident flux at a_S is F* R_P²/(4 a_S²) whatever α_P; absorbed × (1 − α_S)/4.
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 1.5, max: 200, noNaN: true }),
        fc.double({ min: 0, max: 0.9, noNaN: true }),
        fc.double({ min: 0, max: 0.9, noNaN: true }),
        (albP, ratio, albS, eP) => {
          const b = moonEnergyBudget({
            ...BASE,
            planetAlbedo: albP,
            moonSeparationM: ratio * R_JUP_M,
            moonAlbedo: albS,
            planetEccentricity: eP,
          });
          const fStar = L_SUN_W / (4 * Math.PI * AU_M * AU_M * Math.sqrt(1 - eP * eP));
          const expected = ((fStar / (4 * ratio * ratio)) * (1 - albS)) / 4;
          expect((b.reflectedWm2 + b.thermalWm2) / expected).toBeCloseTo(1, 12);
        },
      ),
    );
  });

  it('thermal term equals σT_P⁴ R_P²/a_S² × (1 − α_S)/4', () => {
    // Expected: definition of the planet's thermal flux at the moon (computed in the test from T_P^eq).
    const b = moonEnergyBudget(BASE);
    const incident = (SIGMA_SB * b.planetEquilibriumTempK ** 4) / 100;
    expect(b.thermalWm2).toBeCloseTo((incident * 0.7) / 4, 10);
    // Expected T_P^eq ≈ 250.6 K for a Jupiter twin at 1 au (computed by hand with Python).
    expect(b.planetEquilibriumTempK).toBeCloseTo(250.6, 1);
  });

  it('sums the terms, reports the dominant one and the stellar-equivalent flux', () => {
    // Expected: definitions (computed in the test).
    const b = moonEnergyBudget({ ...BASE, tidalHeatFluxWm2: 500 });
    expect(b.totalWm2).toBeCloseTo(b.stellarWm2 + b.reflectedWm2 + b.thermalWm2 + 500, 10);
    expect(b.dominant).toBe('tidal');
    expect(b.stellarEquivalentWm2).toBeCloseTo((4 * b.totalWm2) / 0.7, 10);
    expect(moonEnergyBudget(BASE).dominant).toBe('stellar');
    // Even grazing the planet, an equilibrium planet's light stays below the (half-eclipsed) starlight:
    // (R_P/a_S)²/4 ≤ 1/4 < 1 − f_E with f_E ≤ 1/2 (derived in the test), so 'stellar' dominates without tides.
    const grazing = moonEnergyBudget({ ...BASE, planetAlbedo: 0, moonSeparationM: 1.0001 * R_JUP_M });
    expect(grazing.dominant).toBe('stellar');
    expect((grazing.thermalWm2 + grazing.reflectedWm2) / grazing.stellarWm2).toBeLessThan(0.51);
    expect(grazing.eclipseFraction).toBeCloseTo(0.5, 2);
  });

  it('throws RangeError naming the field', () => {
    expect(() => moonEnergyBudget({ ...BASE, moonSeparationM: 0.5 * R_JUP_M })).toThrow(/moonSeparationM/);
    expect(() => moonEnergyBudget({ ...BASE, moonAlbedo: 1 })).toThrow(/moonAlbedo/);
    expect(() => moonEnergyBudget({ ...BASE, planetEccentricity: 1 })).toThrow(/planetEccentricity/);
    expect(() => moonEnergyBudget({ ...BASE, tidalHeatFluxWm2: -1 })).toThrow(/tidalHeatFluxWm2/);
    expect(() => moonEnergyBudget({ ...BASE, starLuminosityW: Number.NaN })).toThrow(/starLuminosityW/);
  });
});

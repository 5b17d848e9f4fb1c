import { describe, it, expect } from 'vitest';
import {
  FLUX_BUDGET_CAUTION,
  habitabilityVerdict,
  habitableZoneDistance,
  habitableZoneEdgeFlux,
  habitableZoneSeff,
  KOPPARAPU_2013,
  KOPPARAPU_2014,
} from '../../src/physics/habitableZone.js';
import { moonEnergyBudget, type MoonEnergyBudgetInput } from '../../src/physics/energyBudget.js';
import { runawayGreenhouseFlux, surfaceGravity } from '../../src/physics/runawayGreenhouse.js';
import { AU_M, L_SUN_W, M_EARTH_KG, R_EARTH_M, R_JUP_M, S_SUN_W_M2 } from '../../src/physics/constants.js';

const au = (luminosityW: number, teffK: number, c: Parameters<typeof habitableZoneSeff>[1]) =>
  habitableZoneDistance(luminosityW, teffK, c) / AU_M;

describe('habitable zone (Kopparapu et al. 2013 erratum; 2014)', () => {
  it("gives the Sun's conservative habitable zone ≈ 0.99–1.70 au", () => {
    // Expected: Kopparapu et al. 2013 quote 0.99 au (moist greenhouse) and 1.70 au (maximum greenhouse) for the
    // Sun (from memory). Computed with the erratum coefficients: MoistG 0.9928, MaxG 1.6886, RG 0.9813,
    // RV 0.7503, EM 1.7658 au (Python, by hand).
    expect(au(L_SUN_W, 5780, KOPPARAPU_2013.moistGreenhouse)).toBeCloseTo(0.99, 2);
    expect(Math.abs(au(L_SUN_W, 5780, KOPPARAPU_2013.maximumGreenhouse) - 1.7)).toBeLessThan(0.015);
    expect(au(L_SUN_W, 5780, KOPPARAPU_2013.runawayGreenhouse)).toBeCloseTo(0.9813, 4);
    expect(au(L_SUN_W, 5780, KOPPARAPU_2013.recentVenus)).toBeCloseTo(0.7503, 4);
    expect(au(L_SUN_W, 5780, KOPPARAPU_2013.maximumGreenhouse)).toBeCloseTo(1.6886, 4);
    expect(au(L_SUN_W, 5780, KOPPARAPU_2013.earlyMars)).toBeCloseTo(1.7658, 4);
  });

  it('mass-dependent runaway greenhouse (2014): ~10 % lower flux at 0.1 M_E, ~7 % higher at 5 M_E', () => {
    // Expected: Kopparapu et al. 2014 (ApJL 787, L29) abstract: the inner edge moves to "~10 % lower than Earth
    // flux" for low-mass planets and "~7 % higher" for larger ones (checked). Distances 0.9504/1.0050/0.9175 au
    // computed by hand (Python).
    const s1 = habitableZoneSeff(5780, KOPPARAPU_2014.runawayGreenhouse1MEarth);
    expect(habitableZoneSeff(5780, KOPPARAPU_2014.runawayGreenhouse0p1MEarth) / s1).toBeCloseTo(0.9, 1);
    expect(habitableZoneSeff(5780, KOPPARAPU_2014.runawayGreenhouse5MEarth) / s1).toBeCloseTo(1.07, 2);
    expect(au(L_SUN_W, 5780, KOPPARAPU_2014.runawayGreenhouse1MEarth)).toBeCloseTo(0.9504, 4);
    expect(au(L_SUN_W, 5780, KOPPARAPU_2014.runawayGreenhouse0p1MEarth)).toBeCloseTo(1.005, 3);
    expect(au(L_SUN_W, 5780, KOPPARAPU_2014.runawayGreenhouse5MEarth)).toBeCloseTo(0.9175, 4);
  });

  it('evaluates the polynomial away from 5780 K', () => {
    // Expected: S_eff = 0.88856 (RG13) and d = 0.6182 au (MaxG13, L = 0.1 L_sun) at 4000 K, computed by hand
    // (Python) with explicit powers of T = −1780 K.
    expect(habitableZoneSeff(4000, KOPPARAPU_2013.runawayGreenhouse)).toBeCloseTo(0.88856, 5);
    expect(au(0.1 * L_SUN_W, 4000, KOPPARAPU_2013.maximumGreenhouse)).toBeCloseTo(0.6182, 4);
  });

  it('edge flux is S_eff × S_sun', () => {
    // Expected: 0.3507 × 1361 W m⁻² (IAU 2015 nominal solar constant), computed in the test.
    expect(habitableZoneEdgeFlux(5780, KOPPARAPU_2013.maximumGreenhouse)).toBeCloseTo(0.3507 * S_SUN_W_M2, 10);
  });

  it('refuses temperatures outside 2600–7200 K unless extrapolation is allowed', () => {
    // Expected: the fits' stated validity range (Kopparapu et al. 2013, 2014).
    expect(() => habitableZoneSeff(7500, KOPPARAPU_2013.runawayGreenhouse)).toThrow(/teffK/);
    expect(() => habitableZoneSeff(2500, KOPPARAPU_2013.runawayGreenhouse)).toThrow(RangeError);
    expect(habitableZoneSeff(7500, KOPPARAPU_2013.runawayGreenhouse, { allowExtrapolation: true })).toBeGreaterThan(1);
    expect(() => habitableZoneDistance(0, 5780, KOPPARAPU_2013.runawayGreenhouse)).toThrow(/luminosityW/);
  });
});

describe('habitabilityVerdict', () => {
  // An Earth-size moon at 10 R_J around a Jupiter twin (invented example).
  const moon = (aP: number, tidal = 0): MoonEnergyBudgetInput => ({
    starLuminosityW: L_SUN_W,
    planetSemiMajorAxisM: aP,
    planetEccentricity: 0,
    planetRadiusM: R_JUP_M,
    planetAlbedo: 0.343,
    moonSeparationM: 10 * R_JUP_M,
    moonAlbedo: 0.3,
    tidalHeatFluxWm2: tidal,
  });
  const runaway = runawayGreenhouseFlux(surfaceGravity(M_EARTH_KG, R_EARTH_M));
  const outer = habitableZoneEdgeFlux(5780, KOPPARAPU_2013.maximumGreenhouse);

  it('temperate at 1 au, too hot at 0.7 au, too cold at 2 au', () => {
    // Expected: absorbed stellar flux ≈ 231 W m⁻² at 1 au (< 294), ≈ 471 at 0.7 au (> 294); at 2 au the
    // stellar-equivalent ≈ 330 W m⁻² < outer edge 477 W m⁻² (computed by hand from the formulas).
    expect(habitabilityVerdict(moonEnergyBudget(moon(AU_M)), runaway, outer)).toEqual({
      verdict: 'temperate',
      dominant: 'stellar',
    });
    expect(habitabilityVerdict(moonEnergyBudget(moon(0.7 * AU_M)), runaway, outer).verdict).toBe('too hot');
    expect(habitabilityVerdict(moonEnergyBudget(moon(2 * AU_M)), runaway, outer).verdict).toBe('too cold');
  });

  it('tidal heating alone can make a moon too hot, and is then dominant', () => {
    // Expected: 300 W m⁻² of tidal heat exceeds the ≈ 294 W m⁻² limit on its own (invented example).
    expect(habitabilityVerdict(moonEnergyBudget(moon(3 * AU_M, 300)), runaway, outer)).toEqual({
      verdict: 'too hot',
      dominant: 'tidal',
    });
  });

  it('carries the caution and validates its limits', () => {
    expect(FLUX_BUDGET_CAUTION).toMatch(/first screen, not a climate model/);
    const b = moonEnergyBudget(moon(AU_M));
    expect(() => habitabilityVerdict(b, 0, outer)).toThrow(/runawayLimitWm2/);
    expect(() => habitabilityVerdict(b, runaway, Number.NaN)).toThrow(/outerEdgeFluxWm2/);
  });
});

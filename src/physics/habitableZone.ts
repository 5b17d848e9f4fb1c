/**
 * Stellar habitable-zone limits and a first-screen habitability verdict for a
 * moon.
 *
 * Method: Kopparapu et al. (2013, ApJ 765, 131, eq. 2, with the updated
 * coefficients of the erratum, ApJ 770, 82) and Kopparapu et al. (2014, ApJL
 * 787, L29, eq. 4 and Table 1 [equation/table numbers from memory]):
 *
 *   S_eff = S_eff,⊙ + a T + b T² + c T³ + d T⁴,   T = T_eff − 5780 K,
 *   d = sqrt((L/L_⊙) / S_eff) au,
 *
 * valid for 2600 K ≤ T_eff ≤ 7200 K. S_eff is in units of the present solar
 * constant at Earth. The coefficients below agree with many independent
 * reproductions of the erratum and of the 2014 table (the original, pre-erratum
 * 2013 table differs: do not use it). Here L_⊙ = 3.828e26 W and the solar
 * constant S_⊙ = 1361 W m^-2 (IAU 2015 B3 nominal values).
 *
 * A flux budget is a first screen, not a climate model.
 */
import { AU_M, L_SUN_W, S_SUN_W_M2 } from './constants.js';
import type { EnergyTerm, MoonEnergyBudget } from './energyBudget.js';

/** S_eff(T) = seffSun + a T + b T² + c T³ + d T⁴ with T = T_eff − 5780 K. */
export interface HzCoefficients {
  seffSun: number;
  a: number;
  b: number;
  c: number;
  d: number;
}

/** Kopparapu et al. 2013 (ApJ 765, 131), erratum coefficients (ApJ 770, 82). */
export const KOPPARAPU_2013 = {
  recentVenus: { seffSun: 1.7763, a: 1.4335e-4, b: 3.3954e-9, c: -7.6364e-12, d: -1.195e-15 },
  runawayGreenhouse: { seffSun: 1.0385, a: 1.2456e-4, b: 1.4612e-8, c: -7.6345e-12, d: -1.7511e-15 },
  moistGreenhouse: { seffSun: 1.0146, a: 8.1884e-5, b: 1.9394e-9, c: -4.3618e-12, d: -6.826e-16 },
  maximumGreenhouse: { seffSun: 0.3507, a: 5.9578e-5, b: 1.6707e-9, c: -3.0058e-12, d: -5.1925e-16 },
  earlyMars: { seffSun: 0.3207, a: 5.4471e-5, b: 1.5275e-9, c: -2.1709e-12, d: -3.8282e-16 },
} as const satisfies Record<string, HzCoefficients>;

/** Kopparapu et al. 2014 (ApJL 787, L29): runaway greenhouse for 0.1, 1 and 5 Earth masses. */
export const KOPPARAPU_2014 = {
  recentVenus: { seffSun: 1.776, a: 2.136e-4, b: 2.533e-8, c: -1.332e-11, d: -3.097e-15 },
  runawayGreenhouse1MEarth: { seffSun: 1.107, a: 1.332e-4, b: 1.58e-8, c: -8.308e-12, d: -1.931e-15 },
  runawayGreenhouse5MEarth: { seffSun: 1.188, a: 1.433e-4, b: 1.707e-8, c: -8.968e-12, d: -2.084e-15 },
  runawayGreenhouse0p1MEarth: { seffSun: 0.99, a: 1.209e-4, b: 1.404e-8, c: -7.418e-12, d: -1.713e-15 },
  maximumGreenhouse: { seffSun: 0.356, a: 6.171e-5, b: 1.698e-9, c: -3.198e-12, d: -5.575e-16 },
  earlyMars: { seffSun: 0.32, a: 5.547e-5, b: 1.526e-9, c: -2.874e-12, d: -5.011e-16 },
} as const satisfies Record<string, HzCoefficients>;

/** Validity range of the Kopparapu et al. fits, K. */
export const HZ_TEFF_MIN_K = 2600;
export const HZ_TEFF_MAX_K = 7200;

export interface HzOptions {
  /** Evaluate the polynomial outside 2600–7200 K instead of throwing; default false. */
  allowExtrapolation?: boolean;
}

/**
 * Effective flux S_eff of a habitable-zone limit, in units of the present solar
 * constant (Kopparapu et al. 2013, ApJ 765, 131 + erratum ApJ 770, 82; 2014,
 * ApJL 787, L29).
 */
export function habitableZoneSeff(teffK: number, coefficients: HzCoefficients, options: HzOptions = {}): number {
  if (!Number.isFinite(teffK) || !(teffK > 0)) {
    throw new RangeError(`teffK must be a positive finite number, got ${teffK}`);
  }
  if (!options.allowExtrapolation && !(teffK >= HZ_TEFF_MIN_K && teffK <= HZ_TEFF_MAX_K)) {
    throw new RangeError(
      `teffK = ${teffK} is outside ${HZ_TEFF_MIN_K}–${HZ_TEFF_MAX_K} K, where the Kopparapu et al. fits are valid`,
    );
  }
  const t = teffK - 5780;
  const { seffSun, a, b, c, d } = coefficients;
  return seffSun + t * (a + t * (b + t * (c + t * d)));
}

/** Top-of-atmosphere stellar flux at a habitable-zone limit, S_eff × S_⊙, W m^-2. */
export function habitableZoneEdgeFlux(teffK: number, coefficients: HzCoefficients, options: HzOptions = {}): number {
  return habitableZoneSeff(teffK, coefficients, options) * S_SUN_W_M2;
}

/**
 * Distance of a habitable-zone limit from the star, m:
 * d = sqrt((L/L_⊙)/S_eff) au (Kopparapu et al. 2013, ApJ 765, 131).
 */
export function habitableZoneDistance(
  luminosityW: number,
  teffK: number,
  coefficients: HzCoefficients,
  options: HzOptions = {},
): number {
  if (!(luminosityW > 0) || !Number.isFinite(luminosityW)) {
    throw new RangeError(`luminosityW must be a positive finite number, got ${luminosityW}`);
  }
  const seff = habitableZoneSeff(teffK, coefficients, options);
  if (!(seff > 0)) {
    throw new RangeError(`teffK = ${teffK} gives a non-positive S_eff (${seff}); the fit does not apply`);
  }
  return Math.sqrt(luminosityW / L_SUN_W / seff) * AU_M;
}

/** The caution printed with every verdict. */
export const FLUX_BUDGET_CAUTION = 'a flux budget is a first screen, not a climate model';

export type HabitabilityVerdict = 'too hot' | 'temperate' | 'too cold';

export interface HabitabilityResult {
  verdict: HabitabilityVerdict;
  /** The largest term of the energy budget. */
  dominant: EnergyTerm;
}

/**
 * First-screen verdict on a moon's surface water from its energy budget.
 *
 * - 'too hot': the absorbed, globally averaged total exceeds the
 *   runaway-greenhouse limit (Heller & Barnes 2013, Astrobiology 13, 18, who
 *   define the circumplanetary "habitable edge" this way).
 * - 'too cold': the moon receives less than the outer edge of the stellar
 *   habitable zone. The outer edge is a top-of-atmosphere stellar flux,
 *   S_eff(maximum greenhouse) × S_⊙ (Kopparapu et al. 2013/2014), so the
 *   budget is first converted to the stellar flux that would give the same
 *   absorbed total on its own (`stellarEquivalentWm2` = 4 total/(1 − α_S)). A
 *   moon getting less than that even with a maximal CO₂ greenhouse cannot keep
 *   surface water liquid.
 * - 'temperate' otherwise.
 *
 * A flux budget is a first screen, not a climate model: it ignores the
 * atmosphere's response, seasons, the uneven spread of tidal heat, and the
 * difference between stellar and planetary (infrared) light.
 *
 * @param budget result of moonEnergyBudget
 * @param runawayLimitWm2 runaway-greenhouse limit on the absorbed flux (runawayGreenhouseFlux), W m^-2
 * @param outerEdgeFluxWm2 outer-edge stellar flux, e.g. habitableZoneEdgeFlux(teff, KOPPARAPU_2013.maximumGreenhouse), W m^-2
 */
export function habitabilityVerdict(
  budget: MoonEnergyBudget,
  runawayLimitWm2: number,
  outerEdgeFluxWm2: number,
): HabitabilityResult {
  if (!(runawayLimitWm2 > 0) || !Number.isFinite(runawayLimitWm2)) {
    throw new RangeError(`runawayLimitWm2 must be a positive finite number, got ${runawayLimitWm2}`);
  }
  if (!(outerEdgeFluxWm2 > 0) || !Number.isFinite(outerEdgeFluxWm2)) {
    throw new RangeError(`outerEdgeFluxWm2 must be a positive finite number, got ${outerEdgeFluxWm2}`);
  }
  let verdict: HabitabilityVerdict = 'temperate';
  if (budget.totalWm2 > runawayLimitWm2) verdict = 'too hot';
  else if (budget.stellarEquivalentWm2 < outerEdgeFluxWm2) verdict = 'too cold';
  return { verdict, dominant: budget.dominant };
}

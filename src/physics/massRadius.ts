/**
 * Planet radius from mass: the mean relation of Chen & Kipping 2017 (ApJ 834,
 * 17, "Probabilistic forecasting of the masses and radii of other worlds"),
 * a continuous broken power law in log space (their eq. 2 and Table 1, the
 * posterior means):
 *
 *   log10(R/R⊕) = C_j + S_j log10(M/M⊕)   in regime j,
 *
 * Terran (M < 2.04 M⊕)      S1 = 0.2790, C1 = 0.00346
 * Neptunian (< 0.414 M_J)   S2 = 0.589
 * Jovian (< 0.0800 M☉)      S3 = −0.044
 * Stellar                   S4 = 0.881
 *
 * C2…C4 follow from continuity at the transitions (as in the paper's model).
 * The paper's intrinsic scatter (fractional σ_R = 4.03 %, 14.6 %, 7.37 %,
 * 4.3 % by regime) is not drawn: this gives the mean radius. Only the planetary regimes are
 * offered; a mass at or above the Jovian–stellar transition is out of domain.
 */
import { M_EARTH_KG, M_JUP_KG, M_SUN_KG, R_EARTH_M } from './constants.js';

/** Transition masses, kg (Chen & Kipping 2017, Table 1). */
export const CHEN_KIPPING_TRANSITIONS_KG = {
  terranNeptunian: 2.04 * M_EARTH_KG,
  neptunianJovian: 0.414 * M_JUP_KG,
  jovianStellar: 0.08 * M_SUN_KG,
} as const;

/** Power-law indices S1…S4 and the Terran intercept C1 (Chen & Kipping 2017, Table 1). */
export const CHEN_KIPPING_SLOPES = [0.279, 0.589, -0.044, 0.881] as const;
export const CHEN_KIPPING_C1 = 0.00346;

/** log10 of the transitions in Earth masses. */
function logTransitions(): [number, number, number] {
  const t = CHEN_KIPPING_TRANSITIONS_KG;
  return [Math.log10(t.terranNeptunian / M_EARTH_KG), Math.log10(t.neptunianJovian / M_EARTH_KG), Math.log10(t.jovianStellar / M_EARTH_KG)];
}

/** Intercepts C1…C4 (log10 R/R⊕ at 1 M⊕ of each segment), from continuity at the transitions. */
export function chenKippingIntercepts(): [number, number, number, number] {
  const [t1, t2, t3] = logTransitions();
  const [s1, s2, s3, s4] = CHEN_KIPPING_SLOPES;
  const c1 = CHEN_KIPPING_C1;
  const c2 = c1 + (s1 - s2) * t1;
  const c3 = c2 + (s2 - s3) * t2;
  const c4 = c3 + (s3 - s4) * t3;
  return [c1, c2, c3, c4];
}

/**
 * Mean planet radius, m, for a mass in kg (Chen & Kipping 2017). Kernel:
 * NaN for a mass that is not positive or not below the Jovian–stellar
 * transition (0.08 M☉).
 */
export function chenKippingRadius(massKg: number): number {
  if (!(massKg > 0) || !(massKg < CHEN_KIPPING_TRANSITIONS_KG.jovianStellar)) return Number.NaN;
  const x = Math.log10(massKg / M_EARTH_KG);
  const [t1, t2] = logTransitions();
  const c = chenKippingIntercepts();
  const j = x < t1 ? 0 : x < t2 ? 1 : 2;
  return R_EARTH_M * 10 ** (c[j] + CHEN_KIPPING_SLOPES[j] * x);
}

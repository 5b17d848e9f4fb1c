/**
 * Would the implied moon's own dip have shown in the data?
 *
 * Radius from mass and an assumed bulk density, R = (3M/(4πρ))^{1/3}; depth
 * along the transit chord from moonDipDepth.ts (Mandel & Agol 2002 small-body
 * limit). Two signal-to-noise ratios over N transits, white noise σ_τ stated
 * at timescale τ (σ per unit time scales as τ^{1/2}):
 * - optimal (moon position known, e.g. from the timing solution): the moon
 *   crosses the star for about the planet's T14, so the matched-filter box
 *   SNR is δ·sqrt(N·T14/τ)/σ_τ (white-noise box detection, e.g. Pont, Zucker
 *   & Queloz 2006, MNRAS 373, 231, in its white-noise limit);
 * - stacked without positions (orbital sampling effect, Heller 2014, ApJ
 *   787, 14): folding smears the dip into δ·f(x) with the arcsine profile f
 *   of oseProfile (moonDipStack.ts), so SNR² = N·δ²·∫f(x(t))²dt/(τσ_τ²),
 *   x = v_B t/R*, evaluated by the trapezoid rule on the chord-scaled profile.
 * Bulk densities (planetary fact sheets, from memory): rocky 5500 kg/m³
 * (Earth 5514, the densest rocky body: the smallest radius, hence the most
 * conservative dip), icy 1900 kg/m³ (Ganymede 1936, Callisto 1834).
 */
import { moonDipDepth } from '../physics/moonDip.js';
import { oseProfile } from '../timing/moonDipStack.js';

/** Rocky moon bulk density, kg/m³ (Earth's mean density 5514 kg/m³, planetary fact sheet, from memory). */
export const ROCKY_DENSITY_KG_M3 = 5500;
/** Icy moon bulk density, kg/m³ (Ganymede 1936, Callisto 1834 kg/m³, planetary fact sheets, from memory). */
export const ICY_DENSITY_KG_M3 = 1900;
/** Detection threshold for a dip, σ: Kepler's 7.1σ transit threshold (Jenkins et al. 2010, ApJ 713, L87, from memory). */
export const DIP_DETECTION_SIGMA = 7.1;

export interface DipVisibilityInput {
  moonMassKg: number;
  densityKgM3: number;
  starRadiusM: number;
  u1: number;
  u2: number;
  impactParameter: number;
  /** Planet T14, s. */
  durationS: number;
  /** Moon separation (projected semi-axis along the chord), m. */
  separationM: number;
  /** Barycentre sky speed, m/s. */
  barycentreVelocityMS: number;
  transits: number;
  noiseFraction: number;
  noiseTimescaleS: number;
}

export interface DipVisibility {
  radiusM: number;
  depth: number;
  /** SNR with the moon's position known (box matched filter over N transits). */
  snrOptimal: number;
  /** SNR of the folded (orbital-sampling-effect) stack. */
  snrStacked: number;
}

/** Radius of a sphere of mass M and density ρ, m. */
export function radiusFromDensity(massKg: number, densityKgM3: number): number {
  return Math.cbrt((3 * massKg) / (4 * Math.PI * densityKgM3));
}

/** ∫ f(x)² dx over the folded profile, chord half-length L and projected semi-axis a (stellar radii). */
function oseSquareIntegral(halfChord: number, a: number): number {
  const aScaled = a / halfChord;
  const reach = 1 + aScaled;
  const n = 4000;
  const h = (2 * reach) / n;
  let s = 0;
  for (let k = 0; k <= n; k++) {
    const f = oseProfile(-reach + k * h, aScaled);
    s += (k === 0 || k === n ? 0.5 : 1) * f * f;
  }
  return s * h * halfChord; // x in stellar radii = x_scaled·L
}

export function dipVisibility(input: DipVisibilityInput): DipVisibility {
  const { moonMassKg, densityKgM3, starRadiusM, u1, u2, durationS, separationM, barycentreVelocityMS, transits, noiseFraction, noiseTimescaleS } = input;
  const b = Math.min(Math.max(input.impactParameter, 0), 0.999);
  const radiusM = radiusFromDensity(moonMassKg, densityKgM3);
  const depth = moonDipDepth({ moonRadiusM: radiusM, starRadiusM, u1, u2, impactParameter: b }).depthChordMean;
  const snrOptimal = (depth * Math.sqrt((transits * durationS) / noiseTimescaleS)) / noiseFraction;
  const halfChord = Math.sqrt(1 - b * b);
  const integralStellarRadii = oseSquareIntegral(halfChord, separationM / starRadiusM);
  const integralS = (integralStellarRadii * starRadiusM) / barycentreVelocityMS;
  const snrStacked = (depth * Math.sqrt((transits * integralS) / noiseTimescaleS)) / noiseFraction;
  return { radiusM, depth, snrOptimal, snrStacked };
}

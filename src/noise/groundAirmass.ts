/**
 * The ground noise budget (groundBudget.ts) of one exposure at the air mass it
 * is actually taken at, for a scenario's `instrument.ground` at a site.
 *
 * - Photon noise with atmospheric extinction: the stated throughput holds at
 *   the stated air mass X₀ (`instrument.ground.airmass`); at X the star is
 *   fainter by k (X − X₀) magnitudes (Bouguer's law, m(X) = m₀ + kX; e.g.
 *   Hardie 1962, in Astronomical Techniques, ed. Hiltner, ch. 8), k the
 *   band's extinction coefficient below.
 * - Scintillation at X and the site's own height (Osborn et al. 2015, MNRAS
 *   452, 1707, eq. 7: σ ∝ X^1.5 e^(−h/8000 m)).
 * - The systematic floor does not depend on X.
 */
import type { GroundSpec } from '../scenario/types.js';
import { bandZeroPointPhotons, groundNoiseBudget } from './groundBudget.js';

/**
 * Extinction coefficients, mag per unit air mass, at a good dry site: typical
 * values, of the order of La Silla's medians (Burki et al. 1995, A&AS 112,
 * 383) [from memory, not checked against the paper's tables]. Nights vary by
 * ±0.05 mag or more; the model uses one value per band.
 */
export const EXTINCTION_MAG_PER_AIRMASS: Record<GroundSpec['band'], number> = { U: 0.45, B: 0.25, V: 0.15, R: 0.1, I: 0.06 };

/**
 * White noise per exposure (relative flux, 1σ) of `ground` at air mass
 * `airmass` (≥ 1) from a site at `siteAltitudeM`. Throws RangeError (from
 * groundNoiseBudget) on arguments out of its domain.
 */
export function groundSigmaAtAirmass(ground: GroundSpec, exposureS: number, cadenceS: number, airmass: number, siteAltitudeM: number): number {
  const k = EXTINCTION_MAG_PER_AIRMASS[ground.band];
  return groundNoiseBudget({
    apertureDiameterM: ground.apertureM,
    magnitude: ground.magnitude + k * (airmass - ground.airmass),
    zeroPointPhotonsPerSM2: bandZeroPointPhotons(ground.band),
    throughput: ground.throughput,
    exposureS,
    cadenceS,
    scintillation: { model: 'osborn2015', airmass, altitudeM: siteAltitudeM, cY: ground.scintillationCoefficient },
    floor: ground.floorFraction > 0 ? { fraction: ground.floorFraction, timescaleS: ground.floorTimescaleS } : undefined,
  }).perExposure.total;
}

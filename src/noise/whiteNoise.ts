/**
 * White (uncorrelated) photometric noise.
 *
 * A precision is stated at some timescale ("60 ppm per 1 h", "800 ppm per
 * 2 min"): the standard deviation of the relative flux averaged over that
 * time. For white noise the average of N independent points has standard
 * deviation σ/√N, so the per-exposure level is
 *   σ_exp = σ_ref · sqrt(t_ref / t_exp)
 * (common practice; the white-noise term of Pont, Zucker & Queloz 2006,
 * MNRAS 373, 231, eq. 1, σ_n² = σ_w²/n).
 */
import type { Rng } from './rng.js';

/**
 * Per-exposure white-noise standard deviation (relative flux) from a level
 * `noiseFraction` (relative flux, e.g. 60e-6) stated at `timescaleS` seconds,
 * for exposures of `exposureS` seconds: σ_ref·sqrt(t_ref/t_exp).
 * Throws RangeError for a negative or non-finite level or a non-positive time.
 */
export function whiteNoiseSigma(noiseFraction: number, timescaleS: number, exposureS: number): number {
  if (!(noiseFraction >= 0) || !Number.isFinite(noiseFraction)) {
    throw new RangeError(`noiseFraction must be a finite number >= 0, got ${noiseFraction}`);
  }
  if (!(timescaleS > 0) || !Number.isFinite(timescaleS)) {
    throw new RangeError(`timescaleS must be a finite number > 0, got ${timescaleS}`);
  }
  if (!(exposureS > 0) || !Number.isFinite(exposureS)) {
    throw new RangeError(`exposureS must be a finite number > 0, got ${exposureS}`);
  }
  // Pont, Zucker & Queloz 2006, eq. 1 (white term): σ(t) ∝ t^(−1/2).
  return noiseFraction * Math.sqrt(timescaleS / exposureS);
}

/**
 * Add N(0, sigma²) white noise to `flux` in place and return it. `sigma` is a
 * number (the same for every point) or a per-point Float64Array of the same
 * length. Draws one normal per point, in index order, from `rng`.
 */
export function addWhiteNoise(flux: Float64Array, sigma: number | Float64Array, rng: Rng): Float64Array {
  const n = flux.length;
  if (typeof sigma === 'number') {
    if (!(sigma >= 0) || !Number.isFinite(sigma)) {
      throw new RangeError(`sigma must be a finite number >= 0, got ${sigma}`);
    }
    for (let i = 0; i < n; i++) flux[i] += sigma * rng.normal();
    return flux;
  }
  if (sigma.length !== n) {
    throw new RangeError(`sigma must have the length of flux (${n}), got length ${sigma.length}`);
  }
  for (let i = 0; i < n; i++) {
    const s = sigma[i];
    if (!(s >= 0) || !Number.isFinite(s)) throw new RangeError(`sigma[${i}] must be a finite number >= 0, got ${s}`);
    flux[i] += s * rng.normal();
  }
  return flux;
}

/**
 * Damped random walk (Ornstein–Uhlenbeck process, exponential covariance
 * k(Δt) = σ² e^{−|Δt|/τ}) sampled at arbitrary, possibly gappy, time stamps.
 *
 * Exact discrete update (Kelly, Bechtold & Siemiginowska 2009, ApJ 698, 895,
 * eqs. 2–4, written for a stationary process of variance σ²):
 *   x_0 ~ N(0, σ²),
 *   x_{k+1} = x_k a_k + σ sqrt(1 − a_k²) ε_k,  a_k = e^{−(t_{k+1} − t_k)/τ},
 * with ε_k ~ N(0, 1). Exact for any spacing: no step-size error, gaps handled
 * naturally (the process decorrelates across a long gap). O(n), no allocation.
 */
import type { Rng } from './rng.js';

/**
 * Kernel: fill `out[0..n)` with a DRW of stationary rms `sigma` and timescale
 * `tauS` at times `timeS` (s, non-decreasing). Returns NaN-filled output for
 * out-of-domain input (σ < 0, τ ≤ 0, decreasing times); does not throw.
 * Draws exactly n normals from `rng`, in index order.
 */
export function dampedRandomWalkKernel(n: number, out: Float64Array, timeS: Float64Array, tauS: number, sigma: number, rng: Rng): Float64Array {
  if (n <= 0) return out;
  if (!(sigma >= 0) || !(tauS > 0)) {
    out.fill(NaN, 0, n);
    return out;
  }
  let x = sigma * rng.normal(); // stationary start
  out[0] = x;
  for (let k = 1; k < n; k++) {
    const dt = timeS[k] - timeS[k - 1];
    if (!(dt >= 0)) {
      out.fill(NaN, k, n);
      return out;
    }
    // Kelly et al. 2009, eq. 3 (mean) and eq. 4 (variance) of x(t+Δt) given x(t).
    const a = Math.exp(-dt / tauS);
    x = a * x + sigma * Math.sqrt(1 - a * a) * rng.normal();
    out[k] = x;
  }
  return out;
}

/**
 * Damped-random-walk noise (relative flux) of stationary rms `sigma` and
 * damping timescale `tauS` (s) at the time stamps `timeS` (s, non-decreasing,
 * any spacing). Writes into `out` (default a new array) and returns it.
 * Throws RangeError naming a bad argument.
 */
export function dampedRandomWalkNoise(timeS: Float64Array, tauS: number, sigma: number, rng: Rng, out?: Float64Array): Float64Array {
  const n = timeS.length;
  if (!(tauS > 0) || !Number.isFinite(tauS)) throw new RangeError(`tauS must be a finite number > 0, got ${tauS}`);
  if (!(sigma >= 0) || !Number.isFinite(sigma)) throw new RangeError(`sigma must be a finite number >= 0, got ${sigma}`);
  for (let k = 0; k < n; k++) {
    if (!Number.isFinite(timeS[k])) throw new RangeError(`timeS[${k}] must be finite, got ${timeS[k]}`);
    if (k > 0 && timeS[k] < timeS[k - 1]) {
      throw new RangeError(`timeS must be non-decreasing, got timeS[${k}] = ${timeS[k]} < timeS[${k - 1}] = ${timeS[k - 1]}`);
    }
  }
  const target = out ?? new Float64Array(n);
  if (target.length < n) throw new RangeError(`out must have length >= ${n}, got ${target.length}`);
  return dampedRandomWalkKernel(n, target, timeS, tauS, sigma, rng);
}

/**
 * Exposure smearing: a long exposure records the light curve averaged over
 * its duration, F̄(t) = (1/T)∫_{t−T/2}^{t+T/2} F(t') dt', which rounds the
 * contact points and lengthens ingress and egress (Kipping 2010, MNRAS 408,
 * 1758, §2). As there, the average is approximated by evaluating the model at
 * N sub-exposure times and averaging (the midpoint rule; Kipping 2010 calls this resampling).
 *
 * Error bound (derived here; the midpoint-rule error on a kink): near a
 * contact point a transit light curve is close to a trapezoid whose slope
 * changes by s = depth/τ (τ the ingress duration). On a sub-interval of width
 * h = T/N containing such a kink at offset t₀ from its midpoint, the exact
 * sub-interval mean minus the midpoint value is s(h/2 − |t₀|)²/(2h), at most
 * s·h/8 (at t₀ = 0); that sub-interval carries weight 1/N of the exposure, so
 *
 *   |F̄ − F̄_N| ≤ s·h/(8N) = depth·T / (8N²τ)
 *
 * per kink in the exposure. Smooth curvature between kinks adds the usual
 * midpoint term T²F''/(24N²), smaller for a transit light curve. Hence
 * N = ⌈√(depth·T/(8τ·tolerance))⌉.
 */

/**
 * Number of sub-exposures N such that the midpoint-rule smearing error
 * depth·T/(8N²τ) is ≤ tolerance (relative-flux units, as depth). Returns 1
 * when no supersampling is needed.
 * @param exposureS exposure (integration) time T, s, ≥ 0
 * @param ingressS ingress duration τ, s, > 0
 * @param depth transit depth, relative flux (e.g. p² for a uniform disc), ≥ 0
 * @param tolerance largest acceptable error, relative flux, > 0
 * @throws RangeError naming the argument when out of domain.
 */
export function supersampleCount(exposureS: number, ingressS: number, depth: number, tolerance: number): number {
  if (!(exposureS >= 0) || !Number.isFinite(exposureS)) {
    throw new RangeError(`exposureS must be a finite number ≥ 0, got ${exposureS}`);
  }
  if (!(ingressS > 0) || !Number.isFinite(ingressS)) {
    throw new RangeError(`ingressS must be a finite number > 0, got ${ingressS}`);
  }
  if (!(depth >= 0) || !Number.isFinite(depth)) throw new RangeError(`depth must be a finite number ≥ 0, got ${depth}`);
  if (!(tolerance > 0)) throw new RangeError(`tolerance must be > 0, got ${tolerance}`);
  const n = Math.ceil(Math.sqrt((depth * exposureS) / (8 * ingressS * tolerance)) - 1e-12);
  return n > 1 ? n : 1;
}

/**
 * Sub-exposure offsets from the exposure mid-time, s: centred midpoints
 * (j − (n − 1)/2)·T/n for j = 0 … n − 1 (they sum to 0).
 * @throws RangeError for T < 0 or non-finite, or n not an integer ≥ 1.
 */
export function supersampleOffsets(exposureS: number, n: number): Float64Array {
  if (!(exposureS >= 0) || !Number.isFinite(exposureS)) {
    throw new RangeError(`exposureS must be a finite number ≥ 0, got ${exposureS}`);
  }
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`n must be an integer ≥ 1, got ${n}`);
  const off = new Float64Array(n);
  const h = exposureS / n;
  const mid = (n - 1) / 2;
  for (let j = 0; j < n; j++) off[j] = (j - mid) * h;
  return off;
}

/** A light-curve model: fills out[i] with the flux at times t[i] (same length). */
export type FluxModel = (t: Float64Array, out: Float64Array) => void;

/**
 * Exposure-averaged model flux at each mid-exposure time: out[i] = mean over
 * j of model(times[i] + offset_j), offsets from supersampleOffsets(exposureS, n).
 * The model is called n times on whole arrays; one scratch buffer of
 * 2·times.length doubles is allocated per call, none per point. With n = 1
 * the model is evaluated once at the mid-times.
 * @throws RangeError for bad exposureS or n, a short `out`, or `out` sharing
 *   memory with `times`.
 */
export function integrateExposure(
  times: Float64Array,
  exposureS: number,
  n: number,
  model: FluxModel,
  out: Float64Array,
): Float64Array {
  const offsets = supersampleOffsets(exposureS, n);
  const len = times.length;
  if (out.length < len) throw new RangeError(`out.length must be ≥ times.length (${len}), got ${out.length}`);
  if (out.buffer === times.buffer) throw new RangeError('out must not share memory with times');
  const scratch = new Float64Array(2 * len);
  const t = scratch.subarray(0, len);
  const f = scratch.subarray(len, 2 * len);
  out.fill(0, 0, len);
  for (let j = 0; j < n; j++) {
    const dt = offsets[j];
    for (let i = 0; i < len; i++) t[i] = times[i] + dt;
    model(t, f);
    for (let i = 0; i < len; i++) out[i] += f[i];
  }
  const inv = 1 / n;
  for (let i = 0; i < len; i++) out[i] *= inv;
  return out;
}

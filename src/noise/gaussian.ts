/**
 * Standard-normal samplers driven by a uniform source on [0, 1).
 *
 * Three methods are kept so that `bench/noise.ts` can compare them; the seeded
 * generator in `rng.ts` uses the ziggurat, the fastest here (see the bench).
 *
 * - Ziggurat: Marsaglia & Tsang 2000, J. Stat. Softw. 5(8), "The Ziggurat
 *   Method for Generating Random Variables", 128 layers, with the
 *   double-precision form of Doornik 2005 ("An Improved Ziggurat Method to
 *   Generate Normal Random Samples", Univ. Oxford): the layer index is drawn
 *   independently of the abscissa, removing the correlation Doornik found in
 *   the original integer version. Exact (rejection sampling, no approximation).
 * - Marsaglia polar: Marsaglia & Bray 1964, SIAM Review 6, 260.
 * - Box–Muller: Box & Muller 1958, Ann. Math. Stat. 29, 610.
 */

/** Anything producing uniform doubles on [0, 1). */
export interface UniformSource {
  uniform(): number;
}

/** Number of ziggurat layers (Marsaglia & Tsang 2000, Sect. 3; Doornik 2005 "ZIGNOR"). */
const ZIG_LAYERS = 128;
/** Right-most layer edge r for 128 layers (Marsaglia & Tsang 2000, Sect. 3, n = 128). */
const ZIG_R = 3.442619855899;
/** Common layer area v for 128 layers (Marsaglia & Tsang 2000, Sect. 3, n = 128). */
const ZIG_V = 9.91256303526217e-3;

/**
 * Layer edges x_0 > x_1 = r > … > x_128 = 0 and ratios x_{i+1}/x_i, built once
 * (immutable lookup tables, not settings). Recurrence of Marsaglia & Tsang 2000,
 * Sect. 2: x_{i+1} = f⁻¹(v/x_i + f(x_i)), f(x) = exp(−x²/2); x_0 = v/f(r) is the
 * width of the base strip including the tail (Doornik 2005).
 */
function buildZigguratTables(): { x: Float64Array; ratio: Float64Array } {
  const x = new Float64Array(ZIG_LAYERS + 1);
  let f = Math.exp(-0.5 * ZIG_R * ZIG_R);
  x[0] = ZIG_V / f;
  x[1] = ZIG_R;
  x[ZIG_LAYERS] = 0;
  for (let i = 2; i < ZIG_LAYERS; i++) {
    x[i] = Math.sqrt(-2 * Math.log(ZIG_V / x[i - 1] + f));
    f = Math.exp(-0.5 * x[i] * x[i]);
  }
  const ratio = new Float64Array(ZIG_LAYERS);
  for (let i = 0; i < ZIG_LAYERS; i++) ratio[i] = x[i + 1] / x[i];
  return { x, ratio };
}

const ZIG = buildZigguratTables();
const ZIG_X = ZIG.x;
const ZIG_RATIO = ZIG.ratio;

/**
 * One standard-normal deviate by the ziggurat (Marsaglia & Tsang 2000;
 * Doornik 2005). Uses ≈ 2.03 uniforms per deviate on average.
 */
export function normalZiggurat(src: UniformSource): number {
  const u = 2 * src.uniform() - 1;
  const i = (src.uniform() * ZIG_LAYERS) | 0;
  // Inside the rectangle wholly under the curve: accept at once (≈ 99 %).
  return Math.abs(u) < ZIG_RATIO[i] ? u * ZIG_X[i] : zigguratEdge(src, u, i);
}

/**
 * out[k] = sigma × a standard-normal deviate, k < out.length: normalZiggurat
 * with its common case written into the loop, so that a deviate is not
 * returned (and boxed by V8) per element. The same draws in the same order.
 */
export function fillNormalZiggurat(src: UniformSource, out: Float64Array, sigma: number): void {
  for (let k = 0; k < out.length; k++) {
    const u = 2 * src.uniform() - 1;
    const i = (src.uniform() * ZIG_LAYERS) | 0;
    // Two stores, not one of a conditional: V8 would box the common value to merge it with the call's.
    if (Math.abs(u) < ZIG_RATIO[i]) out[k] = sigma * (u * ZIG_X[i]);
    else out[k] = sigma * zigguratEdge(src, u, i);
  }
}

/** The ziggurat outside layer i's inner rectangle: the tail (i = 0) or the wedge; a rejection starts a fresh deviate. */
function zigguratEdge(src: UniformSource, u: number, i: number): number {
  if (i === 0) {
    // Tail beyond r: Marsaglia 1964 tail method (Marsaglia & Tsang 2000, Sect. 4).
    let t: number;
    let y: number;
    do {
      t = Math.log(1 - src.uniform()) / ZIG_R; // 1 − U ∈ (0, 1]: log finite
      y = Math.log(1 - src.uniform());
    } while (-2 * y < t * t);
    return u < 0 ? t - ZIG_R : ZIG_R - t;
  }
  // Wedge: accept under exp(−x²/2) between layers i and i+1.
  const xv = u * ZIG_X[i];
  const x2 = xv * xv;
  const f0 = Math.exp(-0.5 * (ZIG_X[i] * ZIG_X[i] - x2));
  const f1 = Math.exp(-0.5 * (ZIG_X[i + 1] * ZIG_X[i + 1] - x2));
  if (f1 + src.uniform() * (f0 - f1) < 1) return xv;
  return normalZiggurat(src);
}

/**
 * One standard-normal deviate by the Marsaglia polar method (Marsaglia &
 * Bray 1964, SIAM Review 6, 260); the second deviate of the pair is discarded
 * so that the sampler stays stateless.
 */
export function normalPolar(src: UniformSource): number {
  let v1: number;
  let s: number;
  do {
    v1 = 2 * src.uniform() - 1;
    const v2 = 2 * src.uniform() - 1;
    s = v1 * v1 + v2 * v2;
  } while (s >= 1 || s === 0);
  return v1 * Math.sqrt((-2 * Math.log(s)) / s);
}

/**
 * Fill `out` with standard-normal deviates × sigma by the Box–Muller transform
 * (Box & Muller 1958, Ann. Math. Stat. 29, 610, eq. 1), both members of each pair used.
 */
export function fillNormalBoxMuller(src: UniformSource, out: Float64Array, sigma = 1): void {
  const n = out.length;
  const twoPi = 2 * Math.PI;
  let k = 0;
  while (k < n) {
    const r = sigma * Math.sqrt(-2 * Math.log(1 - src.uniform())); // 1 − U ∈ (0, 1]
    const phi = twoPi * src.uniform();
    out[k++] = r * Math.cos(phi);
    if (k < n) out[k++] = r * Math.sin(phi);
  }
}

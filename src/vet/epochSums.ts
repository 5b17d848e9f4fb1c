/**
 * Trigonometric sums over integer transit epochs at every frequency of a
 * uniform grid, by FFT instead of one O(N) pass per frequency.
 *
 * For weights x_i at integer epochs E_i and the grid ν_j = j/L (j = 0 … L−1,
 * cycles per epoch), the sums
 *   Σ_i x_i cos 2πν_j E_i   and   Σ_i x_i sin 2πν_j E_i
 * are the real and imaginary parts of e^{2πi ν_j E₀} · X_j, where E₀ is the
 * first epoch and X_j = Σ_m x'_m e^{2πi jm/L} the length-L discrete Fourier
 * transform of the weights placed at m = E_i − E₀ (summed where epochs
 * repeat). Because the epochs are integers this is exact, not an
 * interpolation: the "extirpolation" of Press & Rybicki (1989, ApJ 338, 277)
 * is only needed for non-integer times. L need not be a power of two: the
 * transform is Bluestein's chirp z-transform (Bluestein 1970, IEEE Trans.
 * Audio Electroacoust. 18, 451), jm = (j² + m² − (j − m)²)/2, evaluated as a
 * convolution with power-of-two FFTs (fft.js). Cost O(L log L + N) for all
 * L frequencies, against O(N·L) directly.
 */
import FFT from 'fft.js';

/** Largest transform length accepted (guards memory: ~16 bytes × 4 × the next power of two ≥ 2L). */
export const MAX_DFT_LENGTH = 1 << 22;

/** Cosine and sine sums of several weight sets over a shared frequency grid ν_j = j/L. */
export interface EpochSums {
  /** Transform length L. */
  length: number;
  /** For each weight set: cos sums and sin sums at j = 0 … L−1. */
  cos: Float64Array[];
  sin: Float64Array[];
}

interface Plan {
  length: number;
  size: number;
  fft: FFT;
  chirpRe: Float64Array;
  chirpIm: Float64Array;
  bHat: number[];
}

/** The last plan, reused by the several transforms of one analysis (same L). */
let lastPlan: Plan | null = null;

function planFor(L: number): Plan {
  if (lastPlan && lastPlan.length === L) return lastPlan;
  const size = nextPowerOfTwo(2 * L - 1);
  const fft = new FFT(size);
  // Chirp c_k = e^{iπk²/L}; k² mod 2L keeps the phase argument exact for large k.
  const chirpRe = new Float64Array(L);
  const chirpIm = new Float64Array(L);
  for (let k = 0; k < L; k++) {
    const phase = (Math.PI * ((k * k) % (2 * L))) / L;
    chirpRe[k] = Math.cos(phase);
    chirpIm[k] = Math.sin(phase);
  }
  // Spectrum of b_k = conj(c_k) for k = −(L−1) … L−1, stored circularly.
  const b = new Float64Array(2 * size);
  for (let k = 0; k < L; k++) {
    b[2 * k] = chirpRe[k];
    b[2 * k + 1] = -chirpIm[k];
    if (k > 0) {
      b[2 * (size - k)] = chirpRe[k];
      b[2 * (size - k) + 1] = -chirpIm[k];
    }
  }
  const bHat = fft.createComplexArray() as number[];
  fft.transform(bHat, b as unknown as number[]);
  lastPlan = { length: L, size, fft, chirpRe, chirpIm, bHat };
  return lastPlan;
}

function nextPowerOfTwo(n: number): number {
  let p = 4;
  while (p < n) p *= 2;
  return p;
}

/**
 * Σ_i x_i cos(2π j E_i / L) and Σ_i x_i sin(2π j E_i / L) for j = 0 … L−1 and each weight set x.
 * @param epochs integer epochs (any order; repeats allowed)
 * @param weights one or more weight sets, each of the epochs' length
 * @param length the grid's L (an integer ≥ 1 and ≤ MAX_DFT_LENGTH), which must exceed the epoch span
 * @throws RangeError on non-integer epochs, mismatched lengths or an L out of range
 */
export function epochTrigSums(epochs: Float64Array, weights: readonly Float64Array[], length: number): EpochSums {
  const n = epochs.length;
  if (!Number.isInteger(length) || length < 1 || length > MAX_DFT_LENGTH) {
    throw new RangeError(`length must be an integer from 1 to ${MAX_DFT_LENGTH}, got ${length}`);
  }
  let e0 = Infinity;
  let e1 = -Infinity;
  for (let i = 0; i < n; i++) {
    if (!Number.isInteger(epochs[i])) throw new RangeError(`epochs[${i}] must be an integer, got ${epochs[i]}`);
    e0 = Math.min(e0, epochs[i]);
    e1 = Math.max(e1, epochs[i]);
  }
  for (const w of weights) if (w.length !== n) throw new RangeError(`each weight set must have length ${n}, got ${w.length}`);
  if (n > 0 && e1 - e0 >= length) throw new RangeError(`length must exceed the epoch span ${e1 - e0}, got ${length}`);
  const L = length;
  const plan = planFor(L);
  const { size, fft, chirpRe, chirpIm, bHat } = plan;
  const a = new Float64Array(2 * size);
  const aHat = fft.createComplexArray() as number[];
  const conv = fft.createComplexArray() as number[];
  const cosOut: Float64Array[] = [];
  const sinOut: Float64Array[] = [];
  // Shift back to absolute epochs: × e^{2πi j E₀ / L}, with j·E₀ reduced mod L exactly.
  const e0mod = n > 0 ? ((e0 % L) + L) % L : 0;
  const shiftRe = new Float64Array(L);
  const shiftIm = new Float64Array(L);
  for (let j = 0; j < L; j++) {
    const sh = (2 * Math.PI * ((j * e0mod) % L)) / L;
    shiftRe[j] = Math.cos(sh);
    shiftIm[j] = Math.sin(sh);
  }
  // Two real weight sets per transform: x = x₁ + i x₂ gives X₁ = (X_j + conj X_{L−j})/2 and
  // X₂ = (X_j − conj X_{L−j})/(2i), from the Hermitian symmetry of real data.
  for (let q = 0; q < weights.length; q += 2) {
    const w1 = weights[q];
    const w2 = q + 1 < weights.length ? weights[q + 1] : null;
    a.fill(0);
    for (let i = 0; i < n; i++) {
      const m = epochs[i] - e0;
      a[2 * m] += w1[i];
      if (w2) a[2 * m + 1] += w2[i];
    }
    // e^{2πi jm/L} = c_j c_m conj(c_{j−m}): a_m = x_m c_m, convolved with conj(c), times c_j.
    for (let m = 0; m < L; m++) {
      const xr = a[2 * m];
      const xi = a[2 * m + 1];
      a[2 * m] = xr * chirpRe[m] - xi * chirpIm[m];
      a[2 * m + 1] = xr * chirpIm[m] + xi * chirpRe[m];
    }
    fft.transform(aHat, a as unknown as number[]);
    for (let k = 0; k < size; k++) {
      const re = aHat[2 * k] * bHat[2 * k] - aHat[2 * k + 1] * bHat[2 * k + 1];
      const im = aHat[2 * k] * bHat[2 * k + 1] + aHat[2 * k + 1] * bHat[2 * k];
      aHat[2 * k] = re;
      aHat[2 * k + 1] = im;
    }
    fft.inverseTransform(conv, aHat); // divides by size
    const xr = new Float64Array(L);
    const xi = new Float64Array(L);
    for (let j = 0; j < L; j++) {
      xr[j] = chirpRe[j] * conv[2 * j] - chirpIm[j] * conv[2 * j + 1];
      xi[j] = chirpRe[j] * conv[2 * j + 1] + chirpIm[j] * conv[2 * j];
    }
    const sets = w2 ? 2 : 1;
    for (let t = 0; t < sets; t++) {
      const cs = new Float64Array(L);
      const sn = new Float64Array(L);
      for (let j = 0; j < L; j++) {
        let re: number;
        let im: number;
        if (!w2) {
          re = xr[j];
          im = xi[j];
        } else {
          const r = j === 0 ? 0 : L - j;
          // X_j and conj(X_{L−j}).
          const ar = xr[j];
          const ai = xi[j];
          const br = xr[r];
          const bi = -xi[r];
          if (t === 0) {
            re = 0.5 * (ar + br);
            im = 0.5 * (ai + bi);
          } else {
            re = 0.5 * (ai - bi);
            im = -0.5 * (ar - br);
          }
        }
        cs[j] = re * shiftRe[j] - im * shiftIm[j];
        sn[j] = re * shiftIm[j] + im * shiftRe[j];
      }
      cosOut.push(cs);
      sinOut.push(sn);
    }
  }
  return { length: L, cos: cosOut, sin: sinOut };
}

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
  // Spectrum of b_k = conj(c_k) for k = −(L−1) … L−1, stored circularly (the kernel of e^{+2πi jm/L}).
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

  const a = new Float64Array(2 * size);
  const aHat = fft.createComplexArray() as number[];
  const conv = fft.createComplexArray() as number[];
  const cosOut: Float64Array[] = [];
  const sinOut: Float64Array[] = [];
  for (const w of weights) {
    a.fill(0);
    // e^{2πi jm/L} = c_j c_m conj(c_{j−m}): a_m = x_m c_m, convolved with conj(c), times c_j.
    for (let i = 0; i < n; i++) {
      const m = epochs[i] - e0;
      a[2 * m] += w[i];
    }
    for (let m = 0; m < L; m++) {
      const x = a[2 * m];
      a[2 * m] = x * chirpRe[m];
      a[2 * m + 1] = x * chirpIm[m];
    }
    fft.transform(aHat, a as unknown as number[]);
    for (let k = 0; k < size; k++) {
      const re = aHat[2 * k] * bHat[2 * k] - aHat[2 * k + 1] * bHat[2 * k + 1];
      const im = aHat[2 * k] * bHat[2 * k + 1] + aHat[2 * k + 1] * bHat[2 * k];
      aHat[2 * k] = re;
      aHat[2 * k + 1] = im;
    }
    fft.inverseTransform(conv, aHat); // divides by size
    const cs = new Float64Array(L);
    const sn = new Float64Array(L);
    for (let j = 0; j < L; j++) {
      // X_j = c_j · conv_j, then the shift back to absolute epochs: × e^{2πi j E₀ / L}.
      const xr = chirpRe[j] * conv[2 * j] - chirpIm[j] * conv[2 * j + 1];
      const xi = chirpRe[j] * conv[2 * j + 1] + chirpIm[j] * conv[2 * j];
      const r = (((j * (e0 % L)) % L) + L) % L;
      const sh = (2 * Math.PI * r) / L;
      const cr = Math.cos(sh);
      const ci = Math.sin(sh);
      cs[j] = xr * cr - xi * ci;
      sn[j] = xr * ci + xi * cr;
    }
    cosOut.push(cs);
    sinOut.push(sn);
  }
  return { length: L, cos: cosOut, sin: sinOut };
}

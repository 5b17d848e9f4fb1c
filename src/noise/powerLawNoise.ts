/**
 * Correlated ("red") noise with a power-law spectrum S(f) ∝ f^−β, by the
 * method of Timmer & König 1995 (A&A 300, 707, Sect. 3): at each Fourier
 * frequency f_j = j/(NΔt), j = 1 … N/2, draw the real and imaginary parts of
 * the transform as independent Gaussians of variance S(f_j)/2 (the Nyquist
 * term real, of variance S(f_N/2)), set the mean (j = 0) to zero, complete the
 * spectrum with Hermitian symmetry X_{N−j} = X_j* so the series is real, and
 * inverse-transform. β = 0 is white, β = 1 "flicker", β = 2 a random walk.
 *
 * The inverse transform is periodic in N; the public function generates
 * N ≥ 2n (a power of two, fft.js requires it) and keeps the first n points so
 * that the two ends of the output are not forced to join (Timmer & König 1995
 * generate a longer series and cut it for the same reason).
 *
 * Amplitude convention (precise): `rmsFraction` is the ensemble rms about zero
 * of the mean of m = max(1, round(timescaleS/Δt)) consecutive samples, for the
 * spectrum as generated (lowest frequency 1/(NΔt), highest 1/(2Δt)). The scale
 * comes from the expected variance, not from rescaling each realization, so the
 * realization-to-realization scatter of red noise is kept. For a series
 * x_k = (1/N) Σ_j X_j e^{2πijk/N} and block means of m points,
 *   Var = (1/N²) [ Σ_{j=1}^{N/2−1} 2 S_j F_m(j) + S_{N/2} F_m(N/2) ],
 *   F_m(j) = [sin(π j m/N) / (m sin(π j/N))]²
 * (the power transfer of an m-point boxcar mean, i.e. the Fejér kernel: a
 * standard result, derived here from the geometric sum Σ_k e^{2πijk/N}).
 * With β = 0 this gives σ_point = rmsFraction·√m: the white-noise √t law.
 */
import FFT from 'fft.js';
import type { Rng } from './rng.js';

/** Reusable FFT tables and buffers for one transform length N (a power of two). */
export class PowerLawNoiseWorkspace {
  readonly size: number;
  readonly fft: FFT;
  readonly spectrum: Float64Array;
  readonly series: Float64Array;
  /** Per-frequency standard deviation of Re and Im, cached for (beta, m, rms). */
  readonly amplitude: Float64Array;
  private key = '';

  constructor(size: number) {
    if (!Number.isInteger(size) || size < 4 || (size & (size - 1)) !== 0) {
      throw new RangeError(`size must be a power of two >= 4, got ${size}`);
    }
    this.size = size;
    this.fft = new FFT(size);
    this.spectrum = new Float64Array(2 * size);
    this.series = new Float64Array(2 * size);
    this.amplitude = new Float64Array(size / 2 + 1);
  }

  /** Fill `amplitude` for (beta, m, rms) unless already cached. Returns it. */
  amplitudesFor(beta: number, binPoints: number, rmsFraction: number): Float64Array {
    const key = `${beta}|${binPoints}|${rmsFraction}`;
    if (key === this.key) return this.amplitude;
    const n = this.size;
    const half = n >> 1;
    const amp = this.amplitude;
    // Shape S_j = j^−β (the f_j = j/(NΔt) factor cancels in the normalisation).
    let variance = 0;
    amp[0] = 0;
    for (let j = 1; j <= half; j++) {
      const s = Math.pow(j, -beta);
      const fejer = fejerKernel(j, binPoints, n);
      variance += (j === half ? 1 : 2) * s * fejer;
      amp[j] = s;
    }
    variance /= n * n;
    // Scale so the expected binned variance equals rmsFraction² (see file header).
    const scale2 = variance > 0 ? (rmsFraction * rmsFraction) / variance : 0;
    for (let j = 1; j < half; j++) amp[j] = Math.sqrt(0.5 * amp[j] * scale2); // Re, Im each S/2
    amp[half] = Math.sqrt(amp[half] * scale2); // Nyquist term real, variance S
    this.key = key;
    return amp;
  }
}

/** Fejér kernel F_m(j) = [sin(π j m/N)/(m sin(π j/N))]², the power transfer of an m-point boxcar mean. */
function fejerKernel(j: number, m: number, n: number): number {
  if (m === 1) return 1;
  const den = m * Math.sin((Math.PI * j) / n);
  const num = Math.sin((Math.PI * j * m) / n);
  return (num * num) / (den * den);
}

/** Smallest power of two ≥ max(4, 2n): the transform length used for n output points. */
export function powerLawTransformSize(n: number): number {
  let size = 4;
  while (size < 2 * n) size *= 2;
  return size;
}

/**
 * Kernel: one periodic realization of length ws.size into ws.series
 * (interleaved complex, real parts at even indices), Timmer & König 1995
 * steps 1–3. Draw order: Re then Im for j = 1 … N/2 − 1, then the Nyquist term.
 */
export function powerLawNoisePeriodic(ws: PowerLawNoiseWorkspace, beta: number, binPoints: number, rmsFraction: number, rng: Rng): Float64Array {
  const n = ws.size;
  const half = n >> 1;
  const amp = ws.amplitudesFor(beta, binPoints, rmsFraction);
  const spec = ws.spectrum;
  spec[0] = 0; // zero mean
  spec[1] = 0;
  for (let j = 1; j < half; j++) {
    const re = amp[j] * rng.normal();
    const im = amp[j] * rng.normal();
    spec[2 * j] = re;
    spec[2 * j + 1] = im;
    // Hermitian symmetry X_{N−j} = conj(X_j): real output (Timmer & König 1995, Sect. 3).
    spec[2 * (n - j)] = re;
    spec[2 * (n - j) + 1] = -im;
  }
  spec[2 * half] = amp[half] * rng.normal();
  spec[2 * half + 1] = 0;
  ws.fft.inverseTransform(ws.series, spec); // divides by N
  return ws.series;
}

export interface PowerLawNoiseOptions {
  /** Sample spacing, s (> 0). */
  dtS: number;
  /** Spectral index β in S ∝ f^−β, 0 ≤ β ≤ 4. */
  beta: number;
  /** rms (relative flux) of the noise averaged over `timescaleS` (see file header); ≥ 0. */
  rmsFraction: number;
  /** Averaging timescale at which `rmsFraction` is stated, s (> 0). */
  timescaleS: number;
}

/**
 * Fill `out` (length n ≥ 1) with power-law noise on a uniform grid of spacing
 * `dtS`, generated at length N = powerLawTransformSize(n) and cropped to the
 * first n points. Pass a workspace of that size to reuse FFT tables across
 * calls. For unevenly spaced or gappy time stamps use dampedRandomWalkNoise,
 * or generate one uniform block per contiguous observing window.
 * Throws RangeError naming a bad option.
 */
export function powerLawNoise(out: Float64Array, options: PowerLawNoiseOptions, rng: Rng, workspace?: PowerLawNoiseWorkspace): Float64Array {
  const { dtS, beta, rmsFraction, timescaleS } = options;
  const n = out.length;
  if (n < 1) throw new RangeError(`out must have length >= 1, got ${n}`);
  if (!(dtS > 0) || !Number.isFinite(dtS)) throw new RangeError(`dtS must be a finite number > 0, got ${dtS}`);
  if (!(beta >= 0 && beta <= 4)) throw new RangeError(`beta must be in [0, 4], got ${beta}`);
  if (!(rmsFraction >= 0) || !Number.isFinite(rmsFraction)) {
    throw new RangeError(`rmsFraction must be a finite number >= 0, got ${rmsFraction}`);
  }
  if (!(timescaleS > 0) || !Number.isFinite(timescaleS)) {
    throw new RangeError(`timescaleS must be a finite number > 0, got ${timescaleS}`);
  }
  const size = powerLawTransformSize(n);
  const ws = workspace ?? new PowerLawNoiseWorkspace(size);
  if (ws.size !== size) throw new RangeError(`workspace size must be ${size} for ${n} points, got ${ws.size}`);
  const binPoints = Math.max(1, Math.round(timescaleS / dtS));
  if (binPoints > size) {
    throw new RangeError(`timescaleS/dtS must be at most the transform length ${size}, got ${timescaleS / dtS}`);
  }
  const series = powerLawNoisePeriodic(ws, beta, binPoints, rmsFraction, rng);
  for (let k = 0; k < n; k++) out[k] = series[2 * k];
  return out;
}

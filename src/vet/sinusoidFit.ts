/**
 * Weighted least-squares fits of a transit-timing series with a sinusoid of
 * fixed frequency ν (cycles per epoch) on top of its no-moon baseline:
 *   TTV: t_n = T0 + P·E_n + a·cos 2πνE_n + b·sin 2πνE_n   (base "line", 4 linear parameters)
 *   TDV: D_n = D0 + c·cos 2πνE_n + d·sin 2πνE_n           (base "const", 3 linear parameters)
 * and the search for the ν shared by one or more series that minimises their
 * summed χ² (a moon drives TTV and TDV at the same stroboscopic frequency,
 * Kipping 2009a, MNRAS 392, 181).
 *
 * Method: normal equations of a linear model with weights σ⁻², solved by
 * Cholesky inversion, parameter covariance = (AᵀWA)⁻¹ (Press et al. 2007,
 * Numerical Recipes 3rd ed., §15.4). Epochs are centred on their weighted
 * mean inside the fit, so the line's columns stay well conditioned. Where the
 * sine column vanishes (ν = ½ on integer epochs) it is dropped (b = 0). The
 * ν search: a uniform grid ν_k = k/(oversample·span), up to ½ (the Nyquist
 * frequency of once-per-transit sampling), then golden-section refinement
 * around the best grid point (common practice, no source).
 */
import { invertSymmetricPositive } from '../timing/globalTransitFit.js';

export type SeriesBase = 'line' | 'const';

export interface TimingSeriesData {
  epochs: Float64Array;
  /** Values (TTV residuals or durations), s. */
  values: Float64Array;
  /** 1σ errors, s (> 0). */
  errors: Float64Array;
  base: SeriesBase;
}

export interface SinusoidFit {
  frequencyPerEpoch: number;
  chiSquare: number;
  /** cos and sin coefficients (s) and their 2×2 covariance [caa, cab, cbb]. */
  cosAmplitude: number;
  sinAmplitude: number;
  covariance: [number, number, number];
  /** Model at each epoch, s. */
  model: Float64Array;
  /** Number of fitted linear parameters (3 or 4, one fewer if the sine column was dropped). */
  linearParameters: number;
}

/** Weighted LSQ of `values` on columns (row-major n×p design); returns coefficients, covariance and χ², or null if singular. */
function solveLinear(design: Float64Array, n: number, p: number, values: Float64Array, errors: Float64Array): { coef: Float64Array; cov: Float64Array; chi2: number } | null {
  const ata = new Float64Array(p * p);
  const atb = new Float64Array(p);
  for (let i = 0; i < n; i++) {
    const w = 1 / (errors[i] * errors[i]);
    for (let j = 0; j < p; j++) {
      const aij = design[i * p + j];
      atb[j] += w * aij * values[i];
      for (let k = 0; k <= j; k++) ata[j * p + k] += w * aij * design[i * p + k];
    }
  }
  for (let j = 0; j < p; j++) for (let k = 0; k < j; k++) ata[k * p + j] = ata[j * p + k];
  // Scale to unit diagonal before inverting (Jacobi preconditioning), then undo.
  const d = new Float64Array(p);
  for (let j = 0; j < p; j++) d[j] = ata[j * p + j] > 0 ? 1 / Math.sqrt(ata[j * p + j]) : 0;
  for (let j = 0; j < p; j++) if (d[j] === 0) return null;
  const scaled = new Float64Array(p * p);
  for (let j = 0; j < p; j++) for (let k = 0; k < p; k++) scaled[j * p + k] = ata[j * p + k] * d[j] * d[k];
  // Near-collinear columns (relative pivot below ~1e-10) count as singular.
  const inv = new Float64Array(p * p);
  if (!invertSymmetricPositive(scaled, p, inv)) return null;
  for (let j = 0; j < p; j++) if (!(inv[j * p + j] < 1e10)) return null;
  const cov = new Float64Array(p * p);
  for (let j = 0; j < p; j++) for (let k = 0; k < p; k++) cov[j * p + k] = inv[j * p + k] * d[j] * d[k];
  const coef = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    let s = 0;
    for (let k = 0; k < p; k++) s += cov[j * p + k] * atb[k];
    coef[j] = s;
  }
  let chi2 = 0;
  for (let i = 0; i < n; i++) {
    let m = 0;
    for (let j = 0; j < p; j++) m += design[i * p + j] * coef[j];
    const z = (values[i] - m) / errors[i];
    chi2 += z * z;
  }
  return { coef, cov, chi2 };
}

function weightedMeanEpoch(s: TimingSeriesData): number {
  let sw = 0;
  let swe = 0;
  for (let i = 0; i < s.epochs.length; i++) {
    const w = 1 / (s.errors[i] * s.errors[i]);
    sw += w;
    swe += w * s.epochs[i];
  }
  return swe / sw;
}

/**
 * Fit base + sinusoid at frequency ν (cycles per epoch). ν = 0 fits the base alone.
 * @throws RangeError when even the base model is singular (fewer points than parameters).
 */
export function fitSinusoidAt(s: TimingSeriesData, nu: number): SinusoidFit {
  const n = s.epochs.length;
  const nb = s.base === 'line' ? 2 : 1;
  const eBar = weightedMeanEpoch(s);
  const tryFit = (withCos: boolean, withSin: boolean) => {
    const p = nb + (withCos ? 1 : 0) + (withSin ? 1 : 0);
    if (n < p) return null;
    const design = new Float64Array(n * p);
    for (let i = 0; i < n; i++) {
      const x = 2 * Math.PI * nu * s.epochs[i];
      let j = 0;
      design[i * p + j++] = 1;
      if (nb === 2) design[i * p + j++] = s.epochs[i] - eBar;
      if (withCos) design[i * p + j++] = Math.cos(x);
      if (withSin) design[i * p + j++] = Math.sin(x);
    }
    const r = solveLinear(design, n, p, s.values, s.errors);
    if (!r) return null;
    const model = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      let m = 0;
      for (let j = 0; j < p; j++) m += design[i * p + j] * r.coef[j];
      model[i] = m;
    }
    return { r, p, model };
  };
  let res = nu > 0 ? tryFit(true, true) : null;
  let hasSin = true;
  let hasCos = true;
  if (!res && nu > 0) {
    res = tryFit(true, false);
    hasSin = false;
  }
  if (!res) {
    res = tryFit(false, false);
    hasSin = hasCos = false;
  }
  if (!res) throw new RangeError(`fitSinusoidAt: the ${s.base} baseline cannot be fitted to ${n} point(s)`);
  const { r, p, model } = res;
  const ia = hasCos ? nb : -1;
  const ib = hasSin ? nb + 1 : -1;
  return {
    frequencyPerEpoch: nu,
    chiSquare: r.chi2,
    cosAmplitude: ia >= 0 ? r.coef[ia] : 0,
    sinAmplitude: ib >= 0 ? r.coef[ib] : 0,
    covariance: [ia >= 0 ? r.cov[ia * p + ia] : 0, ia >= 0 && ib >= 0 ? r.cov[ia * p + ib] : 0, ib >= 0 ? r.cov[ib * p + ib] : 0],
    model,
    linearParameters: p,
  };
}

/** Summed χ² of the series at a common ν. */
function totalChiSquare(series: readonly TimingSeriesData[], nu: number): number {
  let chi2 = 0;
  for (const s of series) chi2 += fitSinusoidAt(s, nu).chiSquare;
  return chi2;
}

const GOLDEN = (Math.sqrt(5) - 1) / 2;

/**
 * The frequency ν ∈ (0, ½] (cycles per epoch) minimising the summed χ² of the series, each
 * with its own base and sinusoid coefficients. Grid step 1/(oversample·span), then golden section.
 */
export function bestCommonFrequency(series: readonly TimingSeriesData[], oversample = 10): number {
  if (series.length === 0) throw new RangeError('series must hold at least one timing series');
  let eMin = Infinity;
  let eMax = -Infinity;
  for (const s of series) for (const e of s.epochs) {
    eMin = Math.min(eMin, e);
    eMax = Math.max(eMax, e);
  }
  const span = eMax - eMin;
  if (!(span > 0)) throw new RangeError('epochs must not all be equal');
  const count = Math.max(2, Math.ceil(0.5 * oversample * span));
  const step = 0.5 / count;
  let best = step;
  let bestChi = Infinity;
  for (let k = 1; k <= count; k++) {
    const nu = k * step;
    const c = totalChiSquare(series, nu);
    if (c < bestChi) {
      bestChi = c;
      best = nu;
    }
  }
  let lo = Math.max(best - step, 0.05 * step);
  let hi = Math.min(best + step, 0.5);
  let x1 = hi - GOLDEN * (hi - lo);
  let x2 = lo + GOLDEN * (hi - lo);
  let f1 = totalChiSquare(series, x1);
  let f2 = totalChiSquare(series, x2);
  for (let it = 0; it < 60 && hi - lo > 1e-10; it++) {
    if (f1 <= f2) {
      hi = x2;
      x2 = x1;
      f2 = f1;
      x1 = hi - GOLDEN * (hi - lo);
      f1 = totalChiSquare(series, x1);
    } else {
      lo = x1;
      x1 = x2;
      f1 = f2;
      x2 = lo + GOLDEN * (hi - lo);
      f2 = totalChiSquare(series, x2);
    }
  }
  const refined = f1 <= f2 ? x1 : x2;
  return Math.min(f1, f2) < bestChi ? refined : best;
}

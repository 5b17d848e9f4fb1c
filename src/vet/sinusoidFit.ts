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
import { invertSymmetricPositive } from '../numeric/linearAlgebra.js';
import { MAX_DFT_LENGTH, epochTrigSums } from './epochSums.js';
import { goldenSectionMaximum, type ScalarObjective } from '../numeric/goldenSection.js';

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

/** Scratch arrays of `solveNormal` for models of up to 4 parameters (reused across grid frequencies). */
interface NormalWorkspace {
  d: Float64Array;
  scaled: Float64Array;
  inv: Float64Array;
  cov: Float64Array;
  coef: Float64Array;
  work: Float64Array;
}

function newWorkspace(p: number): NormalWorkspace {
  const q = Math.max(p, 4);
  return { d: new Float64Array(q), scaled: new Float64Array(q * q), inv: new Float64Array(q * q), cov: new Float64Array(q * q), coef: new Float64Array(q), work: new Float64Array(q * q + q) };
}

/**
 * Solve the normal equations (AᵀWA) x = AᵀWy of a small linear model (p ≤ 4), given as the
 * lower triangle of AᵀWA filled in full and AᵀWy; coefficients and covariance (AᵀWA)⁻¹, or
 * null if singular (Press et al. 2007, Numerical Recipes 3rd ed., §15.4).
 */
function solveNormal(ata: Float64Array, atb: Float64Array, p: number, ws: NormalWorkspace = newWorkspace(p)): { coef: Float64Array; cov: Float64Array } | null {
  // Scale to unit diagonal before inverting (Jacobi preconditioning), then undo.
  const d = ws.d.subarray(0, p);
  for (let j = 0; j < p; j++) d[j] = ata[j * p + j] > 0 ? 1 / Math.sqrt(ata[j * p + j]) : 0;
  for (let j = 0; j < p; j++) if (d[j] === 0) return null;
  const scaled = ws.scaled.subarray(0, p * p);
  for (let j = 0; j < p; j++) for (let k = 0; k < p; k++) scaled[j * p + k] = ata[j * p + k] * d[j] * d[k];
  // Near-collinear columns (relative pivot below ~1e-10) count as singular.
  const inv = ws.inv.subarray(0, p * p);
  if (!invertSymmetricPositive(scaled, p, inv, ws.work)) return null;
  for (let j = 0; j < p; j++) if (!(inv[j * p + j] < 1e10)) return null;
  const cov = ws.cov.subarray(0, p * p);
  for (let j = 0; j < p; j++) for (let k = 0; k < p; k++) cov[j * p + k] = inv[j * p + k] * d[j] * d[k];
  const coef = ws.coef.subarray(0, p);
  for (let j = 0; j < p; j++) {
    let s = 0;
    for (let k = 0; k < p; k++) s += cov[j * p + k] * atb[k];
    coef[j] = s;
  }
  return { coef, cov };
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
  const sol = solveNormal(ata, atb, p);
  if (!sol) return null;
  const { coef, cov } = sol;
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

/**
 * χ² of base + sinusoid at every grid frequency ν_k = k/L (k = 1 … count), added into `out[k]`,
 * from the normal equations: the trigonometric sums over the epochs come from one FFT per
 * weight set (epochSums.ts), cos² and sin² by the double angle, and χ² = yᵀWy − xᵀAᵀWy at the
 * least-squares solution x (Press et al. 2007, §15.4). The same fallbacks as `fitSinusoidAt`
 * (sine column dropped, then the base alone). Returns yᵀWy, the scale of the roundoff.
 */
function addGridChiSquare(s: TimingSeriesData, L: number, count: number, out: Float64Array): number {
  const n = s.epochs.length;
  const line = s.base === 'line';
  const nb = line ? 2 : 1;
  const eBar = weightedMeanEpoch(s);
  const w = new Float64Array(n);
  const wd = new Float64Array(n);
  const wy = new Float64Array(n);
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let y0 = 0;
  let y1 = 0;
  let yy = 0;
  for (let i = 0; i < n; i++) {
    const wi = 1 / (s.errors[i] * s.errors[i]);
    const d = s.epochs[i] - eBar;
    const y = s.values[i];
    w[i] = wi;
    wd[i] = wi * d;
    wy[i] = wi * y;
    s0 += wi;
    s1 += wi * d;
    s2 += wi * d * d;
    y0 += wi * y;
    y1 += wi * d * y;
    yy += wi * y * y;
  }
  const sums = epochTrigSums(s.epochs, line ? [w, wy, wd] : [w, wy], L);
  const [cw, cy, cd] = sums.cos;
  const [sw, sy, sd] = sums.sin;
  // χ² of the model with the first p columns of [1, E − Ē, cos, sin] (or [1, cos, sin]).
  const ata = new Float64Array(16);
  const atb = new Float64Array(4);
  const ws = newWorkspace(4);
  const chiOf = (p: number): number => {
    if (n < p) return NaN;
    const a = ata.subarray(0, p * p);
    const sol = solveNormal(a, atb.subarray(0, p), p, ws);
    if (!sol) return NaN;
    let fit = 0;
    for (let j = 0; j < p; j++) fit += sol.coef[j] * atb[j];
    return Math.max(0, yy - fit);
  };
  const fill = (p: number, c: number, sn: number, cdk: number, sdk: number, cc: number, ss: number, cs: number, yc: number, ys: number) => {
    // Column values at row i: 1, d_i (line), cos, sin; ata[j][k] = Σ w col_j col_k.
    const cols = p - nb; // 0, 1 or 2 trig columns
    const idx = (j: number, k: number) => j * p + k;
    ata[idx(0, 0)] = s0;
    atb[0] = y0;
    if (line) {
      ata[idx(0, 1)] = ata[idx(1, 0)] = s1;
      ata[idx(1, 1)] = s2;
      atb[1] = y1;
    }
    if (cols >= 1) {
      const jc = nb;
      ata[idx(0, jc)] = ata[idx(jc, 0)] = c;
      if (line) ata[idx(1, jc)] = ata[idx(jc, 1)] = cdk;
      ata[idx(jc, jc)] = cc;
      atb[jc] = yc;
    }
    if (cols >= 2) {
      const jc = nb;
      const js = nb + 1;
      ata[idx(0, js)] = ata[idx(js, 0)] = sn;
      if (line) ata[idx(1, js)] = ata[idx(js, 1)] = sdk;
      ata[idx(jc, js)] = ata[idx(js, jc)] = cs;
      ata[idx(js, js)] = ss;
      atb[js] = ys;
    }
  };
  fill(nb, 0, 0, 0, 0, 0, 0, 0, 0, 0);
  const baseChi = chiOf(nb);
  for (let k = 1; k <= count; k++) {
    const k2 = (2 * k) % L;
    const c = cw[k];
    const sn = sw[k];
    const cc = 0.5 * (s0 + cw[k2]);
    const ss = 0.5 * (s0 - cw[k2]);
    const cs = 0.5 * sw[k2];
    const cdk = line ? cd[k] : 0;
    const sdk = line ? sd[k] : 0;
    fill(nb + 2, c, sn, cdk, sdk, cc, ss, cs, cy[k], sy[k]);
    let chi = chiOf(nb + 2);
    if (Number.isNaN(chi)) {
      fill(nb + 1, c, sn, cdk, sdk, cc, ss, cs, cy[k], sy[k]);
      chi = chiOf(nb + 1);
    }
    if (Number.isNaN(chi)) chi = baseChi;
    out[k] += chi;
  }
  return yy;
}

/** The original O(N·count) grid scan (epochs not all integers): one weighted fit per frequency. */
function directGridChiSquare(series: readonly TimingSeriesData[], step: number, count: number, out: Float64Array): void {
  for (let k = 1; k <= count; k++) out[k] = totalChiSquare(series, k * step);
}

/** Grid points re-fitted exactly around the FFT minimum (ties within roundoff of yᵀWy). */
const EXACT_CANDIDATES = 32;

/**
 * The frequency ν ∈ (0, ½] (cycles per epoch) minimising the summed χ² of the series, each
 * with its own base and sinusoid coefficients. Grid step 1/(oversample·span), then golden section.
 * The grid is scanned with FFT sums (O(L log L + N) for L = 2·count grid points, not O(N·L));
 * the grid points within roundoff of the minimum are re-fitted exactly, so the chosen point
 * is the one a point-by-point scan picks.
 */
export function bestCommonFrequency(series: readonly TimingSeriesData[], oversample = 10): number {
  if (series.length === 0) throw new RangeError('series must hold at least one timing series');
  let eMin = Infinity;
  let eMax = -Infinity;
  let integer = true;
  for (const s of series) for (const e of s.epochs) {
    eMin = Math.min(eMin, e);
    eMax = Math.max(eMax, e);
    if (!Number.isInteger(e)) integer = false;
  }
  const span = eMax - eMin;
  if (!(span > 0)) throw new RangeError('epochs must not all be equal');
  const count = Math.max(2, Math.ceil(0.5 * oversample * span));
  const step = 0.5 / count;
  const grid = new Float64Array(count + 1);
  let best = step;
  let bestChi = Infinity;
  if (integer && 2 * count <= MAX_DFT_LENGTH) {
    let yy = 0;
    for (const s of series) yy += addGridChiSquare(s, 2 * count, count, grid);
    let minFast = Infinity;
    for (let k = 1; k <= count; k++) if (grid[k] < minFast) minFast = grid[k];
    const tol = 1e-9 * yy + 1e-12 * minFast;
    const near: number[] = [];
    for (let k = 1; k <= count; k++) if (grid[k] <= minFast + tol) near.push(k);
    near.sort((a, b) => grid[a] - grid[b] || a - b);
    const cand = near.slice(0, EXACT_CANDIDATES).sort((a, b) => a - b);
    for (const k of cand) {
      const c = totalChiSquare(series, k * step);
      if (c < bestChi) {
        bestChi = c;
        best = k * step;
      }
    }
  } else {
    directGridChiSquare(series, step, count, grid);
    for (let k = 1; k <= count; k++) {
      if (grid[k] < bestChi) {
        bestChi = grid[k];
        best = k * step;
      }
    }
  }
  const lo = Math.max(best - step, 0.05 * step);
  const hi = Math.min(best + step, 0.5);
  const refined = goldenSectionMaximum(new NegatedChiSquare(series), lo, hi, 1e-10);
  return -refined.value < bestChi ? refined.x : best;
}

/** −χ²(ν) of the series, for the golden-section search (a maximiser). */
class NegatedChiSquare implements ScalarObjective {
  constructor(private readonly series: readonly TimingSeriesData[]) {}
  valueAt(nu: number): number {
    return -totalChiSquare(this.series, nu);
  }
}

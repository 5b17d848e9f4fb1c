/**
 * Periodogram of a TTV (or TDV) series against epoch: the generalised,
 * floating-mean, error-weighted Lomb–Scargle periodogram, its false-alarm
 * probability, and the family of moon periods an observed TTV frequency can
 * be an alias of.
 *
 * Method
 * - Periodogram: Lomb 1976 (Ap&SS 39, 447) and Scargle 1982 (ApJ 263, 835)
 *   in the generalised form of Zechmeister & Kürster 2009 (A&A 496, 577),
 *   which fits y = c + a·cos 2πνE + b·sin 2πνE by weighted least squares
 *   (normalised weights w_i = σ_i⁻²/Σσ⁻²) and reports
 *   Z(ν) = 1 − χ²_model/χ²_const, computed from the weighted centred sums
 *   YY, YC, YS, CC, SS, CS of their §2 as
 *   Z = (SS·YC² + CC·YS² − 2·CS·YC·YS)/(YY·D), D = CC·SS − CS² (ZK09 eq. 20;
 *   other ZK09 equation numbers are not quoted here because not re-checked).
 *   Where D vanishes (ν = ½ on integer epochs, where sin πE ≡ 0) the cosine
 *   and sine columns are collinear and the one-column fit is used instead.
 * - Frequencies in cycles per epoch on a uniform grid ν_k = k·Δν, k = 1…K,
 *   with K·Δν = ½ exactly: transits sample the moon's orbit once per planet
 *   period, so ν = ½ is the Nyquist frequency for integer epochs
 *   (Kipping 2009a, MNRAS 392, 181). Δν = 1/(oversample·span of epochs); the
 *   grid peak is then refined by golden-section search within ±Δν.
 * - False-alarm probability of the highest peak: Baluev 2008 (MNRAS 385,
 *   1279), for the "standard" normalisation Z with unknown noise scale, a
 *   null model with d_H = 1 parameter (the mean) and the alternative with
 *   d_K = 3, N_H = N − 1, N_K = N − 3:
 *     single-frequency FAP  Φ(Z) = (1 − Z)^{N_K/2}
 *     τ(Z) = γ_H · W · (1 − Z)^{(N_K − 1)/2} · sqrt(N_H·Z/2),
 *     γ_H = sqrt(2/N_H)·Γ(N_H/2)/Γ((N_H − 1)/2),
 *     W = ν_max·T_eff, T_eff = sqrt(4π·Var_w(E)) (error-weighted variance),
 *     FAP ≈ 1 − (1 − Φ)·e^{−τ}, and the Davies bound Φ + τ (upper bound).
 *   Written from our reading of Baluev 2008 (equation numbers not re-checked);
 *   the values agree with an independent implementation (test fixtures).
 *   Caveat: TTVs are residuals of a fitted linear ephemeris, which removes
 *   two more degrees of freedom than d_H = 1 assumes; the analytic FAP is
 *   then slightly optimistic at low frequency. The detection threshold is
 *   calibrated on null simulations anyway (falseAlarmCalibration.ts).
 * - Alias family: a moon of period P_S sampled once per P_B shows TTVs at
 *   ν = |P_B/P_S − round(P_B/P_S)| cycles per epoch, so an observed ν comes
 *   from any P_S = P_B/(k ± ν), k = 1, 2, … (Kipping 2009a; Kipping 2021,
 *   MNRAS 500, 1851). Only members with period ratio P_B/P_S in
 *   [minRatio, maxRatio] (Hill stability below, Roche limit above) are kept.
 */
import { lnGamma } from '../numeric/gammaFunctions.js';
import { goldenSectionMaximum, type ScalarObjective } from '../numeric/goldenSection.js';

/** Result of a periodogram search. */
export interface Periodogram {
  /** Grid frequencies, cycles per epoch, ascending, last = 0.5. */
  frequency: Float64Array;
  /** Normalised power Z ∈ [0, 1] at each grid frequency. */
  power: Float64Array;
  /** Refined frequency of the highest peak (cycles per epoch) and its power. */
  peakFrequency: number;
  peakPower: number;
  /** Best-fit sinusoid at the peak: y ≈ offset + cosAmplitude·cos 2πνE + sinAmplitude·sin 2πνE. */
  offset: number;
  cosAmplitude: number;
  sinAmplitude: number;
  /** Semi-amplitude sqrt(a² + b²), same unit as the values. */
  amplitude: number;
  /** Baluev 2008 FAP of the peak, its single-frequency term, τ, the Davies bound and W. */
  falseAlarmProbability: number;
  singleFrequencyFap: number;
  tau: number;
  daviesBound: number;
  effectiveWidth: number;
}

export interface PeriodogramOptions {
  /** Frequency grid oversampling relative to 1/span (default 10). */
  oversample?: number;
  /** Caller-owned buffer for the power (length ≥ grid size); a new array otherwise. */
  powerOut?: Float64Array;
}

/** Weighted centred sums for one data set, computed once (weights normalised to Σw = 1). */
interface WeightedData {
  n: number;
  t: Float64Array;
  w: Float64Array;
  /** y minus its weighted mean. */
  yc: Float64Array;
  yMean: number;
  /** Σ w (y − ȳ)² (ZK09 §2, YY). */
  yy: number;
}

function prepare(epochs: Float64Array, values: Float64Array, errors: Float64Array): WeightedData {
  const n = epochs.length;
  if (n < 4) throw new RangeError(`epochs must hold at least 4 points for a periodogram (N − 3 ≥ 1), got ${n}`);
  if (values.length !== n) throw new RangeError(`values must have length ${n}, got ${values.length}`);
  if (errors.length !== n) throw new RangeError(`errors must have length ${n}, got ${errors.length}`);
  const w = new Float64Array(n);
  let sw = 0;
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(epochs[i])) throw new RangeError(`epochs[${i}] must be finite, got ${epochs[i]}`);
    if (!Number.isFinite(values[i])) throw new RangeError(`values[${i}] must be finite, got ${values[i]}`);
    const s = errors[i];
    if (!(s > 0) || !Number.isFinite(s)) throw new RangeError(`errors[${i}] must be finite and > 0, got ${s}`);
    w[i] = 1 / (s * s);
    sw += w[i];
  }
  let yMean = 0;
  for (let i = 0; i < n; i++) {
    w[i] /= sw; // ZK09 §2: normalised weights
    yMean += w[i] * values[i];
  }
  const yc = new Float64Array(n);
  let yy = 0;
  for (let i = 0; i < n; i++) {
    yc[i] = values[i] - yMean;
    yy += w[i] * yc[i] * yc[i];
  }
  return { n, t: epochs, w, yc, yMean, yy };
}

interface SineFit {
  power: number;
  a: number;
  b: number;
  c: number;
}

/** ZK09 power and fitted coefficients at one frequency (cycles per epoch). No allocation. */
function fitAt(d: WeightedData, nu: number, wantCoefficients: boolean, out: SineFit): void {
  const { n, t, w, yc, yy } = d;
  const omega = 2 * Math.PI * nu;
  let C = 0;
  let S = 0;
  let YC = 0;
  let YS = 0;
  let CC = 0;
  let SS = 0;
  let CS = 0;
  for (let i = 0; i < n; i++) {
    const x = omega * t[i];
    const c = Math.cos(x);
    const s = Math.sin(x);
    const wi = w[i];
    C += wi * c;
    S += wi * s;
    YC += wi * yc[i] * c;
    YS += wi * yc[i] * s;
    CC += wi * c * c;
    SS += wi * s * s;
    CS += wi * c * s;
  }
  // Centred sums (ZK09 §2): YC, YS already use centred y; CC, SS, CS subtract the products of means.
  CC -= C * C;
  SS -= S * S;
  CS -= C * S;
  const D = CC * SS - CS * CS;
  out.a = 0;
  out.b = 0;
  if (!(yy > 0)) {
    out.power = 0;
    out.c = d.yMean;
    return;
  }
  // A column whose centred norm is at roundoff level relative to the other (sin πE at ν = ½ on
  // integer epochs evaluates to ~1e-16·E, not 0) is treated as absent, like a zero column.
  const scale = CC * SS;
  const bothPresent = SS > 1e-14 * CC && CC > 1e-14 * SS;
  if (bothPresent && D > 1e-10 * scale && scale > 0) {
    // ZK09 eq. 20, and the 2×2 centred normal equations solved by Cramer's rule for a, b.
    out.power = (SS * YC * YC + CC * YS * YS - 2 * CS * YC * YS) / (yy * D);
    if (wantCoefficients) {
      out.a = (YC * SS - YS * CS) / D;
      out.b = (YS * CC - YC * CS) / D;
    }
  } else if (CC >= SS && CC > 0) {
    // Collinear columns (e.g. ν = ½ on integer epochs): one-column fit in the cosine.
    out.power = (YC * YC) / (CC * yy);
    if (wantCoefficients) out.a = YC / CC;
  } else if (SS > 0) {
    out.power = (YS * YS) / (SS * yy);
    if (wantCoefficients) out.b = YS / SS;
  } else {
    out.power = 0; // ν = 0 or a frequency at which the data see a constant
  }
  out.power = Math.min(1, Math.max(0, out.power));
  // Offset: with centred columns the weighted model mean equals ȳ, so c = ȳ − a·C − b·S.
  out.c = d.yMean - out.a * C - out.b * S;
}

/**
 * Generalised Lomb–Scargle power Z(ν) = 1 − χ²_model/χ²_const at given frequencies
 * (cycles per epoch), written into `out`. Kernel-style: throws only on bad data (RangeError).
 */
export function lombScarglePower(
  epochs: Float64Array,
  values: Float64Array,
  errors: Float64Array,
  frequencies: Float64Array,
  out: Float64Array = new Float64Array(frequencies.length),
): Float64Array {
  if (out.length < frequencies.length) {
    throw new RangeError(`out must have length ≥ ${frequencies.length}, got ${out.length}`);
  }
  const d = prepare(epochs, values, errors);
  const fit: SineFit = { power: 0, a: 0, b: 0, c: 0 };
  for (let k = 0; k < frequencies.length; k++) {
    const nu = frequencies[k];
    if (!Number.isFinite(nu)) {
      out[k] = NaN;
      continue;
    }
    fitAt(d, nu, false, fit);
    out[k] = fit.power;
  }
  return out;
}

/** γ(N) = sqrt(2/N)·Γ(N/2)/Γ((N − 1)/2) of Baluev 2008 (≈ 1 − 0.75/N). */
/** The periodogram power at ν, for the golden-section refinement (a class, not a closure: this runs per realization). */
class PowerAt implements ScalarObjective {
  constructor(
    private readonly d: WeightedData,
    private readonly fit: SineFit,
  ) {}
  valueAt(nu: number): number {
    fitAt(this.d, nu, false, this.fit);
    return this.fit.power;
  }
}

function baluevGamma(nh: number): number {
  return Math.sqrt(2 / nh) * Math.exp(lnGamma(nh / 2) - lnGamma((nh - 1) / 2));
}

/** Baluev 2008 FAP pieces for power Z, N points, maximum frequency and epochs' weighted variance. */
export interface BaluevFap {
  falseAlarmProbability: number;
  singleFrequencyFap: number;
  tau: number;
  daviesBound: number;
  effectiveWidth: number;
}

/**
 * Baluev 2008 (MNRAS 385, 1279) false-alarm probability of a peak of normalised power Z in a
 * floating-mean periodogram of N points searched up to `maxFrequency` (cycles per epoch), with
 * `weightedTimeVariance` the error-weighted variance of the epochs. NaN for Z outside [0, 1],
 * N < 4, or non-positive maxFrequency / variance (kernel convention).
 */
export function baluevFalseAlarm(
  power: number,
  n: number,
  maxFrequency: number,
  weightedTimeVariance: number,
): BaluevFap {
  const nanResult = { falseAlarmProbability: NaN, singleFrequencyFap: NaN, tau: NaN, daviesBound: NaN, effectiveWidth: NaN };
  if (!(power >= 0 && power <= 1) || !(n >= 4) || !(maxFrequency > 0) || !(weightedTimeVariance > 0)) return nanResult;
  const nh = n - 1; // d_H = 1
  const nk = n - 3; // d_K = 3
  const single = Math.pow(1 - power, nk / 2);
  const effectiveWidth = maxFrequency * Math.sqrt(4 * Math.PI * weightedTimeVariance);
  const tau = baluevGamma(nh) * effectiveWidth * Math.pow(1 - power, (nk - 1) / 2) * Math.sqrt((nh * power) / 2);
  // 1 − (1 − Φ)e^{−τ} written to keep precision when both terms are small.
  const fap = -Math.expm1(Math.log1p(-single) - tau);
  return {
    falseAlarmProbability: Math.min(1, fap),
    singleFrequencyFap: single,
    tau,
    daviesBound: single + tau,
    effectiveWidth,
  };
}

/** Error-weighted variance of the epochs (weights σ⁻²). */
function weightedVariance(epochs: Float64Array, w: Float64Array): number {
  let m = 0;
  for (let i = 0; i < epochs.length; i++) m += w[i] * (epochs[i] - epochs[0]);
  let v = 0;
  for (let i = 0; i < epochs.length; i++) {
    const d = epochs[i] - epochs[0] - m;
    v += w[i] * d * d;
  }
  return v;
}


/**
 * The frequency grid of the periodogram, cycles per epoch: `count` points up to the Nyquist
 * frequency 0.5 of unit-spaced epochs, spaced `step` = 0.5/count with `oversample` points per
 * 1/span (common practice: oversampling the natural resolution, as discussed by VanderPlas 2018, ApJS 236, 16).
 * Shared with the vetting's FFT periodogram, which must use exactly this grid.
 * @throws RangeError when every epoch is the same.
 */
export function periodogramGrid(epochs: Float64Array, oversample: number): { maxFrequency: number; count: number; step: number } {
  let eMin = Infinity;
  let eMax = -Infinity;
  for (let i = 0; i < epochs.length; i++) {
    eMin = Math.min(eMin, epochs[i]);
    eMax = Math.max(eMax, epochs[i]);
  }
  const span = eMax - eMin;
  if (!(span > 0)) throw new RangeError('epochs must not all be equal');
  const maxFrequency = 0.5;
  const count = Math.max(1, Math.ceil(maxFrequency * oversample * span));
  return { maxFrequency, count, step: maxFrequency / count };
}

/**
 * Generalised Lomb–Scargle periodogram of `values` (TTVs, any unit) against `epochs` on
 * ν ∈ (0, ½] cycles per epoch, with the refined peak, its sinusoid and its Baluev 2008 FAP.
 * @throws RangeError for N < 4 (Baluev's N_K − 1 ≥ 0), mismatched lengths, non-finite values,
 *   errors not > 0, all epochs equal, or oversample < 1.
 */
export function lombScargle(
  epochs: Float64Array,
  values: Float64Array,
  errors: Float64Array,
  options: PeriodogramOptions = {},
): Periodogram {
  const oversample = options.oversample ?? 10;
  if (!(oversample >= 1) || !Number.isFinite(oversample)) {
    throw new RangeError(`oversample must be a finite number ≥ 1, got ${oversample}`);
  }
  const d = prepare(epochs, values, errors);
  const { maxFrequency, count, step } = periodogramGrid(epochs, oversample);
  const frequency = new Float64Array(count);
  const power = options.powerOut ?? new Float64Array(count);
  if (power.length < count) throw new RangeError(`powerOut must have length ≥ ${count}, got ${power.length}`);
  const fit: SineFit = { power: 0, a: 0, b: 0, c: 0 };
  let best = 0;
  for (let k = 0; k < count; k++) {
    const nu = k === count - 1 ? maxFrequency : (k + 1) * step;
    frequency[k] = nu;
    fitAt(d, nu, false, fit);
    power[k] = fit.power;
    if (fit.power > power[best]) best = k;
  }
  // Golden-section refinement of the peak within ±step, clipped to (0, ½].
  const lo = Math.max(frequency[best] - step, 1e-3 * step);
  const hi = Math.min(frequency[best] + step, maxFrequency);
  let peakFrequency = goldenSectionMaximum(new PowerAt(d, fit), lo, hi, 1e-12 * maxFrequency).x;
  fitAt(d, peakFrequency, true, fit);
  // Keep the grid point when the refinement does not beat it (e.g. the peak sits on the ν = ½ edge).
  if (fit.power <= power[best]) {
    peakFrequency = frequency[best];
    fitAt(d, peakFrequency, true, fit);
  }
  const fap = baluevFalseAlarm(fit.power, epochs.length, maxFrequency, weightedVariance(epochs, d.w));
  return {
    frequency,
    power,
    peakFrequency,
    peakPower: fit.power,
    offset: fit.c,
    cosAmplitude: fit.a,
    sinAmplitude: fit.b,
    amplitude: Math.hypot(fit.a, fit.b),
    ...fap,
  };
}

/** One member of an alias family: P_S = P_B/ratio with ratio = k ± ν. */
export interface AliasCandidate {
  /** Period ratio P_B/P_S. */
  ratio: number;
  /** Moon period, in the unit of the planet period given. */
  moonPeriod: number;
  k: number;
  /** +1 for k + ν, −1 for k − ν. */
  sign: 1 | -1;
}

/** Largest family the alias function will list (guards against an accidental huge maxRatio). */
const MAX_ALIASES = 100_000;

/**
 * Moon periods P_S = P_B/(k ± ν), k = 1, 2, …, that produce TTVs at frequency ν (cycles per
 * epoch, 0 ≤ ν ≤ ½), keeping ratios P_B/P_S in [minRatio, maxRatio], sorted by ratio; duplicates
 * (ν = 0 or ½, where k + ν = (k + 1) − ν) are listed once (Kipping 2009a; Kipping 2021).
 * @throws RangeError for ν outside [0, ½], planetPeriod ≤ 0, minRatio ≤ 0, maxRatio < minRatio,
 *   or more than 100 000 members.
 */
export function aliasFamily(nu: number, planetPeriod: number, minRatio: number, maxRatio: number): AliasCandidate[] {
  if (!(nu >= 0 && nu <= 0.5)) throw new RangeError(`nu must be in [0, 0.5] cycles per epoch, got ${nu}`);
  if (!(planetPeriod > 0) || !Number.isFinite(planetPeriod)) {
    throw new RangeError(`planetPeriod must be finite and > 0, got ${planetPeriod}`);
  }
  if (!(minRatio > 0) || !Number.isFinite(minRatio)) throw new RangeError(`minRatio must be finite and > 0, got ${minRatio}`);
  if (!(maxRatio >= minRatio) || !Number.isFinite(maxRatio)) {
    throw new RangeError(`maxRatio must be finite and ≥ minRatio (${minRatio}), got ${maxRatio}`);
  }
  if (2 * (maxRatio - minRatio + 2) > MAX_ALIASES) {
    throw new RangeError(`maxRatio − minRatio spans more than ${MAX_ALIASES / 2} harmonics, got ${maxRatio - minRatio}`);
  }
  const out: AliasCandidate[] = [];
  const kStart = Math.max(1, Math.floor(minRatio - nu));
  const kEnd = Math.ceil(maxRatio + nu);
  for (let k = kStart; k <= kEnd; k++) {
    for (const sign of [-1, 1] as const) {
      if (sign === 1 && (nu === 0 || nu === 0.5)) continue; // k + ν duplicates (k+1) − ν
      const ratio = k + sign * nu;
      if (ratio < minRatio || ratio > maxRatio || !(ratio > 0)) continue;
      out.push({ ratio, moonPeriod: planetPeriod / ratio, k, sign });
    }
  }
  out.sort((x, y) => x.ratio - y.ratio);
  return out;
}

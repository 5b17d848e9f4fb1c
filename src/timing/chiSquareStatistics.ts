/**
 * Chi-square excess statistics of a transit-timing series: does the scatter
 * of the fitted mid-times and durations exceed what their error bars allow?
 *
 * Method
 * - TTV excess: χ² of the mid-times t_n (epochs E_n, errors σ_n) about the
 *   weighted least-squares linear ephemeris t = T0 + P·E, weights w = 1/σ²;
 *   under white Gaussian errors and no moon, χ² ~ χ²(N − 2) (the standard
 *   straight-line fit, e.g. Press et al. 2007, Numerical Recipes 3rd ed.,
 *   §15.2, eqs. 15.2.4–15.2.6; its χ² has N − 2 degrees of freedom).
 *   Sums are taken about the weighted means of E and t (with t shifted by its
 *   first value), so BJD-sized times in seconds keep their precision.
 * - TDV excess: χ² of the durations about their weighted mean (the
 *   weighted constant), N − 1 degrees of freedom (same reference, the
 *   one-parameter case).
 * - Joint: χ²_TTV + χ²_TDV with (N − 2) + (N − 1) = 2N − 3 degrees of
 *   freedom. This **treats the TTV and TDV errors as independent**: for a
 *   trapezoid transit, mid-time and duration are uncorrelated (Carter et al.
 *   2008, ApJ 689, 499, the diagonal mid-time block of their covariance), but
 *   limb darkening or red noise can correlate them, which makes the joint
 *   p-value only approximate; calibrate on null simulations where it matters.
 * - p-value = S(χ²; dof), the central chi-square survival function
 *   (`noncentralChiSquare.ts`).
 *
 * Units: any consistent time unit (seconds inside moonsieve); epochs are
 * transit numbers (integers in practice, any finite reals accepted).
 */
import { fitLinearEphemeris } from './linearEphemeris.js';
import { chiSquareSurvival } from '../numeric/noncentralChiSquare.js';

/** A chi-square excess test: statistic, degrees of freedom and upper-tail p-value. */
export interface ChiSquareExcess {
  chiSquare: number;
  dof: number;
  /** Pr(χ²(dof) ≥ chiSquare): small values mean excess scatter (a signal, or underestimated errors). */
  pValue: number;
}

/** TTV excess with its fitted ephemeris. */
export interface TtvExcess extends ChiSquareExcess {
  /** Fitted time at epoch 0 (same unit as the mid-times). */
  referenceTime: number;
  /** Fitted period (time unit per epoch). */
  period: number;
  /** Standard errors of referenceTime and period, and their covariance. */
  referenceTimeError: number;
  periodError: number;
  covariance: number;
}

/** TDV excess with its fitted mean duration. */
export interface TdvExcess extends ChiSquareExcess {
  /** Weighted mean duration and its standard error. */
  meanDuration: number;
  meanDurationError: number;
}

function checkSeries(name: string, values: Float64Array, n: number): void {
  if (values.length !== n) {
    throw new RangeError(`${name} must have the same length as epochs (${n}), got ${values.length}`);
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(values[i])) throw new RangeError(`${name}[${i}] must be finite, got ${values[i]}`);
  }
}

function checkErrors(name: string, errors: Float64Array, n: number): void {
  if (errors.length !== n) {
    throw new RangeError(`${name} must have the same length as epochs (${n}), got ${errors.length}`);
  }
  for (let i = 0; i < n; i++) {
    const s = errors[i];
    if (!(s > 0) || !Number.isFinite(s)) throw new RangeError(`${name}[${i}] must be finite and > 0, got ${s}`);
  }
}

/**
 * χ² of mid-times against the weighted linear ephemeris t = T0 + P·E (N − 2 dof).
 * Optional `residualsOut` (length N) receives t_n − (T0 + P·E_n).
 * @throws RangeError if N < 3, lengths differ, a value is not finite, an error is not > 0,
 *   or all epochs are equal.
 */
export function ttvExcess(
  epochs: Float64Array,
  midTimes: Float64Array,
  midTimeErrors: Float64Array,
  residualsOut?: Float64Array,
): TtvExcess {
  const n = epochs.length;
  if (n < 3) throw new RangeError(`epochs must hold at least 3 transits for a TTV χ² (N − 2 ≥ 1 dof), got ${n}`);
  checkSeries('epochs', epochs, n);
  checkSeries('midTimes', midTimes, n);
  checkErrors('midTimeErrors', midTimeErrors, n);
  if (residualsOut !== undefined && residualsOut.length !== n) {
    throw new RangeError(`residualsOut must have length ${n}, got ${residualsOut.length}`);
  }
  // The weighted line itself: linearEphemeris.ts (centred normal equations, Press et al. 2007, §15.2).
  const eph = fitLinearEphemeris(epochs, midTimes, midTimeErrors);
  let chi2 = 0;
  for (let i = 0; i < n; i++) {
    // Residual about the line, referred to the first point for precision with BJD-sized times.
    const r = midTimes[i] - midTimes[0] - (eph.t0S - midTimes[0] + eph.periodS * epochs[i]);
    const z = r / midTimeErrors[i];
    chi2 += z * z;
    if (residualsOut !== undefined) residualsOut[i] = r;
  }
  const dof = n - 2;
  return {
    chiSquare: chi2,
    dof,
    pValue: chiSquareSurvival(chi2, dof),
    referenceTime: eph.t0S,
    period: eph.periodS,
    referenceTimeError: eph.t0ErrS,
    periodError: eph.periodErrS,
    covariance: eph.covT0PeriodS2,
  };
}

/**
 * χ² of durations against their weighted mean (N − 1 dof).
 * Optional `residualsOut` (length N) receives D_n − D̄.
 * @throws RangeError if N < 2, lengths differ, a value is not finite or an error is not > 0.
 */
export function tdvExcess(
  epochs: Float64Array,
  durations: Float64Array,
  durationErrors: Float64Array,
  residualsOut?: Float64Array,
): TdvExcess {
  const n = epochs.length;
  if (n < 2) throw new RangeError(`epochs must hold at least 2 transits for a TDV χ² (N − 1 ≥ 1 dof), got ${n}`);
  checkSeries('epochs', epochs, n);
  checkSeries('durations', durations, n);
  checkErrors('durationErrors', durationErrors, n);
  if (residualsOut !== undefined && residualsOut.length !== n) {
    throw new RangeError(`residualsOut must have length ${n}, got ${residualsOut.length}`);
  }
  const d0 = durations[0];
  let sw = 0;
  let swd = 0;
  for (let i = 0; i < n; i++) {
    const w = 1 / (durationErrors[i] * durationErrors[i]);
    sw += w;
    swd += w * (durations[i] - d0);
  }
  const dBar = swd / sw;
  let chi2 = 0;
  for (let i = 0; i < n; i++) {
    const r = durations[i] - d0 - dBar;
    const z = r / durationErrors[i];
    chi2 += z * z;
    if (residualsOut !== undefined) residualsOut[i] = r;
  }
  const dof = n - 1;
  return {
    chiSquare: chi2,
    dof,
    pValue: chiSquareSurvival(chi2, dof),
    meanDuration: d0 + dBar,
    meanDurationError: Math.sqrt(1 / sw),
  };
}

/**
 * Joint TTV+TDV excess: χ²_TTV + χ²_TDV with dof_TTV + dof_TDV (= 2N − 3 for one series).
 * Treats the TTV and TDV errors as independent (see the file comment).
 */
export function jointTimingExcess(ttv: ChiSquareExcess, tdv: ChiSquareExcess): ChiSquareExcess {
  if (!(ttv.chiSquare >= 0)) throw new RangeError(`ttv.chiSquare must be ≥ 0, got ${ttv.chiSquare}`);
  if (!(tdv.chiSquare >= 0)) throw new RangeError(`tdv.chiSquare must be ≥ 0, got ${tdv.chiSquare}`);
  if (!(ttv.dof >= 1)) throw new RangeError(`ttv.dof must be ≥ 1, got ${ttv.dof}`);
  if (!(tdv.dof >= 1)) throw new RangeError(`tdv.dof must be ≥ 1, got ${tdv.dof}`);
  const chiSquare = ttv.chiSquare + tdv.chiSquare;
  const dof = ttv.dof + tdv.dof;
  return { chiSquare, dof, pValue: chiSquareSurvival(chiSquare, dof) };
}

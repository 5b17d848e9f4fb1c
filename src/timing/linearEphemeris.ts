/**
 * Linear ephemeris t_n = T0 + n·P fitted to transit mid-times by weighted
 * linear least squares (weights 1/σ_n²), with the covariance of (T0, P).
 *
 * Method: the normal equations of a straight line (Press et al. 2007,
 * Numerical Recipes 3rd ed., §15.2, eqs. 15.2.4–15.2.9): with S = Σw,
 * Sx = Σw n, Sxx = Σw n², Sy = Σw t, Sxy = Σw n t, Δ = S·Sxx − Sx²,
 *   T0 = (Sxx·Sy − Sx·Sxy)/Δ,  P = (S·Sxy − Sx·Sy)/Δ,
 *   var T0 = Sxx/Δ,  var P = S/Δ,  cov(T0, P) = −Sx/Δ.
 * For accuracy the times are first reduced by a trial line through the first
 * and last points and the epochs centred on their weighted mean, where T and P
 * are uncorrelated; the result is shifted back to epoch 0 exactly.
 * The covariance is the unscaled one (errors taken as given, not rescaled by
 * χ²/dof); χ² and dof are returned so the caller may rescale.
 */

export interface LinearEphemeris {
  /** Mid-time of epoch 0, s since t0. */
  t0S: number;
  periodS: number;
  t0ErrS: number;
  periodErrS: number;
  /** cov(T0, P), s². */
  covT0PeriodS2: number;
  chi2: number;
  /** Points minus 2. */
  dof: number;
  nPoints: number;
}

/**
 * Weighted least-squares line through (epoch, time ± err).
 * @throws RangeError on mismatched lengths, non-finite values, non-positive
 *   errors, or fewer than two distinct epochs.
 */
export function fitLinearEphemeris(
  epochs: ArrayLike<number>,
  timesS: ArrayLike<number>,
  errS: ArrayLike<number>,
): LinearEphemeris {
  const n = epochs.length;
  if (timesS.length !== n) throw new RangeError(`timesS.length must equal epochs.length (${n}), got ${timesS.length}`);
  if (errS.length !== n) throw new RangeError(`errS.length must equal epochs.length (${n}), got ${errS.length}`);
  let iFirst = -1;
  let iLast = -1;
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(epochs[i])) throw new RangeError(`epochs[${i}] must be finite, got ${epochs[i]}`);
    if (!Number.isFinite(timesS[i])) throw new RangeError(`timesS[${i}] must be finite, got ${timesS[i]}`);
    if (!(errS[i] > 0) || !Number.isFinite(errS[i])) throw new RangeError(`errS[${i}] must be a positive finite number, got ${errS[i]}`);
    if (iFirst < 0 || epochs[i] < epochs[iFirst]) iFirst = i;
    if (iLast < 0 || epochs[i] > epochs[iLast]) iLast = i;
  }
  if (n < 2 || epochs[iFirst] === epochs[iLast]) {
    throw new RangeError(`fitLinearEphemeris needs at least two distinct epochs, got ${n} point(s)`);
  }
  // Trial line through the extreme epochs; fit only the small residual line.
  const nRef = epochs[iFirst];
  const tRef = timesS[iFirst];
  const pTrial = (timesS[iLast] - timesS[iFirst]) / (epochs[iLast] - epochs[iFirst]);
  let S = 0, Sx = 0;
  for (let i = 0; i < n; i++) {
    const w = 1 / (errS[i] * errS[i]);
    S += w;
    Sx += w * (epochs[i] - nRef);
  }
  const xBar = Sx / S; // weighted mean epoch offset
  let Sxx = 0, Sy = 0, Sxy = 0;
  for (let i = 0; i < n; i++) {
    const w = 1 / (errS[i] * errS[i]);
    const x = epochs[i] - nRef - xBar;
    const y = timesS[i] - tRef - pTrial * (epochs[i] - nRef);
    Sxx += w * x * x;
    Sy += w * y;
    Sxy += w * x * y;
  }
  // Centred normal equations (Σw x = 0): intercept at x̄ and slope are uncorrelated.
  const a = Sy / S; // residual line at epoch nRef + x̄
  const b = Sxy / Sxx;
  const varA = 1 / S;
  const varB = 1 / Sxx;
  let chi2 = 0;
  for (let i = 0; i < n; i++) {
    const x = epochs[i] - nRef - xBar;
    const y = timesS[i] - tRef - pTrial * (epochs[i] - nRef);
    const r = (y - a - b * x) / errS[i];
    chi2 += r * r;
  }
  const periodS = pTrial + b;
  // Back to epoch 0: T0 = T(n̄) − n̄·P, n̄ = nRef + x̄.
  const nBar = nRef + xBar;
  const tBar = tRef + pTrial * xBar + a;
  const t0S = tBar - nBar * periodS;
  return {
    t0S,
    periodS,
    t0ErrS: Math.sqrt(varA + nBar * nBar * varB),
    periodErrS: Math.sqrt(varB),
    covT0PeriodS2: -nBar * varB,
    chi2,
    dof: n - 2,
    nPoints: n,
  };
}

/** Predicted mid-time of epoch n, s, and its 1σ uncertainty from the ephemeris covariance. */
export function ephemerisTime(eph: LinearEphemeris, epoch: number): { timeS: number; errS: number } {
  const v = eph.t0ErrS * eph.t0ErrS + 2 * epoch * eph.covT0PeriodS2 + epoch * epoch * eph.periodErrS * eph.periodErrS;
  return { timeS: eph.t0S + epoch * eph.periodS, errS: Math.sqrt(Math.max(v, 0)) };
}

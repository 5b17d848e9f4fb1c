/**
 * Per-transit fits: the mid-time t_c and duration of each transit, with the
 * depth and shape held at the global fit's template.
 *
 * Model for one transit window: m(t) = f0 · T((t − t_c)/s), T the
 * exposure-averaged template (transitTemplate.ts, x = 0 at its (t1 + t4)/2),
 * s the duration scale, so the first-to-last-contact duration is s·T14 of the
 * template; f0 the window's out-of-transit level (fitted unless
 * `fitBaseline` is false). Rescaling the smeared template also rescales its
 * exposure by s; with s − 1 ~ TDV/T14 ≲ 1e-2 that is a negligible error.
 *
 * Procedure:
 * 1. Coarse grid in t_c over the ephemeris prediction ± `searchHalfWidthS`
 *    (default T14/2, so a TTV up to half the duration is not missed), step
 *    h = min(ingress/2, half-width/4), then the two nodes h/2 either side of
 *    the best one: the start is within ingress/8 of the χ² minimum near that
 *    node, as on a grid of step h/2, at about half its cost (ours, no
 *    source); s = 1 and f0 solved linearly at each node. The samples are
 *    binned to ~ingress/8 for this search when that spans two cadences or more.
 * 2. Damped Newton / Levenberg–Marquardt from the best node (Levenberg 1944,
 *    Q. Appl. Math. 2, 164; Marquardt 1963, J. SIAM 11, 431; see
 *    `levenbergMarquardt` below), Jacobian from the template's analytic
 *    slope: ∂m/∂t_c = −f0 T′/s, ∂m/∂s = −f0 T′ u/s, ∂m/∂f0 = T with
 *    u = (t − t_c)/s, Hessian from its analytic curvature.
 *
 * 3. Uncertainties: √diag of (JᵀWJ)⁻¹ at the optimum, W = 1/σ² (the
 *    Cramér–Rao bound for white noise; Fisher information), then multiplied
 *    by the time-averaging factor β of the pooled residuals (betaFactor.ts;
 *    Pont, Zucker & Queloz 2006; Winn et al. 2008). This is the expected
 *    (model-only) information: the residual term of the Hessian is left out.
 *
 * Calibration against the Cramér–Rao bound (issue 4 asks for scatter within
 * 5 % of the bound and pull spread 1 ± 0.05 at S/N ≥ 10).
 * S/N here is the per-transit S/N = δ·√n_in/σ, δ = 1 − the template's
 * minimum, n_in = T14/cadence. It equals Carter et al. 2008 (ApJ 689, 499)
 * Q = √(ΓT)·δ/σ up to √(T/T14) = √(1 − τ/T14) (T mid-ingress to
 * mid-egress). Timing depends on the ingress and egress only: σ_tc =
 * Q⁻¹T√(τ/2T) (Carter et al. 2008), so the timing-relevant S/N is
 * Q·√(τ/T) ≈ S/N·√(τ/T14), 3.2 at S/N 10 for a 10 % ingress.
 * Measured (this project, 2000 simulated transits per cell, template as the
 * truth, random sampling phase, cadence = exposure, white noise; pull standard
 * deviation; the scatter over the bound evaluated at the TRUE parameters
 * agrees with it within 0.03, and the quoted errors equal that bound within
 * 0.3 %, 1–3 % at 30-min cadence and S/N 10):
 *
 *   τ/T14  cadence   S/N 10   15    20    30    40    60
 *   0.05    1 min    1.70   1.40  1.32  1.15  1.10  1.03
 *   0.05    2 min    1.66   1.37  1.25  1.14  1.10  1.05
 *   0.05   10 min    1.33   1.18  1.13  1.07  1.05  1.04
 *   0.05   30 min    1.14   1.12  1.10  1.06  1.05  1.04
 *   0.10    1 min    1.44   1.26  1.16  1.07  1.05  1.04
 *   0.10    2 min    1.35   1.24  1.17  1.09  1.05  1.03
 *   0.10   10 min    1.33   1.20  1.10  1.04  1.02  1.01
 *   0.10   30 min    1.15   1.12  1.09  1.07  1.05  1.03
 *   0.18    1 min    1.28   1.12  1.05  1.00  0.99  0.98
 *   0.18    2 min    1.32   1.14  1.09  1.02  1.01  1.00
 *   0.18   10 min    1.23   1.13  1.07  1.04  1.03  1.02
 *   0.18   30 min    1.18   1.15  1.13  1.07  1.04  1.03
 *
 * (single seed per cell: ±0.02–0.03 statistical, more where the tails are
 * heavy). Both criteria hold from S/N ≈ 20–30 (long ingress) to ≈ 60 (5 %
 * ingress); S/N ≥ 60 meets them for every shape and cadence above, i.e. a
 * timing S/N Q·√(τ/T) ≳ 12. At S/N 10 they cannot be met, by this or any
 * unbiased estimator: the excess is in the scatter, not in the error bars.
 * The model's slope ∂m/∂t_c jumps at the four contacts (smoothed only over
 * the exposure), so when σ_tc is not small against the ingress and exposure
 * the log-likelihood in t_c is not quadratic, the maximum-likelihood estimate
 * is no longer efficient, and the Fisher bound is not attained (the MLE is
 * efficient only asymptotically in S/N: Vallisneri 2008, Phys. Rev. D 77,
 * 042001, on the Fisher matrix's high-S/N validity; the threshold region of
 * nonlinear estimation: Van Trees 1968, Detection, Estimation, and Modulation
 * Theory I, ch. 4 [both from memory]). Checked and ruled out as causes (S/N
 * 12 and 24, 10 % ingress, 2 min): convergence to a secondary minimum (a scan
 * in t_c at 1/20 cadence never found a lower χ²), the table resolution (error
 * ≤ 1e-8 of the flux) and the exposure smearing (same template as the data).
 * Tried and rejected as error estimates: the observed information (Hessian
 * with the residual term: pull spread 1.47 at S/N 12, worse) and Δχ² = 1
 * profile intervals (pull spread 1.44, coverage 55 % instead of 68 %: the χ²
 * curve in t_c is rough on the scale of a cadence). Promising, not built: the
 * flat-prior posterior mean of t_c (Pitman 1939, Biometrika 30, 391, the
 * best equivariant estimator of a location) with the posterior standard
 * deviation as its error gave, for t_c alone, pull spread 1.00 and scatter
 * 1.13–1.15 × the bound at S/N 12 (MLE 1.17–1.21); it needs s marginalised,
 * not fixed at its fit (then 1.24).
 * The requirement test (test/timing/perTransitFit.test.ts) runs the whole
 * recovery at S/N 60 on the photodynamical light curve: scatter/bound 1.027,
 * pull spread 1.027, quoted errors/bound 0.9999 (2000 transits).
 *
 * Partial transits (issue 18): the timing information is in the ingress and
 * egress, so a transit is fitted from whichever of them the data hold. With
 * contacts t1 = t_c − D/2, t4 = t_c + D/2 (D = s·T14) and ingress τ =
 * s·(template ingress), a contact counts as observed when its interval
 * ([t1, t1 + τ] or [t4 − τ, t4]) is fully covered (every instant within 0.75
 * cadence of a sample: no gap over 1.5 cadences) or holds at least
 * MIN_CONTACT_SAMPLES samples (within half a cadence of it). Then
 *   both contacts observed: t_c, s and f0 fitted ('both');
 *   one contact observed: t_c and f0 fitted with the shape, and so the
 *     duration, held at the global fit's ('ingress_only', 'egress_only'): one
 *     contact fixes t_c only given the duration (Carter et al. 2008, ApJ 689,
 *     499: σ_tc comes from the ingress and egress, each half of it); the
 *     duration is not measured (durationErrS NaN, no TDV point);
 *   no contact observed (the middle, or baselines only): 'skipped-partial',
 *     with the counts; no sample between the contacts: 'skipped-no-data'.
 * The rule is applied at the prediction to choose what to fit and again at
 * the fitted t_c and s (the same mode, or the fit is skipped with the
 * reason). A fit that does not converge, or ends with s outside [0.5, 2] or
 * t_c outside the search range widened by D/2, is 'failed'. The errors are
 * the Fisher (Cramér–Rao) errors of whatever was fitted, so a partial
 * transit's larger error is its own: pulls of full, ingress-only and
 * egress-only fits have the same unit spread (test/timing/partialTransits.test.ts).
 *
 * Per-point noise (a ground campaign, noise/observingPlan.ts): the fit stays
 * unweighted and its covariance is the sandwich (JᵀJ)⁻¹ Jᵀ Σ J (JᵀJ)⁻¹, Σ =
 * diag σ_i², the exact covariance of the linearised least-squares estimate
 * with independent errors of unequal variance (e.g. White 1980, Econometrica
 * 48, 817, with Σ known rather than estimated); β is computed on the residuals scaled by
 * σ̄/σ_i.
 */
import { betaFactor, binSizesForTimescale, type BetaFactorResult } from './betaFactor.js';
import { lowerBound } from '../numeric/lowerBound.js';
import { invertSymmetricPositive, solveSymmetricPositive } from '../numeric/linearAlgebra.js';
import { templateFlux, templateFluxArray, templateFluxDerivatives, templateFluxSlope, type TransitTemplate } from './transitTemplate.js';

export type TransitFitStatus = 'ok' | 'skipped-partial' | 'skipped-no-data' | 'failed';

/** Which contacts an ok fit used (null unless ok); see the file header. */
export type TransitContacts = 'both' | 'ingress_only' | 'egress_only';

/** Fewest samples in an ingress or egress that count it as observed when it is not fully covered (ours, no source). */
export const MIN_CONTACT_SAMPLES = 3;

export interface TransitFit {
  epoch: number;
  /** Fitted mid-time (t1 + t4)/2, s since t0 (NaN unless ok). */
  tcS: number;
  /** 1σ uncertainty of tcS, s, including β. */
  tcErrS: number;
  /** First-to-last-contact duration s·T14, s (the global fit's when only one contact was observed). */
  durationS: number;
  /** Its 1σ uncertainty, s; NaN when only one contact was observed (duration not measured). */
  durationErrS: number;
  /** Out-of-transit flux level of the window. */
  baseline: number;
  /** χ² of the window at the optimum, W = 1/σ². */
  chi2: number;
  /** Samples in the window. */
  nPoints: number;
  status: TransitFitStatus;
  /** Why a transit was skipped or failed ('' when ok). */
  reason: string;
  /** The contacts the fit used (ok fits); absent otherwise. */
  contacts?: TransitContacts;
}

export interface PerTransitFitOptions {
  /** Predicted mid-times t0S + n·periodS, s since t0. */
  ephemeris: { t0S: number; periodS: number };
  /** Sampling cadence, s (partial-transit rule and β bin sizes). */
  cadenceS: number;
  /** Number of epochs 0..epochs−1 to report (default: largest epoch in the data + 1). */
  epochs?: number;
  /** Half-width of the coarse t_c search around the prediction, s (default template T14/2). */
  searchHalfWidthS?: number;
  /** Fit each window's out-of-transit level (default true). */
  fitBaseline?: boolean;
  /** 'pooled' (default): one β from all fitted windows; 'off': β = 1. */
  beta?: 'pooled' | 'off';
  /** Largest number of Levenberg–Marquardt steps per transit (default 50). */
  maxIterations?: number;
  /**
   * Each sample's own white-noise σ (relative flux), indexed like timeS; the
   * errors are then the sandwich covariance (file header). Default: every
   * sample has the `sigma` argument.
   */
  pointSigma?: Float64Array | null;
}

export interface PerTransitFitResult {
  fits: TransitFit[];
  /**
   * β applied to every error; null when beta = 'off', when no transit was
   * fitted, or when the residual rms is below half the stated σ (noiseless data).
   */
  beta: BetaFactorResult | null;
}

/** Indices of the samples of each epoch, in time order: `order[start[e] .. start[e+1])`. */
export function groupByEpoch(timeS: Float64Array, epoch: Int32Array, epochs: number): { order: Int32Array; start: Int32Array } {
  const start = new Int32Array(epochs + 1);
  for (let i = 0; i < epoch.length; i++) {
    const e = epoch[i];
    if (e >= 0 && e < epochs && Number.isFinite(timeS[i])) start[e + 1]++;
  }
  for (let e = 0; e < epochs; e++) start[e + 1] += start[e];
  const fill = Int32Array.from(start.subarray(0, epochs));
  const order = new Int32Array(start[epochs]);
  for (let i = 0; i < epoch.length; i++) {
    const e = epoch[i];
    if (e >= 0 && e < epochs && Number.isFinite(timeS[i])) order[fill[e]++] = i;
  }
  // Each epoch's samples in time order (already so for sampleWindows output; sort otherwise).
  for (let e = 0; e < epochs; e++) {
    const a = start[e];
    const b = start[e + 1];
    let sorted = true;
    for (let k = a + 1; k < b && sorted; k++) if (timeS[order[k]] < timeS[order[k - 1]]) sorted = false;
    if (!sorted) order.subarray(a, b).sort((i, j) => timeS[i] - timeS[j]);
  }
  return { order, start };
}

/** True when every instant of [a, b] lies within `reach` of a sample (samples in time order). */
function intervalCovered(timeS: Float64Array, order: Int32Array, i0: number, i1: number, a: number, b: number, reach: number): boolean {
  let covered = a; // [a, covered] is covered so far
  for (let k = i0; k < i1; k++) {
    const t = timeS[order[k]];
    if (t + reach < a) continue;
    if (t - reach > covered) return false;
    if (t + reach > covered) covered = t + reach;
    if (covered >= b) return true;
  }
  return covered >= b;
}

interface CoverageVerdict {
  /** What can be fitted, or null (skip, with the reason). */
  contacts: TransitContacts | null;
  nIn: number;
  reason: string;
}

/** Samples k in [i0, i1) with a ≤ t ≤ b. */
function countIn(timeS: Float64Array, order: Int32Array, i0: number, i1: number, a: number, b: number): number {
  let n = 0;
  for (let k = i0; k < i1; k++) {
    const t = timeS[order[k]];
    if (t >= a && t <= b) n++;
  }
  return n;
}

function checkCoverage(
  timeS: Float64Array,
  order: Int32Array,
  i0: number,
  i1: number,
  tc: number,
  durationS: number,
  ingressS: number,
  cadenceS: number,
): CoverageVerdict {
  const t1 = tc - 0.5 * durationS;
  const t4 = tc + 0.5 * durationS;
  let nIn = 0;
  for (let k = i0; k < i1; k++) {
    const t = timeS[order[k]];
    if (t > t1 && t < t4) nIn++;
  }
  if (nIn === 0) return { contacts: null, nIn, reason: 'no samples between first and last contact' };
  const reach = 0.75 * cadenceS;
  const h = 0.5 * cadenceS;
  const nIng = countIn(timeS, order, i0, i1, t1 - h, t1 + ingressS + h);
  const nEgr = countIn(timeS, order, i0, i1, t4 - ingressS - h, t4 + h);
  const ingress = nIng >= MIN_CONTACT_SAMPLES || intervalCovered(timeS, order, i0, i1, t1, t1 + ingressS, reach);
  const egress = nEgr >= MIN_CONTACT_SAMPLES || intervalCovered(timeS, order, i0, i1, t4 - ingressS, t4, reach);
  if (ingress && egress) return { contacts: 'both', nIn, reason: '' };
  if (ingress) return { contacts: 'ingress_only', nIn, reason: '' };
  if (egress) return { contacts: 'egress_only', nIn, reason: '' };
  return {
    contacts: null,
    nIn,
    reason: `no timing information: ${nIng} sample${nIng === 1 ? '' : 's'} in the ingress and ${nEgr} in the egress (a contact needs ${MIN_CONTACT_SAMPLES}, or no gap over 1.5 cadences)`,
  };
}

/** Caller-owned scratch for `fitOneTransit` (no allocation per point or per transit loop step; one per thread of work, reused from transit to transit). */
export class FitScratch {
  readonly ts = new Float64Array(3);
  readonly A = new Float64Array(9);
  readonly H = new Float64Array(9);
  readonly M = new Float64Array(9);
  readonly inv = new Float64Array(9);
  /** Scratch of the 3×3 solves: an inverse, and a Cholesky factor with one column. */
  readonly solveInv = new Float64Array(9);
  readonly cholesky = new Float64Array(12);
  readonly grad = new Float64Array(3);
  readonly delta = new Float64Array(3);
  /** The full (t_c, s, f0) normal equations before the free parameters are picked (see levenbergMarquardt). */
  readonly A3 = new Float64Array(9);
  readonly H3 = new Float64Array(9);
  readonly grad3 = new Float64Array(3);
  /** Σ σ_i² J_i J_iᵀ (sandwich covariance) and a product. */
  readonly B3 = new Float64Array(9);
  readonly B = new Float64Array(9);
  readonly P = new Float64Array(9);
  /** Running-sum buffers for TransitWindow (grown on demand, reused from one transit to the next). */
  cumD = new Float64Array(0);
  cumDD = new Float64Array(0);
  sums(n: number): void {
    if (this.cumD.length >= n) return;
    this.cumD = new Float64Array(n);
    this.cumDD = new Float64Array(n);
  }
  /** Bins of the coarse search: mean time, mean d, count, and running sums of n, n·d̄, n·d̄². */
  binT = new Float64Array(0);
  binD = new Float64Array(0);
  binN = new Float64Array(0);
  binCumN = new Float64Array(0);
  binCumD = new Float64Array(0);
  binCumDD = new Float64Array(0);
  /** Scratch: shifted bin times and their template values. */
  binU = new Float64Array(0);
  binQ = new Float64Array(0);
  bins(n: number): void {
    if (this.binT.length >= n + 1) return;
    this.binU = new Float64Array(n + 1);
    this.binQ = new Float64Array(n + 1);
    this.binT = new Float64Array(n + 1);
    this.binD = new Float64Array(n + 1);
    this.binN = new Float64Array(n + 1);
    this.binCumN = new Float64Array(n + 1);
    this.binCumD = new Float64Array(n + 1);
    this.binCumDD = new Float64Array(n + 1);
  }
}

/**
 * χ² of the coarse search at t_c (s = 1, f0 linear) on the bins in `w`: up to
 * a constant, Σ n_b (d̄_b − q_b − e·a_b)² minimised over e (see fitOneTransit).
 * Top-level, so that no intermediate is boxed (as a closure it allocated per bin).
 */
function coarseChi2Binned(w: FitScratch, nBins: number, tpl: TransitTemplate, tc: number, fitBaseline: boolean): number {
  const { binT, binD, binN, binCumN, binCumD, binCumDD, binU, binQ } = w;
  const a = lowerBound(binT, 0, nBins, tc + tpl.x0S - tpl.stepS);
  const b = Math.max(a, lowerBound(binT, a, nBins, tc + tpl.x0S + tpl.values.length * tpl.stepS));
  for (let k = a; k < b; k++) binU[k - a] = binT[k] - tc;
  templateFluxArray(tpl, binU, b - a, binQ);
  let srr = 0, sra = 0, saa = 0;
  for (let k = a; k < b; k++) {
    const q = binQ[k - a] - 1;
    const r = binD[k] - q;
    const aa = 1 + q;
    const n = binN[k];
    srr += n * r * r;
    sra += n * r * aa;
    saa += n * aa * aa;
  }
  srr += binCumDD[nBins] - (binCumDD[b] - binCumDD[a]);
  sra += binCumD[nBins] - (binCumD[b] - binCumD[a]);
  saa += binCumN[nBins] - (binCumN[b] - binCumN[a]);
  return fitBaseline ? srr - (sra * sra) / saa : srr;
}

/** The same χ² on every sample of the window (when the bins would be under two cadences wide). */
function coarseChi2Samples(win: TransitWindow, tc: number, fitBaseline: boolean): number {
  const { timeS, flux, order, tpl } = win;
  win.span(tc, 1);
  // Residual r = d − q − e(1 + q): with a = 1 + q, χ²(e) = Σ(d − q)² − 2eΣ(d − q)a + e²Σa².
  let srr = 0, sra = 0, saa = 0;
  for (let k = win.lo; k < win.hi; k++) {
    const i = order[k];
    const q = templateFlux(tpl, timeS[i] - tc) - 1;
    const r = flux[i] - 1 - q;
    const a = 1 + q;
    srr += r * r;
    sra += r * a;
    saa += a * a;
  }
  // Samples outside the table: q = 0, a = 1.
  srr += win.sumDD;
  sra += win.sumD;
  saa += win.nOut;
  return fitBaseline ? srr - (sra * sra) / saa : srr;
}

/** Bin the window's samples (time order) into `w`'s bins of width `binWidth`; returns the number of bins. */
function binWindow(w: FitScratch, timeS: Float64Array, flux: Float64Array, order: Int32Array, i0: number, i1: number, binWidth: number): number {
  w.bins(i1 - i0);
  const { binT, binD, binN, binCumN, binCumD, binCumDD } = w;
  let nBins = 0;
  let k = i0;
  while (k < i1) {
    const t0 = timeS[order[k]];
    let st = 0, sd = 0, n = 0;
    while (k < i1 && timeS[order[k]] - t0 < binWidth) {
      st += timeS[order[k]];
      sd += flux[order[k]] - 1;
      n++;
      k++;
    }
    binT[nBins] = st / n;
    binD[nBins] = sd / n;
    binN[nBins] = n;
    nBins++;
  }
  binCumN[0] = 0;
  binCumD[0] = 0;
  binCumDD[0] = 0;
  for (let b = 0; b < nBins; b++) {
    binCumN[b + 1] = binCumN[b] + binN[b];
    binCumD[b + 1] = binCumD[b] + binN[b] * binD[b];
    binCumDD[b + 1] = binCumDD[b] + binN[b] * binD[b] * binD[b];
  }
  return nBins;
}


/**
 * One transit window: samples `order[i0..i1)` in time order, and running sums
 * of d = y − 1 and d² over them. Outside its table the template is exactly 1
 * (transitTemplate.ts), so the samples there enter every sum below through
 * these running sums instead of one template lookup each; only the samples
 * within the table's reach, found by bisection, are visited. Sums over d
 * rather than y keep the out-of-transit χ², Σ(d − (f0 − 1))², free of
 * cancellation (exact for noiseless data).
 */
class TransitWindow {
  readonly cumD: Float64Array;
  readonly cumDD: Float64Array;
  /** Samples beyond the template's reach at the last `span` call, their count, Σd and Σd². */
  lo = 0;
  hi = 0;
  nOut = 0;
  /** NaN until the first span: non-integers from the start (see FoldedData in globalTransitFit.ts). */
  sumD = Number.NaN;
  sumDD = Number.NaN;
  constructor(
    readonly timeS: Float64Array,
    readonly flux: Float64Array,
    readonly order: Int32Array,
    readonly i0: number,
    readonly i1: number,
    readonly tpl: TransitTemplate,
    scratch: FitScratch,
  ) {
    const n = i1 - i0;
    scratch.sums(n + 1);
    this.cumD = scratch.cumD;
    this.cumDD = scratch.cumDD;
    this.cumD[0] = 0;
    this.cumDD[0] = 0;
    for (let k = 0; k < n; k++) {
      const d = flux[order[i0 + k]] - 1;
      this.cumD[k + 1] = this.cumD[k] + d;
      this.cumDD[k + 1] = this.cumDD[k] + d * d;
    }
  }

  /** First index k in [i0, i1) with timeS[order[k]] ≥ t (i1 if none). */
  private lowerBound(t: number): number {
    let a = this.i0;
    let b = this.i1;
    while (a < b) {
      const m = (a + b) >>> 1;
      if (this.timeS[this.order[m]] < t) a = m + 1;
      else b = m;
    }
    return a;
  }

  /**
   * Samples [lo, hi) that may fall inside the template's table for (tc, s), with
   * one table step of margin on each side; the rest, where the template is 1,
   * summarised in nOut, sumD and sumDD.
   */
  span(tc: number, s: number): void {
    const t = this.tpl;
    const first = t.x0S - t.stepS;
    const last = t.x0S + t.values.length * t.stepS;
    this.lo = this.lowerBound(tc + s * first);
    this.hi = Math.max(this.lo, this.lowerBound(tc + s * last));
    const a = this.lo - this.i0;
    const b = this.hi - this.i0;
    const n = this.i1 - this.i0;
    this.nOut = a + (n - b);
    this.sumD = this.cumD[a] + (this.cumD[n] - this.cumD[b]);
    this.sumDD = this.cumDD[a] + (this.cumDD[n] - this.cumDD[b]);
  }
}

interface RawFit {
  tc: number;
  s: number;
  f0: number;
  cov: Float64Array; // (JᵀJ)⁻¹ · σ² (or the sandwich), np×np
  np: number;
  /** Index of s among the fitted parameters, −1 when the duration was held fixed. */
  sIndex: number;
  chi2: number; // Σ r² (unweighted)
  converged: boolean;
}

/** Σ (y − f0 T((t − tc)/s))² over the window. */
function sumSquares(win: TransitWindow, tc: number, s: number, f0: number, ts: Float64Array): number {
  const { timeS, flux, order, tpl } = win;
  win.span(tc, s);
  let c = 0;
  for (let k = win.lo; k < win.hi; k++) {
    const i = order[k];
    templateFluxSlope(tpl, (timeS[i] - tc) / s, ts);
    const r = flux[i] - f0 * ts[0];
    c += r * r;
  }
  // Outside the table T = 1: Σ (d − (f0 − 1))².
  const e = f0 - 1;
  return c + win.sumDD - 2 * e * win.sumD + win.nOut * e * e;
}

/**
 * At (tc, s, f0), for the free parameters `free[0..np)` (indices into tc, s,
 * f0, in that order): the Fisher matrix JᵀJ into w.A, the full Hessian of
 * ½Σr², JᵀJ − Σ r ∇²m, into w.H, and Jᵀr into w.grad. Second derivatives of m = f0·T(u), u = (t − tc)/s:
 *   ∂²m/∂tc² = f0 T″/s², ∂²m/∂tc∂s = f0 (T″u + T′)/s², ∂²m/∂s² = f0 (T″u² + 2T′u)/s²,
 *   ∂²m/∂tc∂f0 = −T′/s, ∂²m/∂s∂f0 = −T′u/s, ∂²m/∂f0² = 0.
 * Samples outside the table (T = 1, T′ = T″ = 0) add only to ∂m/∂f0 terms.
 */
function normalEquations(win: TransitWindow, tc: number, s: number, f0: number, free: Int32Array, np: number, w: FitScratch): void {
  const { timeS, flux, order, tpl } = win;
  win.span(tc, s);
  let a00 = 0, a01 = 0, a02 = 0, a11 = 0, a12 = 0, a22 = 0, g0 = 0, g1 = 0, g2 = 0;
  let h00 = 0, h01 = 0, h11 = 0, h02 = 0, h12 = 0;
  const d = w.ts;
  const is2 = 1 / (s * s);
  for (let k = win.lo; k < win.hi; k++) {
    const i = order[k];
    const u = (timeS[i] - tc) / s;
    templateFluxDerivatives(tpl, u, d);
    const T = d[0];
    const T1 = d[1];
    const T2 = d[2];
    const j0 = (-f0 * T1) / s;
    const j1 = j0 * u;
    const r = flux[i] - f0 * T;
    a00 += j0 * j0;
    a01 += j0 * j1;
    a11 += j1 * j1;
    g0 += j0 * r;
    g1 += j1 * r;
    a02 += j0 * T;
    a12 += j1 * T;
    a22 += T * T;
    g2 += T * r;
    h00 += r * f0 * T2 * is2;
    h01 += r * f0 * (T2 * u + T1) * is2;
    h11 += r * f0 * (T2 * u * u + 2 * T1 * u) * is2;
    h02 += (r * -T1) / s;
    h12 += (r * -T1 * u) / s;
  }
  // Outside the table: ∂m/∂f0 = 1 and r = d − (f0 − 1).
  a22 += win.nOut;
  g2 += win.sumD - win.nOut * (f0 - 1);
  const A = w.A3;
  const H = w.H3;
  A[0] = a00; A[1] = a01; A[2] = a02;
  A[3] = a01; A[4] = a11; A[5] = a12;
  A[6] = a02; A[7] = a12; A[8] = a22;
  H[0] = a00 - h00; H[1] = a01 - h01; H[2] = a02 - h02;
  H[3] = H[1]; H[4] = a11 - h11; H[5] = a12 - h12;
  H[6] = H[2]; H[7] = H[5]; H[8] = a22;
  w.grad3[0] = g0; w.grad3[1] = g1; w.grad3[2] = g2;
  for (let a = 0; a < np; a++) {
    w.grad[a] = w.grad3[free[a]];
    for (let b = 0; b < np; b++) {
      w.A[a * np + b] = A[free[a] * 3 + free[b]];
      w.H[a * np + b] = H[free[a] * 3 + free[b]];
    }
  }
}

/**
 * B = Σ σ_i² J_i J_iᵀ over the free parameters at (tc, s, f0), into w.B: the
 * middle of the sandwich covariance (file header). Every sample is visited
 * (σ_i differ), with J = (−f0 T′/s, −f0 T′u/s, T) and T = 1, T′ = 0 outside the table.
 */
function noiseMoments(win: TransitWindow, pointSigma: Float64Array, tc: number, s: number, f0: number, free: Int32Array, np: number, w: FitScratch): void {
  const { timeS, order, tpl } = win;
  const d = w.ts;
  let b00 = 0, b01 = 0, b02 = 0, b11 = 0, b12 = 0, b22 = 0;
  for (let k = win.i0; k < win.i1; k++) {
    const i = order[k];
    const u = (timeS[i] - tc) / s;
    templateFluxDerivatives(tpl, u, d);
    const v = pointSigma[i] * pointSigma[i];
    const j0 = (-f0 * d[1]) / s;
    const j1 = j0 * u;
    const j2 = d[0];
    b00 += v * j0 * j0; b01 += v * j0 * j1; b02 += v * j0 * j2;
    b11 += v * j1 * j1; b12 += v * j1 * j2; b22 += v * j2 * j2;
  }
  const B3 = w.B3;
  B3[0] = b00; B3[1] = b01; B3[2] = b02;
  B3[3] = b01; B3[4] = b11; B3[5] = b12;
  B3[6] = b02; B3[7] = b12; B3[8] = b22;
  for (let a = 0; a < np; a++) for (let b = 0; b < np; b++) w.B[a * np + b] = B3[free[a] * 3 + free[b]];
}

/** out = M·B·M for symmetric np×np M and B (w.P scratch). */
function sandwich(M: Float64Array, B: Float64Array, np: number, P: Float64Array, out: Float64Array): void {
  for (let a = 0; a < np; a++) for (let b = 0; b < np; b++) {
    let x = 0;
    for (let c = 0; c < np; c++) x += M[a * np + c] * B[c * np + b];
    P[a * np + b] = x;
  }
  for (let a = 0; a < np; a++) for (let b = 0; b < np; b++) {
    let x = 0;
    for (let c = 0; c < np; c++) x += P[a * np + c] * M[c * np + b];
    out[a * np + b] = x;
  }
}

/** Free parameters (indices into t_c, s, f0): with or without the duration and the baseline. */
const FREE_SETS: Record<string, Int32Array> = {
  '11': Int32Array.from([0, 1, 2]),
  '10': Int32Array.from([0, 1]),
  '01': Int32Array.from([0, 2]),
  '00': Int32Array.from([0]),
};

/**
 * Damped Newton iteration on χ²: steps solve (H + λ·diag JᵀJ) δ = Jᵀr with
 * the full Hessian H (Newton's method with a Levenberg–Marquardt
 * regularisation; Nocedal & Wright 2006, Numerical Optimization, 2nd ed.,
 * §3.4 and §10.3). Plain Gauss–Newton (H ≈ JᵀJ) converges only linearly
 * here, at a rate near 1 when the noise is large against the curvature of
 * the template (measured: ~0.86 per step at S/N 24); the exact Hessian
 * restores quadratic convergence. λ is divided by 10 after a step lowering
 * χ² and multiplied by 10 otherwise (Marquardt 1963).
 */
function levenbergMarquardt(
  win: TransitWindow,
  sigma: number,
  tcStart: number,
  fitBaseline: boolean,
  fitDuration: boolean,
  pointSigma: Float64Array | null,
  maxIterations: number,
  w: FitScratch,
): RawFit {
  const { timeS, flux, order, tpl } = win;
  const free = FREE_SETS[`${fitDuration ? 1 : 0}${fitBaseline ? 1 : 0}`];
  const np = free.length;
  const sIndex = fitDuration ? 1 : -1;
  const fIndex = fitBaseline ? np - 1 : -1;
  let tc = tcStart;
  let s = 1;
  let f0 = 1;
  if (fitBaseline) {
    // Linear f0 at the start: f0 = Σ yT / Σ T² (T = 1 outside the table).
    win.span(tc, s);
    let syt = win.sumD + win.nOut;
    let stt = win.nOut;
    for (let k = win.lo; k < win.hi; k++) {
      const i = order[k];
      const T = templateFlux(tpl, timeS[i] - tc);
      syt += flux[i] * T;
      stt += T * T;
    }
    f0 = stt > 0 ? syt / stt : 1;
  }
  let chi2 = sumSquares(win, tc, s, f0, w.ts);
  let lambda = 1e-3;
  let converged = false;
  const nn = np * np;
  for (let it = 0; it < maxIterations; it++) {
    normalEquations(win, tc, s, f0, free, np, w);
    const okInv = invertSymmetricPositive(w.A, np, w.inv, w.cholesky);
    let accepted = false;
    let small = false;
    for (let tries = 0; tries < 16; tries++) {
      for (let k = 0; k < nn; k++) w.M[k] = w.H[k];
      for (let a = 0; a < np; a++) w.M[a * np + a] = w.H[a * np + a] + lambda * w.A[a * np + a] + 1e-300;
      if (!solveSymmetricPositive(w.M, np, w.grad, w.delta, w.solveInv, w.cholesky)) {
        lambda = Math.max(lambda * 10, 1e-6);
        continue;
      }
      const tcT = tc + w.delta[0];
      const sT = fitDuration ? Math.min(Math.max(s + w.delta[sIndex], 0.2), 5) : 1;
      const f0T = fitBaseline ? f0 + w.delta[fIndex] : 1;
      const c = sumSquares(win, tcT, sT, f0T, w.ts);
      if (c <= chi2) {
        // Converged when every step is below 1e-4 of its standard error σ·√((JᵀJ)⁻¹)ₐₐ.
        small = okInv;
        for (let a = 0; a < np && small; a++) {
          if (!(Math.abs(w.delta[a]) <= 1e-4 * sigma * Math.sqrt(w.inv[a * np + a]))) small = false;
        }
        if (chi2 - c <= 1e-14 * c) small = true;
        tc = tcT;
        s = sT;
        f0 = f0T;
        chi2 = c;
        lambda = Math.max(lambda / 10, 1e-12);
        accepted = true;
        break;
      }
      lambda = Math.max(lambda * 10, 1e-6);
    }
    if (!accepted || small) {
      converged = accepted || okInv;
      break;
    }
  }
  // Fisher matrix at the optimum: cov = σ² (JᵀJ)⁻¹; with per-point σ the sandwich (JᵀJ)⁻¹ JᵀΣJ (JᵀJ)⁻¹.
  normalEquations(win, tc, s, f0, free, np, w);
  const cov = new Float64Array(nn);
  if (!invertSymmetricPositive(w.A, np, w.inv, w.cholesky)) converged = false;
  if (pointSigma === null) {
    for (let k = 0; k < nn; k++) cov[k] = w.inv[k] * sigma * sigma;
  } else {
    noiseMoments(win, pointSigma, tc, s, f0, free, np, w);
    sandwich(w.inv, w.B, np, w.P, cov);
  }
  return { tc, s, f0, cov, np, sIndex, chi2, converged };
}

/**
 * Fit one transit window (samples `order[i0..i1)`, time-ordered) around the
 * predicted mid-time `tcPredS`. Errors are white-noise (β not applied).
 */
export function fitOneTransit(
  timeS: Float64Array,
  flux: Float64Array,
  sigma: number,
  order: Int32Array,
  i0: number,
  i1: number,
  tpl: TransitTemplate,
  epoch: number,
  tcPredS: number,
  opts: PerTransitFitOptions,
  scratch?: FitScratch,
): TransitFit {
  const w = scratch ?? new FitScratch();
  const nPoints = i1 - i0;
  const T14 = tpl.t14S;
  const ingress = tpl.ingressS > 0 ? tpl.ingressS : 0.5 * T14;
  const half = opts.searchHalfWidthS ?? 0.5 * T14;
  const fitBaseline = opts.fitBaseline ?? true;
  const pointSigma = opts.pointSigma ?? null;
  const empty = (status: TransitFitStatus, reason: string): TransitFit => ({
    epoch,
    tcS: NaN,
    tcErrS: NaN,
    durationS: NaN,
    durationErrS: NaN,
    baseline: NaN,
    chi2: NaN,
    nPoints,
    status,
    reason,
    // Present (undefined) so every TransitFit has one object shape: V8 then keeps fitTransits optimized
    // instead of deoptimizing on a "wrong map" each time a skipped fit meets an ok one (measured with
    // --trace-deopt; common practice, no source).
    contacts: undefined,
  });
  if (nPoints === 0) return empty('skipped-no-data', 'no samples in the window');
  const pred = checkCoverage(timeS, order, i0, i1, tcPredS, T14, ingress, opts.cadenceS);
  if (pred.nIn === 0) return empty('skipped-no-data', 'no samples inside the predicted transit');
  if (pred.contacts === null) return empty('skipped-partial', pred.reason);
  const fitDuration = pred.contacts === 'both';

  // 1. Coarse grid in t_c (s = 1, f0 linear), in terms of d = y − 1 and q = T − 1 (q = 0 outside the
  // table): with f0 = 1 + e the residual is (d − q) − e(1 + q), linear in e.
  const win = new TransitWindow(timeS, flux, order, i0, i1, tpl, w);
  // The search runs on bins of ~ingress/8 when that spans two or more cadences: the χ² of the samples
  // is, up to a constant, Σ n_b (d̄_b − q_b − e·a_b)² with the template at each bin's mean time, whose
  // error (the template's curvature over a bin) is far below what a grid of step ingress/2 resolves
  // (ours, no source). The fit below uses every sample.
  const binWidth = ingress / 8;
  const nBins = binWidth >= 2 * opts.cadenceS ? binWindow(w, timeS, flux, order, i0, i1, binWidth) : 0;
  const step = Math.min(ingress / 2, half / 4);
  const nGrid = Math.max(1, Math.ceil(half / step));
  let bestTc = tcPredS;
  let bestChi2 = Infinity;
  for (let g = -nGrid; g <= nGrid; g++) {
    const tc = tcPredS + g * step;
    const c = nBins > 0 ? coarseChi2Binned(w, nBins, tpl, tc, fitBaseline) : coarseChi2Samples(win, tc, fitBaseline);
    if (c < bestChi2) {
      bestChi2 = c;
      bestTc = tc;
    }
  }
  // Refinement: the two half-step neighbours of the best node.
  const centre = bestTc;
  for (const tc of [centre - 0.5 * step, centre + 0.5 * step]) {
    const c = nBins > 0 ? coarseChi2Binned(w, nBins, tpl, tc, fitBaseline) : coarseChi2Samples(win, tc, fitBaseline);
    if (c < bestChi2) {
      bestChi2 = c;
      bestTc = tc;
    }
  }

  // 2. Levenberg–Marquardt.
  let fit = levenbergMarquardt(win, sigma, bestTc, fitBaseline, fitDuration, pointSigma, opts.maxIterations ?? 50, w);
  let contacts: TransitContacts = pred.contacts;
  let cov = ruleAtFit(fit);
  // Both contacts at the prediction, one at the fitted mid-time (a contact near the sample threshold):
  // fitted again from that contact alone, with the duration held.
  if (fitDuration && cov.contacts !== null && cov.contacts !== 'both') {
    contacts = cov.contacts;
    fit = levenbergMarquardt(win, sigma, bestTc, fitBaseline, false, pointSigma, opts.maxIterations ?? 50, w);
    cov = ruleAtFit(fit);
  }
  const finite = Number.isFinite(fit.tc) && Number.isFinite(fit.s) && Number.isFinite(fit.cov[0]);
  const sane = finite && fit.s >= 0.5 && fit.s <= 2 && Math.abs(fit.tc - tcPredS) <= half + 0.5 * T14;
  if (cov.contacts === null) return empty(cov.nIn === 0 ? 'skipped-no-data' : 'skipped-partial', cov.reason);
  // The contact a one-contact fit used must still be observed at the fitted mid-time.
  if (contacts !== 'both' && cov.contacts !== 'both' && cov.contacts !== contacts) {
    return empty('skipped-partial', `the contact observed at the fitted mid-time (${cov.contacts.replace('_', ' ')}) is not the one fitted (${contacts.replace('_', ' ')})`);
  }
  if (contacts === 'both' && cov.contacts !== 'both') return empty('skipped-partial', 'both contacts observed at the prediction, not at the fitted mid-time');
  if (!fit.converged) return empty('failed', 'Levenberg–Marquardt did not converge');
  if (!sane) return empty('failed', `fit left the allowed range (s = ${fit.s.toPrecision(4)}, tc − predicted = ${(fit.tc - tcPredS).toPrecision(4)} s)`);
  return {
    epoch,
    tcS: fit.tc,
    tcErrS: Math.sqrt(fit.cov[0]),
    durationS: fit.s * T14,
    durationErrS: fit.sIndex >= 0 ? Math.sqrt(fit.cov[fit.sIndex * fit.np + fit.sIndex]) * T14 : NaN,
    baseline: fit.f0,
    chi2: fit.chi2 / (sigma * sigma),
    nPoints,
    status: 'ok',
    reason: '',
    contacts,
  };

  /** 3. The partial-transit rule at the fitted position (at the prediction when the fit failed or left its range). */
  function ruleAtFit(f: RawFit): CoverageVerdict {
    const ok = Number.isFinite(f.tc) && Number.isFinite(f.s) && Number.isFinite(f.cov[0]) && f.s >= 0.5 && f.s <= 2 && Math.abs(f.tc - tcPredS) <= half + 0.5 * T14;
    return ok && f.converged ? checkCoverage(timeS, order, i0, i1, f.tc, f.s * T14, f.s * ingress, opts.cadenceS) : pred;
  }
}

/**
 * Fit every transit of an observation (see the file header).
 * @param timeS mid-exposure times, s since t0
 * @param flux relative flux
 * @param sigma white-noise standard deviation per point
 * @param epoch transit epoch of each sample
 * @param tpl template from the global fit
 * @throws RangeError on mismatched lengths or invalid options.
 */
export function fitTransits(
  timeS: Float64Array,
  flux: Float64Array,
  sigma: number,
  epoch: Int32Array,
  tpl: TransitTemplate,
  opts: PerTransitFitOptions,
): PerTransitFitResult {
  const n = timeS.length;
  if (flux.length !== n) throw new RangeError(`flux.length must equal timeS.length (${n}), got ${flux.length}`);
  if (epoch.length !== n) throw new RangeError(`epoch.length must equal timeS.length (${n}), got ${epoch.length}`);
  if (!(sigma > 0) || !Number.isFinite(sigma)) throw new RangeError(`sigma must be a positive finite number, got ${sigma}`);
  if (opts.pointSigma && opts.pointSigma.length !== n) throw new RangeError(`pointSigma.length must equal timeS.length (${n}), got ${opts.pointSigma.length}`);
  if (!(opts.cadenceS > 0) || !Number.isFinite(opts.cadenceS)) throw new RangeError(`cadenceS must be a positive finite number, got ${opts.cadenceS}`);
  if (!(opts.ephemeris.periodS > 0) || !Number.isFinite(opts.ephemeris.periodS)) {
    throw new RangeError(`ephemeris.periodS must be a positive finite number, got ${opts.ephemeris.periodS}`);
  }
  if (!Number.isFinite(opts.ephemeris.t0S)) throw new RangeError(`ephemeris.t0S must be finite, got ${opts.ephemeris.t0S}`);
  if (opts.searchHalfWidthS !== undefined && !(opts.searchHalfWidthS > 0)) {
    throw new RangeError(`searchHalfWidthS must be positive, got ${opts.searchHalfWidthS}`);
  }
  let maxEpoch = -1;
  for (let i = 0; i < n; i++) if (epoch[i] > maxEpoch) maxEpoch = epoch[i];
  const epochs = opts.epochs ?? maxEpoch + 1;
  if (!(Number.isInteger(epochs) && epochs >= 0)) throw new RangeError(`epochs must be a non-negative integer, got ${epochs}`);
  const { order, start } = groupByEpoch(timeS, epoch, epochs);
  const fits: TransitFit[] = [];
  const scratch = new FitScratch();
  for (let e = 0; e < epochs; e++) {
    const pred = opts.ephemeris.t0S + e * opts.ephemeris.periodS;
    fits.push(fitOneTransit(timeS, flux, sigma, order, start[e], start[e + 1], tpl, e, pred, opts, scratch));
  }
  if ((opts.beta ?? 'pooled') === 'off') return { fits, beta: null };

  // β from the pooled residuals of the fitted windows, bin sizes 0.5–2 ingress durations.
  let total = 0;
  let nOk = 0;
  for (const f of fits) if (f.status === 'ok') {
    total += start[f.epoch + 1] - start[f.epoch];
    nOk++;
  }
  if (nOk === 0) return { fits, beta: null };
  const residuals = new Float64Array(total);
  const segments = new Int32Array(nOk + 1);
  const ts = new Float64Array(2);
  let j = 0;
  let seg = 0;
  for (const f of fits) {
    if (f.status !== 'ok') continue;
    segments[seg++] = j;
    const s = f.durationS / tpl.t14S;
    for (let k = start[f.epoch]; k < start[f.epoch + 1]; k++) {
      const i = order[k];
      templateFluxSlope(tpl, (timeS[i] - f.tcS) / s, ts);
      residuals[j++] = (flux[i] - f.baseline * ts[0]) * (opts.pointSigma ? sigma / opts.pointSigma[i] : 1);
    }
  }
  segments[nOk] = j;
  // Data far quieter than the stated σ (a noiseless model): the residuals are only template error, and
  // their correlation says nothing about noise; β is not applied (ours, no source).
  let ss = 0;
  for (let k = 0; k < total; k++) ss += residuals[k] * residuals[k];
  if (!(Math.sqrt(ss / Math.max(total, 1)) >= 0.5 * sigma)) return { fits, beta: null };
  const ingress = tpl.ingressS > 0 ? tpl.ingressS : 0.5 * tpl.t14S;
  const sizes = binSizesForTimescale(Math.max(0.5 * ingress, 2 * opts.cadenceS), Math.max(2 * ingress, 2 * opts.cadenceS), opts.cadenceS);
  const beta = betaFactor(residuals, segments, sizes);
  if (beta.beta !== 1) {
    for (const f of fits) {
      if (f.status !== 'ok') continue;
      f.tcErrS *= beta.beta;
      f.durationErrS *= beta.beta;
    }
  }
  return { fits, beta };
}

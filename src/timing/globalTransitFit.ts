/**
 * Global transit shape: the radius ratio p, impact parameter b, duration
 * scale s, a common mid-time offset Δt and the out-of-transit level f0, fitted
 * to all transits folded on a linear ephemeris, by weighted least squares with
 * the Levenberg–Marquardt method (Levenberg 1944, Q. Appl. Math. 2, 164;
 * Marquardt 1963, J. SIAM 11, 431: solve (JᵀWJ + λ diag JᵀWJ) δ = JᵀW r,
 * λ divided by 10 after a step that lowers χ², multiplied by 10 otherwise).
 *
 * Model: m_i = f0 · T_{p,b,s}(x_i − Δt), x_i = t_i − (T0 + n_i P), with T the
 * exposure-averaged planet-only template (transitTemplate.ts) built with
 * timeScale s. Limb darkening, a/R*, e, ω and the exposure stay at the given
 * geometry. Derivatives: Δt, s and f0 analytic from the template slope
 * (∂T_s(x)/∂s ≈ −T′(x)·x/s, exact apart from the exposure smearing, which
 * only slows convergence: every trial χ² uses a freshly built template); p
 * and b by forward differences of rebuilt templates, kept from one iteration
 * to the next until p, b, s or Δt has moved by one standard error.
 *
 * Cost: one template build per trial step plus two per Jacobian refresh; the
 * three builds at the starting geometry are kept for the next fit from the
 * same start (every realization of a sweep cell). Steps stop when the
 * Gauss–Newton step is below 1e-2 of every standard error (STEP_TOLERANCE).
 * On the bench reference scenario (4764 points, 12 transits) this cut the
 * builds per fit from 16.4 to about 5 (each halved in cost for circular
 * orbits, transitTemplate.ts).
 * The fit iterates on tables of step T14/1000 (interpolation error ≲ 7e-7 of
 * the flux instantaneous, ≲ 2e-7 with a 1-min and ≲ 1.2e-7 with a 2-min
 * exposure; measured as in transitTemplate.ts) and returns, for the
 * per-transit fits, a T14/4000 table (≲ 2e-8, 1e-8) built once at the
 * optimum when σ < 1e-5 per point, else the last iteration table
 * (FINE_BELOW_SIGMA). Earlier,
 * measured on the demo scenario
 * (scenarios/demo-observer.yaml, 3176 points, 8 transits, noisy machine, min
 * of 8 × 20 calls): the whole recoverTimings 23–25 → 6.6–7.8 ms, mid-times
 * unchanged to 1.3e-4 σ and their errors to 4e-5 against the previous
 * version (T14/4000 tables throughout, rebuilt p and b columns every
 * iteration, final 16 000-node table, steps to 1e-4 σ).
 *
 * The impact parameter is fitted unless `fitImpact` is false. It is fixed at
 * the geometry's value (and `impactFixed` set, with the reason) when the
 * free fit does not converge or leaves b undetermined (σ_b > 0.3): b is
 * weakly constrained at low total S/N and degenerate with s and p.
 *
 * Uncertainties: square roots of the diagonal of (JᵀWJ)⁻¹ at the optimum,
 * W = 1/σ² (white noise).
 */
import {
  buildTransitTemplate,
  templateFluxArray,
  templateFluxSlope,
  TemplateWorkspace,
  type TemplateGeometry,
  type TransitTemplate,
} from './transitTemplate.js';
import { lowerBound } from '../numeric/lowerBound.js';
import { remembered } from '../memo.js';
import { invertSymmetricPositive, solveSymmetricPositive } from '../numeric/linearAlgebra.js';

export interface LinearEphemerisGuess {
  /** Mid-time of epoch 0, s since t0. */
  t0S: number;
  periodS: number;
}

export interface GlobalFitOptions {
  /** Ephemeris to fold on (default T0 = 0, P = geometry.periodS). */
  ephemeris?: LinearEphemerisGuess;
  /** Fit b (default true). */
  fitImpact?: boolean;
  /** Largest number of Levenberg–Marquardt steps (default 60). */
  maxIterations?: number;
  /** Scratch to reuse from one fit to the next (default: allocate). */
  workspace?: GlobalFitWorkspace;
}

/**
 * Scratch arrays of globalTransitFit, reusable from one fit to the next (grown
 * on demand, never shrunk; not shared between threads): the template builds'
 * and six per-sample arrays (folded x and y, the running sums, the p and b
 * Jacobian columns). Nothing in a fit's result points into it. A sweep makes
 * one per cell: a realization otherwise allocated ~0.3 MB of array buffers
 * here, whose churn made V8 run a full (mark-compact) collection every few
 * dozen realizations, its marking on the other core.
 */
export class GlobalFitWorkspace {
  readonly templates = new TemplateWorkspace();
  // Six empty arrays from the start, not `[]`: an empty literal has V8's small-integer element kind, and
  // the optimized fit, compiled for an array of typed arrays, was deoptimized on every new workspace (once
  // per cell; measured with --trace-deopt-verbose; common practice, no source).
  private buf: Float64Array[] = [0, 1, 2, 3, 4, 5].map(() => new Float64Array(0));

  /** The six per-sample arrays, of length m + 1. */
  samples(m: number): Float64Array[] {
    if (this.buf[0].length < m + 1) {
      const size = Math.max(m + 1, Math.ceil(1.25 * this.buf[0].length));
      this.buf = [0, 1, 2, 3, 4, 5].map(() => new Float64Array(size));
    }
    return this.buf.map((a) => a.subarray(0, m + 1));
  }
}

export interface GlobalTransitFit {
  radiusRatio: number;
  radiusRatioErr: number;
  impactParameter: number;
  /** NaN when b was held fixed. */
  impactParameterErr: number;
  impactFixed: boolean;
  /** Why b was fixed ('' when it was fitted). */
  impactNote: string;
  /** Duration scale relative to the input geometry. */
  timeScale: number;
  timeScaleErr: number;
  /** Mean mid-time offset from the folding ephemeris, s. */
  offsetS: number;
  offsetErrS: number;
  /** Out-of-transit flux level. */
  baseline: number;
  baselineErr: number;
  chi2: number;
  nPoints: number;
  iterations: number;
  converged: boolean;
  /** Fine template of the fitted shape (timeScale included), for the per-transit fits. */
  template: TransitTemplate;
}

interface Params {
  p: number;
  b: number;
  s: number;
  dt: number;
  f0: number;
}

/** Table step T14/1000 while iterating: interpolation error ≲ 1e-6 of the stellar flux (measured, file header). */
const ITERATION_STEPS_PER_T14 = 1000;
/**
 * Table step T14/250 (or the exposure, if longer) while far from the optimum: ~3.6e-6 of the
 * flux (bench reference scenario, 100-s exposure), a third of the cost of a build. Used until a
 * Gauss–Newton step is predicted to lower χ² by less than COARSE_UNTIL σ² (within about a standard
 * error of the optimum); it matters when the folded shape is far from the start, e.g. smeared by
 * TTVs of a good fraction of the ingress, where the fit takes ten or more steps.
 */
const COARSE_STEPS_PER_T14 = 250;
const COARSE_UNTIL = 1;
/** Table step T14/4000 for the returned template: ≲ 5e-8 (instantaneous), ≲ 1e-8 (1–2 min exposure). */
const FINAL_STEPS_PER_T14 = 4000;
/**
 * Below this per-point σ the per-transit fits get the T14/4000 table; at or
 * above it, the last T14/1000 iteration table. Its interpolation error
 * (1.6e-7 of the flux on the bench reference scenario, ≲ 7e-7 in the cases of
 * the file header) is then ≤ 7 % of σ, and, being the same template for every
 * transit, it moves all mid-times and durations alike, which the TTV and TDV
 * statistics (residuals from a line and from the mean) remove. Saves the
 * costliest build of the fit (ours, no source).
 */
const FINE_BELOW_SIGMA = 1e-5;

/** Re-use the p and b Jacobian columns until some parameter has moved by this many standard errors. */
const REFRESH_SIGMAS = 1;

/**
 * Steps stop below this fraction of every standard error. Finer is not
 * resolved: each trial χ² uses a rebuilt T14/1000 table whose nodes move with
 * p, b and s, and its interpolation error (~1e-7 of the flux) makes χ² jitter
 * by ~1e-2 over a few thousand points at 500 ppm, the drop a 0.1σ step gives.
 * Measured on the bench reference scenario: with 1e-3, about a third of all
 * trials near the optimum were steps of 1e-3–1e-2 σ that raised χ².
 */
const STEP_TOLERANCE = 1e-2;

/**
 * A Levenberg–Marquardt step whose predicted χ² drop, 2δᵀJᵀr − δᵀJᵀJδ
 * (Nocedal & Wright 2006, §10.3, the model's reduction), is below this (in
 * units of the effective σ², see `runLm`) is not tried: the minimum has
 * been reached to the χ² resolution of rebuilt tables (the ~1e-2 jitter of
 * STEP_TOLERANCE; a step that small is within ~0.1σ of the optimum). Without it a fit whose
 * model cannot match the data (a shape smeared by TTVs of a large fraction
 * of the ingress) spent half its builds on trial steps raising χ².
 */
const CHI2_RESOLUTION = 1e-2;

function paramVector(q: Params, fitImpact: boolean, out: Float64Array): void {
  let c = 0;
  out[c++] = q.p;
  if (fitImpact) out[c++] = q.b;
  out[c++] = q.s;
  out[c++] = q.dt;
  out[c++] = q.f0;
}

function templateFor(g: TemplateGeometry, q: Params, stepsPerT14: number, workspace: TemplateWorkspace): TransitTemplate {
  const geo: TemplateGeometry = { ...g, radiusRatio: q.p, impactParameter: q.b, timeScale: q.s };
  return buildTransitTemplate(geo, { stepsPerT14, workspace });
}

/**
 * Templates at the starting point (the start itself and its p and b
 * neighbours for the first Jacobian), kept for the next fits: every
 * realization of a sweep cell starts from the same geometry, so these three
 * builds are the same each time. A build is a pure function of its inputs and
 * tables are never written after they are built, so reusing one changes no
 * result. Small and first-in-first-out; per thread.
 */
const START_CACHE_SIZE = 24;
const startCache = new Map<string, TransitTemplate>();

function startTemplateFor(g: TemplateGeometry, q: Params, stepsPerT14: number, workspace: TemplateWorkspace): TransitTemplate {
  const key = [
    g.periodS, g.aOverRstar, g.eccentricity, g.omegaRad, g.u1, g.u2, g.exposureS, q.p, q.b, q.s, stepsPerT14,
  ].join(',');
  return remembered(startCache, START_CACHE_SIZE, key, () => templateFor(g, q, stepsPerT14, workspace));
}

/**
 * The folded data (x = t − (T0 + nP), y), in runs of increasing x (one per
 * transit window for time-ordered data), with running sums of d = y − 1 and
 * d². Outside its table a template is exactly 1 (transitTemplate.ts), so the
 * samples there enter χ² and the normal equations through those sums:
 * `select` finds, by bisection in each run, the samples within reach of a
 * table, and only those are visited one by one. Sums over d keep the
 * out-of-transit χ², Σ(d − (f0 − 1))², free of cancellation.
 */
class FoldedData {
  readonly runStart: Int32Array;
  readonly cumD: Float64Array;
  readonly cumDD: Float64Array;
  readonly lo: Int32Array;
  readonly hi: Int32Array;
  /**
   * Samples outside the last selection: count, Σd, Σd². The sums start as
   * NaN, a non-integer: a field that starts as a small integer and later
   * holds a fraction makes V8 recompile every function that reads it.
   */
  nOut = 0;
  sumD = Number.NaN;
  sumDD = Number.NaN;

  /** cumD, cumDD: arrays of length ≥ x.length + 1 to hold the running sums (default: allocate). */
  constructor(readonly x: Float64Array, readonly y: Float64Array, cumD?: Float64Array, cumDD?: Float64Array) {
    const m = x.length;
    const starts = [0];
    for (let i = 1; i < m; i++) if (!(x[i] >= x[i - 1])) starts.push(i);
    starts.push(m);
    this.runStart = Int32Array.from(starts);
    this.lo = new Int32Array(starts.length - 1);
    this.hi = new Int32Array(starts.length - 1);
    this.cumD = cumD ?? new Float64Array(m + 1);
    this.cumDD = cumDD ?? new Float64Array(m + 1);
    this.cumD[0] = 0;
    this.cumDD[0] = 0;
    for (let i = 0; i < m; i++) {
      const d = y[i] - 1;
      this.cumD[i + 1] = this.cumD[i] + d;
      this.cumDD[i + 1] = this.cumDD[i] + d * d;
    }
  }

  /**
   * Select the samples with x in [dt + x0 − margin, dt + x_end + margin] of
   * a template's table, margin 2 % of its span plus four steps (so that the
   * p and b neighbours' tables, wider by ~1e-3 of the span, stay inside).
   */
  select(tpl: TransitTemplate, dt: number): void {
    const span = tpl.values.length * tpl.stepS;
    const margin = 0.02 * span + 4 * tpl.stepS;
    const a = dt + tpl.x0S - margin;
    const b = dt + tpl.x0S + span + margin;
    let nIn = 0;
    let inD = 0;
    let inDD = 0;
    for (let r = 0; r < this.lo.length; r++) {
      const s = this.runStart[r];
      const e = this.runStart[r + 1];
      const lo = lowerBound(this.x, s, e, a);
      const hi = Math.max(lo, lowerBound(this.x, lo, e, b));
      this.lo[r] = lo;
      this.hi[r] = hi;
      nIn += hi - lo;
      inD += this.cumD[hi] - this.cumD[lo];
      inDD += this.cumDD[hi] - this.cumDD[lo];
    }
    const m = this.x.length;
    this.nOut = m - nIn;
    this.sumD = this.cumD[m] - inD;
    this.sumDD = this.cumDD[m] - inDD;
  }
}

/**
 * JᵀJ (5 × 5, row-major, into `out`) and Jᵀr (into `grad`) for the columns
 * p, b, s, Δt, f0 at (f0, Δt, 1/s) (`tmp`: two numbers of scratch). A separate small function with scalar
 * accumulators, so the optimising compiler keeps every intermediate in
 * registers (inside runLm's closure scope it allocated once per sample).
 */
function accumulateNormal(
  data: FoldedData,
  tpl: TransitTemplate,
  colP: Float64Array,
  colB: Float64Array,
  fitImpact: boolean,
  f0: number,
  dt: number,
  sInv: number,
  out: Float64Array,
  grad: Float64Array,
  tmp: Float64Array,
): void {
  const { x, y } = data;
  let pp = 0, pb = 0, ps = 0, pt = 0, pf = 0, bb = 0, bs = 0, bt = 0, bf = 0;
  let ss = 0, st = 0, sf = 0, tt = 0, tf = 0, ff = 0;
  let gp = 0, gb = 0, gs = 0, gt = 0, gf = 0;
  data.select(tpl, dt);
  for (let run = 0; run < data.lo.length; run++) {
    const hi = data.hi[run];
    for (let i = data.lo[run]; i < hi; i++) {
      const u = x[i] - dt;
      templateFluxSlope(tpl, u, tmp);
      const T = tmp[0];
      const jt = -f0 * tmp[1];
      const js = jt * u * sInv;
      const jp = f0 * colP[i];
      const jb = fitImpact ? f0 * colB[i] : 0;
      const r = y[i] - f0 * T;
      pp += jp * jp; pb += jp * jb; ps += jp * js; pt += jp * jt; pf += jp * T;
      bb += jb * jb; bs += jb * js; bt += jb * jt; bf += jb * T;
      ss += js * js; st += js * jt; sf += js * T;
      tt += jt * jt; tf += jt * T;
      ff += T * T;
      gp += jp * r; gb += jb * r; gs += js * r; gt += jt * r; gf += T * r;
    }
  }
  // Outside the selection T = 1, T′ = 0 and the p, b columns vanish: only ∂m/∂f0 = 1 remains.
  ff += data.nOut;
  gf += data.sumD - data.nOut * (f0 - 1);
  out.set([pp, pb, ps, pt, pf, pb, bb, bs, bt, bf, ps, bs, ss, st, sf, pt, bt, st, tt, tf, pf, bf, sf, tf, ff]);
  grad.set([gp, gb, gs, gt, gf]);
}

/**
 * The p and b columns ∂T/∂p, ∂T/∂b by forward differences of the neighbours'
 * tables, zero outside the selection (which holds both neighbours' tables, so
 * they are exact there). A top-level function for the same reason as
 * `accumulateNormal`.
 */
function jacobianColumns(
  data: FoldedData,
  tpl: TransitTemplate,
  tplP: TransitTemplate,
  tplB: TransitTemplate | null,
  dt: number,
  dp: number,
  bStep: number,
  colP: Float64Array,
  colB: Float64Array,
): void {
  const x = data.x;
  data.select(tpl, dt);
  colP.fill(0);
  colB.fill(0);
  // Per run: u = x − Δt of the selected samples, then each table over the whole run in one call.
  let longest = 0;
  for (let run = 0; run < data.lo.length; run++) longest = Math.max(longest, data.hi[run] - data.lo[run]);
  const u = new Float64Array(longest);
  const t0 = new Float64Array(longest);
  const t1 = new Float64Array(longest);
  for (let run = 0; run < data.lo.length; run++) {
    const lo = data.lo[run];
    const n = data.hi[run] - lo;
    for (let k = 0; k < n; k++) u[k] = x[lo + k] - dt;
    templateFluxArray(tpl, u, n, t0);
    templateFluxArray(tplP, u, n, t1);
    for (let k = 0; k < n; k++) colP[lo + k] = (t1[k] - t0[k]) / dp;
    if (tplB !== null) {
      templateFluxArray(tplB, u, n, t1);
      for (let k = 0; k < n; k++) colB[lo + k] = (t1[k] - t0[k]) / bStep;
    }
  }
}

/** Σ (y − f0 T(x − Δt))² over all samples. */
function chi2Of(data: FoldedData, tpl: TransitTemplate, q: Params, tmp: Float64Array): number {
  const { x, y } = data;
  data.select(tpl, q.dt);
  let c = 0;
  for (let r = 0; r < data.lo.length; r++) {
    for (let i = data.lo[r]; i < data.hi[r]; i++) {
      templateFluxSlope(tpl, x[i] - q.dt, tmp);
      const res = y[i] - q.f0 * tmp[0];
      c += res * res;
    }
  }
  const e = q.f0 - 1;
  return c + data.sumDD - 2 * e * data.sumD + data.nOut * e * e;
}

function clampParams(q: Params): Params {
  const p = Math.min(Math.max(q.p, 1e-4), 0.9);
  const b = Math.min(Math.max(q.b, 0), 1 + p - 1e-3);
  const s = Math.min(Math.max(q.s, 0.2), 5);
  return { p, b, s, dt: q.dt, f0: q.f0 };
}

interface LmResult {
  q: Params;
  /** Fine template at q. */
  fine: TransitTemplate;
  cov: Float64Array;
  chi2: number;
  iterations: number;
  converged: boolean;
}

function runLm(
  data: FoldedData,
  sigma: number,
  g: TemplateGeometry,
  start: Params,
  fitImpact: boolean,
  maxIterations: number,
  scratch: { templates: TemplateWorkspace; colP: Float64Array; colB: Float64Array },
): LmResult {
  // Parameter order: p, [b], s, dt, f0.
  const { x } = data;
  const np = fitImpact ? 5 : 4;
  const tmp = new Float64Array(2);
  const A = new Float64Array(np * np);
  const grad = new Float64Array(np);
  const M = new Float64Array(np * np);
  const delta = new Float64Array(np);
  const cov = new Float64Array(np * np);
  const inv = new Float64Array(np * np);
  const cholesky = new Float64Array(np * np + np);
  const lastCov = new Float64Array(np * np).fill(NaN);
  // The five-column normal equations, and the columns used (b's left out when it is held fixed).
  const full = new Float64Array(25);
  const g5 = new Float64Array(5);
  const cols = fitImpact ? [0, 1, 2, 3, 4] : [0, 2, 3, 4];
  const ws = scratch.templates;
  let lastCovOk = false;
  let q = clampParams(start);
  let atStart = true;
  let tpl = startTemplateFor(g, q, COARSE_STEPS_PER_T14, ws);
  let chi2 = chi2Of(data, tpl, q, tmp);
  let lambda = 1e-3;
  let converged = false;
  let it = 0;
  // p and b columns of the Jacobian, ∂T/∂p and ∂T/∂b at each point (forward differences of rebuilt
  // templates), and the parameters they were computed at. They are recomputed only when p, b, s or Δt
  // has moved by more than REFRESH_SIGMAS of its standard error since. A lagging Jacobian J̃ slows
  // Gauss–Newton convergence slightly (Nocedal & Wright 2006, Numerical Optimization, 2nd ed., §10.3)
  // and moves its fixed point J̃ᵀr = 0 from the least-squares optimum by about (J̃ − J)/J of a standard
  // error: ~1e-3 σ for a 1σ lag here (the columns change by that fraction over 1σ of p or b).
  const { colP, colB } = scratch;
  const ref = new Float64Array(np);
  let haveCols = false;
  const current = new Float64Array(np);
  let stepsPerT14 = COARSE_STEPS_PER_T14;
  const dof = Math.max(1, x.length - np);
  /** Leave the coarse tables: rebuild the current template and its χ² on the iteration tables. */
  const refine = (): void => {
    stepsPerT14 = ITERATION_STEPS_PER_T14;
    tpl = atStart ? startTemplateFor(g, q, stepsPerT14, ws) : templateFor(g, q, stepsPerT14, ws);
    chi2 = chi2Of(data, tpl, q, tmp);
  };
  for (; it < maxIterations; it++) {
    paramVector(q, fitImpact, current);
    // Effective σ: the stated one, or larger when the model does not fit (reduced χ² > 1), so that
    // "a standard error" below means the parameters' actual uncertainty (errors scaled by √χ²_ν;
    // e.g. Press et al. 2007, Numerical Recipes §15.6 [from memory]). Tolerances only, not the errors.
    const sEff = sigma * Math.max(1, Math.sqrt(chi2 / (sigma * sigma * dof)));
    let refresh = !haveCols || !lastCovOk;
    // f0 (last) only scales the columns, which use the current f0: it does not count.
    for (let a = 0; a < np - 1 && !refresh; a++) {
      if (!(Math.abs(current[a] - ref[a]) <= REFRESH_SIGMAS * sEff * Math.sqrt(lastCov[a * np + a]))) refresh = true;
    }
    if (refresh) {
      const dp = 1e-3 * q.p;
      const db = 1e-3;
      const bStep = q.b + db < 1 + q.p - 1e-3 ? db : -db;
      const build = atStart ? startTemplateFor : templateFor;
      const tplP = build(g, { ...q, p: q.p + dp }, stepsPerT14, ws);
      const tplB = fitImpact ? build(g, { ...q, b: q.b + bStep }, stepsPerT14, ws) : null;
      jacobianColumns(data, tpl, tplP, tplB, q.dt, dp, bStep, colP, colB);
      ref.set(current);
      haveCols = true;
    }
    // JᵀJ and Jᵀr over the five columns p, b, s, Δt, f0 (b's column is zero when b is fixed).
    accumulateNormal(data, tpl, colP, colB, fitImpact, q.f0, q.dt, 1 / q.s, full, g5, tmp);
    for (let a = 0; a < np; a++) {
      grad[a] = g5[cols[a]];
      for (let b = 0; b < np; b++) A[a * np + b] = full[cols[a] * 5 + cols[b]];
    }
    const okCov = invertSymmetricPositive(A, np, cov, cholesky);
    lastCov.set(cov);
    lastCovOk = okCov;
    // Converged when the Gauss–Newton step δ = (JᵀJ)⁻¹Jᵀr is below STEP_TOLERANCE of every standard
    // error σ·√((JᵀJ)⁻¹)ₐₐ: the point is the minimum to that tolerance, and no trial is built. On the
    // coarse tables, a Gauss–Newton step predicted to lower χ² by less than COARSE_UNTIL (its drop
    // gᵀ(JᵀJ)⁻¹g) moves to the iteration tables instead.
    if (okCov) {
      let gnSmall = true;
      let gnDrop = 0;
      for (let a = 0; a < np; a++) {
        let d = 0;
        for (let b = 0; b < np; b++) d += cov[a * np + b] * grad[b];
        gnDrop += d * grad[a];
        if (!(Math.abs(d) <= STEP_TOLERANCE * sEff * Math.sqrt(cov[a * np + a]))) gnSmall = false;
      }
      if (stepsPerT14 === COARSE_STEPS_PER_T14 && (gnSmall || gnDrop < COARSE_UNTIL * sEff * sEff)) {
        refine();
        continue;
      }
      if (gnSmall) {
        converged = true;
        it++;
        break;
      }
    }
    // Levenberg–Marquardt step with up to 12 increases of λ.
    let accepted = false;
    let small = false;
    for (let tries = 0; tries < 12; tries++) {
      M.set(A);
      for (let a = 0; a < np; a++) M[a * np + a] = A[a * np + a] * (1 + lambda) + 1e-300;
      if (!solveSymmetricPositive(M, np, grad, delta, inv, cholesky)) {
        lambda *= 10;
        continue;
      }
      // A step whose predicted χ² drop is below the resolution: stop at the current point.
      let predicted = 0;
      for (let a = 0; a < np; a++) {
        let ad = 0;
        for (let b = 0; b < np; b++) ad += A[a * np + b] * delta[b];
        predicted += delta[a] * (2 * grad[a] - ad);
      }
      if (!(predicted > CHI2_RESOLUTION * sEff * sEff)) {
        small = true;
        accepted = true;
        break;
      }
      let c = 0;
      const trial: Params = { ...q };
      trial.p += delta[c++];
      if (fitImpact) trial.b += delta[c++];
      trial.s += delta[c++];
      trial.dt += delta[c++];
      trial.f0 += delta[c++];
      const tq = clampParams(trial);
      const ttpl = templateFor(g, tq, stepsPerT14, ws);
      const tchi2 = chi2Of(data, ttpl, tq, tmp);
      if (tchi2 <= chi2) {
        const relDrop = (chi2 - tchi2) / Math.max(tchi2, 1e-300);
        if (relDrop < 1e-12) small = true;
        q = tq;
        atStart = false;
        tpl = ttpl;
        chi2 = tchi2;
        lambda = Math.max(lambda / 10, 1e-12);
        accepted = true;
        break;
      }
      lambda *= 10;
    }
    if (stepsPerT14 === COARSE_STEPS_PER_T14 && (!accepted || small)) {
      refine();
      continue;
    }
    if (!accepted) {
      // No step lowers χ²: at the minimum to rounding.
      converged = okCov;
      break;
    }
    if (small) {
      converged = true;
      it++;
      break;
    }
  }
  // Covariance: (JᵀWJ)⁻¹ from the last iteration's Jacobian, W = 1/σ². It was evaluated at the returned
  // point (or one accepted step from it, predicted to lower χ² by less than CHI2_RESOLUTION), with p and b
  // columns from within REFRESH_SIGMAS standard errors, where they change by ~1e-3 or less of
  // themselves: the matrix is that of the optimum to far better than the 1 % an error bar needs. The p
  // and b columns are forward differences of tables built on the same nodes, so their interpolation
  // errors largely cancel. The returned template is the last iteration table (at q) when the noise
  // allows it (FINE_BELOW_SIGMA), else one built finer at the optimum.
  const fine =
    sigma < FINE_BELOW_SIGMA || stepsPerT14 !== ITERATION_STEPS_PER_T14 ? templateFor(g, q, FINAL_STEPS_PER_T14, ws) : tpl;
  const chi2Fine = chi2Of(data, fine, q, tmp);
  const w = 1 / (sigma * sigma);
  if (!lastCovOk) converged = false;
  for (let k = 0; k < np * np; k++) cov[k] = lastCov[k] / w;
  return { q, fine, cov, chi2: chi2Fine * w, iterations: it, converged };
}

/**
 * Fit the global transit shape to all points (see the file header).
 * @param timeS mid-exposure times, s since t0
 * @param flux relative flux
 * @param sigma white-noise standard deviation per point (relative flux)
 * @param epoch transit epoch of each point
 * @param geometry starting geometry (and the fixed a/R*, e, ω, u1, u2, exposure)
 * @throws RangeError on mismatched lengths, a non-positive sigma or too few points.
 */
export function globalTransitFit(
  timeS: Float64Array,
  flux: Float64Array,
  sigma: number,
  epoch: Int32Array,
  geometry: TemplateGeometry,
  opts: GlobalFitOptions = {},
): GlobalTransitFit {
  const n = timeS.length;
  if (flux.length !== n) throw new RangeError(`flux.length must equal timeS.length (${n}), got ${flux.length}`);
  if (epoch.length !== n) throw new RangeError(`epoch.length must equal timeS.length (${n}), got ${epoch.length}`);
  if (!(sigma > 0) || !Number.isFinite(sigma)) throw new RangeError(`sigma must be a positive finite number, got ${sigma}`);
  if (n < 10) throw new RangeError(`globalTransitFit needs at least 10 points, got ${n}`);
  const eph = opts.ephemeris ?? { t0S: 0, periodS: geometry.periodS };
  if (!(eph.periodS > 0) || !Number.isFinite(eph.periodS)) throw new RangeError(`ephemeris.periodS must be positive, got ${eph.periodS}`);
  if (!Number.isFinite(eph.t0S)) throw new RangeError(`ephemeris.t0S must be finite, got ${eph.t0S}`);
  const fitImpact = opts.fitImpact ?? true;
  const maxIterations = opts.maxIterations ?? 60;

  // Folded times and finite data only.
  let m = 0;
  for (let i = 0; i < n; i++) if (Number.isFinite(flux[i]) && Number.isFinite(timeS[i])) m++;
  const ws = opts.workspace ?? new GlobalFitWorkspace();
  const [xBuf, yBuf, cumD, cumDD, colP, colB] = ws.samples(m);
  const x = xBuf.subarray(0, m);
  const y = yBuf.subarray(0, m);
  for (let i = 0, j = 0; i < n; i++) {
    if (!(Number.isFinite(flux[i]) && Number.isFinite(timeS[i]))) continue;
    x[j] = timeS[i] - (eph.t0S + epoch[i] * eph.periodS);
    y[j] = flux[i];
    j++;
  }
  const start: Params = { p: geometry.radiusRatio, b: geometry.impactParameter, s: geometry.timeScale ?? 1, dt: 0, f0: 1 };
  const data = new FoldedData(x, y, cumD, cumDD);
  const scratch = { templates: ws.templates, colP: colP.subarray(0, m), colB: colB.subarray(0, m) };
  let res = runLm(data, sigma, geometry, start, fitImpact, maxIterations, scratch);
  let impactFixed = !fitImpact;
  let impactNote = fitImpact ? '' : 'held fixed at the input value (fitImpact = false)';
  if (fitImpact) {
    const sb = Math.sqrt(res.cov[1 * 5 + 1]);
    if (!res.converged || !(sb <= 0.3)) {
      impactNote = !res.converged
        ? 'held fixed at the input value: the fit with free b did not converge'
        : `held fixed at the input value: b undetermined (σ_b = ${sb.toPrecision(3)} > 0.3)`;
      impactFixed = true;
      res = runLm(data, sigma, geometry, start, false, maxIterations, scratch);
    }
  }
  const np = impactFixed ? 4 : 5;
  const se = (k: number) => Math.sqrt(res.cov[k * np + k]);
  const off = impactFixed ? 0 : 1;
  const q = res.q;
  const template = res.fine;
  return {
    radiusRatio: q.p,
    radiusRatioErr: se(0),
    impactParameter: q.b,
    impactParameterErr: impactFixed ? NaN : se(1),
    impactFixed,
    impactNote,
    timeScale: q.s,
    timeScaleErr: se(1 + off),
    offsetS: q.dt,
    offsetErrS: se(2 + off),
    baseline: q.f0,
    baselineErr: se(3 + off),
    chi2: res.chi2,
    nPoints: m,
    iterations: res.iterations,
    converged: res.converged,
    template,
  };
}

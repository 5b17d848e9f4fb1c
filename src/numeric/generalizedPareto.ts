/**
 * The generalised Pareto distribution (GPD) and a fit of a sample's upper tail.
 *
 * Distribution (Pickands 1975, Ann. Stat. 3, 119; the parametrisation of
 * scipy.stats.genpareto with shape c = ξ): for an excess y ≥ 0 over a
 * threshold, scale σ > 0 and shape ξ,
 *   S(y) = P(Y > y) = (1 + ξ y/σ)^(−1/ξ)   (ξ ≠ 0),   exp(−y/σ)   (ξ = 0),
 * with support y ≥ 0 for ξ ≥ 0 and 0 ≤ y ≤ −σ/ξ for ξ < 0 (ξ = −1 is the
 * uniform distribution on [0, σ], ξ = 0 the exponential). Quantile at survival
 * probability q: y = σ (q^(−ξ) − 1)/ξ, or −σ ln q at ξ = 0. Written with
 * log1p/expm1 so that |ξ| → 0 joins the exponential smoothly.
 *
 * Estimators of (ξ, σ) from excesses y₁ … y_m (all > 0):
 * - 'pwm', probability-weighted moments (Hosking & Wallis 1987, Technometrics
 *   29, 339, eqs. 5–6 with their k = −ξ): with a₀ the mean and
 *   a₁ = m⁻¹ Σ_j y_(j) (m − j)/(m − 1) (ascending order statistics; the
 *   unbiased estimator of E[Y (1 − F(Y))], Landwehr, Matalas & Wallis 1979,
 *   Water Resour. Res. 15, 1055),
 *   ξ̂ = 2 − a₀/(a₀ − 2a₁),  σ̂ = 2a₀a₁/(a₀ − 2a₁).
 *   Closed form, always defined (ξ̂ < 1); Hosking & Wallis recommend it for
 *   ξ < 1/2 (the estimator's variance is finite there), where it is as good
 *   as or better than maximum likelihood for samples below ~500. For ξ < 0 the
 *   fitted end point −σ̂/ξ̂ can fall below the largest excess (a known defect:
 *   the goodness-of-fit check then rejects the fit).
 * - 'ml', maximum likelihood by Grimshaw's (1993, Technometrics 35, 185)
 *   reduction to one dimension: with θ = ξ/σ, the likelihood is maximised over
 *   ξ for fixed θ by ξ(θ) = m⁻¹ Σ ln(1 + θ y_i), σ = ξ(θ)/θ, and the profile
 *   log-likelihood ℓ(θ) = −m [ln(ξ(θ)/θ) + ξ(θ) + 1] (θ → 0: the exponential,
 *   σ = ȳ) is maximised numerically (a log-spaced grid in θ, then golden
 *   section between the best point's neighbours). θ is restricted to ξ(θ) ≥ −1
 *   (for ξ < −1 the likelihood is unbounded; Grimshaw 1993, §2), and to
 *   θ·max(y) ≤ 1e8. The estimator has its usual asymptotic properties for
 *   ξ > −1/2 (Smith 1985, Biometrika 72, 67).
 *
 * Tail of a sample (Knijnenburg, Wessels, Reinders & Shmulevich 2009,
 * Bioinformatics 25, i161, "Fewer permutations, more accurate P-values"):
 * from n values, the N_exc largest define the threshold u halfway between the
 * N_exc-th and (N_exc + 1)-th largest; the GPD is fitted to the excesses over
 * u, its fit is checked by the Anderson–Darling statistic (Choulakian &
 * Stephens 2001, Technometrics 43, 478, eq. 3), and N_exc starts at 250 and
 * drops by 10 until the check passes at the 5 % level. Then
 *   P(X > x) ≈ (N_exc/n) S(x − u)  for x ≥ u,
 * and the value exceeded with probability p ≤ N_exc/n is u + y(q = p n/N_exc).
 * The check's p-value here is a parametric bootstrap of the statistic with the
 * parameters refitted on each replicate (Stute, Manteiga & Quindimil 1993,
 * Metrika 40, 243), since Choulakian & Stephens' table is not reproduced here,
 * stopped as soon as acceptance at the level is certain (Besag & Clifford 1991);
 * its uniform deviates are an argument (a seeded source), so a fit is
 * reproducible.
 */
import { goldenSectionMaximum, type ScalarObjective } from './goldenSection.js';

/** Shape below which |ξ| is treated as 0 in the closed forms (the log1p/expm1 forms are exact to rounding there). */
const XI_ZERO = 1e-12;

/**
 * GPD survival S(y) = P(Y > y) of an excess y (see the file comment). 1 for y ≤ 0, 0 beyond the
 * upper end point −σ/ξ when ξ < 0. NaN for σ ≤ 0 or a non-finite argument.
 */
export function gpdSurvival(y: number, shape: number, scale: number): number {
  if (!(scale > 0) || !Number.isFinite(shape) || Number.isNaN(y)) return NaN;
  if (y <= 0) return 1;
  const t = (shape * y) / scale;
  if (Math.abs(shape) < XI_ZERO) return Math.exp(-y / scale);
  if (t <= -1) return 0;
  return Math.exp(-Math.log1p(t) / shape);
}

/** GPD cumulative distribution F(y) = 1 − S(y), computed without cancellation for small y. */
export function gpdCdf(y: number, shape: number, scale: number): number {
  if (!(scale > 0) || !Number.isFinite(shape) || Number.isNaN(y)) return NaN;
  if (y <= 0) return 0;
  const t = (shape * y) / scale;
  if (Math.abs(shape) < XI_ZERO) return -Math.expm1(-y / scale);
  if (t <= -1) return 1;
  return -Math.expm1(-Math.log1p(t) / shape);
}

/**
 * The excess exceeded with probability q: y = σ (q^(−ξ) − 1)/ξ (−σ ln q at ξ = 0). q = 1 gives 0,
 * q = 0 the upper end point (∞ for ξ ≥ 0). NaN for q outside [0, 1] or σ ≤ 0.
 */
export function gpdSurvivalQuantile(q: number, shape: number, scale: number): number {
  if (!(scale > 0) || !Number.isFinite(shape) || !(q >= 0 && q <= 1)) return NaN;
  if (q === 1) return 0;
  if (q === 0) return shape < 0 ? -scale / shape : Infinity;
  if (Math.abs(shape) < XI_ZERO) return -scale * Math.log(q);
  return (scale * Math.expm1(-shape * Math.log(q))) / shape;
}

/** GPD quantile at cumulative probability p (p = F(y)). */
export function gpdQuantile(p: number, shape: number, scale: number): number {
  if (!(p >= 0 && p <= 1)) return NaN;
  return gpdSurvivalQuantile(1 - p, shape, scale);
}

export type GpdEstimator = 'pwm' | 'ml';

export interface GpdParameters {
  shape: number;
  scale: number;
}

function checkExcesses(y: ArrayLike<number>, least: number): void {
  if (y.length < least) throw new RangeError(`excesses must hold at least ${least} values, got ${y.length}`);
  for (let i = 0; i < y.length; i++) {
    if (!(y[i] > 0) || !Number.isFinite(y[i])) throw new RangeError(`excesses[${i}] must be finite and > 0, got ${y[i]}`);
  }
}

/**
 * Probability-weighted-moment fit (Hosking & Wallis 1987, eqs. 5–6; see the file comment) of excesses
 * y > 0 (any order).
 * @throws RangeError for fewer than 2 excesses, a non-positive or non-finite one, or all equal.
 */
export function fitGpdPwm(excesses: ArrayLike<number>): GpdParameters {
  checkExcesses(excesses, 2);
  const y = Float64Array.from(excesses).sort();
  const m = y.length;
  let a0 = 0;
  let a1 = 0;
  for (let j = 1; j <= m; j++) {
    a0 += y[j - 1];
    a1 += (y[j - 1] * (m - j)) / (m - 1);
  }
  a0 /= m;
  a1 /= m;
  const d = a0 - 2 * a1;
  if (!(d > 0)) throw new RangeError('excesses must not all be equal (the PWM fit needs a spread)');
  return { shape: 2 - a0 / d, scale: (2 * a0 * a1) / d };
}

/** ξ(θ) = m⁻¹ Σ ln(1 + θ y_i) (Grimshaw 1993). */
function xiOfTheta(y: Float64Array, theta: number): number {
  let s = 0;
  for (let i = 0; i < y.length; i++) s += Math.log1p(theta * y[i]);
  return s / y.length;
}

/** The profile log-likelihood per excess, −[ln(ξ(θ)/θ) + ξ(θ) + 1], as a function of u with θ = u/ȳ. */
class ProfileLikelihood implements ScalarObjective {
  constructor(private readonly y: Float64Array, private readonly mean: number) {}
  valueAt(u: number): number {
    const theta = u / this.mean;
    if (Math.abs(u) < 1e-9) return -(Math.log(this.mean) + 1);
    const xi = xiOfTheta(this.y, theta);
    const sigma = xi / theta;
    if (!(sigma > 0) || xi < -1) return -Infinity;
    return -(Math.log(sigma) + xi + 1);
  }
}

/**
 * Maximum-likelihood fit by Grimshaw's (1993) one-dimensional profile (see the file comment) of
 * excesses y > 0 (any order); the shape is restricted to ξ ≥ −1.
 * @throws RangeError for fewer than 3 excesses, a non-positive or non-finite one, or all equal.
 */
export function fitGpdMl(excesses: ArrayLike<number>): GpdParameters {
  checkExcesses(excesses, 3);
  const y = Float64Array.from(excesses).sort();
  const m = y.length;
  let mean = 0;
  for (let i = 0; i < m; i++) mean += y[i];
  mean /= m;
  const max = y[m - 1];
  if (!(max > y[0])) throw new RangeError('excesses must not all be equal (the ML fit needs a spread)');
  // u = θ ȳ. Lower end: ξ(θ) = −1 (ξ decreases to −∞ as θ → −1/max), found by bisection on (−ȳ/max, 0).
  let lo = -mean / max;
  let hi = 0;
  for (let it = 0; it < 200; it++) {
    const mid = 0.5 * (lo + hi);
    if (xiOfTheta(y, mid / mean) < -1) lo = mid;
    else hi = mid;
  }
  const uMin = hi;
  const uMax = 1e8 * (mean / max);
  const f = new ProfileLikelihood(y, mean);
  // Grid: u in [uMin, 0) crowding towards both ends (uMin(1 − 10^−e) and uMin·10^−e, e in (0, 6]),
  // 0, and (0, uMax] log-spaced from 1e-6 ȳ/max.
  const grid: number[] = [0];
  for (let i = 1; i <= 60; i++) grid.push(uMin * (1 - Math.pow(10, -0.1 * i)), uMin * Math.pow(10, -0.1 * i));
  for (let i = 0; i <= 140; i++) grid.push(Math.pow(10, -6 + 0.1 * i) * (mean / max));
  grid.sort((a, b) => a - b);
  let best = 0;
  let bestValue = -Infinity;
  for (let i = 0; i < grid.length; i++) {
    const v = f.valueAt(grid[i]);
    if (v > bestValue) {
      bestValue = v;
      best = i;
    }
  }
  const a = grid[Math.max(0, best - 1)];
  const b = grid[Math.min(grid.length - 1, best + 1)];
  const top = goldenSectionMaximum(f, a, b, 1e-13 * Math.max(1, Math.abs(a), Math.abs(b)), 200);
  const u = top.value >= bestValue ? top.x : grid[best];
  if (Math.abs(u) < 1e-9) return { shape: 0, scale: mean };
  const theta = u / mean;
  const xi = xiOfTheta(y, theta);
  return { shape: xi, scale: xi / theta };
}

/** Fit by the named estimator. */
export function fitGpd(excesses: ArrayLike<number>, estimator: GpdEstimator): GpdParameters {
  return estimator === 'ml' ? fitGpdMl(excesses) : fitGpdPwm(excesses);
}

/**
 * Anderson–Darling statistic of excesses against a GPD (Choulakian & Stephens 2001, eq. 3; Anderson &
 * Darling 1954, JASA 49, 765): with z_(i) = F(y_(i)) ascending,
 * A² = −m − m⁻¹ Σ_i (2i − 1)[ln z_(i) + ln(1 − z_(m+1−i))]. +∞ when an excess lies at or beyond the
 * fitted end point (F = 1) or at 0.
 */
export function andersonDarlingGpd(excesses: ArrayLike<number>, shape: number, scale: number): number {
  const m = excesses.length;
  if (m === 0) return NaN;
  const y = Float64Array.from(excesses).sort();
  let s = 0;
  for (let i = 1; i <= m; i++) {
    const lowLog = Math.log(gpdCdf(y[i - 1], shape, scale));
    const highLog = Math.log(gpdSurvival(y[m - i], shape, scale));
    s += (2 * i - 1) * (lowLog + highLog);
  }
  const a2 = -m - s / m;
  return Number.isNaN(a2) ? Infinity : a2;
}

/** A seeded source of uniform deviates on [0, 1) (noise/rng.ts's Rng is one). */
export interface UniformSource {
  uniform(): number;
}

/**
 * Bootstrap p-value of the Anderson–Darling statistic with estimated parameters: `replicates` samples of
 * the fitted GPD, each refitted by the same estimator; p = (1 + #{A²* ≥ A²})/(replicates + 1) (Davison &
 * Hinkley 1997, Bootstrap Methods and their Application, eq. 4.11; Stute, Manteiga & Quindimil 1993).
 * With `stopAtLevel`, the replicates stop as soon as p ≥ stopAtLevel is certain (the count can only
 * grow), so the decision at that level is the full test's (a sequential Monte Carlo test in the manner of
 * Besag & Clifford 1991, Biometrika 78, 301); the p-value returned is then a lower bound.
 */
export function andersonDarlingGpdPValue(
  excesses: ArrayLike<number>,
  fit: GpdParameters,
  estimator: GpdEstimator,
  replicates: number,
  rng: UniformSource,
  stopAtLevel?: number,
): { statistic: number; pValue: number } {
  const a2 = andersonDarlingGpd(excesses, fit.shape, fit.scale);
  if (!Number.isFinite(a2)) return { statistic: a2, pValue: 0 };
  const m = excesses.length;
  const sample = new Float64Array(m);
  let atLeast = 0;
  for (let b = 0; b < replicates; b++) {
    for (let i = 0; i < m; i++) {
      // 1 − U on (0, 1]: a survival probability; its quantile is finite except at q = 0 (never drawn).
      const y = gpdSurvivalQuantile(1 - rng.uniform(), fit.shape, fit.scale);
      sample[i] = y > 0 ? y : Number.MIN_VALUE;
    }
    let f: GpdParameters;
    try {
      f = fitGpd(sample, estimator);
    } catch {
      atLeast++; // a degenerate replicate counts against the fit (conservative)
      continue;
    }
    if (andersonDarlingGpd(sample, f.shape, f.scale) >= a2) atLeast++;
    if (stopAtLevel !== undefined && (1 + atLeast) / (replicates + 1) >= stopAtLevel) break;
  }
  return { statistic: a2, pValue: (1 + atLeast) / (replicates + 1) };
}

export interface TailFitOptions {
  /** Estimator (default 'pwm'). */
  estimator?: GpdEstimator;
  /** Largest number of exceedances tried first (default min(250, ⌊n/2⌋); Knijnenburg et al. 2009 start at 250). */
  maxExceedances?: number;
  /** Fewest exceedances accepted (default 20); below it the last fit is kept, marked not accepted. */
  minExceedances?: number;
  /** Step by which the exceedance count drops after a rejected fit (default 10, as Knijnenburg et al.). */
  step?: number;
  /** Level of the goodness-of-fit check (default 0.05). */
  level?: number;
  /** Bootstrap replicates of the check (default 99); 0 or no `rng` skips the check (the first fit is kept). */
  replicates?: number;
  rng?: UniformSource;
}

/** A GPD fitted to a sample's upper tail. */
export interface TailFit extends GpdParameters {
  /** Threshold u (halfway between the N_exc-th and (N_exc + 1)-th largest values). */
  threshold: number;
  /** N_exc: values above u. */
  exceedances: number;
  /** n: the whole sample. */
  total: number;
  estimator: GpdEstimator;
  /** Anderson–Darling statistic and its bootstrap p-value (NaN when not checked; when accepted, a lower bound: the replicates stop once p ≥ level is certain). */
  adStatistic: number;
  adPValue: number;
  /** Whether the goodness-of-fit check passed (true when not checked). */
  accepted: boolean;
}

/**
 * Fit a GPD to the upper tail of an ascending-sorted sample (Knijnenburg et al. 2009; see the file
 * comment).
 * @throws RangeError for fewer than 3 values, an unsorted or non-finite sample, or bad options.
 */
export function fitUpperTail(sorted: Float64Array, options: TailFitOptions = {}): TailFit {
  const n = sorted.length;
  if (n < 4) throw new RangeError(`sorted must hold at least 4 values, got ${n}`);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(sorted[i])) throw new RangeError(`sorted[${i}] must be finite, got ${sorted[i]}`);
    if (i > 0 && sorted[i] < sorted[i - 1]) throw new RangeError(`sorted must be ascending (index ${i})`);
  }
  const estimator = options.estimator ?? 'pwm';
  if (estimator !== 'pwm' && estimator !== 'ml') throw new RangeError(`estimator must be 'pwm' or 'ml', got ${String(estimator)}`);
  const maxExc = options.maxExceedances ?? Math.min(250, Math.floor(n / 2));
  const minExc = options.minExceedances ?? Math.min(20, maxExc);
  const step = options.step ?? 10;
  const level = options.level ?? 0.05;
  const replicates = options.replicates ?? 99;
  if (!(Number.isInteger(maxExc) && maxExc >= 3 && maxExc < n)) throw new RangeError(`maxExceedances must be an integer in [3, n − 1 = ${n - 1}], got ${maxExc}`);
  if (!(Number.isInteger(minExc) && minExc >= 3 && minExc <= maxExc)) throw new RangeError(`minExceedances must be an integer in [3, maxExceedances = ${maxExc}], got ${minExc}`);
  if (!(Number.isInteger(step) && step >= 1)) throw new RangeError(`step must be an integer ≥ 1, got ${step}`);
  if (!(level > 0 && level < 1)) throw new RangeError(`level must be in (0, 1), got ${level}`);
  if (!(Number.isInteger(replicates) && replicates >= 0)) throw new RangeError(`replicates must be an integer ≥ 0, got ${replicates}`);
  const check = replicates > 0 && options.rng !== undefined;
  let last: TailFit | null = null;
  for (let m = maxExc; m >= minExc; m -= step) {
    const u = 0.5 * (sorted[n - m] + sorted[n - m - 1]);
    const excess = new Float64Array(m);
    for (let i = 0; i < m; i++) excess[i] = sorted[n - m + i] - u;
    // Ties at the threshold give a zero excess; the GPD has no mass there, so such a split is skipped.
    if (!(excess[0] > 0) || !(excess[m - 1] > excess[0])) continue;
    const fit = fitGpd(excess, estimator);
    const gof = check ? andersonDarlingGpdPValue(excess, fit, estimator, replicates, options.rng!, level) : { statistic: NaN, pValue: NaN };
    last = { ...fit, threshold: u, exceedances: m, total: n, estimator, adStatistic: gof.statistic, adPValue: gof.pValue, accepted: !check || gof.pValue >= level };
    if (last.accepted) return last;
  }
  if (last === null) throw new RangeError('sorted has too many ties in its upper tail for a tail fit');
  return last;
}

/** P(X > x) from a tail fit: (N_exc/n) S(x − u) for x ≥ u; NaN below u (use the empirical fraction there). */
export function tailSurvival(fit: TailFit, x: number): number {
  if (Number.isNaN(x) || x < fit.threshold) return NaN;
  return (fit.exceedances / fit.total) * gpdSurvival(x - fit.threshold, fit.shape, fit.scale);
}

/** The value exceeded with probability p from a tail fit: u + y(p n/N_exc); NaN when p is outside (0, N_exc/n]. */
export function tailQuantile(fit: TailFit, p: number): number {
  const q = (p * fit.total) / fit.exceedances;
  if (!(p > 0) || !(q <= 1)) return NaN;
  return fit.threshold + gpdSurvivalQuantile(q, fit.shape, fit.scale);
}

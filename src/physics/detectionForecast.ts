/**
 * Analytic forecast of the probability of detecting a moon's TTV and TDV.
 *
 * Statistics (white Gaussian timing errors, known σ):
 * - TTV: χ²_TTV = Σ (t_n − t̂_n)²/σ_tc² about the least-squares linear
 *   ephemeris t̂_n = t0 + nP; N − 2 degrees of freedom.
 * - TDV: χ²_TDV = Σ (T_n − T̄)²/σ_T² about the mean duration; N − 1 dof.
 * - Joint: χ²_TTV + χ²_TDV (independent errors); 2N − 3 dof.
 * Without a moon each is central chi-square; with a signal s_n it is
 * noncentral chi-square with noncentrality λ = |(1 − H)s|²/σ², H the hat
 * matrix of the fitted model (Johnson, Kotz & Balakrishnan 1995, Continuous
 * Univariate Distributions vol. 2, ch. 29; the standard quadratic-form
 * result, e.g. Seber & Lee 2003, Linear Regression Analysis, 2nd ed., §2.4).
 *
 * Two modes.
 *
 * 1. Alias frequency unknown (default). Approximation (stated): for a
 *    sinusoidal TTV of rms δ_TTV, |s|² ≈ N δ_TTV², and the fitted ephemeris
 *    absorbs the share 2/N of it, so
 *      λ_TTV ≈ N (δ_TTV/σ_tc)² (N − 2)/N = (N − 2)(δ_TTV/σ_tc)²,
 *      λ_TDV ≈ (N − 1)(δ_TDV/σ_T)²,  λ_joint = λ_TTV + λ_TDV,
 *    and the probability is evaluated at this λ. The share 2/N is exact on
 *    average over the signal's phase and over an alias frequency uniform on
 *    [0, ½] cycles/epoch (Parseval: over all frequencies a sinusoid is
 *    isotropic; checked numerically in the test), which is the uniform
 *    fractional-part assumption behind Kipping 2021 (MNRAS 500, 1851). For a
 *    given frequency it can be far off: a signal at ν ≈ 0.3–0.5 is nearly
 *    orthogonal to a line (λ → N δ²/σ², forecast pessimistic), one with
 *    ν·N ≲ 1 is largely absorbed (forecast optimistic).
 * 2. Alias frequency ν given (cycles per epoch, from `ttvAlias`): TTV_n =
 *    A sin(2πνn + φ), TDV_n = −B cos(2πνn + φ), A = √2 δ_TTV, B = √2 δ_TDV.
 *    λ(φ) is computed exactly from the residuals of sin(2πνn) and cos(2πνn)
 *    after the fits, and the detection probability is averaged over a uniform
 *    phase φ (trapezoid rule on λ's period π, 64 nodes; spectrally accurate for
 *    this smooth periodic integrand). The reported noncentrality is the
 *    phase mean of λ(φ).
 *
 * In both modes the false-alarm threshold is the central chi-square upper α
 * quantile and the detection probability is the noncentral chi-square
 * survival function at that threshold.
 *
 * Combined: the Monte Carlo's decision rule (timing/detection.ts) forecast
 * for the channels modelled here, the timing channels. The Monte Carlo joins
 * TTV, TDV, the moon dip and the photodynamical template channel by a
 * weighted min-p rule (COMBINED_RULE_WEIGHTS); to first order that tests
 * channel c at α·w_c/Σw over the channels that exist (weighted Bonferroni,
 * Genovese, Roeder & Wasserman 2006, Biometrika 93, 509; the rule calibrated
 * on no-moon realizations is a little less conservative), so each timing
 * channel is tested at `timingChannelAlpha(α, N)`, and a detection in either counts:
 *   P = 1 − Π (1 − P_ch)      over TTV and TDV,
 * independent channels (under white noise the fitted mid-time and duration
 * of a symmetric transit are uncorrelated: Carter et al. 2008, ApJ 689, 499,
 * §3, their Fisher matrix). In mode 2 the product is formed at each signal
 * phase φ (TTV and TDV share it) and then averaged. The moon-dip and
 * template channels are not forecast here: their share of the combined
 * probability is missing, so the combined forecast is a lower estimate, and
 * the template channel usually carries most of the signal. Its ideal, the
 * known-template bound (`pdet_bound`, timing/knownTemplateBound.ts), is the
 * upper estimate: the Monte Carlo's combined probability lies between them.
 *
 * Few transits. A channel exists only with at least one degree of freedom
 * left after its fit (a χ² with 0 dof is identically 0 and carries no
 * information, Seber & Lee 2003 §2.4):
 *   N = 2: no TTV channel (the line t0 + nP passes exactly through two
 *          mid-times, N − 2 = 0 dof); the TDV channel has N − 1 = 1 dof (the
 *          difference of the two durations), and the joint test is that TDV
 *          test alone (2N − 3 = 1 dof).
 *   N = 1: no timing channel at all (one mid-time defines the epoch, one
 *          duration defines the mean); only the moon's own dip, which this
 *          forecast does not model, could show the moon.
 * An absent channel is null, with the reason in `notes`.
 */

import { chiSquareUpperQuantile, noncentralChiSquareSurvival } from '../numeric/noncentralChiSquare.js';

export interface DetectionForecastInput {
  /** Number of observed transits N (≥ 1; see "Few transits" in the header for N < 3). */
  nTransits: number;
  /** Per-transit mid-time uncertainty σ_tc, s. */
  sigmaTcS: number;
  /** Per-transit duration uncertainty σ_T, s. */
  sigmaDurS: number;
  /** TTV rms δ_TTV, s. */
  ttvRmsS: number;
  /** TDV rms δ_TDV, s. */
  tdvRmsS: number;
  /** False-alarm probability α of each test, 0 < α < 1. */
  falseAlarm: number;
  /** Optional alias frequency ν of the TTV/TDV signal, cycles per epoch in [0, ½] (mode 2). */
  aliasFrequencyPerEpoch?: number;
  /** Channels the combined rule joins at α/m each (Bonferroni); default: the Monte Carlo's weighted rule (`timingChannelAlpha`). */
  combinedChannels?: number;
}

export interface ChannelForecast {
  /** χ² threshold: central chi-square upper α quantile. */
  threshold: number;
  /** Noncentrality λ. */
  noncentrality: number;
  /** Degrees of freedom. */
  dof: number;
  /** Detection probability Pr(χ² > threshold | λ). */
  probability: number;
}

export interface DetectionForecast {
  /** Null with fewer than 3 transits (no degree of freedom left after the linear ephemeris). */
  ttv: ChannelForecast | null;
  /** Null with fewer than 2 transits. */
  tdv: ChannelForecast | null;
  /** χ²_TTV + χ²_TDV over the channels that exist; null when none does. */
  joint: ChannelForecast | null;
  /** The Monte Carlo's combined rule over TTV and TDV (see "Combined" in the header); null when neither exists. */
  combined: number | null;
  /** Why a channel is absent (empty when all three exist). */
  notes: string[];
}

/** The one-line form of `missingChannelNotes` (for a table cell); null for N ≥ 3. */
export function missingChannelSummary(n: number): string | null {
  if (n >= 3) return null;
  return n === 2
    ? 'no TTV channel with 2 transits (a linear ephemeris fits 2 mid-times exactly); TDV (1 degree of freedom) and moon dip only'
    : `no timing channel with ${n} transit; moon dip only`;
}

/** Why the timing channels that N transits cannot measure are absent (empty for N ≥ 3). */
export function missingChannelNotes(n: number): string[] {
  if (n >= 3) return [];
  if (n === 2) {
    return ['no timing channel with 2 transits: a linear ephemeris (2 free parameters) fits 2 mid-times exactly, so there is no TTV test; the TDV test has 1 degree of freedom (the difference of the two durations) and the joint forecast is that TDV test alone; the moon dip is not forecast (Monte Carlo only)'];
  }
  return [`no timing channel with ${n} transit: one mid-time and one duration leave no degree of freedom for a TTV or TDV test; only the moon's own dip (not forecast here; Monte Carlo only) could show a moon`];
}

/**
 * The combination rule the Monte Carlo applies (timing/detection.ts): the one
 * place to switch when it changes. 'bonferroni': each of m channels at α/m
 * (Bonferroni 1936; Pr(any) ≤ α whatever the correlation). 'sidak': each at
 * 1 − (1 − α)^(1/m), the level at which m independent channels together
 * false-alarm at exactly α (Šidák 1967, JASA 62, 626) — what a min-p rule
 * calibrated directly on no-moon realizations reaches for independent channels.
 */
export type CombinationRule = 'bonferroni' | 'sidak';
export const MONTE_CARLO_COMBINATION: CombinationRule = 'bonferroni';

/**
 * Weights of the Monte Carlo's combined rule (timing/detection.ts, applied in sweep/runCell.ts): the
 * template channel is the likelihood ratio of the whole light curve for the cell's moon (most powerful
 * on average over its phase for white noise: timing/templateSearch.ts), so it carries most of α; the
 * summary channels keep a small share each, a guard against what the templates leave out (red noise,
 * model mismatch). A choice of this program, normalised over the channels that exist.
 */
export const COMBINED_RULE_WEIGHTS = { template: 0.85, ttv: 0.05, tdv: 0.05, dip: 0.05 } as const;

/** Level at which the combined rule tests each timing channel to first order: α·w/Σw over the channels N transits allow. */
export function timingChannelAlpha(alpha: number, nTransits: number): number {
  const w = COMBINED_RULE_WEIGHTS;
  const total = w.template + w.dip + (nTransits >= 2 ? w.tdv : 0) + (nTransits >= 3 ? w.ttv : 0);
  return (alpha * w.ttv) / total;
}

/** Per-channel false-alarm level of the combined rule over m channels. */
export function combinedChannelAlpha(alpha: number, m: number, rule: CombinationRule = MONTE_CARLO_COMBINATION): number {
  if (!(m >= 1)) throw new RangeError(`m must be ≥ 1; got ${m}`);
  return rule === 'bonferroni' ? alpha / m : -Math.expm1(Math.log1p(-alpha) / m);
}

/** Probability that at least one of independent channels detects: 1 − Π(1 − p). */
export function anyOfIndependent(ps: readonly number[]): number {
  let miss = 1;
  for (const p of ps) miss *= 1 - p;
  return 1 - miss;
}

function channel(dof: number, noncentrality: number, falseAlarm: number): ChannelForecast {
  const threshold = chiSquareUpperQuantile(falseAlarm, dof);
  return { threshold, noncentrality, dof, probability: noncentralChiSquareSurvival(threshold, dof, noncentrality) };
}

/** Quadratic form of λ(φ) = a cos²φ + b sin²φ + 2c sinφ cosφ. */
interface PhaseQuadratic { a: number; b: number; c: number }

/**
 * Residual inner products of u = sin(2πνn), v = cos(2πνn), n = 0…N−1, after
 * removing the least-squares fit of span{1, n} (removeSlope) or of span{1}.
 */
function residualProducts(n: number, nu: number, removeSlope: boolean): { uu: number; vv: number; uv: number } {
  const w = 2 * Math.PI * nu;
  const xm = (n - 1) / 2;
  let mu = 0, mv = 0, sxx = 0, sxu = 0, sxv = 0;
  for (let k = 0; k < n; k++) {
    mu += Math.sin(w * k);
    mv += Math.cos(w * k);
  }
  mu /= n;
  mv /= n;
  if (removeSlope) {
    for (let k = 0; k < n; k++) {
      const x = k - xm;
      sxx += x * x;
      sxu += x * (Math.sin(w * k) - mu);
      sxv += x * (Math.cos(w * k) - mv);
    }
  }
  const bu = removeSlope ? sxu / sxx : 0;
  const bv = removeSlope ? sxv / sxx : 0;
  let uu = 0, vv = 0, uv = 0;
  for (let k = 0; k < n; k++) {
    const x = k - xm;
    const ru = Math.sin(w * k) - mu - bu * x;
    const rv = Math.cos(w * k) - mv - bv * x;
    uu += ru * ru;
    vv += rv * rv;
    uv += ru * rv;
  }
  return { uu, vv, uv };
}

const PHASE_NODES = 64;

/** Channel forecast averaged over a uniform signal phase φ (mode 2 in the header). */
function phaseAveragedChannel(dof: number, q: PhaseQuadratic, falseAlarm: number): ChannelForecast {
  const threshold = chiSquareUpperQuantile(falseAlarm, dof);
  let p = 0;
  let lam = 0;
  for (let j = 0; j < PHASE_NODES; j++) {
    const phi = (Math.PI * j) / PHASE_NODES;
    const c = Math.cos(phi), s = Math.sin(phi);
    const l = Math.max(0, q.a * c * c + q.b * s * s + 2 * q.c * s * c);
    lam += l;
    p += noncentralChiSquareSurvival(threshold, dof, l);
  }
  return { threshold, noncentrality: lam / PHASE_NODES, dof, probability: p / PHASE_NODES };
}

/** The combined rule averaged over a uniform phase φ (mode 2): TTV and TDV at the same φ, joined per φ. */
function phaseAveragedCombined(qTtv: PhaseQuadratic | null, dofTtv: number, qTdv: PhaseQuadratic, dofTdv: number, level: number): number {
  const tTtv = qTtv ? chiSquareUpperQuantile(level, dofTtv) : NaN;
  const tTdv = chiSquareUpperQuantile(level, dofTdv);
  let p = 0;
  for (let j = 0; j < PHASE_NODES; j++) {
    const phi = (Math.PI * j) / PHASE_NODES;
    const c = Math.cos(phi), s = Math.sin(phi);
    const lam = (q: PhaseQuadratic): number => Math.max(0, q.a * c * c + q.b * s * s + 2 * q.c * s * c);
    const pTdv = noncentralChiSquareSurvival(tTdv, dofTdv, lam(qTdv));
    const pTtv = qTtv ? noncentralChiSquareSurvival(tTtv, dofTtv, lam(qTtv)) : 0;
    p += anyOfIndependent([pTtv, pTdv]);
  }
  return p / PHASE_NODES;
}

/** Forecast TTV, TDV, joint and combined detection probabilities (see the file header). */
export function forecastDetection(input: DetectionForecastInput): DetectionForecast {
  const { nTransits: n, sigmaTcS, sigmaDurS, ttvRmsS, tdvRmsS, falseAlarm } = input;
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`nTransits must be an integer ≥ 1; got ${n}`);
  for (const [name, v] of [['sigmaTcS', sigmaTcS], ['sigmaDurS', sigmaDurS]] as const) {
    if (!(v > 0) || !Number.isFinite(v)) throw new RangeError(`${name} must be a positive finite number; got ${v}`);
  }
  for (const [name, v] of [['ttvRmsS', ttvRmsS], ['tdvRmsS', tdvRmsS]] as const) {
    if (!(v >= 0) || !Number.isFinite(v)) throw new RangeError(`${name} must be ≥ 0 and finite; got ${v}`);
  }
  if (!(falseAlarm > 0 && falseAlarm < 1)) throw new RangeError(`falseAlarm must be in (0, 1); got ${falseAlarm}`);
  const nu = input.aliasFrequencyPerEpoch;
  if (nu !== undefined && !(nu >= 0 && nu <= 0.5)) throw new RangeError(`aliasFrequencyPerEpoch must be in [0, 0.5]; got ${nu}`);
  if (n < 2) return { ttv: null, tdv: null, joint: null, combined: null, notes: missingChannelNotes(n) };
  const level = input.combinedChannels !== undefined ? combinedChannelAlpha(falseAlarm, input.combinedChannels) : timingChannelAlpha(falseAlarm, n);
  if (nu !== undefined) {
    // TTV s = A(cosφ·u + sinφ·v), residual after the line; TDV s = −B(cosφ·v − sinφ·u), residual after the mean.
    const rt = residualProducts(n, nu, true);
    const rd = residualProducts(n, nu, false);
    const kt = 2 * (ttvRmsS / sigmaTcS) ** 2; // A²/σ_tc²
    const kd = 2 * (tdvRmsS / sigmaDurS) ** 2; // B²/σ_T²
    const qTtv = { a: kt * rt.uu, b: kt * rt.vv, c: kt * rt.uv };
    const qTdv = { a: kd * rd.vv, b: kd * rd.uu, c: -kd * rd.uv };
    const hasTtv = n >= 3;
    const qJoint = hasTtv ? { a: qTtv.a + qTdv.a, b: qTtv.b + qTdv.b, c: qTtv.c + qTdv.c } : qTdv;
    return {
      ttv: hasTtv ? phaseAveragedChannel(n - 2, qTtv, falseAlarm) : null,
      tdv: n >= 2 ? phaseAveragedChannel(n - 1, qTdv, falseAlarm) : null,
      joint: n >= 2 ? phaseAveragedChannel(Math.max(0, n - 2) + (n - 1), qJoint, falseAlarm) : null,
      combined: phaseAveragedCombined(hasTtv ? qTtv : null, n - 2, qTdv, n - 1, level),
      notes: missingChannelNotes(n),
    };
  }
  const lambdaTtv = Math.max(0, n - 2) * (ttvRmsS / sigmaTcS) ** 2;
  const lambdaTdv = (n - 1) * (tdvRmsS / sigmaDurS) ** 2;
  return {
    ttv: n >= 3 ? channel(n - 2, lambdaTtv, falseAlarm) : null,
    tdv: n >= 2 ? channel(n - 1, lambdaTdv, falseAlarm) : null,
    joint: n >= 2 ? channel(Math.max(0, n - 2) + (n - 1), lambdaTtv + lambdaTdv, falseAlarm) : null,
    combined: anyOfIndependent([n >= 3 ? channel(n - 2, lambdaTtv, level).probability : 0, channel(n - 1, lambdaTdv, level).probability]),
    notes: missingChannelNotes(n),
  };
}

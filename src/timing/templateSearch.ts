/**
 * The `template` detection channel: a bank of exact photodynamical
 * planet+moon templates searched in the residuals of the planet-only fit.
 *
 * Method: the generalised likelihood ratio test for a signal of known shape
 * and unknown amplitude A ≥ 0 in white Gaussian noise, maximised over a bank
 * of shapes (Kay 1998, Fundamentals of Statistical Signal Processing Vol. II:
 * Detection Theory, §7.6 matched filter, §6.4–6.5 GLRT with unknown
 * parameters; the nuisance parameters of the planet-only model are removed by
 * projecting them out of each template, the GLRT for the linear model with
 * nuisance parameters, Kay 1998 §7.7, Theorem 7.1). For one template d the
 * log-likelihood ratio after maximising over A ≥ 0 is max(0, z)²/2 with
 *   z = d̃ᵀ W r / sqrt(d̃ᵀ W d̃) / σ,   d̃ = d − J (JᵀWJ)⁻¹ JᵀW d,
 * r the residuals, J the planet-only model's freedoms. Two bank statistics:
 * - 'marginal' (default): the cell's moon has a known amplitude (its mass and
 *   radius), so each template's likelihood ratio is exp(S_k z_k − S_k²/2), S_k
 *   = sqrt(d̃ᵀWd̃)/σ its SNR, and the statistic is the log of their mean over
 *   the bank, which samples the moon's unknown phase (and orientation)
 *   uniformly as the realizations draw it: the likelihood ratio of the
 *   phase-averaged alternative, most powerful on average over the phase
 *   (Neyman–Pearson lemma for the mixture alternative; Kay 1998 §6.3–6.4, the
 *   Bayesian approach to composite hypotheses);
 * - 'max': max_k z_k, the GLRT with the amplitude free (≥ 0) and the phase
 *   maximised over the bank (Kay 1998 §6.4).
 * Neither models the look-elsewhere effect: the threshold is calibrated on the
 * no-moon realizations, like every other channel.
 *
 * Template: d = F_planet+moon − F_planet alone, both from the photodynamical
 * light curve (photometry/lightCurve.ts) on the planned sample grid: the moon's
 * own dip and the planet's displacement about the barycentre together, for the
 * cell's moon (mass, radius, separation) at phases 2πj/N_φ (and nodes or
 * periapses when the orbit is inclined or eccentric: the angles a realization
 * draws, timing/realization.ts). The bank does not search the separation: it
 * is the cell's (the hypothesis the cell tests, as for the known-template
 * bound); a search over unknown separations would pay a larger look-elsewhere
 * price, which this channel does not include.
 *
 * Each template is taken about the best planet-only ephemeris (mid-time and
 * period re-centred by Gauss–Newton, `recentredFlux`), not the truth: the
 * realization's planet-only fit absorbs a transit shift common to every epoch
 * (a moon near-commensurate with the planet) exactly, the projection below
 * only to first order.
 *
 * Freedoms projected out (J): the mid-time offset and the period (∂F/∂t and
 * n·∂F/∂t), the radius ratio, impact parameter, duration scale (stellar
 * density) and both limb-darkening coefficients (finite differences of the
 * planet-only template, timing/transitTemplate.ts), and per transit window a
 * baseline offset and slope.
 *
 * Binning (speed): samples are summed in bins of G consecutive planned
 * samples per window (G·cadence ≈ the planet's ingress / 4); the template is
 * taken per bin as the exact flux averaged over the bin's span (one exposure
 * of G cadences at the bin's mean time, times its n_b samples: the short
 * gaps between exposures are neglected), so z above holds with
 * W = diag(1/n_b) and R_b = Σ r_i (weighted sums on a ground campaign, below). Its
 * only loss is the template's variation inside one bin: at most 1.2 % of a
 * template's SNR at 2-min cadence and a 50-min ingress (measured in
 * test/timing/templateSearch.test.ts; 0.4 % with bins of ingress / 8, at
 * twice the cost). Under white noise each z_k is N(0, 1)
 * whatever the binning. Samples the realization did not observe (gaps,
 * missed transits) contribute nothing; the calibration on no-moon
 * realizations with the same gaps accounts for it.
 *
 * Ground campaign (noise/observingPlan.ts): the epochs are the campaign's
 * transits (`withCampaignEpochs`, as the realizations), and the bins hold the
 * plan's exposures, not the whole planned grid: per epoch the grid indices
 * k = round(t/cadence) of its exposures are cut into bins of G as above,
 * `count` is the exposures per bin (two sites at the same time add), bins
 * without an exposure are dropped, and a bin's time is the mean of its
 * exposures. So the templates, their projections and their SNR S_k count only
 * exposures the calendar allows; nights lost to weather (drawn per
 * realization) stay gaps, left to the calibration. A ground budget gives
 * each exposure its own σ_i (air mass, site): each then weighs
 * v_i = (σ_ref/σ_i)² (σ_ref the median of the plan's σ, as the known-template
 * bound), the bins carry Σv_i (`count`) and Σ v_i r_i/σ_ref (ρ), the
 * freedoms and templates are binned with the same weights and the bank's
 * inner product is W = diag(1/Σv_i): the generalised matched filter for
 * known diagonal noise covariance (Kay 1998, Fundamentals of Statistical
 * Signal Processing Vol. II, §4.5), the same whitening as the bound's, so a
 * template's SNR matches the bound's (test/timing/templateSearchCampaign.test.ts).
 * Under white noise each z_k stays N(0, 1); the threshold is calibrated on
 * no-moon realizations as before.
 *
 * Cost: the bank (templates, projections) is built once per cell; each
 * realization costs one pass over its samples (binning) and a dot product per
 * template over the bins.
 */
import type { Scenario } from '../scenario/types.js';
import { lightCurveModel, LightCurveWorkspace, modelFlux, DEFAULT_SMEARING_TOLERANCE } from '../photometry/lightCurve.js';
import { scenarioDurations, transitWindows } from '../photometry/transitWindows.js';
import { buildTransitTemplate, templateFluxArray, templateGeometryFromScenario, type TemplateGeometry } from './transitTemplate.js';
import type { GlobalTransitFit } from './globalTransitFit.js';
import { whiteNoiseSigma } from '../noise/whiteNoise.js';
import { NOMINAL_SIGMA } from './timingSeries.js';
import { observingPlan, withCampaignEpochs, type ObservingPlan } from '../noise/observingPlan.js';
import { medianOfFinite } from '../numeric/quantiles.js';

/** Bins of the planned sample grid shared by a null class and every cell of it. */
export interface TemplateLayout {
  cadenceS: number;
  periodS: number;
  /** Planned samples per bin (the last bin of a window may hold fewer). */
  samplesPerBin: number;
  /** Per window (index = epoch): first and last grid index k (t = k·cadence), first raw bin. */
  k0: Int32Array;
  k1: Int32Array;
  binStart: Int32Array;
  bins: number;
  /**
   * Per bin: Σ v_i over its planned samples (with a campaign: the plan's exposures), v_i = (σ_ref/σ_i)²
   * the exposure's weight (1 for every sample unless a ground budget gives each exposure its own σ_i):
   * the variance of the bin's ρ under white noise, and the inverse of the bank's inner-product weight.
   */
  count: Float64Array;
  /** σ_ref (relative flux): ρ is in units of it and the bank's SNRs are ‖d̃‖/σ_ref. */
  sigmaRef: number;
  /** Scale of the per-window baseline slope (s): the first window's planned width. */
  slopeScaleS: number;
  /**
   * With a ground campaign: raw bin → kept bin (−1 for a raw bin with no exposure), and the plan's
   * exposures (time s, epoch). Null without a campaign (every raw bin of the planned grid is kept).
   */
  rawToBin: Int32Array | null;
  exposures: { timeS: Float64Array; epoch: Int32Array } | null;
  /** Per plan exposure (aligned with `exposures`), its weight v_i = (σ_ref/σ_i)²; null when every weight is 1. */
  exposureWeight: Float64Array | null;
}

/** Bin width as a fraction of the planet's ingress (see the file comment). */
export const BIN_PER_INGRESS = 1 / 4;

/**
 * The layout of a scenario's planned samples (the windows depend only on the planet: transitWindows.ts),
 * with `samplesPerBin` = max(1, ⌊ingress·BIN_PER_INGRESS / cadence⌋) unless given. With a ground
 * campaign (noise/observingPlan.ts) the epochs are the campaign's transits (`withCampaignEpochs`, as
 * the realizations) and the bins hold the plan's exposures only (see the file comment).
 */
export function templateLayout(given: Scenario, samplesPerBin?: number): TemplateLayout {
  const s = withCampaignEpochs(given);
  const cad = s.instrument.cadenceS;
  const d = scenarioDurations(s);
  const ingress = d.ingressS > 0 ? d.ingressS : d.t14S / 2;
  const G = samplesPerBin ?? Math.max(1, Math.floor((ingress * BIN_PER_INGRESS) / cad));
  if (!(Number.isInteger(G) && G >= 1)) throw new RangeError(`samplesPerBin must be an integer ≥ 1, got ${G}`);
  const plan = observingPlan(s);
  if (plan !== null) return planLayout(s, plan, G);
  const windows = transitWindows(s);
  const n = windows.length;
  const k0 = new Int32Array(n);
  const k1 = new Int32Array(n);
  const binStart = new Int32Array(n + 1);
  let last = -Infinity;
  for (let e = 0; e < n; e++) {
    const w = windows[e];
    // As sampleWindows: a grid point on the cut between two windows belongs to the earlier one.
    const a = Math.max(Math.ceil(w.startS / cad), last + 1);
    const b = Math.floor(w.endS / cad);
    k0[e] = a;
    k1[e] = b;
    binStart[e + 1] = binStart[e] + (b >= a ? Math.ceil((b - a + 1) / G) : 0);
    last = Math.max(last, b);
  }
  const bins = binStart[n];
  const count = new Float64Array(bins);
  for (let e = 0; e < n; e++) for (let k = k0[e]; k <= k1[e]; k++) count[binStart[e] + Math.floor((k - k0[e]) / G)] += 1;
  const slopeScaleS = n > 0 ? cad * (k1[0] - k0[0] + 1) : 0;
  const sigmaRef = whiteNoiseSigma(s.instrument.noiseFraction, s.instrument.noiseTimescaleS, s.instrument.exposureS);
  return {
    cadenceS: cad, periodS: s.planet.periodS, samplesPerBin: G, k0, k1, binStart: binStart.subarray(0, n), bins, count, sigmaRef, slopeScaleS,
    rawToBin: null, exposures: null, exposureWeight: null,
  };
}

/**
 * The layout of a ground campaign's plan: per epoch the range of grid indices k = round(t/cadence)
 * of its exposures, raw bins of G grid points as on the planned grid, `count` the exposures per bin
 * (two sites at the same time add), and only bins holding an exposure kept.
 */
function planLayout(s: Scenario, plan: ObservingPlan, G: number): TemplateLayout {
  const cad = s.instrument.cadenceS;
  const n = plan.epochs;
  const k0 = new Int32Array(n).fill(0);
  const k1 = new Int32Array(n).fill(-1);
  const seen = new Uint8Array(n);
  for (let i = 0; i < plan.timeS.length; i++) {
    const e = plan.epoch[i];
    const k = Math.round(plan.timeS[i] / cad);
    if (!seen[e]) {
      seen[e] = 1;
      k0[e] = k;
      k1[e] = k;
    } else {
      if (k < k0[e]) k0[e] = k;
      if (k > k1[e]) k1[e] = k;
    }
  }
  const binStart = new Int32Array(n + 1);
  for (let e = 0; e < n; e++) binStart[e + 1] = binStart[e] + (k1[e] >= k0[e] ? Math.ceil((k1[e] - k0[e] + 1) / G) : 0);
  const raw = binStart[n];
  // Each exposure weighs v_i = (σ_ref/σ_i)², σ_ref the median of the plan's σ (as the known-template bound).
  const sigmaRef = plan.sigma.length > 0 ? medianOfFinite(plan.sigma) : whiteNoiseSigma(s.instrument.noiseFraction, s.instrument.noiseTimescaleS, s.instrument.exposureS);
  const exposureWeight = plan.sigmaVaries ? new Float64Array(plan.timeS.length) : null;
  if (exposureWeight !== null) for (let i = 0; i < exposureWeight.length; i++) exposureWeight[i] = plan.sigma[i] > 0 ? (sigmaRef / plan.sigma[i]) ** 2 : 0;
  const rawCount = new Float64Array(raw);
  const rawExposures = new Int32Array(raw);
  for (let i = 0; i < plan.timeS.length; i++) {
    const e = plan.epoch[i];
    const r = binStart[e] + Math.floor((Math.round(plan.timeS[i] / cad) - k0[e]) / G);
    rawCount[r] += exposureWeight === null ? 1 : exposureWeight[i];
    rawExposures[r] += 1;
  }
  const rawToBin = new Int32Array(raw);
  let bins = 0;
  for (let r = 0; r < raw; r++) rawToBin[r] = rawExposures[r] > 0 && rawCount[r] > 0 ? bins++ : -1;
  const count = new Float64Array(bins);
  for (let r = 0; r < raw; r++) if (rawToBin[r] >= 0) count[rawToBin[r]] = rawCount[r];
  return {
    cadenceS: cad, periodS: s.planet.periodS, samplesPerBin: G, k0, k1, binStart: binStart.subarray(0, n), bins, count, sigmaRef,
    slopeScaleS: 2 * plan.halfWindowS, rawToBin, exposures: { timeS: plan.timeS, epoch: plan.epoch }, exposureWeight,
  };
}

/** Bin of the sample at time t (s) of window `epoch`, or −1 outside the layout (planned grid, or the plan's exposures). */
function binOf(L: TemplateLayout, t: number, epoch: number): number {
  if (!(epoch >= 0 && epoch < L.k0.length)) return -1;
  const k = Math.round(t / L.cadenceS);
  if (k < L.k0[epoch] || k > L.k1[epoch]) return -1;
  const raw = L.binStart[epoch] + Math.floor((k - L.k0[epoch]) / L.samplesPerBin);
  return L.rawToBin === null ? raw : L.rawToBin[raw];
}

/**
 * out[b] = Σ values[i]·weight[i] over the samples i of bin b (zero-filled first; weight 1 when null);
 * samples off the grid are skipped.
 */
export function binSamples(L: TemplateLayout, timeS: Float64Array, epoch: Int32Array, values: Float64Array, out: Float64Array, weight: Float64Array | null = null): Float64Array {
  out.fill(0);
  for (let i = 0; i < timeS.length; i++) {
    const b = binOf(L, timeS[i], epoch[i]);
    if (b >= 0) out[b] += weight === null ? values[i] : values[i] * weight[i];
  }
  return out;
}

/**
 * Per bin: the mean time of its planned samples (or exposures, weighted by v_i: the weighted sum of a
 * template linear across the bin is its value there times Σv_i), and the span (G − 1)·cadence + exposure
 * of a full bin.
 */
function binCentres(L: TemplateLayout, exposureS: number): { centreS: Float64Array; spanS: number } {
  const centreS = new Float64Array(L.bins);
  if (L.exposures !== null) {
    binSamples(L, L.exposures.timeS, L.exposures.epoch, L.exposures.timeS, centreS, L.exposureWeight);
  } else {
    for (let e = 0; e < L.k0.length; e++) {
      for (let k = L.k0[e]; k <= L.k1[e]; k++) centreS[L.binStart[e] + Math.floor((k - L.k0[e]) / L.samplesPerBin)] += k * L.cadenceS;
    }
  }
  for (let b = 0; b < L.bins; b++) centreS[b] /= L.count[b];
  return { centreS, spanS: (L.samplesPerBin - 1) * L.cadenceS + exposureS };
}

/** Times and epochs of every planned sample of the layout (with a campaign: the plan's exposures). */
export function layoutSamples(L: TemplateLayout): { timeS: Float64Array; epoch: Int32Array } {
  if (L.exposures !== null) return { timeS: Float64Array.from(L.exposures.timeS), epoch: Int32Array.from(L.exposures.epoch) };
  let n = 0;
  for (let e = 0; e < L.k0.length; e++) n += Math.max(0, L.k1[e] - L.k0[e] + 1);
  const timeS = new Float64Array(n);
  const epoch = new Int32Array(n);
  let i = 0;
  for (let e = 0; e < L.k0.length; e++) {
    for (let k = L.k0[e]; k <= L.k1[e]; k++, i++) {
      timeS[i] = k * L.cadenceS;
      epoch[i] = e;
    }
  }
  return { timeS, epoch };
}

/** Per-sample scratch of templateResiduals, reused from one realization to the next (grown on demand; not shared between threads). */
export class ResidualScratch {
  private x = new Float64Array(0);
  private model = new Float64Array(0);
  arrays(n: number): { x: Float64Array; model: Float64Array } {
    if (this.x.length < n) {
      this.x = new Float64Array(Math.max(n, Math.ceil(1.25 * this.x.length)));
      this.model = new Float64Array(this.x.length);
    }
    return { x: this.x.subarray(0, n), model: this.model.subarray(0, n) };
  }
}

/**
 * Normalised binned residuals ρ_b = Σ_{i∈b} (flux_i − m_i)/σ of one realization, m the global
 * planet-only fit f0·T(t − nP − Δt) (globalTransitFit.ts). With no global fit (nothing observed) ρ = 0.
 * With each point's own σ_i (`sigmaPoint`, a ground budget's air mass) on a layout that weighs its
 * exposures (`exposureWeight`): ρ_b = Σ_{i∈b} v_i (flux_i − m_i)/σ_ref = Σ σ_ref (flux_i − m_i)/σ_i²,
 * the generalised matched filter's whitening (Kay 1998, Fundamentals of Statistical Signal Processing
 * Vol. II, §4.5, diagonal noise covariance), whose variance under white noise is the bin's Σv_i.
 */
export function templateResiduals(
  L: TemplateLayout,
  timeS: Float64Array,
  epoch: Int32Array,
  flux: Float64Array,
  sigma: number,
  global: GlobalTransitFit | null,
  out: Float64Array = new Float64Array(L.bins),
  scratch: ResidualScratch = new ResidualScratch(),
  sigmaPoint: Float64Array | null = null,
): Float64Array {
  out.fill(0);
  if (global === null || !(sigma > 0)) return out;
  const n = timeS.length;
  const { x, model } = scratch.arrays(n);
  for (let i = 0; i < n; i++) x[i] = timeS[i] - epoch[i] * L.periodS - global.offsetS;
  templateFluxArray(global.template, x, n, model);
  if (sigmaPoint !== null && L.exposureWeight !== null && L.sigmaRef > 0) accumulateWeighted(L, timeS, epoch, flux, model, global.baseline, sigmaPoint, L.sigmaRef, out);
  else accumulateResiduals(L, timeS, epoch, flux, model, global.baseline, 1 / sigma, out);
  return out;
}

function accumulateResiduals(
  L: TemplateLayout, timeS: Float64Array, epoch: Int32Array, flux: Float64Array, model: Float64Array, f0: number, invSigma: number, out: Float64Array,
): void {
  for (let i = 0; i < timeS.length; i++) {
    const b = binOf(L, timeS[i], epoch[i]);
    if (b >= 0) out[b] += (flux[i] - f0 * model[i]) * invSigma;
  }
}

/** ρ_b += σ_ref (flux_i − f0·m_i)/σ_i² (points with σ_i ≤ 0 or not finite carry no weight). */
function accumulateWeighted(
  L: TemplateLayout, timeS: Float64Array, epoch: Int32Array, flux: Float64Array, model: Float64Array, f0: number, sigmaPoint: Float64Array, sigmaRef: number, out: Float64Array,
): void {
  for (let i = 0; i < timeS.length; i++) {
    const b = binOf(L, timeS[i], epoch[i]);
    const si = sigmaPoint[i];
    if (b >= 0 && si > 0 && Number.isFinite(si)) out[b] += ((flux[i] - f0 * model[i]) * sigmaRef) / (si * si);
  }
}

/** A cell's bank: unit matched filters over the bins, one per template. */
export interface TemplateBank {
  bins: number;
  /** Filters g_k (row k = bins [k·bins, (k+1)·bins)): z_k = Σ_b g_kb ρ_b. */
  filters: Float64Array;
  templates: number;
  /** Per template, sqrt(d̃ᵀ W d̃) (relative flux): its SNR is this / σ. */
  projectedNorm: Float64Array;
  /** Per template, its SNR S_k = projectedNorm / σ at the instrument's white-noise σ. */
  snr: Float64Array;
  statistic: TemplateStatisticKind;
  /** Per template, the moon's phase, node and periapsis (rad). */
  phaseRad: Float64Array;
  nodeRad: Float64Array;
  periapsisRad: Float64Array;
}

export type TemplateStatisticKind = 'marginal' | 'max';

export interface TemplateBankOptions {
  /** The planet-only freedoms' orthonormal basis on this layout (`freedomBasis`), when already built. */
  basis?: FreedomBasis;
  /** The bank statistic (default 'marginal'; see the file comment). */
  statistic?: TemplateStatisticKind;
  /** Phases in the bank (default: `defaultPhaseCount`, doubled while neighbours differ: MIN_NEIGHBOUR_CORRELATION). */
  phases?: number;
  /** Nodes (inclined orbit) and periapses (eccentric orbit) in the bank (default 4 each, 1 when irrelevant). */
  nodes?: number;
  periapses?: number;
}

/** Spacing of the bank's phases: the moon's dip moves by at most this fraction of the stellar chord 2L between neighbours. */
export const PHASE_STEP_PER_CHORD = 0.2;

/**
 * Most phases in a bank: the cost (bank build and the pass over the no-moon residuals) grows with
 * them, and wide orbits, whose dip needs the most, are detected by their timing, which varies smoothly
 * with the phase. Chosen for the 2-minute sweep budget (bench/efficiency.ts measures the efficiency).
 */
export const MAX_PHASES = 32;

/** Fewest phases the geometric rule gives (16: one doubling reaches 32, where close orbits converge; MIN_NEIGHBOUR_CORRELATION). */
export const MIN_PHASES = 16;

/**
 * Phases needed so the moon's dip moves by at most PHASE_STEP_PER_CHORD of the stellar chord between
 * neighbouring templates: N_φ = ⌈2π·a/(0.2·2L)⌉ (a the separation, L = sqrt(1 − b²) the half chord,
 * stellar radii; the dip's overlap with a shifted copy drops linearly with the shift), MIN_PHASES ≤ N_φ ≤ MAX_PHASES.
 * The bank starts there and doubles while neighbouring templates differ too much (MIN_NEIGHBOUR_CORRELATION):
 * close orbits need more than this rule says.
 * A choice of this program (derived here), not a published rule. Measured on bench/efficiency.ts's
 * system at 0.15 Hill radii: half this step moved the 50 % minimum detectable mass from 1.57× to
 * 1.53× the stand-in bound, within the Monte Carlo noise, at up to twice the cost.
 */
export function defaultPhaseCount(s: Scenario): number {
  if (!s.moon) return 1;
  const a = s.moon.separationM / s.star.radiusM;
  const b = Math.min(Math.abs(s.planet.impactParameter), 0.95);
  const L = Math.sqrt(1 - b * b);
  return Math.max(MIN_PHASES, Math.min(MAX_PHASES, Math.ceil((2 * Math.PI * a) / (PHASE_STEP_PER_CHORD * 2 * L))));
}

/**
 * The planet-only freedoms J, binned (columns of length L.bins, row-major by column): see the file
 * comment. Derivatives of the template by central differences (step 1e-3 of p, 1e-2 in b, u1, u2,
 * 1e-3 in the duration scale; a 1-s time shift).
 */
function freedomColumns(geometry: TemplateGeometry, L: TemplateLayout, t: Float64Array, epoch: Int32Array): Float64Array[] {
  const n = t.length;
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = t[i] - epoch[i] * L.periodS;
  const evalAt = (g: TemplateGeometry, shiftS: number): Float64Array => {
    const tpl = buildTransitTemplate(g, { stepsPerT14: 2000 });
    const xs = new Float64Array(n);
    for (let i = 0; i < n; i++) xs[i] = x[i] - shiftS;
    const out = new Float64Array(n);
    templateFluxArray(tpl, xs, n, out);
    return out;
  };
  const diff = (plus: Float64Array, minus: Float64Array, h: number): Float64Array => {
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) out[i] = (plus[i] - minus[i]) / h;
    return out;
  };
  const g0 = { ...geometry, timeScale: 1 };
  const cols: Float64Array[] = [];
  const dt = diff(evalAt(g0, 1), evalAt(g0, -1), 2);
  cols.push(dt);
  const dP = new Float64Array(n);
  for (let i = 0; i < n; i++) dP[i] = epoch[i] * dt[i];
  cols.push(dP);
  const p = g0.radiusRatio;
  cols.push(diff(evalAt({ ...g0, radiusRatio: p * 1.001 }, 0), evalAt({ ...g0, radiusRatio: p * 0.999 }, 0), 0.002 * p));
  const b = g0.impactParameter;
  const hb = 0.01;
  const bLo = Math.max(0, b - hb);
  const bHi = Math.min(b + hb, 0.99 * (1 + p));
  if (bHi > bLo) cols.push(diff(evalAt({ ...g0, impactParameter: bHi }, 0), evalAt({ ...g0, impactParameter: bLo }, 0), bHi - bLo));
  cols.push(diff(evalAt({ ...g0, timeScale: 1.001 }, 0), evalAt({ ...g0, timeScale: 0.999 }, 0), 0.002));
  cols.push(diff(evalAt({ ...g0, u1: g0.u1 + 0.01 }, 0), evalAt({ ...g0, u1: g0.u1 - 0.01 }, 0), 0.02));
  cols.push(diff(evalAt({ ...g0, u2: g0.u2 + 0.01 }, 0), evalAt({ ...g0, u2: g0.u2 - 0.01 }, 0), 0.02));
  // Weighted sums over each bin's samples (v_i: the layout's exposure weights, aligned with t).
  const v = L.exposureWeight;
  const binned = cols.map((c) => binSamples(L, t, epoch, c, new Float64Array(L.bins), v));
  // Per window: baseline offset and slope (sums of v_i and of v_i·x/T14 over the bin's samples).
  const scale = 1 / Math.max(1, L.slopeScaleS);
  for (let e = 0; e < L.k0.length; e++) {
    const off = new Float64Array(L.bins);
    const slope = new Float64Array(L.bins);
    for (let i = 0; i < n; i++) {
      if (epoch[i] !== e) continue;
      const bin = binOf(L, t[i], e);
      if (bin < 0) continue;
      const vi = v === null ? 1 : v[i];
      off[bin] += vi;
      slope[bin] += x[i] * scale * vi;
    }
    binned.push(off, slope);
  }
  return binned;
}

/**
 * Orthonormal basis (in the W = diag(1/count) inner product) of the columns, by modified
 * Gram–Schmidt applied twice (Golub & Van Loan 2013, Matrix Computations, 4th ed., §5.2.8–5.2.9;
 * "twice is enough", Giraud et al. 2005, Numer. Math. 101, 87). A column whose remainder is below
 * 1e-9 of its norm is dependent on the others and dropped.
 */
function orthonormalBasis(cols: Float64Array[], w: Float64Array): Float64Array[] {
  const basis: Float64Array[] = [];
  for (const c of cols) {
    const v = Float64Array.from(c);
    const norm0 = Math.sqrt(wDot(v, v, w));
    if (!(norm0 > 0)) continue;
    for (let pass = 0; pass < 2; pass++) for (const q of basis) axpy(v, q, -wDot(q, v, w));
    const norm = Math.sqrt(wDot(v, v, w));
    if (!(norm > 1e-9 * norm0)) continue;
    for (let i = 0; i < v.length; i++) v[i] /= norm;
    basis.push(v);
  }
  return basis;
}

/** Σ a_i b_i w_i, w = 1/count (0 where count is 0). */
function wDot(a: Float64Array, b: Float64Array, w: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i] * w[i];
  return s;
}

function inverseCounts(count: Float64Array): Float64Array {
  const w = new Float64Array(count.length);
  for (let i = 0; i < count.length; i++) w[i] = count[i] > 0 ? 1 / count[i] : 0;
  return w;
}

function axpy(y: Float64Array, x: Float64Array, a: number): void {
  for (let i = 0; i < y.length; i++) y[i] += a * x[i];
}

/** The planet-only freedoms of a layout, orthonormal in the W = diag(1/count) inner product, and W itself. */
export interface FreedomBasis {
  vectors: Float64Array[];
  w: Float64Array;
}

/** The planet-only freedoms of scenario `s` (its moon ignored) on layout L: the same for every cell of a null class. */
export function freedomBasis(s: Scenario, L: TemplateLayout): FreedomBasis {
  const { timeS, epoch } = layoutSamples(L);
  const w = inverseCounts(L.count);
  return { vectors: orthonormalBasis(freedomColumns(templateGeometryFromScenario({ ...s, moon: null }), L, timeS, epoch), w), w };
}

/**
 * The bank of cell scenario `s` (with its moon) on layout `L` (the null class's: the cell's moonless
 * scenario). σ only sets the light curve's smearing tolerance, as in observeScenario.
 * @throws RangeError when the scenario has no moon.
 */
export function buildTemplateBank(s: Scenario, L: TemplateLayout, o: TemplateBankOptions = {}): TemplateBank {
  const moon = s.moon;
  if (!moon) throw new RangeError('buildTemplateBank: the scenario has no moon');
  const nNode = moon.inclinationRad > 0 ? (o.nodes ?? 4) : 1;
  const nPeri = moon.eccentricity > 0 ? (o.periapses ?? 4) : 1;
  const ctx = bankContext(s, L, o);
  if (o.phases !== undefined) return bankOf(ctx, s, L, o.phases, nNode, nPeri, o);
  // Phases refined by doubling until neighbouring templates resemble each other (see refinedPhaseCount).
  let bank = bankOf(ctx, s, L, defaultPhaseCount(s), nNode, nPeri, o);
  while (neighbourCorrelation(bank, L, nNode * nPeri) < MIN_NEIGHBOUR_CORRELATION && 2 * bank.templates / (nNode * nPeri) <= MAX_REFINED_PHASES) {
    bank = bankOf(ctx, s, L, (2 * bank.templates) / (nNode * nPeri), nNode, nPeri, o);
  }
  return bank;
}

/**
 * Phases are refined (doubled) while the SNR-weighted correlation of phase-neighbouring templates,
 *   C = Σ_k ⟨d̃_k, d̃_k+1⟩_W / Σ_k ‖d̃_k‖_W ‖d̃_k+1‖_W   (k cyclic in phase, per node and periapsis),
 * is below this. A choice of this program (not a published rule), measured with an ideal test
 * (Gaussian residuals, signals at 256 phases; `node dist/bench/run.js bank-phases`, bench/bankPhases.ts) on bench/boundReference.ts's
 * system at 0.15 Hill radii: the geometric rule's 12 phases had C ≈ 0.36 and a 50 % minimum
 * detectable mass 9 % above the converged one (1.43 against 1.31 M⊕), 16 phases (C ≈ 0.44) 5 %, 24
 * (C ≈ 0.63) 1 %; with 32 and 48 phases (C ≈ 0.73 and 0.83) the power no longer changed within the
 * Monte Carlo noise (1.306 and 1.309 M⊕, 3000 signal and 5000 no-moon draws each). That converged
 * mass is about 1.6× the known-template bound's 0.83 M⊕ there (1.56–1.61× depending on the draws and
 * the masses interpolated between; about 1.4× at 0.30 and 1.3× at 0.45 Hill radii, bench bank-phases):
 * the price of not knowing the moon's phase, which the bound takes as known. The marginal statistic
 * with the cell's amplitude is the most powerful test on average over a uniform phase (Neyman–Pearson
 * lemma for the mixture alternative), so no analysis of these data reaches the bound's line there
 * (bins cost a further ~1 % of SNR). The moon's dip there has sharp features
 * (mutual events with the planet, the moon's own motion across the disc in one transit) that the
 * geometric rule's dip-shift argument does not see.
 */
export const MIN_NEIGHBOUR_CORRELATION = 0.7;

/** Most phases the refinement may reach (per node and periapsis). */
export const MAX_REFINED_PHASES = 64;

/** What a bank's templates share whatever the phases: the bins' centres, the moonless flux there, the freedoms. */
interface BankContext {
  centreS: Float64Array;
  spanS: number;
  sigma: number;
  tolerance: number;
  alone: Float64Array;
  basis: FreedomBasis;
  ws: LightCurveWorkspace;
  /** Per bin: its epoch, the moonless flux's slope there, and scratch for shifted times (recentredFlux). */
  epochOf: Float64Array;
  slope: Float64Array;
  shifted: Float64Array;
  /** ‖F″‖/σ of the moonless flux (recentredFlux's stopping rule). */
  curvatureSnr: number;
}

/** Epoch of each kept bin of the layout. */
function binEpochs(L: TemplateLayout): Float64Array {
  const out = new Float64Array(L.bins);
  const n = L.k0.length;
  for (let e = 0; e < n; e++) {
    const rawEnd = e + 1 < n ? L.binStart[e + 1] : L.binStart[e] + (L.k1[e] >= L.k0[e] ? Math.ceil((L.k1[e] - L.k0[e] + 1) / L.samplesPerBin) : 0);
    for (let r = L.binStart[e]; r < rawEnd; r++) {
      const b = L.rawToBin === null ? r : L.rawToBin[r];
      if (b >= 0) out[b] = e;
    }
  }
  return out;
}

/** Per bin, the slope of the moonless flux (central difference between bins of the same window, one-sided at its ends). */
function aloneSlope(centreS: Float64Array, alone: Float64Array, epochOf: Float64Array): Float64Array {
  const n = centreS.length;
  const out = new Float64Array(n);
  for (let b = 0; b < n; b++) {
    const lo = b > 0 && epochOf[b - 1] === epochOf[b] ? b - 1 : b;
    const hi = b + 1 < n && epochOf[b + 1] === epochOf[b] ? b + 1 : b;
    const dt = centreS[hi] - centreS[lo];
    out[b] = dt > 0 ? (alone[hi] - alone[lo]) / dt : 0;
  }
  return out;
}

/**
 * The template's planet+moon flux at the bins, linearised about the best planet-only ephemeris rather
 * than the truth (as the known-template bound, knownTemplateBound.ts): the planet-only fit of a
 * realization absorbs a displacement common to every transit exactly (a moon near-commensurate with
 * the planet), which the projection on the freedoms at the truth absorbs only to first order, leaving
 * −δ²F″/2 in the template that no realization's residuals hold. The mid-time τ₀ and period τ₁ come
 * from Gauss–Newton on the columns F′ and n·F′ in the bank's inner product (Björck 1996, Numerical
 * Methods for Least Squares Problems, §9.2.1); out = the flux at t_b + τ₀ + n_b·τ₁.
 */
function recentredFlux(ctx: BankContext, model: ReturnType<typeof lightCurveModel>, L: TemplateLayout, out: Float64Array): void {
  const { centreS, alone, slope, epochOf, shifted, ws } = ctx;
  const n = L.bins;
  let a00 = 0;
  let a01 = 0;
  let a11 = 0;
  for (let b = 0; b < n; b++) {
    const q = slope[b] * slope[b] * L.count[b];
    a00 += q;
    a01 += epochOf[b] * q;
    a11 += epochOf[b] * epochOf[b] * q;
  }
  const det = a00 * a11 - a01 * a01;
  let tau0 = 0;
  let tau1 = 0;
  for (let it = 0; it < 6; it++) {
    for (let b = 0; b < n; b++) shifted[b] = centreS[b] + tau0 + epochOf[b] * tau1;
    modelFlux(shifted, model, out, ws);
    if (it === 5 || !(det > 0)) break;
    let b0 = 0;
    let b1 = 0;
    for (let b = 0; b < n; b++) {
      const r = (out[b] - alone[b]) * slope[b] * L.count[b];
      b0 += r;
      b1 += epochOf[b] * r;
    }
    // out − alone ≈ F′·(τ − δ): the least-squares coefficients are the remaining shift.
    const c0 = (a11 * b0 - a01 * b1) / det;
    const c1 = (a00 * b1 - a01 * b0) / det;
    // Stop when the step left untaken could change the projected template by at most RECENTRE_SNR in SNR:
    // its first order is projected out anyway, its second order is at most ½·Δτ²·‖F″‖/σ (Taylor).
    const step = Math.max(Math.abs(c0), Math.abs(c0 + c1 * epochOf[n - 1]));
    if (0.5 * step * step * ctx.curvatureSnr < RECENTRE_SNR) break;
    tau0 -= c0;
    tau1 -= c1;
  }
}

/** Largest SNR the bank's templates may lose by stopping the re-centring early (recentredFlux). */
const RECENTRE_SNR = 0.05;

/** ‖F″‖/σ_ref of the moonless flux in the bank's inner product (per s²), from the bins' slopes. */
function curvatureSnr(centreS: Float64Array, slope: Float64Array, epochOf: Float64Array, count: Float64Array, sigma: number): number {
  const second = aloneSlope(centreS, slope, epochOf);
  let a = 0;
  for (let b = 0; b < second.length; b++) a += second[b] * second[b] * count[b];
  return sigma > 0 ? Math.sqrt(a) / sigma : Infinity;
}

function bankContext(s: Scenario, L: TemplateLayout, o: TemplateBankOptions): BankContext {
  // Templates per bin: the exact flux averaged over the bin's span (one exposure of G cadences at the
  // bin's mean time, times its sample count), the gaps between exposures neglected (see the file comment).
  const { centreS, spanS } = binCentres(L, s.instrument.exposureS);
  const sigma = whiteNoiseSigma(s.instrument.noiseFraction, s.instrument.noiseTimescaleS, s.instrument.exposureS);
  const tolerance = Math.max(DEFAULT_SMEARING_TOLERANCE, 0.02 * sigma);
  const ws = new LightCurveWorkspace();
  const alone = modelFlux(centreS, lightCurveModel(binScenario({ ...s, moon: null }, spanS), { tolerance }), new Float64Array(L.bins), ws);
  const epochOf = binEpochs(L);
  const slope = aloneSlope(centreS, alone, epochOf);
  const curvature = curvatureSnr(centreS, slope, epochOf, L.count, L.sigmaRef > 0 ? L.sigmaRef : sigma);
  return {
    centreS, spanS, sigma, tolerance, alone, basis: o.basis ?? freedomBasis(s, L), ws, epochOf, slope, shifted: new Float64Array(L.bins), curvatureSnr: curvature,
  };
}

function binScenario(x: Scenario, spanS: number): Scenario {
  return { ...x, instrument: { ...x.instrument, exposureS: spanS } };
}

/** SNR-weighted correlation of phase-neighbouring templates (see MIN_NEIGHBOUR_CORRELATION); 1 for fewer than 2 phases. */
export function neighbourCorrelation(bank: TemplateBank, L: TemplateLayout, perPhase: number): number {
  const nPhase = bank.templates / perPhase;
  if (nPhase < 2) return 1;
  const B = bank.bins;
  const g = bank.filters;
  let num = 0;
  let den = 0;
  for (let ip = 0; ip < nPhase; ip++) {
    for (let j = 0; j < perPhase; j++) {
      const a = ip * perPhase + j;
      const b = ((ip + 1) % nPhase) * perPhase + j;
      // g = d̃·w/‖d̃‖, so Σ g_a g_b count = ⟨d̃_a, d̃_b⟩_W / (‖d̃_a‖ ‖d̃_b‖).
      let c = 0;
      for (let i = 0; i < B; i++) c += g[a * B + i] * g[b * B + i] * L.count[i];
      const w = bank.projectedNorm[a] * bank.projectedNorm[b];
      num += c * w;
      den += w;
    }
  }
  return den > 0 ? num / den : 1;
}

function bankOf(ctx: BankContext, s: Scenario, L: TemplateLayout, nPhase: number, nNode: number, nPeri: number, o: TemplateBankOptions): TemplateBank {
  const moon = s.moon!;
  const { centreS, spanS, sigma, tolerance, alone, ws } = ctx;
  const n = L.bins;
  const binned = new Float64Array(n);
  const w = ctx.basis.w;
  const basis = ctx.basis.vectors;
  const total = nPhase * nNode * nPeri;
  const filters = new Float64Array(total * L.bins);
  const projectedNorm = new Float64Array(total);
  const phaseRad = new Float64Array(total);
  const nodeRad = new Float64Array(total);
  const periapsisRad = new Float64Array(total);
  const flux = new Float64Array(n);
  let k = 0;
  for (let ip = 0; ip < nPhase; ip++) {
    for (let inode = 0; inode < nNode; inode++) {
      for (let iperi = 0; iperi < nPeri; iperi++, k++) {
        const ph = (2 * Math.PI * ip) / nPhase;
        const node = nNode > 1 ? (2 * Math.PI * inode) / nNode : moon.nodeRad;
        const peri = nPeri > 1 ? (2 * Math.PI * iperi) / nPeri : moon.periapsisRad;
        const sk: Scenario = { ...s, moon: { ...moon, phaseRad: ph, nodeRad: node, periapsisRad: peri } };
        recentredFlux(ctx, lightCurveModel(binScenario(sk, spanS), { tolerance }), L, flux);
        for (let b = 0; b < n; b++) binned[b] = (flux[b] - alone[b]) * L.count[b];
        for (let pass = 0; pass < 2; pass++) for (const q of basis) axpy(binned, q, -wDot(q, binned, w));
        const norm = Math.sqrt(wDot(binned, binned, w));
        projectedNorm[k] = norm;
        phaseRad[k] = ph;
        nodeRad[k] = node;
        periapsisRad[k] = peri;
        const row = filters.subarray(k * L.bins, (k + 1) * L.bins);
        if (norm > 0) for (let b = 0; b < L.bins; b++) row[b] = (binned[b] * w[b]) / norm;
      }
    }
  }
  const snr = new Float64Array(total);
  const sigmaRef = L.sigmaRef > 0 ? L.sigmaRef : sigma > 0 ? sigma : NOMINAL_SIGMA;
  for (let j = 0; j < total; j++) snr[j] = projectedNorm[j] / sigmaRef;
  const statistic = o.statistic ?? 'marginal';
  if (statistic !== 'marginal' && statistic !== 'max') throw new RangeError(`statistic must be 'marginal' or 'max', got ${String(statistic)}`);
  return { bins: L.bins, filters, templates: total, projectedNorm, snr, statistic, phaseRad, nodeRad, periapsisRad };
}

/**
 * The bank statistic of normalised binned residuals ρ (length bank.bins, at `offset` in `rho`),
 * z_k = Σ_b g_kb ρ_b: 'max' → max_k z_k; 'marginal' → ln mean_k exp(S_k z_k − S_k²/2), summed
 * stably about its largest term (see the file comment). −∞ for an empty bank.
 */
export function templateStatistic(bank: TemplateBank, rho: Float64Array, offset = 0, z: Float64Array = new Float64Array(bank.templates)): number {
  const S = bank.snr;
  const marginal = bank.statistic === 'marginal';
  filterOutputs(bank.filters, bank.templates, bank.bins, rho, offset, z);
  let best = -Infinity;
  let sum = 0;
  for (let k = 0; k < bank.templates; k++) {
    const v = marginal ? S[k] * z[k] - 0.5 * S[k] * S[k] : z[k];
    if (!marginal) {
      if (v > best) best = v;
      continue;
    }
    // Running log-sum-exp: sum holds Σ exp(v − best).
    if (v > best) {
      sum = sum * Math.exp(best - v) + 1;
      best = v;
    } else sum += Math.exp(v - best);
  }
  return marginal && bank.templates > 0 ? best + Math.log(sum / bank.templates) : best;
}

/**
 * z[k] = Σ_b g[k·B + b]·ρ[offset + b] for k < T: four templates per pass over ρ (a quarter of the
 * loads of ρ and of the loop overhead; the sums are the same products added in the same order).
 */
function filterOutputs(g: Float64Array, T: number, B: number, rho: Float64Array, offset: number, z: Float64Array): void {
  let k = 0;
  for (; k + 4 <= T; k += 4) filterOutputs4(g, k, B, rho, offset, z);
  for (; k < T; k++) z[k] = filterOutput(g, k * B, B, rho, offset);
}

/** z[k..k+3] of filterOutputs, four templates in one pass over ρ (a function of its own so that V8 optimizes the pass on its own). */
function filterOutputs4(g: Float64Array, k: number, B: number, rho: Float64Array, offset: number, z: Float64Array): void {
  const a0 = k * B;
  const a1 = a0 + B;
  const a2 = a1 + B;
  const a3 = a2 + B;
  let z0 = 0;
  let z1 = 0;
  let z2 = 0;
  let z3 = 0;
  for (let b = 0; b < B; b++) {
    const x = rho[offset + b];
    z0 += g[a0 + b] * x;
    z1 += g[a1 + b] * x;
    z2 += g[a2 + b] * x;
    z3 += g[a3 + b] * x;
  }
  z[k] = z0;
  z[k + 1] = z1;
  z[k + 2] = z2;
  z[k + 3] = z3;
}

/**
 * One template's output Σ_b g[a + b]·ρ[offset + b]. A function of its own: as a loop inside
 * filterOutputs, reached only by banks whose size is not a multiple of 4, it had no type feedback
 * when the function was optimized and deoptimized it again and again (18 times in a small sweep;
 * --trace-deopt; common practice, no source).
 */
function filterOutput(g: Float64Array, a: number, B: number, rho: Float64Array, offset: number): number {
  let s = 0;
  for (let b = 0; b < B; b++) s += g[a + b] * rho[offset + b];
  return s;
}

/** The statistic of every realization of a flat array of ρ (realization r at r·bins). */
export function templateStatistics(bank: TemplateBank, rhoFlat: Float64Array, count: number): Float64Array {
  const out = new Float64Array(count);
  const z = new Float64Array(bank.templates);
  for (let r = 0; r < count; r++) out[r] = templateStatistic(bank, rhoFlat, r * bank.bins, z);
  return out;
}

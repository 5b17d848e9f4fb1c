/**
 * The per-cell computation of a sweep: physical labels from `computeLimits`,
 * then (for cells that are simulated) R realizations with the moon and a set
 * of no-moon realizations that calibrate each channel's false-alarm threshold,
 * then detection probabilities with Wilson intervals beside the analytic
 * forecast.
 *
 * No-moon calibration realizations depend only on the scenario without its
 * moon (parsed afresh without the moon block, so the planet's orbit is that
 * of the moonless system), so cells that differ only in their moon (mass ×
 * separation grids) share them. They are seeded by (seed, hash of the
 * moon-less scenario, r) (nullSet.ts), which keeps results identical whatever the worker count,
 * order, sharding or resumption. The sweep engine computes each class once,
 * in chunks over the workers, and hands the sets to the runner (`shared`);
 * without them (e.g. in the main thread) the runner computes the set itself
 * and caches it per thread.
 *
 * Channel statistics (larger = more moon-like):
 *   ttv: −log10 p of the TTV χ² against a linear ephemeris (N − 2 dof);
 *   tdv: −log10 p of the TDV χ² against a constant (N − 1 dof);
 *   dip: matched-filter SNR of the stacked moon dip (orbital sampling effect),
 *        for this cell's moon separation, outside the planet's own transit;
 *   template: the largest matched-filter SNR over a bank of exact
 *        photodynamical planet+moon templates of this cell's moon (phases,
 *        orientations), in the residuals of the global planet-only fit with its
 *        freedoms projected out (timing/templateSearch.ts). Its bank is built
 *        once per cell and applied to the stored no-moon residuals.
 * p-values are used instead of raw χ² so that realizations with a different
 * number of fitted transits (gaps) share one calibrated threshold.
 * With fewer than 3 planned transits the TTV channel does not exist (0 dof),
 * with 1 neither does TDV: their p_* are null, the combined rule is the
 * min-p rule over the channels that exist (`channels_used`, and why in
 * `channels_note`; timing/detection.ts). A realization in which every transit was lost to missed
 * transits or gaps measured nothing: it is a non-detection in every channel,
 * and the cell counts such realizations in `no_transit_observed`.
 *
 * Thresholds (scenario `detection.calibration`, timing/detection.ts), from all n
 * no-moon statistics (no split half):
 * - 'tail' (default): a generalised Pareto fit of each channel's upper tail
 *   and of the no-moon ln M of the combined rule (Knijnenburg et al. 2009,
 *   Bioinformatics 25, i161), falling back to the order statistic where the
 *   tail is too short for α; the combined rule's rate in force is a bootstrap
 *   mean and 95 % interval. Measured in bench/tailFit.ts: ⌈15/α⌉ no-moon
 *   realizations hold the rate as well as the order statistic does at 25/α
 *   (nullSet.ts). With (n + 1)·α < 15 the cell says `calibration_limited`.
 * - 'order_statistic': x_(k), k = ⌈(n + 1)(1 − α)⌉, and the combined rule's
 *   threshold the same order statistic of the no-moon min-p scores. The
 *   exceedance probability in force is Beta(n + 1 − k, k) distributed (David &
 *   Nagaraja 2003, Order Statistics, §2.2). With fewer than 25 expected
 *   exceedances ((n + 1)·α < 25) the cell says `calibration_limited`; with
 *   (n + 1)·α < 1 no threshold exists and nothing is detected.
 * The cell reports the rate in force's mean and 95 % interval
 * (`false_alarm_in_force`, `_lo`, `_hi`) and how it was set (`calibration_method`).
 */
import { withCampaignEpochs } from '../noise/observingPlan.js';
import type { Scenario } from '../scenario/types.js';
import { CELL_PARSE, withoutMoon } from './applyAxes.js';
import { computeLimits, moonPlacement, type LimitsJson } from '../limits/computeLimits.js';
import { COMBINED_RULE_WEIGHTS, missingChannelSummary } from '../physics/detectionForecast.js';
import { barycentreSkyVelocity } from '../physics/timingSignals.js';
import { createRng } from '../noise/rng.js';
import { RealizationWorkspace, runRealization } from '../timing/realization.js';
import { stackedDipSnr, type ResidualStack } from '../timing/residualStack.js';
import { foldedMoonDip, oseQuadrature } from '../timing/moonDipStack.js';
import { calibrateDetection, decideDetection, DETECTION_CHANNELS, type DetectionCalibration, type DetectionChannel } from '../timing/detection.js';
import { wilsonInterval } from '../timing/falseAlarmCalibration.js';
import {
  buildTemplateBank, freedomBasis, ResidualScratch, templateStatistic, templateStatistics, type FreedomBasis, type TemplateBank, type TemplateLayout,
} from '../timing/templateSearch.js';
import { assertObservable, observationSizeProblems, scenarioDurations } from '../photometry/transitWindows.js';
import type { FieldProblem } from '../scenario/errors.js';
import type { CellContext, CellResult, CellRunner, CellShared, CellTask } from './cellTypes.js';
import {
  calibrationMethodOf, chiSquareScore, computeNullRange, computeNullSet, defaultNullRealizations, nullClassOfScenario,
  nullTemplateLayout, realizationRho, NULL_EXCEEDANCES, NULL_EXCEEDANCES_TAIL,
  type NullClass, type NullSet, type PackedNullRange,
} from './nullSet.js';
import { medianOfFinite } from '../numeric/quantiles.js';
import { cellBound } from './cellBound.js';

export { defaultNullRealizations };

/** Seed salt of the tail-fit calibration's bootstrap stream ("tail"), distinct from the realizations' seeds. */
const TAIL_SEED_SALT = 0x7461696c;

/** Per-worker cache of null sets computed here (worker-local state lives in sweep/, never in the numerical core). */
const nullCache = new Map<string, NullSet>();

/**
 * Per-worker cache of each null class's template layout and planet-only freedoms (the same for every
 * cell of the class: computed once, a result of pure functions, so it cannot change a result).
 */
const layoutCache = new Map<string, { layout: TemplateLayout; basis: FreedomBasis }>();

function templateSetup(c: NullClass): { layout: TemplateLayout; basis: FreedomBasis } {
  const hit = layoutCache.get(c.key);
  if (hit) return hit;
  const layout = nullTemplateLayout(c);
  const entry = { layout, basis: freedomBasis(c.scenario, layout) };
  if (layoutCache.size > 8) layoutCache.clear();
  layoutCache.set(c.key, entry);
  return entry;
}

/**
 * The detection channels N planned transits allow: TTV needs N ≥ 3 (a linear ephemeris has 2 free
 * parameters), TDV N ≥ 2 (a mean duration has 1); the moon dip and the template bank need one transit.
 */
export function channelsFor(transits: number): DetectionChannel[] {
  return DETECTION_CHANNELS.filter((ch) => (ch === 'ttv' ? transits >= 3 : ch === 'tdv' ? transits >= 2 : true));
}

/** Weights of the combined rule's p-values (physics/detectionForecast.ts says why; the forecast uses the same). */
export const COMBINED_WEIGHTS = COMBINED_RULE_WEIGHTS;

/** Grid cells parse a moon that touches its planet as a physical label, not an input error (applyAxes.ts). */
export { CELL_PARSE };

/** Why a cell is not simulated, or null when it is. */
function skipReason(s: Scenario, base: Pick<CellResult, 'placement' | 'allowed'>, ctx: CellContext): string | null {
  if (!s.moon) return 'no moon in the scenario';
  // Overlapping discs have no orbit to simulate, whatever simulate_unstable says.
  if (s.moon.touchesPlanet) return 'not simulated: touches the planet';
  if (ctx.forecastOnly) return 'forecast only';
  if (!base.allowed && !ctx.simulateUnstable) return `not simulated: ${String(base.placement)}`;
  return null;
}

/**
 * The null class of a cell (whether or not the cell is simulated): the cell's
 * scenario without its moon, validated afresh (`withoutMoon`), so that every derived
 * quantity (the planet's semi-major axis from Kepler's third law with the
 * moon's mass, the inclination from the impact parameter) is that of the
 * moonless system. Cells that differ only in their moon then share one class.
 */
function classOfCell(s: Scenario, ctx: CellContext): NullClass {
  const count = ctx.nullRealizations ?? defaultNullRealizations(s.detection.falseAlarm, ctx.realizations, calibrationMethodOf(s));
  return nullClassOfScenario(withoutMoon(s), ctx.seed, count);
}

/**
 * The null class whose realizations calibrate this cell's false alarms, or
 * null when the cell is not simulated (no moon, forecast only, or unstable
 * without simulate_unstable): the same decision `runCell` makes.
 */
export function nullClassOf(task: CellTask, ctx: CellContext): NullClass | null {
  const s = task.scenario;
  if (!s.moon || ctx.forecastOnly) return null;
  // Only the placement decides (skipReason); the rest of computeLimits (the forecast) is not needed here.
  const placement = moonPlacement(s) ?? ['no moon'];
  const base = { placement: placement.join('; '), allowed: placement.length === 1 && placement[0] === 'stable' };
  return skipReason(s, base, ctx) === null ? classOfCell(s, ctx) : null;
}

/**
 * What would make `runCell` refuse this cell (a cadence no shorter than the transit, a light curve
 * above the size limit: transitWindows.ts), for a sweep that validates every cell before any work;
 * empty when the cell can run. Throws the scenario's own InputError for an invalid document.
 */
export function cellComputeProblems(task: CellTask): FieldProblem[] {
  return observationSizeProblems(task.scenario);
}

/** Whether `runCell` will simulate this cell (and so needs its null set). */
export function cellNeedsCalibration(task: CellTask, ctx: CellContext): boolean {
  return nullClassOf(task, ctx) !== null;
}

/**
 * Realizations [start, start + n) of the null set of this cell's class,
 * packed (the calibration pre-pass runs these chunks on the workers).
 */
export function nullChunkOf(task: CellTask, ctx: CellContext, start: number, n: number, ws?: RealizationWorkspace): { key: string; range: PackedNullRange } {
  const c = classOfCell(task.scenario, ctx);
  return { key: c.key, range: computeNullRange(c, start, n, ws) };
}

/** The provided null set of class `c`, else one from this thread's cache, else computed here. */
function nullSetFor(c: NullClass, shared: CellShared | undefined, ws: RealizationWorkspace): NullSet {
  const provided = shared?.nullSets?.get(c.key);
  if (provided) return provided;
  if (shared?.nullSets) shared.onNullMiss?.(c.key);
  const hit = nullCache.get(c.key);
  if (hit) return hit;
  const set = computeNullSet(c, ws);
  if (nullCache.size > 8) nullCache.clear(); // bounded memory: a sweep visits null classes in index order
  nullCache.set(c.key, set);
  return set;
}

/** Folded moon-dip profile (per unit moon depth) at the stack's bin centres, for this cell's moon. */
export function dipProfile(s: Scenario, stack: ResidualStack): Float64Array {
  const m = s.moon!;
  const rStar = s.star.radiusM;
  const v = barycentreSkyVelocity(s.planet.semiMajorAxisM, s.planet.periodS, s.planet.eccentricity, s.planet.omegaRad) / rStar;
  const a = m.separationM / rStar;
  const b = Math.min(s.planet.impactParameter, 0.999);
  const q = oseQuadrature();
  const out = new Float64Array(stack.sum.length);
  for (let k = 0; k < out.length; k++) out[k] = foldedMoonDip((stack.x0S + k * stack.binS) * v, a, b, s.star.u1, s.star.u2, q);
  return out;
}

/** Fields every cell carries, simulated or not (CellResult, from `placement` to `energy_total_w_m2`). */
type CellLabels = Pick<CellResult,
  | 'placement' | 'allowed' | 'habitability' | 'habitability_dominant' | 'moon_mass_kg' | 'moon_separation_m' | 'moon_separation_hill'
  | 'ttv_rms_s' | 'tdv_rms_s' | 'moon_depth' | 'timing_precision_s' | 'duration_precision_s' | 'pdet_forecast_ttv' | 'pdet_forecast_tdv'
  | 'pdet_forecast_joint' | 'pdet_forecast_combined' | 'forecast_regime_ok' | 'channels_note' | 'photocentric_ratio' | 'energy_total_w_m2'>;

/** Fields every cell carries, simulated or not. */
function labelFields(s: Scenario, l: LimitsJson): CellLabels {
  const placement = l.moon_placement ?? ['no moon'];
  return {
    placement: placement.join('; '),
    allowed: placement.length === 1 && placement[0] === 'stable',
    habitability: l.energy_budget?.verdict ?? null,
    habitability_dominant: l.energy_budget?.dominant ?? null,
    moon_mass_kg: s.moon?.massKg ?? null,
    moon_separation_m: s.moon?.separationM ?? null,
    moon_separation_hill: s.moon ? s.moon.separationM / l.hill_radius_m : null,
    ttv_rms_s: l.ttv_rms_s,
    tdv_rms_s: l.tdv_rms_s,
    moon_depth: l.moon_depth,
    timing_precision_s: l.timing_precision_s,
    duration_precision_s: l.duration_precision_s,
    pdet_forecast_ttv: l.pdet_forecast_ttv,
    pdet_forecast_tdv: l.pdet_forecast_tdv,
    pdet_forecast_joint: l.pdet_forecast_joint,
    pdet_forecast_combined: l.pdet_forecast_combined,
    forecast_regime_ok: l.forecast_regime_ok,
    channels_note: s.moon ? missingChannelSummary(s.observation.transits) : null,
    photocentric_ratio: l.photocentric_ratio,
    energy_total_w_m2: l.energy_budget?.total_w_m2 ?? null,
  };
}

/**
 * The dip statistic of each stored no-moon stack for this cell's profile (a
 * non-finite SNR counts as 0). A loop in a top-level function: an arrow
 * function made per cell was compiled anew by V8 in most cells.
 */
export function dipScores(stacks: readonly ResidualStack[], profile: Float64Array, exclude: number): Float64Array {
  const out = new Float64Array(stacks.length);
  for (let i = 0; i < stacks.length; i++) {
    const d = stackedDipSnr(stacks[i], profile, exclude).snr;
    out[i] = Number.isFinite(d) ? d : 0;
  }
  return out;
}

export const runCell: CellRunner = (task: CellTask, ctx: CellContext, shared?: CellShared): CellResult => {
  // With a ground campaign the campaign's transits are the epochs (noise/observingPlan.ts).
  const s = withCampaignEpochs(task.scenario);
  // Refused before any work: a cadence no shorter than the transit, or a light curve too large (transitWindows.ts).
  assertObservable(s, `cell ${task.index}`);
  const limits = computeLimits(s);
  const base = { index: task.index, coords: task.coords, ...labelFields(s, limits), pdet_bound: cellBound(s, task.scenario) };
  const skipped = skipReason(s, base, ctx);
  if (skipped !== null) return { ...base, simulated: false, skipped_reason: skipped };

  const R = ctx.realizations;
  const alpha = s.detection.falseAlarm;
  const nullClass = classOfCell(s, ctx);
  const nNull = nullClass.count;
  const ws = new RealizationWorkspace();
  const nulls = nullSetFor(nullClass, shared, ws);

  // Dip channel: this cell's profile applied to the stored no-moon stacks.
  const profile = dipProfile(s, nulls.stacks[0]);
  const exclude = 0.5 * scenarioDurations(s).t14S;
  const nullDip = dipScores(nulls.stacks, profile, exclude);
  // Template channel: this cell's bank (built once) on the stored no-moon residuals.
  const { layout, basis } = templateSetup(nullClass);
  const bank: TemplateBank = buildTemplateBank(s, layout, { basis });
  const nullTemplate = templateStatistics(bank, nulls.rho, nNull);
  // Only the channels the transit count allows are calibrated and combined (detectionForecast.ts,
  // "Few transits"): with 2 transits the TTV χ² has 0 dof, with 1 the TDV χ² too.
  const channels = channelsFor(s.observation.transits);
  const nullStats: Partial<Record<DetectionChannel, Float64Array>> = { dip: nullDip, template: nullTemplate };
  if (channels.includes('ttv')) nullStats.ttv = nulls.ttv;
  if (channels.includes('tdv')) nullStats.tdv = nulls.tdv;
  // Order statistic: every threshold is the order statistic of all n no-moon values; it rests on (n + 1)·α
  // expected exceedances, fewer than NULL_EXCEEDANCES is flagged. Tail fit: fewer than NULL_EXCEEDANCES_TAIL.
  // The tail fit's checks and bootstrap draw from a stream of the null class (the same in every cell of it).
  const method = calibrationMethodOf(s);
  const limited = (nNull + 1) * alpha < (method === 'tail' ? NULL_EXCEEDANCES_TAIL : NULL_EXCEEDANCES) - 1e-9;
  const calibration: DetectionCalibration = method === 'tail'
    ? calibrateDetection(nullStats, alpha, COMBINED_WEIGHTS, { method: 'tail', rng: createRng((ctx.seed ^ TAIL_SEED_SALT) >>> 0, nullClass.id, 0) })
    : calibrateDetection(nullStats, alpha, COMBINED_WEIGHTS);
  const rho = new Float64Array(layout.bins);
  const rhoScratch = new ResidualScratch();
  const z = new Float64Array(bank.templates);

  const counts: Record<DetectionChannel | 'combined', number> = { ttv: 0, tdv: 0, dip: 0, template: 0, combined: 0 };
  const ttvRms: number[] = [];
  const tdvRms: number[] = [];
  const dipDepth: number[] = [];
  const fitted: number[] = [];
  let nothingObserved = 0;
  for (let r = 0; r < R; r++) {
    const { record, observation, recovery } = runRealization(s, createRng(ctx.seed, task.index, r), { workspace: ws });
    // A realization that lost every transit measured nothing: a non-detection in every channel
    // (its statistics are NaN or 0, never above a threshold), counted in no_transit_observed.
    if (record.noTransitObserved) nothingObserved++;
    const dip = stackedDipSnr(record.stack, profile, exclude);
    const decision = decideDetection(
      {
        ttv: chiSquareScore(record.ttvChi2, record.ttvDof),
        tdv: chiSquareScore(record.tdvChi2, record.tdvDof),
        dip: Number.isFinite(dip.snr) ? dip.snr : 0,
        template: templateStatistic(bank, realizationRho(layout, observation, recovery, rho, rhoScratch), 0, z),
      },
      calibration.thresholds,
    );
    for (const ch of DETECTION_CHANNELS) if (decision[ch]) counts[ch]++;
    if (decision.combined) counts.combined++;
    ttvRms.push(record.ttvRmsS);
    tdvRms.push(record.tdvRmsS);
    dipDepth.push(dip.depth);
    fitted.push(record.transitsFitted);
  }
  const prob: Record<string, unknown> = {};
  for (const ch of [...DETECTION_CHANNELS, 'combined'] as const) {
    const exists = ch === 'combined' || ch === 'template' || channels.includes(ch);
    const w = wilsonInterval(counts[ch], R);
    prob[`pdet_${ch}`] = exists ? w.estimate : null;
    prob[`pdet_${ch}_lo`] = exists ? w.lower : null;
    prob[`pdet_${ch}_hi`] = exists ? w.upper : null;
  }
  // The forecast (noncentral χ², white noise, Carter precision) beside the Monte Carlo TTV channel.
  const fc = limits.pdet_forecast_ttv;
  const disagrees = fc !== null && limits.forecast_regime_ok === true && (fc < (prob.pdet_ttv_lo as number) || fc > (prob.pdet_ttv_hi as number));
  const fa: Record<string, unknown> = {};
  for (const ch of DETECTION_CHANNELS) {
    const c = calibration.single[ch];
    fa[`threshold_${ch}`] = c ? c.threshold : null;
    fa[`false_alarm_measured_${ch}`] = c ? c.measuredAlpha : null;
  }
  // Rate of the thresholds in force (the same order statistic for every channel and the combined rule).
  fa.false_alarm_in_force = calibration.falseAlarmInForce;
  fa.false_alarm_in_force_lo = calibration.falseAlarmInForceLower;
  fa.false_alarm_in_force_hi = calibration.falseAlarmInForceUpper;
  fa.calibration_method = calibration.method === 'tail' ? 'tail' : 'order_statistic';
  fa.template_bank_size = bank.templates;
  return {
    ...base,
    simulated: true,
    realizations: R,
    no_moon_realizations: nNull,
    ...prob,
    channels_used: channels.join(' '),
    no_transit_observed: nothingObserved,
    forecast_ttv_outside_interval: disagrees,
    median_fitted_ttv_rms_s: medianOfFinite(ttvRms),
    median_fitted_tdv_rms_s: medianOfFinite(tdvRms),
    median_dip_depth: medianOfFinite(dipDepth),
    median_transits_fitted: medianOfFinite(fitted),
    false_alarm: alpha,
    calibration_limited: limited,
    false_alarm_measured_combined: calibration.measuredCombinedAlpha,
    ...fa,
  };
};

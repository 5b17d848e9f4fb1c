/**
 * The per-cell computation of a sweep: physical labels from `computeLimits`,
 * then (for cells that are simulated) R realizations with the moon and a set
 * of no-moon realizations that calibrate each channel's false-alarm threshold,
 * then detection probabilities with Wilson intervals beside the analytic
 * forecast.
 *
 * No-moon calibration realizations depend only on the scenario without its
 * moon, so cells that differ only in the moon (mass × separation grids) share
 * them: they are seeded by (seed, hash of the moon-less scenario, r) and
 * cached per worker thread, which keeps results identical whatever the worker
 * count, order, sharding or resumption.
 *
 * Channel statistics (larger = more moon-like):
 *   ttv: −log10 p of the TTV χ² against a linear ephemeris (N − 2 dof);
 *   tdv: −log10 p of the TDV χ² against a constant (N − 1 dof);
 *   dip: matched-filter SNR of the stacked moon dip (orbital sampling effect),
 *        for this cell's moon separation, outside the planet's own transit.
 * p-values are used instead of raw χ² so that realizations with a different
 * number of fitted transits (gaps) share one calibrated threshold.
 */
import { createHash } from 'node:crypto';
import { parseScenario } from '../scenario/parseScenario.js';
import type { Scenario } from '../scenario/types.js';
import { computeLimits, type LimitsJson } from '../physics/computeLimits.js';
import { barycentreSkyVelocity } from '../physics/timingSignals.js';
import { createRng } from '../noise/rng.js';
import { LightCurveWorkspace } from '../photometry/lightCurve.js';
import { runRealization, type RealizationRecord } from '../timing/realization.js';
import { stackedDipSnr, type ResidualStack } from '../timing/residualStack.js';
import { foldedMoonDip, oseQuadrature } from '../timing/moonDipStack.js';
import { chiSquareSurvival } from '../timing/noncentralChiSquare.js';
import { calibrateDetection, decideDetection, DETECTION_CHANNELS, type DetectionCalibration, type DetectionChannel } from '../timing/detection.js';
import { wilsonInterval } from '../timing/falseAlarmCalibration.js';
import { scenarioDurations } from '../photometry/transitWindows.js';
import { canonicalJson } from './canonicalJson.js';
import type { CellContext, CellResult, CellRunner, CellTask } from './cellTypes.js';

/** Default number of no-moon calibration realizations: enough for ~10 exceedances at α (and ≥ 200). */
export function defaultNullRealizations(falseAlarm: number, realizations: number): number {
  return Math.max(realizations, 200, Math.ceil(10 / falseAlarm));
}

/** Stream id of the no-moon realizations: a 31-bit hash of the moon-less scenario. */
function nullStreamId(s: Scenario): { key: string; id: number } {
  const key = canonicalJson({ ...s, moon: null, name: '' });
  const h = createHash('sha256').update(key).digest();
  return { key, id: h.readUInt32BE(0) >>> 1 };
}

/** A seed distinct from the moon realizations' seed for the same scenario seed. */
const NULL_SEED_SALT = 0x6e756c6c; // "null"

interface NullSet {
  ttv: Float64Array;
  tdv: Float64Array;
  stacks: ResidualStack[];
}

/** Per-worker cache of no-moon realizations (worker-local state lives in sweep/, never in the numerical core). */
const nullCache = new Map<string, NullSet>();

/** −log10 of a χ² survival probability (floored at 1e-300); 0 when not measured. */
function chiSquareScore(chi2: number, dof: number): number {
  if (!(dof >= 1) || !Number.isFinite(chi2)) return 0;
  const p = chiSquareSurvival(chi2, dof);
  return -Math.log10(Math.max(p, 1e-300));
}

function nullSet(s: Scenario, seed: number, count: number, ws: LightCurveWorkspace): NullSet {
  const { key, id } = nullStreamId(s);
  const cacheKey = `${seed}|${count}|${key}`;
  const hit = nullCache.get(cacheKey);
  if (hit) return hit;
  const ttv = new Float64Array(count);
  const tdv = new Float64Array(count);
  const stacks: ResidualStack[] = [];
  const noMoon: Scenario = { ...s, moon: null };
  for (let r = 0; r < count; r++) {
    const rng = createRng((seed ^ NULL_SEED_SALT) >>> 0, id, r);
    const { record } = runRealization(noMoon, rng, { withMoon: false, workspace: ws });
    ttv[r] = chiSquareScore(record.ttvChi2, record.ttvDof);
    tdv[r] = chiSquareScore(record.tdvChi2, record.tdvDof);
    stacks.push(record.stack);
  }
  const set = { ttv, tdv, stacks };
  if (nullCache.size > 8) nullCache.clear(); // bounded memory: a sweep visits null classes in index order
  nullCache.set(cacheKey, set);
  return set;
}

/** Folded moon-dip profile (per unit moon depth) at the stack's bin centres, for this cell's moon. */
function dipProfile(s: Scenario, stack: ResidualStack): Float64Array {
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

function median(xs: number[]): number {
  const v = xs.filter(Number.isFinite).sort((p, q) => p - q);
  if (v.length === 0) return NaN;
  const h = v.length >> 1;
  return v.length % 2 ? v[h] : 0.5 * (v[h - 1] + v[h]);
}

/** Fields every cell carries, simulated or not. */
function labelFields(s: Scenario, l: LimitsJson): Record<string, unknown> {
  const placement = l.moon_placement ?? ['no moon'];
  return {
    placement: placement.join('; '),
    stable: placement.length === 1 && placement[0] === 'stable',
    habitability: l.energy_budget?.verdict ?? null,
    habitability_dominant: l.energy_budget?.dominant ?? null,
    moon_mass_kg: s.moon?.massKg ?? null,
    moon_separation_m: s.moon?.separationM ?? null,
    moon_separation_hill: s.moon ? s.moon.separationM / l.hill_radius_m : null,
    ttv_rms_s: l.ttv_rms_s,
    tdv_rms_s: l.tdv_rms_s,
    moon_depth_ppm: l.moon_depth_ppm,
    timing_precision_s: l.timing_precision_s,
    duration_precision_s: l.duration_precision_s,
    forecast_ttv: l.forecast_ttv_probability,
    forecast_tdv: l.forecast_tdv_probability,
    forecast_joint: l.forecast_detection_probability,
    forecast_regime_ok: l.forecast_regime_ok,
    photocentric_ratio: l.photocentric_ratio,
    energy_total_W_m2: l.energy_budget?.total_W_m2 ?? null,
  };
}

export const runCell: CellRunner = (task: CellTask, ctx: CellContext): CellResult => {
  const s = parseScenario(task.scenarioDoc, `cell ${task.index}`);
  const limits = computeLimits(s);
  const base: CellResult = { index: task.index, coords: task.coords, ...labelFields(s, limits) };
  if (!s.moon) return { ...base, simulated: false, skipped_reason: 'no moon in the scenario' };
  if (ctx.forecastOnly) return { ...base, simulated: false, skipped_reason: 'forecast only' };
  if (!base.stable && !ctx.simulateUnstable) return { ...base, simulated: false, skipped_reason: `not simulated: ${String(base.placement)}` };

  const R = ctx.realizations;
  const alpha = s.detection.falseAlarm;
  const nNull = (ctx as CellContext & { nullRealizations?: number }).nullRealizations ?? defaultNullRealizations(alpha, R);
  const ws = new LightCurveWorkspace();
  const nulls = nullSet(s, ctx.seed, nNull, ws);

  // Dip channel: this cell's profile applied to the stored no-moon stacks.
  const profile = dipProfile(s, nulls.stacks[0]);
  const exclude = 0.5 * scenarioDurations(s).t14S;
  const nullDip = Float64Array.from(nulls.stacks, (st) => {
    const d = stackedDipSnr(st, profile, exclude).snr;
    return Number.isFinite(d) ? d : 0;
  });
  const calibration: DetectionCalibration = calibrateDetection({ ttv: nulls.ttv, tdv: nulls.tdv, dip: nullDip }, alpha);

  const counts: Record<DetectionChannel | 'combined', number> = { ttv: 0, tdv: 0, dip: 0, combined: 0 };
  const ttvRms: number[] = [];
  const tdvRms: number[] = [];
  const dipDepth: number[] = [];
  const fitted: number[] = [];
  for (let r = 0; r < R; r++) {
    const { record } = runRealization(s, createRng(ctx.seed, task.index, r), { workspace: ws }) as { record: RealizationRecord };
    const dip = stackedDipSnr(record.stack, profile, exclude);
    const decision = decideDetection(
      {
        ttv: chiSquareScore(record.ttvChi2, record.ttvDof),
        tdv: chiSquareScore(record.tdvChi2, record.tdvDof),
        dip: Number.isFinite(dip.snr) ? dip.snr : 0,
      },
      calibration.thresholds,
    );
    for (const ch of DETECTION_CHANNELS) if (decision[ch]) counts[ch]++;
    if (decision.combined) counts.combined++;
    ttvRms.push(record.ttvRmsS);
    tdvRms.push(record.tdvRmsS);
    dipDepth.push(dip.depth * 1e6);
    fitted.push(record.transitsFitted);
  }
  const prob: Record<string, unknown> = {};
  for (const ch of [...DETECTION_CHANNELS, 'combined'] as const) {
    const w = wilsonInterval(counts[ch], R);
    prob[`p_${ch}`] = w.estimate;
    prob[`p_${ch}_lo`] = w.lower;
    prob[`p_${ch}_hi`] = w.upper;
  }
  // The forecast (noncentral χ², white noise, Carter precision) beside the Monte Carlo TTV channel.
  const fc = limits.forecast_ttv_probability;
  const disagrees = fc !== null && limits.forecast_regime_ok === true && (fc < (prob.p_ttv_lo as number) || fc > (prob.p_ttv_hi as number));
  const fa: Record<string, unknown> = {};
  for (const ch of DETECTION_CHANNELS) {
    const c = calibration.single[ch]!;
    fa[`threshold_${ch}`] = c.threshold;
    fa[`false_alarm_measured_${ch}`] = c.measuredAlpha;
  }
  return {
    ...base,
    simulated: true,
    realizations: R,
    null_realizations: nNull,
    ...prob,
    forecast_ttv_outside_interval: disagrees,
    median_fitted_ttv_rms_s: median(ttvRms),
    median_fitted_tdv_rms_s: median(tdvRms),
    median_dip_depth_ppm: median(dipDepth),
    median_transits_fitted: median(fitted),
    false_alarm_requested: alpha,
    false_alarm_measured_combined: calibration.measuredCombinedAlpha,
    ...fa,
  };
};

/**
 * `planBudget(scenario, target)`: the cheapest observation that reaches a
 * target detection probability for a target moon (or a stated fraction of
 * the temperate, stable moons of a mass range): the fewest transits and the
 * telescope hours they cost, or the coarsest cadence, or the worst white-noise
 * level, the rest of the scenario held fixed.
 *
 * Method.
 * 1. The analytic forecast (noncentral chi-square, src/physics/detectionForecast.ts)
 *    is evaluated over the whole grid of the solved quantity (milliseconds)
 *    and its cheapest passing value is the starting guess.
 * 2. A Monte Carlo search (src/budget/monotoneSearch.ts: gallop from the
 *    guess, then bisect) runs one sweep cell per evaluated value
 *    (src/sweep/runCell.ts) and keeps the cheapest value whose estimated
 *    probability reaches the target. The answer's grid neighbours are
 *    reported with their Wilson intervals (the cheaper one fails by
 *    construction; the dearer one is evaluated for the single-moon budget).
 * Monotonicity of the probability along the grid is assumed and stated. The
 * number of evaluations is capped, so the search always ends; a target that
 * no value in range reaches is reported as such, with the reasons found.
 */
import { readFileSync } from 'node:fs';
import { performance } from 'node:perf_hooks';
import { computeLimits, type LimitsJson } from '../limits/computeLimits.js';
import { HOUR_S, M_EARTH_KG } from '../physics/constants.js';
import { assertObservable, observationSizeProblems, windowHalfWidthS } from '../photometry/transitWindows.js';
import { InputError } from '../scenario/errors.js';
import { parseYamlWithLines, withLines, type SourcePosition } from '../scenario/loadScenario.js';
import { cautionNotes, parseScenario } from '../scenario/parseScenario.js';
import { withoutSkyBlocks } from '../scenario/readSky.js';
import type { Scenario } from '../scenario/types.js';
import { scenarioDocumentOf } from '../scenario/scenarioDocument.js';
import type {
  BudgetAnswer, BudgetEvaluation, BudgetForecastCurve, BudgetResult, BudgetTarget, PlanBudgetOptions, ResolvedBudgetTarget,
} from '../budget/budgetTypes.js';
import { minTransitsFor, resolveBudgetTarget } from '../budget/budgetSpec.js';
import { calibrationMethodOf, defaultNullRealizations, NULL_EXCEEDANCES, NULL_EXCEEDANCES_TAIL } from '../sweep/nullSet.js';
import { rateInForce } from '../timing/falseAlarmCalibration.js';
import { forecastProbability, forecastTransitsNeeded, moonSignal, precisionsAlong, type ValuePrecision } from '../budget/budgetForecast.js';
import { habitablePopulation, spreadEvenly } from '../budget/habitableTargets.js';
import { evaluateMoon, evaluatePopulation, type MonteCarloSettings } from '../budget/monteCarloPoint.js';
import { searchCheapestPassing } from '../budget/monotoneSearch.js';
import { formatQuantity, quantityScenario, pct, solvedQuantity, type SolvedQuantity } from '../budget/solvedQuantity.js';
import { isStable, PHOTOCENTRIC_LIMIT, targetMoonInfo, withTargetMoon } from '../budget/targetMoon.js';
import { budgetObservability, siteNote, wholeToSky } from '../budget/nightsBudget.js';

/** Forecast search limit when extrapolating beyond --max-transits. */
const FORECAST_TRANSITS_LIMIT = 10000;

const p3 = (p: number): string => (Number.isFinite(p) ? p.toFixed(3) : 'n/a');

/** "p = 0.930 [0.862, 0.966]" */
export function evaluationText(e: BudgetEvaluation): string {
  return `${p3(e.probability)} [${p3(e.lower)}, ${p3(e.upper)}]`;
}

function loadDoc(scenario: Scenario | string): { doc: unknown; source: string; lineOf: ((path: string) => SourcePosition | null) | null } {
  // A Scenario: its document (the budget block, and the fields the budget varies as they were written).
  if (typeof scenario !== 'string') return { doc: scenarioDocumentOf(scenario), source: 'scenario', lineOf: null };
  let text: string;
  try {
    text = readFileSync(scenario, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError([{ path: 'SCENARIO', value: scenario, allowed: code === 'ENOENT' ? 'no such file' : `cannot read it (${code ?? String(e)})` }]);
  }
  const { value, positionOf } = parseYamlWithLines(text, scenario);
  return { doc: value, source: scenario, lineOf: positionOf };
}

function withoutBlocks(doc: unknown): Record<string, unknown> {
  if (doc === null || typeof doc !== 'object' || Array.isArray(doc)) return {};
  const out = structuredClone(doc) as Record<string, unknown>;
  delete out.sweep;
  delete out.budget;
  return out;
}

interface Context {
  t: ResolvedBudgetTarget & { nullRealizations: number };
  base: Scenario;
  q: SolvedQuantity;
  mc: MonteCarloSettings;
  windowS: number;
  notes: string[];
  progress: (line: string) => void;
}

/**
 * The observing budget (see the file comment). `scenario` is a scenario file
 * path or a Scenario from parseScenario / loadScenario (its `budget:` block is
 * read from the document it was parsed from); `target` overrides that
 * `budget:` block. Throws InputError for bad input.
 */
export function planBudget(scenario: Scenario | string, target: BudgetTarget = {}, options: PlanBudgetOptions = {}): BudgetResult {
  const t0 = performance.now();
  const { doc, source, lineOf } = loadDoc(scenario);
  try {
    return plan(doc, source, target, options, t0);
  } catch (e) {
    if (e instanceof InputError && lineOf) throw withLines(e, lineOf, source);
    throw e;
  }
}

function plan(doc: unknown, source: string, target: BudgetTarget, options: PlanBudgetOptions, t0: number): BudgetResult {
  const spec = resolveBudgetTarget(doc, target, source);
  const withSky = parseScenario(withoutBlocks(doc), source);
  // The Monte Carlo and the forecast simulate consecutive whole transits (with a campaign the sweep would
  // observe only the calendar's epochs instead: noise/observingPlan.ts); the calendar then turns the count
  // they need into epochs, nights and calendar time (budget/nightsBudget.ts).
  const clean = withoutSkyBlocks(withoutBlocks(doc));
  const base = withSky.sky ? parseScenario(clean, source) : withSky;
  const t = { ...spec, nullRealizations: spec.nullRealizations ?? defaultNullRealizations(base.detection.falseAlarm, spec.realizations, calibrationMethodOf(base)) };
  assertObservable(base, source);
  const q = solvedQuantity(t.solve, clean, base, t.maxTransits, t.channel);
  if (q.solve === 'transits') {
    // The largest transit count must fit in memory too: blame the option that sets it.
    const most = { ...base, observation: { ...base.observation, transits: q.values[q.values.length - 1] } };
    const size = observationSizeProblems(most);
    if (size.length > 0) {
      const block = (doc as { budget?: Record<string, unknown> } | null)?.budget;
      const src = target.maxTransits !== undefined ? '--max-transits' : block && block.max_transits !== undefined ? 'budget.max_transits' : `--max-transits (default ${t.maxTransits})`;
      throw new InputError([{ path: src, value: t.maxTransits, allowed: `${size[0].allowed.replace(/; use a coarser cadence.*$/, '')}; use fewer transits at most, or a coarser cadence (instrument.cadence)` }], source);
    }
  }
  const ctx: Context = {
    t, base, q,
    mc: { seed: base.seed, realizations: t.realizations, nullRealizations: t.nullRealizations, channel: t.channel, probability: t.probability },
    windowS: 2 * windowHalfWidthS(base),
    notes: [],
    progress: options.progress ?? (() => undefined),
  };
  ctx.notes.push(...(t.deprecations ?? []), ...scenarioNotes(ctx));
  const part = t.habitable ? planPopulation(ctx, clean) : planSingle(ctx, clean, source);
  if (part.evaluations.length > 0) ctx.notes.push(...nullCountNotes(ctx, part.evaluations));
  // With a site, the count becomes nights, hours on sky and calendar time (src/budget/nightsBudget.ts).
  const observability = budgetObservability(withSky, part.answer.reached ? part.answer.transits : null, source);
  const notes = withSky.sky && (withSky.sky.sites.length > 0 || withSky.sky.visibility) ? [siteNote(observability), ...ctx.notes] : ctx.notes;
  const answer = observability.plan && part.answer.reached ? { ...part.answer, statement: `${part.answer.statement} ${wholeToSky(observability.plan)}` } : part.answer;
  return {
    scenario: base.name,
    observability,
    solve: t.solve,
    channel: t.channel,
    probability_target: t.probability,
    false_alarm: base.detection.falseAlarm,
    realizations: t.realizations,
    no_moon_realizations: t.nullRealizations,
    monte_carlo: !t.forecastOnly,
    quantity: { solve: q.solve, field: q.field, unit: q.unit, displayUnit: q.displayUnit, displayFactor: q.displayFactor, values: q.values, scenarioValue: q.scenarioValue, cheaper: q.cheaper },
    target_moon: part.targetMoon,
    habitable: part.habitable,
    forecast: part.forecast,
    evaluations: part.evaluations,
    answer,
    window_per_transit_s: ctx.windowS,
    notes,
    assumptions: observability.plan
      ? assumptions(ctx).map((a) => (a.startsWith('the transits are consecutive') ? 'the Monte Carlo simulates consecutive whole transits, each watched for T14 plus the baselines; the observing calendar below turns that count into the epochs the sky allows, partial ones counted by their timing information' : a))
      : assumptions(ctx),
    wall_time_s: (performance.now() - t0) / 1000,
  };
}

interface Part {
  targetMoon: BudgetResult['target_moon'];
  habitable: BudgetResult['habitable'];
  forecast: BudgetForecastCurve;
  evaluations: BudgetEvaluation[];
  answer: BudgetAnswer;
}

function firstReaching(ps: Array<number | null>, level: number): number | null {
  const i = ps.findIndex((p) => p !== null && p >= level);
  return i < 0 ? null : i;
}

/** Transits at grid index i (the solved count, or the scenario's) and the hours they cost. */
function transitsAt(ctx: Context, i: number | null): { transits: number; hours: number } {
  const n = ctx.q.solve === 'transits' && i !== null ? ctx.q.values[i] : ctx.base.observation.transits;
  return { transits: n, hours: (n * ctx.windowS) / HOUR_S };
}

function progressLine(ctx: Context, e: BudgetEvaluation, what: string): void {
  ctx.progress(`  ${formatQuantity(ctx.q, e.value).padEnd(24)} ${what} ${evaluationText(e)} ${e.passed ? 'reaches' : 'short of'} the target (${e.seconds.toFixed(1)} s)\n`);
}

/**
 * Where the Monte Carlo search starts: the forecast's answer; else, when the
 * forecast never reaches the target, where it comes closest (most often the
 * most demanding value: one evaluation then shows the target out of reach);
 * without any forecast, the cheapest number of transits or the most
 * demanding cadence / noise level.
 */
function startIndex(ctx: Context, fc: Array<number | null>, fcIndex: number | null): number {
  if (fcIndex !== null) return fcIndex;
  let best = -1;
  for (let i = 0; i < fc.length; i++) if (fc[i] !== null && (best < 0 || fc[i]! >= fc[best]! - 1e-12)) best = i; // the most demanding of tied maxima
  if (best >= 0) return best;
  return ctx.q.solve === 'transits' ? 0 : ctx.q.values.length - 1;
}

/** Run the Monte Carlo search with `evaluate`, from `start`; returns the evaluations and the answer index. */
function monteCarloSearch(ctx: Context, start: number, evaluate: (i: number) => BudgetEvaluation): { evaluations: BudgetEvaluation[]; answer: number | null; capped: boolean } {
  const K = ctx.q.values.length;
  const evaluations: BudgetEvaluation[] = [];
  const maxEvaluations = 2 * Math.ceil(Math.log2(K + 1)) + 4;
  const out = searchCheapestPassing(K, start, (i) => {
    const e = evaluate(i);
    evaluations.push(e);
    return e.passed;
  }, maxEvaluations);
  return { evaluations, answer: out.answer, capped: out.capped };
}

function planSingle(ctx: Context, clean: Record<string, unknown>, source: string): Part {
  const { t, q } = ctx;
  const tm = withTargetMoon(clean, t, source);
  ctx.notes.push(...tm.notes);
  const limits = computeLimits(tm.scenario);
  const moon = targetMoonInfo(tm.scenario, limits, t.moonMassText, t.moonSeparationText);
  const sig = moonSignal(limits);
  const tf = performance.now();
  const precisions = precisionsAlong(q, tm.scenario);
  const fc = precisions.map((p) => forecastProbability(t.channel, sig, p));
  const fcIndex = firstReaching(fc, t.probability);
  const why: string[] = [];
  if (t.channel === 'dip') why.push('the moon-dip channel has no analytic forecast: the Monte Carlo searches the whole range');
  if (!moon.forecast_regime_ok) {
    why.push(`the moon's own dip is large for its mass ((R_S/R_P)²/(M_S/M_P) = ${moon.photocentric_ratio.toPrecision(2)} ≥ ${PHOTOCENTRIC_LIMIT}): its photocentric TTV (Szabó et al. 2006) partly cancels the barycentric TTV the forecast assumes, so the forecast is only a first guess`);
  }
  if (t.channel === 'combined') why.push('for the combined channel the forecast is the joint TTV + TDV χ² test; the Monte Carlo combined rule is the min-p rule over the TTV, TDV, moon-dip and template tests, calibrated at α on the no-moon realizations');
  why.push(...observationCaveats(ctx));
  const forecast: BudgetForecastCurve = { probability: fc, applies: t.channel !== 'dip' && moon.forecast_regime_ok && observationCaveats(ctx).length === 0, index: fcIndex, why, seconds: (performance.now() - tf) / 1000 };
  const part = { targetMoon: moon, habitable: null, forecast };
  const alias = aliasNote(limits);
  if (alias) ctx.notes.push(alias);

  if (!isStable(limits)) {
    const reasons = [`the target moon is not where a moon can orbit (${moon.placement.join('; ')}; computeLimits): it is not simulated and no budget reaches it`];
    return { ...part, evaluations: [], answer: unreached(ctx, null, reasons) };
  }
  const absent = channelAbsent(ctx);
  if (absent) return { ...part, evaluations: [], answer: unreached(ctx, null, [absent]) };
  if (t.forecastOnly) return { ...part, evaluations: [], answer: forecastAnswer(ctx, fc, fcIndex, limits, precisions) };

  const K = q.values.length;
  const start = startIndex(ctx, fc, fcIndex);
  ctx.progress(`${tm.scenario.name}: Monte Carlo search for ${pct(t.probability)} ${t.channel} detection, ${t.realizations} moon + ${t.nullRealizations} no-moon realizations per value, starting at ${formatQuantity(q, q.values[start])}${fcIndex !== null ? ' (the forecast)' : ''}\n`);
  const evaluate = (i: number): BudgetEvaluation => {
    const e = evaluateMoon(quantityScenario(tm.scenario, q, q.values[i], 'cell 0'), i, q.values[i], ctx.mc);
    progressLine(ctx, e, `pdet_${t.channel} =`);
    return e;
  };
  const search = monteCarloSearch(ctx, start, evaluate);
  const evaluations = search.evaluations;
  const byIndex = (i: number): BudgetEvaluation | null => evaluations.find((e) => e.index === i) ?? null;
  if (search.capped) ctx.notes.push(`the Monte Carlo search stopped at its cap of evaluations before closing the bracket; the answer is the cheapest value seen to pass`);
  if (search.answer === null) {
    const best = evaluations.reduce<BudgetEvaluation | null>((b, e) => (b === null || e.index > b.index ? e : b), null);
    return { ...part, evaluations, answer: unreached(ctx, best, diagnose(ctx, limits, precisions, best, fc)) };
  }
  const a = search.answer;
  if (a + 1 < K && !byIndex(a + 1)) evaluations.push(evaluate(a + 1));
  const at = byIndex(a)!;
  const cheaper = a > 0 ? byIndex(a - 1) : null;
  const dearer = byIndex(a + 1);
  const nonMonotone = evaluations.filter((e) => e.index > a && !e.passed);
  if (nonMonotone.length > 0) {
    ctx.notes.push(`the Monte Carlo estimate is not monotone here: ${nonMonotone.map((e) => `${formatQuantity(q, e.value)} gives ${evaluationText(e)}`).join('; ')}, below the target although more demanding than the answer; the answer is uncertain at ${t.realizations} realizations (use more)`);
  }
  return { ...part, evaluations, answer: reachedAnswer(ctx, a, at, cheaper, dearer) };
}

function reachedAnswer(ctx: Context, a: number, at: BudgetEvaluation, cheaper: BudgetEvaluation | null, dearer: BudgetEvaluation | null): BudgetAnswer {
  const { q, t } = ctx;
  const { transits, hours } = transitsAt(ctx, a);
  const perTransitH = ctx.windowS / HOUR_S;
  const subject = t.habitable ? `${pct(t.habitable.fraction)} of the temperate, stable target moons at least ${pct(t.probability)} ${t.channel} detection` : `${pct(t.probability)} ${t.channel} detection of the target moon`;
  const what = ctx.t.habitable ? 'fraction of moons reaching it' : 'Monte Carlo probability';
  const head = q.solve === 'transits'
    ? `${transits} transits (${hours.toFixed(1)} h of telescope time: ${transits} × ${perTransitH.toFixed(2)} h per transit window) give ${subject}`
    : `the ${q.solve === 'cadence' ? 'coarsest cadence' : 'worst white-noise level'} giving ${subject} is ${formatQuantity(q, q.values[a])} (with ${transits} transits, ${hours.toFixed(1)} h)`;
  let text = `${head}: ${what} ${evaluationText(at)} at ${at.realizations} realizations`;
  if (cheaper) text += `; with ${formatQuantity(q, cheaper.value)} it is ${evaluationText(cheaper)}`;
  else if (a === 0) text += `; this is already the cheapest value in the range considered (${rangeEnd(ctx)})`;
  if (dearer) text += `; with ${formatQuantity(q, dearer.value)} it is ${evaluationText(dearer)}`;
  text += '.';
  if (!t.habitable && at.lower < t.probability) text += ` The interval at the answer reaches below ${pct(t.probability)}: the answer is the point estimate's, not a 95 % guarantee.`;
  return { reached: true, value: q.values[a], index: a, transits, hours, at, cheaperNeighbour: cheaper, dearerNeighbour: dearer, statement: text.charAt(0).toUpperCase() + text.slice(1), reasons: [] };
}

/** Where the cheap end of the grid stops, in words. */
function rangeEnd(ctx: Context): string {
  const q = ctx.q;
  if (q.solve === 'transits') return `at least ${q.values[0]} transits are needed for a TTV excess against a linear ephemeris`;
  if (q.solve === 'cadence') return `cadences coarser than T14/3 leave too few points in transit to fit`;
  return `noise levels above 100 times the scenario's are not considered`;
}

function unreached(ctx: Context, best: BudgetEvaluation | null, reasons: string[]): BudgetAnswer {
  const { transits, hours } = transitsAt(ctx, null);
  const goal = ctx.t.habitable ? `${pct(ctx.t.habitable.fraction)} of the target moons at ${pct(ctx.t.probability)}` : `${pct(ctx.t.probability)} ${ctx.t.channel} detection`;
  const statement = `The target (${goal}) cannot be reached at any ${ctx.q.solve === 'transits' ? 'number of transits' : ctx.q.solve === 'cadence' ? 'cadence' : 'noise level'} in range: ${reasons.join('; ')}.`;
  return { reached: false, value: null, index: null, transits, hours, at: best, cheaperNeighbour: null, dearerNeighbour: null, statement, reasons };
}

/**
 * Why the asked channel cannot exist whatever the cadence or noise (the scenario's transit count is
 * below what it needs, budgetSpec.ts minTransitsFor), or null. Solving for transits starts the grid
 * where the channel exists instead.
 */
function channelAbsent(ctx: Context): string | null {
  const n = ctx.base.observation.transits;
  const ch = ctx.t.channel;
  if (ctx.q.solve === 'transits' || n >= minTransitsFor(ch)) return null;
  const why = ch === 'ttv' ? 'a linear ephemeris (2 free parameters) fits 2 mid-times exactly, TTV needs 3 transits' : 'one duration leaves no degree of freedom, TDV needs 2 transits';
  return `no ${ch.toUpperCase()} channel with ${n} transit${n === 1 ? '' : 's'}: ${why}; choose --channel ${ch === 'ttv' ? 'tdv, dip or combined' : 'dip or combined'}, or more transits (observation.transits)`;
}

/** Why no value has a forecast: the dip channel has none; a timing channel may not exist at this transit count. */
function noForecastReason(ctx: Context, precisions: ValuePrecision[]): string {
  if (ctx.t.channel !== 'dip' && precisions.every((p) => !(p.sigmaTcS > 0 && Number.isFinite(p.sigmaTcS)))) {
    return 'no analytic forecast: without noise the timing precision is not a positive number, so there is no white-noise χ² test to forecast (run without --forecast-only for the Monte Carlo)';
  }
  const n = ctx.base.observation.transits;
  const ch = ctx.t.channel;
  if (ctx.q.solve !== 'transits' && ch !== 'dip' && n < minTransitsFor(ch === 'combined' ? 'tdv' : ch)) {
    const what = ch === 'ttv' ? `no TTV channel with ${n} transit${n === 1 ? '' : 's'} (a linear ephemeris has 2 free parameters; TTV needs 3)` : `no timing channel with ${n} transit; moon dip only`;
    return `${what}: no analytic forecast; run without --forecast-only for the Monte Carlo${ch === 'ttv' ? ', or choose --channel tdv, dip or combined' : ''}`;
  }
  return 'there is no analytic forecast for this channel (run without forecast-only for the Monte Carlo)';
}

/** The answer when the user asked for the forecast alone. */
function forecastAnswer(ctx: Context, fc: Array<number | null>, fcIndex: number | null, limits: LimitsJson | null, precisions: ValuePrecision[]): BudgetAnswer {
  const { q, t } = ctx;
  if (fcIndex === null) {
    const reasons = fc.every((p) => p === null)
      ? [noForecastReason(ctx, precisions)]
      : limits ? diagnose(ctx, limits, precisions, null, fc) : [`the forecast stays below the target over the whole range (at most ${pct(Math.max(...fc.map((p) => p ?? 0)))})`];
    return unreached(ctx, null, reasons);
  }
  const { transits, hours } = transitsAt(ctx, fcIndex);
  const subject = q.solve === 'transits' ? `${transits} transits (${hours.toFixed(1)} h)` : formatQuantity(q, q.values[fcIndex]);
  const statement = `Forecast only (no Monte Carlo): ${subject} is the cheapest value whose forecast reaches ${t.habitable ? `${pct(t.habitable.fraction)} of the target moons at ` : ''}${pct(t.probability)} (forecast ${p3(fc[fcIndex]!)}${fcIndex > 0 ? `; ${formatQuantity(q, q.values[fcIndex - 1])}: ${p3(fc[fcIndex - 1] ?? Number.NaN)}` : ''}).`;
  return { reached: true, value: q.values[fcIndex], index: fcIndex, transits, hours, at: null, cheaperNeighbour: null, dearerNeighbour: null, statement, reasons: [] };
}

/**
 * A note when the moon's TTV, sampled once per transit, aliases close to 0 or
 * ½ cycle per epoch (Kipping 2009, MNRAS 392, 181): near 0 a run of transits
 * sees a slow drift that the fitted ephemeris absorbs, near ½ the samples can
 * fall near the sinusoid's zeros; either way more transits are needed than the
 * amplitude alone suggests, and a wider or heavier moon can need more.
 */
function aliasNote(l: LimitsJson): string | null {
  const nu = l.ttv_alias_frequency_per_epoch;
  if (nu === null) return null;
  if (nu < ALIAS_EDGE) return `the moon's TTV aliases to ${nu.toPrecision(2)} cycles per epoch (period ${(1 / Math.max(nu, 1e-12)).toPrecision(3)} transits): over fewer transits than that it looks like a drift of the ephemeris, which the linear fit absorbs`;
  if (nu > 0.5 - ALIAS_EDGE) return `the moon's TTV aliases to ${nu.toPrecision(3)} cycles per epoch, near ½: alternate transits sample it near the same phase, and for some moon phases near its zeros`;
  return null;
}

/** Alias frequencies within this of 0 or ½ cycle per epoch get a note. */
const ALIAS_EDGE = 0.05;

/** Why the white-noise forecast is only a first guess for this observation (empty: it applies). */
function observationCaveats(ctx: Context): string[] {
  const out: string[] = [];
  const o = ctx.base.observation;
  if (ctx.base.instrument.redNoise) out.push('the scenario has correlated (red) noise; the forecast assumes white noise only');
  if (o.missedFraction > 0 || o.dutyCycle < 1) out.push('the scenario loses transits or parts of windows (missed_fraction, duty_cycle); the forecast assumes every transit fully observed');
  return out;
}

/** What the scenario's observation model means for the budget. */
function scenarioNotes(ctx: Context): string[] {
  const out: string[] = [...cautionNotes(ctx.base)];
  const i = ctx.base.instrument;
  const o = ctx.base.observation;
  if (ctx.q.solve === 'noise' && i.ground) {
    out.push(`the scenario's ground-based noise budget (photon, scintillation, floor) is replaced by its total, ${(i.noiseFraction * 1e6).toPrecision(4)} ppm per ${i.noiseTimescaleS} s exposure, as the white-noise level the search scales`);
  }
  if (ctx.q.solve === 'noise' && i.redNoise) out.push('only the white-noise level varies; the scenario\'s red noise is held fixed');
  if (o.missedFraction > 0) out.push(`the number of transits counts scheduled transits; the scenario loses a fraction ${o.missedFraction} of them (weather, scheduling), and the hours count every scheduled window`);
  return out;
}

/** Why a single moon's target is not reached: what was measured, and what limits it. */
function diagnose(ctx: Context, l: LimitsJson, precisions: ValuePrecision[], best: BudgetEvaluation | null, fc: Array<number | null>): string[] {
  const { q, t } = ctx;
  const K = q.values.length;
  const top = q.values[K - 1];
  const reasons: string[] = [];
  const edge = q.solve === 'transits' ? 'the most considered: --max-transits / budget.max_transits'
    : q.solve === 'cadence' ? 'the finest cadence considered' : "the lowest noise considered: 1/100 of the scenario's, or 0.1 ppm";
  if (best) reasons.push(`at ${formatQuantity(q, best.value)}${best.index === K - 1 ? ` (${edge})` : ''} the Monte Carlo gives ${evaluationText(best)}`);
  const fTop = fc[K - 1];
  if (fTop !== null && fTop !== undefined) reasons.push(`the forecast there is ${p3(fTop)}`);
  const sig = moonSignal(l);
  const pTop = precisions[K - 1];
  if (q.solve === 'transits' && t.channel !== 'dip' && fTop !== null && fTop < t.probability) {
    const need = forecastTransitsNeeded(t.channel, sig, pTop, t.probability, top + 1, FORECAST_TRANSITS_LIMIT);
    reasons.push(need !== null ? `the forecast needs about ${need} transits, beyond the maximum of ${top}` : `the forecast does not reach it within ${FORECAST_TRANSITS_LIMIT} transits`);
  }
  if (t.channel !== 'dip' && (l.ttv_rms_s ?? 0) < pTop.sigmaTcS && (l.tdv_rms_s ?? 0) < pTop.sigmaDurS) {
    reasons.push(`the moon's TTV rms (${(l.ttv_rms_s ?? 0).toPrecision(3)} s) and TDV rms (${(l.tdv_rms_s ?? 0).toPrecision(3)} s) are below the per-transit timing precision (${pTop.sigmaTcS.toPrecision(3)} s) and duration precision (${pTop.sigmaDurS.toPrecision(3)} s) even at the most demanding value: the signal is below the noise`);
  }
  if ((l.photocentric_ratio ?? 0) >= PHOTOCENTRIC_LIMIT && t.channel !== 'dip' && t.channel !== 'tdv') {
    reasons.push(`the moon's own dip is large for its mass ((R_S/R_P)²/(M_S/M_P) = ${(l.photocentric_ratio ?? 0).toPrecision(2)}), so its photocentric TTV cancels part of the barycentric TTV (Szabó et al. 2006, A&A 450, 395): the timing signal is weaker than the moon's mass suggests`);
  }
  const red = ctx.base.instrument.redNoise;
  if (red) {
    reasons.push(`the scenario's correlated (red) noise (${red.model === 'power_law' ? `power law, ${(red.rmsFraction * 1e6).toPrecision(3)} ppm per ${(red.timescaleS / 60).toPrecision(3)} min` : `damped random walk, ${(red.rmsFraction * 1e6).toPrecision(3)} ppm rms, τ = ${(red.tauS / 60).toPrecision(3)} min`}) is held fixed${q.solve === 'noise' ? ' while the white noise is lowered, so it sets a floor that no white-noise level removes' : ''}: it adds timing scatter that averages down slowly`);
  }
  if (t.channel === 'dip' || t.channel === 'combined') {
    reasons.push(`the moon's own dip is ${((l.moon_depth ?? 0) * 1e6).toPrecision(3)} ppm against ${(l.noise_per_exposure * 1e6).toPrecision(3)} ppm white noise per exposure (scenario)`);
  }
  return reasons;
}

function planPopulation(ctx: Context, clean: Record<string, unknown>): Part {
  const { t, q, base } = ctx;
  const h = t.habitable!;
  const pop = habitablePopulation(clean, base, h);
  const targets = pop.targets.map((m) => targetMoonInfo(m.scenario, m.limits));
  const chosen = spreadEvenly(pop.targets, h.confirmMoons);
  const habitable: BudgetResult['habitable'] = {
    mass_from_kg: h.massFromKg, mass_to_kg: h.massToKg, grid: h.grid, fraction: h.fraction, candidates: pop.candidates, targets, simulated: t.forecastOnly ? 0 : chosen.length,
  };
  ctx.notes.push(`target moons: ${h.grid} masses (log-spaced) × ${h.grid} separations (${(pop.separationFromM / 1e3).toFixed(0)}–${(pop.separationToM / 1e3).toFixed(0)} km, fluid Roche limit to the stable limit) at density ${pop.densityKgM3.toFixed(0)} kg/m³; ${targets.length} of ${pop.candidates} are stable and temperate`);
  const tf = performance.now();
  const precisions = precisionsAlong(q, base);
  const signals = pop.targets.map((m) => moonSignal(m.limits));
  const fc: Array<number | null> = precisions.map((p) => {
    if (signals.length === 0 || t.channel === 'dip') return null;
    let k = 0;
    for (const s of signals) if ((forecastProbability(t.channel, s, p) ?? 0) >= t.probability) k++;
    return k / signals.length;
  });
  const fcIndex = firstReaching(fc, h.fraction);
  const notOk = targets.filter((m) => !m.forecast_regime_ok).length;
  const why: string[] = [];
  if (t.channel === 'dip') why.push('the moon-dip channel has no analytic forecast');
  if (notOk > 0) why.push(`${notOk} of ${targets.length} target moons have a large dip for their mass ((R_S/R_P)²/(M_S/M_P) ≥ ${PHOTOCENTRIC_LIMIT}): their photocentric TTV (Szabó et al. 2006) spoils the forecast, which is only a first guess`);
  why.push(...observationCaveats(ctx));
  const forecast: BudgetForecastCurve = { probability: fc, applies: t.channel !== 'dip' && notOk === 0 && observationCaveats(ctx).length === 0, index: fcIndex, why, seconds: (performance.now() - tf) / 1000 };
  const part = { targetMoon: null, habitable, forecast };
  if (targets.length === 0) {
    const ex = Object.entries(pop.excluded).map(([k, v]) => `${v} ${k}`).join(', ');
    return { ...part, evaluations: [], answer: unreached(ctx, null, [`none of the ${pop.candidates} candidate moons of ${(h.massFromKg / M_EARTH_KG).toPrecision(2)}–${(h.massToKg / M_EARTH_KG).toPrecision(2)} Mearth is both stable and temperate (${ex || 'no separation lies between the Roche and the stable limit'})`]) };
  }
  const absent = channelAbsent(ctx);
  if (absent) return { ...part, evaluations: [], answer: unreached(ctx, null, [absent]) };
  if (t.forecastOnly) return { ...part, evaluations: [], answer: forecastAnswer(ctx, fc, fcIndex, null, precisions) };
  const K = q.values.length;
  const start = startIndex(ctx, fc, fcIndex);
  ctx.progress(`${base.name}: Monte Carlo search over ${chosen.length} of ${targets.length} temperate, stable moons, ${t.realizations} realizations each + ${t.nullRealizations} no-moon per value, starting at ${formatQuantity(q, q.values[start])}\n`);
  const evaluate = (i: number): BudgetEvaluation => {
    const v = q.values[i];
    const e = evaluatePopulation(chosen.map((m) => quantityScenario(m.scenario, q, v, `cell ${m.gridIndex}`)), chosen.map((m) => m.gridIndex), i, v, ctx.mc, h.fraction);
    progressLine(ctx, e, 'fraction of moons reaching it');
    return e;
  };
  const search = monteCarloSearch(ctx, start, evaluate);
  const evaluations = search.evaluations;
  if (chosen.length < targets.length) ctx.notes.push(`the Monte Carlo simulates ${chosen.length} of the ${targets.length} target moons (spread evenly over the grid; --confirm-moons); the fraction's interval is over those moons only`);
  if (search.answer === null) {
    const best = evaluations.reduce<BudgetEvaluation | null>((b, e) => (b === null || e.index > b.index ? e : b), null);
    const reasons = [best ? `at ${formatQuantity(q, best.value)}, the most demanding value tried, ${evaluationText(best)} of the simulated moons reach ${pct(t.probability)}` : 'no value was evaluated'];
    if (notOk > 0 && t.channel !== 'dip') reasons.push(`${notOk} of the ${targets.length} moons have a photocentric TTV that cancels part of their barycentric TTV (Szabó et al. 2006)`);
    return { ...part, evaluations, answer: unreached(ctx, best, reasons) };
  }
  const a = search.answer;
  const byIndex = (i: number): BudgetEvaluation | null => evaluations.find((e) => e.index === i) ?? null;
  return { ...part, evaluations, answer: reachedAnswer(ctx, a, byIndex(a)!, a > 0 ? byIndex(a - 1) : null, byIndex(a + 1)) };
}

/**
 * The note on the false-alarm calibration. Order statistic: every threshold (each channel at α, and the
 * combined min-p rule at α: timing/detection.ts) is the order statistic x_(k), k = ⌈(n + 1)(1 − α)⌉, of all
 * n no-moon realizations of the evaluated value, whose exceedance probability is Beta(n + 1 − k, k) (David
 * & Nagaraja 2003, Order Statistics, 3rd ed., §2.2): its mean and 95 % interval are stated. Tail fit (the
 * default): a generalised Pareto fit of the upper tail (Knijnenburg et al. 2009), whose rate in force each
 * evaluation reports with a bootstrap interval (the evaluations' range is stated). A count below 25/α
 * (order statistic) or 15/α (tail fit) is flagged with the count that fixes it.
 */
function nullCountNotes(ctx: Context, evaluations: BudgetEvaluation[]): string[] {
  const alpha = ctx.base.detection.falseAlarm;
  const n = ctx.t.nullRealizations;
  const measured = evaluations.map((e) => e.falseAlarmMeasured).filter((x): x is number => x !== null && Number.isFinite(x));
  const mText = measured.length > 0 ? `; the combined rule fires on ${Math.min(...measured).toFixed(3)}–${Math.max(...measured).toFixed(3)} of them (each scored against the others)` : '';
  const subject = `false-alarm thresholds come from all ${n} no-moon realizations per value (${ctx.t.channel === 'combined' ? 'each channel and the combined min-p rule' : 'the test'} at α = ${alpha})`;
  if (calibrationMethodOf(ctx.base) === 'tail') {
    const text = `${subject}: a generalised Pareto fit of their upper tail (detection.calibration: tail; where the tail is too short for α, the order statistic), with ${(alpha * n).toPrecision(3)} expected exceedances at α`;
    if (alpha * n < NULL_EXCEEDANCES_TAIL - 1e-9) {
      return [`${text}: fewer than ${NULL_EXCEEDANCES_TAIL}, below what the fit was measured to hold its rate at; --no-moon-realizations ${Math.ceil(NULL_EXCEEDANCES_TAIL / alpha)} fixes it, at a proportional cost${mText}`];
    }
    return [`${text}${mText}`];
  }
  const r = rateInForce(n, alpha);
  const text = `${subject}: ` +
    `the rate in force is ${r.mean.toPrecision(2)} on average, 95 % between ${r.lower.toPrecision(2)} and ${r.upper.toPrecision(2)} (Beta distribution of the order statistic), resting on ${r.exceedances} expected exceedances`;
  if (r.exceedances < NULL_EXCEEDANCES) {
    return [`${text}: fewer than ${NULL_EXCEEDANCES}, so the rate a value is judged at may be well off α; --no-moon-realizations ${Math.ceil(NULL_EXCEEDANCES / alpha)} fixes it, at a proportional cost${mText}`];
  }
  return [`${text}${mText}`];
}

function assumptions(ctx: Context): string[] {
  const out = [
    `the detection probability is assumed to rise monotonically with ${ctx.q.solve === 'transits' ? 'the number of transits' : ctx.q.solve === 'cadence' ? 'finer cadence' : 'lower white noise'}: the search gallops from the forecast's guess and bisects on that assumption; Monte Carlo noise can break it locally, which the neighbours show`,
    'a value reaches the target when the Monte Carlo point estimate is at least the target; the Wilson 95 % interval says how sure that is',
    'every evaluation of a moon draws the same random streams (seeded by the scenario seed), so neighbouring values share their random numbers',
    'the analytic forecast (noncentral chi-square of white-noise TTV/TDV excesses at the model\'s Cramér–Rao timing precision, barycentric TTV only) brackets the answer; the Monte Carlo decides it',
    'the transits are consecutive; telescope time per transit is the planet\'s T14 plus the scenario\'s out-of-transit baseline on each side, with no allowance for weather, overheads or gaps',
    'the moon\'s orbital phase (and node, periapsis where they matter) is drawn uniformly in each realization, as in the sweep',
  ];
  if (ctx.q.solve === 'cadence') out.push('the finest cadence considered is 10 s and the coarsest T14/3; the exposure follows the cadence (at the scenario\'s exposure/cadence ratio when it gives an exposure)');
  if (ctx.q.solve === 'noise') out.push('the white-noise level changes at the scenario\'s stated timescale, between 1/100 and 100 times the scenario\'s level');
  if (ctx.q.solve === 'transits') {
    out.push(`from ${ctx.q.values[0]} transit${ctx.q.values[0] === 1 ? '' : 's'}: the TTV channel needs 3 (N − 2 ≥ 1 degrees of freedom against a linear ephemeris), TDV 2, the moon dip 1; below 3 the combined rule uses the channels that exist`);
  }
  return out;
}

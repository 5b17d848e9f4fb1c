/**
 * The `budget --json` document: the `BudgetResult` in the project's
 * vocabulary (docs/vocabulary.md): snake_case keys, SI with unit suffixes,
 * plain fractions. The planner keeps its camelCase fields inside; this is the
 * one place that names them for the outside.
 */
import { HOUR_S } from '../physics/constants.js';
import { observabilityToJson, type ObservingPlanJson } from './nightsJson.js';
import type { BudgetAnswer, BudgetChannel, BudgetEvaluation, BudgetForecastCurve, BudgetQuantityInfo, BudgetResult, BudgetSolve, BudgetTargetMoon } from './budgetTypes.js';

export const BUDGET_SCHEMA = 'moonsieve/budget/1';

export interface BudgetEvaluationJson {
  index: number;
  /** The solved quantity's value in `quantity.unit` (SI; a count for transits). */
  value: number;
  /** Detection probability of the chosen channel (habitable: fraction of target moons reaching it), with its Wilson 95 % interval. */
  probability: number;
  probability_lo: number;
  probability_hi: number;
  passed: boolean;
  /** Detection probability per channel (single moon only). */
  pdet: { combined: number | null; ttv: number | null; tdv: number | null; dip: number | null; template: number | null } | null;
  false_alarm_measured_combined: number | null;
  realizations: number;
  no_moon_realizations: number;
  wall_time_s: number;
}

export interface BudgetQuantityJson {
  solve: BudgetSolve;
  field: string;
  /** SI unit of `values`, `scenario_value` and every evaluation's `value` ('' for a count or a fraction). */
  unit: string;
  display_unit: string;
  /** display value = SI value / display_factor. */
  display_factor: number;
  values: number[];
  scenario_value: number;
  cheaper: string;
}

export interface BudgetAnswerJson {
  reached: boolean;
  value: number | null;
  index: number | null;
  transits: number;
  /** Telescope time of the answer's transits: n × (T14 + 2 × baseline). */
  telescope_time_s: number;
  at: BudgetEvaluationJson | null;
  cheaper_neighbour: BudgetEvaluationJson | null;
  dearer_neighbour: BudgetEvaluationJson | null;
  statement: string;
  reasons: string[];
}

export interface BudgetForecastJson {
  probability: Array<number | null>;
  applies: boolean;
  index: number | null;
  why: string[];
  wall_time_s: number;
}

export interface BudgetTargetMoonJson {
  moon_mass_kg: number;
  moon_mass_text: string;
  moon_separation_text: string;
  moon_separation_m: number;
  moon_radius_m: number;
  placement: string[];
  habitability: string | null;
  ttv_rms_s: number;
  tdv_rms_s: number;
  photocentric_ratio: number;
  forecast_regime_ok: boolean;
}

export interface BudgetJson {
  schema: typeof BUDGET_SCHEMA;
  scenario: string;
  solve: BudgetSolve;
  channel: BudgetChannel;
  probability_target: number;
  false_alarm: number;
  realizations: number;
  no_moon_realizations: number;
  monte_carlo: boolean;
  quantity: BudgetQuantityJson;
  target_moon: BudgetTargetMoonJson | null;
  habitable: {
    moon_mass_from_kg: number;
    moon_mass_to_kg: number;
    grid: number;
    fraction: number;
    candidates: number;
    targets: BudgetTargetMoonJson[];
    simulated: number;
  } | null;
  forecast: BudgetForecastJson;
  evaluations: BudgetEvaluationJson[];
  answer: BudgetAnswerJson;
  window_per_transit_s: number;
  /** True when the budget has no calendar (no site, target and campaign): every transit is assumed observed whole. */
  assumes_every_transit_whole: boolean;
  /** The observability statement: the nights plan in a sentence, or the whole-transit assumption. */
  observability: string;
  /** Epochs to book, nights, hours on sky and calendar time (null without site, target and campaign). */
  observing_plan: ObservingPlanJson | null;
  notes: string[];
  assumptions: string[];
  wall_time_s: number;
}

const channel = (c: Record<string, number>, k: string): number | null => (typeof c[k] === 'number' && Number.isFinite(c[k]) ? c[k] : null);

function evaluation(e: BudgetEvaluation): BudgetEvaluationJson {
  return {
    index: e.index,
    value: e.value,
    probability: e.probability,
    probability_lo: e.lower,
    probability_hi: e.upper,
    passed: e.passed,
    pdet: e.channels && { combined: channel(e.channels, 'combined'), ttv: channel(e.channels, 'ttv'), tdv: channel(e.channels, 'tdv'), dip: channel(e.channels, 'dip'), template: channel(e.channels, 'template') },
    false_alarm_measured_combined: e.falseAlarmMeasured,
    realizations: e.realizations,
    no_moon_realizations: e.nullRealizations,
    wall_time_s: e.seconds,
  };
}

const quantity = (q: BudgetQuantityInfo): BudgetQuantityJson => ({
  solve: q.solve, field: q.field, unit: q.unit, display_unit: q.displayUnit, display_factor: q.displayFactor, values: q.values, scenario_value: q.scenarioValue, cheaper: q.cheaper,
});

const answer = (a: BudgetAnswer): BudgetAnswerJson => ({
  reached: a.reached,
  value: a.value,
  index: a.index,
  transits: a.transits,
  telescope_time_s: a.hours * HOUR_S,
  at: a.at && evaluation(a.at),
  cheaper_neighbour: a.cheaperNeighbour && evaluation(a.cheaperNeighbour),
  dearer_neighbour: a.dearerNeighbour && evaluation(a.dearerNeighbour),
  statement: a.statement,
  reasons: a.reasons,
});

const forecast = (f: BudgetForecastCurve): BudgetForecastJson => ({ probability: f.probability, applies: f.applies, index: f.index, why: f.why, wall_time_s: f.seconds });

const targetMoon = (m: BudgetTargetMoon): BudgetTargetMoonJson => ({
  moon_mass_kg: m.mass_kg,
  moon_mass_text: m.mass_text,
  moon_separation_text: m.separation_text,
  moon_separation_m: m.separation_m,
  moon_radius_m: m.radius_m,
  placement: m.placement,
  habitability: m.habitability,
  ttv_rms_s: m.ttv_rms_s,
  tdv_rms_s: m.tdv_rms_s,
  photocentric_ratio: m.photocentric_ratio,
  forecast_regime_ok: m.forecast_regime_ok,
});

/** The `budget --json` document of a result. */
export function budgetToJson(r: BudgetResult): BudgetJson {
  return {
    schema: BUDGET_SCHEMA,
    scenario: r.scenario,
    solve: r.solve,
    channel: r.channel,
    probability_target: r.probability_target,
    false_alarm: r.false_alarm,
    realizations: r.realizations,
    no_moon_realizations: r.no_moon_realizations,
    monte_carlo: r.monte_carlo,
    quantity: quantity(r.quantity),
    target_moon: r.target_moon && targetMoon(r.target_moon),
    habitable: r.habitable && {
      moon_mass_from_kg: r.habitable.mass_from_kg,
      moon_mass_to_kg: r.habitable.mass_to_kg,
      grid: r.habitable.grid,
      fraction: r.habitable.fraction,
      candidates: r.habitable.candidates,
      targets: r.habitable.targets.map(targetMoon),
      simulated: r.habitable.simulated,
    },
    forecast: forecast(r.forecast),
    evaluations: r.evaluations.map(evaluation),
    answer: answer(r.answer),
    window_per_transit_s: r.window_per_transit_s,
    ...observabilityToJson(r.observability),
    notes: r.notes,
    assumptions: r.assumptions,
    wall_time_s: r.wall_time_s,
  };
}

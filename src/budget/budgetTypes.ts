/**
 * The shapes of an observing-budget question and its answer (`planBudget`).
 * All numbers SI (s, m, kg, fractions); keys of the JSON answer are snake_case
 * like the other `--json` outputs.
 */
import type { Observability } from './nightsBudget.js';

/** What the budget solves for, the rest of the scenario held fixed. */
/** What a budget solves for; `noise` is the white-noise level (`instrument.noise`; its old name `precision` is read for one release). */
export type BudgetSolve = 'transits' | 'cadence' | 'noise';
export const BUDGET_SOLVES: readonly BudgetSolve[] = ['transits', 'cadence', 'noise'];

/** Which detection decision must reach the probability (as in the sweep's cells). */
export type BudgetChannel = 'combined' | 'ttv' | 'tdv' | 'dip' | 'template';
export const BUDGET_CHANNELS: readonly BudgetChannel[] = ['combined', 'ttv', 'tdv', 'dip', 'template'];

/** A population of target moons instead of one (`--habitable`). */
export interface HabitableTarget {
  /** Moon-mass range, kg (log-spaced grid). */
  massFromKg: number;
  massToKg: number;
  /** Grid size per axis: `grid` masses × `grid` separations (fluid Roche limit to the stable limit). */
  grid: number;
  /** Fraction of the temperate, stable moons that must reach the probability, in (0, 1]. */
  fraction: number;
  /** At most this many of them are simulated in each Monte Carlo evaluation (spread evenly over the list). */
  confirmMoons: number;
}

/**
 * The question, as the library takes it. Every field is optional: missing
 * fields come from the scenario's `budget:` block, then from the defaults.
 */
export interface BudgetTarget {
  /** Target moon mass, kg (default: the scenario's moon). */
  moonMassKg?: number;
  /** Target moon separation: metres, or text as in a scenario ("18 Rp", "0.2 hill", "1e9 m"). */
  moonSeparation?: number | string;
  /** Detection probability to reach, in (0, 1). */
  probability?: number;
  solve?: BudgetSolve;
  channel?: BudgetChannel;
  /** Moon realizations per Monte Carlo evaluation. */
  realizations?: number;
  /** No-moon realizations that calibrate the false-alarm thresholds at each evaluated value. */
  nullRealizations?: number;
  /** Largest number of transits considered. */
  maxTransits?: number;
  /** Answer from the analytic forecast alone (no Monte Carlo). */
  forecastOnly?: boolean;
  habitable?: HabitableTarget | null;
  /** Names of the moon values' source for messages (the CLI passes its flag names); default `target.<field>`. */
  sourceNames?: { moonMassKg?: string; moonSeparation?: string };
  /** The target moon's mass as the user wrote it (the CLI sets it), so answers use their unit. */
  moonMassText?: string;
  /** The target moon's separation as the user wrote it ("18 Rp", "0.2 hill", "0.01 AU"). */
  moonSeparationText?: string;
}

/** The question with every default filled in and every value checked. */
export interface ResolvedBudgetTarget {
  moonMassKg: number | null;
  moonSeparation: number | string | null;
  /** Where the moon values came from (for messages): a flag name or a `budget.` path. */
  moonMassSource: string;
  moonSeparationSource: string;
  /** The target moon's mass as the user wrote it ("0.6 Mearth"), for answers in their unit; null when not given as text. */
  moonMassText: string | null;
  /** The separation as the user wrote it, for answers in their unit; null when not given as text. */
  moonSeparationText: string | null;
  probability: number;
  solve: BudgetSolve;
  channel: BudgetChannel;
  realizations: number;
  /** null: the default ⌈15/α⌉ (tail fit) or ⌈25/α⌉ (order statistic), at least R and 200, resolved once α is known (planBudget). */
  nullRealizations: number | null;
  maxTransits: number;
  forecastOnly: boolean;
  habitable: HabitableTarget | null;
  /** Old spellings met in the budget block, one line each (the answer's notes repeat them). */
  deprecations?: string[];
}

/** One Monte Carlo evaluation at one value of the solved quantity. */
export interface BudgetEvaluation {
  index: number;
  /** The solved quantity's value, SI (transits: a count). */
  value: number;
  /** Detection probability of the chosen channel (habitable: fraction of target moons reaching the probability). */
  probability: number;
  /** Wilson 95 % interval of `probability`. */
  lower: number;
  upper: number;
  /** probability ≥ the target (habitable: fraction ≥ the requested fraction). */
  passed: boolean;
  /** Probabilities of every channel (single moon only). */
  channels: Record<string, number> | null;
  /** Fraction of the no-moon realizations (each scored against the others) on which the combined rule fires. */
  falseAlarmMeasured: number | null;
  realizations: number;
  nullRealizations: number;
  seconds: number;
}

export interface BudgetQuantityInfo {
  solve: BudgetSolve;
  /** Scenario field written (as in a sweep axis). */
  field: string;
  /** SI unit of the values ('' for a count or a fraction). */
  unit: string;
  /** Display unit and factor (display = SI / factor). */
  displayUnit: string;
  displayFactor: number;
  /** Grid of candidate values, ordered from the cheapest (fewest transits, coarsest cadence, worst noise) to the most demanding. */
  values: number[];
  /** The scenario's own value. */
  scenarioValue: number;
  /** Words for "cheaper" along the grid, e.g. "fewer transits". */
  cheaper: string;
}

export interface BudgetAnswer {
  /** Whether some value in range reaches the probability (by the Monte Carlo, or the forecast when forecast-only). */
  reached: boolean;
  /** The cheapest value reaching it, SI (null when not reached). */
  value: number | null;
  index: number | null;
  /** Transits at the answer, and the telescope time they cost: n × (T14 + 2 × baseline). */
  transits: number;
  hours: number;
  /** The evaluation at the answer and at its neighbours on the grid (null where none). */
  at: BudgetEvaluation | null;
  cheaperNeighbour: BudgetEvaluation | null;
  dearerNeighbour: BudgetEvaluation | null;
  /** One or two sentences: the answer, or why the target cannot be reached. */
  statement: string;
  /** Why not reached (empty when reached). */
  reasons: string[];
}

export interface BudgetForecastCurve {
  /** Forecast probability (habitable: fraction of target moons whose forecast reaches the probability) per grid value; null where it cannot be computed. */
  probability: Array<number | null>;
  /** Whether the forecast's assumptions hold for this question (white-noise timing, barycentric TTV, a TTV/TDV channel). */
  applies: boolean;
  /** Cheapest grid index whose forecast reaches the target (null: none). */
  index: number | null;
  why: string[];
  seconds: number;
}

export interface BudgetTargetMoon {
  mass_kg: number;
  /** The mass in the unit the user wrote (Earth masses otherwise), for display. */
  mass_text: string;
  /** The separation in km, and in the unit the user wrote when it was not a length in km. */
  separation_text: string;
  separation_m: number;
  radius_m: number;
  placement: string[];
  habitability: string | null;
  ttv_rms_s: number;
  tdv_rms_s: number;
  photocentric_ratio: number;
  forecast_regime_ok: boolean;
}

export interface BudgetResult {
  scenario: string;
  /** The answer in nights, hours on sky and calendar time when the scenario gives site, target and campaign; else the statement that every transit is assumed whole. */
  observability: Observability;
  solve: BudgetSolve;
  channel: BudgetChannel;
  probability_target: number;
  false_alarm: number;
  realizations: number;
  no_moon_realizations: number;
  monte_carlo: boolean;
  quantity: BudgetQuantityInfo;
  /** Single-moon mode: the target moon; habitable mode: null. */
  target_moon: BudgetTargetMoon | null;
  habitable: {
    mass_from_kg: number;
    mass_to_kg: number;
    grid: number;
    fraction: number;
    candidates: number;
    targets: BudgetTargetMoon[];
    simulated: number;
  } | null;
  forecast: BudgetForecastCurve;
  /** Monte Carlo evaluations in the order they were run. */
  evaluations: BudgetEvaluation[];
  answer: BudgetAnswer;
  /** Per transit: T14 + 2 × baseline, s. */
  window_per_transit_s: number;
  notes: string[];
  assumptions: string[];
  wall_time_s: number;
}

export interface PlanBudgetOptions {
  /** Progress lines (one per Monte Carlo evaluation). */
  progress?: (line: string) => void;
}

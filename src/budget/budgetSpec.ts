/**
 * The budget question from its three sources, in order of precedence: the
 * caller's `BudgetTarget` (the CLI fills it from flags), the scenario's
 * `budget:` block, then the defaults. Every problem names where the value
 * came from (`--probability`, `budget.probability`, `target.probability`),
 * the value and what is allowed, all at once.
 *
 *   budget:
 *     probability: 0.9            # or "90 %"
 *     solve: transits             # transits | cadence | noise
 *     channel: combined           # combined | ttv | tdv | dip | template
 *     moon_mass: 0.6 Mearth       # target moon (default: the scenario's moon)
 *     moon_separation: 18 Rp      # length, "N Rp" or "f hill"
 *     realizations: 100
 *     no_moon_realizations: 400
 *     max_transits: 50
 *     forecast_only: false
 *     habitable: {mass_from: 0.1 Mearth, mass_to: 2 Mearth, grid: 8, fraction: 0.5, confirm_moons: 8}
 *                                 # or `habitable: true` for these defaults
 */
import { M_EARTH_KG } from '../physics/constants.js';
import { InputError, type FieldProblem } from '../scenario/errors.js';
import { FieldReader } from '../scenario/fieldReader.js';
import { parseQuantity, splitNumberUnit } from '../scenario/units.js';
import { BUDGET_CHANNELS, BUDGET_SOLVES, type BudgetChannel, type BudgetSolve, type BudgetTarget, type HabitableTarget, type ResolvedBudgetTarget } from './budgetTypes.js';

export const DEFAULT_BUDGET_PROBABILITY = 0.9;
/** Moon realizations per Monte Carlo evaluation (one target moon). */
export const DEFAULT_BUDGET_REALIZATIONS = 100;
/** Moon realizations per target moon in habitable mode (many moons per evaluation). */
export const DEFAULT_HABITABLE_REALIZATIONS = 40;
/**
 * No-moon realizations per evaluated value: null here means the sweep's default,
 * ⌈15/α⌉ with the tail-fit calibration (the default) or ⌈25/α⌉ with the order
 * statistic (and at least R and 200; sweep/nullSet.ts), resolved by planBudget once
 * α is known; both hold the rate in force within about ±40 % (95 %) of α (measured
 * for the tail fit: bench/tailFit.ts); all of them calibrate (timing/detection.ts).
 */
export const DEFAULT_BUDGET_NULL_REALIZATIONS = null;
export const DEFAULT_MAX_TRANSITS = 50;
/** The TTV excess against a linear ephemeris needs at least 3 transits (N − 2 degrees of freedom). */
export const MIN_BUDGET_TRANSITS = 3;

/**
 * The fewest transits at which `channel` exists (detectionForecast.ts, "Few transits"): TTV 3
 * (N − 2 ≥ 1 dof against a linear ephemeris), TDV 2 (N − 1 ≥ 1 about the mean duration), the moon
 * dip 1; the combined rule is the union of the channels that exist, so from 1 transit it is the dip.
 */
export function minTransitsFor(channel: BudgetChannel): number {
  return channel === 'ttv' ? 3 : channel === 'tdv' ? 2 : 1;
}
export const MAX_BUDGET_TRANSITS = 10000;

export const DEFAULT_HABITABLE: HabitableTarget = {
  massFromKg: 0.1 * M_EARTH_KG,
  massToKg: 2 * M_EARTH_KG,
  grid: 8,
  fraction: 0.5,
  confirmMoons: 8,
};

const PROBABILITY_TEXT = 'expected a detection probability above 0 and below 1, e.g. 0.9 or "90 %"';
const REALIZATIONS_TEXT = 'expected a whole number of moon realizations from 1 to 100000';
const NULL_TEXT = 'expected a whole number of no-moon realizations from 4 to 1000000';
const MAX_TRANSITS_TEXT = `expected a whole number of transits from 1 to ${MAX_BUDGET_TRANSITS}`;
const SEPARATION_TEXT = 'expected a length ("1e9 m", "0.01 AU"), planet radii ("18 Rp") or a fraction of the Hill radius ("0.2 hill")';

/** Where a value is read from: a reader and the key inside it (so its path names the source). */
interface Source {
  r: FieldReader;
  key: string;
}

/** The CLI's flag values (strings or booleans as commander gives them), keyed by flag name without dashes. */
export type BudgetFlags = Record<string, string | boolean | undefined>;

/** Flag name (`--moon-mass`) ↔ budget-block key (`moon_mass`). */
const KEYS: ReadonlyArray<[string, string]> = [
  ['moon_mass', '--moon-mass'],
  ['moon_separation', '--moon-separation'],
  ['probability', '--probability'],
  ['solve', '--solve'],
  ['channel', '--channel'],
  ['realizations', '--realizations'],
  ['no_moon_realizations', '--no-moon-realizations'],
  ['max_transits', '--max-transits'],
  ['forecast_only', '--forecast-only'],
];

const HABITABLE_KEYS: ReadonlyArray<[string, string]> = [
  ['mass_from', '--mass-from'],
  ['mass_to', '--mass-to'],
  ['grid', '--grid'],
  ['fraction', '--fraction'],
  ['confirm_moons', '--confirm-moons'],
];

/**
 * Whether the raw value parses as a quantity of `kind` (a bare number counts when `bare`);
 * if not, record `allowed` as the problem: the unit parser's generic examples ("60 ppm" for
 * a fraction, "1 Msun" for a mass) would mislead for a probability or a moon's mass.
 */
function parses(s: Source, kind: 'fraction' | 'mass', allowed: string, bare?: [number, string]): boolean {
  const raw = s.r.raw(s.key);
  if (raw === undefined || raw === null) return true;
  try {
    parseQuantity(raw, s.r.path(s.key), kind, bare?.[0], bare?.[1]);
    return true;
  } catch {
    s.r.problem(s.key, raw, allowed);
    return false;
  }
}

function readProbability(s: Source): number {
  if (!parses(s, 'fraction', PROBABILITY_TEXT, [1, 'a fraction'])) return Number.NaN;
  return s.r.quantity(s.key, 'fraction', { bare: [1, 'a fraction'], min: 0, minExclusive: true, max: 1, maxExclusive: true, rangeText: PROBABILITY_TEXT });
}

function readInt(s: Source, min: number, max: number, text: string): number {
  return s.r.number(s.key, { integer: true, min, max, rangeText: text });
}

const MOON_MASS_TEXT = 'expected a positive moon mass, e.g. "0.6 Mearth" or "7e22 kg"';

function readMass(s: Source): number {
  if (!parses(s, 'mass', MOON_MASS_TEXT)) return Number.NaN;
  return s.r.quantity(s.key, 'mass', { min: 0, minExclusive: true, rangeText: MOON_MASS_TEXT });
}

/** A separation as the scenario accepts it; kept as text for "Rp" and "hill" (resolved against the scenario later). */
function readSeparation(s: Source): number | string | null {
  const raw = s.r.raw(s.key);
  if (raw === undefined || raw === null) return null;
  if (typeof raw === 'string') {
    const nu = splitNumberUnit(raw);
    if (nu && (nu.unit === 'Rp' || nu.unit === 'hill')) {
      if (nu.num > 0 && Number.isFinite(nu.num)) return raw;
      s.r.problem(s.key, raw, 'must be positive; ' + SEPARATION_TEXT);
      return null;
    }
  }
  try {
    const m = parseQuantity(raw, s.r.path(s.key), 'length');
    if (m > 0) return m;
  } catch {
    // reported below
  }
  s.r.problem(s.key, raw, SEPARATION_TEXT);
  return null;
}

function readBool(s: Source): boolean | undefined {
  const raw = s.r.raw(s.key);
  if (raw === undefined || raw === null) return undefined;
  if (typeof raw === 'boolean') return raw;
  s.r.problem(s.key, raw, 'expected true or false');
  return undefined;
}

/**
 * The CLI flags as a `BudgetTarget`. Throws InputError naming each bad flag.
 * `flags` keys are commander's camelCase option names (moonMass, nullRealizations...).
 */
export function readBudgetFlags(flags: BudgetFlags): BudgetTarget {
  const problems: FieldProblem[] = [];
  const byFlag: Record<string, unknown> = {};
  for (const [, flag] of [...KEYS, ...HABITABLE_KEYS, ['habitable', '--habitable']]) {
    const camel = flag.slice(2).replace(/-([a-z])/g, (_, c: string) => c.toUpperCase());
    if (flags[camel] !== undefined) byFlag[flag] = flags[camel];
  }
  const r = new FieldReader(byFlag, '', problems);
  const src = (flag: string): Source | null => (byFlag[flag] === undefined ? null : { r, key: flag });
  const t: BudgetTarget = {};
  let s: Source | null;
  if ((s = src('--moon-mass'))) {
    t.moonMassKg = readMass(s);
    if (typeof byFlag['--moon-mass'] === 'string') t.moonMassText = byFlag['--moon-mass'];
  }
  if ((s = src('--moon-separation'))) {
    t.moonSeparation = readSeparation(s) ?? undefined;
    if (typeof byFlag['--moon-separation'] === 'string') t.moonSeparationText = byFlag['--moon-separation'];
  }
  if ((s = src('--probability'))) t.probability = readProbability(s);
  if ((s = src('--solve'))) t.solve = readSolve(s, []);
  if ((s = src('--channel'))) t.channel = r.choice(s.key, BUDGET_CHANNELS, 'combined');
  if ((s = src('--realizations'))) t.realizations = readInt(s, 1, 100000, REALIZATIONS_TEXT);
  if ((s = src('--no-moon-realizations'))) t.nullRealizations = readInt(s, 4, 1_000_000, NULL_TEXT);
  if ((s = src('--max-transits'))) t.maxTransits = readInt(s, 1, MAX_BUDGET_TRANSITS, MAX_TRANSITS_TEXT);
  if (flags.forecastOnly === true) t.forecastOnly = true;
  const habitableFlags = HABITABLE_KEYS.filter(([, f]) => byFlag[f] !== undefined).map(([, f]) => f);
  if (flags.habitable === true) {
    t.habitable = readHabitable((key) => {
      const flag = HABITABLE_KEYS.find(([k]) => k === key)![1];
      return byFlag[flag] === undefined ? null : { r, key: flag };
    }, DEFAULT_HABITABLE);
  } else if (habitableFlags.length > 0) {
    problems.push({ path: habitableFlags[0], value: byFlag[habitableFlags[0]], allowed: 'only with --habitable' });
  }
  if (problems.length > 0) throw new InputError(problems);
  t.sourceNames = { moonMassKg: '--moon-mass', moonSeparation: '--moon-separation' };
  return t;
}

function readHabitable(get: (key: string) => Source | null, base: HabitableTarget): HabitableTarget {
  const h = { ...base };
  let s: Source | null;
  if ((s = get('mass_from'))) h.massFromKg = readMass(s);
  if ((s = get('mass_to'))) h.massToKg = readMass(s);
  if ((s = get('grid'))) h.grid = readInt(s, 2, 40, 'expected a whole number of grid points per axis from 2 to 40');
  const FRACTION_TEXT = 'expected a fraction of the target moons above 0 and at most 1, e.g. 0.5 or "50 %"';
  if ((s = get('fraction'))) h.fraction = !parses(s, 'fraction', FRACTION_TEXT, [1, 'a fraction']) ? Number.NaN : s.r.quantity(s.key, 'fraction', { bare: [1, 'a fraction'], min: 0, minExclusive: true, max: 1, rangeText: 'expected a fraction of the target moons above 0 and at most 1, e.g. 0.5 or "50 %"' });
  if ((s = get('confirm_moons'))) h.confirmMoons = readInt(s, 1, 1600, 'expected a whole number of moons to simulate from 1 to 1600');
  if (Number.isFinite(h.massFromKg) && Number.isFinite(h.massToKg) && !(h.massToKg > h.massFromKg)) {
    const to = get('mass_to');
    const from = get('mass_from');
    const key = to ?? from;
    // Name the other end as the user knows it (a flag or a block key, or the default), in Earth masses.
    const other = to ? (from ? from.key : `the default ${(base.massFromKg / M_EARTH_KG).toPrecision(2)} Mearth`) : `the default ${(base.massToKg / M_EARTH_KG).toPrecision(2)} Mearth`;
    const otherMass = to ? h.massFromKg : h.massToKg;
    if (key) key.r.problem(key.key, key.r.raw(key.key), to ? `must be heavier than the lightest moon (${from ? `${other} = ${(otherMass / M_EARTH_KG).toPrecision(3)} Mearth` : other})` : `must be lighter than the heaviest moon (${other})`);
  }
  return h;
}

/** `solve`, with its old value `precision` read as `noise` (a note in `deprecations`) for one release. */
function readSolve(s: Source, deprecations: string[]): BudgetSolve {
  if (s.r.raw(s.key) === 'precision') {
    deprecations.push(`${s.r.path(s.key)}: precision is deprecated: write noise (the old value is accepted in this release only)`);
    return 'noise';
  }
  return s.r.choice(s.key, BUDGET_SOLVES, 'transits');
}

/** Check one typed value of a library caller's target; records a problem under `target.<name>`. */
function checkTyped(problems: FieldProblem[], name: string, value: unknown, ok: boolean, allowed: string): void {
  if (!ok) problems.push({ path: `target.${name}`, value, allowed });
}

/**
 * Merge the caller's target, the scenario's `budget:` block (from `doc`) and
 * the defaults. Throws InputError listing every problem.
 */
export function resolveBudgetTarget(doc: unknown, target: BudgetTarget = {}, source = 'scenario'): ResolvedBudgetTarget {
  const problems: FieldProblem[] = [];
  const block = doc !== null && typeof doc === 'object' ? (doc as Record<string, unknown>).budget : undefined;
  const b = new FieldReader(block, 'budget', problems);
  const has = (key: string): Source | null => (b.has(key) ? { r: b, key } : null);
  for (const [k] of KEYS) b.raw(k); // mark as known even when the target overrides it
  b.raw('habitable');

  const isInt = (x: unknown, lo: number, hi: number) => typeof x === 'number' && Number.isInteger(x) && x >= lo && x <= hi;
  const pick = <T>(name: keyof BudgetTarget, key: string, typedOk: (v: unknown) => boolean, allowed: string, read: (s: Source) => T, fallback: T): T => {
    const v = target[name];
    if (v !== undefined) {
      checkTyped(problems, name, v, typedOk(v), allowed);
      return v as T;
    }
    const s = has(key);
    return s ? read(s) : fallback;
  };

  const probability = pick('probability', 'probability', (v) => typeof v === 'number' && v > 0 && v < 1, PROBABILITY_TEXT, readProbability, DEFAULT_BUDGET_PROBABILITY);
  const solveDeprecations: string[] = [];
  const solve = pick<BudgetSolve>('solve', 'solve', (v) => (BUDGET_SOLVES as readonly unknown[]).includes(v), `expected one of ${BUDGET_SOLVES.join(', ')}`, (s) => readSolve(s, solveDeprecations), 'transits');
  const channel = pick<BudgetChannel>('channel', 'channel', (v) => (BUDGET_CHANNELS as readonly unknown[]).includes(v), `expected one of ${BUDGET_CHANNELS.join(', ')}`, (s) => s.r.choice(s.key, BUDGET_CHANNELS, 'combined'), 'combined');
  // `null_realizations` is the old name of `no_moon_realizations`, accepted for one release (planBudget notes it).
  b.raw('null_realizations');
  const nullKey = !b.has('no_moon_realizations') && b.has('null_realizations') ? 'null_realizations' : 'no_moon_realizations';
  const nullRealizations = pick('nullRealizations', nullKey, (v) => isInt(v, 4, 1_000_000), NULL_TEXT, (s) => readInt(s, 4, 1_000_000, NULL_TEXT) as number | null, DEFAULT_BUDGET_NULL_REALIZATIONS as number | null);
  const maxTransits = pick('maxTransits', 'max_transits', (v) => isInt(v, 1, MAX_BUDGET_TRANSITS), MAX_TRANSITS_TEXT, (s) => readInt(s, 1, MAX_BUDGET_TRANSITS, MAX_TRANSITS_TEXT), DEFAULT_MAX_TRANSITS);
  const forecastOnly = pick('forecastOnly', 'forecast_only', (v) => typeof v === 'boolean', 'expected true or false', (s) => readBool(s) ?? false, false);

  let moonMassKg: number | null = null;
  let moonMassSource = 'moon.mass';
  let moonMassText: string | null = target.moonMassText ?? null;
  let moonSeparationText: string | null = target.moonSeparationText ?? null;
  if (target.moonMassKg !== undefined) {
    checkTyped(problems, 'moonMassKg', target.moonMassKg, target.moonMassKg > 0 && Number.isFinite(target.moonMassKg), 'must be a positive mass in kg');
    moonMassKg = target.moonMassKg;
    moonMassSource = target.sourceNames?.moonMassKg ?? 'target.moonMassKg';
  } else if (has('moon_mass')) {
    moonMassKg = readMass({ r: b, key: 'moon_mass' });
    moonMassSource = 'budget.moon_mass';
    moonMassText = typeof b.raw('moon_mass') === 'string' ? (b.raw('moon_mass') as string) : null;
  }
  let moonSeparation: number | string | null = null;
  let moonSeparationSource = 'moon.separation';
  if (target.moonSeparation !== undefined) {
    const v = target.moonSeparation;
    const f = new FieldReader({ moonSeparation: v }, 'target', problems);
    moonSeparation = typeof v === 'number' ? (v > 0 && Number.isFinite(v) ? v : (f.problem('moonSeparation', v, 'must be a positive length in m'), null)) : readSeparation({ r: f, key: 'moonSeparation' });
    moonSeparationSource = target.sourceNames?.moonSeparation ?? 'target.moonSeparation';
  } else if (has('moon_separation')) {
    moonSeparation = readSeparation({ r: b, key: 'moon_separation' });
    moonSeparationSource = 'budget.moon_separation';
    moonSeparationText = typeof b.raw('moon_separation') === 'string' ? (b.raw('moon_separation') as string) : null;
  }

  let habitable: HabitableTarget | null = null;
  if (target.habitable !== undefined) {
    habitable = target.habitable;
    if (habitable) {
      const h = habitable;
      checkTyped(problems, 'habitable.massFromKg', h.massFromKg, h.massFromKg > 0, 'must be a positive mass in kg');
      checkTyped(problems, 'habitable.massToKg', h.massToKg, h.massToKg > h.massFromKg, 'must exceed massFromKg');
      checkTyped(problems, 'habitable.grid', h.grid, isInt(h.grid, 2, 40), 'expected a whole number from 2 to 40');
      checkTyped(problems, 'habitable.fraction', h.fraction, h.fraction > 0 && h.fraction <= 1, 'expected a fraction above 0 and at most 1');
      checkTyped(problems, 'habitable.confirmMoons', h.confirmMoons, isInt(h.confirmMoons, 1, 1600), 'expected a whole number from 1 to 1600');
    }
  } else if (b.has('habitable')) {
    const raw = b.raw('habitable');
    if (raw === true) habitable = { ...DEFAULT_HABITABLE };
    else if (raw === false) habitable = null;
    else {
      const hr = new FieldReader(raw, 'budget.habitable', problems);
      habitable = readHabitable((key) => (hr.has(key) ? { r: hr, key } : null), DEFAULT_HABITABLE);
      for (const [k] of HABITABLE_KEYS) hr.raw(k);
      hr.rejectUnknown();
    }
  }
  if (habitable && (moonMassKg !== null || moonSeparation !== null) && (target.moonMassKg !== undefined || target.moonSeparation !== undefined)) {
    problems.push({ path: target.moonMassKg !== undefined ? moonMassSource : moonSeparationSource, value: target.moonMassKg ?? target.moonSeparation, allowed: 'a single target moon and --habitable (a population of moons) cannot both be asked for' });
  }
  const realizations = pick('realizations', 'realizations', (v) => isInt(v, 1, 100000), REALIZATIONS_TEXT, (s) => readInt(s, 1, 100000, REALIZATIONS_TEXT), habitable ? DEFAULT_HABITABLE_REALIZATIONS : DEFAULT_BUDGET_REALIZATIONS);
  b.rejectUnknown();
  if (problems.length > 0) throw new InputError(problems, source);
  return { moonMassKg, moonSeparation, moonMassSource, moonSeparationSource, moonMassText, moonSeparationText, probability, solve, channel, realizations, nullRealizations, maxTransits, forecastOnly, habitable, deprecations: [...(nullKey === 'null_realizations' ? ['budget.null_realizations is deprecated: write budget.no_moon_realizations (the old name is accepted in this release only)'] : []), ...solveDeprecations] };
}

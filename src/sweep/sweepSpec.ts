/**
 * The `sweep:` block of a scenario: one to three axes over any numeric
 * scenario field (nested fields by their dotted path, e.g.
 * `instrument.ground.aperture`; the third axis is drawn as small multiples), the realizations per cell and whether physically
 * unstable cells are simulated (and, optionally, `no_moon_realizations`: the
 * no-moon realizations that calibrate the false alarms, ≥ 20; by default
 * max(R, 200, ⌈25/α⌉)). A scenario with a moon and no sweep block
 * (or a block without `axes`) gets the default grid: moon mass, log-spaced
 * from 0.05 to 2 Earth masses, × moon separation from the fluid Roche limit
 * to the stable limit, 20 × 20.
 *
 *   sweep:
 *     realizations: 100
 *     simulate_unstable: false
 *     axes:
 *       - {field: moon.mass, from: 0.05 Mearth, to: 2 Mearth, count: 20, spacing: log}
 *       - {field: moon.separation, from: roche, to: stable, count: 20, spacing: linear}
 *
 * `moon.separation` endpoints may also be `roche` (fluid Roche limit),
 * `stable` (the prograde or retrograde stable limit, by the moon's direction),
 * "0.3 hill" (fraction of the Hill radius) or "12 Rp" (planet radii), all of
 * the base scenario as `computeLimits` gives them.
 *
 * Instead of from/to/count an axis may list its values, each written as the
 * field takes it, in increasing or decreasing order:
 *       - {field: instrument.ground.aperture, values: ["0.4 m", "1 m", "2.5 m"], spacing: log}
 * (`spacing` then only says how the report draws the axis).
 *
 * Level fields (`instrument.noise`, `instrument.red_noise.amplitude`,
 * `instrument.ground.floor`) take endpoints as the field does: a fraction
 * ("300 ppm") or a level at a timescale ("50 ppm per 1 h"). With a timescale
 * the axis states every level at it (both ends must agree; an end without one
 * takes the other's); without, the scenario's own timescale is kept (or, when
 * the scenario writes a bare level, the values are bare levels too).
 */
import { computeLimits } from '../limits/computeLimits.js';
import { InputError, type FieldProblem } from '../scenario/errors.js';
import { FieldReader } from '../scenario/fieldReader.js';
import { parseScenario } from '../scenario/parseScenario.js';
import type { Scenario } from '../scenario/types.js';
import { parseQuantity, splitNumberUnit } from '../scenario/units.js';
import { AXIS_FIELDS, axisUnit, parseLevel, valueAtPath, type AxisFieldDef, type AxisWriteContext } from './axisFields.js';
import { applyAxisValues } from './applyAxes.js';

export { applyAxisValues };

export type AxisSpacing = 'linear' | 'log';

export interface SweepAxis {
  field: string;
  /** SI unit of `values` ('' for plain numbers and fractions). */
  unit: string;
  spacing: AxisSpacing;
  /** Endpoints as written in the scenario (or the default), and in SI. */
  fromText: string;
  toText: string;
  from: number;
  to: number;
  /** Count requested; `values.length` may be smaller for integer fields (rounded, duplicates removed). */
  count: number;
  /** Axis values, SI. */
  values: number[];
  write: AxisWriteContext;
  /** Level fields: the timescale, s, at which the values are stated (absent: bare levels). */
  timescaleS?: number;
}

export interface SweepSpec {
  realizations: number;
  /** No-moon calibration realizations per null class, or null for runCell's default (`defaultNullRealizations` of each cell's α and R). */
  nullRealizations: number | null;
  simulateUnstable: boolean;
  axes: SweepAxis[];
  /** True when the axes are the default moon mass × separation grid. */
  defaultAxes: boolean;
  /** Things the user should know (rounded integer axes, empty stable band...). */
  notes: string[];
  /** Old spellings met in the sweep block, one line each, for stderr (not part of the sweep's identity). */
  deprecations: string[];
}

export const DEFAULT_REALIZATIONS = 100;
/** Fewest no-moon calibration realizations a sweep block may ask for. */
export const MIN_NULL_REALIZATIONS = 20;
export const MAX_AXIS_COUNT = 10000;
/** Most axes a sweep block may give (the third is drawn as small multiples). */
export const MAX_AXES = 3;

/** The default axes, in the same form as a sweep block's. */
export const DEFAULT_AXES: ReadonlyArray<Record<string, unknown>> = [
  { field: 'moon.mass', from: '0.05 Mearth', to: '2 Mearth', count: 20, spacing: 'log' },
  { field: 'moon.separation', from: 'roche', to: 'stable', count: 20, spacing: 'linear' },
];

/**
 * Read the sweep block of `doc` (a scenario document as plain values) against
 * its parsed `base` scenario. Throws InputError listing every problem, each
 * with a path such as `sweep.axes[0].field`.
 */
export function parseSweepSpec(doc: unknown, base: Scenario, source = 'scenario'): SweepSpec {
  const problems: FieldProblem[] = [];
  const deprecations: string[] = [];
  const raw = doc !== null && typeof doc === 'object' ? (doc as Record<string, unknown>).sweep : undefined;
  const r = new FieldReader(raw, 'sweep', problems);
  const realizations = r.number('realizations', {
    default: DEFAULT_REALIZATIONS, integer: true, min: 1, max: 1_000_000,
    rangeText: 'expected a whole number of realizations per cell from 1 to 1000000',
  });
  // `null_realizations` is the old name of `no_moon_realizations`, accepted for one release with a note.
  const oldNullRaw = r.raw('null_realizations');
  const newNullRaw = r.raw('no_moon_realizations');
  const nullKey = (newNullRaw === undefined || newNullRaw === null) && oldNullRaw !== undefined && oldNullRaw !== null ? 'null_realizations' : 'no_moon_realizations';
  const nullRaw = nullKey === 'null_realizations' ? oldNullRaw : newNullRaw;
  if (nullKey === 'null_realizations') deprecations.push('sweep.null_realizations is deprecated: write sweep.no_moon_realizations (the old name is accepted in this release only)');
  const nullRealizations = nullRaw === undefined || nullRaw === null ? null : r.number(nullKey, {
    integer: true, min: MIN_NULL_REALIZATIONS, max: 10_000_000,
    rangeText: `expected a whole number of no-moon calibration realizations from ${MIN_NULL_REALIZATIONS} to 10000000`,
  });
  const unstableRaw = r.raw('simulate_unstable');
  let simulateUnstable = false;
  if (unstableRaw !== undefined && unstableRaw !== null) {
    if (typeof unstableRaw === 'boolean') simulateUnstable = unstableRaw;
    else r.problem('simulate_unstable', unstableRaw, 'expected true or false');
  }
  const axesRaw = r.raw('axes');
  r.rejectUnknown();

  const defaultAxes = axesRaw === undefined || axesRaw === null;
  let axisDocs: unknown[] = [];
  let prefix = 'sweep.axes';
  if (defaultAxes) {
    if (!base.moon) {
      problems.push({
        path: raw === undefined || raw === null ? 'sweep' : 'sweep.axes',
        value: undefined,
        allowed: 'the scenario has no moon, so there is no default grid (moon mass × separation): add a sweep block with axes, e.g. axes: [{field: observation.transits, from: 2, to: 20, count: 10}]',
      });
    }
    axisDocs = base.moon ? (DEFAULT_AXES as unknown[]) : [];
    prefix = 'sweep.axes (default)';
  } else if (!Array.isArray(axesRaw) || axesRaw.length < 1 || axesRaw.length > MAX_AXES) {
    problems.push({ path: 'sweep.axes', value: axesRaw, allowed: `expected a list of one to ${MAX_AXES} axes, each {field, from, to, count, spacing} (a third axis is drawn as small multiples, one map per value)` });
  } else {
    axisDocs = axesRaw;
  }

  const notes: string[] = [];
  const axes: SweepAxis[] = [];
  axisDocs.forEach((a, i) => {
    const axis = readAxis(a, `${prefix}[${i}]`, doc, base, problems, notes, deprecations);
    if (axis) {
      if (axes.some((b) => b.field === axis.field)) {
        problems.push({ path: `${prefix}[${i}].field`, value: axis.field, allowed: 'each axis must vary a different field' });
      } else {
        axes.push(axis);
      }
    }
  });
  if (problems.length === 0) resolveLimitWordsOverMasses(axes, axisDocs, prefix, doc, problems, notes, deprecations);
  if (problems.length > 0) throw new InputError(problems, source);
  return { realizations, nullRealizations, simulateUnstable, axes, defaultAxes, notes, deprecations };
}

/**
 * A separation axis from `roche` to `stable` crossed with a moon-mass axis: the limits depend on the
 * moon's mass (the Hill radius through M_P + M_S; the fluid Roche limit through the density when the
 * radius is fixed), so words resolved with the scenario's own moon would put the end columns outside
 * the limits of lighter or heavier moons, which are then not simulated (a false upturn of the
 * minimum detectable mass at the stable edge). Each word is resolved for the lightest and the heaviest
 * moon of the grid (the limits are monotonic in mass) and the tighter value kept, so the end
 * columns hold for every mass. Derived here; axes written as lengths or Hill fractions are unchanged.
 */
function resolveLimitWordsOverMasses(
  axes: SweepAxis[], axisDocs: unknown[], prefix: string, doc: unknown, problems: FieldProblem[], notes: string[], deprecations: string[],
): void {
  const sepIndex = axes.findIndex((a) => a.field === 'moon.separation');
  const mass = axes.find((a) => a.field === 'moon.mass');
  if (sepIndex < 0 || !mass) return;
  const sep = axes[sepIndex];
  const words = [sep.fromText, sep.toText].map((t) => t.trim().toLowerCase());
  if (!words.some((w) => w === 'roche' || w === 'stable')) return;
  const rawIndex = axisDocs.findIndex((a) => a !== null && typeof a === 'object' && (a as Record<string, unknown>).field === 'moon.separation');
  if (rawIndex < 0 || (axisDocs[rawIndex] as Record<string, unknown>).values !== undefined) return;
  const extremes = [Math.min(...mass.values), Math.max(...mass.values)].map((m) => {
    const base = parseScenario(applyAxisValues(doc, [mass], [m]), 'scenario', { moonContact: 'label' });
    return readAxis(axisDocs[rawIndex], `${prefix}[${rawIndex}]`, doc, base, problems, [], deprecations);
  });
  if (extremes.some((a) => a === null)) return;
  const [light, heavy] = extremes as SweepAxis[];
  const pick = (word: string, a: number, b: number): number => (word === 'roche' ? Math.max(a, b) : word === 'stable' ? Math.min(a, b) : a);
  const from = pick(words[0], light.from, heavy.from);
  const to = pick(words[1], light.to, heavy.to);
  if (from === sep.from && to === sep.to) return;
  axes[sepIndex] = { ...sep, from, to, values: spacedValues(from, to, sep.count, sep.spacing) };
  notes.push(`moon.separation: "${sep.fromText}" to "${sep.toText}" resolved for the lightest and the heaviest moon of the grid, so that every cell of the end columns lies inside its own limits (${from.toPrecision(4)} to ${to.toPrecision(4)} m)`);
}

/** Axis fields renamed in this release: old → new (the old name is read, with a note, for one release). */
const RENAMED_AXIS_FIELDS: ReadonlyMap<string, string> = new Map([['planet.periastron', 'planet.periapsis']]);

function readAxis(raw: unknown, path: string, doc: unknown, base: Scenario, problems: FieldProblem[], notes: string[], deprecations: string[]): SweepAxis | null {
  const before = problems.length;
  const r = new FieldReader(raw, path, problems);
  const written = r.string('field', '');
  const field = RENAMED_AXIS_FIELDS.get(written) ?? written;
  if (field !== written) deprecations.push(`${path}.field: ${written} is deprecated: write ${field} (the old name is accepted in this release only)`);
  const valuesRaw = r.raw('values');
  const listed = valuesRaw !== undefined && valuesRaw !== null;
  const fromRaw = r.raw('from');
  const toRaw = r.raw('to');
  const count = listed ? (r.raw('count'), Number.NaN) : r.number('count', { integer: true, min: 1, max: MAX_AXIS_COUNT, rangeText: `expected a whole number of values from 1 to ${MAX_AXIS_COUNT}` });
  const spacing = r.choice('spacing', ['linear', 'log'] as const, 'linear');
  r.rejectUnknown();
  if (listed && [fromRaw, toRaw, r.raw('count')].some((v) => v !== undefined && v !== null)) {
    r.problem('values', valuesRaw, 'give either a list of values or from, to and count, not both');
    return null;
  }
  if (listed && (!Array.isArray(valuesRaw) || valuesRaw.length < 1 || valuesRaw.length > MAX_AXIS_COUNT)) {
    r.problem('values', valuesRaw, `expected a list of 1 to ${MAX_AXIS_COUNT} values, each written as the field takes it, e.g. values: ["0.4 m", "1 m", "2.5 m"]`);
    return null;
  }
  const d = AXIS_FIELDS.get(field);
  if (!d) {
    r.problem('field', field === '' ? r.raw('field') : field, `expected one of the numeric scenario fields: ${[...AXIS_FIELDS.keys()].join(', ')}`);
    return null;
  }
  if (d.section === 'moon' && !base.moon) {
    r.problem('field', field, 'the scenario has no moon block to vary; add one (its values are the defaults for the other moon fields)');
    return null;
  }
  const refusal = fieldRefusal(field, d, doc, base);
  if (refusal) {
    r.problem('field', field, refusal);
    return null;
  }
  // The values as written: the two ends, or the listed values.
  const raws: unknown[] = listed ? (valuesRaw as unknown[]) : [fromRaw, toRaw];
  const keys = listed ? raws.map((_, k) => `values[${k}]`) : ['from', 'to'];
  const timescales: Array<number | undefined> = [];
  const read = raws.map((v, k) => readEndpoint(r, keys[k], v, field, d, base, timescales));
  if (problems.length > before) return null;
  let timescaleS: number | undefined;
  if (d.value.type === 'level') {
    const stated = timescales.map((t, k) => ({ t, k })).filter((e): e is { t: number; k: number } => e.t !== undefined);
    const odd = stated.find((e) => Math.abs(e.t - stated[0].t) > 1e-9 * Math.max(e.t, stated[0].t));
    if (odd) {
      r.problem(keys[odd.k], raws[odd.k], `every value must state the level at the same timescale (${keys[stated[0].k]} is per ${stated[0].t} s, ${keys[odd.k]} per ${odd.t} s); write e.g. from: "50 ppm per 1 h", to: "500 ppm per 1 h"`);
      return null;
    }
    timescaleS = stated.length ? stated[0].t : scenarioTimescale(doc, d);
    if (stated.length > 0 && stated.length < raws.length) notes.push(`${field}: ${listed ? 'the values given without a timescale are read at the others\'' : 'the end given without a timescale is read at the other end\'s'}, per ${timescaleS} s`);
  }
  if (spacing === 'log') {
    const k = read.findIndex((v) => !(v > 0));
    if (k >= 0) {
      r.problem(keys[k], raws[k], `log spacing needs ${listed ? 'every value' : 'from and to'} above zero`);
      return null;
    }
  }
  if (listed && read.length > 1) {
    const up = read[1] > read[0];
    const k = read.findIndex((v, i) => i > 0 && (up ? !(v > read[i - 1]) : !(v < read[i - 1])));
    if (k >= 0) {
      r.problem(keys[k], raws[k], 'expected the values in increasing (or decreasing) order, each once');
      return null;
    }
  }
  const from = read[0];
  const to = read[read.length - 1];
  let values = listed ? read : spacedValues(from, to, count, spacing);
  if (d.value.type === 'integer') {
    const rounded = [...new Set(values.map((v) => Math.round(v)))];
    if (rounded.length !== values.length || rounded.some((v, k) => v !== values[k])) {
      notes.push(`${field}: values rounded to whole numbers${rounded.length < values.length ? `, duplicates removed (${values.length} → ${rounded.length} values)` : ''}: ${rounded.join(', ')}`);
    }
    values = rounded;
  }
  const write: AxisWriteContext = {};
  if (timescaleS !== undefined) write.levelTimescaleS = timescaleS;
  if (field === 'instrument.cadence') {
    const instrument = (doc as Record<string, unknown>).instrument as Record<string, unknown> | undefined;
    if (instrument && instrument.exposure !== undefined && instrument.exposure !== null) {
      write.exposureRatio = base.instrument.exposureS / base.instrument.cadenceS;
      notes.push(`instrument.cadence: the exposure follows the cadence at the scenario's ratio exposure/cadence = ${write.exposureRatio}`);
    }
  }
  if (field === 'moon.separation' && base.moon) {
    const lim = computeLimits(base);
    const stable = base.moon.retrograde ? lim.stable_max_separation_retrograde_m : lim.stable_max_separation_m;
    if (lim.roche_limit_m >= stable) notes.push(`moon.separation: the fluid Roche limit (${lim.roche_limit_m.toPrecision(4)} m) lies beyond the stable limit (${stable.toPrecision(4)} m): no separation is both`);
  }
  const axis: SweepAxis = {
    field, unit: axisUnit(d), spacing, fromText: endpointText(raws[0]), toText: endpointText(raws[raws.length - 1]), from, to,
    count: listed ? read.length : count, values, write,
  };
  if (timescaleS !== undefined) axis.timescaleS = timescaleS;
  checkEndpointsParse(axis, path, doc, problems, listed ? keys : null, raws);
  return axis;
}

function endpointText(raw: unknown): string {
  return typeof raw === 'string' ? raw : String(raw);
}

const GROUND_FIELDS = [...AXIS_FIELDS.keys()].filter((f) => f.startsWith('instrument.ground.'));

/** Why the base scenario cannot vary `field` (a block it lacks, a field its model has not), or null. */
function fieldRefusal(field: string, d: AxisFieldDef, doc: unknown, base: Scenario): string | null {
  if (field === 'instrument.noise' && base.instrument.ground) {
    return `the white noise of this scenario comes from its ground budget (instrument.ground), so there is no noise level to vary: sweep ${GROUND_FIELDS.join(', ')} instead (the floor is the systematic level), or replace the ground block by instrument.noise to sweep the level directly`;
  }
  if (d.block && !isMapping(valueAtPath(doc, d.block.split('.')))) {
    if (d.block === 'instrument.ground') {
      return `the scenario has no ground budget (instrument.ground) to vary${base.instrument.ground ? '' : '; its white noise is instrument.noise: sweep that, or replace it by a ground block {aperture, magnitude, ...}'}`;
    }
    return `the scenario has no ${d.block} block to vary; add one (e.g. red_noise: {model: power_law, amplitude: "150 ppm per 30 min", slope: 1})`;
  }
  if (d.model) {
    const model = base.instrument.redNoise?.model;
    if (model !== d.model) return `${field} belongs to the ${d.model} red-noise model; this scenario's instrument.red_noise is ${model ?? 'absent'}`;
  }
  return null;
}

function isMapping(v: unknown): boolean {
  return v !== null && typeof v === 'object' && !Array.isArray(v);
}

/** The timescale, s, at which the scenario states a level field ("X per T"), or undefined for a bare level. */
function scenarioTimescale(doc: unknown, d: AxisFieldDef): number | undefined {
  const raw = valueAtPath(doc, d.path);
  if (typeof raw !== 'string' || !/\sper\s/.test(raw)) return undefined;
  try {
    return parseLevel(raw, d.path.join('.')).timescaleS;
  } catch {
    return undefined;
  }
}

/** An endpoint in SI, read like the scenario field itself (plus the separation words); a level's timescale goes to `timescales`. */
function readEndpoint(r: FieldReader, key: string, raw: unknown, field: string, d: AxisFieldDef, base: Scenario, timescales: Array<number | undefined>): number {
  const path = r.path(key);
  timescales.push(undefined);
  if (raw === undefined || raw === null) {
    r.problem(key, raw, `required: ${key === 'from' ? 'the first value' : key === 'to' ? 'the last value' : 'a value'} of ${field}`);
    return Number.NaN;
  }
  try {
    if (field === 'moon.separation') return separationEndpoint(raw, path, base);
    if (d.value.type === 'level') {
      const lv = parseLevel(raw, path);
      timescales[timescales.length - 1] = lv.timescaleS;
      return lv.fraction;
    }
    if (d.value.type === 'quantity') return parseQuantity(raw, path, d.value.kind, d.value.bare?.[0], d.value.bare?.[1]);
    const n = typeof raw === 'number' ? raw : typeof raw === 'string' && raw.trim() !== '' ? Number(raw) : Number.NaN;
    if (!Number.isFinite(n)) throw new InputError([{ path, value: raw, allowed: `expected a number (${field} has no unit)` }]);
    return n;
  } catch (e) {
    if (e instanceof InputError) r.problems.push(...e.problems);
    else throw e;
    return Number.NaN;
  }
}

function separationEndpoint(raw: unknown, path: string, base: Scenario): number {
  const moon = base.moon;
  if (!moon) throw new InputError([{ path, value: raw, allowed: 'the scenario has no moon' }]);
  const allowed = 'expected "roche" (fluid Roche limit), "stable" (stable limit), a Hill fraction ("0.3 hill"), planet radii ("12 Rp") or a length ("1e9 m")';
  if (typeof raw === 'string') {
    const word = raw.trim().toLowerCase();
    if (word === 'roche' || word === 'stable' || /\s*(hill)$/.test(word)) {
      const lim = computeLimits(base);
      if (word === 'roche') return lim.roche_limit_m;
      if (word === 'stable') return moon.retrograde ? lim.stable_max_separation_retrograde_m : lim.stable_max_separation_m;
      const nu = splitNumberUnit(raw);
      if (nu && nu.unit === 'hill' && nu.num > 0) return nu.num * lim.hill_radius_m;
      throw new InputError([{ path, value: raw, allowed: 'a Hill fraction must be positive, e.g. "0.3 hill"' }]);
    }
    const nu = splitNumberUnit(raw);
    if (nu && nu.unit === 'Rp') {
      if (nu.num > 0) return nu.num * base.planet.radiusM;
      throw new InputError([{ path, value: raw, allowed: 'planet radii must be positive, e.g. "12 Rp"' }]);
    }
  }
  try {
    return parseQuantity(raw, path, 'length');
  } catch {
    throw new InputError([{ path, value: raw, allowed }]);
  }
}

/**
 * `count` values from `from` to `to` (both included): evenly spaced, or evenly
 * spaced in the logarithm (v_i = from·(to/from)^{i/(n−1)}). The ends are exact.
 */
export function spacedValues(from: number, to: number, count: number, spacing: AxisSpacing): number[] {
  if (!Number.isInteger(count) || count < 1) throw new RangeError(`count must be an integer ≥ 1, got ${count}`);
  if (!Number.isFinite(from) || !Number.isFinite(to)) throw new RangeError(`from and to must be finite, got ${from}, ${to}`);
  if (spacing === 'log' && !(from > 0 && to > 0)) throw new RangeError(`log spacing needs from > 0 and to > 0, got ${from}, ${to}`);
  const out = new Array<number>(count);
  if (count === 1) {
    out[0] = from;
    return out;
  }
  const lf = Math.log(from);
  const lt = Math.log(to);
  for (let i = 0; i < count; i++) {
    const t = i / (count - 1);
    out[i] = i === 0 ? from : i === count - 1 ? to : spacing === 'log' ? Math.exp(lf + t * (lt - lf)) : from + t * (to - from);
  }
  return out;
}

/**
 * Both ends of each axis must give a valid scenario (values run monotonically
 * between them, so the range checks of the scenario hold for the whole axis).
 * A refusal is reported on the axis's `from`/`to`.
 */
function checkEndpointsParse(axis: SweepAxis, path: string, doc: unknown, problems: FieldProblem[], listKeys: string[] | null, raws: unknown[]): void {
  // A listed axis need not be evenly spaced, but its values are monotonic, so its ends bound it too; each is checked all the same.
  const ends: Array<[string, number, string]> = listKeys && listKeys.length === axis.values.length
    ? axis.values.map((v, k) => [listKeys[k], v, endpointText(raws[k])])
    : [['from', axis.values[0], axis.fromText], ['to', axis.values[axis.values.length - 1], axis.toText]];
  for (const [key, value, text] of ends) {
    try {
      // As a grid cell: a moon touching the planet at an end is that cell's label, not an input error.
      parseScenario(applyAxisValues(doc, [axis], [value]), 'scenario', { moonContact: 'label' });
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      for (const p of e.problems) {
        const shown = AXIS_FIELDS.get(axis.field)?.value.type === 'level'
          ? `${Number((value * 1e6).toPrecision(6))} ppm${axis.timescaleS !== undefined ? ` per ${axis.timescaleS} s` : ''}`
          : `${value}${axis.unit ? ' ' + axis.unit : ''}`;
        problems.push({ path: `${path}.${key}`, value: text, allowed: `with ${axis.field} = ${shown} the scenario is refused: ${p.path}: ${p.allowed}` });
      }
      if (axis.values.length === 1) break;
    }
  }
}

/**
 * Quantities with units, parsed only at the edges of the program.
 *
 * A value is either a string "number unit" (`"0.3 Mjup"`, `"180 d"`,
 * `"60 ppm"`) or a bare number in the unit the schema documents for that
 * field. The common units and their products are read from a table; any
 * other unit text goes to mathjs units (loaded on first need), extended with astronomy units whose values
 * come from `physics/constants.ts` (IAU 2015 B3 nominal values, IAU 2012 au).
 * Spellings follow astropy's aliases (`Mjup`, `M_jup`, `Rearth`, `AU`/`au`).
 */
import { createRequire } from 'node:module';
import type { MathJsInstance, Unit } from 'mathjs';
import {
  AU_M,
  DAY_S,
  JULIAN_YEAR_S,
  M_EARTH_KG,
  M_JUP_KG,
  M_SUN_KG,
  L_SUN_W,
  R_EARTH_M,
  R_JUP_M,
  R_SUN_M,
} from '../physics/constants.js';
import { fieldError } from './errors.js';
import { remembered } from '../memo.js';

export type QuantityKind =
  | 'mass'
  | 'length'
  | 'time'
  | 'angle'
  | 'temperature'
  | 'density'
  | 'fraction'
  | 'power';

/** mathjs base-unit key for each kind, and the words a message uses. */
const KIND_INFO: Record<QuantityKind, { base: string; examples: string }> = {
  mass: { base: 'MASS', examples: 'a mass, e.g. "0.3 Mjup", "1 Mearth", "1 Msun", "7e22 kg"' },
  length: { base: 'LENGTH', examples: 'a length, e.g. "1 Rjup", "2 Rearth", "1 Rsun", "0.05 AU", "4e8 m", "3e5 km"' },
  time: { base: 'TIME', examples: 'a time, e.g. "180 d", "3 h", "2 min", "30 s", "4.5 Gyr"' },
  angle: { base: 'ANGLE', examples: 'an angle, e.g. "89.5 deg", "1.2 rad"' },
  temperature: { base: 'TEMPERATURE', examples: 'a temperature, e.g. "5600 K"' },
  density: { base: '', examples: 'a density, e.g. "3 g/cm^3", "3000 kg/m^3"' },
  fraction: { base: 'NONE', examples: 'a dimensionless fraction, e.g. "60 ppm", "0.1 %", "1e-4"' },
  power: { base: 'POWER', examples: 'a power, e.g. "0.5 Lsun", "3e26 W"' },
};

/** Astropy-style spellings mapped to the names registered with mathjs. */
const ALIASES: Record<string, string> = {
  M_jup: 'Mjup', M_jupiter: 'Mjup', Mjupiter: 'Mjup', jupiterMass: 'Mjup', MJ: 'Mjup',
  R_jup: 'Rjup', R_jupiter: 'Rjup', Rjupiter: 'Rjup', jupiterRad: 'Rjup', RJ: 'Rjup',
  M_earth: 'Mearth', earthMass: 'Mearth', Mearth: 'Mearth', ME: 'Mearth',
  R_earth: 'Rearth', earthRad: 'Rearth', RE: 'Rearth',
  M_sun: 'Msun', solMass: 'Msun', Msol: 'Msun',
  R_sun: 'Rsun', solRad: 'Rsun', Rsol: 'Rsun',
  L_sun: 'Lsun', solLum: 'Lsun', Lsol: 'Lsun',
  au: 'AU',
  '%': 'percent',
  hr: 'h',
};

let mathInstance: MathJsInstance | null = null;

/** The mathjs instance with astronomy units; created once, never mutated afterwards. */
function astroMath(): MathJsInstance {
  if (mathInstance) return mathInstance;
  // Loaded on first use (about a second): a sweep worker whose unit cache was primed by the main
  // thread (`primeUnitValues`) never needs it.
  const { create, all } = createRequire(import.meta.url)('mathjs') as typeof import('mathjs');
  const math = create(all);
  const defs: Array<[string, string]> = [
    ['Msun', `${M_SUN_KG} kg`],
    ['Rsun', `${R_SUN_M} m`],
    ['Lsun', `${L_SUN_W} W`],
    ['Mjup', `${M_JUP_KG} kg`],
    ['Rjup', `${R_JUP_M} m`],
    ['Mearth', `${M_EARTH_KG} kg`],
    ['Rearth', `${R_EARTH_M} m`],
    ['AU', `${AU_M} m`],
    ['d', `${DAY_S} s`],
    ['yr', `${JULIAN_YEAR_S} s`],
    ['Myr', `${1e6 * JULIAN_YEAR_S} s`],
    ['Gyr', `${1e9 * JULIAN_YEAR_S} s`],
  ];
  for (const [name, definition] of defs) math.createUnit(name, definition, { override: true });
  // Dimensionless scales: read their SI value with `.value`, never toNumber('').
  math.createUnit('ppm', { definition: '1e-6' }, { override: true });
  math.createUnit('ppt', { definition: '1e-3' }, { override: true });
  math.createUnit('percent', { definition: '1e-2' }, { override: true });
  mathInstance = math;
  return math;
}

/**
 * The units scenarios use most, by kind, with their SI values: the same
 * definitions astroMath registers (constants.ts) and the SI's own (BIPM 2019,
 * The International System of Units, 9th ed., Tables 2, 5 and 8: 1 min = 60 s,
 * 1 h = 3600 s, 1 d = 86 400 s, 1° = π/180 rad, 1 g = 10⁻³ kg). A unit text
 * found here (after ALIASES), or a product of powers of them (`productUnitValue`),
 * needs no mathjs, whose first use costs 0.4 to 1 s of start-up; every other
 * text goes to mathjs. The tests check each entry against mathjs.
 */
export const COMMON_UNITS: Readonly<Record<string, { kind: QuantityKind; si: number }>> = {
  kg: { kind: 'mass', si: 1 },
  g: { kind: 'mass', si: 1e-3 },
  Msun: { kind: 'mass', si: M_SUN_KG },
  Mjup: { kind: 'mass', si: M_JUP_KG },
  Mearth: { kind: 'mass', si: M_EARTH_KG },
  m: { kind: 'length', si: 1 },
  km: { kind: 'length', si: 1e3 },
  cm: { kind: 'length', si: 1e-2 },
  Rsun: { kind: 'length', si: R_SUN_M },
  Rjup: { kind: 'length', si: R_JUP_M },
  Rearth: { kind: 'length', si: R_EARTH_M },
  AU: { kind: 'length', si: AU_M },
  s: { kind: 'time', si: 1 },
  min: { kind: 'time', si: 60 },
  h: { kind: 'time', si: 3600 },
  hour: { kind: 'time', si: 3600 },
  d: { kind: 'time', si: DAY_S },
  day: { kind: 'time', si: DAY_S },
  yr: { kind: 'time', si: JULIAN_YEAR_S },
  Myr: { kind: 'time', si: 1e6 * JULIAN_YEAR_S },
  Gyr: { kind: 'time', si: 1e9 * JULIAN_YEAR_S },
  deg: { kind: 'angle', si: Math.PI / 180 },
  rad: { kind: 'angle', si: 1 },
  K: { kind: 'temperature', si: 1 },
  'g/cm^3': { kind: 'density', si: 1e3 },
  'kg/m^3': { kind: 'density', si: 1 },
  ppm: { kind: 'fraction', si: 1e-6 },
  ppt: { kind: 'fraction', si: 1e-3 },
  percent: { kind: 'fraction', si: 1e-2 },
  W: { kind: 'power', si: 1 },
  Lsun: { kind: 'power', si: L_SUN_W },
};

const NUMBER_UNIT = /^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$/;

function normaliseUnitText(text: string): string {
  // Replace whole alias tokens (letters, digits and underscores, or %).
  return text.replace(/[A-Za-z_][A-Za-z_0-9]*|%/g, (tok) => ALIASES[tok] ?? tok);
}

function hasKind(u: Unit, kind: QuantityKind): boolean {
  const math = astroMath();
  if (kind === 'density') return u.equalBase(math.unit('1 kg/m^3'));
  const base = KIND_INFO[kind].base;
  if (base === 'NONE') return u.equalBase(math.unit('1'));
  // Compare dimensions with a reference unit of that base.
  const ref: Record<string, string> = {
    MASS: '1 kg', LENGTH: '1 m', TIME: '1 s', ANGLE: '1 rad', TEMPERATURE: '1 K', POWER: '1 W',
  };
  return u.equalBase(math.unit(ref[base]));
}

/** What a message says is allowed for a quantity of this kind. */
export function allowedText(kind: QuantityKind, bareUnit?: string): string {
  const bare = bareUnit ? `; a bare number is read as ${bareUnit}` : '';
  return `expected ${KIND_INFO[kind].examples}${bare}`;
}

/**
 * Parse a quantity to its SI value.
 * @param value  string "number unit" or a bare number
 * @param path   dotted field path for messages
 * @param kind   the physical kind required
 * @param bareUnitSi  SI value of one bare-number unit (e.g. DAY_S when bare numbers are days);
 *                    undefined means bare numbers are not allowed
 * @param bareUnitName  the unit's name for messages
 */
export function parseQuantity(
  value: unknown,
  path: string,
  kind: QuantityKind,
  bareUnitSi?: number,
  bareUnitName?: string,
): number {
  const allowed = allowedText(kind, bareUnitSi === undefined ? undefined : bareUnitName);
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw fieldError(path, value, allowed + ' (a finite number)');
    if (bareUnitSi === undefined) throw fieldError(path, value, allowed + ' (a unit is required)');
    if (!Number.isFinite(value * bareUnitSi)) throw fieldError(path, value, allowed + ' (a finite number)');
    return value * bareUnitSi;
  }
  if (typeof value !== 'string') throw fieldError(path, value, allowed);
  const m = NUMBER_UNIT.exec(value);
  if (!m) throw fieldError(path, value, allowed);
  const num = Number(m[1]);
  const unitText = m[2];
  if (!Number.isFinite(num)) throw fieldError(path, value, allowed);
  if (unitText === '') {
    if (bareUnitSi === undefined) throw fieldError(path, value, allowed + ' (a unit is required)');
    if (!Number.isFinite(num * bareUnitSi)) throw fieldError(path, value, allowed + ' (a finite number)');
    return num * bareUnitSi;
  }
  const perUnit = unitValue(unitText, kind);
  if (perUnit === 'unknown') throw fieldError(path, value, `unknown unit "${unitText}"; ${allowed}`);
  if (perUnit === 'wrong kind') throw fieldError(path, value, `"${unitText}" is not a unit of ${kind}; ${allowed}`);
  const si = perUnit * num;
  if (!Number.isFinite(si)) throw fieldError(path, value, allowed);
  return si;
}

/**
 * SI value of one `unitText` of the given kind, or why it is not one. Kept per
 * unit text and kind: a sweep parses thousands of cell scenarios that repeat
 * the same few units, and mathjs takes ~0.2 ms per unit.
 */
const unitValues = new Map<string, number | 'unknown' | 'wrong kind'>();

/** The unit values known so far, as plain data (for `primeUnitValues` in another thread). */
export function unitValueEntries(): Array<[string, number | 'unknown' | 'wrong kind']> {
  return [...unitValues.entries()];
}

/** Add unit values computed by another thread (same keys, same pure function of the unit text). */
export function primeUnitValues(entries: ReadonlyArray<readonly [string, number | 'unknown' | 'wrong kind']>): void {
  for (const [k, v] of entries) if (!unitValues.has(k)) unitValues.set(k, v);
}
function unitValue(unitText: string, kind: QuantityKind): number | 'unknown' | 'wrong kind' {
  return remembered(unitValues, 1000, `${kind}|${unitText}`, () => {
    const common = COMMON_UNITS[normaliseUnitText(unitText)];
    if (common !== undefined) return common.kind === kind ? common.si : 'wrong kind';
    return productUnitValue(unitText, kind) ?? mathjsUnitValue(unitText, kind);
  });
}

/** Exponents of mass, length, time, angle and temperature, in that order (mathjs's base dimensions). */
type Dimension = readonly [number, number, number, number, number];

const KIND_DIMENSION: Record<Exclude<QuantityKind, 'fraction'>, Dimension> = {
  mass: [1, 0, 0, 0, 0],
  length: [0, 1, 0, 0, 0],
  time: [0, 0, 1, 0, 0],
  angle: [0, 0, 0, 1, 0],
  temperature: [0, 0, 0, 0, 1],
  density: [1, -3, 0, 0, 0],
  power: [1, 2, -3, 0, 0], // W = kg m² s⁻³ (BIPM 2019, SI Brochure, Table 4)
};

/** One factor of a product: a table unit (single word, after ALIASES) and an optional integer power. */
const FACTOR = /^([A-Za-z_][A-Za-z_0-9]*)(?:\^([-+]?\d{1,2}))?$/;

/**
 * SI value of a product of table units with integer powers and at most one
 * divisor, such as "kg m^-3", "g/cm^3", "W m^-2", "kg*m^2", "Mjup/Rjup^3", or
 * undefined when the text is not of that simple form (mathjs then reads it).
 * Factors are separated by spaces or "*"; "a b / c d" is refused, since which
 * factors a "/" divides is a matter of convention. Fractions (ppm, percent)
 * never enter a product. Tests check it against mathjs on a list of texts.
 */
export function productUnitValue(unitText: string, kind: QuantityKind): number | 'wrong kind' | undefined {
  if (kind === 'fraction') return undefined;
  const halves = unitText.split('/');
  if (halves.length > 2) return undefined;
  const parts: Array<{ text: string; sign: 1 | -1 }> = [];
  for (const [h, sign] of [[0, 1], [1, -1]] as const) {
    if (h >= halves.length) break;
    const factors = halves[h].trim().split(/\s*\*\s*|\s+/);
    if (sign === -1 && factors.length !== 1) return undefined;
    for (const f of factors) parts.push({ text: f, sign });
  }
  let si = 1;
  const dim = [0, 0, 0, 0, 0];
  for (const { text, sign } of parts) {
    const m = FACTOR.exec(text);
    if (!m) return undefined;
    const entry = COMMON_UNITS[ALIASES[m[1]] ?? m[1]];
    if (entry === undefined || entry.kind === 'fraction') return undefined;
    const power = sign * (m[2] === undefined ? 1 : Number(m[2]));
    if (power === 0) return undefined;
    const d = KIND_DIMENSION[entry.kind];
    for (let k = 0; k < 5; k++) dim[k] += power * d[k];
    // Positive powers multiply and negative ones divide, so "kg/m^3" and "kg m^-3" give the same bits.
    const scale = entry.si ** Math.abs(power);
    si = power > 0 ? si * scale : si / scale;
  }
  if (!Number.isFinite(si) || si === 0) return undefined;
  const want = KIND_DIMENSION[kind];
  return dim.every((x, k) => x === want[k]) ? si : 'wrong kind';
}

/** unitValue through mathjs alone (exported for the tests that check COMMON_UNITS against it). */
export function mathjsUnitValue(unitText: string, kind: QuantityKind): number | 'unknown' | 'wrong kind' {
  const math = astroMath();
  let u: Unit;
  try {
    u = math.unit(normaliseUnitText(unitText));
  } catch {
    return 'unknown';
  }
  if (!hasKind(u, kind)) return 'wrong kind';
  // u.value holds the SI value of one `unitText`; mathjs units made from a
  // string without a number have value null, so multiply explicitly.
  return math.unit(`1 ${normaliseUnitText(unitText)}`).value as number;
}

/** True if the text names a unit (used for special separation units). */
export function splitNumberUnit(value: string): { num: number; unit: string } | null {
  const m = NUMBER_UNIT.exec(value);
  if (!m) return null;
  return { num: Number(m[1]), unit: m[2] };
}

/**
 * The unit a value was written in and the SI size of one of it: the unit text
 * of "0.5 Mearth", or the bare-number unit for a bare number. Null when the
 * value has no usable unit. Used to state an allowed range in the user's unit.
 */
export function writtenUnit(value: unknown, kind: QuantityKind, bare?: readonly [number, string]): { name: string; si: number } | null {
  if (typeof value === 'number') return bare ? { name: bare[1], si: bare[0] } : null;
  if (typeof value !== 'string') return null;
  const nu = splitNumberUnit(value);
  if (!nu) return null;
  if (nu.unit === '') return bare ? { name: bare[1], si: bare[0] } : null;
  const si = unitValue(nu.unit, kind);
  return typeof si === 'number' && si > 0 ? { name: nu.unit, si } : null;
}

/** A number for messages: up to 4 significant digits, no trailing zeros. */
export function formatNumber(x: number): string {
  if (x === 0 || !Number.isFinite(x)) return String(x);
  const a = Math.abs(x);
  if (Number.isInteger(x) && a < 1e15) return String(x);
  if (a >= 1e-3 && a < 1e6) return String(Number(x.toPrecision(4)));
  return x.toExponential(3).replace(/\.?0+e/, 'e').replace('e+', 'e');
}

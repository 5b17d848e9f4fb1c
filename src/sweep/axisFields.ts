/**
 * The scenario fields a sweep axis may vary, how an axis endpoint is read
 * (with the same units and bare-number rules as the scenario itself), and
 * how an axis value is written back into the raw scenario document, which
 * is then parsed again by `parseScenario` so every derived quantity
 * (semi-major axis, Hill radius, moon radius from density, the ground noise
 * budget...) stays consistent.
 *
 * A field is named by its dotted path in the scenario document; nested
 * blocks are reached the same way (`instrument.ground.aperture`,
 * `instrument.red_noise.amplitude`).
 */
import { DAY_S, HOUR_S, MINUTE_S } from '../physics/constants.js';
import { fieldError } from '../scenario/errors.js';
import { parseQuantity, type QuantityKind } from '../scenario/units.js';

const DEG = Math.PI / 180;

export type AxisValueKind =
  | { type: 'quantity'; kind: QuantityKind; /** SI unit written into the document and the output tables. */ unit: string; bare?: [number, string] }
  /**
   * A noise level, written like the field: a fraction ("300 ppm", 3e-4) or a
   * level stated at a timescale ("50 ppm per 1 h"); the axis values are the
   * level (a fraction) at the axis's timescale (see `AxisWriteContext.levelTimescaleS`).
   */
  | { type: 'level' }
  | { type: 'number' }
  | { type: 'integer' };

export type AxisSection = 'star' | 'planet' | 'moon' | 'instrument' | 'observation' | 'detection';

export interface AxisFieldDef {
  section: AxisSection;
  /** The path below the section, dotted ("ground.aperture"). */
  key: string;
  /** Every step of the path from the document's top level. */
  path: string[];
  value: AxisValueKind;
  /** Keys of the same block that give the same thing another way; removed when the axis sets this one. */
  replaces?: string[];
  /** The nested block the field lives in, which the scenario must already have (e.g. "instrument.ground"). */
  block?: string;
  /** For red-noise fields: the only model (instrument.red_noise.model) that has the field. */
  model?: 'power_law' | 'drw';
}

const q = (kind: QuantityKind, unit: string, bare?: [number, string]): AxisValueKind => ({ type: 'quantity', kind, unit, bare });
const num: AxisValueKind = { type: 'number' };
const level: AxisValueKind = { type: 'level' };

function def(path: string, value: AxisValueKind, extra: { replaces?: string[]; model?: AxisFieldDef['model'] } = {}): [string, AxisFieldDef] {
  const steps = path.split('.');
  const section = steps[0] as AxisSection;
  const block = steps.length > 2 ? steps.slice(0, -1).join('.') : undefined;
  return [path, { section, key: steps.slice(1).join('.'), path: steps, value, replaces: extra.replaces, block, model: extra.model }];
}

/** Every numeric scenario field an axis may vary (bare-number units as in parseScenario). */
export const AXIS_FIELDS: ReadonlyMap<string, AxisFieldDef> = new Map([
  def('star.mass', q('mass', 'kg')),
  def('star.radius', q('length', 'm')),
  def('star.teff', q('temperature', 'K', [1, 'K'])),
  def('star.age', q('time', 's')),
  def('star.luminosity', q('power', 'W')),
  def('planet.mass', q('mass', 'kg')),
  def('planet.radius', q('length', 'm'), { replaces: ['mass_radius'] }),
  def('planet.period', q('time', 's', [DAY_S, 'days'])),
  def('planet.eccentricity', num),
  def('planet.periapsis', q('angle', 'rad', [DEG, 'degrees']), { replaces: ['periastron'] }), // periastron: its old name
  def('planet.impact_parameter', num, { replaces: ['inclination'] }),
  def('planet.inclination', q('angle', 'rad', [DEG, 'degrees']), { replaces: ['impact_parameter'] }),
  def('planet.albedo', num),
  def('planet.love_number', num),
  def('planet.tidal_q', num),
  def('moon.mass', q('mass', 'kg')),
  def('moon.radius', q('length', 'm'), { replaces: ['density'] }),
  def('moon.density', q('density', 'kg/m^3'), { replaces: ['radius'] }),
  def('moon.separation', q('length', 'm')),
  def('moon.eccentricity', num),
  def('moon.inclination', q('angle', 'rad', [DEG, 'degrees'])),
  def('moon.node', q('angle', 'rad', [DEG, 'degrees'])),
  def('moon.periapsis', q('angle', 'rad', [DEG, 'degrees'])),
  def('moon.phase', q('angle', 'rad', [DEG, 'degrees'])),
  def('moon.albedo', num),
  def('moon.love_number', num),
  def('moon.tidal_q', num),
  def('instrument.cadence', q('time', 's', [MINUTE_S, 'minutes'])),
  def('instrument.exposure', q('time', 's', [MINUTE_S, 'minutes'])),
  // White noise: the level; the timescale at which it is stated is the axis's (see AxisWriteContext).
  def('instrument.noise', level, { replaces: ['noise_timescale'] }),
  // Correlated noise (instrument.red_noise): power_law {amplitude "X per T", slope} or drw {amplitude, timescale}.
  def('instrument.red_noise.amplitude', level),
  def('instrument.red_noise.slope', num, { model: 'power_law' }),
  def('instrument.red_noise.timescale', q('time', 's', [MINUTE_S, 'minutes']), { model: 'drw' }),
  // Ground-based noise budget (instrument.ground), every numeric field.
  def('instrument.ground.aperture', q('length', 'm')),
  def('instrument.ground.magnitude', num),
  def('instrument.ground.throughput', num),
  def('instrument.ground.airmass', num),
  def('instrument.ground.altitude', q('length', 'm', [1, 'metres'])),
  def('instrument.ground.scintillation_coefficient', num),
  def('instrument.ground.floor', level),
  def('observation.transits', { type: 'integer' }, { replaces: ['duration'] }),
  // A campaign length instead of a count: the transits are the conjunctions inside it.
  def('observation.duration', q('time', 's', [DAY_S, 'days']), { replaces: ['transits'] }),
  def('observation.baseline', q('time', 's', [HOUR_S, 'hours'])),
  // Gaps: fraction of each window observed, mean gap length, fraction of transits lost.
  def('observation.duty_cycle', num),
  def('observation.gap_length', q('time', 's', [MINUTE_S, 'minutes'])),
  def('observation.missed_fraction', num),
  def('detection.false_alarm', q('fraction', '', [1, 'a fraction'])),
]);

/** The unit of an axis's values in tables ('' for plain numbers and fractions). */
export function axisUnit(d: AxisFieldDef): string {
  return d.value.type === 'quantity' ? d.value.unit : '';
}

/** Per-axis facts of the base scenario needed to write a value (see `applyAxisValues`). */
export interface AxisWriteContext {
  /**
   * A level field (noise, red-noise amplitude, ground floor): the timescale, s, at
   * which the axis's levels are stated ("X per T"); absent when the levels are
   * bare fractions, which the field reads as it reads a bare value (per exposure
   * for noise and floor, the stationary rms for a damped random walk).
   */
  levelTimescaleS?: number;
  /** instrument.noise only: the same as `levelTimescaleS` (the name the budget's solved quantity uses). */
  noiseTimescaleS?: number;
  /** instrument.cadence with an explicit exposure: exposure / cadence, kept while the cadence varies. */
  exposureRatio?: number;
}

/** A level endpoint: the fraction, and the timescale when written "X per T". */
export function parseLevel(raw: unknown, path: string): { fraction: number; timescaleS?: number } {
  const allowed = 'expected a level as the field takes it: a fraction ("300 ppm", "0.03 %", 3e-4) or a level at a timescale ("50 ppm per 1 h")';
  if (typeof raw === 'string' && /\sper\s/.test(raw)) {
    const parts = raw.trim().split(/\s+per\s+/);
    if (parts.length !== 2) throw fieldError(path, raw, allowed);
    let fraction: number;
    let timescaleS: number;
    try {
      fraction = parseQuantity(parts[0], path, 'fraction', 1, 'a fraction');
      timescaleS = parseQuantity(parts[1], path, 'time');
    } catch {
      throw fieldError(path, raw, allowed);
    }
    if (!(fraction >= 0) || !(timescaleS > 0)) throw fieldError(path, raw, `${allowed}; the level must be ≥ 0 and the timescale positive`);
    return { fraction, timescaleS };
  }
  try {
    return { fraction: parseQuantity(raw, path, 'fraction', 1, 'a fraction') };
  } catch {
    throw fieldError(path, raw, allowed);
  }
}

/** The value at a dotted path of a document (undefined where a step is missing). */
export function valueAtPath(doc: unknown, path: readonly string[]): unknown {
  let v: unknown = doc;
  for (const k of path) {
    if (v === null || typeof v !== 'object' || Array.isArray(v)) return undefined;
    v = (v as Record<string, unknown>)[k];
  }
  return v;
}

/** Write one axis value (SI) into a scenario document, in place (blocks on the way are created). */
export function writeAxisValue(doc: Record<string, unknown>, field: string, value: number, ctx: AxisWriteContext): void {
  const d = AXIS_FIELDS.get(field);
  if (!d) throw new RangeError(`field must be a sweepable scenario field, got ${JSON.stringify(field)}`);
  let sec: Record<string, unknown> = doc;
  for (const step of d.path.slice(0, -1)) {
    const current = sec[step];
    const next: Record<string, unknown> = current !== null && typeof current === 'object' && !Array.isArray(current) ? (current as Record<string, unknown>) : {};
    sec[step] = next;
    sec = next;
  }
  const key = d.path[d.path.length - 1];
  for (const k of d.replaces ?? []) delete sec[k];
  if (d.value.type === 'level') {
    // The level changes; the timescale at which it is stated is the axis's.
    const t = ctx.levelTimescaleS ?? (field === 'instrument.noise' ? ctx.noiseTimescaleS : undefined);
    sec[key] = t === undefined ? `${value * 1e6} ppm` : `${value * 1e6} ppm per ${t} s`;
    return;
  }
  if (field === 'instrument.cadence' && ctx.exposureRatio !== undefined && sec.exposure !== undefined && sec.exposure !== null) {
    sec.exposure = `${value * ctx.exposureRatio} s`;
  }
  if (d.value.type === 'quantity' && d.value.unit !== '') sec[key] = `${value} ${d.value.unit}`;
  else sec[key] = value;
}

/**
 * The scenario fields a sweep axis may vary, how an axis endpoint is read
 * (with the same units and bare-number rules as the scenario itself), and
 * how an axis value is written back into the raw scenario document, which
 * is then parsed again by `parseScenario` so every derived quantity
 * (semi-major axis, Hill radius, moon radius from density...) stays consistent.
 */
import { DAY_S, HOUR_S, MINUTE_S } from '../physics/constants.js';
import type { QuantityKind } from '../scenario/units.js';

const DEG = Math.PI / 180;

export type AxisValueKind =
  | { type: 'quantity'; kind: QuantityKind; /** SI unit written into the document and the output tables. */ unit: string; bare?: [number, string] }
  | { type: 'number' }
  | { type: 'integer' };

export interface AxisFieldDef {
  section: 'star' | 'planet' | 'moon' | 'instrument' | 'observation' | 'detection';
  key: string;
  value: AxisValueKind;
  /** Keys of the same section that give the same thing another way; removed when the axis sets this one. */
  replaces?: string[];
}

const q = (kind: QuantityKind, unit: string, bare?: [number, string]): AxisValueKind => ({ type: 'quantity', kind, unit, bare });
const num: AxisValueKind = { type: 'number' };

function def(path: string, value: AxisValueKind, replaces?: string[]): [string, AxisFieldDef] {
  const [section, key] = path.split('.') as [AxisFieldDef['section'], string];
  return [path, { section, key, value, replaces }];
}

/** Every numeric scenario field an axis may vary (bare-number units as in parseScenario). */
export const AXIS_FIELDS: ReadonlyMap<string, AxisFieldDef> = new Map([
  def('star.mass', q('mass', 'kg')),
  def('star.radius', q('length', 'm')),
  def('star.teff', q('temperature', 'K', [1, 'K'])),
  def('star.age', q('time', 's')),
  def('star.luminosity', q('power', 'W')),
  def('planet.mass', q('mass', 'kg')),
  def('planet.radius', q('length', 'm')),
  def('planet.period', q('time', 's', [DAY_S, 'days'])),
  def('planet.eccentricity', num),
  def('planet.periastron', q('angle', 'rad', [DEG, 'degrees'])),
  def('planet.impact_parameter', num, ['inclination']),
  def('planet.inclination', q('angle', 'rad', [DEG, 'degrees']), ['impact_parameter']),
  def('planet.albedo', num),
  def('planet.love_number', num),
  def('planet.tidal_q', num),
  def('moon.mass', q('mass', 'kg')),
  def('moon.radius', q('length', 'm'), ['density']),
  def('moon.density', q('density', 'kg/m^3'), ['radius']),
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
  def('instrument.noise', q('fraction', '', [1, 'a fraction']), ['noise_timescale']),
  def('observation.transits', { type: 'integer' }),
  def('observation.baseline', q('time', 's', [HOUR_S, 'hours'])),
  def('detection.false_alarm', q('fraction', '', [1, 'a fraction'])),
]);

/** The unit of an axis's values in tables ('' for plain numbers and fractions). */
export function axisUnit(d: AxisFieldDef): string {
  return d.value.type === 'quantity' ? d.value.unit : '';
}

/** Per-axis facts of the base scenario needed to write a value (see `applyAxisValues`). */
export interface AxisWriteContext {
  /** instrument.noise: the timescale at which the level is stated, kept while the level varies, s. */
  noiseTimescaleS?: number;
  /** instrument.cadence with an explicit exposure: exposure / cadence, kept while the cadence varies. */
  exposureRatio?: number;
}

/** Write one axis value (SI) into a scenario document's section, in place. */
export function writeAxisValue(doc: Record<string, unknown>, field: string, value: number, ctx: AxisWriteContext): void {
  const d = AXIS_FIELDS.get(field);
  if (!d) throw new RangeError(`field must be a sweepable scenario field, got ${JSON.stringify(field)}`);
  const current = doc[d.section];
  const sec: Record<string, unknown> = current !== null && typeof current === 'object' && !Array.isArray(current) ? (current as Record<string, unknown>) : {};
  doc[d.section] = sec;
  for (const k of d.replaces ?? []) delete sec[k];
  if (field === 'instrument.noise') {
    // The level changes; the timescale at which it is stated stays the scenario's.
    sec.noise = `${value * 1e6} ppm per ${ctx.noiseTimescaleS} s`;
    return;
  }
  if (field === 'instrument.cadence' && ctx.exposureRatio !== undefined && sec.exposure !== undefined && sec.exposure !== null) {
    sec.exposure = `${value * ctx.exposureRatio} s`;
  }
  if (d.value.type === 'quantity' && d.value.unit !== '') sec[d.key] = `${value} ${d.value.unit}`;
  else sec[d.key] = value;
}

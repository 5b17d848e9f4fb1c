/**
 * How a sweep axis (SI values) is shown on a plot: a scale factor and a unit
 * label astronomers read at a glance (Earth masses for moons, minutes for
 * cadence, ppm per stated timescale for noise), whether the axis is
 * logarithmic, and the tick marks of a log axis: whole 1-2-5 steps labelled
 * in full ("0.2", "5", "20"), never plotly's bare minor digits ("2", "5"
 * under a decade label), which read 0.4 M⊕ as "4".
 */
import { DAY_S, HOUR_S, L_SUN_W, M_EARTH_KG, M_JUP_KG, MINUTE_S, R_EARTH_M, R_JUP_M, R_SUN_M, M_SUN_KG, JULIAN_YEAR_S } from '../physics/constants.js';
import type { SweepAxisMeta } from '../sweep/sweepMeta.js';

export interface AxisDisplay {
  /** Axis title with its display unit, e.g. "moon mass (M⊕)". */
  title: string;
  /** Display value = SI value / divisor. */
  divisor: number;
  unitLabel: string;
  log: boolean;
}

interface Rule {
  label: string;
  divisor: number;
  unit: string;
}

const RULES: Record<string, Rule> = {
  'moon.mass': { label: 'moon mass', divisor: M_EARTH_KG, unit: 'M⊕' },
  'moon.radius': { label: 'moon radius', divisor: R_EARTH_M, unit: 'R⊕' },
  'moon.separation': { label: 'moon separation', divisor: 1e6, unit: '10³ km' },
  'moon.density': { label: 'moon density', divisor: 1000, unit: 'g/cm³' },
  'planet.mass': { label: 'planet mass', divisor: M_JUP_KG, unit: 'M_J' },
  'planet.radius': { label: 'planet radius', divisor: R_JUP_M, unit: 'R_J' },
  'planet.period': { label: 'planet period', divisor: DAY_S, unit: 'd' },
  'star.mass': { label: 'star mass', divisor: M_SUN_KG, unit: 'M☉' },
  'star.radius': { label: 'star radius', divisor: R_SUN_M, unit: 'R☉' },
  'star.teff': { label: 'star effective temperature', divisor: 1, unit: 'K' },
  'star.luminosity': { label: 'star luminosity', divisor: L_SUN_W, unit: 'L☉' },
  'star.age': { label: 'star age', divisor: 1e9 * JULIAN_YEAR_S, unit: 'Gyr' },
  'instrument.cadence': { label: 'cadence', divisor: MINUTE_S, unit: 'min' },
  'instrument.exposure': { label: 'exposure', divisor: MINUTE_S, unit: 'min' },
  'instrument.noise': { label: 'white noise', divisor: 1e-6, unit: 'ppm' },
  'instrument.red_noise.amplitude': { label: 'red-noise amplitude', divisor: 1e-6, unit: 'ppm' },
  'instrument.red_noise.slope': { label: 'red-noise spectral slope β', divisor: 1, unit: '' },
  'instrument.red_noise.timescale': { label: 'red-noise timescale', divisor: MINUTE_S, unit: 'min' },
  'instrument.ground.aperture': { label: 'telescope aperture', divisor: 1, unit: 'm' },
  'instrument.ground.magnitude': { label: 'star magnitude', divisor: 1, unit: 'mag' },
  'instrument.ground.throughput': { label: 'throughput', divisor: 1, unit: '' },
  'instrument.ground.airmass': { label: 'airmass', divisor: 1, unit: '' },
  'instrument.ground.altitude': { label: 'site altitude', divisor: 1, unit: 'm' },
  'instrument.ground.scintillation_coefficient': { label: 'scintillation coefficient C_Y', divisor: 1, unit: '' },
  'instrument.ground.floor': { label: 'systematic floor', divisor: 1e-6, unit: 'ppm' },
  'observation.baseline': { label: 'baseline', divisor: HOUR_S, unit: 'h' },
  'observation.transits': { label: 'transits observed', divisor: 1, unit: '' },
  'observation.duty_cycle': { label: 'duty cycle (observed fraction of each window)', divisor: 1, unit: '' },
  'observation.gap_length': { label: 'mean gap length', divisor: MINUTE_S, unit: 'min' },
  'observation.missed_fraction': { label: 'fraction of transits missed', divisor: 1, unit: '' },
  'detection.false_alarm': { label: 'false-alarm probability', divisor: 1, unit: '' },
};

const ANGLE_FIELDS = new Set(['planet.periapsis', 'planet.inclination', 'moon.inclination', 'moon.node', 'moon.periapsis', 'moon.phase']);

/** Planet masses and radii of small planets read in Earth units: below these, an axis uses M⊕ / R⊕. */
const EARTH_UNITS_BELOW: Record<string, Rule & { below: number }> = {
  'planet.mass': { label: 'planet mass', divisor: M_EARTH_KG, unit: 'M⊕', below: 0.3 * M_JUP_KG },
  'planet.radius': { label: 'planet radius', divisor: R_EARTH_M, unit: 'R⊕', below: 0.5 * R_JUP_M },
};

/** A timescale as words for a unit label ("1 h", "30 min", "100 s"). */
export function timescaleText(s: number): string {
  const whole = (x: number) => Math.abs(x - Math.round(x)) < 1e-9 * Math.max(1, Math.abs(x));
  if (s >= DAY_S && whole(s / DAY_S)) return `${Math.round(s / DAY_S)} d`;
  if (s >= HOUR_S && whole(s / HOUR_S)) return `${Math.round(s / HOUR_S)} h`;
  if (s >= MINUTE_S && whole(s / MINUTE_S)) return `${Math.round(s / MINUTE_S)} min`;
  return `${formatNumber(s)} s`;
}

export type AxisLike = Pick<SweepAxisMeta, 'field' | 'unit' | 'spacing'> & Partial<Pick<SweepAxisMeta, 'values' | 'timescale_s'>>;

/** Display rule of one axis. Unknown fields are shown in their SI unit. */
export function axisDisplay(axis: AxisLike): AxisDisplay {
  const log = axis.spacing === 'log';
  let rule = RULES[axis.field];
  const earth = EARTH_UNITS_BELOW[axis.field];
  if (earth && axis.values && axis.values.length > 0 && Math.max(...axis.values) < earth.below) rule = earth;
  if (!rule && ANGLE_FIELDS.has(axis.field)) rule = { label: axis.field, divisor: Math.PI / 180, unit: 'deg' };
  if (!rule) rule = { label: axis.field, divisor: 1, unit: axis.unit };
  let unit = rule.unit;
  // A level stated at a timescale carries it in its unit ("ppm per 1 h").
  if (unit === 'ppm' && typeof axis.timescale_s === 'number' && axis.timescale_s > 0) unit = `ppm per ${timescaleText(axis.timescale_s)}`;
  return { title: unit ? `${rule.label} (${unit})` : rule.label, divisor: rule.divisor, unitLabel: unit, log };
}

/** A value formatted with its display unit, 3 significant digits ("0.52 M⊕"). */
export function formatDisplay(d: AxisDisplay, si: number): string {
  const v = si / d.divisor;
  // A unit that starts with a power of ten ("10³ km") reads as a product: "79 × 10³ km", not "79 10³ km".
  const sep = /^10[⁰¹²³⁴⁵⁶⁷⁸⁹⁻]/.test(d.unitLabel) ? ' × ' : ' ';
  return `${formatNumber(v)}${d.unitLabel ? `${sep}${d.unitLabel}` : ''}`;
}

/** 3 significant digits, exponent form outside 1e-3…1e5. */
export function formatNumber(v: number, digits = 3): string {
  if (!Number.isFinite(v)) return String(v);
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e5 || a < 1e-3) return v.toExponential(digits - 1);
  return String(Number(v.toPrecision(digits)));
}

const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

/** A tick label in full: "0.2", "20", "1500"; outside 1e-3…1e5 "2×10⁻⁵" or "10⁶". */
export function tickLabel(v: number): string {
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e-3 && a < 1e5) return String(Number(v.toPrecision(6)));
  const e = Math.floor(Math.log10(a) + 1e-9);
  const m = Number((v / 10 ** e).toPrecision(6));
  const pow = `10${String(e).split('').map((ch) => SUPERSCRIPT[ch]).join('')}`;
  return m === 1 ? pow : `${m}×${pow}`;
}

/** m × 10^e without binary noise (0.30000000000000004 → 0.3). */
function clean(v: number): number {
  return Number(v.toPrecision(12));
}

/** A 1-2-5 step near `raw` (the next one up): 1, 2, 5, 10, 20... × 10^k. */
export function niceStep(raw: number): number {
  const e = Math.floor(Math.log10(raw));
  const f = raw / 10 ** e;
  const m = f <= 1 + 1e-9 ? 1 : f <= 2 + 1e-9 ? 2 : f <= 5 + 1e-9 ? 5 : 10;
  return clean(m * 10 ** e);
}

/** Evenly spaced ticks at a 1-2-5 step, about `target` of them, inside [lo, hi]. */
export function linearTicks(lo: number, hi: number, target = 5): number[] {
  if (!(hi > lo)) return [clean(lo)];
  const step = niceStep((hi - lo) / (target - 1));
  const out: number[] = [];
  for (let k = Math.ceil(lo / step - 1e-9); k * step <= hi * (1 + 1e-12) + 1e-300; k++) out.push(clean(k * step));
  return out;
}

/** Most ticks a log axis shows at every 1-2-5 step; a wider range is labelled at whole decades. */
const MAX_125_TICKS = 12;
const MAX_DECADE_TICKS = 10;

/**
 * Tick values of a log axis over [lo, hi] (display units, lo > 0): every 1, 2
 * and 5 × 10^k inside the range when that gives 3 to 12 ticks; whole decades
 * (thinned to at most 10) over a wider range; over a narrow range (fewer than
 * 3 such ticks) evenly spaced ticks at a 1-2-5 step, so every label is a full
 * value. Common practice, no source.
 */
export function logTickValues(lo: number, hi: number): number[] {
  if (!(lo > 0) || !(hi >= lo) || !Number.isFinite(hi)) throw new RangeError(`log ticks need 0 < lo ≤ hi, got ${lo}, ${hi}`);
  const inside = (v: number) => v >= lo * (1 - 1e-9) && v <= hi * (1 + 1e-9);
  const e0 = Math.floor(Math.log10(lo)) - 1;
  const e1 = Math.ceil(Math.log10(hi)) + 1;
  const steps125: number[] = [];
  const decades: number[] = [];
  for (let e = e0; e <= e1; e++) {
    for (const m of [1, 2, 5]) {
      const v = clean(m * 10 ** e);
      if (!inside(v)) continue;
      steps125.push(v);
      if (m === 1) decades.push(v);
    }
  }
  if (steps125.length > MAX_125_TICKS) {
    if (decades.length <= MAX_DECADE_TICKS) return decades;
    const every = Math.ceil(decades.length / MAX_DECADE_TICKS);
    return decades.filter((_, k) => k % every === 0);
  }
  if (steps125.length >= 3) return steps125;
  return linearTicks(lo, hi).filter((v) => v > 0 && inside(v));
}

/** Plotly tick settings of a log axis over [lo, hi] (display units): explicit values and full labels. */
export function logTickLayout(lo: number, hi: number): { tickmode: 'array'; tickvals: number[]; ticktext: string[] } {
  const tickvals = logTickValues(lo, hi);
  return { tickmode: 'array', tickvals, ticktext: tickvals.map(tickLabel) };
}

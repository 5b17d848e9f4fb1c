/**
 * How a sweep axis (SI values) is shown on a plot: a scale factor and a unit
 * label astronomers read at a glance (Earth masses for moons, minutes for
 * cadence, ppm for noise), and whether the axis is logarithmic.
 */
import { DAY_S, HOUR_S, M_EARTH_KG, M_JUP_KG, MINUTE_S, R_EARTH_M, R_JUP_M, R_SUN_M, M_SUN_KG, JULIAN_YEAR_S } from '../physics/constants.js';
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
  'star.age': { label: 'star age', divisor: 1e9 * JULIAN_YEAR_S, unit: 'Gyr' },
  'instrument.cadence': { label: 'cadence', divisor: MINUTE_S, unit: 'min' },
  'instrument.exposure': { label: 'exposure', divisor: MINUTE_S, unit: 'min' },
  'instrument.noise': { label: 'noise level', divisor: 1e-6, unit: 'ppm' },
  'observation.baseline': { label: 'baseline', divisor: HOUR_S, unit: 'h' },
  'observation.transits': { label: 'transits observed', divisor: 1, unit: '' },
  'detection.false_alarm': { label: 'false-alarm probability', divisor: 1, unit: '' },
};

const ANGLE_FIELDS = new Set(['planet.periastron', 'planet.inclination', 'moon.inclination', 'moon.node', 'moon.periapsis', 'moon.phase']);

/** Display rule of one axis. Unknown fields are shown in their SI unit. */
export function axisDisplay(axis: Pick<SweepAxisMeta, 'field' | 'unit' | 'spacing'>): AxisDisplay {
  const log = axis.spacing === 'log';
  let rule = RULES[axis.field];
  if (!rule && ANGLE_FIELDS.has(axis.field)) rule = { label: axis.field, divisor: Math.PI / 180, unit: 'deg' };
  if (!rule) rule = { label: axis.field, divisor: 1, unit: axis.unit };
  return { title: rule.unit ? `${rule.label} (${rule.unit})` : rule.label, divisor: rule.divisor, unitLabel: rule.unit, log };
}

/** A value formatted with its display unit, 3 significant digits ("0.52 M⊕"). */
export function formatDisplay(d: AxisDisplay, si: number): string {
  const v = si / d.divisor;
  return `${formatNumber(v)}${d.unitLabel ? ` ${d.unitLabel}` : ''}`;
}

/** 3 significant digits, exponent form outside 1e-3…1e5. */
export function formatNumber(v: number, digits = 3): string {
  if (!Number.isFinite(v)) return String(v);
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e5 || a < 1e-3) return v.toExponential(digits - 1);
  return String(Number(v.toPrecision(digits)));
}

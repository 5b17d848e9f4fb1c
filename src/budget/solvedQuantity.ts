/**
 * The quantity a budget solves for, as a grid of candidate values ordered
 * from the cheapest (fewest transits, coarsest cadence, worst white noise)
 * to the most demanding, and how one value is written into the scenario
 * document (with the sweep's own writer, so a value means exactly what it
 * means on a sweep axis: the exposure follows the cadence at the scenario's
 * ratio when the scenario gives one; the noise level keeps its timescale).
 *
 * Cadence and noise grids are geometric with ratio 2^(1/4) (≈ 19 % steps),
 * anchored on the scenario's own value so that value is a grid point.
 */
import { MINUTE_S } from '../physics/constants.js';
import type { Scenario } from '../scenario/types.js';
import { parseScenario } from '../scenario/parseScenario.js';
import { scenarioDocumentOf } from '../scenario/scenarioDocument.js';
import { CELL_PARSE } from '../sweep/applyAxes.js';
import { lightCurvePointCount, MAX_LIGHT_CURVE_POINTS, scenarioDurations } from '../photometry/transitWindows.js';
import { writeAxisValue, type AxisWriteContext } from '../sweep/axisFields.js';
import type { BudgetChannel, BudgetQuantityInfo, BudgetSolve } from './budgetTypes.js';
import { minTransitsFor } from './budgetSpec.js';

/** Ratio between neighbouring cadence or noise values. */
export const GEOMETRIC_STEP = 2 ** 0.25;
/** Finest cadence considered, s. */
export const MIN_CADENCE_S = 10;
/** Coarsest cadence considered: T14 / 3 (a coarser sampling leaves too few points in transit to fit). */
export const MAX_CADENCE_PER_T14 = 1 / 3;
/** Noise levels considered: from 1/100 to 100 × the scenario's, within [0.1 ppm, 50 %]. */
export const NOISE_RANGE_FACTOR = 100;
const NOISE_FLOOR = 1e-7;
const NOISE_CEILING = 0.5;

const FIELDS: Record<BudgetSolve, string> = {
  transits: 'observation.transits',
  cadence: 'instrument.cadence',
  noise: 'instrument.noise',
};

export interface SolvedQuantity extends BudgetQuantityInfo {
  write: AxisWriteContext;
  /** Keys of the quantity's section removed when a value is written (a ground budget gives way to the white-noise level). */
  remove: string[];
}

/** Geometric values anchor·step^k within [lo, hi], in ascending order (the anchor always included). */
function geometricGrid(anchor: number, lo: number, hi: number): number[] {
  const kLo = Math.ceil(Math.log(Math.min(lo, anchor) / anchor) / Math.log(GEOMETRIC_STEP) - 1e-9);
  const kHi = Math.floor(Math.log(Math.max(hi, anchor) / anchor) / Math.log(GEOMETRIC_STEP) + 1e-9);
  const out: number[] = [];
  for (let k = kLo; k <= kHi; k++) out.push(k === 0 ? anchor : anchor * GEOMETRIC_STEP ** k);
  return out;
}

/** The grid and writing context for `solve` on the parsed scenario `base` (and its document `doc`). */
export function solvedQuantity(solve: BudgetSolve, doc: unknown, base: Scenario, maxTransits: number, channel: BudgetChannel = 'ttv'): SolvedQuantity {
  const field = FIELDS[solve];
  if (solve === 'transits') {
    const values: number[] = [];
    // From the fewest transits at which the channel exists (budgetSpec.ts minTransitsFor).
    for (let n = minTransitsFor(channel); n <= maxTransits; n++) values.push(n);
    return { solve, field, unit: '', displayUnit: 'transits', displayFactor: 1, values, scenarioValue: base.observation.transits, cheaper: 'fewer transits', write: {}, remove: [] };
  }
  if (solve === 'cadence') {
    const c0 = base.instrument.cadenceS;
    const t14 = scenarioDurations(base).t14S;
    // Coarsest (cheapest) first; cadences whose light curve would exceed the size limit are left out.
    const values = geometricGrid(c0, MIN_CADENCE_S, MAX_CADENCE_PER_T14 * t14).reverse()
      .filter((c) => c === c0 || lightCurvePointCount({ ...base, instrument: { ...base.instrument, cadenceS: c } }) <= MAX_LIGHT_CURVE_POINTS);
    const write: AxisWriteContext = {};
    const instrument = (doc as Record<string, unknown>).instrument as Record<string, unknown> | undefined;
    if (instrument && instrument.exposure !== undefined && instrument.exposure !== null) write.exposureRatio = base.instrument.exposureS / c0;
    return { solve, field, unit: 's', displayUnit: 'min', displayFactor: MINUTE_S, values, scenarioValue: c0, cheaper: 'a coarser cadence', write, remove: [] };
  }
  const n0 = base.instrument.noiseFraction > 0 ? base.instrument.noiseFraction : 1e-4;
  const lo = Math.max(NOISE_FLOOR, n0 / NOISE_RANGE_FACTOR);
  const hi = Math.min(NOISE_CEILING, n0 * NOISE_RANGE_FACTOR);
  const values = geometricGrid(n0, lo, hi).reverse(); // worst (cheapest) first
  const ts = base.instrument.noiseTimescaleS;
  return {
    solve, field, unit: '', displayUnit: `ppm per ${formatTimescale(ts)}`, displayFactor: 1e-6, values, scenarioValue: base.instrument.noiseFraction,
    cheaper: 'worse white noise', write: { noiseTimescaleS: ts },
    // A ground budget's total per exposure becomes the white-noise level that the search scales.
    remove: base.instrument.ground ? ['ground'] : [],
  };
}

function formatTimescale(s: number): string {
  if (s >= 3600 && Math.abs(s / 3600 - Math.round(s / 3600)) < 1e-9) return `${s / 3600} h`;
  if (s >= 60 && Math.abs(s / 60 - Math.round(s / 60)) < 1e-9) return `${s / 60} min`;
  return `${s} s`;
}

/** A copy of `doc` (without its `sweep` and `budget` blocks) with the quantity set to `value` (SI). */
export function applyQuantity(doc: unknown, q: Pick<SolvedQuantity, 'field' | 'write' | 'remove'>, value: number): Record<string, unknown> {
  const out = structuredClone(doc ?? {}) as Record<string, unknown>;
  delete out.sweep;
  delete out.budget;
  if (q.remove.length > 0) {
    const section = out[q.field.split('.')[0]];
    if (section !== null && typeof section === 'object') for (const k of q.remove) delete (section as Record<string, unknown>)[k];
  }
  writeAxisValue(out, q.field, value, q.write);
  return out;
}

/**
 * The scenario `base` (from parseScenario) with the quantity set to `value` (SI), validated as
 * a sweep cell is (`CELL_PARSE`), under the name `label`; `base` is not changed.
 */
export function quantityScenario(base: Scenario, q: Pick<SolvedQuantity, 'field' | 'write' | 'remove'>, value: number, label: string): Scenario {
  return parseScenario(applyQuantity(scenarioDocumentOf(base), q, value), label, CELL_PARSE);
}

/** A value in the quantity's display unit, as text ("12 transits", "4.76 min", "450 ppm per 2 min"). */
export function formatQuantity(q: Pick<BudgetQuantityInfo, 'solve' | 'displayUnit' | 'displayFactor'>, value: number): string {
  const v = value / q.displayFactor;
  if (q.solve === 'transits') return `${v} transit${v === 1 ? '' : 's'}`;
  return `${v >= 100 ? v.toFixed(0) : v.toPrecision(3)} ${q.displayUnit}`;
}

/** A probability in per cent, with the digits it needs (0.99 → "99 %", 6e-5 → "0.006 %"). */
export const pct = (p: number): string => {
  const x = 100 * p;
  if (x > 0 && x < 1) return `${x.toPrecision(1)} %`;
  return `${x.toFixed(p > 0.995 && p < 1 ? 1 : 0)} %`;
};

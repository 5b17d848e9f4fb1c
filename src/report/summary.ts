/**
 * `summary.json`: the headline numbers the report's plain-language summary
 * quotes, computed once from cells.json so the page and the file agree.
 *
 * Definitions
 * - A habitable-zone moon is a cell whose moon is physically allowed
 *   (placement "stable": outside the Roche limit, inside the stable limit,
 *   surviving tidal migration) and whose energy budget is "temperate".
 * - Its detection probability is the Monte Carlo combined-channel estimate
 *   `pdet_combined` (the weighted min-p rule over template, TTV, TDV and moon dip, calibrated at α),
 *   or in a forecast-only run the forecast of the same rule over TTV and TDV,
 *   `pdet_forecast_combined` (the moon dip is not forecast; summaries written
 *   before it quote the joint χ² forecast `pdet_forecast_joint`).
 * - "Detected at 90 %" means that probability ≥ 0.9; "confidently" adds that
 *   the lower Wilson bound `pdet_combined_lo` is ≥ 0.9 too (Monte Carlo only).
 * - The bound lines (`bound_50`, `bound_90`) are the same search on the
 *   known-template bound `pdet_bound` (timing/knownTemplateBound.ts), over the
 *   cells that have a probability above (like for like), and `efficiency_50`
 *   compares the two 50 % lines per x value (see `efficiencyOf`).
 */
import type { CellResult } from '../sweep/cellTypes.js';
import type { SweepMeta } from '../sweep/sweepMeta.js';
import { cellProbability, gridLayout, num, type GridLayout } from './reportGrid.js';
import { minDetectable, type MinDetectablePoint } from './minDetectable.js';
import { medianOfFinite } from '../numeric/quantiles.js';

export const SUMMARY_SCHEMA = 'moonsieve/summary/2';

/** One cell quoted by the summary. */
export interface SummaryCell {
  /** Row-major cell index. */
  index: number;
  /** The cell's value on each axis, SI. */
  coords: number[];
  /** Moon mass, kg (null without a moon). */
  moon_mass_kg: number | null;
  /** Planet–moon semi-major axis, m (null without a moon). */
  moon_separation_m: number | null;
  /** The separation in Hill radii (null without a moon). */
  moon_separation_hill: number | null;
  /** The cell's detection probability (the `probability_field` of the summary). */
  probability: number;
}

/** summary.json (schema SUMMARY_SCHEMA, schemas/summary.schema.json): the headline numbers of a sweep. */
export interface SweepSummary {
  /** Schema id with its version (SUMMARY_SCHEMA). */
  schema: string;
  /** The scenario's name. */
  scenario: string;
  /** sha256 of the scenario document's canonical JSON (as in cells.json's meta). */
  scenario_hash: string;
  /** The moonsieve version that wrote the cells. */
  moonsieve_version: string;
  /** The scenario seed. */
  seed: number;
  /** Where the probabilities come from: the Monte Carlo, or the analytic forecast (a forecast-only run). */
  basis: 'monte carlo' | 'forecast';
  /** The cell field the detection probability is read from. */
  probability_field: 'pdet_combined' | 'pdet_forecast_combined' | 'pdet_forecast_joint';
  /** Moon realizations per simulated cell (null in a forecast-only run). */
  realizations: number | null;
  /** The requested false-alarm probability per channel. */
  false_alarm: number;
  /** Measured combined false-alarm rate over the simulated cells: min, median, max (null when none). */
  false_alarm_measured_combined: { min: number; median: number; max: number } | null;
  /** Cells summarised. */
  cells: number;
  /** Cells of the whole grid. */
  cells_grid: number;
  /** Cells simulated (Monte Carlo). */
  cells_simulated: number;
  /** Cells whose moon is physically allowed (placement "stable"). */
  cells_allowed: number;
  /** Cells whose moon's energy budget is temperate. */
  cells_temperate: number;
  /** Stable and temperate. */
  cells_habitable: number;
  /** Habitable-zone cells detected with probability ≥ 0.5. */
  habitable_detected_50: number;
  /** Habitable-zone cells detected with probability ≥ 0.9. */
  habitable_detected_90: number;
  /** Of those, the ones whose lower Wilson bound is ≥ 0.9 too (null in a forecast-only run). */
  habitable_detected_90_confident: number | null;
  /** The lightest habitable-zone moon detected at 90 %, when the moon mass varies over the grid. */
  smallest_habitable_detected_90: SummaryCell | null;
  /** The same over every stable cell, temperate or not. */
  allowed_detected_90: number;
  /** The lightest stable moon detected at 90 %, when the moon mass varies over the grid. */
  smallest_allowed_detected_90: SummaryCell | null;
  /** The habitable-zone cell with the highest probability still below 0.9. */
  closest_habitable_miss: SummaryCell | null;
  /** Range of each axis (SI) over the habitable cells detected at 90 %. */
  habitable_detected_90_axis_ranges: Array<{ field: string; unit: string; min: number; max: number }>;
  /** Whether the moon mass differs between cells (more than one moon_mass_kg). */
  moon_mass_varies: boolean;
  /**
   * On a two-axis grid: per x value, the smallest y (direction 'increasing',
   * e.g. moon mass) or the largest y ('decreasing', e.g. noise level) that
   * reaches 50 % and 90 % (see minDetectable.ts).
   */
  min_detectable: {
    /** The axis whose minimum (or maximum) detectable value is given per column. */
    y_field: string;
    /** 'increasing': the smallest y that reaches the level; 'decreasing': the largest. */
    direction: 'increasing' | 'decreasing';
    /** The axis of the columns. */
    x_field: string;
    /** On a three-axis grid, the axis drawn as small multiples; each point then carries its `facet` value, panel after panel. */
    facet_field?: string;
    /** Per column, where the probability reaches 0.5. */
    level_50: MinDetectablePoint[];
    /** Per column, where the probability reaches 0.9. */
    level_90: MinDetectablePoint[];
    /** The same lines for the known-template bound (`pdet_bound`): no analysis of the same data can do better. */
    bound_50: MinDetectablePoint[];
    bound_90: MinDetectablePoint[];
    /** Per x value: how far the detector's 50 % line is from the bound's (see `efficiencyOf`). */
    efficiency_50: EfficiencyPoint[];
  } | null;
}

/**
 * The detector against the bound at one x value: `ratio` is the detector's
 * 50 % y over the bound's for an 'increasing' axis (a moon mass: how many
 * times heavier a moon must be for this detector than for the best possible
 * one), the bound's over the detector's for a 'decreasing' one; 1 is optimal.
 */
export interface EfficiencyPoint {
  x: number;
  facet?: number;
  ratio: number | null;
  /**
   * 'value'; 'at most' when the detector's y is itself a bound (reached after
   * unsimulated cells or at the grid's edge); 'at least' when the bound's is,
   * or when the detector never reaches 50 % on the grid (ratio then from the
   * farthest cell of the column that has a probability); 'unknown' when both
   * are bounds or the bound never reaches 50 %.
   */
  ratio_kind: 'value' | 'at most' | 'at least' | 'unknown';
}

/** Per column of a layout, the y farthest along the search direction among the cells with a probability (null: none). */
function farthestWithProbability(layout: GridLayout, yValues: readonly number[], prob: (c: CellResult) => number | null, direction: 'increasing' | 'decreasing'): Array<number | null> {
  const out: Array<number | null> = [];
  for (let i = 0; i < layout.nx; i++) {
    let far: number | null = null;
    for (let j = 0; j < yValues.length; j++) {
      const c = layout.cellAt(i, j);
      if (!c || prob(c) === null) continue;
      if (far === null || (direction === 'increasing' ? yValues[j] > far : yValues[j] < far)) far = yValues[j];
    }
    out.push(far);
  }
  return out;
}

/** Per x value, the detector's 50 % point against the bound's (EfficiencyPoint). */
export function efficiencyOf(mc: readonly MinDetectablePoint[], bound: readonly MinDetectablePoint[], direction: 'increasing' | 'decreasing', farthest: readonly (number | null)[]): EfficiencyPoint[] {
  return mc.map((m, k) => {
    const far = farthest[k];
    const b = bound[k];
    const base = { x: m.x, ...(m.facet !== undefined ? { facet: m.facet } : {}) };
    if (!b || b.y === null || !(b.y > 0)) return { ...base, ratio: null, ratio_kind: 'unknown' as const };
    const ratioOf = (mcY: number): number => (direction === 'increasing' ? mcY / (b.y as number) : (b.y as number) / mcY);
    const bLoose = b.is_bound || b.at_grid_edge;
    if (m.y === null) {
      // Never reached: the minimum lies beyond the farthest cell with a probability (if the bound's is a value).
      const known = !bLoose && far !== null && far !== undefined;
      return { ...base, ratio: known ? ratioOf(far) : null, ratio_kind: known ? ('at least' as const) : ('unknown' as const) };
    }
    const mLoose = m.is_bound || m.at_grid_edge;
    const kind = mLoose && bLoose ? 'unknown' : mLoose ? 'at most' : bLoose ? 'at least' : 'value';
    return { ...base, ratio: kind === 'unknown' ? null : ratioOf(m.y), ratio_kind: kind };
  });
}

function summaryCell(c: CellResult, p: number): SummaryCell {
  const m = num(c, 'moon_mass_kg');
  return {
    index: c.index,
    coords: c.coords,
    moon_mass_kg: m,
    moon_separation_m: num(c, 'moon_separation_m'),
    moon_separation_hill: num(c, 'moon_separation_hill'),
    probability: p,
  };
}

/** Lightest (then lowest index) of cells; null when empty. */
function lightest(cs: Array<{ c: CellResult; p: number }>): SummaryCell | null {
  let best: { c: CellResult; p: number } | null = null;
  for (const e of cs) {
    const m = num(e.c, 'moon_mass_kg') ?? Infinity;
    const bm = best ? (num(best.c, 'moon_mass_kg') ?? Infinity) : Infinity;
    if (!best || m < bm || (m === bm && e.c.index < best.c.index)) best = e;
  }
  return best ? summaryCell(best.c, best.p) : null;
}

/** Fields along which a larger value makes a moon easier to detect. */
const EASIER_WHEN_LARGER = new Set([
  'moon.mass', 'moon.radius', 'moon.separation', 'observation.transits', 'observation.baseline', 'moon.density',
  'instrument.ground.aperture', 'instrument.ground.throughput', 'observation.duty_cycle', 'detection.false_alarm',
]);
/** Fields along which a larger value makes it harder. */
const HARDER_WHEN_LARGER = new Set([
  'instrument.noise', 'instrument.cadence', 'instrument.exposure', 'star.radius', 'planet.mass',
  'instrument.red_noise.amplitude', 'instrument.ground.magnitude', 'instrument.ground.airmass', 'instrument.ground.floor',
  'instrument.ground.scintillation_coefficient', 'observation.missed_fraction',
]);

/** Whether detection improves ('increasing') or worsens ('decreasing') along the y axis: known fields, else the data (all panels). */
function detectionDirection(layouts: readonly GridLayout[], field: string, yValues: readonly number[], prob: (c: CellResult) => number | null): 'increasing' | 'decreasing' {
  if (EASIER_WHEN_LARGER.has(field)) return 'increasing';
  if (HARDER_WHEN_LARGER.has(field)) return 'decreasing';
  const jLo = yValues.indexOf(Math.min(...yValues));
  const jHi = yValues.indexOf(Math.max(...yValues));
  let lo = 0;
  let hi = 0;
  for (const layout of layouts) {
    for (let i = 0; i < layout.nx; i++) {
      const a = layout.cellAt(i, jLo);
      const b = layout.cellAt(i, jHi);
      lo += (a && prob(a)) ?? 0;
      hi += (b && prob(b)) ?? 0;
    }
  }
  return hi >= lo ? 'increasing' : 'decreasing';
}

export function buildSummary(meta: SweepMeta, cells: readonly CellResult[]): SweepSummary {
  const fo = meta.forecast_only;
  const prob = (c: CellResult): number | null => cellProbability(c, 'combined', fo, meta.simulate_unstable);
  const sorted = [...cells].sort((a, b) => a.index - b.index);
  const stable = sorted.filter((c) => c.allowed === true);
  const habitable = stable.filter((c) => c.habitability === 'temperate');
  const withP = (cs: CellResult[]) => cs.map((c) => ({ c, p: prob(c) })).filter((e): e is { c: CellResult; p: number } => e.p !== null);
  const habP = withP(habitable);
  const stableP = withP(stable);
  const hab90 = habP.filter((e) => e.p >= 0.9);
  const stable90 = stableP.filter((e) => e.p >= 0.9);
  const masses = new Set(sorted.map((c) => num(c, 'moon_mass_kg')).filter((m) => m !== null));
  const massVaries = masses.size > 1;

  let miss: { c: CellResult; p: number } | null = null;
  for (const e of habP) if (e.p < 0.9 && (!miss || e.p > miss.p)) miss = e;

  const fa = sorted.filter((c) => c.simulated === true).map((c) => num(c, 'false_alarm_measured_combined')).filter((x): x is number => x !== null);

  let minDet: SweepSummary['min_detectable'] = null;
  if (meta.axes.length >= 2) {
    const first = gridLayout(meta, sorted);
    const layouts = Array.from({ length: first.nFacets }, (_, k) => (k === 0 ? first : gridLayout(meta, sorted, k)));
    const xa = meta.axes[first.xAxis];
    const ya = meta.axes[first.yAxis as number];
    const fa = first.facetAxis === null ? null : meta.axes[first.facetAxis];
    const ylog = ya.spacing === 'log';
    const direction = detectionDirection(layouts, ya.field, ya.values, prob);
    // The bound over the cells the detector has a probability for: like for like.
    const boundProb = (c: CellResult): number | null => (prob(c) === null ? null : num(c, 'pdet_bound'));
    const level = (lv: number, pr: (c: CellResult) => number | null = prob): MinDetectablePoint[] => layouts.flatMap((layout, k) => {
      const pts = minDetectable(layout, xa.values, ya.values, ylog, pr, lv, direction);
      return fa ? pts.map((p) => ({ ...p, facet: fa.values[k] })) : pts;
    });
    const level50 = level(0.5);
    const bound50 = level(0.5, boundProb);
    minDet = {
      y_field: ya.field,
      direction,
      x_field: xa.field,
      ...(fa ? { facet_field: fa.field } : {}),
      level_50: level50,
      level_90: level(0.9),
      bound_50: bound50,
      bound_90: level(0.9, boundProb),
      efficiency_50: efficiencyOf(level50, bound50, direction, layouts.flatMap((layout) => farthestWithProbability(layout, ya.values, prob, direction))),
    };
  }

  return {
    schema: SUMMARY_SCHEMA,
    scenario: meta.scenario,
    scenario_hash: meta.scenario_hash,
    moonsieve_version: meta.moonsieve_version,
    seed: meta.seed,
    basis: fo ? 'forecast' : 'monte carlo',
    probability_field: fo ? 'pdet_forecast_combined' : 'pdet_combined',
    realizations: fo ? null : meta.realizations,
    false_alarm: meta.false_alarm,
    false_alarm_measured_combined: fa.length ? { min: Math.min(...fa), median: medianOfFinite(fa), max: Math.max(...fa) } : null,
    cells: sorted.length,
    cells_grid: meta.cells,
    cells_simulated: sorted.filter((c) => c.simulated === true).length,
    cells_allowed: stable.length,
    cells_temperate: sorted.filter((c) => c.habitability === 'temperate').length,
    cells_habitable: habitable.length,
    habitable_detected_50: habP.filter((e) => e.p >= 0.5).length,
    habitable_detected_90: hab90.length,
    habitable_detected_90_confident: fo ? null : hab90.filter((e) => (num(e.c, 'pdet_combined_lo') ?? 0) >= 0.9).length,
    smallest_habitable_detected_90: massVaries ? lightest(hab90) : null,
    allowed_detected_90: stable90.length,
    smallest_allowed_detected_90: massVaries ? lightest(stable90) : null,
    closest_habitable_miss: miss ? summaryCell(miss.c, miss.p) : null,
    habitable_detected_90_axis_ranges: hab90.length
      ? meta.axes.map((a, k) => {
          const v = hab90.map((e) => e.c.coords[k]);
          return { field: a.field, unit: a.unit, min: Math.min(...v), max: Math.max(...v) };
        })
      : [],
    moon_mass_varies: massVaries,
    min_detectable: minDet,
  };
}

/** summary.json text. */
export function renderSummaryJson(summary: SweepSummary): string {
  return JSON.stringify(summary, null, 2) + '\n';
}

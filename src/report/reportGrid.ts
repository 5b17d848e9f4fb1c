/**
 * The sweep's cells arranged for plotting: which axis goes across (x) and
 * which up (y), the probability each channel gives a cell (Monte Carlo or,
 * in a forecast-only run, the analytic forecast), and z matrices [row = y][col = x].
 * Cells are row-major over the axes, last axis fastest (src/sweep/grid.ts).
 */
import type { CellResult } from '../sweep/cellTypes.js';
import type { SweepMeta, SweepAxisMeta } from '../sweep/sweepMeta.js';

export type MapChannel = 'combined' | 'template' | 'ttv' | 'tdv' | 'dip';
export const MAP_CHANNELS: readonly MapChannel[] = ['combined', 'template', 'ttv', 'tdv', 'dip'];
export const CHANNEL_LABELS: Record<MapChannel, string> = { combined: 'combined (weighted min-p over the channels)', template: 'template search', ttv: 'TTV', tdv: 'TDV', dip: 'moon dip' };

/** A channel's label; in a forecast-only run "combined" is the joint TTV + TDV forecast. */
export function channelLabel(ch: MapChannel, forecastOnly: boolean): string {
  return forecastOnly && ch === 'combined' ? 'combined (forecast of its timing channels; template and moon dip not forecast)' : CHANNEL_LABELS[ch];
}

/**
 * What "combined" means, in one sentence for the map and the summary: in a
 * Monte Carlo run the weighted minimum of the four channels' empirical
 * p-values, its threshold calibrated on the no-moon realizations so that the
 * rule's false-alarm probability is α (timing/detection.ts; Westfall & Young
 * 1993 for min-p, Genovese, Roeder & Wasserman 2006 for the weights); in a
 * forecast-only run the analytic forecast of its timing channels.
 */
export function combinedMeaning(forecastOnly: boolean, alpha: number): string {
  const a = String(Number(alpha.toPrecision(3)));
  return forecastOnly
    ? `"combined" is the analytic forecast of the Monte Carlo's rule for its timing channels: a detection in TTV or TDV, each tested at its share of α = ${a} (${String(Number((alpha * 0.05).toPrecision(3)))} each, the weights of the Monte Carlo's rule), averaged over the moon's phase and the angles the Monte Carlo draws. The template search and the moon dip, which carry most of the power, are not forecast, so the forecast reads low: the cyan bound lines are the upper estimate, and a Monte Carlo run lies between.`
    : `"combined" is the rule a detection claim would use: the minimum of the four channels' p-values against the no-moon realizations (weighted 0.85 for the template search, 0.05 each for TTV, TDV and the moon dip), its threshold calibrated on those realizations so that the whole rule's false-alarm probability is α = ${a}; a single channel's map tests that channel alone at α.`;
}

/** The cell field holding a channel's detection probability, or null when the run has none. */
export function channelField(channel: MapChannel, forecastOnly: boolean): string | null {
  if (!forecastOnly) return `pdet_${channel}`;
  return { combined: 'pdet_forecast_combined', template: null, ttv: 'pdet_forecast_ttv', tdv: 'pdet_forecast_tdv', dip: null }[channel];
}

/** A number field of a cell, or null (JSON turned NaN into null; missing fields are null too). */
export function num(c: CellResult | undefined, key: string): number | null {
  const v = (c as Readonly<Record<string, unknown>> | undefined)?.[key];
  return typeof v === 'number' && Number.isFinite(v) ? v : null;
}

/**
 * Detection probability of a cell in a channel; null for cells without one:
 * not simulated, or in a forecast-only run a cell the Monte Carlo would not
 * simulate (a moon not physically allowed, unless `simulateUnstable`), so
 * forecast-only maps leave and label the same cells as Monte Carlo maps.
 */
export function cellProbability(c: CellResult, channel: MapChannel, forecastOnly: boolean, simulateUnstable = false): number | null {
  const f = channelField(channel, forecastOnly);
  if (f === null) return null;
  if (!forecastOnly && c.simulated !== true) return null;
  if (forecastOnly && c.allowed !== true && !(simulateUnstable && !String(c.placement ?? '').includes('touches the planet'))) return null;
  return num(c, f);
}

export interface GridLayout {
  /** Index into meta.axes of the axis drawn across (x) and up (y); y is null for a 1-axis sweep. */
  xAxis: number;
  yAxis: number | null;
  /** Index into meta.axes of the axis drawn as small multiples (one panel per value), null with fewer than 3 axes. */
  facetAxis: number | null;
  /** The panel (index on the facet axis) this layout reads; 0 without a facet axis. */
  facet: number;
  /** Number of panels (values of the facet axis; 1 without one). */
  nFacets: number;
  nx: number;
  ny: number;
  /** Cell at column i (x), row j (y) of this panel; undefined where the output lacks it (a shard). */
  cellAt(i: number, j: number): CellResult | undefined;
}

/**
 * Which axes the map draws where: y is the moon mass when it is swept (so the
 * minimum detectable mass reads upward), else the first axis; x is the first
 * other axis; with three axes the remaining one (the third, unless the moon
 * mass is third) is drawn as small multiples, one panel per value.
 */
export function axisRoles(meta: Pick<SweepMeta, 'axes'>): { xAxis: number; yAxis: number | null; facetAxis: number | null } {
  const n = meta.axes.length;
  if (n === 1) return { xAxis: 0, yAxis: null, facetAxis: null };
  const massAxis = meta.axes.findIndex((a) => a.field === 'moon.mass');
  const yAxis = massAxis >= 0 ? massAxis : 0;
  const rest = meta.axes.map((_, k) => k).filter((k) => k !== yAxis);
  return { xAxis: rest[0], yAxis, facetAxis: n >= 3 ? rest[1] : null };
}

/** The grid of one panel (`facet`: index on the facet axis; ignored without one). */
export function gridLayout(meta: SweepMeta, cells: readonly CellResult[], facet = 0): GridLayout {
  const byIndex = new Map<number, CellResult>();
  for (const c of cells) byIndex.set(c.index, c);
  const axes = meta.axes;
  const { xAxis, yAxis, facetAxis } = axisRoles(meta);
  if (yAxis === null) {
    return { xAxis: 0, yAxis: null, facetAxis: null, facet: 0, nFacets: 1, nx: axes[0].values.length, ny: 1, cellAt: (i) => byIndex.get(i) };
  }
  // Row-major strides, last axis fastest (src/sweep/grid.ts).
  const stride = axes.map((_, a) => axes.slice(a + 1).reduce((n, b) => n * b.values.length, 1));
  const nFacets = facetAxis === null ? 1 : axes[facetAxis].values.length;
  if (!Number.isInteger(facet) || facet < 0 || facet >= nFacets) throw new RangeError(`facet must be an integer from 0 to ${nFacets - 1}, got ${facet}`);
  const base = facetAxis === null ? 0 : facet * stride[facetAxis];
  const nx = axes[xAxis].values.length;
  const ny = axes[yAxis].values.length;
  const cellAt = (i: number, j: number): CellResult | undefined => byIndex.get(base + i * stride[xAxis] + j * stride[yAxis]);
  return { xAxis, yAxis, facetAxis, facet: facetAxis === null ? 0 : facet, nFacets, nx, ny, cellAt };
}

/** z[row j][col i] of any per-cell quantity (null where undefined). */
export function gridMatrix(layout: GridLayout, value: (c: CellResult) => number | null): Array<Array<number | null>> {
  const z: Array<Array<number | null>> = [];
  for (let j = 0; j < layout.ny; j++) {
    const row: Array<number | null> = [];
    for (let i = 0; i < layout.nx; i++) {
      const c = layout.cellAt(i, j);
      row.push(c ? value(c) : null);
    }
    z.push(row);
  }
  return z;
}

/**
 * Edges between neighbouring cell centres (arithmetic midpoints, or geometric
 * for log axes), extended by half a step at each end: n + 1 values.
 */
export function cellEdges(values: readonly number[], log: boolean): number[] {
  const n = values.length;
  if (n === 0) return [];
  if (n === 1) return log ? [values[0] / 1.1, values[0] * 1.1] : [values[0] - 0.5 * Math.abs(values[0] || 1) * 0.1, values[0] + 0.5 * Math.abs(values[0] || 1) * 0.1];
  const mid = (a: number, b: number) => (log ? Math.sqrt(a * b) : 0.5 * (a + b));
  const out = [log ? (values[0] * values[0]) / mid(values[0], values[1]) : 2 * values[0] - mid(values[0], values[1])];
  for (let k = 0; k + 1 < n; k++) out.push(mid(values[k], values[k + 1]));
  out.push(log ? (values[n - 1] * values[n - 1]) / mid(values[n - 2], values[n - 1]) : 2 * values[n - 1] - mid(values[n - 2], values[n - 1]));
  return out;
}

/**
 * The outline of a set of cells (e.g. the temperate ones) as polyline
 * segments along cell edges, separated by nulls (plotly draws gaps there):
 * every side of a marked cell whose neighbour is unmarked or off the grid.
 */
export function regionOutline(
  layout: GridLayout,
  marked: (c: CellResult) => boolean,
  xEdges: readonly number[],
  yEdges: readonly number[],
): { x: Array<number | null>; y: Array<number | null> } {
  const x: Array<number | null> = [];
  const y: Array<number | null> = [];
  const is = (i: number, j: number): boolean => {
    if (i < 0 || j < 0 || i >= layout.nx || j >= layout.ny) return false;
    const c = layout.cellAt(i, j);
    return c !== undefined && marked(c);
  };
  const seg = (x0: number, y0: number, x1: number, y1: number): void => {
    x.push(x0, x1, null);
    y.push(y0, y1, null);
  };
  for (let j = 0; j < layout.ny; j++) {
    for (let i = 0; i < layout.nx; i++) {
      if (!is(i, j)) continue;
      if (!is(i - 1, j)) seg(xEdges[i], yEdges[j], xEdges[i], yEdges[j + 1]);
      if (!is(i + 1, j)) seg(xEdges[i + 1], yEdges[j], xEdges[i + 1], yEdges[j + 1]);
      if (!is(i, j - 1)) seg(xEdges[i], yEdges[j], xEdges[i + 1], yEdges[j]);
      if (!is(i, j + 1)) seg(xEdges[i], yEdges[j + 1], xEdges[i + 1], yEdges[j + 1]);
    }
  }
  return { x, y };
}

export type { SweepAxisMeta };

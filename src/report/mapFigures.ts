/**
 * The figures drawn over the sweep grid: the detectability map (or, for a
 * one-axis sweep, detection probability against the axis), the minimum
 * detectable moon mass at 50 % and 90 %, and Monte Carlo against the
 * analytic forecast. Plain plotly data/layout objects (see plotlyPage.ts).
 *
 * Colour: 'Cividis', designed to read the same for colour-blind readers and
 * to increase monotonically in lightness, so it survives greyscale printing
 * (Nuñez, Anderton & Renslow 2018, PLoS ONE 13, e0199239).
 */
import type { CellResult } from '../sweep/cellTypes.js';
import type { SweepMeta } from '../sweep/sweepMeta.js';
import type { Figure } from './plotlyPage.js';
import { escapeHtml } from './escape.js';
import { axisDisplay, formatDisplay, formatNumber, type AxisDisplay } from './axisDisplay.js';
import { CHANNEL_LABELS, MAP_CHANNELS, cellEdges, cellProbability, gridLayout, gridMatrix, num, regionOutline, type GridLayout, type MapChannel } from './reportGrid.js';
import type { PhysicalBoundaries } from './physicalBoundaries.js';
import type { SweepSummary } from './summary.js';

export const MAP_COLORSCALE = 'Cividis';
/** Trace indices of the map that the channel selector restyles (heatmap, 50 % and 90 % contours). */
export const MAP_Z_TRACES = [0, 1, 2];

export interface GridFigures {
  figures: Figure[];
  /** Per channel, the map's z (2-axis) or y (1-axis) values; null for a channel this run lacks. */
  channelZ: Record<MapChannel, Array<Array<number | null>> | Array<number | null> | null>;
  twoAxis: boolean;
}

interface Axes2 {
  layout: GridLayout;
  xd: AxisDisplay;
  yd: AxisDisplay;
  x: number[];
  y: number[];
  xEdges: number[];
  yEdges: number[];
}

function axisLayout(d: AxisDisplay, edges: number[]): Record<string, unknown> {
  let lo = Math.min(edges[0], edges[edges.length - 1]);
  // A physical axis whose values are all positive starts at 0, not at a negative half cell.
  if (!d.log && lo < 0 && Math.min(edges[1], edges[edges.length - 2]) > 0) lo = 0;
  const hi = Math.max(edges[0], edges[edges.length - 1]);
  return {
    title: { text: d.title },
    type: d.log ? 'log' : 'linear',
    range: d.log ? [Math.log10(lo), Math.log10(hi)] : [lo, hi],
    zeroline: false,
  };
}

function axes2(meta: SweepMeta, cells: readonly CellResult[]): Axes2 {
  const layout = gridLayout(meta, cells);
  const xa = meta.axes[layout.xAxis];
  const ya = meta.axes[layout.yAxis as number];
  const xd = axisDisplay(xa);
  const yd = axisDisplay(ya);
  const x = xa.values.map((v) => v / xd.divisor);
  const y = ya.values.map((v) => v / yd.divisor);
  return { layout, xd, yd, x, y, xEdges: cellEdges(x, xd.log), yEdges: cellEdges(y, yd.log) };
}

/** Hover text per cell (already escaped, lines joined by <br>): coordinates, placement, habitability, probability. */
function hoverMatrix(meta: SweepMeta, a: Axes2): string[][] {
  const fo = meta.forecast_only;
  const xa = meta.axes[a.layout.xAxis];
  const ya = meta.axes[a.layout.yAxis as number];
  return gridMatrix(a.layout, () => 0).map((row, j) =>
    row.map((_, i) => {
      const c = a.layout.cellAt(i, j);
      if (!c) return 'not in this output';
      const lines = [
        `cell ${c.index}: ${formatDisplay(a.yd, ya.values[j])}, ${formatDisplay(a.xd, xa.values[i])}`,
        `placement: ${String(c.placement ?? '?')}; energy budget: ${String(c.habitability ?? '?')}`,
      ];
      if (fo) lines.push(`forecast joint ${pct(num(c, 'forecast_joint'))}, TTV ${pct(num(c, 'forecast_ttv'))}, TDV ${pct(num(c, 'forecast_tdv'))}`);
      else if (c.simulated === true) lines.push(`combined ${pct(num(c, 'p_combined'))} [${pct(num(c, 'p_combined_lo'))}, ${pct(num(c, 'p_combined_hi'))}]; TTV ${pct(num(c, 'p_ttv'))}, TDV ${pct(num(c, 'p_tdv'))}, dip ${pct(num(c, 'p_dip'))}`);
      else lines.push(`not simulated (${String(c.skipped_reason ?? '')})`);
      return lines.map(escapeHtml).join('<br>');
    }),
  );
}

function pct(p: number | null): string {
  return p === null ? '–' : `${formatNumber(100 * p)} %`;
}

/** Markers on cells whose moon is not physically allowed, one trace per label. */
function placementTraces(a: Axes2): unknown[] {
  const groups = new Map<string, { x: number[]; y: number[] }>();
  for (let j = 0; j < a.layout.ny; j++) {
    for (let i = 0; i < a.layout.nx; i++) {
      const c = a.layout.cellAt(i, j);
      if (!c || c.stable === true || typeof c.placement !== 'string') continue;
      for (const label of c.placement.split('; ')) {
        if (label === 'stable' || label === 'no moon') continue;
        const g = groups.get(label) ?? { x: [], y: [] };
        g.x.push(a.x[i]);
        g.y.push(a.y[j]);
        groups.set(label, g);
      }
    }
  }
  const symbols: Record<string, string> = { 'inside Roche limit': 'x-thin-open', 'beyond stable limit': 'cross-thin-open', 'would not survive tidal migration': 'asterisk-open' };
  return [...groups].map(([label, g]) => ({
    type: 'scatter', mode: 'markers', x: g.x, y: g.y, name: `cell: ${label}`,
    marker: { symbol: symbols[label] ?? 'x-thin-open', size: 9, color: '#222', line: { width: 1.5, color: '#222' } },
    hoverinfo: 'skip',
  }));
}

/** Vertical and horizontal lines of the base scenario's limits (mass × separation maps only). */
function boundaryTraces(meta: SweepMeta, a: Axes2, b: PhysicalBoundaries | null): unknown[] {
  if (!b) return [];
  const xf = meta.axes[a.layout.xAxis].field;
  const yf = meta.axes[a.layout.yAxis as number].field;
  const out: unknown[] = [];
  const yLo = Math.min(a.yEdges[0], a.yEdges[a.yEdges.length - 1]);
  const yHi = Math.max(a.yEdges[0], a.yEdges[a.yEdges.length - 1]);
  const xLo = Math.min(a.xEdges[0], a.xEdges[a.xEdges.length - 1]);
  const xHi = Math.max(a.xEdges[0], a.xEdges[a.xEdges.length - 1]);
  const where = (v: number, lo: number, hi: number) => (v < lo || v > hi ? ' (off the map)' : '');
  if (xf === 'moon.separation') {
    const v = (name: string, m: number, dash: string, color: string) => {
      const x = m / a.xd.divisor;
      out.push({ type: 'scatter', mode: 'lines', x: [x, x], y: [yLo, yHi], name: `${name}: ${formatDisplay(a.xd, m)}${where(x, xLo, xHi)}`, line: { dash, width: 2.5, color }, hoverinfo: 'name' });
    };
    v('Roche limit (fluid)', b.rocheLimitM, 'dash', '#d95f02');
    v('stable limit, prograde', b.stableLimitProgradeM, 'solid', '#d95f02');
    v('stable limit, retrograde', b.stableLimitRetrogradeM, 'dot', '#d95f02');
  }
  if (yf === 'moon.mass') {
    const y = b.tidalSurvivalMassKg / a.yd.divisor;
    out.push({ type: 'scatter', mode: 'lines', x: [xLo, xHi], y: [y, y], name: `tidal-survival mass: ${formatDisplay(a.yd, b.tidalSurvivalMassKg)}${where(y, yLo, yHi)}`, line: { dash: 'dashdot', width: 2.5, color: '#e7298a' }, hoverinfo: 'name' });
  }
  return out;
}

function contourTrace(z: unknown, a: Axes2, level: number, dash: string): unknown {
  return {
    type: 'contour', x: a.x, y: a.y, z, showscale: false, hoverinfo: 'skip', name: `${Math.round(level * 100)} % contour`,
    autocontour: false, contours: { coloring: 'none', start: level, end: level, size: 1, showlabels: true, labelfont: { color: '#fff', size: 12 } },
    line: { color: '#ffffff', width: 2.5, dash }, showlegend: true,
  };
}

function mapTitle(meta: SweepMeta, channel: MapChannel): string {
  return `Detection probability, ${CHANNEL_LABELS[channel]}${meta.forecast_only ? ' (analytic forecast)' : ''}`;
}

/** The map's title per channel (the selector sets it). */
export function mapTitles(meta: SweepMeta): Record<MapChannel, string> {
  return Object.fromEntries(MAP_CHANNELS.map((ch) => [ch, mapTitle(meta, ch)])) as Record<MapChannel, string>;
}

function twoAxisFigures(meta: SweepMeta, cells: readonly CellResult[], b: PhysicalBoundaries | null, summary: SweepSummary): GridFigures {
  const a = axes2(meta, cells);
  const fo = meta.forecast_only;
  const channelZ = Object.fromEntries(
    MAP_CHANNELS.map((ch) => [ch, channelAvailable(meta, ch) ? gridMatrix(a.layout, (c) => cellProbability(c, ch, fo)) : null]),
  ) as GridFigures['channelZ'];
  const z = channelZ.combined as Array<Array<number | null>>;
  const outline = regionOutline(a.layout, (c) => c.habitability === 'temperate', a.xEdges, a.yEdges);
  const data: unknown[] = [
    {
      type: 'heatmap', x: a.x, y: a.y, z, zmin: 0, zmax: 1, colorscale: MAP_COLORSCALE, name: 'detection probability',
      colorbar: { title: { text: 'P(detect)', side: 'right' }, tickformat: '.0%', x: 1.02, len: 0.75, y: 0.5 },
      hovertext: hoverMatrix(meta, a), hoverinfo: 'text', showlegend: false,
    },
    contourTrace(z, a, 0.5, 'dash'),
    contourTrace(z, a, 0.9, 'solid'),
    { type: 'scatter', mode: 'lines', x: outline.x, y: outline.y, name: 'habitable region (temperate energy budget)', line: { color: '#1b9e77', width: 4 }, hoverinfo: 'skip', connectgaps: false },
    ...boundaryTraces(meta, a, b),
    ...placementTraces(a),
  ];
  const figures: Figure[] = [
    {
      id: 'map',
      data,
      layout: {
        title: { text: mapTitle(meta, 'combined') },
        xaxis: axisLayout(a.xd, a.xEdges),
        yaxis: axisLayout(a.yd, a.yEdges),
        legend: { orientation: 'h', y: -0.18, x: 0, font: { size: 11 } },
        margin: { t: 50, r: 30, b: 40 },
        plot_bgcolor: '#f4f4f4',
      },
    },
  ];
  const md = summary.min_detectable;
  if (md) {
    const line = (pts: typeof md.level_50, level: string, dash: string) => ({
      type: 'scatter', mode: 'lines+markers', name: `${level} detection probability`,
      x: pts.map((p) => p.x / a.xd.divisor), y: pts.map((p) => (p.y === null ? null : p.y / a.yd.divisor)),
      line: { dash, width: 2.5, color: level === '90 %' ? '#00204c' : '#7c7b78' },
      marker: { symbol: pts.map((p) => (p.atGridEdge ? 'triangle-down' : 'circle')), size: 8 },
      connectgaps: false,
    });
    const yName = a.yd.title;
    const what = md.direction === 'increasing' ? 'minimum detectable' : 'largest detectable';
    figures.push({
      id: 'mindet',
      data: [line(md.level_50, '50 %', 'dash'), line(md.level_90, '90 %', 'solid')],
      layout: {
        title: { text: `${what[0].toUpperCase()}${what.slice(1)} ${yName.replace(/ \(.*\)$/, '')} at 50 % and 90 %` },
        xaxis: { ...axisLayout(a.xd, a.xEdges) },
        yaxis: { ...axisLayout(a.yd, a.yEdges), title: { text: `${what} ${yName}` } },
        legend: { orientation: 'h', y: -0.2 },
        margin: { t: 50 },
      },
    });
  }
  if (!fo) {
    const diff = gridMatrix(a.layout, (c) => {
      const p = cellProbability(c, 'ttv', false);
      const f = num(c, 'forecast_ttv');
      return p === null || f === null ? null : p - f;
    });
    const ox: number[] = [];
    const oy: number[] = [];
    for (let j = 0; j < a.layout.ny; j++) {
      for (let i = 0; i < a.layout.nx; i++) {
        if (a.layout.cellAt(i, j)?.forecast_ttv_outside_interval === true) {
          ox.push(a.x[i]);
          oy.push(a.y[j]);
        }
      }
    }
    figures.push({
      id: 'mcdiff',
      data: [
        {
          type: 'heatmap', x: a.x, y: a.y, z: diff, zmin: -1, zmax: 1, zmid: 0, colorscale: 'RdBu', name: 'Monte Carlo − forecast',
          colorbar: { title: { text: 'MC − forecast', side: 'right' }, tickformat: '+.0%' }, hovertemplate: 'MC − forecast: %{z:+.0%}<extra></extra>', showlegend: false,
        },
        { type: 'scatter', mode: 'markers', x: ox, y: oy, name: 'forecast outside the Monte Carlo 95 % interval', marker: { symbol: 'circle-open', size: 11, color: '#000', line: { width: 2 } }, hoverinfo: 'skip' },
      ],
      layout: {
        title: { text: 'TTV channel: Monte Carlo detection probability minus the analytic forecast' },
        xaxis: axisLayout(a.xd, a.xEdges),
        yaxis: axisLayout(a.yd, a.yEdges),
        legend: { orientation: 'h', y: -0.18 },
        margin: { t: 50 },
        plot_bgcolor: '#f4f4f4',
      },
    });
  }
  return { figures, channelZ, twoAxis: true };
}

export function channelAvailable(meta: SweepMeta, ch: MapChannel): boolean {
  return !(meta.forecast_only && ch === 'dip');
}

function oneAxisFigures(meta: SweepMeta, cells: readonly CellResult[]): GridFigures {
  const layout = gridLayout(meta, cells);
  const ax = meta.axes[0];
  const d = axisDisplay(ax);
  const x = ax.values.map((v) => v / d.divisor);
  const fo = meta.forecast_only;
  const at = (i: number) => layout.cellAt(i, 0);
  const channelZ = Object.fromEntries(
    MAP_CHANNELS.map((ch) => [ch, channelAvailable(meta, ch) ? x.map((_, i) => { const c = at(i); return c ? cellProbability(c, ch, fo) : null; }) : null]),
  ) as GridFigures['channelZ'];
  const colors: Record<MapChannel, string> = { combined: '#00204c', ttv: '#7c7b78', tdv: '#bcaf6f', dip: '#ffe945' };
  const data: unknown[] = [];
  for (const ch of MAP_CHANNELS) {
    const y = channelZ[ch] as Array<number | null> | null;
    if (!y) continue;
    const lo = x.map((_, i) => (fo ? null : num(at(i), `p_${ch}_lo`)));
    const hi = x.map((_, i) => (fo ? null : num(at(i), `p_${ch}_hi`)));
    data.push({
      type: 'scatter', mode: 'lines+markers', x, y, name: CHANNEL_LABELS[ch],
      line: { width: ch === 'combined' ? 3.5 : 2, color: colors[ch], dash: ch === 'combined' ? 'solid' : ch === 'ttv' ? 'dash' : ch === 'tdv' ? 'dot' : 'dashdot' },
      error_y: fo ? undefined : { type: 'data', symmetric: false, array: y.map((p, i) => (p === null || hi[i] === null ? null : (hi[i] as number) - p)), arrayminus: y.map((p, i) => (p === null || lo[i] === null ? null : p - (lo[i] as number))), thickness: 1, width: 3 },
    });
  }
  const shapes: unknown[] = [0.5, 0.9].map((lv) => ({ type: 'line', xref: 'paper', x0: 0, x1: 1, y0: lv, y1: lv, line: { dash: lv === 0.5 ? 'dash' : 'solid', color: '#888', width: 1 } }));
  const edges = cellEdges(x, d.log);
  x.forEach((_, i) => {
    const c = at(i);
    if (c?.habitability === 'temperate') shapes.push({ type: 'rect', xref: 'x', yref: 'paper', x0: edges[i], x1: edges[i + 1], y0: 0, y1: 1, fillcolor: '#1b9e77', opacity: 0.12, line: { width: 0 }, layer: 'below' });
  });
  const unstable = x.map((xv, i) => ({ xv, c: at(i) })).filter((e) => e.c && e.c.stable !== true);
  if (unstable.length) {
    data.push({ type: 'scatter', mode: 'markers', x: unstable.map((e) => e.xv), y: unstable.map(() => 0), name: 'not physically allowed', text: unstable.map((e) => String(e.c?.placement ?? '')), marker: { symbol: 'x-thin-open', size: 10, color: '#222', line: { width: 1.5 } } });
  }
  const figures: Figure[] = [
    {
      id: 'map',
      data,
      layout: {
        title: { text: `Detection probability against ${d.title}${fo ? ' (analytic forecast)' : ''}; green band: temperate energy budget` },
        xaxis: { title: { text: d.title }, type: d.log ? 'log' : 'linear' },
        yaxis: { title: { text: 'detection probability' }, range: [-0.03, 1.03], tickformat: '.0%' },
        shapes,
        legend: { orientation: 'h', y: -0.2 },
        margin: { t: 50 },
      },
    },
  ];
  if (!fo) {
    const pt = x.map((_, i) => num(at(i), 'p_ttv'));
    const fc = x.map((_, i) => num(at(i), 'forecast_ttv'));
    const out = x.map((xv, i) => ({ xv, c: at(i) })).filter((e) => e.c?.forecast_ttv_outside_interval === true);
    figures.push({
      id: 'mcdiff',
      data: [
        {
          type: 'scatter', mode: 'lines+markers', x, y: pt, name: 'Monte Carlo (TTV), 95 % interval', line: { color: '#00204c', width: 2.5 },
          error_y: { type: 'data', symmetric: false, array: pt.map((p, i) => (p === null ? null : (num(at(i), 'p_ttv_hi') ?? p) - p)), arrayminus: pt.map((p, i) => (p === null ? null : p - (num(at(i), 'p_ttv_lo') ?? p))) },
        },
        { type: 'scatter', mode: 'lines', x, y: fc, name: 'analytic forecast (TTV)', line: { color: '#bcaf6f', width: 2.5, dash: 'dash' } },
        { type: 'scatter', mode: 'markers', x: out.map((e) => e.xv), y: out.map((e) => num(e.c, 'forecast_ttv')), name: 'forecast outside the 95 % interval', marker: { symbol: 'circle-open', size: 13, color: '#000', line: { width: 2 } } },
      ],
      layout: {
        title: { text: 'TTV channel: Monte Carlo against the analytic forecast' },
        xaxis: { title: { text: d.title }, type: d.log ? 'log' : 'linear' },
        yaxis: { title: { text: 'detection probability' }, range: [-0.03, 1.03], tickformat: '.0%' },
        legend: { orientation: 'h', y: -0.2 },
        margin: { t: 50 },
      },
    });
  }
  return { figures, channelZ, twoAxis: false };
}

/** Every grid figure of a sweep. */
export function gridFigures(meta: SweepMeta, cells: readonly CellResult[], boundaries: PhysicalBoundaries | null, summary: SweepSummary): GridFigures {
  return meta.axes.length === 2 ? twoAxisFigures(meta, cells, boundaries, summary) : oneAxisFigures(meta, cells);
}

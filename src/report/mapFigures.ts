/**
 * The figures drawn over the sweep grid: the detectability map (or, for a
 * one-axis sweep, detection probability against the axis; for a three-axis
 * sweep, small multiples: one map per value of the third axis, all on the
 * same colour scale, each labelled with its value and unit), the minimum
 * detectable moon mass at 50 % and 90 %, and Monte Carlo against the
 * analytic forecast. Every map and the minimum-detectable plot also carry the
 * known-template bound (`pdet_bound`, timing/knownTemplateBound.ts): the
 * line no analysis of the same data can beat, in cyan. Plain plotly
 * data/layout objects (see plotlyPage.ts).
 *
 * Colour: 'Cividis', designed to read the same for colour-blind readers and
 * to increase monotonically in lightness, so it survives greyscale printing
 * (Nuñez, Anderton & Renslow 2018, PLoS ONE 13, e0199239).
 */
import type { CellResult } from '../sweep/cellTypes.js';
import type { SweepMeta } from '../sweep/sweepMeta.js';
import type { Figure } from './plotlyPage.js';
import { escapeHtml } from './escape.js';
import { axisDisplay, formatDisplay, formatNumber, logTickLayout, type AxisDisplay } from './axisDisplay.js';
import { MAP_CHANNELS, cellEdges, cellProbability, channelLabel, gridLayout, gridMatrix, num, regionOutline, type GridLayout, type MapChannel } from './reportGrid.js';
import type { SweepSummary } from './summary.js';

/** The physical boundaries drawn over a moon mass × separation map (computed by app/physicalBoundaries.ts). */
export interface PhysicalBoundaries {
  rocheLimitM: number;
  stableLimitProgradeM: number;
  stableLimitRetrogradeM: number;
  tidalSurvivalMassKg: number;
  hillRadiusM: number;
  planetRadiusM: number;
  retrograde: boolean;
}

export const MAP_COLORSCALE = 'Cividis';
/** Trace indices of the map that the channel selector restyles (heatmap, 50 % and 90 % contours). */
export const MAP_Z_TRACES = [0, 1, 2];

export interface GridFigures {
  figures: Figure[];
  /**
   * Per channel, the map's z (2 axes: one matrix; 3 axes: one matrix per
   * panel) or y (1 axis) values; null for a channel this run lacks.
   */
  channelZ: Record<MapChannel, Array<Array<number | null>> | Array<number | null> | Array<Array<Array<number | null>>> | null>;
  twoAxis: boolean;
  /** Three axes: the map's trace indices the channel selector restyles, and the panel of each. */
  mapTraces: number[];
  mapTraceFacet: number[];
  faceted: boolean;
  /** Height of the map figure, px (taller with more rows of panels). */
  mapHeightPx: number;
}

/** One panel of a (possibly faceted) map: its grid, its plotly axes and its label. */
interface Panel {
  layout: GridLayout;
  /** Trace axis references ('x', 'y' for the first panel, then 'x2', 'y2', ...). */
  xref: string;
  yref: string;
  /** Layout keys of its axes ('xaxis', 'xaxis2', ...). */
  xKey: string;
  yKey: string;
  /** "telescope aperture = 1 m" on a faceted map, else null. */
  label: string | null;
  first: boolean;
  row: number;
  col: number;
}

interface Axes2 {
  xd: AxisDisplay;
  yd: AxisDisplay;
  /** Display of the facet axis, null with two axes. */
  fd: AxisDisplay | null;
  x: number[];
  y: number[];
  xEdges: number[];
  yEdges: number[];
  panels: Panel[];
  rows: number;
  cols: number;
}

/** Columns of small multiples for n panels (2 to 4 across). */
export function facetColumns(n: number): number {
  return n <= 1 ? 1 : n <= 4 ? 2 : n <= 9 ? 3 : 4;
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
    // Log axes: full labels at 1-2-5 steps, never plotly's bare minor digits.
    ...(d.log ? logTickLayout(lo, hi) : {}),
  };
}

function axes2(meta: SweepMeta, cells: readonly CellResult[]): Axes2 {
  const first = gridLayout(meta, cells);
  const xa = meta.axes[first.xAxis];
  const ya = meta.axes[first.yAxis as number];
  const fa = first.facetAxis === null ? null : meta.axes[first.facetAxis];
  const xd = axisDisplay(xa);
  const yd = axisDisplay(ya);
  const fd = fa ? axisDisplay(fa) : null;
  const x = xa.values.map((v) => v / xd.divisor);
  const y = ya.values.map((v) => v / yd.divisor);
  const n = first.nFacets;
  const cols = facetColumns(n);
  const rows = Math.ceil(n / cols);
  const panels: Panel[] = [];
  for (let k = 0; k < n; k++) {
    const suffix = k === 0 ? '' : String(k + 1);
    panels.push({
      layout: k === 0 ? first : gridLayout(meta, cells, k),
      xref: `x${suffix}`, yref: `y${suffix}`, xKey: `xaxis${suffix}`, yKey: `yaxis${suffix}`,
      label: fa && fd ? `${fd.title.replace(/ \(.*\)$/, '')} = ${formatDisplay(fd, fa.values[k])}` : null,
      first: k === 0, row: Math.floor(k / cols), col: k % cols,
    });
  }
  return { xd, yd, fd, x, y, xEdges: cellEdges(x, xd.log), yEdges: cellEdges(y, yd.log), panels, rows, cols };
}

/** Put a trace on a panel: its axes, and on panels after the first no second legend entry. */
function onPanel(trace: Record<string, unknown>, p: Panel, faceted: boolean): Record<string, unknown> {
  if (!faceted) return trace;
  const name = typeof trace.name === 'string' ? trace.name : undefined;
  return { ...trace, xaxis: p.xref, yaxis: p.yref, legendgroup: name, ...(p.first ? {} : { showlegend: false }) };
}

/** Layout entries of a map's axes: one pair, or one pair per panel with its label above it. */
function panelAxesLayout(a: Axes2): Record<string, unknown> {
  if (a.panels.length === 1) return { xaxis: axisLayout(a.xd, a.xEdges), yaxis: axisLayout(a.yd, a.yEdges) };
  const out: Record<string, unknown> = {};
  const gapX = 0.07;
  const gapY = 0.1;
  const annotations: unknown[] = [];
  const n = a.panels.length;
  for (const p of a.panels) {
    const x0 = p.col / a.cols + (p.col > 0 ? gapX / 2 : 0);
    const x1 = (p.col + 1) / a.cols - (p.col < a.cols - 1 ? gapX / 2 : 0);
    const y1 = 1 - p.row / a.rows - gapY * 0.55;
    const y0 = 1 - (p.row + 1) / a.rows + (p.row < a.rows - 1 ? gapY * 0.45 : 0);
    const below = p.row < a.rows - 1 && (p.row + 1) * a.cols + p.col < n;
    const xl = axisLayout(a.xd, a.xEdges);
    const yl = axisLayout(a.yd, a.yEdges);
    out[p.xKey] = { ...xl, title: { text: below ? '' : a.xd.title, font: { size: 12 } }, domain: [x0, x1], anchor: p.yref };
    out[p.yKey] = { ...yl, title: { text: p.col === 0 ? a.yd.title : '', font: { size: 12 } }, domain: [y0, y1], anchor: p.xref };
    annotations.push({ text: p.label, xref: 'paper', yref: 'paper', x: (x0 + x1) / 2, y: y1, xanchor: 'center', yanchor: 'bottom', showarrow: false, font: { size: 13 } });
  }
  out.annotations = annotations;
  return out;
}

/** Hover text per cell of a panel (already escaped, lines joined by <br>): coordinates, placement, habitability, probability. */
function hoverMatrix(meta: SweepMeta, a: Axes2, p: Panel): string[][] {
  const fo = meta.forecast_only;
  const xa = meta.axes[p.layout.xAxis];
  const ya = meta.axes[p.layout.yAxis as number];
  return gridMatrix(p.layout, () => 0).map((row, j) =>
    row.map((_, i) => {
      const c = p.layout.cellAt(i, j);
      if (!c) return 'not in this output';
      const lines = [
        `cell ${c.index}: ${formatDisplay(a.yd, ya.values[j])}, ${formatDisplay(a.xd, xa.values[i])}${p.label ? `, ${p.label}` : ''}`,
        `placement: ${String(c.placement ?? '?')}; energy budget: ${String(c.habitability ?? '?')}`,
      ];
      if (fo && cellProbability(c, 'combined', true, meta.simulate_unstable) === null) lines.push(`not forecast (${String(c.placement ?? '')}): the Monte Carlo would not simulate it`);
      else if (fo) lines.push(`forecast combined ${pct(num(c, 'pdet_forecast_combined'))}, TTV ${pct(num(c, 'pdet_forecast_ttv'))}, TDV ${pct(num(c, 'pdet_forecast_tdv'))}; joint χ² ${pct(num(c, 'pdet_forecast_joint'))}`);
      else if (c.simulated === true) lines.push(`combined ${pct(num(c, 'pdet_combined'))} [${pct(num(c, 'pdet_combined_lo'))}, ${pct(num(c, 'pdet_combined_hi'))}]; TTV ${pct(num(c, 'pdet_ttv'))}, TDV ${pct(num(c, 'pdet_tdv'))}, dip ${pct(num(c, 'pdet_dip'))}, template ${pct(num(c, 'pdet_template'))}`);
      else lines.push(`not simulated (${String(c.skipped_reason ?? '')})`);
      if (num(c, 'pdet_bound') !== null) lines.push(`bound (best possible analysis) ${pct(num(c, 'pdet_bound'))}`);
      return lines.map(escapeHtml).join('<br>');
    }),
  );
}

function pct(p: number | null): string {
  return p === null ? '–' : `${formatNumber(100 * p)} %`;
}

/** Markers on cells whose moon is not physically allowed, one trace per label. */
function placementTraces(a: Axes2, p: Panel): Array<Record<string, unknown>> {
  const groups = new Map<string, { x: number[]; y: number[] }>();
  for (let j = 0; j < p.layout.ny; j++) {
    for (let i = 0; i < p.layout.nx; i++) {
      const c = p.layout.cellAt(i, j);
      if (!c || c.allowed === true || typeof c.placement !== 'string') continue;
      for (const label of c.placement.split('; ')) {
        if (label === 'stable' || label === 'no moon') continue;
        const g = groups.get(label) ?? { x: [], y: [] };
        g.x.push(a.x[i]);
        g.y.push(a.y[j]);
        groups.set(label, g);
      }
    }
  }
  const symbols: Record<string, string> = { 'touches the planet': 'circle-x-open', 'inside Roche limit': 'x-thin-open', 'beyond stable limit': 'cross-thin-open', 'would not survive tidal migration': 'asterisk-open' };
  return [...groups].map(([label, g]) => ({
    type: 'scatter', mode: 'markers', x: g.x, y: g.y, name: `cell: ${label}`,
    marker: { symbol: symbols[label] ?? 'x-thin-open', size: 9, color: '#222', line: { width: 1.5, color: '#222' } },
    hoverinfo: 'skip',
  }));
}

/** Vertical and horizontal lines of the base scenario's limits (mass × separation maps only). */
function boundaryTraces(meta: SweepMeta, a: Axes2, b: PhysicalBoundaries | null, p: Panel): Array<Record<string, unknown>> {
  if (!b) return [];
  const xf = meta.axes[p.layout.xAxis].field;
  const yf = meta.axes[p.layout.yAxis as number].field;
  const out: Array<Record<string, unknown>> = [];
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

function contourTrace(z: unknown, a: Axes2, level: number, dash: string): Record<string, unknown> {
  return {
    type: 'contour', x: a.x, y: a.y, z, showscale: false, hoverinfo: 'skip', name: `${Math.round(level * 100)} % contour`,
    autocontour: false, contours: { coloring: 'none', start: level, end: level, size: 1, showlabels: true, labelfont: { color: '#fff', size: 12 } },
    line: { color: '#ffffff', width: 2.5, dash }, showlegend: true,
  };
}

/** Colour of the bound's lines: cyan, apart from the Cividis scale, the white contours and the orange limits. */
export const BOUND_COLOUR = '#17becf';

/** The bound's contour at a level, over the cells the map shows (like for like). */
function boundContour(z: unknown, a: Axes2, level: number, dash: string): Record<string, unknown> {
  return {
    ...contourTrace(z, a, level, dash),
    name: `bound ${Math.round(level * 100)} % (no analysis can do better)`,
    contours: { coloring: 'none', start: level, end: level, size: 1, showlabels: true, labelfont: { color: BOUND_COLOUR, size: 12 } },
    line: { color: BOUND_COLOUR, width: 2.5, dash },
  };
}

function mapTitle(meta: SweepMeta, channel: MapChannel): string {
  const below = channel === 'combined' && !meta.forecast_only ? '; can be below a single channel, tested at α' : '';
  const forecast = meta.forecast_only && channel !== 'combined' ? ' (analytic forecast)' : '';
  return `Detection probability, ${channelLabel(channel, meta.forecast_only)}${below}${forecast}`;
}

/** The map's title per channel (the selector sets it). */
export function mapTitles(meta: SweepMeta): Record<MapChannel, string> {
  return Object.fromEntries(MAP_CHANNELS.map((ch) => [ch, mapTitle(meta, ch)])) as Record<MapChannel, string>;
}

/** Bottom margin of a faceted map, px, and the legend's place: 70 px below the plot area, clear of the x-axis title. */
const FACET_MARGIN_B = 90;
const FACET_LEGEND_Y = (heightPx: number): number => -70 / (heightPx - 80 - FACET_MARGIN_B);

/** Height of a map of `rows` rows of panels, px. */
function mapHeight(rows: number): number {
  return rows <= 1 ? 640 : 120 + 330 * rows;
}

/** Line colours of the panels on the minimum-detectable plot: dark blue to olive along the facet axis (Cividis end points). */
function facetColour(k: number, n: number): string {
  const from = [0x00, 0x20, 0x4c];
  const to = [0xa6, 0x9d, 0x5a];
  const t = n <= 1 ? 0 : k / (n - 1);
  return `#${from.map((c, i) => Math.round(c + t * (to[i] - c)).toString(16).padStart(2, '0')).join('')}`;
}

function twoAxisFigures(meta: SweepMeta, cells: readonly CellResult[], b: PhysicalBoundaries | null, summary: SweepSummary): GridFigures {
  const a = axes2(meta, cells);
  const fo = meta.forecast_only;
  const faceted = a.panels.length > 1;
  const perPanel = (ch: MapChannel) => a.panels.map((p) => gridMatrix(p.layout, (c) => cellProbability(c, ch, fo, meta.simulate_unstable)));
  const zByChannel = Object.fromEntries(MAP_CHANNELS.map((ch) => [ch, channelAvailable(meta, ch) ? perPanel(ch) : null])) as Record<MapChannel, Array<Array<Array<number | null>>> | null>;
  const channelZ = Object.fromEntries(
    MAP_CHANNELS.map((ch) => [ch, zByChannel[ch] === null ? null : faceted ? zByChannel[ch] : (zByChannel[ch] as Array<Array<Array<number | null>>>)[0]]),
  ) as GridFigures['channelZ'];
  const combined = zByChannel.combined as Array<Array<Array<number | null>>>;
  const bound = a.panels.map((p) => gridMatrix(p.layout, (c) => (cellProbability(c, 'combined', fo, meta.simulate_unstable) === null ? null : num(c, 'pdet_bound'))));
  const data: unknown[] = [];
  const mapTraces: number[] = [];
  const mapTraceFacet: number[] = [];
  a.panels.forEach((p, k) => {
    const z = combined[k];
    const outline = regionOutline(p.layout, (c) => c.habitability === 'temperate', a.xEdges, a.yEdges);
    mapTraces.push(data.length, data.length + 1, data.length + 2);
    mapTraceFacet.push(k, k, k);
    const traces: Array<Record<string, unknown>> = [
      {
        // Every panel on the same colour scale (zmin 0, zmax 1); the first shows it.
        type: 'heatmap', x: a.x, y: a.y, z, zmin: 0, zmax: 1, colorscale: MAP_COLORSCALE, name: 'detection probability',
        showscale: p.first,
        colorbar: { title: { text: 'P(detect)', side: 'right' }, tickformat: '.0%', x: 1.02, len: 0.75, y: 0.5 },
        hovertext: hoverMatrix(meta, a, p), hoverinfo: 'text', showlegend: false,
      },
      contourTrace(z, a, 0.5, 'dash'),
      contourTrace(z, a, 0.9, 'solid'),
      boundContour(bound[k], a, 0.5, 'dash'),
      boundContour(bound[k], a, 0.9, 'solid'),
      { type: 'scatter', mode: 'lines', x: outline.x, y: outline.y, name: 'habitable region (temperate energy budget)', line: { color: '#1b9e77', width: 4 }, hoverinfo: 'skip', connectgaps: false },
      ...boundaryTraces(meta, a, b, p),
      ...placementTraces(a, p),
    ];
    for (const t of traces) data.push(onPanel(t, p, faceted));
  });
  const mapHeightPx = mapHeight(a.rows);
  const figures: Figure[] = [
    {
      id: 'map',
      data,
      layout: {
        title: { text: mapTitle(meta, 'combined') },
        ...panelAxesLayout(a),
        legend: { orientation: 'h', ...(faceted ? { y: FACET_LEGEND_Y(mapHeightPx), yanchor: 'top' } : { y: -0.18 }), x: 0, font: { size: 11 } },
        margin: { t: faceted ? 80 : 50, r: 30, b: faceted ? FACET_MARGIN_B : 40 },
        plot_bgcolor: '#f4f4f4',
        ...(faceted ? { height: mapHeightPx } : {}),
      },
    },
  ];
  const md = summary.min_detectable;
  if (md) {
    const fa = a.fd && md.facet_field ? meta.axes.find((ax) => ax.field === md.facet_field) : undefined;
    const groups = fa ? fa.values.map((v, k) => ({ k, v, label: a.panels[k]?.label ?? '' })) : [{ k: 0, v: undefined as number | undefined, label: '' }];
    const line = (pts: typeof md.level_50, level: string, dash: string, g: (typeof groups)[number]) => {
      const mine = g.v === undefined ? pts : pts.filter((p) => p.facet === g.v);
      return {
        type: 'scatter', mode: 'lines+markers', name: `${level} detection probability${g.label ? `, ${g.label}` : ''}`,
        x: mine.map((p) => p.x / a.xd.divisor), y: mine.map((p) => (p.y === null ? null : p.y / a.yd.divisor)),
        line: { dash, width: 2.5, color: g.v === undefined ? (level === '90 %' ? '#00204c' : '#7c7b78') : facetColour(g.k, groups.length) },
        // A point that is only an upper bound (at the grid's edge, or reached after unsimulated cells) points down.
        marker: { symbol: mine.map((p) => (p.at_grid_edge || p.is_bound ? 'triangle-down' : 'circle')), size: 8 },
        connectgaps: false,
      };
    };
    const boundLine = (pts: typeof md.level_50, level: string, dash: string, g: (typeof groups)[number]) => ({
      ...line(pts, level, dash, g),
      name: `bound ${level} (no analysis can do better)${g.label ? `, ${g.label}` : ''}`,
      line: { dash, width: 2, color: g.v === undefined ? BOUND_COLOUR : facetColour(g.k, groups.length) },
      opacity: 0.85,
    });
    const yName = a.yd.title;
    const what = md.direction === 'increasing' ? 'minimum detectable' : 'largest detectable';
    figures.push({
      id: 'mindet',
      data: groups.flatMap((g) => [
        line(md.level_50, '50 %', 'dash', g), line(md.level_90, '90 %', 'solid', g),
        boundLine(md.bound_50, '50 %', 'dash', g), boundLine(md.bound_90, '90 %', 'solid', g),
      ]),
      layout: {
        title: { text: `${what[0].toUpperCase()}${what.slice(1)} ${yName.replace(/ \(.*\)$/, '')} at 50 % and 90 %, and the bound (cyan: known template, white noise)` },
        xaxis: { ...axisLayout(a.xd, a.xEdges) },
        yaxis: { ...axisLayout(a.yd, a.yEdges), title: { text: `${what} ${yName}` } },
        legend: { orientation: 'h', y: -0.2 },
        margin: { t: 50 },
      },
    });
  }
  if (!fo) {
    const diffData: unknown[] = [];
    a.panels.forEach((p) => {
      const diff = gridMatrix(p.layout, (c) => {
        const pr = cellProbability(c, 'ttv', false);
        const f = num(c, 'pdet_forecast_ttv');
        return pr === null || f === null ? null : pr - f;
      });
      const ox: number[] = [];
      const oy: number[] = [];
      for (let j = 0; j < p.layout.ny; j++) {
        for (let i = 0; i < p.layout.nx; i++) {
          if (p.layout.cellAt(i, j)?.forecast_ttv_outside_interval === true) {
            ox.push(a.x[i]);
            oy.push(a.y[j]);
          }
        }
      }
      diffData.push(
        onPanel({
          type: 'heatmap', x: a.x, y: a.y, z: diff, zmin: -1, zmax: 1, zmid: 0, colorscale: 'RdBu', name: 'Monte Carlo − forecast', showscale: p.first,
          colorbar: { title: { text: 'MC − forecast', side: 'right' }, tickformat: '+.0%' }, hovertemplate: 'MC − forecast: %{z:+.0%}<extra></extra>', showlegend: false,
        }, p, faceted),
        onPanel({ type: 'scatter', mode: 'markers', x: ox, y: oy, name: 'forecast outside the Monte Carlo 95 % interval', marker: { symbol: 'circle-open', size: 11, color: '#000', line: { width: 2 } }, hoverinfo: 'skip' }, p, faceted),
      );
    });
    figures.push({
      id: 'mcdiff',
      data: diffData,
      layout: {
        title: { text: 'TTV channel: Monte Carlo detection probability minus the analytic forecast' },
        ...panelAxesLayout(a),
        legend: { orientation: 'h', ...(faceted ? { y: FACET_LEGEND_Y(mapHeightPx), yanchor: 'top' } : { y: -0.18 }) },
        margin: { t: faceted ? 80 : 50, b: faceted ? FACET_MARGIN_B : undefined },
        plot_bgcolor: '#f4f4f4',
        ...(faceted ? { height: mapHeightPx } : {}),
      },
    });
  }
  return { figures, channelZ, twoAxis: true, mapTraces: faceted ? mapTraces : MAP_Z_TRACES, mapTraceFacet: faceted ? mapTraceFacet : [0, 0, 0], faceted, mapHeightPx };
}

export function channelAvailable(meta: SweepMeta, ch: MapChannel): boolean {
  return !(meta.forecast_only && (ch === 'dip' || ch === 'template'));
}

function oneAxisFigures(meta: SweepMeta, cells: readonly CellResult[]): GridFigures {
  const layout = gridLayout(meta, cells);
  const ax = meta.axes[0];
  const d = axisDisplay(ax);
  const x = ax.values.map((v) => v / d.divisor);
  const fo = meta.forecast_only;
  const at = (i: number) => layout.cellAt(i, 0);
  const channelZ = Object.fromEntries(
    MAP_CHANNELS.map((ch) => [ch, channelAvailable(meta, ch) ? x.map((_, i) => { const c = at(i); return c ? cellProbability(c, ch, fo, meta.simulate_unstable) : null; }) : null]),
  ) as GridFigures['channelZ'];
  const colors: Record<MapChannel, string> = { combined: '#00204c', template: '#3b496c', ttv: '#7c7b78', tdv: '#bcaf6f', dip: '#ffe945' };
  const data: unknown[] = [];
  for (const ch of MAP_CHANNELS) {
    const y = channelZ[ch] as Array<number | null> | null;
    if (!y) continue;
    const lo = x.map((_, i) => (fo ? null : num(at(i), `pdet_${ch}_lo`)));
    const hi = x.map((_, i) => (fo ? null : num(at(i), `pdet_${ch}_hi`)));
    data.push({
      type: 'scatter', mode: 'lines+markers', x, y, name: channelLabel(ch, fo),
      line: { width: ch === 'combined' ? 3.5 : 2, color: colors[ch], dash: ch === 'combined' ? 'solid' : ch === 'template' ? 'longdash' : ch === 'ttv' ? 'dash' : ch === 'tdv' ? 'dot' : 'dashdot' },
      error_y: fo ? undefined : { type: 'data', symmetric: false, array: y.map((p, i) => (p === null || hi[i] === null ? null : (hi[i] as number) - p)), arrayminus: y.map((p, i) => (p === null || lo[i] === null ? null : p - (lo[i] as number))), thickness: 1, width: 3 },
    });
  }
  const boundY = x.map((_, i) => { const c = at(i); return c && cellProbability(c, 'combined', fo, meta.simulate_unstable) !== null ? num(c, 'pdet_bound') : null; });
  if (boundY.some((v) => v !== null)) {
    data.push({ type: 'scatter', mode: 'lines+markers', x, y: boundY, name: 'bound: known template, white noise (no analysis can do better)', line: { width: 2, color: BOUND_COLOUR, dash: 'longdash' } });
  }
  const shapes: unknown[] = [0.5, 0.9].map((lv) => ({ type: 'line', xref: 'paper', x0: 0, x1: 1, y0: lv, y1: lv, line: { dash: lv === 0.5 ? 'dash' : 'solid', color: '#888', width: 1 } }));
  const edges = cellEdges(x, d.log);
  const oneAxisX = { title: { text: d.title }, type: d.log ? 'log' : 'linear', ...(d.log ? logTickLayout(Math.min(...x), Math.max(...x)) : {}) };
  x.forEach((_, i) => {
    const c = at(i);
    if (c?.habitability === 'temperate') shapes.push({ type: 'rect', xref: 'x', yref: 'paper', x0: edges[i], x1: edges[i + 1], y0: 0, y1: 1, fillcolor: '#1b9e77', opacity: 0.12, line: { width: 0 }, layer: 'below' });
  });
  const unstable = x.map((xv, i) => ({ xv, c: at(i) })).filter((e) => e.c && e.c.allowed !== true);
  if (unstable.length) {
    data.push({ type: 'scatter', mode: 'markers', x: unstable.map((e) => e.xv), y: unstable.map(() => 0), name: 'not physically allowed', text: unstable.map((e) => String(e.c?.placement ?? '')), marker: { symbol: 'x-thin-open', size: 10, color: '#222', line: { width: 1.5 } } });
  }
  const figures: Figure[] = [
    {
      id: 'map',
      data,
      layout: {
        title: { text: `Detection probability against ${d.title}${fo ? ' (analytic forecast)' : ''}; green band: temperate energy budget` },
        xaxis: oneAxisX,
        yaxis: { title: { text: 'detection probability' }, range: [-0.03, 1.03], tickformat: '.0%' },
        shapes,
        legend: { orientation: 'h', y: -0.2 },
        margin: { t: 50 },
      },
    },
  ];
  if (!fo) {
    const pt = x.map((_, i) => num(at(i), 'pdet_ttv'));
    const fc = x.map((_, i) => num(at(i), 'pdet_forecast_ttv'));
    const out = x.map((xv, i) => ({ xv, c: at(i) })).filter((e) => e.c?.forecast_ttv_outside_interval === true);
    figures.push({
      id: 'mcdiff',
      data: [
        {
          type: 'scatter', mode: 'lines+markers', x, y: pt, name: 'Monte Carlo (TTV), 95 % interval', line: { color: '#00204c', width: 2.5 },
          error_y: { type: 'data', symmetric: false, array: pt.map((p, i) => (p === null ? null : (num(at(i), 'pdet_ttv_hi') ?? p) - p)), arrayminus: pt.map((p, i) => (p === null ? null : p - (num(at(i), 'pdet_ttv_lo') ?? p))) },
        },
        { type: 'scatter', mode: 'lines', x, y: fc, name: 'analytic forecast (TTV)', line: { color: '#bcaf6f', width: 2.5, dash: 'dash' } },
        { type: 'scatter', mode: 'markers', x: out.map((e) => e.xv), y: out.map((e) => num(e.c, 'pdet_forecast_ttv')), name: 'forecast outside the 95 % interval', marker: { symbol: 'circle-open', size: 13, color: '#000', line: { width: 2 } } },
      ],
      layout: {
        title: { text: 'TTV channel: Monte Carlo against the analytic forecast' },
        xaxis: oneAxisX,
        yaxis: { title: { text: 'detection probability' }, range: [-0.03, 1.03], tickformat: '.0%' },
        legend: { orientation: 'h', y: -0.2 },
        margin: { t: 50 },
      },
    });
  }
  return { figures, channelZ, twoAxis: false, mapTraces: [], mapTraceFacet: [], faceted: false, mapHeightPx: 640 };
}

/** Every grid figure of a sweep. */
export function gridFigures(meta: SweepMeta, cells: readonly CellResult[], boundaries: PhysicalBoundaries | null, summary: SweepSummary): GridFigures {
  return meta.axes.length >= 2 ? twoAxisFigures(meta, cells, boundaries, summary) : oneAxisFigures(meta, cells);
}

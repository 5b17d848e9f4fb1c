/** Plotly figures of the example cells (see exampleCells.ts). */
import type { Figure } from './plotlyPage.js';
import { formatNumber } from './axisDisplay.js';

/** One example cell of the report: realization 0 of a chosen cell (computed by app/exampleCells.ts). */
export interface ExampleCell {
  index: number;
  coords: number[];
  /** Why it was chosen ("most detectable", …). */
  label: string;
  /** The cell's combined detection probability (Monte Carlo, or forecast in a forecast-only run). */
  probability: number;
  moonMassKg: number | null;
  moonSeparationM: number | null;
  planetPeriodS: number;
  /** Observed points, hours from each transit's predicted conjunction, and flux − 1 in ppm (binned by `binFactor`). */
  lightCurve: { timeH: number[]; fluxPpm: number[]; binFactor: number; modelTimeH: Array<number | null>; modelPpm: Array<number | null>; noisePpm: number };
  ttv: { epoch: number[]; valueS: number[]; errS: number[] };
  tdv: { epoch: number[]; valueS: number[]; errS: number[] };
  /** Null when fewer than four transits were fitted. */
  periodogram: { frequency: number[]; power: number[]; peakFrequency: number; falseAlarmProbability: number } | null;
  /** The moon's TTV frequency folded into [0, ½] cycles per epoch, and other moon periods with the same alias, s. */
  aliasFrequencyPerEpoch: number | null;
  aliasFamilyPeriodsS: number[];
}

const MIN_S = 60;

export function exampleFigures(ex: ExampleCell, k: number): Figure[] {
  const lc = ex.lightCurve;
  const figs: Figure[] = [
    {
      id: `ex${k}-lc`,
      data: [
        { type: 'scatter', mode: 'markers', x: lc.timeH, y: lc.fluxPpm, name: lc.binFactor > 1 ? `observed (averaged in groups of ${lc.binFactor})` : 'observed', marker: { size: 3, color: '#7c7b78', opacity: 0.55 } },
        { type: 'scatter', mode: 'lines', x: lc.modelTimeH, y: lc.modelPpm, name: 'model (planet + moon), each transit', line: { color: '#00204c', width: 1.5 }, connectgaps: false },
      ],
      layout: {
        title: { text: `Light curve, all transits overlaid (noise ${formatNumber(lc.noisePpm)} ppm per exposure)` },
        xaxis: { title: { text: 'time from predicted conjunction (h)' } },
        yaxis: { title: { text: 'relative flux − 1 (ppm)' } },
        legend: { orientation: 'h', y: -0.22 },
        margin: { t: 45 },
      },
    },
    {
      id: `ex${k}-timing`,
      data: [
        { type: 'scatter', mode: 'markers', x: ex.ttv.epoch, y: ex.ttv.valueS.map((v) => v / MIN_S), error_y: { type: 'data', array: ex.ttv.errS.map((v) => v / MIN_S), thickness: 1.2 }, name: 'TTV', marker: { color: '#00204c', size: 8 } },
        { type: 'scatter', mode: 'markers', x: ex.tdv.epoch, y: ex.tdv.valueS.map((v) => v / MIN_S), error_y: { type: 'data', array: ex.tdv.errS.map((v) => v / MIN_S), thickness: 1.2 }, name: 'TDV', xaxis: 'x', yaxis: 'y2', marker: { color: '#bcaf6f', size: 8, symbol: 'diamond' } },
      ],
      layout: {
        title: { text: 'Recovered TTV and TDV with 1σ errors' },
        grid: { rows: 2, columns: 1, pattern: 'coupled' },
        // One tick per epoch only while they fit (a tick per epoch of 500 transits is a black bar).
        xaxis: { title: { text: 'transit epoch' }, ...(Math.max(0, ...ex.ttv.epoch, ...ex.tdv.epoch) - Math.min(0, ...ex.ttv.epoch, ...ex.tdv.epoch) <= 20 ? { dtick: 1 } : {}) },
        yaxis: { title: { text: 'TTV (min)' }, domain: [0.55, 1] },
        yaxis2: { title: { text: 'TDV (min)' }, domain: [0, 0.45] },
        legend: { orientation: 'h', y: -0.22 },
        margin: { t: 45 },
      },
    },
  ];
  if (ex.periodogram) {
    const pg = ex.periodogram;
    const shapes: unknown[] = [];
    const annotations: unknown[] = [];
    if (ex.aliasFrequencyPerEpoch !== null) {
      shapes.push({ type: 'line', x0: ex.aliasFrequencyPerEpoch, x1: ex.aliasFrequencyPerEpoch, yref: 'paper', y0: 0, y1: 1, line: { color: '#1b9e77', width: 2.5, dash: 'dash' } });
      annotations.push({ x: ex.aliasFrequencyPerEpoch, yref: 'paper', y: 1.04, text: 'moon (folded)', xanchor: ex.aliasFrequencyPerEpoch > 0.3 ? 'right' : 'left', showarrow: false, font: { color: '#1b9e77' } });
    }
    shapes.push({ type: 'line', x0: pg.peakFrequency, x1: pg.peakFrequency, yref: 'paper', y0: 0, y1: 0.92, line: { color: '#d95f02', width: 1.5, dash: 'dot' } });
    annotations.push({ x: pg.peakFrequency, yref: 'paper', y: 0.94, text: ` peak, FAP ${formatNumber(pg.falseAlarmProbability)} `, xanchor: pg.peakFrequency > 0.3 ? 'right' : 'left', showarrow: false, font: { color: '#d95f02' } });
    figs.push({
      id: `ex${k}-ls`,
      data: [{ type: 'scatter', mode: 'lines', x: pg.frequency, y: pg.power, name: 'TTV periodogram', line: { color: '#00204c', width: 1.5 } }],
      layout: {
        title: { text: 'TTV periodogram (generalised Lomb–Scargle) up to the sampling Nyquist frequency' },
        xaxis: { title: { text: 'frequency (cycles per transit epoch)' }, range: [0, 0.5] },
        yaxis: { title: { text: 'normalised power' }, range: [0, 1.05] },
        shapes,
        annotations,
        showlegend: false,
        margin: { t: 55 },
      },
    });
  }
  return figs;
}

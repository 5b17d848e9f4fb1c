/**
 * summary.json and the page's plain-language summary. Expected values are
 * recomputed in the test directly from cells.json by the definitions stated
 * in src/report/summary.ts ("computed from cells.json in the test"), and the
 * page's quoted numbers are read back from its data-summary-key spans.
 */
import { describe, it, expect, beforeAll } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { Command } from 'commander';
import { runTinySweep, type TinySweep } from './tinySweep.js';
import { buildSummary, efficiencyOf } from '../../src/report/summary.js';
import { formatSummaryValue } from '../../src/report/summaryText.js';
import { minDetectable } from '../../src/report/minDetectable.js';
import { cellEdges, cellProbability, gridLayout, regionOutline } from '../../src/report/reportGrid.js';
import { registerReport } from '../../src/cli/reportCommand.js';
import { M_EARTH_KG } from '../../src/physics/constants.js';
import { stringify } from 'yaml';
import { writeFileSync } from 'node:fs';
import type { CellResult } from '../../src/sweep/cellTypes.js';
import type { SweepMeta } from '../../src/sweep/sweepMeta.js';

function at(obj: unknown, path: string): unknown {
  return path.split('.').reduce<unknown>((o, k) => (o === null || o === undefined ? undefined : (o as Record<string, unknown>)[k]), obj);
}

function decode(s: string): string {
  return s.replace(/&quot;/g, '"').replace(/&#39;/g, "'").replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&amp;/g, '&');
}

let sweep: TinySweep;
let html: string;
let summaryJson: Record<string, unknown>;

beforeAll(async () => {
  sweep = await runTinySweep();
  // The scenario beside the results, as `moonsieve report DIR` finds it.
  writeFileSync(join(sweep.dir, 'scenario.yaml'), stringify(sweep.doc));
  const out: string[] = [];
  const program = new Command().exitOverride();
  registerReport(program, { out: (t) => out.push(t), err: (t) => out.push(t) });
  await program.parseAsync(['node', 'moonsieve', 'report', sweep.dir]);
  expect(out.join('')).toContain('summary.json');
  html = readFileSync(join(sweep.dir, 'report.html'), 'utf8');
  summaryJson = JSON.parse(readFileSync(join(sweep.dir, 'summary.json'), 'utf8')) as Record<string, unknown>;
}, 60_000);

describe('summary.json against cells.json', () => {
  it('counts habitable-zone moons and their detections as defined', () => {
    const cells = sweep.cells;
    const hab = cells.filter((c) => c.allowed === true && c.habitability === 'temperate');
    const p = (c: CellResult) => c.pdet_combined as number;
    expect(summaryJson.cells).toBe(cells.length);
    expect(summaryJson.cells_habitable).toBe(hab.length);
    expect(summaryJson.cells_allowed).toBe(cells.filter((c) => c.allowed === true).length);
    expect(summaryJson.habitable_detected_90).toBe(hab.filter((c) => c.simulated === true && p(c) >= 0.9).length);
    expect(summaryJson.habitable_detected_50).toBe(hab.filter((c) => c.simulated === true && p(c) >= 0.5).length);
    const det = hab.filter((c) => c.simulated === true && p(c) >= 0.9).sort((a, b) => (a.moon_mass_kg as number) - (b.moon_mass_kg as number) || a.index - b.index);
    const smallest = summaryJson.smallest_habitable_detected_90 as Record<string, unknown> | null;
    if (det.length === 0) expect(smallest).toBeNull();
    else {
      expect(smallest?.index).toBe(det[0].index);
      expect(smallest?.moon_mass_kg).toBe(det[0].moon_mass_kg);
    }
    expect(summaryJson).toEqual(JSON.parse(JSON.stringify(buildSummary(sweep.meta, sweep.cells))));
  });

  it('the fixture exercises the interesting cases (habitable cells, unsimulated unstable cells)', () => {
    // Guards the test above against passing vacuously on an all-empty grid.
    expect(summaryJson.cells_habitable as number).toBeGreaterThan(0);
    expect(summaryJson.cells_simulated as number).toBeLessThan(sweep.cells.length);
  });

  it('every number the page quotes equals summary.json', () => {
    const spans = [...html.matchAll(/<span class="num" data-summary-key="([^"]+)" data-value="([^"]+)" data-divisor="([^"]+)" data-format="([^"]+)">([^<]*)<\/span>/g)];
    expect(spans.length).toBeGreaterThan(5);
    const keys = new Set<string>();
    for (const [, key, value, divisor, format, text] of spans) {
      keys.add(key);
      const v = at(summaryJson, key);
      expect(typeof v, key).toBe('number');
      expect(JSON.parse(decode(value)), key).toBe(v);
      expect(decode(text).startsWith(formatSummaryValue((v as number) / Number(divisor), format as 'count' | 'percent' | 'sig3')), key).toBe(true);
    }
    for (const k of ['cells', 'cells_habitable', 'habitable_detected_90', 'habitable_detected_50']) expect(keys.has(k), k).toBe(true);
    if (summaryJson.smallest_habitable_detected_90) expect(keys.has('smallest_habitable_detected_90.moon_mass_kg')).toBe(true);
  });
});

describe('minimum detectable value', () => {
  // A hand-made 1-column grid: y = 1, 2, 4 (log axis) with p = 0.2, 0.6, 1.0.
  const meta = { axes: [{ field: 'moon.mass', values: [1, 2, 4], spacing: 'log' }, { field: 'moon.separation', values: [10], spacing: 'linear' }] } as unknown as SweepMeta;
  const cells = [0.2, 0.6, 1.0].map((p, j) => ({ index: j, coords: [[1, 2, 4][j], 10], p })) as unknown as CellResult[];
  const layout = gridLayout(meta, cells);
  const prob = (c: CellResult) => (c as unknown as { p: number }).p;
  it('interpolates in log y between the grid values that bracket the level', () => {
    // 50 %: between y = 1 (0.2) and 2 (0.6): f = 0.75, y = 2^0.75; 90 %: between 2 (0.6) and 4 (1.0): f = 0.75, y = 2·2^0.75
    // (computed by hand from the stated rule, no source).
    const [p50] = minDetectable(layout, [10], [1, 2, 4], true, prob, 0.5);
    const [p90] = minDetectable(layout, [10], [1, 2, 4], true, prob, 0.9);
    expect(p50.y).toBeCloseTo(2 ** 0.75, 12);
    expect(p90.y).toBeCloseTo(2 * 2 ** 0.75, 12);
    expect(p50.at_grid_edge).toBe(false);
  });
  it('flags a level already reached at the lowest value, and null when never reached', () => {
    expect(minDetectable(layout, [10], [1, 2, 4], true, prob, 0.1)[0]).toEqual({ x: 10, y: 1, at_grid_edge: true, is_bound: false });
    expect(minDetectable(layout, [10], [1, 2, 4], true, () => 0.3, 0.9)[0].y).toBeNull();
  });
  it('a level reached right after unsimulated cells is a bound, not a value (issue 17: the upturn at the stable edge)', () => {
    // y = 1, 2 not simulated (null), y = 4 at 0.95: the 50 % crossing lies somewhere below 4 (by hand).
    const gapFirst = (c: CellResult) => [null, null, 0.95][c.index];
    expect(minDetectable(layout, [10], [1, 2, 4], true, gapFirst, 0.5)[0]).toEqual({ x: 10, y: 4, at_grid_edge: false, is_bound: true });
    // A gap followed by a simulated cell below the level: the crossing between 2 and 4 is interpolated, a value.
    const gapThenLow = (c: CellResult) => [null, 0.1, 0.9][c.index];
    const v = minDetectable(layout, [10], [1, 2, 4], true, gapThenLow, 0.5)[0];
    expect(v.is_bound).toBe(false);
    expect(v.y).toBeCloseTo(2 * Math.SQRT2, 12); // halfway in log between 2 and 4 (by hand)
  });
  it('forecast-only: a cell the Monte Carlo would not simulate has no probability on the map, as on Monte Carlo maps (issue 17)', () => {
    const unstable = { index: 0, coords: [], allowed: false, placement: 'beyond stable limit', simulated: false, pdet_forecast_combined: 0.8 } as unknown as CellResult;
    const stable = { ...unstable, allowed: true, placement: 'stable' } as CellResult;
    expect(cellProbability(unstable, 'combined', true)).toBeNull();
    expect(cellProbability(stable, 'combined', true)).toBe(0.8);
    // With simulate_unstable the Monte Carlo simulates it, so the forecast shows it; a moon touching its planet never.
    expect(cellProbability(unstable, 'combined', true, true)).toBe(0.8);
    expect(cellProbability({ ...unstable, placement: 'touches the planet' } as CellResult, 'combined', true, true)).toBeNull();
  });
  it('efficiency: the detector\'s 50 % point over the bound\'s, and what kind of number it is', () => {
    const pt = (y: number | null, o: Partial<{ at_grid_edge: boolean; is_bound: boolean }> = {}) => ({ x: 1, y, at_grid_edge: false, is_bound: false, ...o });
    // By hand: 6/1 = 6; after unsimulated cells the detector's y is at most 6, so the ratio is at most 6.
    expect(efficiencyOf([pt(6)], [pt(1)], 'increasing', [10])[0]).toEqual({ x: 1, ratio: 6, ratio_kind: 'value' });
    expect(efficiencyOf([pt(6, { is_bound: true })], [pt(1)], 'increasing', [10])[0]).toEqual({ x: 1, ratio: 6, ratio_kind: 'at most' });
    expect(efficiencyOf([pt(6)], [pt(1, { at_grid_edge: true })], 'increasing', [10])[0]).toEqual({ x: 1, ratio: 6, ratio_kind: 'at least' });
    // The detector never reaches 50 %: at least the largest simulated value (10) over the bound's (2).
    expect(efficiencyOf([pt(null)], [pt(2)], 'increasing', [10])[0]).toEqual({ x: 1, ratio: 5, ratio_kind: 'at least' });
    // A noise axis (decreasing): the bound tolerates 4, the detector 2: ratio 2.
    expect(efficiencyOf([pt(2)], [pt(4)], 'decreasing', [1])[0].ratio).toBe(2);
  });
  it('mirrors the question for an axis along which detection gets harder (largest y still reaching the level)', () => {
    // p falls with y: 1.0, 0.6, 0.2 at y = 1, 2, 4; 90 % between 1 (1.0) and 2 (0.6): f = 0.25, y = 2^0.25 (by hand).
    const falling = (c: CellResult) => [1.0, 0.6, 0.2][c.index];
    expect(minDetectable(layout, [10], [1, 2, 4], true, falling, 0.9, 'decreasing')[0].y).toBeCloseTo(2 ** 0.25, 12);
  });
  it('cell edges are geometric midpoints on a log axis and the outline of one cell is its four sides', () => {
    // Computed by hand: midpoints √2 and √8 between 1, 2, 4; ends mirrored (1/√2, 8/√8 = √8·2/2).
    const e = cellEdges([1, 2, 4], true);
    expect(e[1]).toBeCloseTo(Math.SQRT2, 14);
    expect(e[2]).toBeCloseTo(Math.sqrt(8), 14);
    expect(e[0]).toBeCloseTo(1 / Math.SQRT2, 14);
    const o = regionOutline(layout, (c) => c.index === 1, [0, 1], e);
    expect(o.x.filter((v) => v === null).length).toBe(4);
  });
});

describe('the assumptions block states the rate in force', () => {
  it('quotes the range of the cells\' rates in force of the combined rule, their widest interval and how the thresholds were set (computed from cells.json in the test)', () => {
    const sim = sweep.cells.filter((c) => typeof c.false_alarm_in_force === 'number');
    expect(sim.length).toBeGreaterThan(0);
    const text = decode(html).replace(/<[^>]*>/g, ' ').replace(/\s+/g, ' ');
    const fmt = (x: number): string => formatSummaryValue(x, 'sig3');
    const lo = Math.min(...sim.map((c) => c.false_alarm_in_force as number));
    const hi = Math.max(...sim.map((c) => c.false_alarm_in_force as number));
    expect(text).toContain(`rate in force of the combined rule: ${fmt(lo)}–${fmt(hi)} over the cells`);
    // 20 no-moon realizations are too few for a tail fit (at least 40): the order statistic, with its Beta interval.
    expect(new Set(sim.map((c) => c.calibration_method))).toEqual(new Set(['order_statistic']));
    expect(text).toMatch(/thresholds at order statistics of the no-moon statistics, the rate in force their Beta distribution/);
  });
});

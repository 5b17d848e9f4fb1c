/**
 * A three-axis sweep end to end: the grid, cells.json and cells.ecsv carry
 * the third axis; results are byte-identical with 1 and 2 worker threads;
 * --forecast-only runs it; the report draws small multiples, one map per
 * value of the third axis, on one colour scale and labelled with the value
 * and unit; summary.json gives the minimum detectable mass per panel.
 * Expected values are the report's and engine's own contracts (common
 * practice, no source).
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runSweep, type SweepOptions, type SweepOutcome } from '../../src/app/sweep/runSweep.js';
import { parseCellsJson } from '../../src/app/sweep/outputs.js';
import { planetMassCaution } from '../../src/report/sweepReport.js';
import { renderSweepReport } from '../../src/app/sweepReport.js';
import { gridFigures } from '../../src/report/mapFigures.js';
import { buildSummary } from '../../src/report/summary.js';
import { gridLayout } from '../../src/report/reportGrid.js';
import { tinyScenarioDoc } from './tinySweep.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';

/** runSweep of a scenario document, parsed first as a library caller does (a parse error rejects, as runSweep's own do). */
const sweepDoc = async (doc: unknown, options: SweepOptions = {}): Promise<SweepOutcome> => runSweep(parseScenario(doc), options);

const ENV = {};
let tmp: string;
beforeAll(() => {
  tmp = mkdtempSync(join(tmpdir(), 'moonsieve-3axes-'));
});
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

function threeAxisDoc(): Record<string, unknown> {
  const doc = tinyScenarioDoc('Three-axis world');
  doc.sweep = {
    realizations: 3,
    no_moon_realizations: 20,
    axes: [
      { field: 'moon.mass', from: '0.3 Mearth', to: '3 Mearth', count: 2, spacing: 'log' },
      { field: 'moon.separation', from: '0.05 hill', to: '0.4 hill', count: 2 },
      { field: 'instrument.noise', from: '200 ppm per 10 min', to: '800 ppm per 10 min', count: 2, spacing: 'log' },
    ],
  };
  return doc;
}

describe('a three-axis sweep', () => {
  it('carries the third axis in cells and ECSV, identical with 1 and 2 workers, and is drawn as small multiples', async () => {
    const doc = threeAxisDoc();
    const a = await sweepDoc(doc, { out: join(tmp, 'w1'), quiet: true, shard: null, workers: 1, env: ENV });
    const b = await sweepDoc(doc, { out: join(tmp, 'w2'), quiet: true, shard: null, workers: 2, env: ENV });
    const ja = readFileSync(join(a.outDir, 'cells.json'), 'utf8');
    expect(readFileSync(join(b.outDir, 'cells.json'), 'utf8')).toBe(ja);
    const { meta, cells } = parseCellsJson(ja);
    expect(meta.axes.map((x) => x.field)).toEqual(['moon.mass', 'moon.separation', 'instrument.noise']);
    expect(meta.axes[2].timescale_s).toBe(600);
    expect(cells).toHaveLength(8);
    // Row-major, last axis fastest: cell 5 = (mass 1, separation 0, noise 1).
    const c5 = cells.find((c) => c.index === 5)!;
    expect(c5.coords).toEqual([meta.axes[0].values[1], meta.axes[1].values[0], meta.axes[2].values[1]]);
    const ecsv = readFileSync(join(a.outDir, 'cells.ecsv'), 'utf8');
    expect(ecsv).toMatch(/name: "instrument_noise"/);
    expect(ecsv).toMatch(/sweep axis 3: instrument\.noise/);

    const summary = buildSummary(meta, cells);
    expect(summary.min_detectable?.facet_field).toBe('instrument.noise');
    expect(summary.min_detectable?.level_90.map((p) => p.facet)).toEqual([...meta.axes[2].values.flatMap((v) => [v, v])]);

    // Panel k reads the cells whose noise index is k.
    const panel1 = gridLayout(meta, cells, 1);
    expect(panel1.nFacets).toBe(2);
    expect(panel1.cellAt(0, 1)?.index).toBe(5); // x = separation 0, y = mass 1, noise 1

    const g = gridFigures(meta, cells, null, summary);
    expect(g.faceted).toBe(true);
    const map = g.figures.find((f) => f.id === 'map')!;
    const heatmaps = map.data.filter((t) => (t as { type: string }).type === 'heatmap') as Array<Record<string, unknown>>;
    expect(heatmaps).toHaveLength(2);
    for (const h of heatmaps) expect([h.zmin, h.zmax, h.colorscale]).toEqual([0, 1, 'Cividis']);
    expect(heatmaps.map((h) => h.showscale)).toEqual([true, false]);
    expect(heatmaps.map((h) => [h.xaxis, h.yaxis])).toEqual([['x', 'y'], ['x2', 'y2']]);
    const labels = (map.layout.annotations as Array<{ text: string }>).map((x) => x.text);
    expect(labels).toEqual(['white noise = 200 ppm per 10 min', 'white noise = 800 ppm per 10 min']);
    expect(map.layout.xaxis2).toBeDefined();
    // The channel selector's z per panel.
    expect((g.channelZ.tdv as unknown[]).length).toBe(2);
    expect(g.mapTraceFacet).toEqual([0, 0, 0, 1, 1, 1]);

    const html = renderSweepReport({ meta, cells, runInfo: a.runInfo, scenario: doc });
    expect(html).toMatch(/One map per value of white noise \(ppm per 10 min\), all on the same colour scale/);
    expect(html).toMatch(/minimum of the four channels&#39;? ?p-values|minimum of the four channels/);
    expect(html).toMatch(/"faceted":true/);
  }, 120_000);

  it('runs with --forecast-only', async () => {
    const doc = threeAxisDoc();
    const r = await sweepDoc(doc, { out: join(tmp, 'fo'), quiet: true, shard: null, workers: 1, env: ENV, forecastOnly: true });
    expect(r.complete).toBe(true);
    const { meta, cells } = parseCellsJson(readFileSync(join(r.outDir, 'cells.json'), 'utf8'));
    expect(meta.forecast_only).toBe(true);
    expect(cells).toHaveLength(8);
    expect(cells.every((c) => typeof c.pdet_forecast_joint === 'number' || c.allowed !== true)).toBe(true);
    const html = renderSweepReport({ meta, cells, runInfo: r.runInfo, scenario: doc });
    expect(html).toMatch(/forecast of its timing channels; template and moon dip not forecast/); // the forecast of the Monte Carlo's combined rule (issue 17)
    expect(html).not.toMatch(/id="mcdiff"/);
  }, 60_000);
});

describe('planet-mass caution', () => {
  const meta = (fields: string[]) => ({ axes: fields.map((field) => ({ field })) }) as unknown as Parameters<typeof planetMassCaution>[0];
  it('is given when the planet mass is swept with a fixed radius, and not otherwise', () => {
    const doc = tinyScenarioDoc();
    const text = planetMassCaution(meta(['planet.mass', 'moon.mass']), doc);
    expect(text).toMatch(/keeps the planet's radius fixed at 0\.9 R_J/);
    expect(text).toMatch(/Give a mass–radius relation to let the radius follow\./);
    expect(planetMassCaution(meta(['planet.mass', 'planet.radius']), doc)).toBeNull();
    expect(planetMassCaution(meta(['moon.mass']), doc)).toBeNull();
    // A radius that is not a plain length (a relation sets it) gets no caution.
    expect(planetMassCaution(meta(['planet.mass']), { ...doc, planet: { ...(doc.planet as object), radius: 'from mass' } })).toBeNull();
  });
});

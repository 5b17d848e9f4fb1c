/**
 * The sweep engine against a small deterministic fake runner (defined below,
 * written to a temporary .mjs so worker threads can load it; seeded from
 * createRng(seed, cell, r)). Expected values are the engine's own contracts:
 * identical cells.json bytes across execution paths ("common practice, no source").
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { runSweep } from '../../src/app/sweep/runSweep.js';
import { mergeShards } from '../../src/app/sweep/merge.js';
import { InputError } from '../../src/scenario/errors.js';
import { CHECKPOINT_FILE } from '../../src/app/sweep/checkpoint.js';
import type { CellRunner } from '../../src/sweep/cellTypes.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';

const RNG_URL = pathToFileURL(resolve('dist/src/noise/rng.js')).href;

/** The fake runner, as a module source (worker threads load it by URL). */
const FAKE_RUNNER_SOURCE = `
import { createRng } from ${JSON.stringify(RNG_URL)};
export function fakeRunCell(task, ctx) {
  let hits = 0;
  let sum = 0;
  for (let r = 0; r < ctx.realizations; r++) {
    const rng = createRng(ctx.seed, task.index, r);
    const x = rng.normal();
    sum += x;
    if (x > 0.5) hits++;
  }
  return {
    index: -1, coords: [],
    mean_s: sum / ctx.realizations,
    hits,
    detected: hits > 0,
    label: task.index % 3 === 0 ? 'stable' : 'beyond stable limit',
    probability: { ttv: hits / ctx.realizations, tdv: null },
    moon_mass_kg_task: task.scenario.moon.massKg,
    moon_separation_m_task: task.scenario.moon.separationM,
    forecast_only: ctx.forecastOnly,
    not_a_number: NaN,
  };
}
`;

const BASE_DOC = {
  name: 'Test world <b>&',
  seed: 12345,
  star: { mass: '1 Msun', radius: '1 Rsun', teff: '5772 K', limb_darkening: { u1: 0.4, u2: 0.25 } },
  planet: { mass: '1 Mjup', radius: '1 Rjup', period: '200 d' },
  moon: { mass: '0.5 Mearth', density: '3 g/cm^3', separation: '0.1 hill' },
  instrument: { cadence: '2 min', noise: '300 ppm per 2 min' },
  observation: { transits: 6 },
  sweep: {
    realizations: 5,
    axes: [
      { field: 'moon.mass', from: '0.1 Mearth', to: '1 Mearth', count: 4, spacing: 'log' },
      { field: 'moon.separation', from: '0.05 hill', to: '0.3 hill', count: 3 },
    ],
  },
};

const BASE = parseScenario(BASE_DOC);

let tmp: string;
let runnerPath: string;
let fake: CellRunner;
const ENV = {}; // no Slurm variables
const quiet = { quiet: true, env: ENV } as const;

beforeAll(async () => {
  tmp = mkdtempSync(join(tmpdir(), 'moonsieve-sweep-'));
  runnerPath = join(tmp, 'fakeRunner.mjs');
  writeFileSync(runnerPath, FAKE_RUNNER_SOURCE);
  fake = ((await import(pathToFileURL(runnerPath).href)) as { fakeRunCell: CellRunner }).fakeRunCell;
});
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

const moduleRunner = () => ({ module: runnerPath, exportName: 'fakeRunCell' });
const cellsJson = (dir: string): string => readFileSync(join(dir, 'cells.json'), 'utf8');

describe('runSweep determinism', () => {
  it('main thread, 1 worker and 2 workers give byte-identical cells.json', async () => {
    const a = await runSweep(BASE, { ...quiet, out: join(tmp, 'main'), runner: fake });
    const b = await runSweep(BASE, { ...quiet, out: join(tmp, 'w1'), runner: moduleRunner(), workers: 1 });
    const c = await runSweep(BASE, { ...quiet, out: join(tmp, 'w2'), runner: moduleRunner(), workers: 2 });
    expect(a.complete && b.complete && c.complete).toBe(true);
    expect(b.runInfo.workers).toBe(1);
    expect(c.runInfo.workers).toBe(2);
    const ref = cellsJson(join(tmp, 'main'));
    expect(cellsJson(join(tmp, 'w1'))).toBe(ref);
    expect(cellsJson(join(tmp, 'w2'))).toBe(ref);
    // 4 × 3 cells, sorted, with engine-set index/coords, NaN as null, the axis values applied to the document.
    const parsed = JSON.parse(ref) as { cells: Array<Record<string, unknown>> };
    expect(parsed.cells.map((x) => x.index)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11]);
    const c7 = parsed.cells[7];
    expect(c7.not_a_number).toBeNull();
    // The task's typed scenario carries the cell's axis values (SI, exactly: written as "<value> kg" and read back).
    expect(c7.moon_mass_kg_task).toBe((c7.coords as number[])[0]);
    expect(c7.moon_separation_m_task).toBe((c7.coords as number[])[1]);
    expect(c7.coords).toEqual([a.meta.axes[0].values[2], a.meta.axes[1].values[1]]); // row-major: 7 = 2·3 + 1
    for (const f of ['cells.json', 'cells.ecsv', 'report.html', 'run.json']) expect(existsSync(join(tmp, 'w2', f))).toBe(true);
    expect(existsSync(join(tmp, 'w2', CHECKPOINT_FILE))).toBe(false);
  });

  it('two shards merged equal the unsharded run; each shard holds only its cells', async () => {
    const full = await runSweep(BASE, { ...quiet, out: join(tmp, 'full'), runner: fake });
    const s1 = await runSweep(BASE, { ...quiet, out: join(tmp, 's1'), runner: moduleRunner(), workers: 2, shard: '1/2' });
    const s2 = await runSweep(BASE, { ...quiet, out: join(tmp, 's2'), runner: fake, shard: { k: 2, n: 2 } });
    expect(s1.results.map((r) => r.index)).toEqual([0, 2, 4, 6, 8, 10]);
    expect(s2.results.map((r) => r.index)).toEqual([1, 3, 5, 7, 9, 11]);
    expect(JSON.parse(readFileSync(join(tmp, 's2', 'run.json'), 'utf8')).shard).toEqual({ k: 2, n: 2 });
    const m = mergeShards([join(tmp, 's2'), join(tmp, 's1')], join(tmp, 'merged'));
    expect(m.results.length).toBe(12);
    expect(cellsJson(join(tmp, 'merged'))).toBe(cellsJson(join(tmp, 'full')));
    expect(full.complete).toBe(true);
  });

  it('the shard comes from the Slurm job-array variables when none is given', async () => {
    const env = { SLURM_ARRAY_TASK_ID: '5', SLURM_ARRAY_TASK_MIN: '3', SLURM_ARRAY_TASK_COUNT: '4' };
    const r = await runSweep(BASE, { quiet: true, env, out: join(tmp, 'slurm'), runner: fake });
    expect(r.runInfo.shard).toEqual({ k: 3, n: 4 }); // 5 − 3 + 1
    expect(r.results.map((x) => x.index)).toEqual([2, 6, 10]);
  });

  it('interrupted (maxCells) and resumed equals a straight run, with no lost or doubled cells', async () => {
    const dir = join(tmp, 'resume');
    const part = await runSweep(BASE, { ...quiet, out: dir, runner: moduleRunner(), workers: 2, maxCells: 5 });
    expect(part.complete).toBe(false);
    expect(part.files).toEqual([]);
    expect(existsSync(join(dir, 'cells.json'))).toBe(false);
    const lines = readFileSync(join(dir, CHECKPOINT_FILE), 'utf8').trim().split('\n');
    expect(lines.length).toBe(1 + 5); // header + 5 cells
    // Without --resume the checkpoint is not silently overwritten.
    await expect(runSweep(BASE, { ...quiet, out: dir, runner: fake })).rejects.toThrow(/--resume/);
    const rest = await runSweep(BASE, { ...quiet, out: dir, runner: fake, resume: true });
    expect(rest.complete).toBe(true);
    expect(rest.runInfo.cells_resumed).toBe(5);
    expect(rest.runInfo.cells_computed).toBe(7);
    expect(existsSync(join(dir, CHECKPOINT_FILE))).toBe(false);
    expect(cellsJson(dir)).toBe(cellsJson(join(tmp, 'main')));
  });

  it('a truncated last line and a doubled line in the checkpoint are ignored on resume', async () => {
    const dir = join(tmp, 'trunc');
    await runSweep(BASE, { ...quiet, out: dir, runner: fake, maxCells: 7 });
    const path = join(dir, CHECKPOINT_FILE);
    const lines = readFileSync(path, 'utf8').split('\n').filter((l) => l !== '');
    // Double cell line 2, and cut the last line in the middle (as a kill during a write would).
    const last = lines[lines.length - 1];
    const text = [...lines.slice(0, -1), lines[2], last.slice(0, Math.floor(last.length / 2))].join('\n');
    writeFileSync(path, text);
    const rest = await runSweep(BASE, { ...quiet, out: dir, runner: moduleRunner(), workers: 2, resume: true });
    expect(rest.runInfo.cells_resumed).toBe(6);
    expect(cellsJson(dir)).toBe(cellsJson(join(tmp, 'main')));
  });

  it('an abort signal stops the run and keeps the checkpoint', async () => {
    const dir = join(tmp, 'abort');
    const controller = new AbortController();
    let calls = 0;
    const stopping: CellRunner = (task, ctx) => {
      if (++calls === 3) controller.abort();
      return fake(task, ctx);
    };
    const r = await runSweep(BASE, { ...quiet, out: dir, runner: stopping, signal: controller.signal });
    expect(r.complete).toBe(false);
    expect(r.cellsDone).toBe(3);
    expect(r.cellsInRun).toBe(12);
    expect(existsSync(join(dir, CHECKPOINT_FILE))).toBe(true);
  });

  it('a resume of a different scenario is refused, naming what differs', async () => {
    const dir = join(tmp, 'other');
    await runSweep(BASE, { ...quiet, out: dir, runner: fake, maxCells: 2 });
    const changed = parseScenario({ ...BASE_DOC, seed: 999 });
    const err = await runSweep(changed, { ...quiet, out: dir, runner: fake, resume: true }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(InputError);
    expect(String((err as Error).message)).toMatch(/different sweep.*seed \(12345 vs 999\)/s);
    const otherShard = await runSweep(BASE, { ...quiet, out: dir, runner: fake, resume: true, shard: '1/2' }).catch((e: unknown) => e);
    expect(String((otherShard as Error).message)).toMatch(/shard \(all cells vs shard 1\/2\)/);
  });

  it('passes forecastOnly to the runner and records it', async () => {
    const r = await runSweep(BASE, { ...quiet, out: join(tmp, 'fc'), runner: fake, forecastOnly: true });
    expect(r.results.every((c) => (c as unknown as { forecast_only: unknown }).forecast_only === true)).toBe(true);
    expect(r.meta.forecast_only).toBe(true);
  });

  it('writes an ECSV with axis units, flattened result fields and a scenario header, and an escaped page', () => {
    const dir = join(tmp, 'main');
    const ecsv = readFileSync(join(dir, 'cells.ecsv'), 'utf8');
    expect(ecsv).toContain('# - {name: "moon_mass_kg", unit: "kg", datatype: float64');
    expect(ecsv).toContain('# - {name: "moon_separation_m", unit: "m", datatype: float64');
    expect(ecsv).toContain('# - {name: "mean_s", unit: "s", datatype: float64}');
    expect(ecsv).toContain('# - {name: "probability_ttv", datatype: float64}');
    expect(ecsv).toContain('# - {name: "detected", datatype: bool}');
    expect(ecsv).toContain('# - {name: "label", datatype: string}');
    expect(ecsv).toContain('# - {"scenario": "Test world <b>&"}');
    expect(ecsv).toMatch(/# - \{"scenario_hash": "[0-9a-f]{64}"\}/);
    const rows = ecsv.split('\n').filter((l) => l !== '' && !l.startsWith('#'));
    expect(rows.length).toBe(1 + 12);
    const html = readFileSync(join(dir, 'report.html'), 'utf8');
    expect(html).toContain('Test world &lt;b&gt;&amp;');
    expect(html).not.toContain('<b>&');
    const run = JSON.parse(readFileSync(join(dir, 'run.json'), 'utf8'));
    expect(run).toMatchObject({ seed: 12345, cells_total: 12, cells: 12, shard: null, realizations: 5 });
    expect(typeof run.wall_time_s).toBe('number');
    expect(cellsJson(dir)).not.toMatch(/wall_time|workers/);
  });
});

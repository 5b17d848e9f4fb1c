/**
 * The sweep's no-moon calibration pre-pass: the plan (chunks tile each class,
 * phases bound memory), null sets joined from chunks equal one computed in a
 * single loop bit for bit, and the REAL runner on worker threads (pre-pass)
 * gives the same cells.json bytes as the main thread (runner computes its own
 * sets) for 1 and 2 workers. Expected values are the engine's own contracts
 * (identical bytes across execution paths) or computed in the test
 * ("common practice, no source").
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runSweep, type SweepOptions, type SweepOutcome, loadSweep } from '../../src/app/sweep/runSweep.js';
import { mergeShards } from '../../src/app/sweep/merge.js';
import { runCell, nullClassOf, nullChunkOf, cellNeedsCalibration, defaultNullRealizations } from '../../src/sweep/runCell.js';
import { planCalibration, nullChunkSize } from '../../src/sweep/calibrationPlan.js';
import { computeNullRange, joinNullRanges, unpackNullSet, type NullSet } from '../../src/sweep/nullSet.js';
import { prepareJob, cellTask, type CellJob } from '../../src/sweep/cellJob.js';
import { executeCells } from '../../src/app/sweep/workerPool.js';
import { metaDifferences } from '../../src/sweep/sweepMeta.js';
import { parseSweepSpec } from '../../src/sweep/sweepSpec.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';
import { InputError } from '../../src/scenario/errors.js';
import type { CellResult, CellRunner } from '../../src/sweep/cellTypes.js';

/** runSweep of a scenario document, parsed first as a library caller does (a parse error rejects, as runSweep's own do). */
const sweepDoc = async (doc: unknown, options: SweepOptions = {}): Promise<SweepOutcome> => runSweep(parseScenario(doc), options);

/**
 * A small scenario (4 transits, 10-min cadence) on a 2 × 2 grid: moon density
 * {2, 4 g/cm³} × separation {0.1, 0.9 Hill}. 0.9 Hill lies beyond the
 * prograde stable limit (≈ 0.49 Hill, Domingos et al. 2006, MNRAS 373, 1227),
 * so those cells are not simulated; the two simulated cells share one null
 * class (they differ only in the moon's size; its mass would move the
 * planet's barycentric orbit and so the moon-less scenario). TWO_CLASSES varies
 * the transit count instead: two classes.
 */
const TINY = {
  name: 'Calibration world (invented)',
  seed: 97531,
  star: { mass: '1 Msun', radius: '1 Rsun', teff: '5772 K', limb_darkening: { u1: 0.4, u2: 0.25 } },
  planet: { mass: '1 Mjup', radius: '1 Rjup', period: '60 d' },
  moon: { mass: '1 Mearth', density: '3 g/cm^3', separation: '0.1 hill' },
  instrument: { cadence: '10 min', noise: '400 ppm per 10 min' },
  observation: { transits: 4, baseline: '2 h' },
  detection: { false_alarm: 0.05 },
  sweep: {
    realizations: 3,
    no_moon_realizations: 20,
    axes: [
      { field: 'moon.density', from: '2 g/cm^3', to: '4 g/cm^3', count: 2 },
      { field: 'moon.separation', from: '0.1 hill', to: '0.9 hill', count: 2 },
    ],
  },
};
const TWO_CLASSES = {
  ...TINY,
  sweep: { ...TINY.sweep, axes: [{ field: 'observation.transits', from: 4, to: 5, count: 2 }, TINY.sweep.axes[1]] },
};

let tmp: string;
const cellsJson = (dir: string): string => readFileSync(join(tmp, dir, 'cells.json'), 'utf8');
const sink = (): { text: string; write(t: string): void } => ({ text: '', write(t: string) { this.text += t; } });

function jobOf(sweepDoc: unknown): CellJob {
  const { doc, scenario, spec } = loadSweep(parseScenario(sweepDoc));
  return {
    baseDocument: doc,
    axes: spec.axes.map((a) => ({ field: a.field, write: a.write, values: a.values })),
    ctx: { seed: scenario.seed, realizations: spec.realizations, simulateUnstable: false, forecastOnly: false, nullRealizations: 20 },
  };
}

beforeAll(() => {
  tmp = mkdtempSync(join(tmpdir(), 'moonsieve-calib-'));
});
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe('planCalibration', () => {
  const classOf = (cell: number) => (cell % 4 === 3 ? null : { key: `k${cell % 3}`, count: 45 });

  it('chunks tile each class in order; free cells come first; each cell appears once', () => {
    const cells = [0, 1, 2, 3, 4, 5, 6, 7, 8];
    const plan = planCalibration(cells, classOf, { workers: 2, chunkSize: 10 });
    expect(plan.classes).toBe(3);
    expect(plan.realizations).toBe(3 * 45);
    expect(plan.phases[0]).toEqual({ classes: [], cells: [3, 7] });
    for (const ph of plan.phases.slice(1)) {
      for (const c of ph.classes) {
        expect(c.chunks.map((ch) => ch.start)).toEqual([0, 10, 20, 30, 40]);
        expect(c.chunks.reduce((n, ch) => n + ch.n, 0)).toBe(45);
      }
    }
    expect(plan.phases.flatMap((p) => p.cells).sort((a, b) => a - b)).toEqual(cells);
    expect(plan.chunks).toBe(15);
  });

  it('phases hold whole classes within the realization budget (one larger class alone)', () => {
    const plan = planCalibration([0, 1, 2, 4, 5, 6], classOf, { workers: 1, maxPhaseRealizations: 90 });
    // Classes k0 {0, 6}, k1 {1, 4}, k2 {2, 5}: 45 + 45 ≤ 90, then k2 alone.
    expect(plan.phases.map((p) => p.classes.map((c) => c.key))).toEqual([['k0', 'k1'], ['k2']]);
    expect(plan.phases.map((p) => p.cells)).toEqual([[0, 1, 4, 6], [2, 5]]);
    const big = planCalibration([0, 1], () => ({ key: 'x', count: 500 }), { workers: 1, maxPhaseRealizations: 90 });
    expect(big.phases.length).toBe(1);
    expect(() => planCalibration([0], classOf, { workers: 0 })).toThrow(RangeError);
  });

  it('chunk size: ≥ 4 chunks per worker, at most 50 realizations each', () => {
    expect(nullChunkSize(1000, 2)).toBe(50); // 1000 / 8 = 125 → capped
    expect(nullChunkSize(1000, 16)).toBe(16); // ⌈1000 / 64⌉
    expect(nullChunkSize(20, 2)).toBe(3); // ⌈20 / 8⌉
  });
});

describe('null sets from chunks', () => {
  it('joined chunks (in any order) equal the set computed in one loop, bit for bit; runCell gives the same cell with either', () => {
    const job = jobOf(TINY);
    const prepared = prepareJob(job);
    const task = cellTask(prepared, 0);
    const c = nullClassOf(task, job.ctx)!;
    expect(c.count).toBe(20);
    expect(cellNeedsCalibration(task, job.ctx)).toBe(true);
    expect(cellNeedsCalibration(cellTask(prepared, 1), job.ctx)).toBe(false); // 0.9 Hill: unstable
    const whole = computeNullRange(c, 0, 20);
    const parts = [nullChunkOf(task, job.ctx, 13, 7), nullChunkOf(task, job.ctx, 0, 6), nullChunkOf(task, job.ctx, 6, 7)];
    for (const p of parts) expect(p.key).toBe(c.key);
    const joined = joinNullRanges(parts.map((p) => p.range), 20, true);
    expect(joined.sum.buffer).toBeInstanceOf(SharedArrayBuffer);
    for (const f of ['ttv', 'tdv', 'x0S', 'binS', 'sigma', 'binOffset', 'sum', 'count'] as const) {
      expect(Array.from(joined[f]), f).toEqual(Array.from(whole[f]));
    }
    expect(() => joinNullRanges([parts[0].range, parts[1].range], 20)).toThrow(/tile/);

    const own = runCell(task, job.ctx);
    let misses = 0;
    const given = runCell(task, job.ctx, { nullSets: new Map([[c.key, unpackNullSet(joined)]]), onNullMiss: () => misses++ });
    expect(JSON.stringify(given)).toBe(JSON.stringify(own));
    expect(misses).toBe(0);
    runCell(task, job.ctx, { nullSets: new Map<string, NullSet>(), onNullMiss: () => misses++ });
    expect(misses).toBe(1);
  });
});

describe('runSweep with the real runner: the pre-pass changes nothing but the speed', () => {
  it('main thread (own sets), 1 worker and 2 workers (pre-pass) give byte-identical cells.json', async () => {
    const quiet = { quiet: true, env: {} } as const;
    const main = await sweepDoc(TINY, { ...quiet, out: join(tmp, 'main'), runner: runCell });
    expect(main.calibration).toBeNull();
    const log = sink();
    const w1 = await sweepDoc(TINY, { env: {}, progress: log, out: join(tmp, 'w1'), workers: 1 });
    const w2 = await sweepDoc(TINY, { ...quiet, out: join(tmp, 'w2'), workers: 2 });
    expect(main.complete && w1.complete && w2.complete).toBe(true);
    expect(w2.runInfo.workers).toBe(2);
    // One null class of 20 realizations; every simulated cell used the provided set.
    expect(w1.calibration).toMatchObject({ classes: 1, realizations: 20, fallbackCells: 0 });
    expect(w2.calibration).toMatchObject({ classes: 1, realizations: 20, chunks: Math.ceil(20 / nullChunkSize(20, 2)), fallbackCells: 0 });
    expect(log.text).toMatch(/calibrating false alarms: 20 no-moon realizations/);
    expect(log.text).toMatch(/false alarms calibrated/);
    const ref = cellsJson('main');
    expect(cellsJson('w1')).toBe(ref);
    expect(cellsJson('w2')).toBe(ref);
    const parsed = JSON.parse(ref) as { meta: { no_moon_realizations: number }; cells: CellResult[] };
    expect(parsed.meta.no_moon_realizations).toBe(20);
    expect(parsed.cells.map((c) => c.simulated)).toEqual([true, false, true, false]);
    expect(parsed.cells[0].no_moon_realizations).toBe(20);
  });

  it('an interrupted run resumed on 2 workers gives the same bytes; the pre-pass covers only the cells left', async () => {
    const dir = join(tmp, 'resume');
    await sweepDoc(TINY, { quiet: true, env: {}, out: dir, runner: runCell, maxCells: 1 });
    const rest = await sweepDoc(TINY, { quiet: true, env: {}, out: dir, workers: 2, resume: true });
    expect(rest.runInfo.cells_resumed).toBe(1);
    expect(rest.calibration).toMatchObject({ classes: 1, realizations: 20, fallbackCells: 0 });
    expect(cellsJson('resume')).toBe(cellsJson('main'));
  });

  it('two classes in two phases (a 20-realization budget), chunks of 3: the same cells as the main thread', async () => {
    const job = jobOf(TWO_CLASSES);
    const prepared = prepareJob(job);
    const got: CellResult[] = [];
    let phases = 0;
    const out = await executeCells({
      pending: [0, 1, 2, 3],
      job,
      workers: 2,
      calibration: (cells, threads) =>
        planCalibration(cells, (i) => nullClassOf(cellTask(prepared, i), job.ctx), { workers: threads, chunkSize: 3, maxPhaseRealizations: 20 }),
      onCalibration: (e) => void (phases = e.plan.phases.length),
      onResult: (r) => got.push(r),
    });
    expect(out.completed).toBe(true);
    expect(phases).toBe(3); // the unstable (free) cells, then one phase per class
    expect(out.calibration).toMatchObject({ classes: 2, chunks: 14, fallbackCells: 0 });
    got.sort((a, b) => a.index - b.index);
    const own: CellResult[] = [];
    await executeCells({ pending: [0, 1, 2, 3], job, workers: 1, runner: runCell, onResult: (r) => own.push(r) });
    expect(got.map((c) => c.simulated)).toEqual([true, false, true, false]);
    expect(JSON.stringify(got)).toBe(JSON.stringify(own));
  });
});

describe('no_moon_realizations in the sweep block and the meta', () => {
  const fake: CellRunner = (task) => ({ index: task.index, coords: task.coords, x: task.index }) as unknown as CellResult; // a fake result: the engine passes any object through

  it('is read (integer ≥ 20), defaults to defaultNullRealizations in the meta, and is refused below 20', async () => {
    const base = parseScenario(TINY);
    expect(parseSweepSpec(TINY, base).nullRealizations).toBe(20);
    const { no_moon_realizations: _n, ...noNull } = TINY.sweep;
    void _n;
    const plain = { ...TINY, sweep: noNull };
    expect(parseSweepSpec(plain, base).nullRealizations).toBeNull();
    const r = await sweepDoc(plain, { quiet: true, env: {}, runner: fake, out: join(tmp, 'plain') });
    // α = 0.05, R = 3, tail calibration (the default): max(3, 200, ⌈15/0.05⌉) = 300 (computed from the scenario's values).
    expect(r.meta.no_moon_realizations).toBe(defaultNullRealizations(0.05, 3));
    expect(r.meta.no_moon_realizations).toBe(300);
    // With the order statistic chosen: ⌈25/0.05⌉ = 500 (nullSet.ts).
    const order = { ...plain, detection: { ...(plain as { detection?: object }).detection, false_alarm: 0.05, calibration: 'order_statistic' } };
    const r2 = await sweepDoc(order, { quiet: true, env: {}, runner: fake, out: join(tmp, 'order') });
    expect(r2.meta.no_moon_realizations).toBe(500);
    for (const bad of [19, 20.5, 'many']) {
      let err: unknown;
      try {
        parseSweepSpec({ ...TINY, sweep: { ...TINY.sweep, no_moon_realizations: bad } }, base);
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(InputError);
      expect((err as InputError).problems[0].path).toBe('sweep.no_moon_realizations');
    }
  });

  it('a merge or resume with a different count is refused, naming it', async () => {
    const other = { ...TINY, sweep: { ...TINY.sweep, no_moon_realizations: 30 } };
    await sweepDoc(TINY, { quiet: true, env: {}, runner: fake, out: join(tmp, 'n1'), shard: '1/2' });
    await sweepDoc(other, { quiet: true, env: {}, runner: fake, out: join(tmp, 'n2'), shard: '2/2' });
    expect(() => mergeShards([join(tmp, 'n1'), join(tmp, 'n2')], join(tmp, 'nm'))).toThrow(/no-moon calibration realizations \(20 vs 30\)/);
    await sweepDoc(TINY, { quiet: true, env: {}, runner: fake, out: join(tmp, 'nr'), maxCells: 1 });
    await expect(sweepDoc(other, { quiet: true, env: {}, runner: fake, out: join(tmp, 'nr'), resume: true })).rejects.toThrow(/no-moon calibration realizations \(20 vs 30\)/);
    const a = (await sweepDoc(TINY, { quiet: true, env: {}, runner: fake, out: join(tmp, 'm1') })).meta;
    expect(metaDifferences(a, { ...a, no_moon_realizations: 40 })).toEqual(['no-moon calibration realizations (20 vs 40)']);
  });
});

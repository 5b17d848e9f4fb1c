/**
 * Limits stated up front (issue 15 items 2 and 8): runs that cannot finish in
 * memory are refused with the number they would need, every grid cell is
 * validated before any work, a large grid does not overflow the calibration
 * planner or block Ctrl-C, the no-moon sets are saved for a resume, and the
 * Slurm variables are checked. Expected values are the engine's own contracts
 * or arithmetic in the test ("common practice, no source").
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runSweep, type SweepOptions, type SweepOutcome } from '../../src/app/sweep/runSweep.js';
import { InputError } from '../../src/scenario/errors.js';
import { planCalibration } from '../../src/sweep/calibrationPlan.js';
import { MAX_GRID_CELLS, MAX_NULL_REALIZATIONS } from '../../src/sweep/sizeLimits.js';
import { resolveShard } from '../../src/sweep/shard.js';
import { resolveWorkerCount } from '../../src/app/sweep/workerPool.js';
import { NULLSET_DIR } from '../../src/app/sweep/outputFolder.js';
import { openNullStore } from '../../src/app/sweep/nullStore.js';
import { computeNullRange, nullClassOfScenario } from '../../src/sweep/nullSet.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';
import type { CellResult, CellRunner } from '../../src/sweep/cellTypes.js';

/** runSweep of a scenario document, parsed first as a library caller does (a parse error rejects, as runSweep's own do). */
const sweepDoc = async (doc: unknown, options: SweepOptions = {}): Promise<SweepOutcome> => runSweep(parseScenario(doc), options);

const fake: CellRunner = () => ({ index: -1, coords: [], pdet_combined: 0.5 }) as unknown as CellResult; // a fake result: the engine passes any object through

const BASE = {
  name: 'Limits world',
  seed: 31,
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
      { field: 'moon.separation', from: '0.1 hill', to: '0.2 hill', count: 2 },
    ],
  },
};

let tmp: string;
beforeAll(() => {
  tmp = mkdtempSync(join(tmpdir(), 'moonsieve-limits-'));
});
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

async function refused(doc: unknown, out: string, extra: object = {}): Promise<string> {
  const e = await sweepDoc(doc, { quiet: true, env: {}, out, ...extra }).then(() => null, (err: unknown) => err);
  expect(e).toBeInstanceOf(InputError);
  expect(existsSync(out)).toBe(false); // nothing written
  return (e as Error).message;
}

describe('size limits', () => {
  it('false_alarm 1e-9 is refused with the 15/α = 1.5e10 no-moon realizations the default tail calibration would need and how to change it', async () => {
    const msg = await refused({ ...BASE, detection: { false_alarm: 1e-9 }, sweep: { ...BASE.sweep, no_moon_realizations: undefined } }, join(tmp, 'fa'));
    expect(msg).toMatch(/detection\.false_alarm: got 1e-9/);
    expect(msg).toContain('15/α = 1.50e10 no-moon realizations');
    expect(msg).toContain(`at most ${MAX_NULL_REALIZATIONS}`);
    expect(msg).toMatch(/α must be at least 0\.00015/); // 15 / 100 000 (nullSet.ts: NULL_EXCEEDANCES_TAIL)
    expect(msg).toMatch(/--forecast-only/);
    // The analytic forecast needs no calibration and is not limited by it.
    const fo = await sweepDoc({ ...BASE, detection: { false_alarm: 1e-9 }, sweep: { ...BASE.sweep, no_moon_realizations: undefined } }, { quiet: true, env: {}, out: join(tmp, 'fa-fo'), forecastOnly: true, runner: fake });
    expect(fo.complete).toBe(true);
  });

  it('an explicit no_moon_realizations above the limit is refused naming that field', async () => {
    const msg = await refused({ ...BASE, sweep: { ...BASE.sweep, no_moon_realizations: 200000 } }, join(tmp, 'nr'));
    expect(msg).toMatch(/sweep\.no_moon_realizations: got 200000; at most 100000/);
  });

  it('a 400 × 400 grid is refused with its cell count and the limit, before any cell is parsed', async () => {
    const axes = [
      { field: 'moon.density', from: '2 g/cm^3', to: '4 g/cm^3', count: 400 },
      { field: 'moon.separation', from: '0.1 hill', to: '0.2 hill', count: 400 },
    ];
    const t0 = performance.now();
    const msg = await refused({ ...BASE, sweep: { ...BASE.sweep, axes } }, join(tmp, 'g400'));
    expect(performance.now() - t0).toBeLessThan(5000);
    expect(msg).toContain('400 × 400 = 160000 cells');
    expect(msg).toContain(`at most ${MAX_GRID_CELLS} cells`);
  });

  it('the calibration planner takes a class of 160 000 cells without overflowing the stack', () => {
    const cells = Array.from({ length: 160_000 }, (_, i) => i);
    const plan = planCalibration(cells, () => ({ key: 'one', count: 20 }), { workers: 2 });
    expect(plan.phases).toHaveLength(1);
    expect(plan.phases[0].cells).toHaveLength(160_000);
  });

  it('an abort while the cells are validated stops at once, with nothing written', async () => {
    const axes = [
      { field: 'moon.density', from: '2 g/cm^3', to: '4 g/cm^3', count: 200 },
      { field: 'moon.separation', from: '0.1 hill', to: '0.2 hill', count: 200 },
    ];
    const controller = new AbortController();
    setTimeout(() => controller.abort(), 50);
    const t0 = performance.now();
    const out = join(tmp, 'abort-validate');
    const res = await sweepDoc({ ...BASE, sweep: { ...BASE.sweep, axes } }, { quiet: true, env: {}, out, runner: fake, signal: controller.signal });
    expect(res.complete).toBe(false);
    expect(res.cellsDone).toBe(0);
    expect(res.checkpointKept).toBe(false);
    expect(performance.now() - t0).toBeLessThan(2000); // 40 000 cells take ~4 s to validate
    expect(existsSync(out)).toBe(false);
  });
});

describe('every grid cell is validated before any work', () => {
  it('with a false-alarm axis, each cell whose α needs too many no-moon realizations is named', async () => {
    const axes = [{ field: 'detection.false_alarm', from: 1e-9, to: 1e-2, count: 3, spacing: 'log' }, BASE.sweep.axes[1]];
    const msg = await refused({ ...BASE, sweep: { ...BASE.sweep, no_moon_realizations: undefined, axes } }, join(tmp, 'fa-axis'));
    expect(msg).toMatch(/^4 of 6 grid cells are invalid/);
    expect(msg).toMatch(/cell 0 \(detection\.false_alarm = 1\.00e-9, .*15\/α = 1\.50e10 no-moon realizations/);
    expect(msg).toMatch(/cell 3 \(detection\.false_alarm = 3\.16e-6, .*15\/α = 4\.74e6/);
  });

  // Each endpoint is valid with the other field's base value, but a 2.5 R_J planet is larger
  // than a 0.2 R_sun (1.95 R_J) star: one cell of the nine is impossible.
  const BAD = {
    ...BASE,
    moon: { ...BASE.moon, separation: '300000 km' },
    sweep: {
      ...BASE.sweep,
      axes: [
        { field: 'star.radius', from: '0.2 Rsun', to: '1 Rsun', count: 3 },
        { field: 'planet.radius', from: '0.5 Rjup', to: '2.5 Rjup', count: 3 },
      ],
    },
  };
  it('each bad cell is one line naming its axis values and the problem; nothing is written, on a fresh run or a resume', async () => {
    for (const resume of [false, true]) {
      const msg = await refused(BAD, join(tmp, 'bad-cells'), { resume });
      expect(msg).toMatch(/^1 of 9 grid cells are invalid/);
      expect(msg).toMatch(/cell 2 \(star\.radius = 0\.2 .*, planet\.radius = 2\.5 .*\): .*planet\.radius/);
      expect(msg.split('\n')).toHaveLength(1);
    }
  });

  // A 40 000 km orbit lies inside the 0.65 and 1 R_J planets (planet radius + moon radius >
  // separation): in a grid that is a physical verdict on those cells, not an input error.
  const TOUCHING = {
    ...BASE,
    planet: { ...BASE.planet, radius: '0.3 Rjup' },
    moon: { ...BASE.moon, separation: '300000 km' },
    sweep: {
      ...BASE.sweep,
      simulate_unstable: true,
      axes: [
        { field: 'planet.radius', from: '0.3 Rjup', to: '1 Rjup', count: 3 },
        { field: 'moon.separation', from: '40000 km', to: '500000 km', count: 3 },
      ],
    },
  };
  it('cells whose moon would touch the planet are labelled and never simulated, even with simulate_unstable', async () => {
    const out = join(tmp, 'touching');
    const res = await sweepDoc(TOUCHING, { quiet: true, env: {}, out, workers: 1 });
    expect(res.complete).toBe(true);
    const cells = JSON.parse(readFileSync(join(out, 'cells.json'), 'utf8')).cells as Array<{ index: number; placement: string; allowed: boolean; simulated: boolean }>;
    const touching = cells.filter((c) => c.placement.includes('touches the planet'));
    expect(touching.map((c) => c.index).sort()).toEqual([3, 6]); // planet 0.65 and 1 R_J at 40 000 km (arithmetic)
    for (const c of touching) {
      expect(c.allowed).toBe(false);
      expect(c.simulated).toBe(false);
    }
    expect(cells.some((c) => c.simulated)).toBe(true);
  });
});

describe('the no-moon calibration sets are saved for a resume', () => {
  it('a chunk saved and read back is the same numbers', () => {
    const c = nullClassOfScenario(parseScenario(BASE), 31, 20);
    const r = computeNullRange(c, 5, 3);
    const store = openNullStore(join(tmp, 'store'));
    store.save(c.key, r);
    const [back] = store.load(c.key, 20);
    expect(back.start).toBe(5);
    for (const f of ['ttv', 'tdv', 'x0S', 'binS', 'sigma', 'binOffset', 'sum', 'count'] as const) expect(Array.from(back[f])).toEqual(Array.from(r[f]));
    expect(store.load(c.key, 7)).toEqual([]); // a range beyond a smaller class is not used
    // A damaged file (one byte changed) is not used: its range is computed again.
    const file = join(tmp, 'store', readdirSync(join(tmp, 'store')).find((f) => f.endsWith('.bin'))!);
    const bytes = readFileSync(file);
    bytes[20] ^= 1;
    writeFileSync(file, bytes);
    expect(store.load(c.key, 20)).toEqual([]);
    store.save(c.key, r);
    store.drop(c.key);
    expect(store.load(c.key, 20)).toEqual([]);
  });

  it('an interrupted sweep keeps its no-moon sets; the resume reads them back instead of computing them, with the same cells.json', async () => {
    const straight = join(tmp, 'ns-straight');
    await sweepDoc(BASE, { quiet: true, env: {}, out: straight, workers: 1 });
    const dir = join(tmp, 'ns-resumed');
    // Stopped as Ctrl-C would, as soon as the calibration is done (before the cells that use it).
    const controller = new AbortController();
    const progress = { isTTY: false, write: (t: string) => { if (t.includes('false alarms calibrated')) controller.abort(); } };
    const first = await sweepDoc(BASE, { env: {}, out: dir, workers: 1, signal: controller.signal, progress });
    expect(first.complete).toBe(false);
    expect(first.calibration?.resumedRealizations).toBe(0);
    expect(readdirSync(join(dir, NULLSET_DIR)).filter((f) => f.endsWith('.bin')).length).toBeGreaterThan(0);
    const rest = await sweepDoc(BASE, { quiet: true, env: {}, out: dir, workers: 2, resume: true });
    expect(rest.complete).toBe(true);
    expect(rest.calibration?.resumedRealizations).toBe(20);
    expect(readFileSync(join(dir, 'cells.json'), 'utf8')).toBe(readFileSync(join(straight, 'cells.json'), 'utf8'));
    expect(existsSync(join(dir, NULLSET_DIR))).toBe(false);
  });
});

describe('Slurm variables', () => {
  it('SLURM_ARRAY_TASK_ID without SLURM_ARRAY_TASK_COUNT is an error with the fix (unless --shard is given)', () => {
    expect(() => resolveShard(undefined, { SLURM_ARRAY_TASK_ID: '3' })).toThrow(/SLURM_ARRAY_TASK_COUNT: got "unset \(SLURM_ARRAY_TASK_ID=3\)".*--shard K\/N/);
    expect(() => resolveShard(undefined, { SLURM_ARRAY_TASK_COUNT: '4' })).toThrow(/SLURM_ARRAY_TASK_ID/);
    expect(resolveShard('1/1', { SLURM_ARRAY_TASK_ID: '3' })).toEqual({ k: 1, n: 1 });
    expect(resolveShard(undefined, { SLURM_ARRAY_TASK_ID: '3', SLURM_ARRAY_TASK_COUNT: '4', SLURM_ARRAY_TASK_MIN: '0' })).toEqual({ k: 4, n: 4 });
  });

  it('a bad SLURM_CPUS_PER_TASK is an error, not ignored; --workers wins', () => {
    for (const bad of ['abc', '0', '2.5', '-1', '5000']) {
      expect(() => resolveWorkerCount(undefined, { SLURM_CPUS_PER_TASK: bad })).toThrow(InputError);
    }
    expect(() => resolveWorkerCount(undefined, { SLURM_CPUS_PER_TASK: 'abc' })).toThrow(/SLURM_CPUS_PER_TASK: got "abc".*--workers N/);
    expect(resolveWorkerCount(undefined, { SLURM_CPUS_PER_TASK: '4' })).toBe(4);
    expect(resolveWorkerCount('2', { SLURM_CPUS_PER_TASK: 'abc' })).toBe(2);
  });
});

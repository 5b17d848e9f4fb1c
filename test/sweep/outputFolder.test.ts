/**
 * One sweep per output folder (issue 15 item 3): the lock, the refusal of a
 * folder holding another sweep or foreign files, staged outputs, and the
 * checks of checkpoint lines and of cells read back by `report` and `merge`.
 * Every refusal leaves the folder as it was. Expected values are the
 * engine's own contracts ("common practice, no source").
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import { runSweep, type SweepOptions, type SweepOutcome } from '../../src/app/sweep/runSweep.js';
import { mergeShards } from '../../src/app/sweep/merge.js';
import { rewriteSweepReport } from '../../src/app/rewriteReport.js';
import { InputError } from '../../src/scenario/errors.js';
import { CHECKPOINT_FILE } from '../../src/app/sweep/checkpoint.js';
import { LOCK_FILE, STAGING_DIR, acquireFolderLock, commitOutputs, settleStaging } from '../../src/app/sweep/outputFolder.js';
import { defaultOutDir } from '../../src/app/defaultOutDir.js';
import type { CellResult, CellRunner } from '../../src/sweep/cellTypes.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';

/** runSweep of a scenario document, parsed first as a library caller does (a parse error rejects, as runSweep's own do). */
const sweepDoc = async (doc: unknown, options: SweepOptions = {}): Promise<SweepOutcome> => runSweep(parseScenario(doc), options);

/** A deterministic runner in the main thread: probabilities from the cell index. */
const fake: CellRunner = (task, ctx) => ({
  index: -1, coords: [],
  simulated: true,
  realizations: ctx.realizations,
  pdet_ttv: (task.index % 5) / 5, pdet_tdv: 0, pdet_dip: 0.5, pdet_combined: (task.index % 5) / 5,
  label: task.index % 2 === 0 ? 'stable' : 'beyond stable limit',
}) as unknown as CellResult; // a fake result: the engine passes any object through

const BASE = {
  name: 'Folder world',
  seed: 4242,
  star: { mass: '1 Msun', radius: '1 Rsun', teff: '5772 K', limb_darkening: { u1: 0.4, u2: 0.25 } },
  planet: { mass: '1 Mjup', radius: '1 Rjup', period: '60 d' },
  moon: { mass: '0.5 Mearth', density: '3 g/cm^3', separation: '0.1 hill' },
  instrument: { cadence: '10 min', noise: '300 ppm per 10 min' },
  observation: { transits: 5 },
  sweep: {
    realizations: 3,
    no_moon_realizations: 20,
    axes: [
      { field: 'moon.mass', from: '0.1 Mearth', to: '1 Mearth', count: 3, spacing: 'log' },
      { field: 'moon.separation', from: '0.1 hill', to: '0.3 hill', count: 2 },
    ],
  },
};
/** Another sweep whose name gives the same default folder. */
const OTHER = { ...BASE, name: 'Folder  world!', seed: 4243 };

let tmp: string;
const q = { quiet: true, env: {}, runner: fake } as const;

/** Every file under `dir` with its bytes (to show a refusal changed nothing). */
function snapshot(dir: string): Record<string, string> {
  const out: Record<string, string> = {};
  if (!existsSync(dir)) return out;
  for (const name of readdirSync(dir, { recursive: true }) as string[]) {
    const p = join(dir, name);
    try {
      out[name] = readFileSync(p, 'latin1');
    } catch {
      out[name] = '<dir>';
    }
  }
  return out;
}

async function refusal(p: Promise<unknown>): Promise<string> {
  const e = await p.then(() => null, (err: unknown) => err);
  expect(e).toBeInstanceOf(InputError);
  return (e as Error).message;
}

/** The pid of a process that has exited (a stale lock's holder). */
function deadPid(): number {
  const r = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' });
  return Number(r.stdout);
}

beforeAll(() => {
  tmp = mkdtempSync(join(tmpdir(), 'moonsieve-folder-'));
});
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe('one sweep per output folder', () => {
  it('refuses a folder holding another sweep (also two names with one default folder), changing nothing; --force replaces it', async () => {
    expect(defaultOutDir(OTHER.name)).toBe(defaultOutDir(BASE.name));
    const dir = join(tmp, 'owner');
    await sweepDoc(BASE, { ...q, out: dir });
    const before = snapshot(dir);
    const msg = await refusal(sweepDoc(OTHER, { ...q, out: dir }));
    expect(msg).toMatch(/holds the results of another sweep \("Folder world"/);
    expect(msg).toMatch(/--force/);
    expect(snapshot(dir)).toEqual(before);
    // The same sweep again is fine (its results are the same).
    await sweepDoc(BASE, { ...q, out: dir });
    expect(readFileSync(join(dir, 'cells.json'), 'utf8')).toBe(before['cells.json']);
    const forced = await sweepDoc(OTHER, { ...q, out: dir, force: true });
    expect(forced.complete).toBe(true);
    expect(JSON.parse(readFileSync(join(dir, 'cells.json'), 'utf8')).meta.scenario).toBe('Folder  world!');
    expect(existsSync(join(dir, LOCK_FILE))).toBe(false);
    expect(existsSync(join(dir, STAGING_DIR))).toBe(false);
  });

  it('refuses a folder with files moonsieve did not write unless --force, and leaves them alone', async () => {
    const dir = join(tmp, 'foreign');
    mkdirSync(dir);
    writeFileSync(join(dir, 'notes.txt'), 'mine');
    const msg = await refusal(sweepDoc(BASE, { ...q, out: dir }));
    expect(msg).toMatch(/not this sweep's \(notes\.txt\)/);
    expect(readdirSync(dir)).toEqual(['notes.txt']);
    await sweepDoc(BASE, { ...q, out: dir, force: true });
    expect(readFileSync(join(dir, 'notes.txt'), 'utf8')).toBe('mine');
    expect(existsSync(join(dir, 'cells.json'))).toBe(true);
  });

  it('refuses a folder locked by a live run (with or without --resume), naming its pid and host', async () => {
    const dir = join(tmp, 'locked');
    const lock = acquireFolderLock(dir, 'moonsieve sweep other.yaml');
    try {
      for (const resume of [false, true]) {
        const msg = await refusal(sweepDoc(BASE, { ...q, out: dir, resume }));
        expect(msg).toContain(`pid ${process.pid} on host ${hostname()}`);
        expect(msg).toMatch(/wait for that run to finish, or stop it/);
      }
      expect(readdirSync(dir)).toEqual([LOCK_FILE]);
    } finally {
      lock.release();
    }
    expect(existsSync(join(dir, LOCK_FILE))).toBe(false);
  });

  it('takes over a stale lock: a dead pid, or a live pid started at another time (reused)', async () => {
    for (const [name, info] of [
      ['stale-dead', { pid: deadPid(), proc_start: null }],
      ['stale-reused', { pid: process.pid, proc_start: '1' }],
    ] as const) {
      const dir = join(tmp, name);
      mkdirSync(dir);
      writeFileSync(join(dir, LOCK_FILE), JSON.stringify({ ...info, host: hostname(), started: '2026-01-01T00:00:00Z', command: 'moonsieve sweep x', token: 't' }));
      const res = await sweepDoc(BASE, { ...q, out: dir });
      expect(res.complete).toBe(true);
      expect(existsSync(join(dir, LOCK_FILE))).toBe(false);
    }
  });

  it('two runs started together on one folder: one runs, the other is refused', async () => {
    const dir = join(tmp, 'race');
    const results = await Promise.allSettled([sweepDoc(BASE, { ...q, out: dir }), sweepDoc(BASE, { ...q, out: dir })]);
    expect(results.filter((r) => r.status === 'fulfilled')).toHaveLength(1);
    const rejected = results.find((r) => r.status === 'rejected') as PromiseRejectedResult;
    expect(String(rejected.reason.message)).toMatch(/in use by pid/);
  });
});

describe('staged outputs', () => {
  it('a commit killed after its manifest is completed by the next command; one killed before it is dropped', () => {
    const dir = join(tmp, 'staging');
    mkdirSync(dir);
    commitOutputs(dir, [['a.txt', 'old a'], ['b.txt', 'old b']]);
    expect(readdirSync(dir).sort()).toEqual(['a.txt', 'b.txt']);
    // Killed while staging (no manifest): the previous set stays.
    mkdirSync(join(dir, STAGING_DIR));
    writeFileSync(join(dir, STAGING_DIR, 'a.txt'), 'new a');
    expect(settleStaging(dir)).toBe('dropped');
    expect(readFileSync(join(dir, 'a.txt'), 'utf8')).toBe('old a');
    // Killed after the manifest and one rename: the rest is completed.
    mkdirSync(join(dir, STAGING_DIR));
    writeFileSync(join(dir, STAGING_DIR, 'b.txt'), 'new b');
    writeFileSync(join(dir, STAGING_DIR, 'manifest.json'), JSON.stringify({ files: ['a.txt', 'b.txt'], remove: [] }));
    writeFileSync(join(dir, 'a.txt'), 'new a'); // already renamed
    expect(settleStaging(dir)).toBe('completed');
    expect([readFileSync(join(dir, 'a.txt'), 'utf8'), readFileSync(join(dir, 'b.txt'), 'utf8')]).toEqual(['new a', 'new b']);
    expect(existsSync(join(dir, STAGING_DIR))).toBe(false);
  });

  it('report finishes an interrupted commit before reading the folder', async () => {
    const dir = join(tmp, 'staged-report');
    await sweepDoc(BASE, { ...q, out: dir });
    const cells = readFileSync(join(dir, 'cells.json'), 'utf8');
    // A new sweep's cells.json staged with its manifest, the kill before any rename: the old set is still in place.
    mkdirSync(join(dir, STAGING_DIR));
    const edited = cells.replace('"pdet_dip":0.5', '"pdet_dip":0.25');
    writeFileSync(join(dir, STAGING_DIR, 'cells.json'), edited);
    writeFileSync(join(dir, STAGING_DIR, 'manifest.json'), JSON.stringify({ files: ['cells.json'], remove: [] }));
    rewriteSweepReport(dir);
    expect(readFileSync(join(dir, 'cells.json'), 'utf8')).toBe(edited);
    expect(existsSync(join(dir, STAGING_DIR))).toBe(false);
  });
});

describe('checkpoint lines are checked on --resume', () => {
  const damage: Array<[string, (line: string) => string, RegExp]> = [
    ['missing coords', (l) => l.replace(/"coords":\[[^\]]*\],/, ''), /line 3: coords: got \(missing\)/],
    ['non-numeric probability', (l) => l.replace(/"pdet_combined":[^,}]+/, '"pdet_combined":"abc"'), /line 3: pdet_combined: got "abc"; a probability/],
    ['probability above 1', (l) => l.replace(/"pdet_ttv":[^,}]+/, '"pdet_ttv":2.5'), /line 3: pdet_ttv: got 2.5; a probability/],
    ['cell outside the grid', (l) => l.replace(/"index":\d+/, '"index":600'), /line 3: index: got 600; expected a whole cell index from 0 to 5/],
    ['wrong coordinates', (l) => l.replace(/"coords":\[[-0-9.e+]+/, '"coords":[1'), /line 3: coords: .*are not the axis values of cell/],
    ['realizations above the sweep\'s', (l) => l.replace(/"realizations":3/, '"realizations":7'), /line 3: realizations: got 7; expected a whole number from 0 to 3/],
    ['garbage', () => '{"index": 1, oops', /line 3: got "\{\\"index\\": 1, oops"; not a JSON cell result/],
  ];
  for (const [what, edit, expected] of damage) {
    it(`refuses ${what}, naming the line, and changes nothing`, async () => {
      const dir = join(tmp, `cp-${what.replace(/\W+/g, '-')}`);
      await sweepDoc(BASE, { ...q, out: dir, maxCells: 3 });
      const path = join(dir, CHECKPOINT_FILE);
      const lines = readFileSync(path, 'utf8').split('\n');
      lines[2] = edit(lines[2]);
      writeFileSync(path, lines.join('\n'));
      const before = snapshot(dir);
      const msg = await refusal(sweepDoc(BASE, { ...q, out: dir, resume: true }));
      expect(msg).toMatch(expected);
      expect(msg).toMatch(/--resume cannot trust it/);
      expect(snapshot(dir)).toEqual(before);
    });
  }

  it('refuses two different results for one cell; the same line twice is harmless', async () => {
    const dir = join(tmp, 'cp-repeat');
    await sweepDoc(BASE, { ...q, out: dir, maxCells: 3 });
    const path = join(dir, CHECKPOINT_FILE);
    const lines = readFileSync(path, 'utf8').split('\n').filter((l) => l !== '');
    writeFileSync(path, [...lines, lines[1].replace(/"pdet_dip":0.5/, '"pdet_dip":0.75')].join('\n') + '\n');
    expect(await refusal(sweepDoc(BASE, { ...q, out: dir, resume: true }))).toMatch(/line 5: got "cell 0"; a different result for this cell is already at line 2/);
    writeFileSync(path, [...lines, lines[1]].join('\n') + '\n');
    const res = await sweepDoc(BASE, { ...q, out: dir, resume: true });
    expect(res.runInfo.cells_resumed).toBe(3);
  });
});

describe('cells are checked in report and merge', () => {
  const damage: Array<[string, (cells: string) => string, RegExp]> = [
    ['a probability of 2.5', (t) => t.replace(/"pdet_ttv":[^,}]+/, '"pdet_ttv":2.5'), /cell 1: pdet_ttv: got 2.5; a probability/],
    ['a probability of -1', (t) => t.replace(/"pdet_combined":[^,}]+/, '"pdet_combined":-1'), /pdet_combined: got -1;/],
    ['a probability "abc"', (t) => t.replace(/"pdet_dip":[^,}]+/, '"pdet_dip":"abc"'), /pdet_dip: got "abc";/],
    ['a missing cell', (t) => t.replace(/\n {4}\{"index":1,[^\n]*/, ''), /cells\.json: got "1 of 6 cells missing"; every cell must be present; missing cells 1/],
    ['a repeated cell', (t) => t.replace(/"index":1,"coords":\[[^\]]*\]/, (m) => m.replace('"index":1', '"index":0')), /coords: .*are not the axis values of cell 0/],
    ['a cell beyond the grid', (t) => t.replace(/"index":5,/, '"index":9,'), /index: got 9; expected a whole cell index from 0 to 5/],
    ['another schema version', (t) => t.replace('"schema": "moonsieve/cells/2"', '"schema": "moonsieve/cells/1"'), /its schema is "moonsieve\/cells\/1", this moonsieve reads moonsieve\/cells\/2/],
    ['no schema (an older moonsieve)', (t) => t.replace('"schema": "moonsieve/cells/2",\n', ''), /its schema is not stated \(an older moonsieve wrote it\)/],
  ];
  it('a repeated cell with its own coordinates is named as a repeat', async () => {
    const dir = join(tmp, 'rep-twice');
    await sweepDoc(BASE, { ...q, out: dir });
    const path = join(dir, 'cells.json');
    const text = readFileSync(path, 'utf8');
    const line0 = /\n {4}(\{"index":0,[^\n]*?\}),?\n/.exec(text)![1];
    writeFileSync(path, text.replace(/\n {4}\{"index":1,[^\n]*\}/, '\n    ' + line0));
    expect(() => rewriteSweepReport(dir)).toThrow(/cells\.json cell 2.*got "cell 0"; this cell is already in cells\.json cell 1/s);
  });
  for (const [what, edit, expected] of damage) {
    it(`report and merge refuse ${what}; nothing is written`, async () => {
      const dir = join(tmp, `rep-${what.replace(/\W+/g, '-')}`);
      await sweepDoc(BASE, { ...q, out: dir });
      const path = join(dir, 'cells.json');
      writeFileSync(path, edit(readFileSync(path, 'utf8')));
      const before = snapshot(dir);
      expect(() => rewriteSweepReport(dir)).toThrow(expected);
      expect(() => rewriteSweepReport(dir)).toThrow(InputError);
      const mergeOut = join(tmp, `merged-${what.replace(/\W+/g, '-')}`);
      expect(() => mergeShards([dir], mergeOut)).toThrow(InputError);
      expect(snapshot(dir)).toEqual(before);
      expect(existsSync(mergeOut)).toBe(false);
    });
  }
});

describe('shards and folders', () => {
  it('a shard is refused in a folder holding another shard of the same sweep; a merge there is fine', async () => {
    const dir = join(tmp, 'shards-one-folder');
    await sweepDoc(BASE, { ...q, out: dir, shard: '1/2' });
    const before = snapshot(dir);
    const msg = await refusal(sweepDoc(BASE, { ...q, out: dir, shard: '2/2' }));
    expect(msg).toMatch(/holds shard 1\/2 of this sweep \(run\.json\) and this run is shard 2\/2: give each shard its own --out/);
    expect(snapshot(dir)).toEqual(before);
    // A shard's folder re-renders (its cells are the shard's, exactly once); a cell of another shard is refused.
    expect(rewriteSweepReport(dir).summary.cells).toBe(3);
    const two = join(tmp, 'shard-edited');
    await sweepDoc(BASE, { ...q, out: two, shard: '1/2' });
    const cellsPath = join(two, 'cells.json');
    writeFileSync(cellsPath, readFileSync(cellsPath, 'utf8').replace(/"index":2,"coords":\[[^\]]*\]/, '"index":1,"coords":[5.972167867791379e+23,919772253.6733063]'));
    expect(() => rewriteSweepReport(two)).toThrow(/got "cell 1"; not a cell of the run that wrote cells\.json/);
    const other = join(tmp, 'shards-two');
    await sweepDoc(BASE, { ...q, out: other, shard: '2/2' });
    const merged = mergeShards([dir, other], dir);
    expect(merged.results).toHaveLength(6);
  });
});

describe('report and merge respect a running sweep', () => {
  it('report refuses a locked folder; merge refuses to read a folder being written', async () => {
    const dir = join(tmp, 'busy');
    await sweepDoc(BASE, { ...q, out: dir });
    const lock = acquireFolderLock(dir, 'moonsieve sweep busy.yaml');
    try {
      const before = snapshot(dir);
      expect(() => rewriteSweepReport(dir)).toThrow(/in use by pid \d+ on host .* \(moonsieve sweep busy\.yaml\)/);
      expect(() => mergeShards([dir], join(tmp, 'busy-merged'))).toThrow(/a run is writing this folder now \(pid \d+/);
      expect(snapshot(dir)).toEqual(before);
    } finally {
      lock.release();
    }
    expect(rewriteSweepReport(dir).files).toHaveLength(2);
  });
});

/**
 * `moonsieve merge`: refuses shards of different sweeps, overlapping shards,
 * missing cells and unfinished shards with clear messages, and merges good
 * shards into the unsharded result. Runner: a small deterministic fake seeded
 * from createRng(seed, cell, r), run in the main thread. Expected outcomes
 * follow from the shard definition ("common practice, no source").
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Command } from 'commander';
import { runSweep, type SweepOptions, type SweepOutcome } from '../../src/app/sweep/runSweep.js';
import { mergeShards } from '../../src/app/sweep/merge.js';
import { registerMerge } from '../../src/cli/mergeCommand.js';
import { InputError } from '../../src/scenario/errors.js';
import { createRng } from '../../src/noise/rng.js';
import type { CellResult, CellRunner } from '../../src/sweep/cellTypes.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';

/** runSweep of a scenario document, parsed first as a library caller does (a parse error rejects, as runSweep's own do). */
const sweepDoc = async (doc: unknown, options: SweepOptions = {}): Promise<SweepOutcome> => runSweep(parseScenario(doc), options);

const fake: CellRunner = (task, ctx) => {
  let s = 0;
  for (let r = 0; r < ctx.realizations; r++) s += createRng(ctx.seed, task.index, r).uniform();
  // A fake result (not runCell's fields): the engine passes any JSON-serialisable object through.
  return { index: task.index, coords: task.coords, score: s / ctx.realizations } as unknown as CellResult;
};

const BASE = {
  name: 'Merge world',
  seed: 3,
  star: { mass: '0.9 Msun', radius: '0.9 Rsun', teff: '5300 K', limb_darkening: { u1: 0.45, u2: 0.2 } },
  planet: { mass: '0.5 Mjup', radius: '0.9 Rjup', period: '120 d' },
  instrument: { cadence: '5 min', noise: '500 ppm per 5 min' },
  observation: { transits: 4 },
  sweep: { realizations: 3, axes: [{ field: 'observation.transits', from: 3, to: 8, count: 6 }] },
};

let tmp: string;
const run = (doc: unknown, out: string, shard: string | null) =>
  sweepDoc(doc, { quiet: true, env: {}, runner: fake, out: join(tmp, out), shard });

beforeAll(async () => {
  tmp = mkdtempSync(join(tmpdir(), 'moonsieve-merge-'));
  await run(BASE, 'full', null);
  await run(BASE, 'a1', '1/2');
  await run(BASE, 'a2', '2/2');
  await run({ ...BASE, seed: 4 }, 'b2', '2/2');
  await run({ ...BASE, planet: { ...BASE.planet, period: '121 d' } }, 'c2', '2/2');
  await run(BASE, 't1', '1/3');
  await run(BASE, 't2', '2/3');
  await sweepDoc(BASE, { quiet: true, env: {}, runner: fake, out: join(tmp, 'part'), shard: '3/3', maxCells: 1 });
});
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

function mergeError(dirs: string[]): string {
  try {
    mergeShards(dirs.map((d) => join(tmp, d)), join(tmp, 'never'));
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as Error).message;
  }
  throw new Error('expected the merge to be refused');
}

describe('merge', () => {
  it('merges two shards into the unsharded cells.json, byte for byte', () => {
    const m = mergeShards([join(tmp, 'a1'), join(tmp, 'a2')], join(tmp, 'merged'));
    expect(m.results.map((r) => r.index)).toEqual([0, 1, 2, 3, 4, 5]);
    expect(readFileSync(join(tmp, 'merged', 'cells.json'), 'utf8')).toBe(readFileSync(join(tmp, 'full', 'cells.json'), 'utf8'));
    const runJson = JSON.parse(readFileSync(join(tmp, 'merged', 'run.json'), 'utf8'));
    expect(runJson.merged_from.map((x: { run: { shard: unknown } }) => x.run.shard)).toEqual([{ k: 1, n: 2 }, { k: 2, n: 2 }]);
  });

  it('refuses shards from different scenarios (seed, or scenario hash)', () => {
    expect(mergeError(['a1', 'b2'])).toMatch(/different sweep.*seed \(3 vs 4\)/s);
    expect(mergeError(['a1', 'c2'])).toMatch(/different sweep.*scenario \(hash [0-9a-f]{12}… vs [0-9a-f]{12}…\)/s);
  });

  it('refuses overlapping shards, naming the cells', () => {
    expect(mergeError(['full', 'a1'])).toMatch(/must not overlap \(cells 0, 2, 4\)/);
  });

  it('refuses missing cells, naming them and the shard count', () => {
    expect(mergeError(['t1', 't2'])).toMatch(/2 of 6 missing.*missing cells 2, 5 \(the shards given are 2 of N = 3\)/s);
  });

  it('refuses an unfinished shard and a folder with no sweep', () => {
    expect(mergeError(['t1', 't2', 'part'])).toMatch(/has not finished.*--resume/);
    expect(mergeError(['nowhere'])).toMatch(/no cells\.json/);
  });

  it('runs from the command line', async () => {
    const out: string[] = [];
    const program = new Command().exitOverride();
    registerMerge(program, { out: (t) => out.push(t), err: (t) => out.push(t) });
    await program.parseAsync(['node', 'moonsieve', 'merge', join(tmp, 'a2'), join(tmp, 'a1'), '--out', join(tmp, 'cli')]);
    expect(out.join('')).toMatch(/Merge world: merged 2 folders, 6 of 6 cells/);
    expect(readFileSync(join(tmp, 'cli', 'cells.json'), 'utf8')).toBe(readFileSync(join(tmp, 'full', 'cells.json'), 'utf8'));
  });
});

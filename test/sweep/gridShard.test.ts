/**
 * Grid indexing, shard assignment and worker counts. Expected values are
 * worked by hand from the definitions (row-major, index mod N = K − 1);
 * "common practice, no source".
 */
import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { createGrid } from '../../src/sweep/grid.js';
import { parseShard, resolveShard, shardCells, shardFromEnv } from '../../src/sweep/shard.js';
import { resolveWorkerCount } from '../../src/app/sweep/workerPool.js';
import { InputError } from '../../src/scenario/errors.js';

describe('grid', () => {
  it('indexes cells row-major, last axis fastest', () => {
    const g = createGrid([[1, 2, 3], [10, 20]]);
    expect(g.total).toBe(6);
    expect([0, 1, 2, 3, 4, 5].map((i) => g.cellCoords(i))).toEqual([[1, 10], [1, 20], [2, 10], [2, 20], [3, 10], [3, 20]]);
    expect(createGrid([[5, 6, 7]]).cellCoords(2)).toEqual([7]);
    expect(() => g.cellCoords(6)).toThrow(RangeError);
    expect(() => createGrid([])).toThrow(RangeError);
  });

  it('maps every index to distinct axis indices (property)', () => {
    fc.assert(fc.property(fc.integer({ min: 1, max: 9 }), fc.integer({ min: 1, max: 9 }), (n0, n1) => {
      const g = createGrid([Array.from({ length: n0 }, (_, i) => i), Array.from({ length: n1 }, (_, i) => i)]);
      const seen = new Set<string>();
      for (let i = 0; i < g.total; i++) {
        const [a, b] = g.cellAxisIndices(i);
        expect(a * n1 + b).toBe(i);
        seen.add(`${a},${b}`);
      }
      return seen.size === n0 * n1;
    }));
  });
});

describe('shards', () => {
  it('parses K/N and refuses bad text', () => {
    expect(parseShard('3/8')).toEqual({ k: 3, n: 8 });
    for (const bad of ['0/4', '5/4', '2', 'a/b', '1/0', '-1/3']) expect(() => parseShard(bad)).toThrow(InputError);
    expect(() => parseShard('5/4')).toThrow(/--shard/);
  });

  it('N shards cover every cell exactly once (property)', () => {
    fc.assert(fc.property(fc.integer({ min: 0, max: 200 }), fc.integer({ min: 1, max: 12 }), (total, n) => {
      const all = Array.from({ length: n }, (_, k) => shardCells(total, { k: k + 1, n })).flat().sort((a, b) => a - b);
      return all.length === total && all.every((v, i) => v === i);
    }));
    expect(shardCells(10, { k: 2, n: 3 })).toEqual([1, 4, 7]);
    expect(shardCells(3, null)).toEqual([0, 1, 2]);
  });

  it('reads the Slurm job-array variables (K = ID − MIN + 1)', () => {
    expect(shardFromEnv({})).toBeNull();
    expect(shardFromEnv({ SLURM_ARRAY_TASK_ID: '0', SLURM_ARRAY_TASK_COUNT: '4' })).toEqual({ k: 1, n: 4 });
    expect(shardFromEnv({ SLURM_ARRAY_TASK_ID: '4', SLURM_ARRAY_TASK_COUNT: '4', SLURM_ARRAY_TASK_MIN: '1' })).toEqual({ k: 4, n: 4 });
    expect(() => shardFromEnv({ SLURM_ARRAY_TASK_ID: '4', SLURM_ARRAY_TASK_COUNT: '4', SLURM_ARRAY_TASK_MIN: '0' })).toThrow(/SLURM_ARRAY_TASK_ID/);
    // An explicit shard wins over the environment; null forces the whole grid.
    const env = { SLURM_ARRAY_TASK_ID: '1', SLURM_ARRAY_TASK_COUNT: '2' };
    expect(resolveShard('1/3', env)).toEqual({ k: 1, n: 3 });
    expect(resolveShard(null, env)).toBeNull();
    expect(resolveShard(undefined, env)).toEqual({ k: 2, n: 2 });
  });
});

describe('worker count', () => {
  it('takes --workers, else SLURM_CPUS_PER_TASK, else the core count', () => {
    expect(resolveWorkerCount(3, { SLURM_CPUS_PER_TASK: '8' })).toBe(3);
    expect(resolveWorkerCount('2', {})).toBe(2);
    expect(resolveWorkerCount(undefined, { SLURM_CPUS_PER_TASK: '8' })).toBe(8);
    expect(resolveWorkerCount(undefined, {})).toBeGreaterThanOrEqual(1);
    expect(() => resolveWorkerCount('0', {})).toThrow(/--workers/);
    expect(() => resolveWorkerCount('two', {})).toThrow(InputError);
  });
});

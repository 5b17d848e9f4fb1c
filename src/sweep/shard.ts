/**
 * Shards: `--shard K/N` runs the cells whose index i has i mod N = K − 1, so
 * shards are fixed by index (never by timing) and N shards cover the grid
 * exactly once. Inside a Slurm job array, the shard comes from the array
 * task variables when no `--shard` is given.
 */
import { InputError } from '../scenario/errors.js';

export interface Shard {
  /** 1-based shard number, 1 ≤ k ≤ n. */
  k: number;
  n: number;
}

const SHARD_TEXT = /^\s*(\d+)\s*\/\s*(\d+)\s*$/;

/** Parse "K/N" (1 ≤ K ≤ N). Throws InputError naming `path`. */
export function parseShard(text: string, path = '--shard'): Shard {
  const m = SHARD_TEXT.exec(text);
  const k = m ? Number(m[1]) : Number.NaN;
  const n = m ? Number(m[2]) : Number.NaN;
  if (!m || !Number.isSafeInteger(k) || !Number.isSafeInteger(n) || n < 1 || k < 1 || k > n) {
    throw new InputError([{ path, value: text, allowed: 'expected K/N with whole numbers 1 ≤ K ≤ N, e.g. "2/8" for the second of eight shards' }]);
  }
  return { k, n };
}

/**
 * The shard of a Slurm job-array task: K = SLURM_ARRAY_TASK_ID − SLURM_ARRAY_TASK_MIN + 1
 * (MIN taken as 0 when unset), N = SLURM_ARRAY_TASK_COUNT. Null outside a job array.
 */
export function shardFromEnv(env: Record<string, string | undefined>): Shard | null {
  const idText = env.SLURM_ARRAY_TASK_ID;
  const countText = env.SLURM_ARRAY_TASK_COUNT;
  const idSet = idText !== undefined && idText !== '';
  const countSet = countText !== undefined && countText !== '';
  if (!idSet && !countSet) return null;
  if (!idSet || !countSet) {
    // One without the other would run the whole grid in every task of the array (or shard nothing).
    throw new InputError([{
      path: idSet ? 'SLURM_ARRAY_TASK_COUNT' : 'SLURM_ARRAY_TASK_ID',
      value: idSet ? `unset (SLURM_ARRAY_TASK_ID=${idText})` : `unset (SLURM_ARRAY_TASK_COUNT=${countText})`,
      allowed: 'a job-array task needs both variables to know its shard (Slurm sets both for --array jobs); pass --shard K/N explicitly, or --shard 1/1 to run the whole grid',
    }]);
  }
  const id = Number(idText);
  const n = Number(countText);
  const min = env.SLURM_ARRAY_TASK_MIN === undefined || env.SLURM_ARRAY_TASK_MIN === '' ? 0 : Number(env.SLURM_ARRAY_TASK_MIN);
  const k = id - min + 1;
  if (!Number.isSafeInteger(id) || !Number.isSafeInteger(n) || !Number.isSafeInteger(min) || n < 1 || k < 1 || k > n) {
    throw new InputError([{
      path: 'SLURM_ARRAY_TASK_ID',
      value: `${idText} (SLURM_ARRAY_TASK_MIN=${env.SLURM_ARRAY_TASK_MIN ?? 'unset'}, SLURM_ARRAY_TASK_COUNT=${countText})`,
      allowed: 'the array must be contiguous (e.g. --array=0-7 or 1-8) so that task ID − MIN + 1 runs from 1 to COUNT; otherwise pass --shard K/N',
    }]);
  }
  return { k, n };
}

/** An explicit shard (object or "K/N" text) wins; undefined falls back to the Slurm variables; null means no shard. */
export function resolveShard(option: Shard | string | null | undefined, env: Record<string, string | undefined>): Shard | null {
  if (option === null) return null;
  if (typeof option === 'string') return parseShard(option);
  if (option !== undefined) {
    if (!Number.isSafeInteger(option.k) || !Number.isSafeInteger(option.n) || option.n < 1 || option.k < 1 || option.k > option.n) {
      throw new InputError([{ path: 'shard', value: option, allowed: 'expected {k, n} with whole numbers 1 ≤ k ≤ n' }]);
    }
    return { k: option.k, n: option.n };
  }
  return shardFromEnv(env);
}

export function inShard(index: number, shard: Shard | null): boolean {
  return shard === null || index % shard.n === shard.k - 1;
}

/** The cell indices of a shard (all cells without one), ascending. */
export function shardCells(total: number, shard: Shard | null): number[] {
  const out: number[] = [];
  const start = shard === null ? 0 : shard.k - 1;
  const step = shard === null ? 1 : shard.n;
  for (let i = start; i < total; i += step) out.push(i);
  return out;
}

export function shardText(shard: Shard | null): string {
  return shard === null ? 'all cells' : `shard ${shard.k}/${shard.n}`;
}

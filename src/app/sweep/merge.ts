/**
 * `mergeShards`: joins the outputs of the shards of one sweep into the
 * outputs an unsharded run writes (cells.json byte-identical). Refuses, with
 * a clear InputError, folders from different sweeps (scenario hash, seed,
 * version, grid, realizations, mode), shards that overlap, and missing cells.
 */
import { existsSync, readFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { defaultOutDir } from '../defaultOutDir.js';
import { InputError, type FieldProblem } from '../../scenario/errors.js';
import { VERSION } from '../../version.js';
import type { CellResult } from '../../sweep/cellTypes.js';
import { CHECKPOINT_FILE } from './checkpoint.js';
import { OUTPUT_FILES, parseCellsJson, writeSweepOutputs, type SweepRunInfo } from './outputs.js';
import { acquireFolderLock, checkFolderOwner, settleForReading, settleStaging } from './outputFolder.js';
import { capProblems, cellChecker } from '../../sweep/cellChecks.js';
import { checkOutputDir } from '../../io/outputPaths.js';
import { metaDifferences, type SweepMeta } from '../../sweep/sweepMeta.js';
import { scenarioHash } from '../../sweep/canonicalJson.js';
import { parse as parseYaml } from 'yaml';

export interface MergeOutcome {
  outDir: string;
  files: string[];
  meta: SweepMeta;
  results: CellResult[];
  runInfo: SweepRunInfo;
}

interface ShardOutput {
  dir: string;
  meta: SweepMeta;
  cells: CellResult[];
  run: Record<string, unknown> | null;
}

/** List at most a few numbers: "3, 7, 11 and 40 more". */
function listSome(xs: readonly number[], max = 8): string {
  const head = xs.slice(0, max).join(', ');
  return xs.length > max ? `${head} and ${xs.length - max} more` : head;
}

/** The scenario document a shard wrote (scenario.yaml), if any shard has one with the sweep's hash. */
function scenarioDocOf(dirs: readonly string[], hash: string): unknown | null {
  for (const dir of dirs) {
    const path = join(dir, 'scenario.yaml');
    if (!existsSync(path)) continue;
    try {
      const doc = parseYaml(readFileSync(path, 'utf8')) as unknown;
      if (scenarioHash(doc) === hash) return doc;
    } catch {
      // an unreadable copy: try the next shard
    }
  }
  return null;
}

function readShard(dir: string): ShardOutput {
  settleForReading(dir, 'DIR');
  const path = join(dir, 'cells.json');
  if (!existsSync(path)) {
    const unfinished = existsSync(join(dir, CHECKPOINT_FILE));
    throw new InputError([{
      path: dir, value: 'no cells.json',
      allowed: unfinished ? 'that shard has not finished (its checkpoint cells.partial.jsonl is there): resume it with --resume first' : 'expected the output folder of a finished sweep shard (with cells.json and run.json)',
    }]);
  }
  let parsed: { meta: SweepMeta; cells: CellResult[] };
  try {
    parsed = parseCellsJson(readFileSync(path, 'utf8'));
  } catch (e) {
    throw new InputError([{ path, value: 'unreadable', allowed: `expected a moonsieve cells.json (${e instanceof Error ? e.message : String(e)})` }]);
  }
  let run: Record<string, unknown> | null = null;
  try {
    run = JSON.parse(readFileSync(join(dir, 'run.json'), 'utf8')) as Record<string, unknown>;
  } catch {
    run = null;
  }
  return { dir, meta: parsed.meta, cells: parsed.cells, run };
}

/** Merge shard folders `dirs` into `out` (default reports/<scenario slug>/); `force` as for a sweep's --out. */
export function mergeShards(dirs: readonly string[], out?: string, opts: { force?: boolean } = {}): MergeOutcome {
  if (out !== undefined) checkOutputDir('--out', out);
  const t0 = performance.now();
  const started = new Date().toISOString();
  if (dirs.length === 0) throw new InputError([{ path: 'DIR', value: undefined, allowed: 'give the output folders of the shards to merge' }]);
  const shards = dirs.map(readShard);
  const first = shards[0];
  const problems: FieldProblem[] = [];
  for (const s of shards.slice(1)) {
    const diffs = metaDifferences(first.meta, s.meta);
    if (diffs.length > 0) {
      problems.push({ path: s.dir, value: `sweep of "${s.meta.scenario}"`, allowed: `belongs to a different sweep than ${first.dir}: ${diffs.join('; ')}` });
    }
  }
  if (problems.length > 0) throw new InputError(problems, 'merge refused');

  // Every cell of every shard must be a sound result of this grid (cellChecks.ts).
  const checker = cellChecker(first.meta);
  for (const s of shards) s.cells.forEach((c, k) => problems.push(...checker.check(c, `${join(s.dir, 'cells.json')} cell ${k + 1}`)));
  if (problems.length > 0) throw new InputError(capProblems(problems), 'merge refused: damaged cells');

  const total = first.meta.cells;
  const owner = new Map<number, string>();
  const overlaps = new Map<string, number[]>();
  const outside: number[] = [];
  const results: CellResult[] = [];
  for (const s of shards) {
    for (const c of s.cells) {
      if (!Number.isInteger(c.index) || c.index < 0 || c.index >= total) {
        outside.push(c.index);
        continue;
      }
      const prev = owner.get(c.index);
      if (prev !== undefined) {
        const key = `${prev} and ${s.dir}`;
        const list = overlaps.get(key) ?? [];
        list.push(c.index);
        overlaps.set(key, list);
        continue;
      }
      owner.set(c.index, s.dir);
      results.push(c);
    }
  }
  for (const [pair, idx] of overlaps) {
    problems.push({ path: pair, value: `${idx.length} cells in both`, allowed: `shards must not overlap (cells ${listSome(idx)}); merge each shard once, from one sharding (same N)` });
  }
  if (outside.length > 0) problems.push({ path: 'cells', value: listSome(outside), allowed: `cell indices must run from 0 to ${total - 1}` });
  const missing: number[] = [];
  for (let i = 0; i < total; i++) if (!owner.has(i)) missing.push(i);
  if (missing.length > 0) {
    const shardNs = [...new Set(shards.map((s) => (s.run?.shard as { n?: number } | null | undefined)?.n).filter((n) => n !== undefined))];
    const hint = shardNs.length === 1 ? ` (the shards given are ${shards.length} of N = ${shardNs[0]})` : '';
    problems.push({ path: 'cells', value: `${missing.length} of ${total} missing`, allowed: `every cell must come from one shard; missing cells ${listSome(missing)}${hint}` });
  }
  if (problems.length > 0) throw new InputError(problems, 'merge refused');

  results.sort((a, b) => a.index - b.index);
  const meta = first.meta;
  const outDir = out ?? defaultOutDir(meta.scenario);
  if (out === undefined) checkOutputDir('output folder (default from the scenario name)', outDir);
  const force = opts.force === true;
  checkFolderOwner(outDir, meta.scenario_hash, OUTPUT_FILES, CHECKPOINT_FILE, force);
  const runs = shards.map((s) => ({ dir: s.dir, run: s.run }));
  const num = (v: unknown): number => (typeof v === 'number' && Number.isFinite(v) ? v : 0);
  const runInfo: SweepRunInfo = {
    moonsieve_version: VERSION,
    scenario: meta.scenario,
    scenario_hash: meta.scenario_hash,
    seed: meta.seed,
    shard: null,
    workers: Math.max(0, ...shards.map((s) => num(s.run?.workers))),
    host_cores: availableParallelism(),
    started,
    finished: new Date().toISOString(),
    wall_time_s: (performance.now() - t0) / 1000,
    cells_total: total,
    cells: results.length,
    cells_computed: 0,
    cells_resumed: 0,
    realizations: meta.realizations,
    forecast_only: meta.forecast_only,
    false_alarm: meta.false_alarm,
    node_version: process.version,
    merged_from: runs,
  };
  const scenarioDoc = scenarioDocOf(shards.map((s) => s.dir), meta.scenario_hash);
  const lock = acquireFolderLock(outDir, `moonsieve merge (${shards.length} folders)`);
  let files: string[];
  try {
    settleStaging(outDir);
    checkFolderOwner(outDir, meta.scenario_hash, OUTPUT_FILES, CHECKPOINT_FILE, force);
    files = writeSweepOutputs(outDir, meta, results, runInfo, scenarioDoc);
  } finally {
    lock.release();
  }
  return { outDir, files, meta, results, runInfo };
}

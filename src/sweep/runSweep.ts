/**
 * `runSweep`: the injection–recovery sweep of one scenario over its grid.
 * Reads the scenario and its sweep block, picks this run's cells (shard),
 * resumes from a checkpoint if asked, runs the cells on worker threads,
 * streams each finished cell to the checkpoint, and when all of this run's
 * cells are done writes the outputs atomically and removes the checkpoint.
 * Every realization is seeded from (scenario seed, cell, realization) by the
 * runner, so the results do not depend on workers, order, shards or resumes.
 * With the default runner on worker threads, the no-moon calibration sets the
 * cells of this run need are computed first, once each, in chunks over the
 * workers (calibrationPlan.ts, workerPool.ts); they are seeded independently
 * of the worker, so this changes the speed, not the results.
 */
import { existsSync, readFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { performance } from 'node:perf_hooks';
import { defaultOutDir } from '../cli/outputPaths.js';
import { parseYamlWithLines, withLines } from '../scenario/loadScenario.js';
import { InputError } from '../scenario/errors.js';
import { parseScenario } from '../scenario/parseScenario.js';
import type { Scenario } from '../scenario/types.js';
import { VERSION } from '../version.js';
import { scenarioHash } from './canonicalJson.js';
import type { CellResult, CellRunner } from './cellTypes.js';
import { checkpointHeader, checkpointPath, openCheckpoint, readCheckpoint, removeCheckpoint } from './checkpoint.js';
import { writeSweepOutputs, type SweepRunInfo } from './outputs.js';
import { createProgress, formatDuration, type ProgressStream } from './progress.js';
import { inShard, resolveShard, shardCells, type Shard } from './shard.js';
import { buildSweepMeta, type SweepMeta } from './sweepMeta.js';
import { parseSweepSpec, type SweepSpec } from './sweepSpec.js';
import { executeCells, resolveWorkerCount, type CalibrationStats, type RunnerModule } from './workerPool.js';
import { planCalibration } from './calibrationPlan.js';
import { cellTask, prepareJob, type CellJob } from './cellJob.js';
import { nullClassOf } from './runCell.js';

export interface SweepOptions {
  /** Worker threads (default: SLURM_CPUS_PER_TASK when set, else every core). */
  workers?: number | string;
  /** "K/N" or {k, n}; undefined reads the Slurm job-array variables; null forces the whole grid. */
  shard?: Shard | string | null;
  /** Continue from `<out>/cells.partial.jsonl`. Without it an existing checkpoint is refused. */
  resume?: boolean;
  /** Output folder (default reports/<scenario slug>/). */
  out?: string;
  /** No progress output. */
  quiet?: boolean;
  /** Fill cells from the analytic forecast only (passed to the runner). */
  forecastOnly?: boolean;
  /**
   * The per-cell computation: a function runs in the main thread; a module
   * {module, exportName} runs on worker threads; default ./runCell.js on worker threads.
   */
  runner?: CellRunner | RunnerModule;
  /** Stop after this many cells, leaving the checkpoint, as an interruption would (for tests). */
  maxCells?: number;
  /** Abort (e.g. on SIGINT): stop dispatching, stop the workers, keep the checkpoint. */
  signal?: AbortSignal;
  /** Environment for the Slurm variables (default process.env). */
  env?: Record<string, string | undefined>;
  /** Where progress goes (default process.stderr). */
  progress?: ProgressStream;
}

export interface SweepOutcome {
  /** This run's finished cells (all of them when complete), sorted by index. */
  results: CellResult[];
  runInfo: SweepRunInfo;
  /** False when interrupted: the checkpoint is kept and no outputs are written. */
  complete: boolean;
  outDir: string;
  /** Output files written (empty when interrupted). */
  files: string[];
  meta: SweepMeta;
  /** Cells this run (shard) must do, and how many are done. */
  cellsInRun: number;
  cellsDone: number;
  /** The no-moon calibration pre-pass on the workers (null: none, e.g. a custom runner or the main thread). */
  calibration: CalibrationStats | null;
}

export interface LoadedSweep {
  doc: unknown;
  scenario: Scenario;
  spec: SweepSpec;
  hash: string;
}

/** Read a scenario (file path or document) and its sweep block; InputError on any problem. */
export function loadSweep(scenarioDocOrPath: unknown): LoadedSweep {
  let doc: unknown;
  let scenario: Scenario;
  let source = 'scenario';
  if (typeof scenarioDocOrPath === 'string') {
    source = scenarioDocOrPath;
    let text: string;
    try {
      text = readFileSync(scenarioDocOrPath, 'utf8');
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      throw new InputError([{ path: 'SCENARIO', value: scenarioDocOrPath, allowed: code === 'ENOENT' ? 'no such file' : `cannot read it (${code ?? String(e)})` }]);
    }
    const parsed = parseYamlWithLines(text, source);
    doc = parsed.value;
    try {
      scenario = parseScenario(doc, source);
      return { doc, scenario, spec: parseSweepSpec(doc, scenario, source), hash: scenarioHash(doc) };
    } catch (e) {
      if (e instanceof InputError) throw withLines(e, (p) => parsed.positionOf(p.replace(/\[(\d+)\]/g, '.$1').replace(/ \(default\)/, '')), source);
      throw e;
    }
  }
  doc = scenarioDocOrPath;
  scenario = parseScenario(doc, source);
  return { doc, scenario, spec: parseSweepSpec(doc, scenario, source), hash: scenarioHash(doc) };
}

export async function runSweep(scenarioDocOrPath: unknown, options: SweepOptions = {}): Promise<SweepOutcome> {
  const startedMs = Date.now();
  const t0 = performance.now();
  const env = options.env ?? process.env;
  const { doc, scenario, spec, hash } = loadSweep(scenarioDocOrPath);
  const shard = resolveShard(options.shard, env);
  const workers = resolveWorkerCount(options.workers, env);
  if (options.maxCells !== undefined && !(Number.isInteger(options.maxCells) && options.maxCells >= 0)) {
    throw new RangeError(`maxCells must be an integer ≥ 0, got ${options.maxCells}`);
  }
  const forecastOnly = options.forecastOnly === true;
  const meta = buildSweepMeta(scenario, hash, spec, forecastOnly);
  const outDir = options.out ?? defaultOutDir(scenario.name);
  const cpPath = checkpointPath(outDir);
  const header = checkpointHeader(meta, shard);

  if (existsSync(cpPath) && !options.resume) {
    throw new InputError([{
      path: cpPath,
      value: 'an unfinished sweep checkpoint',
      allowed: 'pass --resume to continue that sweep, or delete the file (or choose another --out) to start afresh',
    }]);
  }
  const mine = (i: number): boolean => i >= 0 && i < meta.cells && inShard(i, shard);
  const resumed = options.resume ? readCheckpoint(cpPath, header, mine) : [];
  const done = new Set(resumed.map((r) => r.index));
  const runCells = shardCells(meta.cells, shard);
  const pending = runCells.filter((i) => !done.has(i));
  const results: CellResult[] = [...resumed];

  const progress = createProgress({
    total: runCells.length,
    initial: resumed.length,
    stream: options.progress ?? process.stderr,
    quiet: options.quiet,
  });
  const job: CellJob = {
    baseDoc: doc,
    axes: spec.axes.map((a) => ({ field: a.field, write: a.write, values: a.values })),
    ctx: {
      seed: scenario.seed, realizations: spec.realizations, simulateUnstable: spec.simulateUnstable, forecastOnly,
      ...(spec.nullRealizations !== null ? { nullRealizations: spec.nullRealizations } : {}),
    },
  };
  // Parse one cell here, so that the unit values its axis fields use are known to this thread and
  // handed to the workers (units.ts); a cell that does not parse is reported by the runner instead.
  try {
    if (meta.cells > 0) parseScenario(cellTask(prepareJob(job), runCells[0] ?? 0).scenarioDoc);
  } catch {
    // the runner reports it, with the cell's index
  }
  // The default runner on worker threads: compute each no-moon calibration set once, spread over the workers.
  const calibration = options.runner === undefined && !forecastOnly
    ? (cells: readonly number[], threads: number) => {
      const prepared = prepareJob(job);
      return planCalibration(cells, (i) => nullClassOf(cellTask(prepared, i), job.ctx), { workers: threads });
    }
    : undefined;
  const writer = openCheckpoint(cpPath, header, resumed);
  let outcome: Awaited<ReturnType<typeof executeCells>>;
  let calibrationStartMs = 0;
  try {
    outcome = await executeCells({
      pending,
      job,
      runner: options.runner,
      workers,
      maxCells: options.maxCells,
      signal: options.signal,
      calibration,
      onCalibration: (e) => {
        if (e.stage === 'start') {
          calibrationStartMs = performance.now();
          progress.note(`calibrating false alarms: ${e.plan.realizations} no-moon realizations (${e.plan.classes} scenario${e.plan.classes === 1 ? '' : 's'} without the moon, ${e.plan.chunks} chunks on ${e.threads} worker${e.threads === 1 ? '' : 's'})`);
        } else {
          progress.note(`false alarms calibrated: ${e.plan.realizations} no-moon realizations in ${formatDuration((performance.now() - calibrationStartMs) / 1000)}`);
        }
      },
      onResult: (r) => {
        writer.append(r);
        results.push(r);
        progress.update(results.length);
      },
    });
  } finally {
    writer.close();
  }
  results.sort((a, b) => a.index - b.index);
  const complete = outcome.completed && results.length === runCells.length;
  progress.finish(results.length);

  const runInfo: SweepRunInfo = {
    moonsieve_version: VERSION,
    scenario: scenario.name,
    scenario_hash: hash,
    seed: scenario.seed,
    shard,
    workers: outcome.threads,
    host_cores: availableParallelism(),
    started: new Date(startedMs).toISOString(),
    finished: new Date().toISOString(),
    wall_time_s: (performance.now() - t0) / 1000,
    cells_total: meta.cells,
    cells: results.length,
    cells_computed: results.length - resumed.length,
    cells_resumed: resumed.length,
    realizations: spec.realizations,
    forecast_only: forecastOnly,
    false_alarm: scenario.detection.falseAlarm,
    node_version: process.version,
  };
  let files: string[] = [];
  if (complete) {
    files = writeSweepOutputs(outDir, meta, results, runInfo, doc);
    removeCheckpoint(cpPath);
  }
  return { results, runInfo, complete, outDir, files, meta, cellsInRun: runCells.length, cellsDone: results.length, calibration: outcome.calibration };
}

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
 * Before any work: the sizes are checked (sizeLimits.ts), every cell of the
 * grid is parsed, and the output folder is checked and locked (outputFolder.ts).
 */
import { existsSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { availableParallelism } from 'node:os';
import { performance } from 'node:perf_hooks';
import { defaultOutDir } from '../defaultOutDir.js';
import { parseYamlWithLines, withLines } from '../../scenario/loadScenario.js';
import { describeValue, InputError, type FieldProblem } from '../../scenario/errors.js';
import { checkOutputDir } from '../../io/outputPaths.js';
import { axisDisplay, formatDisplay } from '../../report/axisDisplay.js';
import { checkGridSize, checkNullRealizations, MAX_NULL_REALIZATIONS } from '../../sweep/sizeLimits.js';
import { acquireFolderLock, checkFolderOwner, NULLSET_DIR, settleStaging } from './outputFolder.js';
import { openNullStore } from './nullStore.js';
import { parseScenario } from '../../scenario/parseScenario.js';
import type { Scenario, ScenarioDocument } from '../../scenario/types.js';
import { scenarioDocumentOf } from '../../scenario/scenarioDocument.js';
import { VERSION } from '../../version.js';
import { scenarioHash } from '../../sweep/canonicalJson.js';
import type { CellResult, CellRunner } from '../../sweep/cellTypes.js';
import { CHECKPOINT_FILE, checkpointHeader, checkpointPath, openCheckpoint, readCheckpoint, removeCheckpoint } from './checkpoint.js';
import { OUTPUT_FILES, writeSweepOutputs, type SweepRunInfo } from './outputs.js';
import { createProgress, formatDuration, type ProgressStream } from './progress.js';
import { inShard, resolveShard, shardCells, type Shard } from '../../sweep/shard.js';
import { buildSweepMeta, type SweepMeta } from '../../sweep/sweepMeta.js';
import { buildSummary, type SweepSummary } from '../../report/summary.js';
import { parseSweepSpec, type SweepSpec } from '../../sweep/sweepSpec.js';
import { executeCells, resolveWorkerCount, type CalibrationStats, type RunnerModule } from './workerPool.js';
import { planCalibration } from '../../sweep/calibrationPlan.js';
import { cellTask, prepareJob, type CellJob } from '../../sweep/cellJob.js';
import { cellComputeProblems, nullClassOf } from '../../sweep/runCell.js';

export interface SweepOptions {
  /** Worker threads (default: SLURM_CPUS_PER_TASK when set, else every core). */
  workers?: number | string;
  /** "K/N" or {k, n}; undefined reads the Slurm job-array variables; null forces the whole grid. */
  shard?: Shard | string | null;
  /** Continue from `<out>/cells.partial.jsonl`. Without it an existing checkpoint is refused. */
  resume?: boolean;
  /** Output folder (default reports/<scenario slug>/). */
  out?: string;
  /** Write into a folder holding another sweep's results or other files, or discard its checkpoint. */
  force?: boolean;
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
  /** Whether a checkpoint was left to resume from (false when complete, or stopped before any was written). */
  checkpointKept: boolean;
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
  /** The scenario's document (`Scenario.document`): its sweep block, its hash and `scenario.yaml` come from it. */
  doc: ScenarioDocument;
  scenario: Scenario;
  spec: SweepSpec;
  hash: string;
}

/**
 * Read a scenario (a file path, or a Scenario from parseScenario / loadScenario) and its
 * sweep block (the `sweep:` block of the file, or of the document the Scenario was parsed
 * from); InputError on any problem.
 */
export function loadSweep(scenarioOrPath: Scenario | string): LoadedSweep {
  if (typeof scenarioOrPath === 'string') {
    const source = scenarioOrPath;
    let text: string;
    try {
      text = readFileSync(scenarioOrPath, 'utf8');
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      throw new InputError([{ path: 'SCENARIO', value: scenarioOrPath, allowed: code === 'ENOENT' ? 'no such file' : `cannot read it (${code ?? String(e)})` }]);
    }
    const parsed = parseYamlWithLines(text, source);
    try {
      const scenario = parseScenario(parsed.value, source);
      const doc = scenarioDocumentOf(scenario);
      return { doc, scenario, spec: parseSweepSpec(doc, scenario, source), hash: scenarioHash(doc) };
    } catch (e) {
      if (e instanceof InputError) throw withLines(e, (p) => parsed.positionOf(p.replace(/\[(\d+)\]/g, '.$1').replace(/ \(default\)/, '')), source);
      throw e;
    }
  }
  const scenario = scenarioOrPath;
  const doc = scenarioDocumentOf(scenario);
  return { doc, scenario, spec: parseSweepSpec(doc, scenario, 'scenario'), hash: scenarioHash(doc) };
}

/** One line per grid cell whose scenario is invalid, naming its axis values; plus the null classes of `classCells`. */
async function validateCells(
  job: CellJob, meta: SweepMeta, total: number, classCells: ReadonlySet<number>, withClasses: boolean, signal: AbortSignal | undefined,
): Promise<{ aborted: boolean; classes: Map<number, { key: string; count: number } | null> }> {
  const prepared = prepareJob(job);
  const displays = meta.axes.map((a) => axisDisplay(a));
  const classes = new Map<number, { key: string; count: number } | null>();
  const bad: FieldProblem[] = [];
  let badCells = 0;
  for (let i = 0; i < total; i++) {
    if (i % 256 === 255) {
      // Let Ctrl-C (and other events) through on large grids.
      await new Promise<void>((r) => setImmediate(r));
      if (signal?.aborted) return { aborted: true, classes };
    }
    const coords = prepared.grid.cellCoords(i);
    const where = (): string => `cell ${i} (${meta.axes.map((a, k) => `${a.field} = ${formatDisplay(displays[k], coords[k])}`).join(', ')})`;
    try {
      // The cell's scenario: the axis values applied and validated with the scenario's own checks.
      const task = cellTask(prepared, i);
      // The scenario's own checks, then what the simulation itself would refuse (a cadence no shorter
      // than the transit, a light curve above the size limit), so no cell fails after work has begun.
      const computeProblems = cellComputeProblems(task);
      if (computeProblems.length > 0) throw new InputError(computeProblems);
      if (withClasses && classCells.has(i)) {
        const c = nullClassOf(task, job.ctx);
        classes.set(i, c === null ? null : { key: c.key, count: c.count });
        if (c !== null && c.count > MAX_NULL_REALIZATIONS) {
          checkNullRealizations(c.count, task.scenario.detection.falseAlarm, job.ctx.nullRealizations !== undefined);
        }
      }
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      badCells++;
      if (bad.length < 20) {
        const first = e.problems[0];
        bad.push({
          path: where(),
          value: typeof first?.value === 'string' && first.value.length > 60 ? first.value.slice(0, 57) + '...' : first?.value,
          allowed: e.problems.map((p, k) => (k === 0 ? `${p.path}: ${p.allowed}` : `also ${p.path} = ${describeValue(p.value)}: ${p.allowed}`)).join('; '),
        });
      }
    }
  }
  if (badCells > 0) {
    if (badCells > bad.length) bad.push({ path: '…', value: `${badCells - bad.length} more cells`, allowed: 'invalid too (not listed)' });
    throw new InputError(bad, `${badCells} of ${total} grid cells are invalid (change the axis ranges so every cell is a valid scenario); nothing was run`);
  }
  return { aborted: false, classes };
}

/**
 * Run the sweep of `scenario` (a file path, or a Scenario from parseScenario / loadScenario,
 * whose document holds the `sweep:` block) and write its outputs into the output folder
 * (see the file comment; `runSweepInMemory` writes nothing).
 */
/**
 * The sweep's meta after the checks made before any cell is parsed: the old spellings of the
 * sweep block noted on the progress stream (even with quiet; not part of the sweep's identity),
 * the grid size, and the no-moon count (with a false-alarm axis each cell's own count is
 * checked with the cells).
 */
function sweepMetaChecked(l: Pick<LoadedSweep, 'scenario' | 'spec' | 'hash'>, forecastOnly: boolean, progress: ProgressStream | undefined): SweepMeta {
  for (const d of l.spec.deprecations) (progress ?? process.stderr).write(`note: ${d}\n`);
  // Sizes first: nothing is parsed per cell nor written before a run known to fit.
  checkGridSize(l.spec.axes.map((a) => a.values.length));
  const meta = buildSweepMeta(l.scenario, l.hash, l.spec, forecastOnly);
  if (!forecastOnly && !l.spec.axes.some((a) => a.field === 'detection.false_alarm')) {
    checkNullRealizations(meta.no_moon_realizations, l.scenario.detection.falseAlarm, l.spec.nullRealizations !== null);
  }
  return meta;
}

/** What every thread needs to run any cell of the sweep (plain data, sent once to each worker). */
function sweepJob(l: Pick<LoadedSweep, 'doc' | 'scenario' | 'spec'>, forecastOnly: boolean): CellJob {
  return {
    baseDocument: l.doc,
    axes: l.spec.axes.map((a) => ({ field: a.field, write: a.write, values: a.values })),
    ctx: {
      seed: l.scenario.seed, realizations: l.spec.realizations, simulateUnstable: l.spec.simulateUnstable, forecastOnly,
      ...(l.spec.nullRealizations !== null ? { nullRealizations: l.spec.nullRealizations } : {}),
    },
  };
}

export async function runSweep(scenarioOrPath: Scenario | string, options: SweepOptions = {}): Promise<SweepOutcome> {
  const startedMs = Date.now();
  const t0 = performance.now();
  const env = options.env ?? process.env;
  const { doc, scenario, spec, hash } = loadSweep(scenarioOrPath);
  const shard = resolveShard(options.shard, env);
  const workers = resolveWorkerCount(options.workers, env);
  if (options.maxCells !== undefined && !(Number.isInteger(options.maxCells) && options.maxCells >= 0)) {
    throw new RangeError(`maxCells must be an integer ≥ 0, got ${options.maxCells}`);
  }
  const forecastOnly = options.forecastOnly === true;
  const force = options.force === true;
  const meta = sweepMetaChecked({ scenario, spec, hash }, forecastOnly, options.progress);
  const outDir = options.out ?? defaultOutDir(scenario.name);
  checkOutputDir(options.out === undefined ? 'output folder (default from the scenario name)' : '--out', outDir);
  checkFolderOwner(outDir, hash, OUTPUT_FILES, CHECKPOINT_FILE, force, { resume: options.resume === true, shard });
  const cpPath = checkpointPath(outDir);
  const header = checkpointHeader(meta, shard);
  const runCells = shardCells(meta.cells, shard);

  const job = sweepJob({ doc, scenario, spec }, forecastOnly);
  // Every cell of the grid is parsed here, before anything is written: a cell that is invalid only at
  // some axis values is refused now, not in a worker after minutes (and again on --resume). This also
  // makes the unit values the axis fields use known to this thread, to hand to the workers (units.ts),
  // and gives each cell of this run its null class for the calibration plan.
  const useCalibration = options.runner === undefined && !forecastOnly;
  const checked = await validateCells(job, meta, meta.cells, new Set(runCells), useCalibration, options.signal);

  const runInfoOf = (results: readonly CellResult[], resumedCount: number, threads: number): SweepRunInfo => ({
    moonsieve_version: VERSION,
    scenario: scenario.name,
    scenario_hash: hash,
    seed: scenario.seed,
    shard,
    workers: threads,
    host_cores: availableParallelism(),
    started: new Date(startedMs).toISOString(),
    finished: new Date().toISOString(),
    wall_time_s: (performance.now() - t0) / 1000,
    cells_total: meta.cells,
    cells: results.length,
    cells_computed: results.length - resumedCount,
    cells_resumed: resumedCount,
    realizations: spec.realizations,
    forecast_only: forecastOnly,
    false_alarm: scenario.detection.falseAlarm,
    node_version: process.version,
  });
  if (checked.aborted) {
    return { results: [], runInfo: runInfoOf([], 0, 0), complete: false, checkpointKept: false, outDir, files: [], meta, cellsInRun: runCells.length, cellsDone: 0, calibration: null };
  }

  // One run per folder: held until the outputs are written (or the run stops).
  const lock = acquireFolderLock(outDir, `moonsieve sweep ${typeof scenarioOrPath === 'string' ? scenarioOrPath : `"${scenario.name}"`}${shard ? ` --shard ${shard.k}/${shard.n}` : ''}`);
  try {
    settleStaging(outDir);
    checkFolderOwner(outDir, hash, OUTPUT_FILES, CHECKPOINT_FILE, force, { resume: options.resume === true, shard }); // again, now that no other run can write
    const nullDir = join(outDir, NULLSET_DIR);
    if (existsSync(cpPath) && !options.resume) {
      if (!force) {
        throw new InputError([{
          path: cpPath,
          value: 'an unfinished sweep checkpoint',
          allowed: 'pass --resume to continue that sweep, or --force to discard it and start afresh (or choose another --out)',
        }]);
      }
      removeCheckpoint(cpPath);
    }
    // Saved no-moon sets belong to the checkpoint: kept for a resume only.
    if (!options.resume) rmSync(nullDir, { recursive: true, force: true });
    const mine = (i: number): boolean => i >= 0 && i < meta.cells && inShard(i, shard);
    const resumed = options.resume ? readCheckpoint(cpPath, header, mine) : [];
    const done = new Set(resumed.map((r) => r.index));
    const pending = runCells.filter((i) => !done.has(i));
    const results: CellResult[] = [...resumed];

    const progress = createProgress({
      total: runCells.length,
      initial: resumed.length,
      stream: options.progress ?? process.stderr,
      quiet: options.quiet,
    });
    // The default runner on worker threads: compute each no-moon calibration set once, spread over the workers.
    const calibration = useCalibration
      ? (cells: readonly number[], threads: number) => planCalibration(cells, (i) => checked.classes.get(i) ?? null, { workers: threads })
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
        nullStore: useCalibration ? openNullStore(nullDir) : undefined,
        onCalibration: (e) => {
          if (e.stage === 'start') {
            calibrationStartMs = performance.now();
            const back = e.resumed > 0 ? `, ${e.resumed} of them read back from the interrupted run` : '';
            progress.note(`calibrating false alarms: ${e.plan.realizations} no-moon realizations (${e.plan.classes} scenario${e.plan.classes === 1 ? '' : 's'} without the moon, ${e.plan.chunks} chunks on ${e.threads} worker${e.threads === 1 ? '' : 's'}${back})`);
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

    const runInfo = runInfoOf(results, resumed.length, outcome.threads);
    let files: string[] = [];
    if (complete) {
      files = writeSweepOutputs(outDir, meta, results, runInfo, doc);
      removeCheckpoint(cpPath);
      rmSync(nullDir, { recursive: true, force: true });
    }
    return { results, runInfo, complete, checkpointKept: !complete, outDir, files, meta, cellsInRun: runCells.length, cellsDone: results.length, calibration: outcome.calibration };
  } finally {
    lock.release();
  }
}

export interface InMemorySweepOptions {
  /** Worker threads (default: SLURM_CPUS_PER_TASK when set in `env`, else every core). */
  workers?: number | string;
  /** Fill cells from the analytic forecast only. */
  forecastOnly?: boolean;
  /** The per-cell computation, as in `SweepOptions.runner` (default ./runCell.js on worker threads). */
  runner?: CellRunner | RunnerModule;
  /** Abort: stop dispatching and stop the workers; the promise then rejects. */
  signal?: AbortSignal;
  /** Environment for SLURM_CPUS_PER_TASK (default process.env). */
  env?: Record<string, string | undefined>;
  /** Where the sweep block's deprecation notes go (default process.stderr); the run itself prints no progress. */
  progress?: ProgressStream;
}

/** A whole sweep computed in memory. */
export interface InMemorySweep {
  /** Every cell of the grid, sorted by index: the `cells` of the cells.json a file run with the same scenario writes. */
  cells: CellResult[];
  /** What summary.json holds for these cells. */
  summary: SweepSummary;
  /** The sweep's identity (cells.json's `meta`). */
  meta: SweepMeta;
  /** The no-moon calibration pre-pass on the workers (null: none). */
  calibration: CalibrationStats | null;
}

/**
 * Run the whole grid of the sweep of `scenario` (a file path, or a Scenario from parseScenario /
 * loadScenario whose document holds the `sweep:` block) and return its cells and summary,
 * writing nothing: no output folder, no checkpoint, no lock. The cells are those `runSweep`
 * writes to cells.json for the same scenario and seed (same seeding per cell and realization,
 * the same validation of every cell first); an interruption cannot be resumed.
 * Throws InputError for bad input, and an Error naming the signal when aborted.
 */
export async function runSweepInMemory(scenarioOrPath: Scenario | string, options: InMemorySweepOptions = {}): Promise<InMemorySweep> {
  const env = options.env ?? process.env;
  const loaded = loadSweep(scenarioOrPath);
  const workers = resolveWorkerCount(options.workers, env);
  const forecastOnly = options.forecastOnly === true;
  const meta = sweepMetaChecked(loaded, forecastOnly, options.progress);
  const job = sweepJob(loaded, forecastOnly);
  const all = shardCells(meta.cells, null);
  const useCalibration = options.runner === undefined && !forecastOnly;
  const checked = await validateCells(job, meta, meta.cells, new Set(all), useCalibration, options.signal);
  const aborted = (): Error => new Error(`the sweep of "${loaded.scenario.name}" was aborted; nothing was kept`);
  if (checked.aborted) throw aborted();
  const results: CellResult[] = [];
  const outcome = await executeCells({
    pending: all,
    job,
    runner: options.runner,
    workers,
    signal: options.signal,
    calibration: useCalibration ? (cells, threads) => planCalibration(cells, (i) => checked.classes.get(i) ?? null, { workers: threads }) : undefined,
    onResult: (r) => results.push(r),
  });
  if (!outcome.completed || results.length !== all.length) throw aborted();
  results.sort((a, b) => a.index - b.index);
  return { cells: results, summary: buildSummary(meta, results), meta, calibration: outcome.calibration };
}

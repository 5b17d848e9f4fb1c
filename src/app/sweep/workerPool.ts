/**
 * Runs the cells of a sweep: on a pool of worker threads (dynamic dispatch:
 * each worker is handed the next cell when it reports its previous result),
 * or in the main thread when the runner is a function (tests, small library
 * calls). Results are handed to `onResult` in completion order; their content
 * does not depend on the path, the worker count or the order.
 *
 * With a calibration plan (calibrationPlan.ts) the pool first has the workers
 * compute chunks of no-moon realizations, joins each class's chunks in
 * realization order into SharedArrayBuffer-backed sets, posts them to every
 * worker, and only then dispatches the cells of that phase; the next phase's
 * chunks fill workers that would otherwise wait. A phase's sets are dropped
 * when its cells are done.
 */
import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { dirname, isAbsolute, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import { InputError, type FieldProblem } from '../../scenario/errors.js';
import type { CellResult, CellRunner } from '../../sweep/cellTypes.js';
import { prepareJob, runOneCell, type CellJob } from '../../sweep/cellJob.js';
import type { WorkerInit } from './worker.js';
import type { FromWorker, ToWorker } from './workerMessages.js';
import type { CalibrationClassPlan, CalibrationPlan } from '../../sweep/calibrationPlan.js';
import { unitValueEntries } from '../../scenario/units.js';
import { joinNullRanges, type PackedNullRange } from '../../sweep/nullSet.js';
import type { NullStore } from './nullStore.js';

/** A runner that worker threads load by module: a path or file: URL, and its export (default `runCell`). */
export interface RunnerModule {
  module: string;
  exportName?: string;
}

export interface ExecuteOptions {
  /** Cell indices to run, in dispatch order. */
  pending: readonly number[];
  job: CellJob;
  /** A function runs in the main thread; a module (or undefined: ./runCell.js) runs in worker threads. */
  runner?: CellRunner | RunnerModule;
  workers: number;
  /** Stop (as if interrupted) after this many cells. */
  maxCells?: number;
  signal?: AbortSignal;
  onResult: (result: CellResult) => void;
  /**
   * Plan the no-moon calibration pre-pass for the cells this call will run (in
   * dispatch order) on `threads` workers; worker threads only (a runner in the
   * main thread computes and caches its own sets).
   */
  calibration?: (cells: readonly number[], threads: number) => CalibrationPlan;
  /** Where finished chunks of no-moon realizations are saved and read back on a resume (nullStore.ts). */
  nullStore?: NullStore;
  /** Told when the pre-pass starts and when every null set is complete. */
  onCalibration?: (e: { stage: 'start' | 'done'; plan: CalibrationPlan; threads: number; resumed: number }) => void;
}

/** What the calibration pre-pass did. */
export interface CalibrationStats {
  /** Null classes, realizations and chunks computed on the workers. */
  classes: number;
  realizations: number;
  chunks: number;
  /** Cells whose runner found no provided set and computed its own (0 when the pre-pass covered every cell). */
  fallbackCells: number;
  /** Realizations read back from the null-set checkpoint instead of computed. */
  resumedRealizations: number;
}

export interface ExecuteOutcome {
  /** True when every pending cell ran. */
  completed: boolean;
  /** Worker threads used (0: the main thread ran the cells). */
  threads: number;
  /** The calibration pre-pass, or null when there was none. */
  calibration: CalibrationStats | null;
}

/** --workers, else SLURM_CPUS_PER_TASK, else os.availableParallelism(). */
export function resolveWorkerCount(option: number | string | undefined, env: Record<string, string | undefined>): number {
  if (option !== undefined) {
    const n = typeof option === 'number' ? option : Number(option);
    if (!Number.isSafeInteger(n) || n < 1 || n > 1024) {
      throw new InputError([{ path: '--workers', value: option, allowed: 'expected a whole number of worker threads from 1 to 1024' }]);
    }
    return n;
  }
  const slurm = env.SLURM_CPUS_PER_TASK;
  if (slurm !== undefined && slurm !== '') {
    const n = Number(slurm);
    if (Number.isSafeInteger(n) && n >= 1 && n <= 1024) return n;
    throw new InputError([{
      path: 'SLURM_CPUS_PER_TASK', value: slurm,
      allowed: 'expected a whole number of CPUs from 1 to 1024 (set by #SBATCH --cpus-per-task=N); fix or unset the variable, or pass --workers N',
    }]);
  }
  return availableParallelism();
}

/**
 * The compiled worker script. From dist/ this is ./worker.js beside this file;
 * from the TypeScript sources (vitest) it is the matching file under dist/,
 * since worker threads cannot load .ts files.
 */
export function workerScriptUrl(): URL {
  const here = fileURLToPath(import.meta.url);
  if (!here.endsWith('.ts')) return new URL('./worker.js', import.meta.url);
  const root = resolve(dirname(here), '..', '..', '..');
  const built = join(root, 'dist', 'src', 'app', 'sweep', 'worker.js');
  if (!existsSync(built)) {
    throw new Error(`the sweep workers run compiled JavaScript, and ${built} does not exist: run "npm run build" first`);
  }
  return pathToFileURL(built);
}

function moduleUrl(m: RunnerModule): string {
  if (/^file:/.test(m.module)) return m.module;
  return pathToFileURL(isAbsolute(m.module) ? m.module : resolve(m.module)).href;
}

function errorFromWorker(msg: Extract<FromWorker, { type: 'error' }>): Error {
  if (msg.name === 'InputError' && Array.isArray(msg.problems)) {
    return new InputError(msg.problems as FieldProblem[], msg.index >= 0 ? `cell ${msg.index}` : 'cell runner');
  }
  const where = msg.index >= 0 ? `cell ${msg.index} failed` : 'the cell runner could not be loaded';
  const e = new Error(`${where}: ${msg.message}`);
  if (msg.stack) e.stack = `${e.message}\n  [in worker] ${msg.stack}`;
  return e;
}

export async function executeCells(o: ExecuteOptions): Promise<ExecuteOutcome> {
  const limit = Math.min(o.pending.length, o.maxCells ?? Number.POSITIVE_INFINITY);
  if (typeof o.runner === 'function') return runInMainThread(o, o.runner, limit);
  if (limit === 0) return { completed: o.pending.length === 0, threads: 0, calibration: null };
  return runInWorkers(o, o.runner, limit);
}

async function runInMainThread(o: ExecuteOptions, runner: CellRunner, limit: number): Promise<ExecuteOutcome> {
  const prepared = prepareJob(o.job);
  for (let i = 0; i < limit; i++) {
    if (o.signal?.aborted) return { completed: false, threads: 0, calibration: null };
    o.onResult(runOneCell(runner, prepared, o.pending[i]));
    // Let signal handlers run between cells.
    await new Promise<void>((r) => setImmediate(r));
  }
  return { completed: limit === o.pending.length && !o.signal?.aborted, threads: 0, calibration: null };
}

interface PhaseState {
  classes: CalibrationClassPlan[];
  cells: number[];
  /** Next cell to dispatch. */
  nextCell: number;
  cellsDone: number;
  chunks: Array<{ id: number; cell: number; start: number; n: number }>;
  /** Next chunk to dispatch. */
  nextChunk: number;
  chunksLeft: number;
  /** Received chunk ranges, per class (released once joined). */
  ranges: PackedNullRange[][] | null;
  ready: boolean;
}

function runInWorkers(o: ExecuteOptions, runner: RunnerModule | undefined, limit: number): Promise<ExecuteOutcome> {
  const threads = Math.max(1, Math.min(o.workers, limit));
  const cells = o.pending.slice(0, limit);
  const planned = o.calibration ? o.calibration(cells, threads) : null;
  const plan = planned && planned.classes > 0 ? planned : null;
  const init: WorkerInit = {
    job: o.job,
    runnerModule: runner ? moduleUrl(runner) : null,
    runnerExport: runner?.exportName ?? 'runCell',
    calibrate: plan !== null,
    unitValues: unitValueEntries(),
  };
  // Phases: the plan's, or one phase of every cell when there is nothing to calibrate.
  const chunkTable: Array<{ phase: number; cls: number; start: number; n: number }> = [];
  let resumedRealizations = 0;
  const phases: PhaseState[] = (plan ? plan.phases : [{ classes: [], cells }]).map((ph, p) => {
    const chunks: PhaseState['chunks'] = [];
    const ranges: PackedNullRange[][] = ph.classes.map(() => []);
    ph.classes.forEach((c, k) => {
      // Realizations saved by an earlier, interrupted run are read back; only the gaps are computed.
      const have = o.nullStore ? o.nullStore.load(c.key, c.count) : [];
      ranges[k].push(...have);
      const size = c.chunks[0]?.n ?? c.count;
      let at = 0;
      const todo = (from: number, to: number): void => {
        for (let start = from; start < to; start += size) {
          const n = Math.min(size, to - start);
          chunks.push({ id: chunkTable.length, cell: c.cell, start, n });
          chunkTable.push({ phase: p, cls: k, start, n });
        }
      };
      for (const r of have) {
        todo(at, r.start);
        at = r.start + r.n;
        resumedRealizations += r.n;
      }
      todo(at, c.count);
    });
    return {
      classes: ph.classes, cells: ph.cells, nextCell: 0, cellsDone: 0, chunks, nextChunk: 0, chunksLeft: chunks.length,
      ranges, ready: chunks.length === 0,
    };
  });
  const phaseOfCell = new Map<number, number>();
  phases.forEach((ph, p) => ph.cells.forEach((c) => phaseOfCell.set(c, p)));
  const stats: CalibrationStats | null = plan ? { classes: plan.classes, realizations: plan.realizations, chunks: plan.chunks, fallbackCells: 0, resumedRealizations } : null;
  /** Complete sets the workers hold, by phase (a phase read back whole from the store is complete at once). */
  const live = new Map<number, Array<{ key: string; set: PackedNullRange }>>();
  phases.forEach((ph, p) => {
    if (ph.ready && ph.classes.length > 0) {
      live.set(p, ph.classes.map((c, k) => ({ key: c.key, set: joinNullRanges(ph.ranges![k], c.count, true) })));
      ph.ranges = null;
    }
  });
  const script = workerScriptUrl();
  return new Promise<ExecuteOutcome>((resolvePromise, rejectPromise) => {
    const workers: Worker[] = [];
    let received = 0;
    let settled = false;
    let pendingPhases = phases.filter((ph) => !ph.ready).length;
    /** The first phase with cells still to dispatch. */
    let cp = 0;
    const started = new Set<Worker>();
    const stopped = new Set<Worker>();
    const idle = new Set<Worker>();
    const busy = new Set<Worker>();
    const finish = (err: Error | null, completed: boolean): void => {
      if (settled) return;
      settled = true;
      o.signal?.removeEventListener('abort', onAbort);
      void Promise.all(workers.map((w) => w.terminate())).then(() => {
        if (err) rejectPromise(err);
        else resolvePromise({ completed, threads, calibration: stats });
      });
    };
    const onAbort = (): void => finish(null, false);
    const send = (w: Worker, m: ToWorker): void => w.postMessage(m);
    const broadcast = (m: ToWorker): void => {
      for (const w of started) if (!stopped.has(w)) send(w, m);
    };
    /** Give `w` its next piece of work: a cell of a ready phase, else a chunk (this phase's, then the next's), else wait or stop. */
    const dispatch = (w: Worker): void => {
      while (cp < phases.length && phases[cp].nextCell >= phases[cp].cells.length) cp++;
      if (cp >= phases.length) {
        idle.delete(w);
        busy.delete(w);
        stopped.add(w);
        send(w, { type: 'stop' });
        return;
      }
      const ph = phases[cp];
      if (ph.ready) {
        idle.delete(w);
        busy.add(w);
        send(w, { type: 'cell', index: ph.cells[ph.nextCell++] });
        return;
      }
      for (const q of [ph, phases[cp + 1]]) {
        if (q && q.nextChunk < q.chunks.length) {
          const c = q.chunks[q.nextChunk++];
          idle.delete(w);
          busy.add(w);
          send(w, { type: 'nullChunk', id: c.id, cell: c.cell, start: c.start, n: c.n });
          return;
        }
      }
      busy.delete(w);
      idle.add(w);
    };
    const onChunk = (w: Worker, msg: Extract<FromWorker, { type: 'nullChunk' }>): void => {
      const entry = chunkTable[msg.id];
      const ph = phases[entry.phase];
      const cls = ph.classes[entry.cls];
      if (msg.key !== cls.key || msg.range.start !== entry.start || msg.range.n !== entry.n) {
        throw new Error(`a worker returned no-moon realizations for another class or range than asked (cell ${cls.cell}, from ${entry.start})`);
      }
      o.nullStore?.save(cls.key, msg.range);
      ph.ranges![entry.cls].push(msg.range);
      if (--ph.chunksLeft === 0) {
        const sets = ph.classes.map((c, k) => ({ key: c.key, set: joinNullRanges(ph.ranges![k], c.count, true) }));
        ph.ranges = null;
        live.set(entry.phase, sets);
        broadcast({ type: 'nullSets', sets });
        ph.ready = true;
        if (--pendingPhases === 0) o.onCalibration?.({ stage: 'done', plan: plan!, threads, resumed: resumedRealizations });
        for (const v of [...idle]) dispatch(v);
      }
      dispatch(w);
    };
    const onCellDone = (index: number): void => {
      const p = phaseOfCell.get(index);
      if (p === undefined) return;
      const ph = phases[p];
      if (++ph.cellsDone === ph.cells.length && live.has(p)) {
        broadcast({ type: 'dropNullSets', keys: ph.classes.map((c) => c.key) });
        live.delete(p);
        // Its cells are in the cell checkpoint now: the saved realizations are no longer needed.
        for (const c of ph.classes) o.nullStore?.drop(c.key);
      }
    };
    if (o.signal?.aborted) {
      resolvePromise({ completed: false, threads: 0, calibration: null });
      return;
    }
    o.signal?.addEventListener('abort', onAbort, { once: true });
    if (plan) {
      o.onCalibration?.({ stage: 'start', plan, threads, resumed: resumedRealizations });
      if (pendingPhases === 0) o.onCalibration?.({ stage: 'done', plan, threads, resumed: resumedRealizations });
    }
    for (let t = 0; t < threads; t++) {
      const w = new Worker(script, { workerData: init });
      workers.push(w);
      w.on('message', (msg: FromWorker) => {
        if (settled) return;
        try {
          if (msg.type === 'ready') {
            started.add(w);
            for (const sets of live.values()) send(w, { type: 'nullSets', sets });
            dispatch(w);
          } else if (msg.type === 'nullChunk') {
            onChunk(w, msg);
          } else if (msg.type === 'result') {
            received++;
            busy.delete(w);
            if (stats && msg.nullMisses > 0) stats.fallbackCells++;
            onCellDone(msg.result.index);
            o.onResult(msg.result);
            if (received === limit) finish(null, limit === o.pending.length);
            else dispatch(w);
          } else {
            finish(errorFromWorker(msg), false);
          }
        } catch (e) {
          finish(e instanceof Error ? e : new Error(String(e)), false);
        }
      });
      w.on('error', (e) => finish(e, false));
      w.on('exit', (code) => {
        if (!settled && (code !== 0 || busy.has(w))) finish(new Error(`a sweep worker stopped unexpectedly (exit code ${code})`), false);
      });
    }
  });
}

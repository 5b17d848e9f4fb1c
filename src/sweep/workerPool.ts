/**
 * Runs the cells of a sweep: on a pool of worker threads (dynamic dispatch:
 * each worker is handed the next cell when it reports its previous result),
 * or in the main thread when the runner is a function (tests, small library
 * calls). Results are handed to `onResult` in completion order; their content
 * does not depend on the path, the worker count or the order.
 */
import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { dirname, isAbsolute, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import { InputError, type FieldProblem } from '../scenario/errors.js';
import type { CellResult, CellRunner } from './cellTypes.js';
import { prepareJob, runOneCell, type CellJob } from './cellJob.js';
import type { WorkerInit } from './worker.js';
import type { FromWorker, ToWorker } from './workerMessages.js';

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
}

export interface ExecuteOutcome {
  /** True when every pending cell ran. */
  completed: boolean;
  /** Worker threads used (0: the main thread ran the cells). */
  threads: number;
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
    if (Number.isSafeInteger(n) && n >= 1) return n;
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
  const root = resolve(dirname(here), '..', '..');
  const built = join(root, 'dist', 'src', 'sweep', 'worker.js');
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
  if (limit === 0) return { completed: o.pending.length === 0, threads: 0 };
  return runInWorkers(o, o.runner, limit);
}

async function runInMainThread(o: ExecuteOptions, runner: CellRunner, limit: number): Promise<ExecuteOutcome> {
  const prepared = prepareJob(o.job);
  for (let i = 0; i < limit; i++) {
    if (o.signal?.aborted) return { completed: false, threads: 0 };
    o.onResult(runOneCell(runner, prepared, o.pending[i]));
    // Let signal handlers run between cells.
    await new Promise<void>((r) => setImmediate(r));
  }
  return { completed: limit === o.pending.length && !o.signal?.aborted, threads: 0 };
}

function runInWorkers(o: ExecuteOptions, runner: RunnerModule | undefined, limit: number): Promise<ExecuteOutcome> {
  const threads = Math.max(1, Math.min(o.workers, limit));
  const init: WorkerInit = {
    job: o.job,
    runnerModule: runner ? moduleUrl(runner) : null,
    runnerExport: runner?.exportName ?? 'runCell',
  };
  const script = workerScriptUrl();
  return new Promise<ExecuteOutcome>((resolvePromise, rejectPromise) => {
    const workers: Worker[] = [];
    let next = 0;
    let received = 0;
    let settled = false;
    const finish = (err: Error | null, completed: boolean): void => {
      if (settled) return;
      settled = true;
      o.signal?.removeEventListener('abort', onAbort);
      void Promise.all(workers.map((w) => w.terminate())).then(() => {
        if (err) rejectPromise(err);
        else resolvePromise({ completed, threads });
      });
    };
    const onAbort = (): void => finish(null, false);
    const send = (w: Worker, m: ToWorker): void => w.postMessage(m);
    const busy = new Set<Worker>();
    const dispatch = (w: Worker): void => {
      if (next < limit) {
        busy.add(w);
        send(w, { type: 'cell', index: o.pending[next++] });
      } else {
        send(w, { type: 'stop' });
      }
    };
    if (o.signal?.aborted) {
      resolvePromise({ completed: false, threads: 0 });
      return;
    }
    o.signal?.addEventListener('abort', onAbort, { once: true });
    for (let t = 0; t < threads; t++) {
      const w = new Worker(script, { workerData: init });
      workers.push(w);
      w.on('message', (msg: FromWorker) => {
        if (settled) return;
        if (msg.type === 'ready') {
          dispatch(w);
        } else if (msg.type === 'result') {
          received++;
          busy.delete(w);
          try {
            o.onResult(msg.result);
          } catch (e) {
            finish(e instanceof Error ? e : new Error(String(e)), false);
            return;
          }
          if (received === limit) finish(null, limit === o.pending.length);
          else dispatch(w);
        } else {
          finish(errorFromWorker(msg), false);
        }
      });
      w.on('error', (e) => finish(e, false));
      w.on('exit', (code) => {
        if (!settled && (code !== 0 || busy.has(w))) finish(new Error(`a sweep worker stopped unexpectedly (exit code ${code})`), false);
      });
    }
  });
}

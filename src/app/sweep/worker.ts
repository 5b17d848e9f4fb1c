/**
 * Worker-thread entry (runs as compiled JavaScript, dist/src/app/sweep/worker.js).
 * Loads the cell runner module, says `ready`, then runs one cell per `cell`
 * message and posts its result; `stop` ends the thread. With `calibrate`, it
 * also computes chunks of no-moon calibration realizations (`nullChunk`) and
 * keeps the complete null sets the main thread sends (`nullSets`) for the
 * runner, until told to drop them.
 */
import { parentPort, workerData } from 'node:worker_threads';
import type { CellRunner, CellShared } from '../../sweep/cellTypes.js';
import { cellTask, prepareJob, runOneCell, type CellJob } from '../../sweep/cellJob.js';
import type { FromWorker, ToWorker } from './workerMessages.js';
import type { NullSet } from '../../sweep/nullSet.js';
import { primeUnitValues } from '../../scenario/units.js';

export interface WorkerInit {
  job: CellJob;
  /** file: URL of the module exporting the runner; default sweep/runCell.js. */
  runnerModule: string | null;
  runnerExport: string;
  /** Take part in the calibration pre-pass (the default runner only). */
  calibrate: boolean;
  /** The main thread's unit values (units.ts), so that the worker need not load mathjs. */
  unitValues?: Array<[string, number | 'unknown' | 'wrong kind']>;
}

function describeError(e: unknown, index: number): FromWorker {
  const err = e as { name?: string; message?: string; stack?: string; problems?: unknown };
  return {
    type: 'error',
    index,
    name: typeof err?.name === 'string' ? err.name : 'Error',
    message: typeof err?.message === 'string' ? err.message : String(e),
    stack: typeof err?.stack === 'string' ? err.stack : undefined,
    problems: Array.isArray(err?.problems) ? JSON.parse(JSON.stringify(err.problems)) : undefined,
  };
}

async function start(): Promise<void> {
  const port = parentPort;
  if (!port) throw new Error('worker.js must run in a worker thread');
  const init = workerData as WorkerInit;
  if (init.unitValues) primeUnitValues(init.unitValues);
  const post = (m: FromWorker, transfer?: ArrayBuffer[]): void => port.postMessage(m, transfer);
  let runner: CellRunner;
  let calib: { cells: typeof import('../../sweep/runCell.js'); sets: typeof import('../../sweep/nullSet.js') } | null = null;
  try {
    const url = init.runnerModule ?? new URL('../../sweep/runCell.js', import.meta.url).href;
    const mod = (await import(url)) as Record<string, unknown>;
    const fn = mod[init.runnerExport];
    if (typeof fn !== 'function') throw new Error(`${url} has no exported function ${init.runnerExport}`);
    runner = fn as CellRunner;
    if (init.calibrate) calib = { cells: await import('../../sweep/runCell.js'), sets: await import('../../sweep/nullSet.js') };
  } catch (e) {
    post(describeError(e, -1));
    return;
  }
  const prepared = prepareJob(init.job);
  const provided = new Map<string, NullSet>();
  let misses = 0;
  const shared: CellShared | undefined = calib ? { nullSets: provided, onNullMiss: () => void misses++ } : undefined;
  port.on('message', (msg: ToWorker) => {
    switch (msg.type) {
      case 'stop':
        port.close();
        return;
      case 'nullSets':
        for (const { key, set } of msg.sets) provided.set(key, calib!.sets.unpackNullSet(set));
        return;
      case 'dropNullSets':
        for (const key of msg.keys) provided.delete(key);
        return;
      case 'nullChunk':
        try {
          const { key, range } = calib!.cells.nullChunkOf(cellTask(prepared, msg.cell), init.job.ctx, msg.start, msg.n);
          post({ type: 'nullChunk', id: msg.id, key, range }, calib!.sets.packedBuffers(range));
        } catch (e) {
          post(describeError(e, msg.cell));
        }
        return;
      case 'cell':
        try {
          misses = 0;
          const result = runOneCell(runner, prepared, msg.index, shared);
          post({ type: 'result', result, nullMisses: misses });
        } catch (e) {
          post(describeError(e, msg.index));
        }
    }
  });
  post({ type: 'ready' });
}

void start();

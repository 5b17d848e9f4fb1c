/**
 * Worker-thread entry (runs as compiled JavaScript, dist/src/sweep/worker.js).
 * Loads the cell runner module, says `ready`, then runs one cell per `cell`
 * message and posts its result; `stop` ends the thread.
 */
import { parentPort, workerData } from 'node:worker_threads';
import type { CellRunner } from './cellTypes.js';
import { prepareJob, runOneCell, type CellJob } from './cellJob.js';
import type { FromWorker, ToWorker } from './workerMessages.js';

export interface WorkerInit {
  job: CellJob;
  /** file: URL of the module exporting the runner; default ./runCell.js beside this file. */
  runnerModule: string | null;
  runnerExport: string;
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
  const post = (m: FromWorker): void => port.postMessage(m);
  let runner: CellRunner;
  try {
    const url = init.runnerModule ?? new URL('./runCell.js', import.meta.url).href;
    const mod = (await import(url)) as Record<string, unknown>;
    const fn = mod[init.runnerExport];
    if (typeof fn !== 'function') throw new Error(`${url} has no exported function ${init.runnerExport}`);
    runner = fn as CellRunner;
  } catch (e) {
    post(describeError(e, -1));
    return;
  }
  const prepared = prepareJob(init.job);
  port.on('message', (msg: ToWorker) => {
    if (msg.type === 'stop') {
      port.close();
      return;
    }
    try {
      post({ type: 'result', result: runOneCell(runner, prepared, msg.index) });
    } catch (e) {
      post(describeError(e, msg.index));
    }
  });
  post({ type: 'ready' });
}

void start();

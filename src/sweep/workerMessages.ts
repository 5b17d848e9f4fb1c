/** Messages between the sweep's main thread and its worker threads. */
import type { CellResult } from './cellTypes.js';

export type ToWorker = { type: 'cell'; index: number } | { type: 'stop' };

export type FromWorker =
  | { type: 'ready' }
  | { type: 'result'; result: CellResult }
  /** index −1: the runner could not be loaded. `problems` is set when the error was an InputError. */
  | { type: 'error'; index: number; name: string; message: string; stack?: string; problems?: unknown };

/** Messages between the sweep's main thread and its worker threads. */
import type { CellResult } from '../../sweep/cellTypes.js';
import type { PackedNullRange } from '../../sweep/nullSet.js';

export type ToWorker =
  | { type: 'cell'; index: number }
  /** Compute realizations [start, start + n) of the null set of cell `cell`'s class; `id` is echoed back. */
  | { type: 'nullChunk'; id: number; cell: number; start: number; n: number }
  /** Complete null sets (SharedArrayBuffer-backed), for the cells that follow. */
  | { type: 'nullSets'; sets: Array<{ key: string; set: PackedNullRange }> }
  /** Null sets no longer needed. */
  | { type: 'dropNullSets'; keys: string[] }
  | { type: 'stop' };

export type FromWorker =
  | { type: 'ready' }
  /** `nullMisses`: classes the runner had to compute itself (provided sets lacked them). */
  | { type: 'result'; result: CellResult; nullMisses: number }
  | { type: 'nullChunk'; id: number; key: string; range: PackedNullRange }
  /** index −1: the runner could not be loaded. `problems` is set when the error was an InputError. */
  | { type: 'error'; index: number; name: string; message: string; stack?: string; problems?: unknown };

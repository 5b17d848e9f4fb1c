/**
 * The contract between the sweep engine and the per-cell computation.
 * The engine owns the grid, dispatch, seeding keys, checkpoints and outputs;
 * a `CellRunner` turns one cell of the grid into one JSON-serialisable result.
 */
import type { NullSet } from './nullSet.js';

/** One cell of the grid, as handed to a runner. */
export interface CellTask {
  /** Row-major cell index over the sweep axes (last axis fastest). */
  index: number;
  /** The cell's value on each axis, SI (the axis `unit`). */
  coords: number[];
  /** The scenario YAML as plain values, with this cell's axis values already applied (no `sweep` key). */
  scenarioDoc: unknown;
}

/**
 * One cell's result. Must be JSON-serialisable; the engine rewrites `index`
 * and `coords` from the task and passes the result through JSON once, so
 * NaN and ±Infinity become null everywhere (in memory, checkpoint and output alike).
 */
export interface CellResult {
  index: number;
  coords: number[];
  [k: string]: unknown;
}

/** What every cell of a sweep shares. */
export interface CellContext {
  /** The scenario seed; realization r of cell i draws from createRng(seed, i, r). */
  seed: number;
  realizations: number;
  simulateUnstable: boolean;
  forecastOnly: boolean;
  /** No-moon calibration realizations per cell (default: `defaultNullRealizations` of the cell's α and R). */
  nullRealizations?: number;
}

/**
 * What the engine may hand a runner besides the task: null sets computed once
 * for the whole sweep (the calibration pre-pass), keyed by `NullClass.key`.
 * A runner that finds no set for its class computes one itself.
 */
export interface CellShared {
  nullSets?: ReadonlyMap<string, NullSet>;
  /** Called when `nullSets` was given but lacks the cell's class (the runner then computes it). */
  onNullMiss?: (key: string) => void;
}

export type CellRunner = (task: CellTask, ctx: CellContext, shared?: CellShared) => CellResult;

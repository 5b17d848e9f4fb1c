/**
 * What one worker (or the main thread) needs to run any cell of a sweep, and
 * the one function that runs a cell, so every execution path builds the same
 * task and normalises the result the same way.
 */
import type { CellContext, CellResult, CellRunner, CellShared, CellTask } from './cellTypes.js';
import { createGrid, type Grid } from './grid.js';
import { applyAxisValues } from './applyAxes.js';
import type { SweepAxis } from './sweepSpec.js';

/** Plain data (structured-cloneable), sent once to each worker. */
export interface CellJob {
  baseDoc: unknown;
  axes: Array<Pick<SweepAxis, 'field' | 'write' | 'values'>>;
  ctx: CellContext;
}

export interface PreparedJob {
  job: CellJob;
  grid: Grid;
}

export function prepareJob(job: CellJob): PreparedJob {
  return { job, grid: createGrid(job.axes.map((a) => a.values)) };
}

export function cellTask(p: PreparedJob, index: number): CellTask {
  const coords = p.grid.cellCoords(index);
  return { index, coords, scenarioDoc: applyAxisValues(p.job.baseDoc, p.job.axes, coords) };
}

/**
 * Run cell `index` and normalise its result: `index` and `coords` come first
 * and from the engine, and the whole object passes through JSON once (NaN and
 * ±Infinity become null), so a result read back from a checkpoint is
 * indistinguishable from a fresh one. `shared` (e.g. precomputed null sets)
 * is passed through to the runner.
 */
export function runOneCell(runner: CellRunner, p: PreparedJob, index: number, shared?: CellShared): CellResult {
  const task = cellTask(p, index);
  const raw = (shared === undefined ? runner(task, p.job.ctx) : runner(task, p.job.ctx, shared)) as unknown;
  if (raw === null || typeof raw !== 'object' || Array.isArray(raw)) {
    throw new TypeError(`the cell runner returned ${raw === null ? 'null' : Array.isArray(raw) ? 'an array' : typeof raw} for cell ${index}; expected an object`);
  }
  const { index: _index, coords: _coords, ...rest } = raw as CellResult;
  void _index;
  void _coords;
  return JSON.parse(JSON.stringify({ index, coords: task.coords, ...rest })) as CellResult;
}

/**
 * What one worker (or the main thread) needs to run any cell of a sweep, and
 * the one function that runs a cell, so every execution path builds the same
 * task and normalises the result the same way.
 */
import type { CellContext, CellResult, CellRunner, CellShared, CellTask } from './cellTypes.js';
import { createGrid, type Grid } from './grid.js';
import { applyAxes, CELL_PARSE } from './applyAxes.js';
import type { SweepAxis } from './sweepSpec.js';
import { parseScenario } from '../scenario/parseScenario.js';
import type { Scenario, ScenarioDocument } from '../scenario/types.js';

/** Plain data (structured-cloneable), sent once to each worker. */
export interface CellJob {
  /**
   * The sweep's scenario as its document (`Scenario.document`, the form a
   * Scenario is varied through: a structured clone of a Scenario drops it);
   * each thread validates it once (`prepareJob`) and varies the typed
   * Scenario per cell (`applyAxes`).
   */
  baseDocument: ScenarioDocument;
  axes: Array<Pick<SweepAxis, 'field' | 'write' | 'values'>>;
  ctx: CellContext;
}

export interface PreparedJob {
  job: CellJob;
  grid: Grid;
  /** The sweep's scenario, validated once in this thread. */
  base: Scenario;
}

export function prepareJob(job: CellJob): PreparedJob {
  // As a grid cell (CELL_PARSE): the base's own moon need not clear its planet, only the cells' moons are judged.
  return { job, grid: createGrid(job.axes.map((a) => a.values)), base: parseScenario(job.baseDocument, 'scenario', CELL_PARSE) };
}

/** The task of cell `index`: its coordinates and its scenario (throws the cell's InputError, named "cell <index>"). */
export function cellTask(p: PreparedJob, index: number): CellTask {
  const coords = p.grid.cellCoords(index);
  return { index, coords, scenario: applyAxes(p.base, p.job.axes, coords, `cell ${index}`) };
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

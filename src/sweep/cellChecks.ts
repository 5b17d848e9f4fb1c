/**
 * Checks of finished cells read back from disk (a checkpoint on --resume, a
 * cells.json in `report` and `merge`), so that a damaged or edited file is
 * refused with one line per problem instead of being rendered or merged.
 *
 * Each cell must carry an integer index inside the grid and the coordinates
 * of that index (the axis values in the sweep's meta); any field named
 * `pdet_*` (measured and forecast), `false_alarm` or `false_alarm_*` or inside a `probability`
 * object is a probability: a number in [0, 1] or null; `realizations` is a
 * whole number from 0 to the sweep's realizations per cell and
 * `no_moon_realizations` a whole number ≥ 0 (or null); a simulated cell carries
 * its probabilities (`pdet_ttv`, `pdet_tdv`, `pdet_dip`, `pdet_combined`); and a field
 * holds the same kind of value (number or not) in every cell.
 * Coverage (each cell exactly once) is checked by `checkCoverage`.
 */
import type { FieldProblem } from '../scenario/errors.js';
import { createGrid, type Grid } from './grid.js';
import type { SweepMeta } from './sweepMeta.js';

const PROBABILITY = /^(pdet_.+|false_alarm(_.+)?)$/;
const SIMULATED_REQUIRED = ['pdet_ttv', 'pdet_tdv', 'pdet_dip', 'pdet_combined'];

/** The value for a message: numbers, booleans, null and missing as they are; text and objects cut to 40 characters. */
function short(v: unknown): unknown {
  if (v === undefined || v === null || typeof v === 'number' || typeof v === 'boolean') return v;
  if (typeof v === 'string') return v.length > 40 ? v.slice(0, 37) + '...' : v;
  let s: string;
  try {
    s = JSON.stringify(v);
  } catch {
    s = String(v);
  }
  return s.length > 40 ? s.slice(0, 37) + '...' : JSON.parse(s);
}

export interface CellChecker {
  /** Problems of one cell (`where` names it in messages, e.g. "cells.partial.jsonl line 4"). */
  check(cell: unknown, where: string): FieldProblem[];
}

/** A checker for the cells of the sweep described by `meta`. */
export function cellChecker(meta: SweepMeta): CellChecker {
  let grid: Grid | null = null;
  try {
    grid = createGrid(meta.axes.map((a) => a.values));
  } catch {
    grid = null;
  }
  const total = meta.cells;
  /** Per field: whether it held a number (true) or another non-null value (false) in the first cell that had it. */
  const kinds = new Map<string, { numeric: boolean; where: string }>();
  return {
    check(cell, where) {
      const problems: FieldProblem[] = [];
      const add = (field: string, value: unknown, allowed: string): void => {
        problems.push({ path: `${where}: ${field}`, value: short(value), allowed });
      };
      if (cell === null || typeof cell !== 'object' || Array.isArray(cell)) {
        add('cell', cell, 'expected a cell result object');
        return problems;
      }
      const c = cell as Record<string, unknown>;
      const index = c.index;
      const indexOk = typeof index === 'number' && Number.isInteger(index) && index >= 0 && index < total;
      if (!indexOk) add('index', index, `expected a whole cell index from 0 to ${total - 1}`);
      if (!Array.isArray(c.coords) || c.coords.length !== meta.axes.length || !c.coords.every((x) => typeof x === 'number')) {
        add('coords', c.coords, `expected ${meta.axes.length} numbers, the cell's axis values`);
      } else if (indexOk && grid !== null) {
        const want = grid.cellCoords(index as number);
        if (want.some((w, k) => w !== (c.coords as number[])[k])) add('coords', c.coords, `are not the axis values of cell ${index as number} (${JSON.stringify(want)})`);
      }
      const visit = (obj: Record<string, unknown>, prefix: string, inProbability: boolean): void => {
        for (const [k, v] of Object.entries(obj)) {
          if (prefix === '' && (k === 'index' || k === 'coords')) continue;
          const name = prefix ? `${prefix}.${k}` : k;
          if (v !== null && typeof v === 'object' && !Array.isArray(v)) {
            visit(v as Record<string, unknown>, name, inProbability || k === 'probability');
            continue;
          }
          if (inProbability || PROBABILITY.test(k)) {
            if (v !== null && !(typeof v === 'number' && v >= 0 && v <= 1)) add(name, v, 'a probability: expected a number from 0 to 1, or null');
          } else if (k === 'realizations') {
            if (v !== null && !(typeof v === 'number' && Number.isInteger(v) && v >= 0 && v <= meta.realizations)) add(name, v, `expected a whole number from 0 to ${meta.realizations} (the sweep's realizations per cell)`);
          } else if (k === 'no_moon_realizations') {
            if (v !== null && !(typeof v === 'number' && Number.isInteger(v) && v >= 0)) add(name, v, 'expected a whole number ≥ 0');
          }
          if (v === null || Array.isArray(v)) continue;
          const numeric = typeof v === 'number';
          const seen = kinds.get(name);
          if (seen === undefined) kinds.set(name, { numeric, where });
          else if (seen.numeric !== numeric) add(name, v, `expected ${seen.numeric ? 'a number' : 'a value that is not a number'}, as in ${seen.where}`);
        }
      };
      visit(c, '', false);
      if (c.simulated === true) {
        for (const k of SIMULATED_REQUIRED) if (!(k in c)) add(k, undefined, 'a simulated cell must carry this probability');
      }
      return problems;
    },
  };
}

/** Problems of coverage: `indices` (in file order, with where each came from) must hold each of `cells` (or the run's) exactly once. */
export function coverageProblems(entries: ReadonlyArray<{ index: number; where: string }>, expected: readonly number[] | number, what: string): FieldProblem[] {
  const want = typeof expected === 'number' ? null : new Set(expected);
  const total = typeof expected === 'number' ? expected : expected.length;
  const first = new Map<number, string>();
  const problems: FieldProblem[] = [];
  for (const e of entries) {
    const prev = first.get(e.index);
    if (prev !== undefined) {
      problems.push({ path: e.where, value: `cell ${e.index}`, allowed: `this cell is already in ${prev}: each cell must appear once` });
      continue;
    }
    if (want !== null && !want.has(e.index)) {
      problems.push({ path: e.where, value: `cell ${e.index}`, allowed: `not a cell of the run that wrote ${what} (another shard's)` });
      continue;
    }
    first.set(e.index, e.where);
  }
  const missing: number[] = [];
  if (want === null) {
    for (let i = 0; i < total; i++) if (!first.has(i)) missing.push(i);
  } else {
    for (const i of expected as readonly number[]) if (!first.has(i)) missing.push(i);
  }
  if (missing.length > 0) {
    const head = missing.slice(0, 8).join(', ') + (missing.length > 8 ? ` and ${missing.length - 8} more` : '');
    problems.push({ path: what, value: `${missing.length} of ${total} cells missing`, allowed: `every cell must be present; missing cells ${head}` });
  }
  return problems;
}

/** At most `max` problems, the rest summarised in one more line. */
export function capProblems(problems: FieldProblem[], max = 12): FieldProblem[] {
  if (problems.length <= max) return problems;
  return [...problems.slice(0, max), { path: '…', value: `${problems.length - max} more problems`, allowed: 'not listed' }];
}

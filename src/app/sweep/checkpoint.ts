/**
 * The streaming checkpoint `<out>/cells.partial.jsonl`: a header line that
 * identifies the sweep and shard, then one JSON line per finished cell,
 * appended as each cell ends. A kill can leave a truncated last line; a
 * resume ignores it and a line repeated byte for byte, refuses any other
 * damage (a line that does not parse, a cell outside the grid or the run,
 * wrong coordinates, a probability outside [0, 1], two different results
 * for one cell: cellChecks.ts), rewrites the file clean and appends from
 * there, so no cell is lost or doubled.
 */
import { closeSync, existsSync, openSync, readFileSync, rmSync, writeSync } from 'node:fs';
import { basename, join } from 'node:path';
import { writeFileAtomic } from '../../io/atomicWrite.js';
import { InputError, type FieldProblem } from '../../scenario/errors.js';
import { capProblems, cellChecker } from '../../sweep/cellChecks.js';
import type { CellResult } from '../../sweep/cellTypes.js';
import { metaDifferences, type SweepMeta } from '../../sweep/sweepMeta.js';
import { shardText, type Shard } from '../../sweep/shard.js';

export const CHECKPOINT_FILE = 'cells.partial.jsonl';
const KIND = 'moonsieve-sweep-checkpoint';

export interface CheckpointHeader {
  kind: typeof KIND;
  meta: SweepMeta;
  shard: Shard | null;
}

export function checkpointPath(dir: string): string {
  return join(dir, CHECKPOINT_FILE);
}

export function checkpointHeader(meta: SweepMeta, shard: Shard | null): CheckpointHeader {
  return { kind: KIND, meta, shard };
}

/**
 * Results already in the checkpoint at `path` (empty when there is none).
 * Throws InputError when the checkpoint belongs to another sweep or shard.
 */
export function readCheckpoint(path: string, expected: CheckpointHeader, cellInRun: (index: number) => boolean): CellResult[] {
  if (!existsSync(path)) return [];
  const text = readFileSync(path, 'utf8');
  const lines = text.split('\n');
  let header: CheckpointHeader | null = null;
  try {
    header = JSON.parse(lines[0]) as CheckpointHeader;
  } catch {
    header = null;
  }
  if (!header || header.kind !== KIND || !header.meta) {
    throw new InputError([{ path, value: lines[0].slice(0, 60), allowed: 'not a moonsieve sweep checkpoint (bad header line); remove it to start afresh' }]);
  }
  const diffs = metaDifferences(header.meta, expected.meta);
  const shardA = header.shard ?? null;
  const shardB = expected.shard;
  if ((shardA === null) !== (shardB === null) || (shardA && shardB && (shardA.k !== shardB.k || shardA.n !== shardB.n))) {
    diffs.push(`shard (${shardText(shardA)} vs ${shardText(shardB)})`);
  }
  if (diffs.length > 0) {
    throw new InputError([{
      path,
      value: `checkpoint of "${header.meta.scenario}"`,
      allowed: `belongs to a different sweep, so --resume cannot continue it: ${diffs.join('; ')} (checkpoint vs now). Use the same scenario and options, or another --out, or delete the checkpoint to start afresh`,
    }]);
  }
  const checker = cellChecker(expected.meta);
  const problems: FieldProblem[] = [];
  const first = new Map<number, { line: number; text: string }>();
  const out: CellResult[] = [];
  const name = basename(path);
  for (let i = 1; i < lines.length; i++) {
    const line = lines[i];
    if (line.trim() === '') continue;
    const where = `${name} line ${i + 1}`;
    let r: unknown;
    try {
      r = JSON.parse(line);
    } catch {
      // The last line, with no newline after it, is one a kill cut short: dropped, the cell is run again.
      if (i === lines.length - 1) continue;
      problems.push({ path: where, value: line.slice(0, 40) + (line.length > 40 ? '...' : ''), allowed: 'not a JSON cell result (a damaged line in the middle of the checkpoint)' });
      continue;
    }
    const p = checker.check(r, where);
    if (p.length > 0) {
      problems.push(...p);
      continue;
    }
    const cell = r as CellResult;
    if (!cellInRun(cell.index)) {
      problems.push({ path: where, value: `cell ${cell.index}`, allowed: `not a cell of this run (${shardText(expected.shard)})` });
      continue;
    }
    const prev = first.get(cell.index);
    if (prev !== undefined) {
      // The same line twice is harmless (the first is kept); two different results for one cell are not.
      if (prev.text !== line) problems.push({ path: where, value: `cell ${cell.index}`, allowed: `a different result for this cell is already at line ${prev.line}: each cell must appear once` });
      continue;
    }
    first.set(cell.index, { line: i + 1, text: line });
    out.push(cell);
  }
  if (problems.length > 0) {
    throw new InputError(capProblems(problems), `${path} is damaged, so --resume cannot trust it; remove the lines named (their cells are run again) or delete the file to start afresh`);
  }
  return out;
}

/** Appends one line per finished cell. Create with `openCheckpoint`. */
export interface CheckpointWriter {
  append(result: CellResult): void;
  close(): void;
}

/** Start the checkpoint at `path` afresh with the header and `existing` results (rewritten whole, atomically), then append. */
export function openCheckpoint(path: string, header: CheckpointHeader, existing: readonly CellResult[]): CheckpointWriter {
  const head = JSON.stringify(header) + '\n' + existing.map((r) => JSON.stringify(r) + '\n').join('');
  writeFileAtomic(path, head);
  let fd: number | null = openSync(path, 'a');
  return {
    append(result) {
      if (fd === null) throw new Error('checkpoint already closed');
      writeSync(fd, JSON.stringify(result) + '\n');
    },
    close() {
      if (fd !== null) closeSync(fd);
      fd = null;
    },
  };
}

export function removeCheckpoint(path: string): void {
  rmSync(path, { force: true });
}

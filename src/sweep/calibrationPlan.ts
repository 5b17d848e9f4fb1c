/**
 * The plan of a sweep's calibration pre-pass: which null classes the cells of
 * this run need, the chunks of realizations the workers compute, and the
 * phases in which cells run once their classes are complete.
 *
 * Cells are grouped into phases of whole classes (in order of each class's
 * first cell), at most `maxPhaseRealizations` realizations per phase unless a
 * single class is larger, so that a grid whose cells each have their own
 * class (e.g. a noise or transit-count axis) never holds every set at once.
 * Cells that need no calibration form phase 0, which is ready at once. The
 * plan only orders work: results do not depend on it.
 */

export interface CalibrationClassPlan {
  /** NullClass.key. */
  key: string;
  /** A cell of the class (the workers rebuild the class from it). */
  cell: number;
  /** Realizations in the class. */
  count: number;
  /** [start, n) ranges tiling [0, count). */
  chunks: Array<{ start: number; n: number }>;
}

export interface CalibrationPhase {
  classes: CalibrationClassPlan[];
  /** Cells to run once the phase's classes are complete, in dispatch order. */
  cells: number[];
}

export interface CalibrationPlan {
  phases: CalibrationPhase[];
  /** Totals over the phases. */
  classes: number;
  realizations: number;
  chunks: number;
}

export interface CalibrationPlanOptions {
  /** Worker threads (sets the chunk size). */
  workers: number;
  /** Realizations per chunk (default: count / (4 × workers), clamped to 1…50). */
  chunkSize?: number;
  /** Realizations held per phase (default 4096, about 60–120 MB of stacks). */
  maxPhaseRealizations?: number;
}

export const DEFAULT_MAX_PHASE_REALIZATIONS = 4096;

/** The chunk size for a class of `count` realizations on `workers` threads: ≥ 4 chunks per worker, ≤ 50 per chunk. */
export function nullChunkSize(count: number, workers: number): number {
  return Math.max(1, Math.min(50, Math.ceil(count / (4 * Math.max(1, workers)))));
}

/**
 * Plan the pre-pass for `cells` (in dispatch order); `classOf(cell)` gives the
 * cell's class {key, count}, or null when the cell needs no calibration.
 */
export function planCalibration(
  cells: readonly number[],
  classOf: (cell: number) => { key: string; count: number } | null,
  o: CalibrationPlanOptions,
): CalibrationPlan {
  if (!(Number.isInteger(o.workers) && o.workers >= 1)) throw new RangeError(`workers must be an integer ≥ 1, got ${o.workers}`);
  const maxPhase = o.maxPhaseRealizations ?? DEFAULT_MAX_PHASE_REALIZATIONS;
  if (!(maxPhase >= 1)) throw new RangeError(`maxPhaseRealizations must be ≥ 1, got ${maxPhase}`);
  if (o.chunkSize !== undefined && !(Number.isInteger(o.chunkSize) && o.chunkSize >= 1)) throw new RangeError(`chunkSize must be an integer ≥ 1, got ${o.chunkSize}`);

  const free: number[] = [];
  const byKey = new Map<string, { plan: CalibrationClassPlan; cells: number[] }>();
  for (const cell of cells) {
    const c = classOf(cell);
    if (c === null) {
      free.push(cell);
      continue;
    }
    const entry = byKey.get(c.key);
    if (entry) entry.cells.push(cell);
    else {
      const size = o.chunkSize ?? nullChunkSize(c.count, o.workers);
      const chunks: Array<{ start: number; n: number }> = [];
      for (let start = 0; start < c.count; start += size) chunks.push({ start, n: Math.min(size, c.count - start) });
      byKey.set(c.key, { plan: { key: c.key, cell, count: c.count, chunks }, cells: [cell] });
    }
  }

  const phases: CalibrationPhase[] = [];
  if (free.length > 0) phases.push({ classes: [], cells: free });
  let current: CalibrationPhase | null = null;
  let held = 0;
  let realizations = 0;
  let chunks = 0;
  for (const { plan, cells: members } of byKey.values()) {
    if (current === null || (held > 0 && held + plan.count > maxPhase)) {
      current = { classes: [], cells: [] };
      phases.push(current);
      held = 0;
    }
    current.classes.push(plan);
    // A loop, not push(...members): a class can hold every cell of a large grid (a spread that long overflows the stack).
    for (const m of members) current.cells.push(m);
    held += plan.count;
    realizations += plan.count;
    chunks += plan.chunks.length;
  }
  // Within a phase, cells keep their dispatch order.
  const position = new Map<number, number>();
  cells.forEach((cell, i) => position.set(cell, i));
  for (const ph of phases) ph.cells.sort((a, b) => position.get(a)! - position.get(b)!);
  return { phases, classes: byKey.size, realizations, chunks };
}

/**
 * Sweep throughput: runs a whole sweep (into a temporary folder, removed
 * afterwards) with a given runner and worker count, and returns cells per
 * second and realizations per second over the wall time, worker start-up
 * included. bench/run.ts calls it with the real runner for 1 and 2 workers.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { runSweep } from '../src/sweep/runSweep.js';
import type { CellRunner } from '../src/sweep/cellTypes.js';
import type { RunnerModule } from '../src/sweep/workerPool.js';

export interface SweepBenchResult {
  label: string;
  workers: number;
  cells: number;
  /** Realizations with a moon actually run: 0 for cells not simulated, else each result's `realizations` field, else the sweep's per-cell count. */
  realizations: number;
  seconds: number;
  cellsPerSecond: number;
  realizationsPerSecond: number;
  /** Peak resident memory of this process (main thread and workers), MB. */
  peakRssMb: number;
}

export interface SweepBenchOptions {
  workers: number;
  /** Default: the real runner (src/sweep/runCell.ts) on worker threads. */
  runner?: CellRunner | RunnerModule;
  forecastOnly?: boolean;
  /** Cap the number of cells (the rate is then over those cells). */
  maxCells?: number;
  label?: string;
}

/** `scenario`: a scenario file path or document (with or without a sweep block). */
export async function benchSweep(scenario: unknown, o: SweepBenchOptions): Promise<SweepBenchResult> {
  const out = mkdtempSync(join(tmpdir(), 'moonsieve-bench-sweep-'));
  try {
    const t0 = performance.now();
    const res = await runSweep(scenario, {
      out, workers: o.workers, runner: o.runner, forecastOnly: o.forecastOnly, maxCells: o.maxCells, quiet: true, shard: null, env: {},
    });
    const seconds = (performance.now() - t0) / 1000;
    const cells = res.results.length;
    // Cells that were not simulated (forecast only, unstable) ran no realizations.
    const perCell = (r: Record<string, unknown>): number =>
      r.simulated === false || res.meta.forecast_only ? 0 : typeof r.realizations === 'number' ? r.realizations : res.meta.realizations;
    const realizations = res.results.reduce((n, r) => n + perCell(r), 0);
    return {
      label: o.label ?? `sweep ${res.meta.scenario}, ${o.workers} worker${o.workers === 1 ? '' : 's'}${o.forecastOnly ? ', forecast only' : ''}`,
      workers: res.runInfo.workers,
      cells,
      realizations,
      seconds,
      cellsPerSecond: cells / seconds,
      realizationsPerSecond: realizations / seconds,
      peakRssMb: process.resourceUsage().maxRSS / 1024,
    };
  } finally {
    rmSync(out, { recursive: true, force: true });
  }
}

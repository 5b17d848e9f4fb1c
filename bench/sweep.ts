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
import { parse as parseYaml } from 'yaml';
import { runSweep } from '../src/app/sweep/runSweep.js';
import { parseScenario } from '../src/scenario/parseScenario.js';
import type { CellResult, CellRunner } from '../src/sweep/cellTypes.js';
import type { RunnerModule } from '../src/app/sweep/workerPool.js';

export interface SweepBenchResult {
  label: string;
  workers: number;
  cells: number;
  /** Realizations with a moon actually run: 0 for cells not simulated, else each result's `realizations` field, else the sweep's per-cell count. */
  realizations: number;
  seconds: number;
  cellsPerSecond: number;
  realizationsPerSecond: number;
  /** No-moon calibration realizations run (0 when none). */
  calibrationRealizations: number;
  /** All realizations (with and without a moon) per second. */
  allRealizationsPerSecond: number;
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
export async function benchSweep(scenarioOrDoc: unknown, o: SweepBenchOptions): Promise<SweepBenchResult> {
  const scenario = typeof scenarioOrDoc === 'string' ? scenarioOrDoc : parseScenario(scenarioOrDoc);
  const out = mkdtempSync(join(tmpdir(), 'moonsieve-bench-sweep-'));
  try {
    const t0 = performance.now();
    const res = await runSweep(scenario, {
      out, workers: o.workers, runner: o.runner, forecastOnly: o.forecastOnly, maxCells: o.maxCells, quiet: true, shard: null, env: {},
    });
    const seconds = (performance.now() - t0) / 1000;
    const cells = res.results.length;
    // Cells that were not simulated (forecast only, unstable) ran no realizations.
    const perCell = (r: CellResult): number =>
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
      calibrationRealizations: res.calibration?.realizations ?? 0,
      allRealizationsPerSecond: (realizations + (res.calibration?.realizations ?? 0)) / seconds,
      peakRssMb: process.resourceUsage().maxRSS / 1024,
    };
  } finally {
    rmSync(out, { recursive: true, force: true });
  }
}

/**
 * The reference sweep: the observer demo with 12 transits at 2-minute cadence on a
 * 20 × 20 mass × separation grid, 100 realizations per cell. Running it whole takes minutes,
 * so by default the bench runs `cells` of its cells with `realizations` each (same scenario,
 * same calibration) on 1 and 2 workers, and projects the whole grid from the measured
 * rate; `--full` runs it whole on 2 workers.
 */
export function referenceSweepDoc(realizations: number): Record<string, unknown> {
  return parseYaml(`
name: bench reference sweep (invented system)
seed: 2026
star: {mass: 0.74 Msun, radius: 0.71 Rsun, teff: 4650 K, age: 4 Gyr, limb_darkening: {u1: 0.55, u2: 0.17}}
planet: {mass: 0.32 Mjup, radius: 0.84 Rjup, period: 148.3 d, impact_parameter: 0.25}
moon: {mass: 0.6 Mearth, density: 4.0 g/cm^3, separation: 18 Rp}
instrument: {cadence: 2 min, exposure: 100 s, noise: 450 ppm per 2 min}
observation: {transits: 12, baseline: 2.5 h}
detection: {false_alarm: 1 %}
sweep:
  realizations: ${realizations}
  axes:
    - {field: moon.mass, from: 0.05 Mearth, to: 3 Mearth, count: 20, spacing: log}
    - {field: moon.separation, from: roche, to: stable, count: 20, spacing: linear}
`) as Record<string, unknown>;
}

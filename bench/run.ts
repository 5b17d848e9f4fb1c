/**
 * `npm run bench`: the performance figures the issues ask for, as medians of
 * several runs, with the machine's core count. Compare ratios within one run:
 * the machine is shared and noisy.
 */
import { availableParallelism, cpus } from 'node:os';
import type { BenchMedian } from './measure.js';
import { benchPhotometry } from './photometry.js';
import { benchGaussian, benchFft } from './noise.js';
import { benchLightCurveWindow, benchRecovery } from './lightCurve.js';
import { benchBudget } from './budget.js';
import { benchSweep, referenceSweepDoc } from './sweep.js';
import { threadScaling } from './threadScaling.js';

function print(title: string, rows: BenchMedian[]): void {
  process.stdout.write(`\n${title}\n`);
  for (const r of rows) {
    const v = r.median >= 100 ? r.median.toFixed(0) : r.median >= 1 ? r.median.toFixed(2) : r.median.toPrecision(3);
    process.stdout.write(`  ${r.label.padEnd(92)} ${v.padStart(10)} ${r.unit}  (median of ${r.repeats})\n`);
  }
}

/** Sweep throughput on the reference sweep (see bench/sweep.ts), 1 and 2 workers, and the projection. */
async function sweepSection(full: boolean): Promise<BenchMedian[]> {
  const rows: BenchMedian[] = [];
  // 120 cells × 25 realizations plus the shared no-moon set of 1000: about fifteen seconds on one worker,
  // long enough that start-up and compilation weigh little in the speed-up.
  const cells = 120;
  const realizations = 25;
  const rates: Record<number, number> = {};
  for (const workers of full ? [2] : [1, 2]) {
    const doc = referenceSweepDoc(full ? 100 : realizations);
    const r = await benchSweep(doc, { workers, maxCells: full ? undefined : cells, label: `reference sweep, ${workers} worker(s)` });
    rates[workers] = r.allRealizationsPerSecond;
    rows.push({ label: `${r.cells} cells × ${full ? 100 : realizations} realizations (+ no-moon calibration), ${workers} worker(s): wall time`, median: r.seconds, unit: 's', repeats: 1 });
    rows.push({ label: `  cells per second`, median: r.cellsPerSecond, unit: '/s', repeats: 1 });
    rows.push({ label: `  realizations per second (${r.realizations} with a moon + ${r.calibrationRealizations} no-moon)`, median: r.allRealizationsPerSecond, unit: '/s', repeats: 1 });
    rows.push({ label: `  peak resident memory`, median: r.peakRssMb, unit: 'MB', repeats: 1 });
  }
  const machine = await threadScaling();
  if (!full) {
    rows.push({ label: 'speed-up, 2 workers over 1 (goal ≥ 1.8)', median: rates[2] / rates[1], unit: '×', repeats: 1 });
    rows.push({ label: '  this machine\'s two-thread ceiling: a pure arithmetic loop, 2 threads over 1 (bench/threadScaling.ts)', median: machine.ratio, unit: '×', repeats: 3 });
    // The whole grid: 400 cells × 100 realizations plus one shared no-moon set (1000 at α = 1 %).
    rows.push({ label: 'projected 20 × 20 × 100 sweep on 2 workers from this short run (start-up and warm-up included: pessimistic; --full measures it)', median: (400 * 100 + 1000) / rates[2], unit: 's', repeats: 1 });
  }
  rows.push({ label: 'machine speed after the sweep: that loop (1e8 steps) alone on one thread (0.57 s typical here; larger = slowed)', median: machine.aloneMs / 1000, unit: 's', repeats: 3 });
  return rows;
}

async function main(): Promise<void> {
  const only = process.argv[2] && !process.argv[2].startsWith('--') ? process.argv[2] : undefined;
  process.stdout.write(`moonsieve bench — node ${process.version}, ${availableParallelism()} cores (${cpus()[0]?.model ?? 'unknown CPU'}), ${new Date().toISOString()}\n`);
  const sections: Array<[string, () => BenchMedian[] | Promise<BenchMedian[]>]> = [
    ['photometry', () => benchPhotometry()],
    ['light curve', () => benchLightCurveWindow()],
    ['noise', () => [...benchGaussian(), ...benchFft()]],
    ['recovery', () => benchRecovery()],
    ['budget', () => benchBudget()],
    ['sweep', () => sweepSection(process.argv.includes('--full'))],
  ];
  for (const [name, run] of sections) {
    if (only && only !== name) continue;
    print(name, await run());
  }
}

main().catch((e) => {
  process.stderr.write(String(e instanceof Error ? e.stack : e) + '\n');
  process.exitCode = 1;
});

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

function print(title: string, rows: BenchMedian[]): void {
  process.stdout.write(`\n${title}\n`);
  for (const r of rows) {
    const v = r.median >= 100 ? r.median.toFixed(0) : r.median >= 1 ? r.median.toFixed(2) : r.median.toPrecision(3);
    process.stdout.write(`  ${r.label.padEnd(92)} ${v.padStart(10)} ${r.unit}  (median of ${r.repeats})\n`);
  }
}

async function main(): Promise<void> {
  const only = process.argv[2];
  process.stdout.write(`moonsieve bench — node ${process.version}, ${availableParallelism()} cores (${cpus()[0]?.model ?? 'unknown CPU'}), ${new Date().toISOString()}\n`);
  const sections: Array<[string, () => BenchMedian[] | Promise<BenchMedian[]>]> = [
    ['photometry', () => benchPhotometry()],
    ['light curve', () => benchLightCurveWindow()],
    ['noise', () => [...benchGaussian(), ...benchFft()]],
    ['recovery', () => benchRecovery()],
    ['budget', () => benchBudget()],
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

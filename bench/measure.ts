/** Shared benchmark helpers: medians over repeats, after a warm-up. */
import { performance } from 'node:perf_hooks';

/** One benchmark figure: the median over repeats. */
export interface BenchMedian {
  label: string;
  median: number;
  unit: string;
  repeats: number;
  /** How the figure was formed, when not a median of `repeats` runs (e.g. "mean of 2"). */
  summary?: string;
}

export function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

/** Median rate in millions per second of `run(n)` doing n operations (its return value keeps the work live). */
export function rate(label: string, n: number, repeats: number, run: (n: number) => number, warmupN = n): BenchMedian {
  let sink = run(warmupN); // warm-up / JIT
  const rates: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const t0 = performance.now();
    sink += run(n);
    const dt = (performance.now() - t0) / 1000;
    rates.push(n / dt / 1e6);
  }
  if (Number.isNaN(sink)) throw new Error('unreachable: keeps the result live');
  return { label, median: median(rates), unit: 'M/s', repeats };
}

/** Median wall time in milliseconds of `run()` over repeats, after `warmup` untimed calls (JIT). */
export function timeMs(label: string, repeats: number, run: () => unknown, warmup = 3): BenchMedian {
  for (let w = 0; w < warmup; w++) run();
  const ts: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const t0 = performance.now();
    run();
    ts.push(performance.now() - t0);
  }
  return { label, median: median(ts), unit: 'ms', repeats };
}

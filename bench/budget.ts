/**
 * Observing budget: the wall time of one budget (forecast bracket, then the
 * Monte Carlo search and the answer's neighbours) for the observer demo's
 * target moon at the default realization counts, in the main thread. The
 * issue's goal is under 30 s on the 2-core machine. The forecast alone is
 * timed beside it.
 */
import { performance } from 'node:perf_hooks';
import { planBudget } from '../src/app/planBudget.js';
import { median, type BenchMedian } from './measure.js';

/**
 * The forecast alone (median of 3 after a warm-up, ms) and `repeats` full budgets (s; the first
 * includes the JIT warm-up a user also pays), run from the repository root like the other benches.
 */
export function benchBudget(repeats = 1, scenarioPath = 'scenarios/demo-observer.yaml'): BenchMedian[] {
  const forecast: number[] = [];
  planBudget(scenarioPath, { forecastOnly: true }); // warm-up of the forecast path
  for (let r = 0; r < 3; r++) {
    const t0 = performance.now();
    planBudget(scenarioPath, { forecastOnly: true });
    forecast.push(performance.now() - t0);
  }
  const full: number[] = [];
  let evaluations = 0;
  let answer = '';
  for (let r = 0; r < repeats; r++) {
    const t0 = performance.now();
    const res = planBudget(scenarioPath, {});
    full.push((performance.now() - t0) / 1000);
    evaluations = res.evaluations.length;
    answer = res.answer.reached ? `${res.answer.transits} transits, ${res.answer.hours.toFixed(1)} h` : 'not reached';
  }
  return [
    { label: 'budget, observer demo target moon: forecast only', median: median(forecast), unit: 'ms', repeats: forecast.length },
    { label: `budget, observer demo target moon: forecast + Monte Carlo, default counts (${evaluations} evaluations; ${answer}); goal < 30 s`, median: median(full), unit: 's', repeats },
  ];
}

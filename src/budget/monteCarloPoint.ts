/**
 * One Monte Carlo evaluation of a budget at one value of the solved quantity:
 * exactly one sweep cell (`runCell`) per target moon on the scenario with that
 * value applied (`quantityScenario`): R moon realizations (phase and orientation
 * drawn as in the sweep) against false-alarm thresholds calibrated on no-moon
 * realizations of the same scenario, with Wilson intervals.
 *
 * Every evaluation of one moon uses the same cell index, so realization r
 * draws the same random stream at every value (common random numbers):
 * neighbouring values differ less by chance than independent runs would,
 * which keeps the estimated probability closer to monotone along the grid.
 */
import { performance } from 'node:perf_hooks';
import { runCell } from '../sweep/runCell.js';
import type { CellResult } from '../sweep/cellTypes.js';
import type { Scenario } from '../scenario/types.js';
import { wilsonInterval } from '../timing/falseAlarmCalibration.js';
import type { BudgetChannel, BudgetEvaluation } from './budgetTypes.js';

export interface MonteCarloSettings {
  seed: number;
  realizations: number;
  nullRealizations: number;
  channel: BudgetChannel;
  probability: number;
}

const num = (x: unknown): number => (typeof x === 'number' ? x : Number.NaN);

/** Run one cell; throws if the runner did not simulate it (an unstable moon is never simulated). */
export function runBudgetCell(scenario: Scenario, cellIndex: number, value: number, m: MonteCarloSettings): CellResult {
  const r = runCell(
    { index: cellIndex, coords: [value], scenario },
    { seed: m.seed, realizations: m.realizations, simulateUnstable: false, forecastOnly: false, nullRealizations: m.nullRealizations } as Parameters<typeof runCell>[1],
  );
  if (r.simulated !== true) throw new RangeError(`the moon at this value was not simulated: ${String(r.skipped_reason)}`);
  return r;
}

/** One target moon at grid index `index` (value `value`, `scenario` with the value applied). */
export function evaluateMoon(scenario: Scenario, index: number, value: number, m: MonteCarloSettings): BudgetEvaluation {
  const t0 = performance.now();
  const r = runBudgetCell(scenario, 0, value, m);
  const p = num(r[`pdet_${m.channel}`]);
  const channels: Record<string, number> = {};
  for (const ch of ['combined', 'ttv', 'tdv', 'dip', 'template'] as const) channels[ch] = num(r[`pdet_${ch}`]);
  return {
    index,
    value,
    probability: p,
    lower: num(r[`pdet_${m.channel}_lo`]),
    upper: num(r[`pdet_${m.channel}_hi`]),
    passed: p >= m.probability,
    channels,
    falseAlarmMeasured: num(r.false_alarm_measured_combined),
    realizations: m.realizations,
    nullRealizations: m.nullRealizations,
    seconds: (performance.now() - t0) / 1000,
  };
}

/**
 * A population at grid index `index`: the fraction of `scenarios` (one per
 * target moon, the value already applied) whose detection probability
 * reaches `m.probability`, with its Wilson interval over the moons, and
 * whether it reaches `fraction`. Moon k uses cell index `cellIndices[k]`.
 */
export function evaluatePopulation(scenarios: readonly Scenario[], cellIndices: readonly number[], index: number, value: number, m: MonteCarloSettings, fraction: number): BudgetEvaluation {
  const t0 = performance.now();
  let reached = 0;
  let falseAlarm = 0;
  for (let k = 0; k < scenarios.length; k++) {
    const r = runBudgetCell(scenarios[k], cellIndices[k], value, m);
    if (num(r[`pdet_${m.channel}`]) >= m.probability) reached++;
    falseAlarm += num(r.false_alarm_measured_combined);
  }
  const w = wilsonInterval(reached, scenarios.length);
  return {
    index,
    value,
    probability: w.estimate,
    lower: w.lower,
    upper: w.upper,
    passed: w.estimate >= fraction,
    channels: null,
    falseAlarmMeasured: falseAlarm / scenarios.length,
    realizations: m.realizations,
    nullRealizations: m.nullRealizations,
    seconds: (performance.now() - t0) / 1000,
  };
}

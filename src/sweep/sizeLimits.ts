/**
 * Size limits of a sweep, checked before any work starts, so that a run that
 * cannot finish in memory is refused with the number it would need and how
 * to change it, instead of growing until the process aborts.
 *
 * - Cells: every cell's scenario is parsed in the main thread before the run
 *   (about 0.1 ms each) and every cell's result is held until the outputs are
 *   written (about 1–2 kB each), and the report draws one map point per cell.
 *   40 000 cells (e.g. 200 × 200) keep this to seconds and tens of MB.
 * - No-moon calibration realizations per scenario without the moon: a whole
 *   set is held in memory while its cells run (per realization a few numbers
 *   and the binned residual stack, about 1–30 kB) and each costs about as much
 *   as a moon realization. 100 000 (the default 15/α for α = 1.5e-4, 25/α for 2.5e-4) is at most
 *   a few GB.
 */
import { InputError } from '../scenario/errors.js';

export const MAX_GRID_CELLS = 40_000;
export const MAX_NULL_REALIZATIONS = 100_000;

function big(n: number): string {
  return n >= 1e6 ? n.toExponential(2).replace('e+', 'e') : String(n);
}

/** Refuse a grid of more than MAX_GRID_CELLS cells. */
export function checkGridSize(shape: readonly number[]): void {
  const cells = shape.reduce((a, b) => a * b, 1);
  if (cells <= MAX_GRID_CELLS) return;
  throw new InputError([{
    path: 'sweep.axes',
    value: `${shape.join(' × ')} = ${big(cells)} cells`,
    allowed: `a sweep may have at most ${MAX_GRID_CELLS} cells (e.g. 200 × 200): lower the axes' count, or split the range into several sweeps with their own --out`,
  }]);
}

/**
 * Refuse a calibration of more than MAX_NULL_REALIZATIONS no-moon realizations.
 * `fromSweepBlock`: the count was set by sweep.no_moon_realizations (else derived from α).
 */
export function checkNullRealizations(count: number, falseAlarm: number, fromSweepBlock: boolean, where = ''): void {
  if (count <= MAX_NULL_REALIZATIONS) return;
  const at = where ? ` (${where})` : '';
  if (fromSweepBlock) {
    throw new InputError([{
      path: 'sweep.no_moon_realizations' + at,
      value: count,
      allowed: `at most ${MAX_NULL_REALIZATIONS} no-moon calibration realizations fit in memory (each set is held while its cells run): lower it`,
    }]);
  }
  // The default count is ⌈k/α⌉ with k = 15 (tail fit) or 25 (order statistic): nullSet.ts.
  const k = Math.round(count * falseAlarm);
  throw new InputError([{
    path: 'detection.false_alarm' + at,
    value: falseAlarm,
    allowed: `calibrating a false-alarm probability α needs about ${k}/α = ${big(count)} no-moon realizations per scenario without the moon; ` +
      `at most ${MAX_NULL_REALIZATIONS} fit in memory, so α must be at least ${k / MAX_NULL_REALIZATIONS} (e.g. "0.1 %"). ` +
      'For a smaller α, use the analytic forecast (sweep --forecast-only, or limits)',
  }]);
}

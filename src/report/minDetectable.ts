/**
 * The minimum detectable value of the y axis (the moon mass, on a mass ×
 * separation grid) at each x value: the smallest y whose detection
 * probability reaches a level. Between the last grid value below the level
 * and the first at or above it, y is interpolated linearly in probability
 * (in log y for a log axis); common practice, no source. When even the
 * smallest grid value reaches the level, y is that value and `at_grid_edge` is
 * set (the true minimum is lower); when no value does, y is null. When the
 * cell just below the first one reaching the level has no probability (not
 * simulated: unstable, touching the planet, skipped), the crossing may lie
 * anywhere in that gap: y is that first cell's value and `is_bound` is set
 * (the minimum is at most y; issue 17, the upturn at the stable edge).
 *
 * For an axis along which detection gets harder as the value grows (noise
 * level, cadence), direction 'decreasing' asks the mirror question: the
 * largest y that still reaches the level.
 */
import type { CellResult } from '../sweep/cellTypes.js';
import type { GridLayout } from './reportGrid.js';

export interface MinDetectablePoint {
  /** x value (SI) of the column. */
  x: number;
  /** Minimum detectable y (SI), or null when no cell in the column reaches the level. */
  y: number | null;
  at_grid_edge: boolean;
  /** y is only a bound (at most y, or at least y for 'decreasing'): the cells just before it in the search were not simulated. */
  is_bound: boolean;
  /** On a three-axis grid: the panel's value (SI) of the facet axis (see reportGrid.ts); absent otherwise. */
  facet?: number;
}

export function minDetectable(
  layout: GridLayout,
  xValues: readonly number[],
  yValues: readonly number[],
  yLog: boolean,
  probability: (c: CellResult) => number | null,
  level: number,
  direction: 'increasing' | 'decreasing' = 'increasing',
): MinDetectablePoint[] {
  if (!(level > 0 && level <= 1)) throw new RangeError(`level must be in (0, 1], got ${level}`);
  const sign = direction === 'increasing' ? 1 : -1;
  const order = yValues.map((v, j) => j).sort((a, b) => sign * (yValues[a] - yValues[b]));
  const out: MinDetectablePoint[] = [];
  for (let i = 0; i < layout.nx; i++) {
    let prev: { y: number; p: number } | null = null;
    let found: MinDetectablePoint = { x: xValues[i], y: null, at_grid_edge: false, is_bound: false };
    let gap = false;
    for (let k = 0; k < order.length; k++) {
      const j = order[k];
      const c = layout.cellAt(i, j);
      const p = c ? probability(c) : null;
      if (p === null) {
        prev = null; // a gap (unsimulated cell) breaks the interpolation
        gap = true;
        continue;
      }
      if (p >= level) {
        if (k === 0) {
          found = { x: xValues[i], y: yValues[j], at_grid_edge: true, is_bound: false };
        } else if (prev !== null && p > prev.p) {
          const f = (level - prev.p) / (p - prev.p);
          const y = yLog ? Math.exp(Math.log(prev.y) + f * (Math.log(yValues[j]) - Math.log(prev.y))) : prev.y + f * (yValues[j] - prev.y);
          found = { x: xValues[i], y, at_grid_edge: false, is_bound: false };
        } else {
          // Reached right after a gap: the crossing is somewhere in the unsimulated cells before it.
          found = { x: xValues[i], y: yValues[j], at_grid_edge: false, is_bound: prev === null && gap };
        }
        break;
      }
      prev = { y: yValues[j], p };
      gap = false;
    }
    out.push(found);
  }
  return out;
}

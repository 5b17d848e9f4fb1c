/**
 * The sweep grid: the Cartesian product of one to three axes, cells indexed
 * row-major (the last axis varies fastest), so cell i of a 2-axis grid with
 * counts (n0, n1) sits at axis indices (⌊i / n1⌋, i mod n1).
 */

export interface Grid {
  /** Number of values on each axis. */
  shape: number[];
  /** Total number of cells, the product of `shape`. */
  total: number;
  /** Index on each axis of cell `index`. */
  cellAxisIndices(index: number): number[];
  /** The axis values (SI) of cell `index`. */
  cellCoords(index: number): number[];
}

export function createGrid(axisValues: readonly (readonly number[])[]): Grid {
  if (axisValues.length === 0) throw new RangeError('axisValues must name at least one axis, got 0');
  for (let a = 0; a < axisValues.length; a++) {
    if (axisValues[a].length < 1) throw new RangeError(`axisValues[${a}] must hold at least one value, got 0`);
  }
  const shape = axisValues.map((v) => v.length);
  const total = shape.reduce((a, b) => a * b, 1);
  if (!Number.isSafeInteger(total)) throw new RangeError(`grid too large: ${shape.join(' × ')} cells`);
  const cellAxisIndices = (index: number): number[] => {
    if (!Number.isInteger(index) || index < 0 || index >= total) {
      throw new RangeError(`index must be an integer from 0 to ${total - 1}, got ${index}`);
    }
    const out = new Array<number>(shape.length);
    let rest = index;
    for (let a = shape.length - 1; a >= 0; a--) {
      out[a] = rest % shape[a];
      rest = Math.floor(rest / shape[a]);
    }
    return out;
  };
  return {
    shape,
    total,
    cellAxisIndices,
    cellCoords: (index) => cellAxisIndices(index).map((i, a) => axisValues[a][i]),
  };
}

/**
 * Writing a cell's axis values into the scenario document (kept apart from
 * the sweep-block parser so worker threads load only what they need).
 */
import { writeAxisValue, type AxisWriteContext } from './axisFields.js';

/**
 * The scenario document of one cell: a copy of `baseDoc` without its `sweep`
 * block and with each axis's value written in (as "<SI value> <SI unit>" text),
 * ready for `parseScenario`.
 */
export function applyAxisValues(baseDoc: unknown, axes: readonly { field: string; write: AxisWriteContext }[], coords: readonly number[]): Record<string, unknown> {
  if (coords.length !== axes.length) throw new RangeError(`coords must hold one value per axis (${axes.length}), got ${coords.length}`);
  const doc = structuredClone(baseDoc ?? {}) as Record<string, unknown>;
  delete doc.sweep;
  for (let a = 0; a < axes.length; a++) writeAxisValue(doc, axes[a].field, coords[a], axes[a].write);
  return doc;
}

/**
 * Varying a typed scenario: a sweep cell's axis values (or a budget's solved
 * quantity) applied to a `Scenario`, giving the cell's `Scenario`, validated
 * with the same field checks as any scenario (kept apart from the sweep-block
 * parser so worker threads load only what they need).
 *
 * A value is written into the scenario's document (`Scenario.document`) as
 * "<SI value> <SI unit>" and the document validated again, because the SI
 * values alone do not say how the fixed fields were written, which decides
 * what follows the varied one: a separation of "0.3 hill" follows the planet
 * and star masses, "12 Rp" the planet radius; a moon density makes its radius
 * follow its mass; a luminosity left out follows the star's radius and
 * temperature; an impact parameter (or an inclination) is kept while the
 * period changes the semi-major axis. Validating again also keeps every
 * derived quantity (semi-major axis, Hill radius, ground noise budget)
 * consistent and turns a moon that would touch its planet into the cell's
 * `touchesPlanet` label (`CELL_PARSE`), as on any grid cell.
 */
import { parseScenario, type ParseOptions } from '../scenario/parseScenario.js';
import { scenarioDocumentOf } from '../scenario/scenarioDocument.js';
import type { Scenario, ScenarioDocument } from '../scenario/types.js';
import { writeAxisValue, type AxisWriteContext } from './axisFields.js';

/** Grid cells parse a moon that touches its planet as a physical label, not an input error (parseScenario). */
export const CELL_PARSE: ParseOptions = { moonContact: 'label' };

/** What `applyAxes` needs of an axis: the field it varies and how a value is written (sweepSpec.ts). */
export interface AxisWrite {
  field: string;
  write: AxisWriteContext;
}

/**
 * The scenario document of one cell: a copy of `baseDoc` without its `sweep`
 * block and with each axis's value written in (as "<SI value> <SI unit>" text),
 * ready for `parseScenario`.
 */
export function applyAxisValues(baseDoc: unknown, axes: readonly AxisWrite[], coords: readonly number[]): ScenarioDocument {
  if (coords.length !== axes.length) throw new RangeError(`coords must hold one value per axis (${axes.length}), got ${coords.length}`);
  const doc = structuredClone(baseDoc ?? {}) as ScenarioDocument;
  delete doc.sweep;
  for (let a = 0; a < axes.length; a++) writeAxisValue(doc, axes[a].field, coords[a], axes[a].write);
  return doc;
}

/**
 * The scenario `base` with axis k's field set to `coords[k]` (SI), validated
 * as a grid cell (`CELL_PARSE`: a moon touching its planet is labelled, not
 * refused). Pure: `base` is not changed. Throws the scenario's InputError,
 * under the name `label`, for a cell no scenario could have.
 */
export function applyAxes(base: Scenario, axes: readonly AxisWrite[], coords: readonly number[], label = 'scenario'): Scenario {
  return parseScenario(applyAxisValues(scenarioDocumentOf(base), axes, coords), label, CELL_PARSE);
}

/**
 * The scenario `s` without its moon, validated afresh, so that every derived
 * quantity is that of the moonless system (the planet's semi-major axis from
 * Kepler's third law without the moon's mass, the inclination from the
 * impact parameter). Cells that differ only in their moon give equal results.
 */
export function withoutMoon(s: Scenario): Scenario {
  const rest: ScenarioDocument = { ...scenarioDocumentOf(s) };
  delete rest.moon;
  return parseScenario(rest, 'scenario without its moon');
}

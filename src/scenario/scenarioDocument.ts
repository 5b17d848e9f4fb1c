/**
 * The document of a typed scenario (`Scenario.document`): what a scenario is
 * varied through (sweep axes, a budget's solved quantity) and what the
 * entry points that take "a Scenario or a path" read its `sweep:` and
 * `budget:` blocks from.
 */
import type { Scenario, ScenarioDocument } from './types.js';

/** The document `s` was parsed from (a copy is not needed: callers copy before writing). */
export function scenarioDocumentOf(s: Scenario): ScenarioDocument {
  if (s.document) return s.document;
  throw new RangeError('scenario must come from parseScenario or loadScenario (its document says how each value was written, which a copy or a hand-built Scenario lacks)');
}

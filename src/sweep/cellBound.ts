/**
 * The known-template bound of one sweep cell (`pdet_bound`): the detection
 * probability no analysis of the cell's light curve can beat
 * (timing/knownTemplateBound.ts), with the moonless scenario of the cell's
 * null class as the planet-only reference, so the cells of a class share its
 * projector. Null where the cell has no orbit to model (no moon, or a moon
 * touching its planet) or no noise.
 */
import { parseScenario } from '../scenario/parseScenario.js';
import type { Scenario } from '../scenario/types.js';
import { knownTemplateBound } from '../timing/knownTemplateBound.js';

export function cellBound(doc: unknown, s: Scenario): number | null {
  if (!s.moon || s.moon.touchesPlanet) return null;
  const rest = { ...(doc as Record<string, unknown>) };
  delete rest.moon;
  const b = knownTemplateBound(s, { planetOnly: parseScenario(rest, 'scenario without its moon') });
  return Number.isFinite(b.probability) ? b.probability : null;
}

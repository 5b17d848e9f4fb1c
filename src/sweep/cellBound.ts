/**
 * The known-template bound of one sweep cell (`pdet_bound`): the detection
 * probability no analysis of the cell's light curve can beat
 * (timing/knownTemplateBound.ts), with the moonless scenario of the cell's
 * null class as the planet-only reference, so the cells of a class share its
 * projector. Null where the cell has no orbit to model (no moon, or a moon
 * touching its planet) or no noise.
 */
import type { Scenario } from '../scenario/types.js';
import { knownTemplateBound } from '../timing/knownTemplateBound.js';
import { withCampaignEpochs } from '../noise/observingPlan.js';
import { withoutMoon } from './applyAxes.js';

/** `s`: the cell's scenario as simulated (campaign epochs applied); `given`: the cell's scenario as the grid made it. */
export function cellBound(s: Scenario, given: Scenario): number | null {
  if (!s.moon || s.moon.touchesPlanet) return null;
  const b = knownTemplateBound(s, { planetOnly: withCampaignEpochs(withoutMoon(given)) });
  return Number.isFinite(b.probability) ? b.probability : null;
}

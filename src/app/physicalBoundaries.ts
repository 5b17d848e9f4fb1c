/**
 * The physical boundaries drawn over a moon mass × separation map, from the
 * base scenario's `computeLimits` (each number's source is cited there):
 * fluid Roche limit, prograde and retrograde stable limits (Domingos, Winter
 * & Yokoyama 2006), and the largest moon surviving tidal migration
 * (Barnes & O'Brien 2002).
 */
import { computeLimits } from '../limits/computeLimits.js';
import { parseScenario } from '../scenario/parseScenario.js';
import type { PhysicalBoundaries } from '../report/mapFigures.js';

export type { PhysicalBoundaries };


/** Boundaries of the base scenario document (null when it cannot be read). */
export function physicalBoundaries(scenarioDoc: unknown): PhysicalBoundaries | null {
  if (scenarioDoc === null || scenarioDoc === undefined) return null;
  const s = parseScenario(scenarioDoc, 'scenario');
  const l = computeLimits(s);
  return {
    rocheLimitM: l.roche_limit_m,
    stableLimitProgradeM: l.stable_max_separation_m,
    stableLimitRetrogradeM: l.stable_max_separation_retrograde_m,
    tidalSurvivalMassKg: l.tidal_max_moon_mass_kg,
    hillRadiusM: l.hill_radius_m,
    planetRadiusM: s.planet.radiusM,
    retrograde: s.moon?.retrograde ?? false,
  };
}

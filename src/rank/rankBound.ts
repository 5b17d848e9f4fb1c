/**
 * The known-template bound for a ranked planet: at each separation, the
 * smallest moon that the best possible test (a matched filter knowing the
 * moon's template, src/timing/knownTemplateBound.ts, after Kay 1998) detects
 * with probability RANK_PDET. It bounds what any analysis of the same light
 * curve can do, where the forecast of the timing channels is a lower
 * estimate; the two bracket what a real search reaches. About 10 ms per
 * evaluation, so it runs for the top of the list only.
 *
 * Like the forecast it brackets, the bound sees `observation.transits` whole
 * transits: the scenario's site, target, campaign and visibility are left
 * out here (with them the bound would count only the campaign's observable
 * exposures, a different question from the forecast's; the campaign's
 * columns of the ranking answer that one).
 */
import type { Scenario } from '../scenario/types.js';
import { scenarioDocumentOf } from '../scenario/scenarioDocument.js';
import { parseScenario } from '../scenario/parseScenario.js';
import { withoutSkyBlocks } from '../scenario/readSky.js';
import { knownTemplateBound } from '../timing/knownTemplateBound.js';
import { withoutMoon } from '../sweep/applyAxes.js';
import { scenarioMoonDensity } from '../budget/targetMoon.js';
import { moonScenario, solveMinMass, RANK_SEPARATIONS_HILL } from './rankPlanet.js';

/** Per separation of RANK_SEPARATIONS_HILL: the bound's smallest detectable moon (null where `allowed[k]` is false or none is detected below the planet mass). */
export function boundMinMasses(s: Scenario, allowed: readonly boolean[], guessesKg: ReadonlyArray<number | null>): Array<number | null> {
  const base = withoutSkyBlocks(scenarioDocumentOf(s));
  const density = scenarioMoonDensity(s);
  // The planet-only model is the same for every moon: one basis for the whole search.
  const planetOnly = withoutMoon(parseScenario(base, s.name));
  return RANK_SEPARATIONS_HILL.map((f, k) => {
    if (!allowed[k]) return null;
    const prob = (m: number): number | null => {
      const sm = moonScenario(base, m, f, density, s.name);
      if (sm.moon?.touchesPlanet) return null;
      const p = knownTemplateBound(sm, { planetOnly }).probability;
      return Number.isFinite(p) ? p : null;
    };
    // The bound detects at least what the forecast does: start the search below the forecast's mass.
    const guess = guessesKg[k] ?? s.planet.massKg / 10;
    return solveMinMass(prob, s.planet.massKg, guess / 2).massKg;
  });
}

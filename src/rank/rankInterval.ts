/**
 * The ranking's uncertainty from the one stated error the list's model has:
 * a planet whose mass comes from its radius (flag mass_from_radius) takes it
 * from the mean Chen & Kipping (2017) relation, whose intrinsic radius
 * scatter they state per regime (Chen & Kipping 2017, ApJ 834, 17, Table 1:
 * fractional σ_R = 4.03 % Terran, 14.6 % Neptunian). The planet mass at the
 * radius ± 1 σ_R is inverted through the same relation, the forecast's
 * minimum moon mass is recomputed at both masses, and each planet's rank
 * interval is the span of ranks its minimum-mass interval allows against
 * the others' intervals. Rows with a stated mass carry no interval here
 * (their mass error is not in the list): the interval is a floor on the
 * rank's uncertainty, not all of it (the forecast's own model error is not
 * quantified).
 */
import type { Scenario, ScenarioDocument } from '../scenario/types.js';
import { parseScenario } from '../scenario/parseScenario.js';
import { CELL_PARSE } from '../sweep/applyAxes.js';
import { scenarioDocumentOf } from '../scenario/scenarioDocument.js';
import { CHEN_KIPPING_TRANSITIONS_KG } from '../physics/massRadius.js';
import { M_JUP_KG } from '../physics/constants.js';
import { chenKippingMassFromRadius } from './planetTable.js';
import { rankPlanet, type RankSettings } from './rankPlanet.js';

/** Chen & Kipping (2017, Table 1) fractional intrinsic radius scatter, Terran and Neptunian regimes. */
export const CHEN_KIPPING_RADIUS_SCATTER = { terran: 0.0403, neptunian: 0.146 } as const;

export interface MassInterval {
  planet_mass_low_kg: number | null;
  planet_mass_high_kg: number | null;
  best_min_moon_mass_low_kg: number | null;
  best_min_moon_mass_high_kg: number | null;
}

/** The planet mass at the radius ∓ 1 σ_R of its regime (null where the inversion has no single mass). */
export function massFromRadiusRange(radiusM: number, massKg: number): [number | null, number | null] {
  const sigma = massKg < CHEN_KIPPING_TRANSITIONS_KG.terranNeptunian ? CHEN_KIPPING_RADIUS_SCATTER.terran : CHEN_KIPPING_RADIUS_SCATTER.neptunian;
  const lo = chenKippingMassFromRadius(radiusM * (1 - sigma));
  const hi = chenKippingMassFromRadius(radiusM * (1 + sigma));
  return [Number.isFinite(lo) ? lo : null, Number.isFinite(hi) ? hi : null];
}

function withPlanetMass(s: Scenario, massKg: number): Scenario {
  const doc = structuredClone(scenarioDocumentOf(s)) as Record<string, unknown>;
  const planet = { ...(doc.planet as Record<string, unknown>) };
  planet.mass = `${massKg / M_JUP_KG} Mjup`;
  doc.planet = planet;
  return parseScenario(doc as ScenarioDocument, s.name, CELL_PARSE);
}

/**
 * The interval of a mass_from_radius planet: planet masses at ±1 σ_R and the
 * forecast's smallest moon (over the separations) at each; for other rows
 * every value is null. `settings.calendar` is not needed for the masses and is
 * turned off. The low and high moon masses are the smaller and larger of the
 * two and the nominal (the minimum mass is not monotonic in the planet mass
 * near the Roche and stable limits).
 */
export function massInterval(s: Scenario, row: number, flags: readonly string[], nominalBestKg: number | null, settings: RankSettings): MassInterval {
  const none: MassInterval = { planet_mass_low_kg: null, planet_mass_high_kg: null, best_min_moon_mass_low_kg: null, best_min_moon_mass_high_kg: null };
  if (!flags.includes('mass_from_radius')) return none;
  const [lo, hi] = massFromRadiusRange(s.planet.radiusM, s.planet.massKg);
  const bests: Array<number | null> = [nominalBestKg];
  for (const m of [lo, hi]) {
    if (m === null) bests.push(null);
    else bests.push(rankPlanet(withPlanetMass(s, m), row, flags, { ...settings, calendar: false }).best_min_mass_kg);
  }
  const found = bests.filter((b): b is number => b !== null);
  return {
    planet_mass_low_kg: lo,
    planet_mass_high_kg: hi,
    best_min_moon_mass_low_kg: found.length ? Math.min(...found) : null,
    // A mass at which no moon is found counts as unbounded above (null).
    best_min_moon_mass_high_kg: found.length === bests.length ? Math.max(...found) : null,
  };
}

/** What rankIntervals reads of a ranked planet. */
export interface RankedForInterval {
  rank: number;
  best_min_moon_mass_kg: number | null;
  flags: readonly string[];
  best_min_moon_mass_low_kg: number | null;
  best_min_moon_mass_high_kg: number | null;
}

/**
 * Rank intervals [best, worst] (1: first) from the minimum-mass intervals: a
 * planet's best rank counts the planets surely ahead of it (their high end
 * below its low end), its worst rank the planets possibly ahead (their low
 * end below its high end); equal ends keep the nominal order. A planet
 * without an interval has [its value, its value]; one with no detectable moon
 * (null) is ∞ (they rank last, by the nominal order among themselves).
 * Common practice for ranks under interval uncertainty, no source. O(n²).
 */
export function rankIntervals(ps: readonly RankedForInterval[]): Array<[number, number]> {
  const inf = (x: number | null) => x ?? Infinity;
  const lo = ps.map((p) => (p.flags.includes('mass_from_radius') ? inf(p.best_min_moon_mass_low_kg) : inf(p.best_min_moon_mass_kg)));
  const hi = ps.map((p) => (p.flags.includes('mass_from_radius') ? inf(p.best_min_moon_mass_high_kg) : inf(p.best_min_moon_mass_kg)));
  return ps.map((p, i) => {
    if (p.best_min_moon_mass_kg === null) return [p.rank, p.rank];
    let best = 1;
    let worst = 1;
    for (let j = 0; j < ps.length; j++) {
      if (j === i) continue;
      if (hi[j] < lo[i] || (hi[j] === lo[i] && ps[j].rank < p.rank)) best++;
      if (lo[j] < hi[i] || (lo[j] === hi[i] && ps[j].rank < p.rank)) worst++;
    }
    return [best, worst];
  });
}

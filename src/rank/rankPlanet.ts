/**
 * The forecast tier of `moonsieve rank` for one planet, in milliseconds: the
 * moons its system allows (Roche limit to stable limit, tidal survival), the
 * smallest moon the analytic forecast detects at a few separations, the
 * observable transits of the campaign, the cost for the scenario's target
 * moon and whether that moon is temperate. Every number comes from the same
 * functions as the single-planet commands: `computeLimits` (`limits`),
 * `forecastTransitsNeeded` (`budget`'s forecast), and `nightsPlan` (`budget`'s
 * nights and campaign counts).
 */
import { computeLimits, type LimitsJson } from '../limits/computeLimits.js';
import { parseScenario } from '../scenario/parseScenario.js';
import { CELL_PARSE } from '../sweep/applyAxes.js';
import { scenarioDocumentOf } from '../scenario/scenarioDocument.js';
import type { Scenario, ScenarioDocument } from '../scenario/types.js';
import { scenarioMoonDensity } from '../budget/targetMoon.js';
import { forecastTransitsNeeded, moonSignal, valuePrecision } from '../budget/budgetForecast.js';
import { DEFAULT_BUDGET_PROBABILITY, MAX_BUDGET_TRANSITS, MIN_BUDGET_TRANSITS } from '../budget/budgetSpec.js';
import { MAX_EXTENSION_YEARS, nightsPlan } from '../budget/nightsBudget.js';
import { M_EARTH_KG } from '../physics/constants.js';

/** Separations, in Hill radii, at which the minimum detectable moon mass is found. */
export const RANK_SEPARATIONS_HILL = [0.1, 0.2, 0.3, 0.45] as const;
/** The detection probability that defines "detectable" for the minimum mass (the forecast's median). */
export const RANK_PDET = 0.5;
/** The bisection's mass range, kg: 1e-4 to 1e3 Earth masses (a moon above the planet's mass is refused below). */
export const RANK_MASS_RANGE_KG = [1e-4 * M_EARTH_KG, 1e3 * M_EARTH_KG] as const;

export interface SeparationReach {
  separation_hill: number;
  separation_m: number;
  /** Why no mass is given: 'inside Roche limit', 'beyond stable limit', 'not detectable below the planet mass', 'no forecast'; null when a mass is given. */
  note: string | null;
  /** Smallest moon mass whose forecast combined detection probability reaches RANK_PDET; null with a note. */
  min_mass_kg: number | null;
}

/** What a ranked planet is, the same in the internal rank and in rank.json (RankedPlanetJson). */
export interface PlanetFacts {
  name: string;
  row: number;
  flags: string[];
  planet_mass_kg: number;
  planet_radius_m: number;
  period_s: number;
  hill_radius_m: number;
  roche_limit_m: number;
  stable_max_separation_m: number;
  tidal_max_moon_mass_kg: number;
  in_habitable_zone: boolean | null;
  timing_precision_s: number;
  transits: number;
  best_separation_hill: number | null;
  /** The target moon (the scenario's moon block). */
  target_placement: string[] | null;
  target_pdet_forecast_combined: number | null;
  target_transits_needed: number | null;
  target_habitability: string | null;
}

export interface PlanetRank extends PlanetFacts {
  reach: SeparationReach[];
  /** The smallest of the reach masses (null: none detectable at any separation). */
  best_min_mass_kg: number | null;
  /** Campaign counts (null without site/visibility, target and campaign). */
  campaign_transits: number | null;
  campaign_full: number | null;
  /** Expected whole-transit equivalents of the campaign after weather (nightsPlan). */
  campaign_expected_whole: number | null;
  /** The nights plan for target_transits_needed (null without a campaign or without a count). */
  nights: number | null;
  on_sky_s: number | null;
  needed_length_s: number | null;
  /** The target moon is temperate, stably placed and needs no more transits than the campaign (or the scenario's count) holds. */
  habitable_moon_in_reach: boolean;
  notes: string[];
}

/** A moon of `massKg` at `fHill` Hill radii, with the scenario's moon density (rock without a moon). */
function moonDocument(base: ScenarioDocument, massKg: number, fHill: number, densityKgM3: number): ScenarioDocument {
  const doc = { ...base } as Record<string, unknown>;
  const old = (base.moon && typeof base.moon === 'object' ? base.moon : {}) as Record<string, unknown>;
  const moon: Record<string, unknown> = { ...old, mass: `${massKg} kg`, density: `${densityKgM3} kg/m^3`, separation: `${fHill} hill` };
  delete moon.radius;
  doc.moon = moon;
  return doc as ScenarioDocument;
}

/** The forecast's combined probability for a moon of `massKg` at `fHill` (computeLimits on the validated scenario). */
export function pdetAt(base: ScenarioDocument, massKg: number, fHill: number, densityKgM3: number, label: string): { pdet: number | null; limits: LimitsJson } {
  // A moon so heavy that it touches its planet is a label (no forecast), as on a sweep cell.
  const s = parseScenario(moonDocument(base, massKg, fHill, densityKgM3), label, CELL_PARSE);
  const l = computeLimits(s);
  return { pdet: l.pdet_forecast_combined, limits: l };
}

/** The root finder stops when the forecast is within this of RANK_PDET (0.2 percentage points; about 0.3 % in mass). */
export const RANK_PDET_TOLERANCE = 2e-3;
/** Largest step of the search in log moon mass (a factor 8). */
const MAX_LOG_STEP = Math.log(8);
const logit = (p: number): number => {
  const q = Math.min(1 - 1e-12, Math.max(1e-12, p));
  return Math.log(q / (1 - q));
};

/**
 * Smallest mass at which `prob(massKg)` (a detection probability rising with
 * the moon mass) reaches RANK_PDET, between RANK_MASS_RANGE_KG[0] and `topKg`.
 * Secant steps on logit(prob) against log mass from `guessKg` (at most ×8
 * per step), kept inside the bracket once one is found, with bisection when a
 * secant step leaves it (a safeguarded secant, e.g. Press et al. 2007,
 * Numerical Recipes, 3rd ed., §9.2–9.3), until the probability is within
 * RANK_PDET_TOLERANCE of RANK_PDET. Null with a note when no mass up to
 * `topKg` reaches it.
 */
export function solveMinMass(prob: (massKg: number) => number | null, topKg: number, guessKg: number): { massKg: number | null; note: string | null; evaluations: number } {
  const xMin = Math.log(RANK_MASS_RANGE_KG[0]);
  const xMax = Math.log(Math.min(RANK_MASS_RANGE_KG[1], topKg));
  let evaluations = 0;
  const p = (x: number): number | null => {
    evaluations++;
    const v = prob(Math.exp(x));
    return v === null || Number.isNaN(v) ? null : v;
  };
  let x0 = Math.min(xMax, Math.max(xMin, Math.log(guessKg)));
  const p0 = p(x0);
  if (p0 === null) return { massKg: null, note: 'no forecast', evaluations };
  if (Math.abs(p0 - RANK_PDET) < RANK_PDET_TOLERANCE) return { massKg: Math.exp(x0), note: null, evaluations };
  let f0 = logit(p0) - logit(RANK_PDET);
  let lo = f0 < 0 ? x0 : -Infinity;
  let hi = f0 >= 0 ? x0 : Infinity;
  let x1 = Math.min(xMax, Math.max(xMin, x0 + (f0 < 0 ? 0.5 : -0.5)));
  for (let i = 0; i < 60; i++) {
    if (x1 === x0) {
      // At an end of the range with the root beyond it.
      if (f0 < 0) return { massKg: null, note: 'not detectable below the planet mass', evaluations };
      return { massKg: Math.exp(xMin), note: null, evaluations };
    }
    const p1 = p(x1) ?? 0; // no probability above (a moon touching its planet): not detected
    if (Math.abs(p1 - RANK_PDET) < RANK_PDET_TOLERANCE) return { massKg: Math.exp(x1), note: null, evaluations };
    const f1 = logit(p1) - logit(RANK_PDET);
    if (f1 < 0) lo = Math.max(lo, x1);
    else hi = Math.min(hi, x1);
    let x2 = f1 !== f0 ? x1 - (f1 * (x1 - x0)) / (f1 - f0) : x1 + (f1 < 0 ? MAX_LOG_STEP : -MAX_LOG_STEP);
    if (!Number.isFinite(x2)) x2 = x1 + (f1 < 0 ? MAX_LOG_STEP : -MAX_LOG_STEP);
    x2 = Math.min(x1 + MAX_LOG_STEP, Math.max(x1 - MAX_LOG_STEP, x2));
    if (Number.isFinite(lo) && Number.isFinite(hi)) {
      if (!(x2 > lo && x2 < hi)) x2 = 0.5 * (lo + hi);
      if (hi - lo < 1e-6) return { massKg: Math.exp(hi), note: null, evaluations };
    }
    x2 = Math.min(xMax, Math.max(xMin, x2));
    x0 = x1;
    f0 = f1;
    x1 = x2;
  }
  return { massKg: Number.isFinite(hi) ? Math.exp(hi) : null, note: Number.isFinite(hi) ? null : 'no convergence', evaluations };
}

/** Smallest moon mass at `fHill` whose forecast (computeLimits' pdet_forecast_combined) reaches RANK_PDET (solveMinMass). */
export function minDetectableMass(base: ScenarioDocument, s: Scenario, fHill: number, densityKgM3: number, guessKg = M_EARTH_KG): { massKg: number | null; note: string | null; evaluations: number } {
  return solveMinMass((m) => pdetAt(base, m, fHill, densityKgM3, s.name).pdet, s.planet.massKg, guessKg);
}

/** The scenario with a moon of `massKg` at `fHill` Hill radii (the target moon's density and other elements). */
export function moonScenario(base: ScenarioDocument, massKg: number, fHill: number, densityKgM3: number, label: string): Scenario {
  return parseScenario(moonDocument(base, massKg, fHill, densityKgM3), label, CELL_PARSE);
}

export interface RankSettings {
  /** Probability the target moon's transit count is solved for (budget's default 0.9). */
  probability: number;
  /** Whether to compute the campaign calendar and nights (needs site or visibility, target and campaign). */
  calendar: boolean;
}

export const DEFAULT_RANK_SETTINGS: RankSettings = { probability: DEFAULT_BUDGET_PROBABILITY, calendar: true };

export function rankPlanet(s: Scenario, row: number, flags: readonly string[], settings: RankSettings = DEFAULT_RANK_SETTINGS): PlanetRank {
  const base = scenarioDocumentOf(s);
  const notes: string[] = [];
  const l = computeLimits(s);
  const density = scenarioMoonDensity(s);
  const reach: SeparationReach[] = [];
  let guess = M_EARTH_KG;
  for (const f of RANK_SEPARATIONS_HILL) {
    const sep = f * l.hill_radius_m;
    const r: SeparationReach = { separation_hill: f, separation_m: sep, note: null, min_mass_kg: null };
    if (sep < l.roche_limit_m) r.note = 'inside Roche limit';
    else if (sep > l.stable_max_separation_m) r.note = 'beyond stable limit';
    else {
      const m = minDetectableMass(base, s, f, density, guess);
      r.min_mass_kg = m.massKg;
      // The TTV amplitude grows about as the separation (Kipping 2009a): the next separation starts below.
      if (m.massKg !== null) guess = m.massKg / 1.6;
      r.note = m.note;
    }
    reach.push(r);
  }
  let best: SeparationReach | null = null;
  for (const r of reach) if (r.min_mass_kg !== null && (best === null || r.min_mass_kg < best.min_mass_kg!)) best = r;

  // A detectable moon heavier than any moon that survives tidal migration over the star's age (Barnes & O'Brien 2002,
  // computeLimits' tidal_max_moon_mass_kg; prograde moons only, as the placement applies it) is no moon to look for.
  const aboveTidal = reach.filter((r) => r.min_mass_kg !== null && r.min_mass_kg > l.tidal_max_moon_mass_kg).map((r) => r.separation_hill);
  if (aboveTidal.length > 0 && !(s.moon?.retrograde ?? false)) {
    notes.push(`at ${aboveTidal.join(', ')} Hill radii the smallest detectable moon is heavier than the largest moon that survives tidal migration over the star's age (${Number((l.tidal_max_moon_mass_kg / M_EARTH_KG).toPrecision(3))} Mearth, Barnes & O'Brien 2002): no moon that survives there is detectable`);
  }
  const inHz = l.habitable_zone_inner_m === null || l.habitable_zone_outer_m === null ? null
    : s.planet.semiMajorAxisM >= l.habitable_zone_inner_m && s.planet.semiMajorAxisM <= l.habitable_zone_outer_m;

  let needed: number | null = null;
  let habitability: string | null = null;
  const stable = l.moon_placement !== null && l.moon_placement.length === 1 && l.moon_placement[0] === 'stable';
  if (s.moon && stable) {
    needed = forecastTransitsNeeded('combined', moonSignal(l), valuePrecision(l), settings.probability, MIN_BUDGET_TRANSITS, MAX_BUDGET_TRANSITS);
    habitability = l.energy_budget?.verdict ?? null;
  } else if (s.moon) {
    // As budget does: a moon that cannot orbit there is not costed.
    notes.push(`the target moon cannot orbit this planet (${(l.moon_placement ?? []).join('; ')}): no cost given`);
    habitability = l.energy_budget?.verdict ?? null;
  }
  let campaign: { transits: number; full: number; expected_whole: number } | null = null;
  let nights: number | null = null;
  let onSky: number | null = null;
  let length: number | null = null;
  const sky = s.sky;
  if (settings.calendar && sky && sky.campaign && sky.target && (sky.sites.length > 0 || sky.visibility)) {
    // The nights plan (budget's) holds the campaign's counts too; without a count it books every usable epoch.
    const plan = nightsPlan(s, needed, s.name);
    campaign = { transits: plan.campaign.transits, full: plan.campaign.full, expected_whole: plan.campaign.expected_whole_equivalent };
    if (needed !== null && plan.needed_length_s !== null) {
      nights = plan.nights;
      onSky = plan.on_sky_s;
      length = plan.needed_length_s;
    } else if (needed !== null) {
      notes.push(`the ${needed} transits the target moon needs are not reached within the campaign extended by ${MAX_EXTENSION_YEARS} years`);
    }
  } else if (settings.calendar) {
    notes.push('no site (or visibility), target and campaign: no calendar; every transit assumed observed whole');
  }
  const available = campaign ? campaign.expected_whole : s.observation.transits;
  const inReach = habitability === 'temperate' && stable && needed !== null && needed <= available;
  return {
    name: s.name,
    row,
    flags: [...flags],
    planet_mass_kg: s.planet.massKg,
    planet_radius_m: s.planet.radiusM,
    period_s: s.planet.periodS,
    hill_radius_m: l.hill_radius_m,
    roche_limit_m: l.roche_limit_m,
    stable_max_separation_m: l.stable_max_separation_m,
    tidal_max_moon_mass_kg: l.tidal_max_moon_mass_kg,
    in_habitable_zone: inHz,
    timing_precision_s: l.timing_precision_s,
    transits: l.transits,
    reach,
    best_min_mass_kg: best ? best.min_mass_kg : null,
    best_separation_hill: best ? best.separation_hill : null,
    target_placement: l.moon_placement,
    target_pdet_forecast_combined: l.pdet_forecast_combined,
    target_transits_needed: needed,
    target_habitability: habitability,
    campaign_transits: campaign ? campaign.transits : null,
    campaign_full: campaign ? campaign.full : null,
    campaign_expected_whole: campaign ? campaign.expected_whole : null,
    nights,
    on_sky_s: onSky,
    needed_length_s: length,
    habitable_moon_in_reach: inReach,
    notes,
  };
}

/** What the rank order looks at (compareRankKeys). */
export interface RankKey {
  /** Best minimum moon mass, kg (null: none detectable). */
  mass: number | null;
  /** Transits the target moon needs (null: not reachable). */
  transits: number | null;
  name: string;
  row: number;
}

/** Rank order: smallest best minimum mass first (none detectable last), then fewest transits needed, then name, then row. */
export function compareRankKeys(a: RankKey, b: RankKey): number {
  const ma = a.mass ?? Infinity;
  const mb = b.mass ?? Infinity;
  if (ma !== mb) return ma < mb ? -1 : 1;
  const ta = a.transits ?? Infinity;
  const tb = b.transits ?? Infinity;
  if (ta !== tb) return ta < tb ? -1 : 1;
  return a.name < b.name ? -1 : a.name > b.name ? 1 : a.row - b.row;
}

/** compareRankKeys on ranked planets. */
export function compareRanks(a: PlanetRank, b: PlanetRank): number {
  const key = (p: PlanetRank): RankKey => ({ mass: p.best_min_mass_kg, transits: p.target_transits_needed, name: p.name, row: p.row });
  return compareRankKeys(key(a), key(b));
}

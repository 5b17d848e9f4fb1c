/**
 * The ranked list as the project's vocabulary (`rank.json`, schema
 * moonsieve/rank/1): one entry per ranked planet in rank order, the skipped
 * rows with their problems, and what the forecast leaves out. Nothing in it
 * depends on the run (no times, no worker or shard count but the shard
 * itself), so a merge of shards equals the unsharded list byte for byte.
 */
import { rankIntervals, type MassInterval } from './rankInterval.js';
import { formatProblem, type FieldProblem } from '../scenario/errors.js';
import { compareRankKeys, compareRanks, RANK_PDET, RANK_SEPARATIONS_HILL, type PlanetFacts, type PlanetRank, type RankKey } from './rankPlanet.js';
import type { Shard } from '../sweep/shard.js';

export const RANK_SCHEMA = 'moonsieve/rank/1';

export interface RankedPlanetJson extends PlanetFacts {
  rank: number;
  min_moon_mass_kg: Array<number | null>;
  min_moon_mass_notes: Array<string | null>;
  best_min_moon_mass_kg: number | null;
  campaign_transits: number | null;
  campaign_full_transits: number | null;
  campaign_expected_whole_transits: number | null;
  nights: number | null;
  on_sky_s: number | null;
  needed_length_s: number | null;
  habitable_moon_in_reach: boolean;
  /** Known-template bound's smallest detectable moon per separation (the best any analysis can do); null when not computed for this planet. */
  bound_min_moon_mass_kg: Array<number | null> | null;
  /** Monte Carlo confirmation (`budget`'s search) of the target moon's transits; null when not run for this planet. */
  mc_transits_needed: number | null;
  mc_pdet: number | null;
  mc_pdet_lower: number | null;
  mc_pdet_upper: number | null;
  mc_realizations: number | null;
  mc_nights: number | null;
  mc_on_sky_s: number | null;
  /** mass_from_radius rows: planet mass at the radius ∓ 1 σ_R of Chen & Kipping (2017); null for other rows (see rankInterval.ts). */
  planet_mass_low_kg: number | null;
  planet_mass_high_kg: number | null;
  /** The forecast's smallest moon over those planet masses (null high end: none found at one of them; null both: no interval). */
  best_min_moon_mass_low_kg: number | null;
  best_min_moon_mass_high_kg: number | null;
  /** Rank interval those masses allow against the other planets' (1: first). */
  rank_best: number;
  rank_worst: number;
  /** The planet's detail sweep scenario (`details/<folder>/scenario.yaml`, relative to the rank folder); null when not written (`--detail 0`, or below the rows written). */
  detail_scenario: string | null;
  /** Its sweep report (`details/<folder>/report.html`); null when that sweep was not run (`--detail`). */
  detail_report: string | null;
  notes: string[];
}

export interface SkippedRowJson {
  row: number;
  line: number;
  name: string;
  problems: string[];
}

export interface RankJson {
  schema: typeof RANK_SCHEMA;
  scenario: string;
  /** "K/N" for one shard's output; null for a whole list (or a merge of all shards). */
  shard: string | null;
  planets_in_list: number;
  planets_ranked: number;
  separations_hill: number[];
  pdet_threshold: number;
  transits_probability: number;
  /** How many of the top planets have the known-template bound (0: none). */
  bound_computed: number;
  /** How many of the top planets the Monte Carlo confirmed (0: none). */
  mc_confirmed: number;
  /** How many of the top planets were given a detail sweep (`--detail`; a shard: its own top; 0: none). */
  detail_top: number;
  skipped: SkippedRowJson[];
  /** Things about the list the user should know (ignored columns). */
  notes: string[];
  assumptions: string[];
  planets: RankedPlanetJson[];
}

export const RANK_ASSUMPTIONS: readonly string[] = [
  `minimum moon mass: the smallest moon whose analytic forecast (computeLimits' pdet_forecast_combined, as \`moonsieve limits\` gives it) reaches ${RANK_PDET} at each separation; a white-noise forecast of the timing channels (TTV, TDV), a lower estimate of what a full analysis (moon dip, template search) reaches; red noise, gaps and the photocentric TTV of large moons are left out (see \`moonsieve limits\` on one planet and \`moonsieve sweep\` for the Monte Carlo); a minimum mass can exceed the largest moon that survives tidal migration (tidal_max_moon_mass_kg), which the planet's notes then say`,
  'target moon cost: the fewest transits whose joint TTV+TDV forecast reaches the stated probability, as `moonsieve budget --forecast-only` finds it; nights and hours on sky from the campaign calendar of the scenario\'s site(s) and each row\'s coordinates, as `moonsieve budget` plans them; the Monte Carlo confirmation (mc_* keys, `budget`\'s search with its realizations) is run only for the top planets (`mc_confirmed`), and only its answer, not the forecast, includes the moon dip and the Monte Carlo\'s combined rule',
  'known-template bound (bound_min_moon_mass_kg, top planets only): the smallest moon a matched filter that knows the moon\'s template detects with the same probability (Kay 1998), the best any analysis of the same white-noise light curve can do; the forecast is a lower estimate of the sensitivity, the bound an upper one',
  'the rank: smallest minimum moon mass over the separations first, then fewest transits for the target moon, then name; it carries the forecast\'s model error, which is not quantified; rank_best–rank_worst give only the spread from the Chen & Kipping (2017) radius scatter of mass_from_radius rows (stated-mass rows have no interval)',
  'habitable moon in reach: the target moon is temperate by its energy budget (a flux budget is a first screen, not a climate model), stably placed, and needs no more transits than the campaign is expected to deliver whole (or than the scenario\'s transit count without a campaign)',
  'every row shares the scenario\'s other values: limb darkening, stellar age, albedos, tidal parameters, eccentricity, instrument and observation; a star whose limb darkening differs much from the scenario\'s gets a slightly wrong timing precision',
  'rows without a planet mass take it from the radius by inverting the mean Chen & Kipping (2017) relation (flag mass_from_radius): that relation has a wide scatter (about 15 % in radius for Neptunes), so such masses are rough',
];

export function planetToJson(p: PlanetRank, rank: number, interval: MassInterval | null = null): RankedPlanetJson {
  return {
    rank,
    row: p.row,
    name: p.name,
    flags: p.flags,
    planet_mass_kg: p.planet_mass_kg,
    planet_radius_m: p.planet_radius_m,
    period_s: p.period_s,
    hill_radius_m: p.hill_radius_m,
    roche_limit_m: p.roche_limit_m,
    stable_max_separation_m: p.stable_max_separation_m,
    tidal_max_moon_mass_kg: p.tidal_max_moon_mass_kg,
    in_habitable_zone: p.in_habitable_zone,
    timing_precision_s: p.timing_precision_s,
    transits: p.transits,
    min_moon_mass_kg: p.reach.map((r) => r.min_mass_kg),
    min_moon_mass_notes: p.reach.map((r) => r.note),
    best_min_moon_mass_kg: p.best_min_mass_kg,
    best_separation_hill: p.best_separation_hill,
    target_placement: p.target_placement,
    target_pdet_forecast_combined: p.target_pdet_forecast_combined,
    target_transits_needed: p.target_transits_needed,
    target_habitability: p.target_habitability,
    campaign_transits: p.campaign_transits,
    campaign_full_transits: p.campaign_full,
    campaign_expected_whole_transits: p.campaign_expected_whole,
    nights: p.nights,
    on_sky_s: p.on_sky_s,
    needed_length_s: p.needed_length_s,
    habitable_moon_in_reach: p.habitable_moon_in_reach,
    bound_min_moon_mass_kg: null,
    mc_transits_needed: null,
    mc_pdet: null,
    mc_pdet_lower: null,
    mc_pdet_upper: null,
    mc_realizations: null,
    mc_nights: null,
    mc_on_sky_s: null,
    planet_mass_low_kg: interval?.planet_mass_low_kg ?? null,
    planet_mass_high_kg: interval?.planet_mass_high_kg ?? null,
    best_min_moon_mass_low_kg: interval?.best_min_moon_mass_low_kg ?? null,
    best_min_moon_mass_high_kg: interval?.best_min_moon_mass_high_kg ?? null,
    rank_best: rank,
    rank_worst: rank,
    detail_scenario: null,
    detail_report: null,
    notes: p.notes,
  };
}

export function skippedToJson(row: number, line: number, name: string, problems: readonly FieldProblem[]): SkippedRowJson {
  return { row, line, name, problems: problems.map(formatProblem) };
}

/** Rank order of JSON entries (compareRankKeys, as compareRanks on the planets). */
function compareJson(a: RankedPlanetJson, b: RankedPlanetJson): number {
  const key = (p: RankedPlanetJson): RankKey => ({ mass: p.best_min_moon_mass_kg, transits: p.target_transits_needed, name: p.name, row: p.row });
  return compareRankKeys(key(a), key(b));
}

/** The document of ranked planets and skipped rows (ranks 1…n in order). */
export function buildRankJson(scenario: string, shard: Shard | null, planetsInList: number, planets: readonly RankedPlanetJson[], skipped: readonly SkippedRowJson[], transitsProbability: number, notes: readonly string[] = []): RankJson {
  const sorted = [...planets].sort(compareJson).map((p, i) => ({ ...p, rank: i + 1 }));
  rankIntervals(sorted).forEach(([best, worst], i) => {
    sorted[i].rank_best = best;
    sorted[i].rank_worst = worst;
  });
  return {
    schema: RANK_SCHEMA,
    scenario,
    shard: shard ? `${shard.k}/${shard.n}` : null,
    planets_in_list: planetsInList,
    planets_ranked: sorted.length,
    separations_hill: [...RANK_SEPARATIONS_HILL],
    pdet_threshold: RANK_PDET,
    transits_probability: transitsProbability,
    bound_computed: 0,
    mc_confirmed: 0,
    detail_top: 0,
    skipped: [...skipped].sort((a, b) => a.row - b.row),
    notes: [...notes],
    assumptions: [...RANK_ASSUMPTIONS],
    planets: sorted,
  };
}

/** The ranked planets from PlanetRank results (convenience for the library). */
export function rankedFromPlanets(planets: readonly PlanetRank[]): RankedPlanetJson[] {
  return [...planets].sort(compareRanks).map((p, i) => planetToJson(p, i + 1));
}

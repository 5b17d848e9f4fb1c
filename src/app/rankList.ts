/**
 * `moonsieve rank`: read a planet list and a scenario, rank the planets (one
 * shard of them, or all), write `rank.json` and `rank.ecsv`; and `mergeRankOutputs`,
 * which joins the shards' outputs into the same files an unsharded run writes.
 * The per-planet work is pure (src/rank/); this file only reads and writes.
 */
import { existsSync, mkdirSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../scenario/errors.js';
import { parseYamlWithLines } from '../scenario/loadScenario.js';
import type { ScenarioDocument } from '../scenario/types.js';
import { readPlanetTable, planetRows, planetTableFromRows, type PlanetTableText } from '../rank/planetTable.js';
import { DEFAULT_RANK_SETTINGS, rankPlanet, RANK_SEPARATIONS_HILL, type RankSettings } from '../rank/rankPlanet.js';
import { buildRankJson, planetToJson, skippedToJson, RANK_SCHEMA, type RankJson, type RankedPlanetJson, type SkippedRowJson } from '../rank/rankJson.js';
import { inShard, type Shard } from '../sweep/shard.js';
import { parseEcsv, toEcsv, type TableColumn } from '../io/ecsv.js';
import { writeFileAtomic } from '../io/atomicWrite.js';
import { renderRankPage, RANK_PAGE_ROWS } from '../report/rankPage.js';
import { detailDir } from '../rank/detailSweep.js';
import { planBudget } from './planBudget.js';
import { boundMinMasses } from '../rank/rankBound.js';
import { massInterval } from '../rank/rankInterval.js';
import { DEFAULT_MAX_TRANSITS } from '../budget/budgetSpec.js';
import type { Scenario } from '../scenario/types.js';

export interface RankOptions {
  shard?: Shard | null;
  settings?: RankSettings;
  /** Called after each ranked planet (progress). */
  onPlanet?: (done: number, total: number) => void;
  /** Monte Carlo confirmation of the target moon's transits for the top `confirm` planets (0: none; not with a shard). */
  confirm?: number;
  /** Moon realizations per Monte Carlo evaluation of the confirmation. */
  confirmRealizations?: number;
  /** No-moon realizations of the confirmation (default: budget's, from the false-alarm probability). */
  confirmNoMoonRealizations?: number;
  /** Known-template bound at every separation for the top `bound` planets (0: none; not with a shard). */
  bound?: number;
  /** Planets already ranked by an interrupted run, by row (from its checkpoint): taken as they are, not recomputed. */
  done?: ReadonlyMap<number, RankedPlanetJson>;
  /** Called with each planet this run ranks (the checkpoint records it). */
  onRanked?: (p: RankedPlanetJson) => void;
  /** Called once the forecast tier is done, before the bound, the Monte Carlo and the details. */
  onForecastDone?: () => void;
  /** Called after each confirmed planet with its wall time, s (the cost per planet). */
  onConfirm?: (name: string, seconds: number, done: number, total: number) => void;
}

/** Default moon realizations per evaluation of the confirmation (budget's default is 100: this is a first check). */
export const DEFAULT_CONFIRM_REALIZATIONS = 40;
/** Planets confirmed by default in an unsharded run. */
export const DEFAULT_CONFIRM = 3;
/** Planets given the known-template bound by default in an unsharded run. */
export const DEFAULT_BOUND = 10;

function readText(path: string, what: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError([{ path: what, value: path, allowed: code === 'ENOENT' ? 'no such file' : `cannot read it (${code ?? String(e)})` }]);
  }
}

/** The scenario's document (its YAML as plain values), checked to be a mapping. */
export function readScenarioDocument(path: string): ScenarioDocument {
  const { value } = parseYamlWithLines(readText(path, 'SCENARIO'), path);
  if (value === null || typeof value !== 'object' || Array.isArray(value)) {
    throw new InputError([{ path: 'SCENARIO', value: path, allowed: 'a YAML mapping with the instrument, observation, detection (and site, campaign, moon) blocks shared by every planet' }]);
  }
  return value as ScenarioDocument;
}

/** Whether the list is ECSV: a `.ecsv` name, or a first line `# %ECSV` (which a CSV reading would skip as a comment and then misread a space-delimited table). */
export function isEcsvList(text: string, source: string): boolean {
  return source.toLowerCase().endsWith('.ecsv') || /^#\s*%ECSV/.test(text);
}

/** The planet list's table from its text: ECSV (parseEcsv, units checked against the column names) or CSV. */
export function readPlanetList(raw: string, source: string): PlanetTableText {
  // A byte-order mark (spreadsheets write one) is not part of the first column's name nor of the %ECSV line.
  const text = raw.replace(/^\uFEFF/, '');
  if (!isEcsvList(text, source)) return readPlanetTable(text, source);
  const t = parseEcsv(text, source);
  return planetTableFromRows(t.columns.map((c) => c.name), t.columns.map((c) => c.unit), t.rows, source);
}

/** Rank the list's text against the scenario document (pure but for the progress callback). */
export function rankListText(doc: ScenarioDocument, listText: string, listSource: string, o: RankOptions = {}): RankJson {
  const settings = o.settings ?? DEFAULT_RANK_SETTINGS;
  const shard = o.shard ?? null;
  const table = readPlanetList(listText, listSource);
  const rows = planetRows(doc, table);
  const mine = rows.filter((_, i) => inShard(i, shard));
  const ranked: RankedPlanetJson[] = [];
  const skipped: SkippedRowJson[] = [];
  let done = 0;
  for (const r of mine) {
    if (r.scenario === null) skipped.push(skippedToJson(r.row, r.line, r.name, r.problems));
    else if (o.done?.has(r.row)) ranked.push(o.done.get(r.row)!);
    else {
      const pr = rankPlanet(r.scenario, r.row, r.flags, settings);
      const p = planetToJson(pr, 0, massInterval(r.scenario, r.row, r.flags, pr.best_min_mass_kg, settings));
      o.onRanked?.(p);
      ranked.push(p);
    }
    done++;
    o.onPlanet?.(done, mine.length);
  }
  o.onForecastDone?.();
  if (shard === null && rows.length > 0 && ranked.length === 0) {
    // Nothing to rank: every row is bad, which is most likely a problem of the whole input.
    throw new InputError(rows.flatMap((r) => r.problems).slice(0, 20), `${listSource}: no row could be ranked`);
  }
  const name = typeof doc.name === 'string' ? doc.name : 'scenario';
  const notes = table.unknown.length ? [`columns not read (not planet-list columns, see docs/rank.md): ${table.unknown.join(', ')}`] : [];
  const result = buildRankJson(name, shard, rows.length, ranked, skipped, settings.probability, notes);
  const bound = o.bound ?? 0;
  if (bound > 0) {
    if (shard !== null) throw new InputError([{ path: '--bound', value: bound, allowed: 'the bound is computed for the top of the whole list: run it without --shard (or --bound 0 with a shard)' }]);
    const byRow = new Map(rows.map((r) => [r.row, r.scenario]));
    for (const p of result.planets.slice(0, bound)) {
      const s = byRow.get(p.row);
      if (!s) continue;
      const allowed = p.min_moon_mass_notes.map((n) => n !== 'inside Roche limit' && n !== 'beyond stable limit');
      p.bound_min_moon_mass_kg = boundMinMasses(s, allowed, p.min_moon_mass_kg);
      const above = separationsAbove(p);
      if (above.length) {
        p.notes = [...p.notes, `the known-template bound needs a heavier moon than the timing forecast at ${above.join(', ')} Hill radii: the two models disagree for this planet (the bound should detect at least what the forecast does); trust neither there without the Monte Carlo`];
      }
      result.bound_computed++;
    }
  }
  const confirm = o.confirm ?? 0;
  if (confirm > 0) {
    if (shard !== null) throw new InputError([{ path: '--confirm', value: confirm, allowed: 'the Monte Carlo confirms the top of the whole list: run it without --shard (or --confirm 0 with a shard)' }]);
    const byRow = new Map(rows.map((r) => [r.row, r.scenario]));
    confirmTop(result, byRow, confirm, settings.probability, o);
  }
  return result;
}

/** Separations (Hill radii) where the bound's mass exceeds the forecast's by more than the search tolerance. */
function separationsAbove(p: RankedPlanetJson): number[] {
  const out: number[] = [];
  p.min_moon_mass_kg.forEach((m, k) => {
    const b = p.bound_min_moon_mass_kg?.[k] ?? null;
    if (m !== null && b !== null && b > 1.01 * m) out.push(RANK_SEPARATIONS_HILL[k]);
  });
  return out;
}

/**
 * The Monte Carlo tier for the first `n` ranked planets whose target moon can
 * orbit and whose forecast needs at most DEFAULT_MAX_TRANSITS transits:
 * `budget`'s search (planBudget: forecast bracket, Monte Carlo bisection with
 * Wilson intervals) for the fewest transits reaching `probability`. Writes the
 * mc_* keys of those planets in place; seeded by the scenario's seed as
 * `budget` is, so the answer does not depend on the run.
 */
function confirmTop(r: RankJson, byRow: Map<number, Scenario | null>, n: number, probability: number, o: RankOptions): void {
  // Planets whose forecast needs more transits than budget's default range are left out: the search would only say "not reached".
  const picked = r.planets.filter((p) => p.target_transits_needed !== null && p.target_transits_needed <= DEFAULT_MAX_TRANSITS).slice(0, n);
  let done = 0;
  for (const p of picked) {
    const s = byRow.get(p.row);
    if (!s) continue;
    const t0 = performance.now();
    const b = planBudget(s, { probability, realizations: o.confirmRealizations ?? DEFAULT_CONFIRM_REALIZATIONS, nullRealizations: o.confirmNoMoonRealizations });
    const at = b.answer.at;
    p.mc_transits_needed = b.answer.reached ? b.answer.transits : null;
    p.mc_pdet = at ? at.probability : null;
    p.mc_pdet_lower = at ? at.lower : null;
    p.mc_pdet_upper = at ? at.upper : null;
    p.mc_realizations = b.realizations;
    if (!b.answer.reached) p.notes = [...p.notes, `Monte Carlo confirmation: ${b.answer.statement}`];
    const plan = b.observability.plan;
    p.mc_nights = b.answer.reached && plan && plan.needed_length_s !== null ? plan.nights : null;
    p.mc_on_sky_s = b.answer.reached && plan && plan.needed_length_s !== null ? plan.on_sky_s : null;
    done++;
    o.onConfirm?.(p.name, (performance.now() - t0) / 1000, done, picked.length);
  }
  r.mc_confirmed = done;
}

/** The scenario's document and the list's text, read (InputError on a missing or unreadable file). */
export function readRankInputs(scenarioPath: string, listPath: string): { doc: ScenarioDocument; listText: string } {
  return { doc: readScenarioDocument(scenarioPath), listText: readText(listPath, 'LIST') };
}

export function rankList(scenarioPath: string, listPath: string, o: RankOptions = {}): RankJson {
  const { doc, listText } = readRankInputs(scenarioPath, listPath);
  return rankListText(doc, listText, listPath, o);
}

const num = (x: number | null) => (x === null ? Number.NaN : x);
const sepName = (f: number) => `min_moon_mass_at_${String(f).replace('.', 'p')}_hill_kg`;

/** The ranked planets as ECSV columns (the JSON's names; lists joined with "; "). */
export function rankColumns(r: RankJson): TableColumn[] {
  const p = r.planets;
  const flt = (name: string, unit: string | undefined, description: string, f: (x: RankedPlanetJson) => number | null): TableColumn => ({ name, datatype: 'float64', unit, description, values: p.map((x) => num(f(x))) });
  const str = (name: string, description: string, f: (x: RankedPlanetJson) => string): TableColumn => ({ name, datatype: 'string', description, values: p.map(f) });
  const int = (name: string, description: string, f: (x: RankedPlanetJson) => number): TableColumn => ({ name, datatype: 'int64', description, values: p.map(f) });
  return [
    int('rank', 'rank in the list (1: the smallest moon within reach)', (x) => x.rank),
    int('rank_best', 'best rank the Chen & Kipping (2017) mass scatter of mass_from_radius rows allows', (x) => x.rank_best),
    int('rank_worst', 'worst rank it allows', (x) => x.rank_worst),
    int('row', 'row of the planet list (1: first data row)', (x) => x.row),
    str('name', 'planet name', (x) => x.name),
    str('flags', 'mass_from_radius, radius_from_mass (Chen & Kipping 2017)', (x) => x.flags.join('; ')),
    flt('planet_mass_kg', 'kg', 'planet mass', (x) => x.planet_mass_kg),
    flt('planet_radius_m', 'm', 'planet radius', (x) => x.planet_radius_m),
    flt('period_s', 's', 'orbital period', (x) => x.period_s),
    flt('hill_radius_m', 'm', 'Hill radius', (x) => x.hill_radius_m),
    flt('roche_limit_m', 'm', 'fluid Roche limit for the target moon density', (x) => x.roche_limit_m),
    flt('stable_max_separation_m', 'm', 'prograde stable limit (Domingos, Winter & Yokoyama 2006)', (x) => x.stable_max_separation_m),
    flt('tidal_max_moon_mass_kg', 'kg', 'largest moon surviving tidal migration', (x) => x.tidal_max_moon_mass_kg),
    ...r.separations_hill.map((f, k) => flt(sepName(f), 'kg', `smallest moon at ${f} Hill radii whose forecast reaches pdet ${r.pdet_threshold} (nan: see rank.json notes)`, (x) => x.min_moon_mass_kg[k])),
    flt('best_min_moon_mass_kg', 'kg', 'smallest of those', (x) => x.best_min_moon_mass_kg),
    flt('best_min_moon_mass_low_kg', 'kg', 'mass_from_radius rows: smallest of those over the planet mass at radius ∓ 1 sigma (nan: no interval)', (x) => x.best_min_moon_mass_low_kg),
    flt('best_min_moon_mass_high_kg', 'kg', 'largest of those (nan: no interval, or none found at one end)', (x) => x.best_min_moon_mass_high_kg),
    flt('best_separation_hill', undefined, 'separation of the smallest, Hill radii', (x) => x.best_separation_hill),
    flt('bound_best_min_moon_mass_kg', 'kg', 'smallest moon the known-template bound detects at any of the separations (nan: not computed)', (x) => (x.bound_min_moon_mass_kg ? x.bound_min_moon_mass_kg.reduce<number | null>((a, m) => (m !== null && (a === null || m < a) ? m : a), null) : null)),
    flt('timing_precision_s', 's', 'per-transit mid-time precision (model Fisher bound)', (x) => x.timing_precision_s),
    flt('target_pdet_forecast_combined', undefined, 'forecast detection probability of the target moon with the scenario\'s transits', (x) => x.target_pdet_forecast_combined),
    flt('target_transits_needed', undefined, `transits for the target moon at probability ${r.transits_probability} (nan: more than the budget's maximum)`, (x) => x.target_transits_needed),
    str('target_habitability', 'energy-budget verdict of the target moon', (x) => x.target_habitability ?? ''),
    flt('campaign_transits', undefined, 'transits of the campaign (nan: no calendar)', (x) => x.campaign_transits),
    flt('campaign_expected_whole_transits', undefined, 'whole-transit equivalents the campaign is expected to deliver after weather', (x) => x.campaign_expected_whole_transits),
    flt('nights', undefined, 'nights (or visits) to book for the target moon', (x) => x.nights),
    flt('on_sky_s', 's', 'hours on sky for the target moon', (x) => x.on_sky_s),
    str('in_habitable_zone', 'planet inside the Kopparapu et al. (2013) habitable zone', (x) => (x.in_habitable_zone === null ? '' : String(x.in_habitable_zone))),
    flt('mc_transits_needed', undefined, 'Monte Carlo (budget) transits for the target moon (nan: not confirmed or not reached)', (x) => x.mc_transits_needed),
    flt('mc_pdet', undefined, 'Monte Carlo detection probability at that count', (x) => x.mc_pdet),
    flt('mc_nights', undefined, 'nights for the Monte Carlo count', (x) => x.mc_nights),
    { name: 'habitable_moon_in_reach', datatype: 'bool', description: 'target moon temperate, stable and within the campaign', values: p.map((x) => x.habitable_moon_in_reach) },
  ];
}

export function rankEcsv(r: RankJson): string {
  return toEcsv(rankColumns(r), {
    schema: RANK_SCHEMA,
    scenario: r.scenario,
    shard: r.shard,
    planets_in_list: r.planets_in_list,
    bound_computed: r.bound_computed,
    mc_confirmed: r.mc_confirmed,
    skipped_rows: r.skipped.map((s) => s.row),
    separations_hill: r.separations_hill,
    assumptions: r.assumptions,
  });
}

export const RANK_FILES = ['rank.json', 'rank.ecsv', 'rank.html'] as const;

export function writeRankOutputs(dir: string, r: RankJson): void {
  writeFileAtomic(join(dir, 'rank.json'), JSON.stringify(r, null, 2) + '\n');
  writeFileAtomic(join(dir, 'rank.ecsv'), rankEcsv(r));
  writeFileAtomic(join(dir, 'rank.html'), renderRankPage(r));
}

/** Each shard folder's rank.json, checked to be one (InputError otherwise). */
function readRankShards(dirs: readonly string[]): RankJson[] {
  return dirs.map((d) => {
    let doc: RankJson;
    try {
      doc = JSON.parse(readText(join(d, 'rank.json'), 'DIR')) as RankJson;
    } catch (e) {
      if (e instanceof InputError) throw e;
      throw new InputError([{ path: 'DIR', value: join(d, 'rank.json'), allowed: 'a rank.json written by moonsieve rank' }]);
    }
    if (doc.schema !== RANK_SCHEMA) throw new InputError([{ path: 'DIR', value: join(d, 'rank.json'), allowed: `a ${RANK_SCHEMA} document` }]);
    return doc;
  });
}

/**
 * Join shard outputs (folders holding rank.json) into the whole list's result.
 * Shards run with `--detail N` (each the same N) ran their own top N detail
 * sweeps; the whole list keeps the detail keys an unsharded `--detail N` run
 * writes: a scenario for the first max(RANK_PAGE_ROWS, N) planets, a report
 * for the top N (each of those is in its own shard's top N, so its shard ran
 * it). `copyRankDetails` then copies those folders.
 */
export function mergeRankOutputs(dirs: readonly string[]): RankJson {
  const docs = readRankShards(dirs);
  const first = docs[0];
  const shards = docs.map((d) => d.shard ?? '1/1');
  const n = Number(shards[0].split('/')[1]);
  const want = Array.from({ length: n }, (_, i) => `${i + 1}/${n}`);
  const problems = [];
  if ([...shards].sort().join(',') !== [...want].sort().join(',')) problems.push({ path: 'DIR', value: shards.join(', '), allowed: `every shard of one run exactly once: ${want.join(', ')}` });
  for (const d of docs) {
    if (d.scenario !== first.scenario || d.planets_in_list !== first.planets_in_list || d.transits_probability !== first.transits_probability) {
      problems.push({ path: 'DIR', value: `${d.scenario} (${d.planets_in_list} planets)`, allowed: `shards of one list and scenario: ${first.scenario} (${first.planets_in_list} planets)` });
    }
  }
  const details = docs.map((d) => d.detail_top ?? 0);
  if (details.some((x) => x !== details[0])) {
    problems.push({ path: 'DIR', value: `--detail ${details.join(', ')} (shards ${shards.join(', ')})`, allowed: 'shards run with the same --detail N: the whole list\'s top N detail sweeps are among every shard\'s own top N only then' });
  }
  if (problems.length) throw new InputError(problems);
  const r = buildRankJson(first.scenario, null, first.planets_in_list, docs.flatMap((d) => d.planets), docs.flatMap((d) => d.skipped), first.transits_probability, first.notes);
  const top = details[0];
  r.detail_top = top;
  const written = top > 0 ? Math.max(RANK_PAGE_ROWS, top) : 0;
  r.planets.forEach((p, i) => {
    if (i >= written) p.detail_scenario = null;
    if (i >= top) p.detail_report = null;
  });
  return r;
}

/** What `copyRankDetails` did: the detail folders copied, and the planets whose detail the shards did not hold. */
export interface RankDetailCopy {
  copied: string[];
  missing: string[];
}

/** Regular files of a folder (a sweep's outputs are flat files). */
function filesOf(dir: string): string[] {
  return readdirSync(dir).filter((f) => statSync(join(dir, f)).isFile()).sort();
}

/**
 * Copy the detail folders the merged list `r` names (from mergeRankOutputs) from
 * the shard folders into `outDir/details/`: the whole sweep folder for a planet
 * with a report, its scenario.yaml alone for the others, each file written
 * atomically. A folder is looked up under the planet's own name
 * (`detailDir(row, name)`), never under a path read from a file. A planet
 * whose shard lacks the scenario or the report loses that key in `r` (the
 * page then shows the command that makes it) and is named in `missing`.
 * Write rank.json after this.
 */
export function copyRankDetails(dirs: readonly string[], outDir: string, r: RankJson): RankDetailCopy {
  const docs = readRankShards(dirs);
  const dirOfRow = new Map<number, string>();
  docs.forEach((d, k) => { for (const p of d.planets) dirOfRow.set(p.row, dirs[k]); });
  const copied: string[] = [];
  const missing: string[] = [];
  for (const p of r.planets) {
    if (p.detail_scenario === null) continue;
    const rel = detailDir(p.row, p.name);
    const shardDir = dirOfRow.get(p.row);
    const from = shardDir === undefined ? null : join(shardDir, ...rel.split('/'));
    if (from === null || !existsSync(join(from, 'scenario.yaml'))) {
      missing.push(`${p.name}: no ${rel}/scenario.yaml in its shard folder`);
      p.detail_scenario = null;
      p.detail_report = null;
      continue;
    }
    p.detail_scenario = `${rel}/scenario.yaml`;
    const withReport = p.detail_report !== null && existsSync(join(from, 'report.html'));
    if (p.detail_report !== null && !withReport) missing.push(`${p.name}: its shard's detail sweep did not finish (no ${rel}/report.html); run \`moonsieve sweep ${rel}/scenario.yaml --out ${rel}\` in the merged folder`);
    p.detail_report = withReport ? `${rel}/report.html` : null;
    const to = join(outDir, ...rel.split('/'));
    mkdirSync(to, { recursive: true });
    for (const f of withReport ? filesOf(from) : ['scenario.yaml']) writeFileAtomic(join(to, f), readFileSync(join(from, f)));
    copied.push(rel);
  }
  return { copied, missing };
}

export { RANK_SEPARATIONS_HILL };

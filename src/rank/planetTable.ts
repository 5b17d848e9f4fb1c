/**
 * The planet list of `moonsieve rank`: a CSV or ECSV table (one header row,
 * one row per planet) whose columns are named here, with the unit in each
 * name (an ECSV column may also carry that unit in its header). Each
 * row's values are written into the shared scenario's document (as
 * "<value> <unit>" text) and the document validated with `parseScenario`, so a
 * row becomes a typed `Scenario` with every derived quantity consistent (the
 * same route a sweep cell takes, src/sweep/applyAxes.ts). A row that cannot be
 * a scenario is skipped with its problems (row number, field, value, what is
 * allowed); a missing required column is an error of the whole input.
 *
 * Missing planet mass: from the planet radius by inverting the mean
 * mass–radius relation of Chen & Kipping (2017, ApJ 834, 17, eq. 2, Table 1)
 * in its Terran and Neptunian regimes, where the radius rises with the mass;
 * a radius the Jovian regime (slope −0.044) also reaches (from about 1.01 R_J
 * up) says almost nothing about the mass, so such a row needs its mass and is
 * skipped without it. Missing planet
 * radius: the same relation forward (`mass_radius: chen_kipping_2017`). Either
 * way the row is flagged (`mass_from_radius`, `radius_from_mass`).
 */
import { InputError, type FieldProblem } from '../scenario/errors.js';
import { parseScenario } from '../scenario/parseScenario.js';
import { CELL_PARSE } from '../sweep/applyAxes.js';
import type { Scenario, ScenarioDocument } from '../scenario/types.js';
import { CHEN_KIPPING_SLOPES, CHEN_KIPPING_TRANSITIONS_KG, chenKippingIntercepts } from '../physics/massRadius.js';
import { M_EARTH_KG, M_JUP_KG, R_EARTH_M, R_JUP_M } from '../physics/constants.js';

/** One column of the planet list: its name, whether the header must have it, what it holds, and the units an ECSV header may give it. */
export interface PlanetColumn {
  name: string;
  required: boolean;
  meaning: string;
  /**
   * Unit spellings an ECSV column may carry: the unit its name states, as
   * astropy writes it first (`Unit.to_string()`) and then other spellings
   * astropy reads as the same unit. No unit (or an empty one) is always
   * accepted; the list never converts units.
   */
  units: readonly string[];
}

/** The columns, in the order the docs list them. Any other column is ignored (and named in the output's notes). */
export const PLANET_COLUMNS: readonly PlanetColumn[] = [
  { name: 'name', required: true, meaning: 'planet name, unique in the list', units: [] },
  { name: 'star_mass_msun', required: true, meaning: 'stellar mass, solar masses', units: ['solMass', 'Msun', 'M_sun'] },
  { name: 'star_radius_rsun', required: true, meaning: 'stellar radius, solar radii', units: ['solRad', 'Rsun', 'R_sun'] },
  { name: 'star_teff_k', required: true, meaning: 'stellar effective temperature, K', units: ['K'] },
  { name: 'magnitude', required: false, meaning: "the star's magnitude in `band` (a ground instrument's noise budget; empty: the scenario's)", units: ['mag'] },
  { name: 'band', required: false, meaning: 'photometric band of `magnitude` (U, B, V, R, I; empty: the scenario\'s)', units: [] },
  { name: 'noise_ppm_per_hour', required: false, meaning: 'white noise stated directly, ppm over one hour (replaces the scenario\'s noise or ground budget for that row)', units: ['ppm', '1e-06'] },
  { name: 'planet_mass_mjup', required: false, meaning: 'planet mass, Jupiter masses (empty: from the radius, Chen & Kipping 2017, flagged)', units: ['jupiterMass', 'Mjup', 'M_jup', 'M_jupiter'] },
  { name: 'planet_radius_rjup', required: false, meaning: 'planet radius, Jupiter radii (empty: from the mass, Chen & Kipping 2017, flagged)', units: ['jupiterRad', 'Rjup', 'R_jup', 'R_jupiter'] },
  { name: 'period_d', required: true, meaning: 'orbital period, days', units: ['d', 'day'] },
  { name: 'impact_parameter', required: true, meaning: 'transit impact parameter, stellar radii', units: [] },
  { name: 't0_bjd_tdb', required: false, meaning: 'mid-transit time of epoch 0, BJD_TDB days', units: ['d', 'day'] },
  { name: 't0_error_min', required: false, meaning: 'error of t0, minutes', units: ['min'] },
  { name: 'period_error_d', required: false, meaning: 'error of the period, days', units: ['d', 'day'] },
  { name: 'ra_deg', required: false, meaning: 'right ascension (ICRS), degrees (with dec_deg: the row is the campaign target)', units: ['deg'] },
  { name: 'dec_deg', required: false, meaning: 'declination (ICRS), degrees', units: ['deg'] },
];

/** Planet mass or radius: the header must hold at least one of the two. */
export const PLANET_SIZE_COLUMNS = ['planet_mass_mjup', 'planet_radius_rjup'] as const;

export interface PlanetTableText {
  header: string[];
  /** Cells by column name; empty strings for empty cells. */
  rows: Array<Record<string, string>>;
  /** 1-based line numbers in the file of each row (the header is line 1 unless comments precede it). */
  lines: number[];
  /** Header columns that are not planet-list columns (ignored). */
  unknown: string[];
}

/** Split one CSV line (RFC 4180 quoting, no newlines inside quotes). */
export function splitCsvLine(line: string): string[] {
  const out: string[] = [];
  let cur = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const c = line[i];
    if (quoted) {
      if (c === '"' && line[i + 1] === '"') { cur += '"'; i++; }
      else if (c === '"') quoted = false;
      else cur += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') { out.push(cur.trim()); cur = ''; }
    else cur += c;
  }
  out.push(cur.trim());
  return out;
}

/** One data row as read from a file: its 1-based line, its cells (null: missing) and a syntax problem, if any. */
export interface PlanetTableRowText {
  line: number;
  cells: ReadonlyArray<string | null>;
  problem: string | null;
}

/**
 * Parse the planet list's text as CSV: lines starting with `#` and blank
 * lines are skipped. Throws InputError for a missing required column. (An
 * ECSV list is read by src/io/ecsv.ts, `parseEcsv`, and handed to
 * `planetTableFromRows` with its units; src/app/rankList.ts chooses.)
 */
export function readPlanetTable(text: string, source = 'planet list'): PlanetTableText {
  const all = text.split(/\r?\n/);
  let header: string[] | null = null;
  const rows: PlanetTableRowText[] = [];
  for (let i = 0; i < all.length; i++) {
    const line = all[i];
    if (line.trim() === '' || line.trimStart().startsWith('#')) continue;
    const cells = splitCsvLine(line);
    if (header === null) { header = cells; continue; }
    rows.push({ line: i + 1, cells, problem: null });
  }
  if (header === null) throw new InputError([{ path: source, value: '(no header row)', allowed: `a CSV table whose first row names the columns: ${PLANET_COLUMNS.filter((c) => c.required).map((c) => c.name).join(', ')} and ${PLANET_SIZE_COLUMNS.join(' or ')}` }]);
  return planetTableFromRows(header, null, rows, source);
}

const unitText = (u: string | null | undefined): string => (u ?? '').trim();

/**
 * The planet table from a header, the columns' units (an ECSV header's; null
 * for CSV, which states units only in the column names) and the data rows.
 * Throws InputError, one problem per column, for a missing required column, a
 * column named twice, or a unit other than the one the column's name states
 * (the list does not convert units: `period_d` in hours would be read as days).
 */
export function planetTableFromRows(header: readonly string[], units: ReadonlyArray<string | null> | null, dataRows: readonly PlanetTableRowText[], source = 'planet list'): PlanetTableText {
  const problems: FieldProblem[] = [];
  for (const c of PLANET_COLUMNS) {
    if (c.required && !header.includes(c.name)) problems.push({ path: `${source}: column ${c.name}`, value: undefined, allowed: `required column (${c.meaning})` });
  }
  if (!PLANET_SIZE_COLUMNS.some((c) => header.includes(c))) {
    problems.push({ path: `${source}: column ${PLANET_SIZE_COLUMNS.join(' or ')}`, value: undefined, allowed: 'the list needs the planet mass or radius (or both) in a column' });
  }
  const seen = new Set<string>();
  for (const h of header) {
    if (seen.has(h)) problems.push({ path: `${source}: column ${h}`, value: h, allowed: 'each column name once' });
    seen.add(h);
  }
  if (units) {
    header.forEach((h, k) => {
      const col = PLANET_COLUMNS.find((c) => c.name === h);
      const u = unitText(units[k]);
      if (!col || u === '' || col.units.includes(u)) return;
      problems.push({
        path: `${source}: column ${h} unit`,
        value: u,
        allowed: col.units.length
          ? `the unit its name states, ${col.units[0]}${col.units.length > 1 ? ` (also written ${col.units.slice(1).join(', ')})` : ''}, or no unit; the list does not convert units`
          : 'no unit (the column is a plain number or text)',
      });
    });
  }
  if (problems.length) throw new InputError(problems);
  const rows: Array<Record<string, string>> = [];
  const lines: number[] = [];
  for (const r of dataRows) {
    const row: Record<string, string> = {};
    for (let j = 0; j < header.length; j++) row[header[j]] = r.cells[j] ?? '';
    if (r.problem !== null) row['#syntax'] = r.problem;
    else if (r.cells.length !== header.length) row['#cells'] = String(r.cells.length);
    rows.push(row);
    lines.push(r.line);
  }
  const known = new Set(PLANET_COLUMNS.map((c) => c.name));
  return { header: [...header], rows, lines, unknown: header.filter((h) => !known.has(h)) };
}

/**
 * Planet mass from radius: Chen & Kipping (2017, eq. 2, Table 1) inverted in the
 * Terran and Neptunian regimes. The Jovian branch (slope −0.044) spans radii from
 * its top at 0.414 M_J (about 1.28 R_J) down to its end at 0.08 M☉ (about
 * 1.01 R_J), so a radius at or above that end is met by two masses (or, in the
 * branch, by a range of them): NaN there, and for a radius that is not positive.
 */
export function chenKippingMassFromRadius(radiusM: number): number {
  if (!(radiusM > 0)) return Number.NaN;
  const c = chenKippingIntercepts();
  const y = Math.log10(radiusM / R_EARTH_M);
  const t1 = Math.log10(CHEN_KIPPING_TRANSITIONS_KG.terranNeptunian / M_EARTH_KG);
  const t3 = Math.log10(CHEN_KIPPING_TRANSITIONS_KG.jovianStellar / M_EARTH_KG);
  const y1 = c[0] + CHEN_KIPPING_SLOPES[0] * t1;
  const y3 = c[2] + CHEN_KIPPING_SLOPES[2] * t3;
  if (y >= y3) return Number.NaN;
  const j = y < y1 ? 0 : 1;
  return M_EARTH_KG * 10 ** ((y - c[j]) / CHEN_KIPPING_SLOPES[j]);
}

/** One planet of the list as a scenario, or its problems. */
export interface PlanetRow {
  /** 1-based row number (the first data row is 1). */
  row: number;
  line: number;
  name: string;
  scenario: Scenario | null;
  flags: string[];
  problems: FieldProblem[];
}

const number = (text: string): number => (text.trim() === '' ? Number.NaN : Number(text));

function setPath(doc: Record<string, unknown>, path: string, value: unknown): void {
  const keys = path.split('.');
  let o = doc;
  for (let i = 0; i < keys.length - 1; i++) {
    const v = o[keys[i]];
    if (v === null || typeof v !== 'object' || Array.isArray(v)) o[keys[i]] = {};
    o = o[keys[i]] as Record<string, unknown>;
  }
  o[keys[keys.length - 1]] = value;
}

/** Numeric cell → document text, or a problem (a cell that is not a finite number). */
function numericCell(row: Record<string, string>, col: string, problems: FieldProblem[], where: string): number | null {
  const text = row[col];
  if (text === undefined || text.trim() === '') return null;
  const x = number(text);
  if (!Number.isFinite(x)) {
    problems.push({ path: `${where}: ${col}`, value: text, allowed: 'a finite number' });
    return null;
  }
  return x;
}

/**
 * The scenario document of one row: a copy of `baseDoc` (without its sweep and
 * budget blocks) with the row's values written in. Returns the document, the
 * flags and the problems found before validation.
 */
export function rowDocument(baseDoc: ScenarioDocument, row: Record<string, string>, where: string): { doc: ScenarioDocument; flags: string[]; problems: FieldProblem[] } {
  const doc = structuredClone(baseDoc) as Record<string, unknown>;
  delete doc.sweep;
  delete doc.budget;
  const problems: FieldProblem[] = [];
  const flags: string[] = [];
  if (row['#cells'] !== undefined) problems.push({ path: `${where}`, value: `${row['#cells']} cells`, allowed: 'one cell per header column' });
  if (row['#syntax'] !== undefined) problems.push({ path: `${where}`, value: row['#syntax'], allowed: 'a well-formed row (values quoted with double quotes, one per header column)' });
  const name = (row.name ?? '').trim();
  if (name === '') problems.push({ path: `${where}: name`, value: row.name, allowed: 'a non-empty planet name' });
  doc.name = name;
  const req = (col: string, path: string, unit: string) => {
    const x = numericCell(row, col, problems, where);
    if (x === null && (row[col] ?? '').trim() === '') problems.push({ path: `${where}: ${col}`, value: undefined, allowed: 'required in every row' });
    if (x !== null) setPath(doc, path, unit ? `${x} ${unit}` : x);
  };
  const opt = (col: string, path: string, unit: string) => {
    const x = numericCell(row, col, problems, where);
    if (x !== null) setPath(doc, path, unit ? `${x} ${unit}` : x);
    return x;
  };
  req('star_mass_msun', 'star.mass', 'Msun');
  req('star_radius_rsun', 'star.radius', 'Rsun');
  req('star_teff_k', 'star.teff', 'K');
  // A luminosity in the shared scenario belongs to its own star, not to each row's: it follows R and Teff.
  const star = doc.star as Record<string, unknown> | undefined;
  if (star) delete star.luminosity;
  req('period_d', 'planet.period', 'd');
  req('impact_parameter', 'planet.impact_parameter', '');
  const planet = (doc.planet ?? {}) as Record<string, unknown>;
  delete planet.inclination;
  const mass = numericCell(row, 'planet_mass_mjup', problems, where);
  const radius = numericCell(row, 'planet_radius_rjup', problems, where);
  delete planet.mass_radius;
  if (mass !== null) planet.mass = `${mass} Mjup`;
  if (radius !== null) planet.radius = `${radius} Rjup`;
  if (mass === null && radius !== null && Number.isFinite(radius)) {
    const m = chenKippingMassFromRadius(radius * R_JUP_M);
    if (Number.isFinite(m)) {
      planet.mass = `${m / M_JUP_KG} Mjup`;
      flags.push('mass_from_radius');
    } else {
      problems.push({ path: `${where}: planet_mass_mjup`, value: undefined, allowed: `needed for a planet of ${radius} Rjup: from about 1.01 Rjup up, Chen & Kipping (2017) give more than one mass for a radius` });
    }
  } else if (mass !== null && radius === null) {
    delete planet.radius;
    planet.mass_radius = 'chen_kipping_2017';
    flags.push('radius_from_mass');
  } else if (mass === null && radius === null && (row.planet_mass_mjup ?? '').trim() === '' && (row.planet_radius_rjup ?? '').trim() === '') {
    problems.push({ path: `${where}: planet_mass_mjup`, value: undefined, allowed: 'the planet mass or radius (or both) is needed in every row' });
  }
  doc.planet = planet;
  opt('t0_bjd_tdb', 'observation.t0', '');
  opt('t0_error_min', 'observation.t0_error', 'min');
  opt('period_error_d', 'planet.period_error', 'd');
  const ra = numericCell(row, 'ra_deg', problems, where);
  const dec = numericCell(row, 'dec_deg', problems, where);
  if ((ra === null) !== (dec === null)) problems.push({ path: `${where}: ${ra === null ? 'ra_deg' : 'dec_deg'}`, value: undefined, allowed: 'ra_deg and dec_deg come together' });
  else if (ra !== null && dec !== null) doc.target = { ra: `${ra} deg`, dec: `${dec} deg` };
  const noise = numericCell(row, 'noise_ppm_per_hour', problems, where);
  const instrument = (doc.instrument ?? {}) as Record<string, unknown>;
  doc.instrument = instrument;
  if (noise !== null) {
    delete instrument.ground;
    instrument.noise = `${noise} ppm per 1 h`;
  } else {
    const mag = numericCell(row, 'magnitude', problems, where);
    const band = (row.band ?? '').trim();
    if (mag !== null || band !== '') {
      const ground = instrument.ground as Record<string, unknown> | undefined;
      if (!ground || typeof ground !== 'object') {
        problems.push({ path: `${where}: magnitude`, value: row.magnitude, allowed: 'a magnitude needs a ground instrument (instrument.ground) in the scenario; give noise_ppm_per_hour instead' });
      } else {
        if (mag !== null) ground.magnitude = mag;
        if (band !== '') ground.band = band;
      }
    }
  }
  return { doc: doc as ScenarioDocument, flags, problems };
}

/** Every row of the list as a scenario, or skipped with its problems (duplicated names: the later rows). */
export function planetRows(baseDoc: ScenarioDocument, table: PlanetTableText): PlanetRow[] {
  const out: PlanetRow[] = [];
  const firstRow = new Map<string, number>();
  for (let i = 0; i < table.rows.length; i++) {
    const row = table.rows[i];
    const where = `row ${i + 1}`;
    const { doc, flags, problems } = rowDocument(baseDoc, row, where);
    const name = (row.name ?? '').trim();
    const earlier = firstRow.get(name);
    if (name !== '' && earlier !== undefined) problems.push({ path: `${where}: name`, value: name, allowed: `each planet name once (already in row ${earlier})` });
    else if (name !== '') firstRow.set(name, i + 1);
    let scenario: Scenario | null = null;
    if (problems.length === 0) {
      try {
        // A target moon that would touch this planet is an answer (its placement), not a bad row.
        scenario = parseScenario(doc, name, CELL_PARSE);
      } catch (e) {
        if (!(e instanceof InputError)) throw e;
        for (const p of e.problems) problems.push({ ...p, path: `${where}: ${p.path}` });
      }
    }
    out.push({ row: i + 1, line: table.lines[i], name, scenario: problems.length ? null : scenario, flags, problems });
  }
  return out;
}

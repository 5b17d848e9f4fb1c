/**
 * Reads a table of measured transit times (plain CSV with a header row, or
 * ECSV 1.0) into a checked `TimingTable`.
 *
 * Columns (names case-insensitive; a unit in brackets after the name in CSV,
 * e.g. `time_err [min]`, or the column's `unit` in an ECSV header):
 *   epoch (optional integers; inferred from the planet period when absent),
 *   time (also `mid_time`, `tc`): mid-transit time in days in the stated standard,
 *   time_err (also `mid_time_err`, `tc_err`): its 1σ, with a time unit,
 *   duration (also `t14`) and duration_err (optional pair): with a time unit.
 *
 * The time standard must be stated (BJD_TDB, or BJD_TDB minus an offset in
 * days such as "BJD_TDB-2457000"): mixing standards (UTC vs TDB, HJD vs BJD)
 * shifts transits by up to about a minute and mimics a TTV (Eastman, Siverd
 * & Gaudi 2010, PASP 122, 935). Every problem is reported at once, each with
 * its line and column; duplicate epochs, non-monotonic times and negative or
 * zero uncertainties are errors.
 */
import { parse as parseYaml } from 'yaml';
import { DAY_S } from '../physics/constants.js';
import { InputError, type FieldProblem } from '../scenario/errors.js';
import { parseQuantity } from '../scenario/units.js';
import type { TimingTable } from './claimTypes.js';

/** Fewest transits the vetting accepts: the ephemeris-plus-sinusoid model has 5 parameters. */
export const MIN_TABLE_ROWS = 6;
/** Most rows accepted: 20 000 transits are 55 years of a 1-day planet (outputs and fits grow with the rows). */
export const MAX_TABLE_ROWS = 20_000;
/** Most orbits from first to last transit: the frequency grid has 5 points per orbit of span (≤ 2^22 FFT length). */
export const MAX_EPOCH_SPAN = 50_000;
/** Largest |epoch|: keeps 2πνE well inside double precision (1e7 rad has ~2e-9 rad resolution). */
export const MAX_ABS_EPOCH = 10_000_000;
/** Latest BJD_TDB accepted, d (JD 10 000 000 is in the year 22 666). */
export const MAX_BJD = 10_000_000;
/** Smallest timing uncertainty accepted, s: 1 ms, well below any measured transit time. */
export const MIN_TIME_ERR_S = 1e-3;

export const TIME_STANDARD_ALLOWED =
  'state the time standard: "BJD_TDB", or BJD_TDB minus an offset in days such as "BJD_TDB-2457000"; ' +
  'unstated or mixed standards shift transits by up to about a minute and mimic a TTV (Eastman, Siverd & Gaudi 2010, PASP 122, 935)';

/** Offset (days) to add to a table value to get BJD_TDB, or null if the text is not an accepted standard. */
export function parseTimeStandard(text: unknown): number | null {
  if (typeof text !== 'string') return null;
  const m = /^\s*BJD_TDB\s*(?:([-+])\s*(\d+(?:\.\d*)?))?\s*$/.exec(text);
  if (!m) return null;
  if (m[1] === undefined) return 0;
  const off = Number(m[2]);
  return m[1] === '-' ? off : -off;
}

type Role = 'epoch' | 'time' | 'time_err' | 'duration' | 'duration_err';

const ROLE_NAMES: Record<string, Role> = {
  epoch: 'epoch', n: 'epoch', transit: 'epoch',
  time: 'time', mid_time: 'time', tc: 'time', t_mid: 'time',
  time_err: 'time_err', mid_time_err: 'time_err', tc_err: 'time_err', time_error: 'time_err', t_mid_err: 'time_err',
  duration: 'duration', t14: 'duration',
  duration_err: 'duration_err', t14_err: 'duration_err', duration_error: 'duration_err',
};

interface ColumnSpec {
  name: string;
  unit: string | null;
}

interface RawTable {
  columns: ColumnSpec[];
  /** 1-based line number of each data row and its cells. */
  rows: Array<{ line: number; cells: string[] }>;
  headerLine: number;
  metaTimeStandard: string | null;
}

/** "t.csv row 3 (line 7), column 2 (time_err)": data rows are counted from 1 after the header. */
function where(source: string, line: number, col?: number, name?: string, row?: number): string {
  const pos = row !== undefined ? `row ${row} (line ${line})` : `line ${line}`;
  return `${source} ${pos}${col !== undefined ? `, column ${col}` : ''}${name ? ` (${name})` : ''}`;
}

/** A cell or row as quoted in a message: at most 40 characters. */
function clip(text: string): string {
  return text.length > 40 ? `${text.slice(0, 37)}…` : text;
}

function sig(x: number): string {
  return Number(x.toPrecision(3)).toString();
}

/** The first problems of a long list, and how many more there are. */
function firstProblems(problems: FieldProblem[], max = 20): FieldProblem[] {
  if (problems.length <= max) return problems;
  return [...problems.slice(0, max), { path: '…', value: `${problems.length - max} more problems`, allowed: 'fix the ones above and run again' }];
}

/** Split "time_err [min]" or "time_err (min)" into name and unit. */
function splitHeader(h: string): ColumnSpec {
  const m = /^\s*([^[(]*?)\s*(?:[[(]\s*([^\])]*?)\s*[\])])?\s*$/.exec(h);
  if (!m) return { name: h.trim(), unit: null };
  return { name: m[1], unit: m[2] ? m[2] : null };
}

function splitRow(line: string, delimiter: string): string[] {
  return delimiter === ' ' ? line.trim().split(/\s+/) : line.split(delimiter).map((c) => c.trim());
}

function readCsv(lines: string[], source: string, problems: FieldProblem[]): RawTable | null {
  let headerLine = -1;
  const rows: RawTable['rows'] = [];
  let columns: ColumnSpec[] = [];
  for (let i = 0; i < lines.length; i++) {
    const text = lines[i];
    if (text.trim() === '' || text.trimStart().startsWith('#')) continue;
    if (headerLine < 0) {
      headerLine = i + 1;
      columns = text.split(',').map(splitHeader);
      continue;
    }
    rows.push({ line: i + 1, cells: splitRow(text, ',') });
  }
  if (headerLine < 0) {
    problems.push({ path: source, value: '(no header)', allowed: 'a header row naming the columns, e.g. "epoch,time,time_err [min]"' });
    return null;
  }
  return { columns, rows, headerLine, metaTimeStandard: null };
}

function readEcsv(lines: string[], source: string, problems: FieldProblem[]): RawTable | null {
  const header: string[] = [];
  let i = 0;
  for (; i < lines.length && lines[i].startsWith('#'); i++) header.push(lines[i].replace(/^# ?/, ''));
  const sep = header.indexOf('---');
  let doc: Record<string, unknown> = {};
  try {
    doc = (parseYaml(header.slice(sep + 1).join('\n'), { schema: 'yaml-1.1' }) ?? {}) as Record<string, unknown>;
  } catch (e) {
    problems.push({ path: where(source, 2), value: 'ECSV header', allowed: `a YAML header (${String((e as Error).message).split('\n')[0]})` });
    return null;
  }
  const delimiter = typeof doc.delimiter === 'string' ? doc.delimiter : ' ';
  const dts = Array.isArray(doc.datatype) ? (doc.datatype as Array<Record<string, unknown>>) : [];
  const columns: ColumnSpec[] = dts.map((d) => ({ name: String(d.name ?? ''), unit: typeof d.unit === 'string' ? d.unit : null }));
  let metaTimeStandard: string | null = null;
  const meta = doc.meta;
  const metaEntries: Array<[string, unknown]> = [];
  if (Array.isArray(meta)) for (const m of meta) if (m && typeof m === 'object') metaEntries.push(...Object.entries(m as object));
  if (meta instanceof Map) for (const [k, v] of meta) metaEntries.push([String(k), v]);
  else if (meta && typeof meta === 'object' && !Array.isArray(meta)) metaEntries.push(...Object.entries(meta as object));
  for (const [k, v] of metaEntries) if (k === 'time_standard' && typeof v === 'string') metaTimeStandard = v;
  // Skip the header row of column names.
  let headerLine = -1;
  const rows: RawTable['rows'] = [];
  for (; i < lines.length; i++) {
    if (lines[i].trim() === '') continue;
    if (headerLine < 0) {
      headerLine = i + 1;
      const names = splitRow(lines[i], delimiter).map((s) => s.replace(/^"|"$/g, ''));
      if (columns.length === 0) columns.push(...names.map((n) => ({ name: n, unit: null })));
      continue;
    }
    rows.push({ line: i + 1, cells: splitRow(lines[i], delimiter) });
  }
  return { columns, rows, headerLine: Math.max(headerLine, 1), metaTimeStandard };
}

/** Parse a number cell; NaN (and a recorded problem) if it is not a finite number. */
function numberCell(cell: string | undefined, at: string, problems: FieldProblem[], integer = false): number {
  const v = cell === undefined || cell.trim() === '' ? NaN : Number(cell);
  if (!Number.isFinite(v) || (integer && !Number.isInteger(v))) {
    problems.push({ path: at, value: clip(cell ?? ''), allowed: integer ? 'expected an integer epoch' : 'expected a finite number (not NaN or Infinity)' });
    return NaN;
  }
  return v;
}

/** SI size of one unit of a time column, or NaN (with a problem) if the unit is missing or not a time. */
function timeUnitSi(col: ColumnSpec, at: string, problems: FieldProblem[]): number {
  if (col.unit === null) {
    problems.push({ path: at, value: col.name, allowed: `give the unit of this column, e.g. "${col.name} [min]" in a CSV header or "unit: min" in ECSV` });
    return NaN;
  }
  try {
    return parseQuantity(`1 ${col.unit}`, at, 'time');
  } catch {
    problems.push({ path: at, value: col.unit, allowed: 'expected a time unit such as s, min, h or d' });
    return NaN;
  }
}

/**
 * Parse a timing table.
 * @param text the file's text
 * @param source its name, for messages
 * @param timeStandard the stated standard (from the claim), or null to use the ECSV meta `time_standard`
 * @param planetPeriodS the planet period, s, to infer epochs when the table has none
 * @throws InputError listing every problem with its line and column
 */
export function parseTimingTable(text: string, source: string, timeStandard: string | null, planetPeriodS: number): TimingTable {
  const problems: FieldProblem[] = [];
  const lines = text.split(/\r?\n/);
  const isEcsv = lines.length > 0 && /^#\s*%ECSV/.test(lines[0]);
  const raw = isEcsv ? readEcsv(lines, source, problems) : readCsv(lines, source, problems);
  if (!raw) throw new InputError(problems, source);

  const standard = timeStandard ?? raw.metaTimeStandard;
  const offsetDays = parseTimeStandard(standard);
  if (standard === null || standard === undefined) {
    problems.push({ path: 'claim.time_standard', value: undefined, allowed: `required for a timing table: ${TIME_STANDARD_ALLOWED}` });
  } else if (offsetDays === null) {
    problems.push({ path: 'claim.time_standard', value: standard, allowed: TIME_STANDARD_ALLOWED });
  }

  const roleCol: Partial<Record<Role, number>> = {};
  raw.columns.forEach((c, j) => {
    const role = ROLE_NAMES[c.name.toLowerCase()];
    const at = where(source, raw.headerLine, j + 1, c.name);
    if (role === undefined) {
      problems.push({ path: at, value: c.name, allowed: 'unknown column; allowed: epoch, time (mid_time, tc), time_err, duration (t14), duration_err' });
    } else if (roleCol[role] !== undefined) {
      problems.push({ path: at, value: c.name, allowed: `a second "${role}" column; give each column once` });
    } else {
      roleCol[role] = j;
    }
  });
  if (roleCol.time === undefined) problems.push({ path: where(source, raw.headerLine), value: raw.columns.map((c) => c.name).join(','), allowed: 'a "time" column (mid-transit times in days)' });
  if (roleCol.time_err === undefined) problems.push({ path: where(source, raw.headerLine), value: raw.columns.map((c) => c.name).join(','), allowed: 'a "time_err" column with its unit, e.g. "time_err [min]"' });
  if ((roleCol.duration === undefined) !== (roleCol.duration_err === undefined)) {
    problems.push({ path: where(source, raw.headerLine), value: raw.columns.map((c) => c.name).join(','), allowed: 'give both "duration" and "duration_err", or neither' });
  }
  if (roleCol.time !== undefined) {
    const u = raw.columns[roleCol.time].unit;
    if (u !== null && !/^(d|day|days)$/i.test(u)) {
      problems.push({ path: where(source, raw.headerLine, roleCol.time + 1, 'time'), value: u, allowed: 'times are days in the stated standard (unit "d" or none)' });
    }
  }
  const errUnit = roleCol.time_err !== undefined ? timeUnitSi(raw.columns[roleCol.time_err], where(source, raw.headerLine, roleCol.time_err + 1, 'time_err'), problems) : NaN;
  const hasDur = roleCol.duration !== undefined && roleCol.duration_err !== undefined;
  const durUnit = hasDur ? timeUnitSi(raw.columns[roleCol.duration!], where(source, raw.headerLine, roleCol.duration! + 1, 'duration'), problems) : NaN;
  const durErrUnit = hasDur ? timeUnitSi(raw.columns[roleCol.duration_err!], where(source, raw.headerLine, roleCol.duration_err! + 1, 'duration_err'), problems) : NaN;
  if (problems.length > 0) throw new InputError(problems, source);

  const n = raw.rows.length;
  if (n < MIN_TABLE_ROWS) {
    throw new InputError([{ path: source, value: `${n} data row${n === 1 ? '' : 's'}`, allowed: `at least ${MIN_TABLE_ROWS} transits: the no-moon ephemeris has 2 parameters and a moon's sinusoid 3 more (amplitude, phase, frequency), and one more row is needed to test the fit; with fewer there is no timing test of a moon` }], source);
  }
  if (n > MAX_TABLE_ROWS) {
    throw new InputError([{ path: source, value: `${n} data rows`, allowed: `at most ${MAX_TABLE_ROWS} transits: the periodograms, fits and outputs grow with the table, and ${MAX_TABLE_ROWS} transits already cover 55 years of a 1-day planet; vet a subset (e.g. every other transit, or one decade)` }], source);
  }
  const tDay = new Float64Array(n);
  const tErr = new Float64Array(n);
  const epochsGiven = roleCol.epoch !== undefined;
  const epochs = new Float64Array(n);
  const dur = hasDur ? new Float64Array(n) : null;
  const durErr = hasDur ? new Float64Array(n) : null;
  const ncol = raw.columns.length;
  const periodDays = planetPeriodS / DAY_S;
  const errRange = `from ${MIN_TIME_ERR_S * 1000} ms to a quarter of planet.period (${sig(planetPeriodS / 4 / DAY_S)} d): an uncertainty beyond that cannot tie the row to one transit`;
  const durRange = `shorter than half of planet.period (${sig(periodDays / 2)} d): no transit lasts longer`;
  const unitText = (u: number) => (u === DAY_S ? 'd' : u === 3600 ? 'h' : u === 60 ? 'min' : u === 1 ? 's' : `× ${u} s`);
  /** Check an uncertainty cell (value in the column's unit) and return it in seconds, or NaN after recording a problem. */
  const uncertainty = (v: number, unitS: number, cell: string, at: string, max: number, range: string): number => {
    if (!Number.isFinite(v)) return NaN;
    const si = v * unitS;
    if (v < 0) problems.push({ path: at, value: clip(cell), allowed: `a negative uncertainty; expected ${range}` });
    else if (v === 0) problems.push({ path: at, value: clip(cell), allowed: `a zero uncertainty; expected ${range}` });
    else if (!(si >= MIN_TIME_ERR_S && si <= max)) problems.push({ path: at, value: `${clip(cell)} ${unitText(unitS)}`, allowed: `expected ${range}` });
    else return si;
    return NaN;
  };
  for (let i = 0; i < n; i++) {
    const { line, cells } = raw.rows[i];
    const row = i + 1;
    if (cells.length !== ncol) {
      problems.push({ path: where(source, line, undefined, undefined, row), value: clip(cells.join(',')), allowed: `expected ${ncol} fields (${raw.columns.map((c) => c.name).join(', ')}), found ${cells.length}` });
      continue;
    }
    const cell = (role: Role) => cells[roleCol[role]!];
    const at = (role: Role) => where(source, line, roleCol[role]! + 1, raw.columns[roleCol[role]!].name, row);
    tDay[i] = numberCell(cell('time'), at('time'), problems);
    if (Number.isFinite(tDay[i])) {
      const bjd = tDay[i] + (offsetDays ?? 0);
      if (!(bjd >= 0 && bjd <= MAX_BJD)) {
        problems.push({ path: at('time'), value: clip(cell('time')), allowed: `expected a BJD_TDB from 0 to ${MAX_BJD} d (the stated standard "${String(standard)}" adds ${offsetDays ?? 0} d)` });
        tDay[i] = NaN;
      }
    }
    tErr[i] = uncertainty(numberCell(cell('time_err'), at('time_err'), problems), errUnit, cell('time_err'), at('time_err'), planetPeriodS / 4, errRange);
    if (epochsGiven) {
      epochs[i] = numberCell(cell('epoch'), at('epoch'), problems, true);
      if (Number.isFinite(epochs[i]) && Math.abs(epochs[i]) > MAX_ABS_EPOCH) {
        problems.push({ path: at('epoch'), value: clip(cell('epoch')), allowed: `expected an integer epoch from −${MAX_ABS_EPOCH} to ${MAX_ABS_EPOCH} (count epochs from a transit near the table)` });
      }
    }
    if (dur && durErr) {
      const d = numberCell(cell('duration'), at('duration'), problems);
      if (Number.isFinite(d) && !(d > 0 && d * durUnit < planetPeriodS / 2)) {
        problems.push({ path: at('duration'), value: `${clip(cell('duration'))} ${unitText(durUnit)}`, allowed: `expected a positive duration ${durRange}` });
      }
      dur[i] = d * durUnit;
      durErr[i] = uncertainty(numberCell(cell('duration_err'), at('duration_err'), problems), durErrUnit, cell('duration_err'), at('duration_err'), planetPeriodS / 4, errRange);
    }
  }
  if (problems.length > 0) throw new InputError(firstProblems(problems), source);

  // Rows in time order: a table need not be sorted (the order of rows carries no meaning); the
  // sort is stable and reported. Repeated times are errors.
  const order = Array.from({ length: n }, (_, i) => i);
  const reordered = order.some((i) => i > 0 && tDay[i] < tDay[i - 1]);
  if (reordered) order.sort((a, b2) => tDay[a] - tDay[b2] || a - b2);
  const timeCol = roleCol.time! + 1;
  const rowOf = (k: number) => order[k] + 1;
  const lineOf = (k: number) => raw.rows[order[k]].line;
  for (let k = 1; k < n; k++) {
    if (tDay[order[k]] === tDay[order[k - 1]]) {
      problems.push({ path: where(source, lineOf(k), timeCol, 'time', rowOf(k)), value: tDay[order[k]], allowed: `a repeated time (also row ${rowOf(k - 1)}, line ${lineOf(k - 1)}): each transit once` });
    }
  }
  if (problems.length > 0) throw new InputError(firstProblems(problems), source);
  const pick = (a: Float64Array) => Float64Array.from(order, (i) => a[i]);
  const tSorted = pick(tDay);
  const errSorted = pick(tErr);
  const epochsSorted = pick(epochs);
  // Elapsed seconds from the first transit, from the table values (before the offset) for precision.
  const timeS = new Float64Array(n);
  for (let k = 0; k < n; k++) timeS[k] = (tSorted[k] - tSorted[0]) * DAY_S;
  if (!epochsGiven) {
    // Epoch of each transit: nearest whole number of periods after the first (Kepler: one transit per period).
    for (let k = 0; k < n; k++) {
      const x = timeS[k] / planetPeriodS;
      epochsSorted[k] = Math.round(x);
      if (Math.abs(x - epochsSorted[k]) > 0.25) {
        problems.push({ path: where(source, lineOf(k), timeCol, 'time', rowOf(k)), value: tSorted[k], allowed: `lies ${(Math.abs(x - epochsSorted[k]) * periodDays).toFixed(3)} d from the transit predicted by planet.period; give an "epoch" column or check the period` });
      }
    }
  }
  const epochCol = epochsGiven ? roleCol.epoch! + 1 : timeCol;
  for (let k = 1; k < n; k++) {
    const at = where(source, lineOf(k), epochCol, epochsGiven ? 'epoch' : 'time', rowOf(k));
    if (epochsSorted[k] === epochsSorted[k - 1]) {
      problems.push({ path: at, value: epochsSorted[k], allowed: `duplicate epoch ${epochsSorted[k]} (also row ${rowOf(k - 1)}, line ${lineOf(k - 1)})${epochsGiven ? '' : ' after inferring epochs from planet.period'}: each transit once` });
    } else if (epochsSorted[k] < epochsSorted[k - 1] && epochsGiven) {
      problems.push({ path: at, value: epochsSorted[k], allowed: `epochs must increase with time (row ${rowOf(k - 1)}, line ${lineOf(k - 1)}, has the earlier time but epoch ${epochsSorted[k - 1]})` });
    }
  }
  if (problems.length > 0) throw new InputError(firstProblems(problems), source);
  const span = epochsSorted[n - 1] - epochsSorted[0];
  if (span > MAX_EPOCH_SPAN) {
    throw new InputError([{ path: source, value: `epochs ${epochsSorted[0]} to ${epochsSorted[n - 1]} (${span} orbits)`, allowed: `at most ${MAX_EPOCH_SPAN} orbits from first to last transit: the frequency grid must resolve 1/span, and ${MAX_EPOCH_SPAN} orbits already cover 68 years of a half-day planet; vet a shorter stretch` }], source);
  }
  const pickOrNull = (a: Float64Array | null) => (a ? pick(a) : null);
  return {
    source,
    timeStandard: String(standard),
    epochs: epochsSorted,
    epochsInferred: !epochsGiven,
    reordered,
    timeS,
    timeErrS: errSorted,
    referenceBjdTdb: tSorted[0] + (offsetDays ?? 0),
    durationS: pickOrNull(dur),
    durationErrS: pickOrNull(durErr),
  };
}

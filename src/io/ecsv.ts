/**
 * Writer and reader for ECSV 1.0, astropy's Enhanced Character Separated Values
 * (Aldcroft et al., APE 6, "ECSV", accepted; revised 2021, zenodo
 * 10.5281/zenodo.4792325), so astropy's `Table.read(path)` loads it with
 * units and metadata. Conventions kept for astropy compatibility:
 * - units are strings astropy parses: a scale such as `1e-06` rather than
 *   `ppm` (astropy does not enable ppm by default);
 * - a BJD_TDB time column has no unit (the standard goes in its description
 *   and in the table meta), since astropy fails on a unit for Time columns;
 * - floats are written in the shortest form that round-trips exactly.
 * A `.csv` path gets a plain CSV (one header row) instead.
 *
 * `parseEcsv` reads an ECSV 1.0 (or 0.9) text back: the `# %ECSV` line, the
 * YAML header in `# ` lines (its `datatype` list and optional `delimiter`
 * and `meta`), the row of column names, which must repeat the header's
 * names, and the data rows (APE 6, "Header details" and "Data"): a space
 * or a comma between values (space by default; runs of spaces count as one),
 * values that hold the delimiter, a space or a double quote quoted with
 * double quotes (a double quote inside doubled), and a missing value written
 * as an empty field or `""`.
 */
import { parse as parseYaml } from 'yaml';
import { InputError, type FieldProblem } from '../scenario/errors.js';

export type EcsvDatatype = 'float64' | 'int64' | 'string' | 'bool';

export interface TableColumn {
  name: string;
  datatype: EcsvDatatype;
  unit?: string;
  description?: string;
  values: ArrayLike<number> | ArrayLike<string> | ArrayLike<boolean>;
}

function yamlString(s: string): string {
  // JSON strings are valid YAML flow scalars.
  return JSON.stringify(s);
}

/** YAML flow rendering of plain metadata (objects, arrays, numbers, strings, booleans). */
function yamlFlow(v: unknown): string {
  if (v === null || v === undefined) return 'null';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : Number.isNaN(v) ? '.nan' : v > 0 ? '.inf' : '-.inf';
  if (typeof v === 'boolean') return v ? 'true' : 'false';
  if (typeof v === 'string') return yamlString(v);
  if (Array.isArray(v)) return '[' + v.map(yamlFlow).join(', ') + ']';
  return '{' + Object.entries(v as Record<string, unknown>).map(([k, x]) => `${yamlString(k)}: ${yamlFlow(x)}`).join(', ') + '}';
}

function formatCell(col: TableColumn, i: number): string {
  const v = col.values[i];
  switch (col.datatype) {
    case 'float64': {
      const x = v as number;
      return Number.isFinite(x) ? String(x) : Number.isNaN(x) ? 'nan' : x > 0 ? 'inf' : '-inf';
    }
    case 'int64':
      return String(Math.trunc(v as number));
    case 'bool':
      return v ? 'True' : 'False';
    case 'string': {
      const s = String(v);
      return /[",\n\r]/.test(s) || s === '' ? `"${s.replace(/"/g, '""')}"` : s;
    }
  }
}

function rowCount(columns: TableColumn[]): number {
  const n = columns.length ? columns[0].values.length : 0;
  for (const c of columns) {
    if (c.values.length !== n) throw new RangeError(`column ${c.name} has ${c.values.length} rows, expected ${n}`);
  }
  return n;
}

/** Render an ECSV 1.0 table (comma-delimited) with the given table-level metadata. */
export function toEcsv(columns: TableColumn[], meta: Record<string, unknown> = {}): string {
  const n = rowCount(columns);
  const lines: string[] = ['# %ECSV 1.0', '# ---', "# delimiter: ','", '# datatype:'];
  for (const c of columns) {
    const parts = [`name: ${yamlString(c.name)}`];
    if (c.unit) parts.push(`unit: ${yamlString(c.unit)}`);
    parts.push(`datatype: ${c.datatype}`);
    if (c.description) parts.push(`description: ${yamlString(c.description)}`);
    lines.push(`# - {${parts.join(', ')}}`);
  }
  const metaEntries = Object.entries(meta);
  if (metaEntries.length > 0) {
    lines.push('# meta: !!omap');
    for (const [k, v] of metaEntries) lines.push(`# - {${yamlString(k)}: ${yamlFlow(v)}}`);
  }
  lines.push('# schema: astropy-2.0');
  lines.push(columns.map((c) => formatCell({ ...c, datatype: 'string', values: [c.name] }, 0)).join(','));
  const out = [lines.join('\n')];
  const row: string[] = new Array(columns.length);
  const body: string[] = [];
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < columns.length; j++) row[j] = formatCell(columns[j], i);
    body.push(row.join(','));
  }
  return out.concat(body).join('\n') + '\n';
}

/** Render a plain CSV: one header row with units in brackets, then the rows. */
export function toCsv(columns: TableColumn[]): string {
  const n = rowCount(columns);
  const header = columns.map((c) => (c.unit ? `${c.name} [${c.unit}]` : c.name)).join(',');
  const body: string[] = [header];
  for (let i = 0; i < n; i++) body.push(columns.map((c) => formatCell(c, i)).join(','));
  return body.join('\n') + '\n';
}

/** ECSV for `.ecsv`, CSV for `.csv`; any other extension is refused by the caller. */
export function renderTable(path: string, columns: TableColumn[], meta: Record<string, unknown>): string {
  return path.toLowerCase().endsWith('.csv') ? toCsv(columns) : toEcsv(columns, meta);
}

/** The datatypes of ECSV 1.0 (APE 6, "datatype"). */
export const ECSV_DATATYPES: readonly string[] = [
  'bool', 'int8', 'int16', 'int32', 'int64', 'uint8', 'uint16', 'uint32', 'uint64',
  'float16', 'float32', 'float64', 'float128', 'complex64', 'complex128', 'complex256', 'string',
];

/** One column of an ECSV header. */
export interface EcsvColumnHeader {
  name: string;
  datatype: string;
  /** The unit as written (null: none). */
  unit: string | null;
  description: string | null;
  /** APE 6 subtype of a multidimensional or variable-length column (null: none). */
  subtype: string | null;
}

/** One data row: its cells as text (quotes removed; null for a missing value) and what is wrong with it, if anything. */
export interface EcsvRow {
  /** 1-based line in the text. */
  line: number;
  cells: Array<string | null>;
  /** A malformed row (an unclosed quote, a wrong number of values); null when well-formed. */
  problem: string | null;
}

export interface ParsedEcsv {
  /** The version on the first line ("1.0"). */
  version: string;
  delimiter: ' ' | ',';
  columns: EcsvColumnHeader[];
  /** The header's `meta` (an `!!omap` read as a plain object); {} without one. */
  meta: Record<string, unknown>;
  /** 1-based line of the row of column names. */
  headerLine: number;
  rows: EcsvRow[];
}

/** A header problem: the source, the line and what is allowed. */
function headerProblem(source: string, line: number, value: unknown, allowed: string): InputError {
  return new InputError([{ path: `${source} line ${line}`, value, allowed }]);
}

/**
 * Split one line into values (APE 6, "Data"): `delimiter` between values, a
 * space delimiter taking runs of spaces as one and ignoring leading and
 * trailing spaces; a value may be quoted with `"` (a `"` inside doubled);
 * an empty value or `""` is missing (null). Returns the cells, or a problem.
 */
export function splitEcsvLine(line: string, delimiter: ' ' | ','): { cells: Array<string | null>; problem: string | null } {
  const cells: Array<string | null> = [];
  const n = line.length;
  let i = 0;
  const space = delimiter === ' ';
  if (space) while (i < n && line[i] === ' ') i++;
  if (space && i === n) return { cells, problem: null };
  for (;;) {
    // Leading spaces of a value are not part of it (as astropy reads a comma-delimited file).
    while (!space && i < n && line[i] === ' ') i++;
    let cell: string | null;
    if (line[i] === '"') {
      let v = '';
      i++;
      let closed = false;
      while (i < n) {
        if (line[i] === '"') {
          if (line[i + 1] === '"') { v += '"'; i += 2; continue; }
          closed = true;
          i++;
          break;
        }
        v += line[i++];
      }
      if (!closed) return { cells, problem: `value ${cells.length + 1} opens a double quote that the line does not close` };
      if (!space) while (i < n && line[i] === ' ') i++;
      if (i < n && line[i] !== delimiter) return { cells, problem: `value ${cells.length + 1}: text after its closing double quote` };
      cell = v === '' ? null : v;
    } else {
      let j = i;
      while (j < n && line[j] !== delimiter) j++;
      const v = line.slice(i, j).trimEnd();
      if (v.includes('"')) return { cells, problem: `value ${cells.length + 1} (${v.length > 40 ? v.slice(0, 37) + '…' : v}) holds a double quote but is not quoted` };
      cell = v === '' ? null : v;
      i = j;
    }
    cells.push(cell);
    if (i >= n) break;
    // At a delimiter: a space delimiter takes the whole run (and trailing spaces end the line).
    i++;
    if (space) {
      while (i < n && line[i] === ' ') i++;
      if (i >= n) break;
    } else if (i >= n) {
      cells.push(null);
      break;
    }
  }
  return { cells, problem: null };
}

function plainMeta(v: unknown): Record<string, unknown> {
  if (v instanceof Map) return Object.fromEntries([...v.entries()].map(([k, x]) => [String(k), x]));
  if (Array.isArray(v)) {
    const out: Record<string, unknown> = {};
    for (const e of v) if (e && typeof e === 'object') Object.assign(out, plainMeta(e));
    return out;
  }
  if (v && typeof v === 'object') return { ...(v as Record<string, unknown>) };
  return {};
}

/**
 * Read an ECSV text (APE 6). Throws InputError for a problem of the whole
 * table (no `# %ECSV` line, a YAML header that does not parse or lacks its
 * `datatype` list, an unknown datatype or delimiter, no row of column names,
 * or one that does not repeat the header's names); a malformed data row is
 * returned with its `problem`, so a caller can skip it and read the rest.
 * Lines starting with `#` after the header and blank lines are skipped.
 */
export function parseEcsv(text: string, source = 'ECSV table'): ParsedEcsv {
  const lines = text.split(/\r?\n/);
  const first = /^#\s*%ECSV\s+(\d+)\.(\d+)\s*$/.exec(lines[0] ?? '');
  if (!first || Number(first[1]) > 1) {
    throw headerProblem(source, 1, (lines[0] ?? '').slice(0, 40), 'an ECSV file starts with the line "# %ECSV 1.0" (APE 6; versions 0.9 and 1.0 are read)');
  }
  let i = 1;
  const yaml: string[] = [];
  let sep = -1;
  for (; i < lines.length && lines[i].startsWith('#'); i++) {
    const body = lines[i].replace(/^# ?/, '');
    if (sep < 0) {
      if (body.trim() === '---') sep = i;
      continue;
    }
    yaml.push(body);
  }
  if (sep < 0) throw headerProblem(source, 2, lines[1] ?? '', 'the YAML header of an ECSV file begins with a line "# ---"');
  let doc: unknown;
  try {
    doc = parseYaml(yaml.join('\n'), { schema: 'yaml-1.1', logLevel: 'silent' });
  } catch (e) {
    throw headerProblem(source, sep + 2, 'the YAML header', `valid YAML (${String((e as Error).message).split('\n')[0]})`);
  }
  const head = (doc && typeof doc === 'object' && !Array.isArray(doc) ? doc : {}) as Record<string, unknown>;
  const delimiter = head.delimiter ?? ' ';
  if (delimiter !== ' ' && delimiter !== ',') throw headerProblem(source, sep + 2, delimiter, "delimiter: ' ' (the default) or ',' (APE 6)");
  if (!Array.isArray(head.datatype) || head.datatype.length === 0) {
    throw headerProblem(source, sep + 2, 'no datatype list', 'a YAML header with a "datatype:" list naming each column (APE 6)');
  }
  const problems: FieldProblem[] = [];
  const columns: EcsvColumnHeader[] = head.datatype.map((d: unknown, k: number) => {
    const e = (d && typeof d === 'object' ? d : {}) as Record<string, unknown>;
    const name = typeof e.name === 'string' ? e.name : e.name === undefined || e.name === null ? '' : String(e.name);
    const datatype = typeof e.datatype === 'string' ? e.datatype : '';
    if (name === '') problems.push({ path: `${source}: datatype entry ${k + 1}`, value: d, allowed: 'a column entry with a name' });
    if (!ECSV_DATATYPES.includes(datatype)) problems.push({ path: `${source}: column ${name || k + 1} datatype`, value: e.datatype, allowed: `one of ${ECSV_DATATYPES.join(', ')} (APE 6)` });
    const str = (x: unknown): string | null => (x === undefined || x === null ? null : String(x));
    return { name, datatype, unit: str(e.unit), description: str(e.description), subtype: str(e.subtype) };
  });
  if (problems.length) throw new InputError(problems);
  // The row of column names, then the data.
  let headerLine = -1;
  const rows: EcsvRow[] = [];
  for (; i < lines.length; i++) {
    const line = lines[i];
    if (line.trim() === '' || line.trimStart().startsWith('#')) continue;
    const split = splitEcsvLine(line, delimiter);
    if (headerLine < 0) {
      headerLine = i + 1;
      const names = split.cells.map((c) => c ?? '');
      const want = columns.map((c) => c.name);
      const k = names.findIndex((n, j) => j < want.length && n !== want[j]);
      if (split.problem !== null) throw headerProblem(source, headerLine, split.problem, `a row of column names (the YAML header's names in order: ${want.join(delimiter)})`);
      if (k >= 0) {
        throw headerProblem(source, headerLine, `column ${k + 1} named ${names[k]}`, `the row of column names repeats the YAML header's names in order; column ${k + 1} there is ${want[k]} (all: ${want.join(delimiter)})`);
      }
      if (names.length !== want.length) {
        throw headerProblem(source, headerLine, `${names.length} column names`, `the row of column names repeats the YAML header's ${want.length} names in order (all: ${want.join(delimiter)})`);
      }
      continue;
    }
    let problem = split.problem;
    if (problem === null && split.cells.length !== columns.length) problem = `${split.cells.length} values, the header has ${columns.length} columns`;
    rows.push({ line: i + 1, cells: split.cells, problem });
  }
  if (headerLine < 0) throw headerProblem(source, lines.length, '(end of file)', `a row of column names after the header: ${columns.map((c) => c.name).join(delimiter)}`);
  return { version: `${first[1]}.${first[2]}`, delimiter, columns, meta: plainMeta(head.meta), headerLine, rows };
}

/**
 * A cell's value by its column's datatype: a number for the integer and float
 * types (`nan`, `inf`, `-inf` as Python writes them), a boolean for `bool`
 * (`True`/`False`), the text for `string` and the complex types; null for a
 * missing value; NaN for a number or boolean that does not parse.
 */
export function ecsvValue(datatype: string, cell: string | null): number | boolean | string | null {
  if (cell === null) return null;
  if (datatype === 'string' || datatype.startsWith('complex')) return cell;
  if (datatype === 'bool') return cell === 'True' || cell === 'true' ? true : cell === 'False' || cell === 'false' ? false : Number.NaN;
  const t = cell.trim();
  if (t === 'nan' || t === 'NaN') return Number.NaN;
  if (t === 'inf' || t === '+inf' || t === 'Infinity') return Number.POSITIVE_INFINITY;
  if (t === '-inf' || t === '-Infinity') return Number.NEGATIVE_INFINITY;
  const x = t === '' ? Number.NaN : Number(t);
  if (datatype.startsWith('int') || datatype.startsWith('uint')) return Number.isInteger(x) ? x : Number.NaN;
  return x;
}

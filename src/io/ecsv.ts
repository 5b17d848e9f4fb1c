/**
 * Writer for ECSV 1.0, astropy's Enhanced Character Separated Values
 * (Aldcroft et al., APE 6, "ECSV", accepted; revised 2021, zenodo
 * 10.5281/zenodo.4792325), so astropy's `Table.read(path)` loads it with
 * units and metadata. Conventions kept for astropy compatibility:
 * - units are strings astropy parses: a scale such as `1e-06` rather than
 *   `ppm` (astropy does not enable ppm by default);
 * - a BJD_TDB time column has no unit (the standard goes in its description
 *   and in the table meta), since astropy fails on a unit for Time columns;
 * - floats are written in the shortest form that round-trips exactly.
 * A `.csv` path gets a plain CSV (one header row) instead.
 */

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

/**
 * parseEcsv (src/io/ecsv.ts) against astropy: the planet lists that
 * test/fixtures/planetList_astropy.py wrote once with astropy 5.2.1
 * (space- and comma-delimited, a quoted name with a space, a quoted double
 * quote, masked values), read back to the values astropy itself reads from
 * them (planetList_astropy.json, same script); and the header checks of APE 6.
 */
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { parseEcsv, ecsvValue, splitEcsvLine, toEcsv } from '../../src/io/ecsv.js';
import { InputError } from '../../src/scenario/errors.js';

const fixture = (f: string) => readFileSync(new URL(`../fixtures/${f}`, import.meta.url), 'utf8');
interface Ref { names: string[]; units: Array<string | null>; datatypes: string[]; rows: Array<Array<number | string | null>>; meta: Record<string, unknown> }
const ref = JSON.parse(fixture('planetList_astropy.json')) as Record<string, Ref>;

const problemOf = (f: () => unknown): string => {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as Error).message;
  }
  throw new Error('no error');
};

describe('parseEcsv reads what astropy wrote', () => {
  for (const file of ['planetList_space.ecsv', 'planetList_comma.ecsv']) {
    it(`${file}: names, units, values and masked values as astropy reads them (astropy 5.2.1, test/fixtures/planetList_astropy.py)`, () => {
      const want = ref[file];
      const t = parseEcsv(fixture(file), file);
      expect(t.version).toBe('1.0');
      expect(t.delimiter).toBe(file.includes('comma') ? ',' : ' ');
      expect(t.columns.map((c) => c.name)).toEqual(want.names);
      expect(t.columns.map((c) => c.unit)).toEqual(want.units);
      // astropy's dtypes: fixed-width unicode for ECSV 'string', float64 for 'float64'.
      t.columns.forEach((c, k) => expect(c.datatype === 'string' ? /^<U\d+$/.test(want.datatypes[k]) : want.datatypes[k] === c.datatype, c.name).toBe(true));
      expect(t.meta).toEqual(want.meta);
      expect(t.rows.map((r) => r.problem)).toEqual(want.rows.map(() => null));
      // Exact: both sides parse the same shortest round-trip decimal text to the same double.
      expect(t.rows.map((r) => r.cells.map((c, k) => ecsvValue(t.columns[k].datatype, c)))).toEqual(want.rows);
      expect(t.rows.map((r) => r.line)).toEqual(want.rows.map((_, i) => t.headerLine + 1 + i));
    });
  }

  it('reads its own writer\'s output back (toEcsv, comma-delimited)', () => {
    const text = toEcsv([
      { name: 'x', datatype: 'float64', unit: 'd', values: new Float64Array([1.5, Number.NaN]) },
      { name: 'n', datatype: 'int64', values: new Int32Array([3, -4]) },
      { name: 's', datatype: 'string', values: ['a, "b"', 'c'] },
      { name: 'ok', datatype: 'bool', values: [true, false] },
    ], { seed: 7 });
    const t = parseEcsv(text);
    expect(t.meta).toEqual({ seed: 7 });
    expect(t.rows.map((r) => r.cells.map((c, k) => ecsvValue(t.columns[k].datatype, c)))).toEqual([[1.5, 3, 'a, "b"', true], [Number.NaN, -4, 'c', false]]);
  });
});

describe('parseEcsv: rows and header checks (APE 6)', () => {
  it('splits space- and comma-delimited lines with quotes, runs of spaces and missing values', () => {
    // Common practice, no source: the quoting rules APE 6 takes from CSV (RFC 4180), spaces as astropy reads them.
    expect(splitEcsvLine('  a   "b c"  "" "d ""e"""  ', ' ')).toEqual({ cells: ['a', 'b c', null, 'd "e"'], problem: null });
    expect(splitEcsvLine('a, "b,c",,', ',')).toEqual({ cells: ['a', 'b,c', null, null], problem: null });
    expect(splitEcsvLine('a "b', ' ').problem).toMatch(/value 2 opens a double quote/);
    expect(splitEcsvLine('a "b"c', ' ').problem).toMatch(/value 2: text after its closing double quote/);
  });

  const head = ['# %ECSV 1.0', '# ---', '# datatype:', '# - {name: a, datatype: float64}', '# - {name: b, unit: d, datatype: string}'];
  it('a malformed data row is returned with its problem, the others are read', () => {
    const t = parseEcsv([...head, 'a b', '1 x', '2', '3 "y'].join('\n'));
    expect(t.rows.map((r) => r.problem)).toEqual([null, '1 values, the header has 2 columns', 'value 2 opens a double quote that the line does not close']);
    expect(t.rows.map((r) => r.line)).toEqual([7, 8, 9]);
  });

  it('refuses, naming the line and what is allowed: no %ECSV line, no ---, no datatype, an unknown datatype or delimiter, a column row that differs from the header', () => {
    expect(problemOf(() => parseEcsv('a,b\n1,2\n', 'l.ecsv'))).toMatch(/^l\.ecsv line 1: got "a,b"; an ECSV file starts with the line "# %ECSV 1\.0"/);
    expect(problemOf(() => parseEcsv('# %ECSV 2.0\n# ---\n', 'l.ecsv'))).toMatch(/l\.ecsv line 1: got "# %ECSV 2\.0"/);
    expect(problemOf(() => parseEcsv('# %ECSV 1.0\n# datatype:\na\n', 'l.ecsv'))).toMatch(/line 2: .*begins with a line "# ---"/);
    expect(problemOf(() => parseEcsv('# %ECSV 1.0\n# ---\n# delimiter: ","\na\n', 'l.ecsv'))).toMatch(/a "datatype:" list naming each column/);
    expect(problemOf(() => parseEcsv([...head.slice(0, 3), '# - {name: a, datatype: float99}', 'a'].join('\n'), 'l.ecsv'))).toMatch(/column a datatype: got "float99"; one of bool, int8/);
    expect(problemOf(() => parseEcsv([...head, "# delimiter: '|'", 'a|b'].join('\n'), 'l.ecsv'))).toMatch(/got "\|"; delimiter: ' ' \(the default\) or ','/);
    expect(problemOf(() => parseEcsv([...head, 'a c', '1 2'].join('\n'), 'l.ecsv'))).toMatch(/l\.ecsv line 6: got "column 2 named c"; the row of column names repeats the YAML header's names in order; column 2 there is b \(all: a b\)/);
    expect(problemOf(() => parseEcsv([...head, 'b a', '1 2'].join('\n'), 'l.ecsv'))).toMatch(/got "column 1 named b"; .* column 1 there is a/);
    expect(problemOf(() => parseEcsv([...head, 'a', '1 2'].join('\n'), 'l.ecsv'))).toMatch(/got "1 column names"; the row of column names repeats the YAML header's 2 names in order/);
    expect(problemOf(() => parseEcsv([...head, 'a b c', '1 2'].join('\n'), 'l.ecsv'))).toMatch(/got "3 column names"/);
    expect(problemOf(() => parseEcsv(head.join('\n'), 'l.ecsv'))).toMatch(/a row of column names after the header: a b/);
  });

  it('typed values by datatype', () => {
    // Common practice, no source: Python's float repr (nan, inf) and bool text (True, False), as astropy writes them.
    expect(ecsvValue('float64', 'nan')).toBeNaN();
    expect(ecsvValue('float32', '-inf')).toBe(Number.NEGATIVE_INFINITY);
    expect(ecsvValue('int64', '12')).toBe(12);
    expect(ecsvValue('int64', '1.5')).toBeNaN();
    expect(ecsvValue('bool', 'False')).toBe(false);
    expect(ecsvValue('string', '12')).toBe('12');
    expect(ecsvValue('float64', null)).toBeNull();
  });
});

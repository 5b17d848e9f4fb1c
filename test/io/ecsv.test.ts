import { describe, it, expect } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { toEcsv, toCsv } from '../../src/io/ecsv.js';

const cols = [
  { name: 'time', datatype: 'float64' as const, description: 'Mid-exposure time, BJD_TDB (days)', values: new Float64Array([2461000.123456789, 2461000.125]) },
  { name: 'epoch', datatype: 'int64' as const, values: new Int32Array([0, 1]) },
  { name: 'depth', datatype: 'float64' as const, unit: '1e-06', values: new Float64Array([123.5, Number.NaN]) },
  { name: 'note', datatype: 'string' as const, values: ['a, "quoted" one', 'plain'] },
];

// Whether Debian's python3-astropy is installed (.ci/run installs it).
const astropyOk = spawnSync('/usr/bin/python3', ['-c', 'import astropy'], { encoding: 'utf8' }).status === 0;

describe('ECSV writer', () => {
  it('writes the ECSV 1.0 header and round-trip-exact floats (APE 6 layout)', () => {
    const text = toEcsv(cols, { time_standard: 'BJD_TDB', seed: 7 });
    const lines = text.split('\n');
    expect(lines[0]).toBe('# %ECSV 1.0');
    expect(lines[1]).toBe('# ---');
    expect(text).toContain("# delimiter: ','");
    expect(text).toContain('time,epoch,depth,note');
    expect(text).toContain('2461000.123456789,0,123.5,"a, ""quoted"" one"');
    expect(text).toContain('nan');
    expect(Number('2461000.123456789')).toBe(2461000.123456789);
  });

  it('CSV puts units in the header row', () => {
    expect(toCsv(cols).split('\n')[0]).toBe('time,epoch,depth [1e-06],note');
  });

  it.skipIf(!astropyOk)('astropy Table.read loads it with units and meta (astropy, a general-purpose reference library)', () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-ecsv-'));
    const path = join(dir, 't.ecsv');
    writeFileSync(path, toEcsv(cols, { time_standard: 'BJD_TDB', seed: 7 }));
    const script = `
import sys, json
from astropy.table import Table
t = Table.read(sys.argv[1], format='ascii.ecsv')
print(json.dumps({'names': t.colnames, 'unit': str(t['depth'].unit), 'time0': float(t['time'][0]),
  'note0': str(t['note'][0]), 'meta': dict(t.meta), 'n': len(t)}))
`;
    const out = JSON.parse(execFileSync('/usr/bin/python3', ['-c', script, path], { encoding: 'utf8' }));
    expect(out.names).toEqual(['time', 'epoch', 'depth', 'note']);
    expect(out.unit).toBe('1e-06');
    expect(out.time0).toBe(2461000.123456789);
    expect(out.note0).toBe('a, "quoted" one');
    expect(out.meta.time_standard).toBe('BJD_TDB');
    expect(out.n).toBe(2);
  });
});

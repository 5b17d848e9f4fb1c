import { describe, it, expect } from 'vitest';
import { parseTimingTable, parseTimeStandard } from '../../src/vet/timingTable.js';
import { parseClaimText } from '../../src/vet/loadClaim.js';
import { InputError } from '../../src/scenario/errors.js';
import { DAY_S } from '../../src/physics/constants.js';

const P = 10 * DAY_S; // planet period used to infer epochs
const rows = (times: number[], err = '0.5') => times.map((t) => `${t},${err}`).join('\n');
const csv = (body: string) => `time,time_err [min]\n${body}\n`;
const times = [3000.1, 3010.1002, 3020.0999, 3030.1001, 3040.1, 3050.1003];

function problemsOf(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as Error).message;
  }
  throw new Error('expected an InputError');
}

describe('parseTimeStandard', () => {
  it('accepts BJD_TDB and BJD_TDB minus an offset; refuses other standards (Eastman et al. 2010 convention)', () => {
    expect(parseTimeStandard('BJD_TDB')).toBe(0);
    expect(parseTimeStandard('BJD_TDB-2457000')).toBe(2457000);
    expect(parseTimeStandard('BJD_TDB - 2454833')).toBe(2454833);
    expect(parseTimeStandard('HJD')).toBeNull();
    expect(parseTimeStandard('BJD_UTC')).toBeNull();
    expect(parseTimeStandard(undefined)).toBeNull();
  });
});

describe('parseTimingTable', () => {
  it('reads a CSV, converts units, infers epochs across a gap and applies the offset', () => {
    const t = parseTimingTable(csv(rows([3000.1, 3010.1002, 3030.1001, 3040.1, 3050.1003, 3060.1])), 't.csv', 'BJD_TDB-2457000', P);
    expect(Array.from(t.epochs)).toEqual([0, 1, 3, 4, 5, 6]);
    expect(t.epochsInferred).toBe(true);
    expect(t.referenceBjdTdb).toBe(2460000.1); // 3000.1 + 2457000, exact in binary to the printed digits
    expect(t.timeErrS[0]).toBeCloseTo(30, 12); // 0.5 min = 30 s (definition of the minute)
    expect(t.timeS[1]).toBeCloseTo((3010.1002 - 3000.1) * DAY_S, 6);
    expect(t.durationS).toBeNull();
  });

  it('refuses a table without a stated time standard, citing Eastman, Siverd & Gaudi 2010', () => {
    const msg = problemsOf(() => parseTimingTable(csv(rows(times)), 't.csv', null, P));
    expect(msg).toMatch(/claim\.time_standard/);
    expect(msg).toMatch(/Eastman, Siverd & Gaudi 2010/);
    expect(msg).toMatch(/mimic a TTV/);
  });

  it('a malformed cell gets a message naming its line and column', () => {
    const text = csv(rows(times)).replace('3020.0999,0.5', '3020.0999,abc');
    const msg = problemsOf(() => parseTimingTable(text, 't.csv', 'BJD_TDB', P));
    expect(msg).toContain('t.csv row 3 (line 4), column 2 (time_err)');
    expect(msg).toContain('"abc"');
  });

  it('a row with the wrong number of fields names its line', () => {
    const text = csv(rows(times)).replace('3030.1001,0.5', '3030.1001');
    expect(problemsOf(() => parseTimingTable(text, 't.csv', 'BJD_TDB', P))).toMatch(/t\.csv row 4 \(line 5\): .*expected 2 fields/);
  });

  it('duplicate epochs are errors, given or inferred', () => {
    const given = 'epoch,time,time_err [s]\n' + times.map((t, i) => `${i === 3 ? 2 : i},${t},20`).join('\n');
    expect(problemsOf(() => parseTimingTable(given, 't.csv', 'BJD_TDB', P))).toMatch(/row 4 \(line 5\), column 1 \(epoch\).*duplicate epoch 2 \(also row 3/);
    const inferred = csv(rows([3000.1, 3010.1, 3010.2, 3030.1, 3040.1, 3050.1]));
    expect(problemsOf(() => parseTimingTable(inferred, 't.csv', 'BJD_TDB', P))).toMatch(/row 3 \(line 4\), column 1 \(time\).*duplicate epoch 1/);
  });

  it('unsorted rows are sorted by time (and say so); epochs that disagree with the time order and repeated times are errors', () => {
    const swapped = csv(rows([3000.1, 3020.1, 3010.1, 3030.1, 3040.1, 3050.1]));
    const t = parseTimingTable(swapped, 't.csv', 'BJD_TDB', P);
    expect(t.reordered).toBe(true);
    expect(Array.from(t.epochs)).toEqual([0, 1, 2, 3, 4, 5]);
    expect(t.timeS[1]).toBeCloseTo(10 * DAY_S, 4);
    expect(parseTimingTable(csv(rows(times)), 't.csv', 'BJD_TDB', P).reordered).toBe(false);
    const crossed = 'epoch,time,time_err [s]\n' + [0, 2, 1, 3, 4, 5].map((e, i) => `${e},${3000.1 + 10 * i},20`).join('\n');
    expect(problemsOf(() => parseTimingTable(crossed, 't.csv', 'BJD_TDB', P))).toMatch(/row 3 \(line 4\), column 1 \(epoch\): got 1; epochs must increase with time \(row 2/);
    const repeated = csv(rows([3000.1, 3010.1, 3010.1, 3030.1, 3040.1, 3050.1]));
    expect(problemsOf(() => parseTimingTable(repeated, 't.csv', 'BJD_TDB', P))).toMatch(/row 3 \(line 4\), column 1 \(time\).*repeated time \(also row 2/);
  });

  it('uncertainties that are zero, negative, NaN, Infinity or beyond a quarter period are field errors with the row', () => {
    const withErr = (e: string) => csv(rows(times)).replace('3040.1,0.5', `3040.1,${e}`);
    expect(problemsOf(() => parseTimingTable(withErr('-0.5'), 't.csv', 'BJD_TDB', P))).toMatch(/row 5 \(line 6\), column 2 \(time_err\): got "-0.5"; a negative uncertainty/);
    expect(problemsOf(() => parseTimingTable(withErr('0'), 't.csv', 'BJD_TDB', P))).toMatch(/row 5 \(line 6\), column 2 \(time_err\): got "0"; a zero uncertainty/);
    expect(problemsOf(() => parseTimingTable(withErr('NaN'), 't.csv', 'BJD_TDB', P))).toMatch(/row 5 \(line 6\), column 2 \(time_err\): got "NaN"; expected a finite number/);
    expect(problemsOf(() => parseTimingTable(withErr('Infinity'), 't.csv', 'BJD_TDB', P))).toMatch(/row 5 .*"Infinity"; expected a finite number/);
    // 1e308 min overflows a double in seconds; far beyond P/4 = 2.5 d anyway.
    const huge = problemsOf(() => parseTimingTable(withErr('1e308'), 't.csv', 'BJD_TDB', P));
    expect(huge).toMatch(/row 5 \(line 6\), column 2 \(time_err\): got "1e308 min"; expected from 1 ms to a quarter of planet\.period \(2\.5 d\)/);
    expect(problemsOf(() => parseTimingTable(withErr('1e-9'), 't.csv', 'BJD_TDB', P))).toMatch(/row 5 .*from 1 ms/);
  });

  it('times outside BJD 0 … 1e7, absurd epochs and durations, and long cells are refused with a clipped value', () => {
    const bad = csv(rows(times)).replace('3040.1,0.5', '1e308,0.5');
    expect(problemsOf(() => parseTimingTable(bad, 't.csv', 'BJD_TDB', P))).toMatch(/row 5 \(line 6\), column 1 \(time\): got "1e308"; expected a BJD_TDB from 0 to 10000000 d/);
    const epochs = 'epoch,time,time_err [s]\n' + times.map((t, i) => `${i === 2 ? 1e12 : i},${t},20`).join('\n');
    expect(problemsOf(() => parseTimingTable(epochs, 't.csv', 'BJD_TDB', P))).toMatch(/row 3 .*\(epoch\).*from −10000000 to 10000000/);
    const dur = 'time,time_err [s],duration [d],duration_err [min]\n' + times.map((t, i) => `${t},20,${i === 1 ? 6 : 0.2},3`).join('\n');
    expect(problemsOf(() => parseTimingTable(dur, 't.csv', 'BJD_TDB', P))).toMatch(/row 2 .*\(duration\): got "6 d"; expected a positive duration shorter than half of planet\.period \(5 d\)/);
    const long = csv(rows(times)).replace('3040.1,0.5', `3040.1,${'9'.repeat(5000)}x`);
    const msg = problemsOf(() => parseTimingTable(long, 't.csv', 'BJD_TDB', P));
    expect(msg.length).toBeLessThan(300);
    expect(msg).toContain('…');
  });

  it('tables of 0, 1 or 2 rows, and more than the row or span limits, say the limit and why', () => {
    for (const k of [0, 1, 2]) {
      const msg = problemsOf(() => parseTimingTable(csv(rows(times.slice(0, k))), 't.csv', 'BJD_TDB', P));
      expect(msg).toMatch(new RegExp(`got "${k} data rows?"; at least 6 transits: the no-moon ephemeris has 2 parameters`));
    }
    const many = csv(Array.from({ length: 20001 }, (_, i) => `${3000.1 + 10 * i},0.5`).join('\n'));
    expect(problemsOf(() => parseTimingTable(many, 't.csv', 'BJD_TDB', P))).toMatch(/got "20001 data rows"; at most 20000 transits/);
    const wide = 'epoch,time,time_err [s]\n' + times.map((t, i) => `${i * 20000},${3000.1 + i * 20000 * 10},20`).join('\n');
    expect(problemsOf(() => parseTimingTable(wide, 't.csv', 'BJD_TDB', P))).toMatch(/epochs 0 to 100000 \(100000 orbits\).*at most 50000 orbits/);
  });

  it('an error column without a unit, an unknown column and too few rows are refused', () => {
    expect(problemsOf(() => parseTimingTable(`time,time_err\n${rows(times)}`, 't.csv', 'BJD_TDB', P))).toMatch(/line 1, column 2 \(time_err\).*give the unit/);
    expect(problemsOf(() => parseTimingTable(`time,time_err [s],colour\n${times.map((t) => `${t},5,red`).join('\n')}`, 't.csv', 'BJD_TDB', P))).toMatch(/column 3 \(colour\).*unknown column/);
    expect(problemsOf(() => parseTimingTable(csv(rows(times.slice(0, 4))), 't.csv', 'BJD_TDB', P))).toMatch(/got "4 data rows"; at least 6 transits/);
  });

  it('reads an ECSV table (space delimiter, units and time standard in the header)', () => {
    const ecsv = [
      '# %ECSV 1.0',
      '# ---',
      '# datatype:',
      '# - {name: epoch, datatype: int64}',
      '# - {name: tc, datatype: float64}',
      '# - {name: tc_err, unit: s, datatype: float64}',
      '# - {name: t14, unit: h, datatype: float64}',
      '# - {name: t14_err, unit: min, datatype: float64}',
      '# meta: !!omap',
      '# - {time_standard: BJD_TDB}',
      '# schema: astropy-2.0',
      'epoch tc tc_err t14 t14_err',
      ...times.map((t, i) => `${i} ${2457000 + t} 12 6.5 1.5`),
    ].join('\n');
    const t = parseTimingTable(ecsv, 't.ecsv', null, P);
    expect(t.timeStandard).toBe('BJD_TDB');
    expect(t.epochsInferred).toBe(false);
    expect(t.durationS![2]).toBeCloseTo(6.5 * 3600, 9); // hours to seconds
    expect(t.durationErrS![2]).toBeCloseTo(90, 12);
    expect(t.timeErrS[5]).toBe(12);
  });
});

describe('claim file with a table', () => {
  const claimYaml = (extra: string) => `
name: test claim
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5700 K, limb_darkening: {u1: 0.4, u2: 0.25}}
planet: {mass: 1 Mjup, radius: 1 Rjup, period: 10 d}
claim:
  table: times.csv
${extra}`;
  const readText = () => csv(rows(times));
  it('refuses a table whose claim states no time standard', () => {
    const msg = problemsOf(() => parseClaimText(claimYaml(''), 'c.yaml', { readText }));
    expect(msg).toMatch(/claim\.time_standard/);
    expect(msg).toMatch(/Eastman/);
  });
  it('refuses an unknown time standard with the line of the YAML key', () => {
    const msg = problemsOf(() => parseClaimText(claimYaml('  time_standard: HJD_UTC'), 'c.yaml', { readText }));
    expect(msg).toMatch(/claim\.time_standard \(line 7\)/);
  });
  it('accepts a stated standard and counts the transits from the rows', () => {
    const c = parseClaimText(claimYaml('  time_standard: BJD_TDB-2457000'), 'c.yaml', { readText });
    expect(c.transits).toBe(6);
    expect(c.table!.referenceBjdTdb).toBe(2460000.1);
  });
  it('needs amplitudes or a table, and the amplitude kind must be stated', () => {
    const base = `star: {mass: 1 Msun, radius: 1 Rsun, teff: 5700 K, limb_darkening: {u1: 0.4, u2: 0.25}}
planet: {mass: 1 Mjup, radius: 1 Rjup, period: 10 d}
claim:
  transits: 8
`;
    expect(problemsOf(() => parseClaimText(base, 'c.yaml'))).toMatch(/needs ttv and\/or tdv amplitudes/);
    expect(problemsOf(() => parseClaimText(base + '  ttv: {amplitude: 2 min, uncertainty: 0.2 min}\n', 'c.yaml'))).toMatch(/claim\.ttv\.kind.*"rms" or "semi-amplitude"/);
  });
});

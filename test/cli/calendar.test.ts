import { afterAll, describe, it, expect } from 'vitest';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli as run } from '../helpers/runCli.js';
import { parseSexagesimal, parseUtcDate } from '../../src/scenario/readSky.js';
import { parseScenarioText } from '../../src/scenario/loadScenario.js';
import * as lib from '../../src/index.js';

const demoPath = new URL('../../scenarios/demo-calendar.yaml', import.meta.url).pathname;
const demo = readFileSync(demoPath, 'utf8');
// A scenario without site, target and campaign (the observer demo has them since issue 18, item 7).
const noSkyDemo = new URL('../../scenarios/demo-survey.yaml', import.meta.url).pathname;
const dir = mkdtempSync(join(tmpdir(), 'moonsieve-calendar-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
function variant(name: string, from: string, to: string): string {
  expect(demo.includes(from), from).toBe(true);
  const p = join(dir, name);
  writeFileSync(p, demo.replace(from, to));
  return p;
}

describe('moonsieve calendar', () => {
  it('prints one line per transit and site and the counts per site and network', async () => {
    const r = await run(['calendar', demoPath]);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/Cerro Tavel: \d+ transits in the campaign, \d+ fully and \d+ partly observable/);
    expect(r.out).toMatch(/network \(any site\): \d+ transits in the campaign/);
    expect(r.out).toContain('What this leaves out:');
  });

  it('--json prints the schema and snake_case transit records', async () => {
    const r = await run(['calendar', demoPath, '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out) as { schema: string; transits: Array<Record<string, unknown>> };
    expect(j.schema).toBe('moonsieve/calendar/1');
    for (const key of ['epoch', 'transit_coverage', 'mid_time_bjd_tdb', 'mid_time_utc', 'observable_start_utc', 'observable_end_utc', 'baseline_before_coverage', 'airmass_middle', 'class', 'mid_time_sigma_s']) {
      expect(j.transits[0], key).toHaveProperty(key);
    }
    for (const t of j.transits) for (const k of Object.keys(t)) expect(k).toMatch(/^[a-z0-9_]+$/);
  });

  it('--out writes an ECSV table atomically; a bad extension is refused before any work', async () => {
    const out = join(dir, 'cal.ecsv');
    const r = await run(['calendar', demoPath, '--out', out]);
    expect(r.code).toBe(0);
    const text = readFileSync(out, 'utf8');
    expect(text.startsWith('# %ECSV 1.0')).toBe(true);
    expect(text).toContain('transit_coverage');
    const bad = await run(['calendar', demoPath, '--out', join(dir, 'cal.txt')]);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/--out.*\.ecsv or \.csv/);
    expect(existsSync(join(dir, 'cal.txt'))).toBe(false);
  });

  it('names the missing blocks when the scenario has no site, target or campaign', async () => {
    const r = await run(['calendar', noSkyDemo]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/site: got \(missing\); required by calendar/);
    expect(r.err).toMatch(/target: got \(missing\); required by calendar/);
    expect(r.err).toMatch(/campaign: got \(missing\); required by calendar/);
    expect(r.err).not.toMatch(/\n\s+at /); // no stack trace
  });

  it('exits 2 with the field and its line for a latitude outside ±90°, a malformed Dec or RA, a campaign that ends before it starts', async () => {
    const cases: Array<[string, string, string, RegExp]> = [
      ['lat.yaml', 'latitude: -30.17 deg', 'latitude: -95 deg', /site\.0\.latitude \(line 35, column \d+\): got "-95 deg"; expected a latitude from -90 to 90 deg/],
      ['dec.yaml', 'dec: "-12:33:10"', 'dec: "-12:73:10"', /target\.dec \(line 38, column \d+\): got "-12:73:10"; malformed sexagesimal angle/],
      ['ra.yaml', 'ra: "08:41:12.5"', 'ra: "25:41:12.5"', /target\.ra \(line 38, column \d+\): got "25:41:12.5"; expected a right ascension/],
      ['end.yaml', 'end: 2028-12-31', 'end: 2026-12-31', /campaign\.end \(line 39, column \d+\): got "2026-12-31"; the campaign must end after it starts/],
      ['date.yaml', 'start: 2027-01-01', 'start: 2027-02-30', /campaign\.start \(line 39, column \d+\): got "2027-02-30"; expected a UTC date/],
      ['airmass.yaml', 'airmass: 2.0', 'airmass: 0.5', /constraints\.airmass \(line 40, column \d+\): got 0\.5/],
    ];
    for (const [name, from, to, want] of cases) {
      const r = await run(['calendar', variant(name, from, to)]);
      expect(r.code, name).toBe(2);
      expect(r.err, name).toMatch(want);
    }
  });

  it('tells other commands that only the calendar reads the site, and keeps that note off the calendar', async () => {
    const s = parseScenarioText(demo);
    expect((s.cautions ?? []).map((c) => c.path)).toContain('site');
    const r = await run(['calendar', demoPath]);
    expect(r.err).not.toMatch(/calendar` only/);
  });

  it('refuses a campaign of more transits than a calendar lists, and cuts a baseline longer than half the period with a note', async () => {
    const many = await run(['calendar', variant('many.yaml', 'period: 13.8 d', 'period: 0.3 d')]);
    expect(many.code).toBe(0);
    const huge = await run(['calendar', variant('huge.yaml', 'end: 2028-12-31', 'end: 2099-12-31')]);
    expect(huge.code).toBe(0);
    const both = variant('both.yaml', 'period: 13.8 d', 'period: 1.2 d');
    writeFileSync(both, readFileSync(both, 'utf8').replace('end: 2028-12-31', 'end: 2099-12-31'));
    const r = await run(['calendar', both]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/campaign.*holds about \d+ transits.*at most 20000: shorten the campaign/);
    const long = await run(['calendar', variant('long.yaml', 'baseline: 2 h', 'baseline: 9 d'), '--json']);
    expect(long.code).toBe(0);
    expect((JSON.parse(long.out) as { notes: string[] }).notes.join('\n')).toMatch(/baseline of 9\.00 d is cut to 6\.\d+ d/);
  });

  it('requires a name for each site of a list', async () => {
    const r = await run(['calendar', variant('noname.yaml', '{name: Mount Orrin, ', '{')]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/site\.1\.name.*required in a list of sites/);
  });
});

describe('sky blocks of a scenario', () => {
  it('read sexagesimal and degree coordinates alike', () => {
    // 08:41:12.5 h = (8 + 41/60 + 12.5/3600) × 15° = 130.302083° (definition of hours of RA).
    expect((parseSexagesimal('08:41:12.5', 'hours')! * 180) / Math.PI).toBeCloseTo(130.302083, 5);
    expect((parseSexagesimal('8h41m12.5s', 'hours')! * 180) / Math.PI).toBeCloseTo(130.302083, 5);
    expect((parseSexagesimal('-12:33:10', 'degrees')! * 180) / Math.PI).toBeCloseTo(-12.552778, 5);
    expect((parseSexagesimal('-00 30 00', 'degrees')! * 180) / Math.PI).toBeCloseTo(-0.5, 9);
    expect(parseSexagesimal('-12:60:00', 'degrees')).toBeNull();
    expect(parseSexagesimal('130.3 deg', 'degrees')).toBeUndefined();
    const s = parseScenarioText(demo.replace('ra: "08:41:12.5"', 'ra: 130.302083').replace('dec: "-12:33:10"', 'dec: -12.552778 deg'));
    const t = parseScenarioText(demo);
    expect(s.sky!.target!.raRad).toBeCloseTo(t.sky!.target!.raRad, 7);
    expect(s.sky!.target!.decRad).toBeCloseTo(t.sky!.target!.decRad, 7);
  });

  it('reads dates as UTC, a bare end date through its 24:00', () => {
    const d = (iso: string) => (Date.parse(iso) - Date.UTC(2000, 0, 1, 12)) / 1e3;
    expect(parseUtcDate('2027-01-01', false)).toBe(d('2027-01-01T00:00:00Z'));
    expect(parseUtcDate('2028-12-31', true)).toBe(d('2029-01-01T00:00:00Z'));
    expect(parseUtcDate('2027-03-04T05:06:07Z', true)).toBe(d('2027-03-04T05:06:07Z'));
    expect(parseUtcDate('2027-03-04T05:06:07+02:00', true)).toBe(d('2027-03-04T03:06:07Z'));
    expect(parseUtcDate('2027-13-01', false)).toBeNull();
  });

  it('leave a scenario without them unchanged (no sky property) and apply the constraint defaults', () => {
    const plain = parseScenarioText(readFileSync(noSkyDemo, 'utf8'));
    expect(plain.sky).toBeUndefined();
    expect('sky' in plain).toBe(false);
    const withSite = parseScenarioText(demo.replace('constraints: {sun_altitude: -12 deg, airmass: 2.0, clear_fraction: 0.7}\n', ''));
    expect(withSite.sky!.constraints.airmass).toBe(2);
    expect(withSite.sky!.constraints.clearFraction).toBe(1);
    expect((withSite.sky!.constraints.sunAltitudeRad * 180) / Math.PI).toBeCloseTo(-12, 12);
  });

  it('transitCalendar is exported from the library', () => {
    expect(typeof lib.transitCalendar).toBe('function');
  });
});

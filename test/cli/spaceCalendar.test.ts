/**
 * `moonsieve calendar`, budget and sweep with a space instrument's visibility
 * pattern (issue 18, item 1): the calendar lists each transit's visible
 * fraction and class from the pattern, bad patterns exit 2 naming the field,
 * and a sweep gives the same cells whatever the worker count.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli as run } from '../helpers/runCli.js';

const demoPath = new URL('../../scenarios/demo-space.yaml', import.meta.url).pathname;
const demo = readFileSync(demoPath, 'utf8');
const dir = mkdtempSync(join(tmpdir(), 'moonsieve-space-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
function variant(name: string, from: RegExp | string, to: string): string {
  const text = demo.replace(from, to);
  expect(text).not.toBe(demo);
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
}
const PATTERN = /^visibility:\n(?: {2}.*\n)+/m;

describe('moonsieve calendar with a visibility pattern', () => {
  it('--json lists every transit with its visible fraction and class, no air mass, the pattern stated', async () => {
    const r = await run(['calendar', demoPath, '--json']);
    expect(r.code).toBe(0);
    const cal = JSON.parse(r.out);
    expect(cal.schema).toBe('moonsieve/calendar/1');
    expect(cal.transits.length).toBe(39); // 2027-03-01 to 2028-02-29 holds 39 transits of 9.4 d (counting, no source)
    expect(cal.constraints).toBeNull();
    expect(cal.target).toBeNull();
    expect(cal.visibility).toMatchObject({ name: 'Kestrel-LEO', on_s: 3300, off_s: 2400, start_bjd_tdb: 2461400.5, block_s: 27 * 86400, gap_s: 55 * 86400 });
    const classes = new Set(cal.transits.map((t: { class: string }) => t.class));
    expect(classes.has('none')).toBe(true); // outside the blocks
    for (const t of cal.transits) {
      expect(t.site).toBe('Kestrel-LEO');
      expect(t.airmass_start).toBeNull();
      expect(t.transit_coverage).toBeGreaterThanOrEqual(0);
      // Inside a block, a 55-of-95-min pattern sees 55/95 of a long transit on average, never all of a 3.5-h one.
      expect(t.transit_coverage).toBeLessThan(1);
    }
    expect(cal.assumptions.join(' ')).toMatch(/South Atlantic Anomaly/);
  });

  it('the screen table states the pattern; --out writes an ECSV with empty air masses', async () => {
    const out = join(dir, 'space.ecsv');
    const r = await run(['calendar', demoPath, '--out', out]);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/Kestrel-LEO visible 55\.0 min of every 95\.0 min, in blocks of 27\.0 d every 82\.0 d/);
    expect(r.out).toMatch(/Kestrel-LEO: 39 transits in the campaign/);
    const ecsv = readFileSync(out, 'utf8');
    expect(ecsv).toContain('# %ECSV');
    expect(ecsv).toContain('visibility');
  });

  it.each([
    ['on ≤ 0', 'visibility.on', PATTERN, 'visibility: {on: 0 min, off: 40 min}\n'],
    ['off < 0', 'visibility.off', PATTERN, 'visibility: {on: 55 min, off: -5 min}\n'],
    ['an unknown key', 'visibility.period', PATTERN, 'visibility: {on: 55 min, period: 95 min}\n'],
    ['a site as well', 'site', PATTERN, 'visibility: {on: 55 min}\nsite: {latitude: -30 deg, longitude: -70 deg}\n'],
    ['a ground budget as well', 'instrument.ground', 'noise: 400 ppm per 1 h', 'ground: {aperture: 1 m, magnitude: 11}'],
  ])('%s: exit 2, one line naming %s, nothing on stdout', async (_what, field, from, to) => {
    const r = await run(['calendar', variant(`bad-${field}.yaml`, from, to)]);
    expect(r.code).toBe(2);
    expect(r.out).toBe('');
    // One problem: "moonsieve: FILE: FIELD (line L, column C): got …; allowed" on one line.
    expect(r.err.trim().split('\n').length).toBe(1);
    expect(r.err).toMatch(new RegExp(`: ${field.replace('.', '\\.')} (\\(line|got)`));
    expect(r.err).not.toMatch(/at .*\.ts:\d+/); // no stack trace
  });

  it('without a campaign the calendar names the missing block', async () => {
    const r = await run(['calendar', variant('nocampaign.yaml', /^campaign: .*\n/m, '')]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/campaign/);
  });
});

describe('budget and sweep with a visibility pattern', () => {
  it('the budget books visits, with the pattern\'s hours and no weather', async () => {
    const r = await run(['budget', demoPath, '--forecast-only', '--json', '--quiet']);
    expect(r.code).toBe(0);
    const b = JSON.parse(r.out);
    const text = JSON.stringify(b);
    expect(text).toMatch(/visits/);
    expect(text).toMatch(/no weather/);
  });

  it('a sweep gives identical cells with 1 and 2 workers (seeded per cell and realization)', async () => {
    const sweepText = `${demo}\nsweep:\n  realizations: 3\n  axes:\n    - {field: moon.mass, from: 0.3 Mearth, to: 3 Mearth, count: 2, spacing: log}\n`;
    const p = join(dir, 'sweep.yaml');
    writeFileSync(p, sweepText);
    const a = await run(['sweep', p, '--out', join(dir, 'w1'), '--workers', '1', '--quiet']);
    const b = await run(['sweep', p, '--out', join(dir, 'w2'), '--workers', '2', '--quiet']);
    expect(a.code, a.err).toBe(0);
    expect(b.code, b.err).toBe(0);
    const cells = (d: string) => JSON.parse(readFileSync(join(dir, d, 'cells.json'), 'utf8')).cells;
    expect(cells('w2')).toEqual(cells('w1'));
    expect(cells('w1').length).toBe(2);
  }, 240_000);
});

/**
 * A space instrument's periodic visibility (issue 18, item 1): the visible
 * stretches of a window, and the calendar built from them instead of the sky.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseScenarioText } from '../../src/scenario/loadScenario.js';
import { InputError } from '../../src/scenario/errors.js';
import { transitCalendar } from '../../src/sky/calendar.js';
import { visibleFraction, visibleStretches } from '../../src/sky/visibilityPattern.js';
import { scenarioDurations } from '../../src/physics/transitDuration.js';
import type { VisibilitySpec } from '../../src/scenario/types.js';

const DAY = 86400;
const demo = readFileSync(new URL('../../scenarios/demo-space.yaml', import.meta.url), 'utf8');
/** The demo system without its visibility and campaign blocks. */
const SYSTEM = demo.slice(0, demo.indexOf('\n# The pattern is'));
const space = (visibility: string, campaign = '{start: 2027-03-01, end: 2028-02-29}') =>
  parseScenarioText(`${SYSTEM}\nvisibility: ${visibility}\ncampaign: ${campaign}\n`, 'test');

function problemsOf(text: string): Array<{ path: string; allowed: string }> {
  try {
    parseScenarioText(text, 'test');
  } catch (e) {
    if (e instanceof InputError) return e.problems;
    throw e;
  }
  return [];
}

describe('visibleStretches', () => {
  const v: VisibilitySpec = { name: 'x', onS: 55 * 60, offS: 40 * 60, referenceBjdTdb: 2461000.5, blockS: null, gapS: 0 };
  it('places the visible parts at k(on + off) … k(on + off) + on from the reference, cut to the window', () => {
    // Origin 1 cycle + 10 min after the reference: the window [0, 3 h] from there (common practice, no source: the stated schedule).
    const origin = 2461000.5 + (95 * 60 + 600) / DAY;
    const iv = visibleStretches(v, origin, 0, 3 * 3600);
    // From the reference the window is [105, 285] min; the cycles are visible over [95, 150], [190, 245], [285, 340] min.
    const expected = [[0, 45 * 60], [85 * 60, 140 * 60]];
    expect(iv.length).toBe(2);
    iv.forEach(([a, b], i) => {
      expect(a).toBeCloseTo(expected[i][0], 3); // BJD differences round to ~1e-5 s
      expect(b).toBeCloseTo(expected[i][1], 3);
    });
  });
  it('is the whole window when off is 0, and the intersection with the blocks when blocks are given', () => {
    expect(visibleStretches({ ...v, offS: 0 }, 2461003.2, -5000, 7000)).toEqual([[-5000, 7000]]);
    // Blocks of 1 d every 3 d from the reference; the window [0.5 d, 1.5 d] after it keeps only [0.5 d, 1 d].
    const b = visibleStretches({ ...v, offS: 0, blockS: DAY, gapS: 2 * DAY }, 2461000.5, 0.5 * DAY, 1.5 * DAY);
    expect(b.length).toBe(1);
    expect(b[0][0]).toBeCloseTo(0.5 * DAY, 3);
    expect(b[0][1]).toBeCloseTo(DAY, 3);
    expect(visibleFraction({ ...v, offS: 0, blockS: DAY, gapS: 2 * DAY })).toBeCloseTo(1 / 3, 12);
  });
});

describe('the calendar of a space instrument', () => {
  it('on half the time, with a cycle incommensurate with the period: the transit coverage averages 0.5 over many transits', () => {
    // 47.3 min visible, 47.3 min hidden; the 9.4-d period is 143.09 cycles, so the phase at each
    // transit is equidistributed (Weyl 1916, Math. Ann. 77, 313) and the expected coverage is the
    // pattern's visible fraction, 0.5, whatever the transit's length.
    const s = space('{on: 47.3 min, off: 47.3 min, start: 2461400.5}', '{start: 2027-01-01, end: 2046-12-31}');
    const cal = transitCalendar(s);
    expect(cal.transits.length).toBeGreaterThan(700);
    const mean = cal.transits.reduce((a, r) => a + r.transit_coverage, 0) / cal.transits.length;
    expect(Math.abs(mean - 0.5)).toBeLessThan(0.01); // ~780 transits, each 0.5 ± 0.06 (2.2 cycles per transit)
    for (const r of cal.transits) {
      expect(r.airmass_start).toBeNull();
      expect(r.airmass_middle).toBeNull();
      expect(r.airmass_end).toBeNull();
      expect(r.site).toBe('space'); // the default name
    }
    expect(cal.constraints).toBeNull();
    expect(cal.visibility?.visible_fraction).toBeCloseTo(0.5, 12);
  });

  it('always on: every transit whole, baselines too (coverage 1)', () => {
    const cal = transitCalendar(space('{on: 95 min, off: 0 min}'));
    expect(cal.transits.length).toBe(39); // 365 d / 9.4 d (common practice, no source: a count)
    for (const r of cal.transits) {
      expect(r.class).toBe('full');
      expect(r.transit_coverage).toBe(1);
      expect(r.baseline_before_coverage).toBeCloseTo(1, 9);
      expect(r.baseline_after_coverage).toBeCloseTo(1, 9);
    }
    expect(cal.sites[0].counts.full).toBe(39);
  });

  it('observing blocks shorter than the campaign: transits outside the blocks are lost, those inside kept whole', () => {
    const ref = 2461400.5;
    const s = space(`{on: 95 min, off: 0 min, start: ${ref}, block: 27 d, gap: 55 d}`);
    const cal = transitCalendar(s);
    const half = scenarioDurations(s).t14S / 2 / DAY;
    let inside = 0;
    let outside = 0;
    for (const r of cal.transits) {
      // Independent check on the BJD_TDB axis: where first and last contact fall in the 82-day block cycle.
      const phase = (t: number) => (((t - ref) % 82) + 82) % 82;
      const a = phase(r.mid_time_bjd_tdb - half);
      const b = phase(r.mid_time_bjd_tdb + half);
      if (a < 27 && b < 27 && b > a) {
        inside++;
        expect(r.class).toBe('full');
      } else if (a >= 27 && b >= 27 && b > a) {
        outside++;
        expect(r.class).toBe('none');
        expect(r.transit_coverage).toBe(0);
      }
    }
    expect(inside).toBeGreaterThan(5);
    expect(outside).toBeGreaterThan(15);
    expect(cal.sites[0].counts.none).toBeGreaterThanOrEqual(outside);
  });

  it('a target, when given, only moves the UTC times (the pattern is on BJD_TDB)', () => {
    const without = transitCalendar(space('{on: 55 min, off: 40 min, start: 2461400.5}'));
    const withTarget = transitCalendar(parseScenarioText(`${SYSTEM}\nvisibility: {on: 55 min, off: 40 min, start: 2461400.5}\ntarget: {ra: 120 deg, dec: 10 deg}\ncampaign: {start: 2027-03-01, end: 2028-02-29}\n`, 'test'));
    expect(withTarget.transits.map((r) => r.transit_coverage)).toEqual(without.transits.map((r) => r.transit_coverage));
    const dt = withTarget.transits.map((r, i) => Math.abs(Date.parse(r.mid_time_utc) - Date.parse(without.transits[i].mid_time_utc)) / 1000);
    expect(Math.max(...dt)).toBeLessThan(8.4 * 60); // the light time to the barycentre, ≤ 499 s (1 au / c; IAU 2012 B2)
    expect(Math.max(...dt)).toBeGreaterThan(60);
  });
});

describe('bad visibility input', () => {
  const base = (block: string, extra = '') => `${SYSTEM}\nvisibility: ${block}\ncampaign: {start: 2027-03-01, end: 2028-02-29}\n${extra}`;
  it.each([
    ['on ≤ 0', 'visibility.on', base('{on: 0 min, off: 40 min}')],
    ['on missing', 'visibility.on', base('{off: 40 min}')],
    ['off < 0', 'visibility.off', base('{on: 55 min, off: -1 min}')],
    ['unknown key', 'visibility.of', base('{on: 55 min, of: 40 min}')],
    ['gap without block', 'visibility.gap', base('{on: 55 min, gap: 3 d}')],
    ['block without gap', 'visibility.gap', base('{on: 55 min, block: 3 d}')],
    ['a cycle shorter than a minute', 'visibility.off', base('{on: 20 s, off: 20 s}')],
    ['malformed start', 'visibility.start', base('{on: 55 min, start: soon}')],
    ['with a site', 'site', base('{on: 55 min}', 'site: {latitude: -30 deg, longitude: -70 deg}\n')],
    ['with constraints', 'constraints', base('{on: 55 min}', 'constraints: {airmass: 2}\n')],
  ])('%s: one problem naming %s', (_what, path, text) => {
    const p = problemsOf(text);
    expect(p.map((x) => x.path)).toContain(path);
  });
  it('a site with visibility says which one to drop', () => {
    const p = problemsOf(base('{on: 55 min}', 'site: {latitude: -30 deg, longitude: -70 deg}\n')).find((x) => x.path === 'site')!;
    expect(p.allowed).toMatch(/drop `site`.*or drop `visibility`/);
  });
});

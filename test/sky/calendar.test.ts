/**
 * The calendar against an independent brute-force computation: every minute
 * of each transit, the Sun and target altitudes from the point functions
 * (astronomy-engine Equator/Horizon at each instant, checked against astropy
 * in astropy.test.ts) and the air mass limit applied sample by sample.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseScenarioText } from '../../src/scenario/loadScenario.js';
import { transitCalendar } from '../../src/sky/calendar.js';
import { sunAltitudeDeg, targetAltitudeDeg } from '../../src/sky/skyPosition.js';
import { airmassKastenYoung } from '../../src/sky/airmass.js';
import { bjdTdbToUtc } from '../../src/sky/barycentric.js';
import { utcSFromDate } from '../../src/sky/timeScales.js';

const demoText = readFileSync(new URL('../../scenarios/demo-calendar.yaml', import.meta.url), 'utf8');
/** The demo system with one site, or other sky blocks in place of the demo's. */
function scenarioWith(sky: string): string {
  const cut = demoText.indexOf('\nsite:');
  return demoText.slice(0, cut) + '\n' + sky + '\n';
}
const ONE_SITE = `site: {name: Cerro Tavel, latitude: -30.17 deg, longitude: -70.80 deg, altitude: 2400 m}
target: {ra: "08:41:12.5", dec: "-12:33:10"}
campaign: {start: 2027-01-01, end: 2028-12-31}
constraints: {sun_altitude: -12 deg, airmass: 2.0}`;

describe('transitCalendar', () => {
  it('matches a brute-force 1-minute computation over a two-year campaign (coverage within 0.03, same count of full transits)', () => {
    const s = parseScenarioText(scenarioWith(ONE_SITE), 'one site');
    const cal = transitCalendar(s);
    const site = s.sky!.sites[0];
    const target = s.sky!.target!;
    const t14 = cal.transit_duration_s;
    expect(cal.transits.length).toBeGreaterThan(50); // 2 years / 13.8 d ≈ 53
    let bruteFull = 0;
    let worst = 0;
    for (const row of cal.transits) {
      const mid = bjdTdbToUtc(row.mid_time_bjd_tdb, target, site);
      const t1 = mid - t14 / 2;
      const ok = (t: number) => sunAltitudeDeg(t, site) < -12 && airmassKastenYoung(targetAltitudeDeg(t, site, target)) <= 2 && targetAltitudeDeg(t, site, target) > 0;
      const n = Math.ceil(t14 / 60);
      let seen = 0;
      let all = ok(t1) && ok(t1 + t14);
      for (let k = 0; k < n; k++) {
        const good = ok(t1 + ((k + 0.5) * t14) / n);
        if (good) seen++;
        else all = false;
      }
      if (all) bruteFull++;
      const d = Math.abs(seen / n - row.transit_coverage);
      worst = Math.max(worst, d);
      expect(d, `epoch ${row.epoch}`).toBeLessThan(0.03); // independent 1-minute computation (issue 18)
    }
    const full = cal.transits.filter((r) => r.class === 'full').length;
    expect(full).toBe(bruteFull);
    expect(cal.sites[0].counts.full).toBe(full);
    console.info(`calendar vs brute force: ${cal.transits.length} transits, ${full} full; worst coverage difference ${worst.toFixed(4)}`);
  });

  it('keeps the counts consistent and the classes in step with the coverage', () => {
    const cal = transitCalendar(parseScenarioText(scenarioWith(ONE_SITE), 'one site'));
    const c = cal.sites[0].counts;
    expect(c.full + c.partial + c.none).toBe(c.transits);
    for (const r of cal.transits) {
      expect(r.transit_coverage).toBeGreaterThanOrEqual(0);
      expect(r.transit_coverage).toBeLessThanOrEqual(1);
      expect(r.class === 'full').toBe(r.transit_coverage === 1);
      expect(r.class === 'none').toBe(r.transit_coverage === 0);
      if (r.observable_start_utc) {
        expect(r.airmass_middle!).toBeLessThanOrEqual(2 + 1e-6);
        expect(r.airmass_start!).toBeLessThanOrEqual(2 + 1e-3);
      }
      // Epoch numbers are the ephemeris's: t0 + nP (demo: t0 2461412.3317, P 13.8 d).
      expect(r.mid_time_bjd_tdb).toBeCloseTo(2461412.3317 + r.epoch * 13.8, 8);
    }
  });

  it('widens the mid-time uncertainty with the epoch: σ² = σ_t0² + n²σ_P²', () => {
    const cal = transitCalendar(parseScenarioText(scenarioWith(ONE_SITE), 'one site'));
    for (const r of cal.transits) {
      // Propagation of independent errors of t0 (1.5 min) and P (0.00004 d) (common practice, no source).
      expect(r.mid_time_sigma_s).toBeCloseTo(Math.sqrt(90 ** 2 + (r.epoch * 0.00004 * 86400) ** 2), 6);
      const bookSpan = (Date.parse(r.book_end_utc) - Date.parse(r.book_start_utc)) / 1e3;
      expect(bookSpan).toBeCloseTo(cal.transit_duration_s + 2 * cal.baseline_s + 6 * r.mid_time_sigma_s, -1);
    }
  });

  it('gives an empty calendar and a clear statement for a target that never rises above the air-mass limit', () => {
    const s = parseScenarioText(scenarioWith(ONE_SITE.replace('dec: "-12:33:10"', 'dec: "+62:00:00"')), 'north target');
    const cal = transitCalendar(s);
    expect(cal.transits.length).toBeGreaterThan(50);
    expect(cal.transits.every((r) => r.class === 'none' && r.observable_start_utc === null)).toBe(true);
    expect(cal.sites[0].counts.full + cal.sites[0].counts.partial).toBe(0);
    // Highest altitude 90° − |φ − δ| = 90 − 92.17 < 0: never rises (spherical astronomy, e.g. Smart 1977).
    expect(cal.notes.join('\n')).toMatch(/Cerro Tavel: the target never reaches air mass 2 .*never rises/);
  });

  it('a network of two sites at different longitudes sees at least as many transits as either alone', () => {
    const net = transitCalendar(parseScenarioText(demoText, 'demo'));
    expect(net.sites.length).toBe(2);
    for (const s of net.sites) {
      expect(net.network_counts.full).toBeGreaterThanOrEqual(s.counts.full);
      expect(net.network_counts.full + net.network_counts.partial).toBeGreaterThanOrEqual(s.counts.full + s.counts.partial);
    }
    expect(net.network.length).toBe(net.network_counts.transits);
    // Union of the sites: each epoch's network coverage at least each site's.
    for (const e of net.network) {
      for (const r of net.transits.filter((t) => t.epoch === e.epoch)) expect(e.transit_coverage).toBeGreaterThanOrEqual(r.transit_coverage - 1e-12);
    }
  });

  it('measures ten years of transits for three sites (performance goal 100 ms; measured, not asserted)', () => {
    const sky = `site:
  - {name: A, latitude: -30.17, longitude: -70.80, altitude: 2400}
  - {name: B, latitude: 28.76, longitude: -17.88, altitude: 2300}
  - {name: C, latitude: -31.27, longitude: 149.06, altitude: 1150}
target: {ra: 130.3, dec: -12.55}
campaign: {start: 2027-01-01, end: 2036-12-31}`;
    const s = parseScenarioText(scenarioWith(sky), 'ten years');
    transitCalendar(s); // warm-up
    const t0 = performance.now();
    const cal = transitCalendar(s);
    const ms = performance.now() - t0;
    expect(cal.network_counts.transits).toBeGreaterThan(260);
    console.info(`calendar: ${cal.network_counts.transits} transits × 3 sites in ${ms.toFixed(1)} ms`);
  });

  it('reports transits whose mid-time lies inside the campaign only', () => {
    const cal = transitCalendar(parseScenarioText(scenarioWith(ONE_SITE), 'one site'));
    const start = utcSFromDate(new Date('2027-01-01T00:00:00Z'));
    const end = utcSFromDate(new Date('2029-01-01T00:00:00Z'));
    for (const r of cal.transits) {
      const t = utcSFromDate(new Date(r.mid_time_utc));
      expect(t).toBeGreaterThanOrEqual(start - 1);
      expect(t).toBeLessThanOrEqual(end + 1);
    }
  });
});

/**
 * The sky stage against astropy 5.2.1: values computed once by
 * test/fixtures/sky_astropy.py (committed with its output, sky_astropy.json).
 * Tolerances from issue 18: 1 arcmin for altitudes, 1 min for twilight,
 * 1 s for BJD_TDB ↔ UTC.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { sunAltitudeDeg, targetAltitudeDeg, EpochSky } from '../../src/sky/skyPosition.js';
import { airmassKastenYoung } from '../../src/sky/airmass.js';
import { bjdTdbToUtc, utcToBjdTdb } from '../../src/sky/barycentric.js';
import { sunCrossings } from '../../src/sky/twilight.js';
import { ttMinusUtcS, utcSFromDate } from '../../src/sky/timeScales.js';

interface Fixture {
  sites: Array<{ name: string; lat: number; lon: number; height: number }>;
  targets: Array<{ name: string; ra: number; dec: number }>;
  altitudes: Array<{ site: string; utc: string; sun_alt_deg: number; targets: Record<string, number> }>;
  twilight: Array<{ site: string; from_utc: string; limit_deg: number; setting: boolean; utc: string }>;
  bjd: Array<{ site: string; target: string; utc: string; bjd_tdb_jd1: number; bjd_tdb_jd2: number; light_travel_s: number; tdb_minus_utc_s: number }>;
}
const fx = JSON.parse(readFileSync(new URL('../fixtures/sky_astropy.json', import.meta.url), 'utf8')) as Fixture;
const D = Math.PI / 180;
const site = (name: string) => {
  const s = fx.sites.find((x) => x.name === name)!;
  return { latitudeRad: s.lat * D, longitudeRad: s.lon * D, altitudeM: s.height };
};
const target = (name: string) => {
  const t = fx.targets.find((x) => x.name === name)!;
  return { raRad: t.ra * D, decRad: t.dec * D };
};
const utc = (iso: string) => utcSFromDate(new Date(iso));
const ARCMIN = 1 / 60;

describe('sky positions against astropy (test/fixtures/sky_astropy.py)', () => {
  it('Sun and target altitudes within 1 arcmin, point functions and the per-window evaluator alike', () => {
    let worst = 0;
    for (const row of fx.altitudes) {
      const s = site(row.site);
      const t = utc(row.utc);
      const sun = sunAltitudeDeg(t, s);
      expect(Math.abs(sun - row.sun_alt_deg), `${row.site} ${row.utc} Sun`).toBeLessThan(ARCMIN); // astropy get_sun → AltAz
      worst = Math.max(worst, Math.abs(sun - row.sun_alt_deg));
      for (const [name, alt] of Object.entries(row.targets)) {
        const sky = new EpochSky(t - 6 * 3600, t + 9 * 3600, target(name));
        const a = targetAltitudeDeg(t, s, target(name));
        expect(Math.abs(a - alt), `${row.site} ${row.utc} target ${name}`).toBeLessThan(ARCMIN); // astropy ICRS → AltAz
        expect(Math.abs(sky.targetAltitude(t, s) / D - alt), `${row.site} ${row.utc} target ${name}, window`).toBeLessThan(ARCMIN);
        worst = Math.max(worst, Math.abs(a - alt), Math.abs(sky.targetAltitude(t, s) / D - alt));
      }
      const sky = new EpochSky(t - 6 * 3600, t + 9 * 3600, target('a'));
      expect(Math.abs(sky.sunAltitude(t, s) / D - row.sun_alt_deg), `${row.site} ${row.utc} Sun, window`).toBeLessThan(ARCMIN);
      worst = Math.max(worst, Math.abs(sky.sunAltitude(t, s) / D - row.sun_alt_deg));
    }
    console.info(`altitudes: worst difference from astropy ${(worst * 3600).toFixed(1)} arcsec`);
  });

  it('Sun crossings of −12° and 0° within 1 min', () => {
    let worst = 0;
    const starts = [...new Set(fx.twilight.map((t) => `${t.site}|${t.from_utc}|${t.limit_deg}`))];
    for (const key of starts) {
      const [name, from, limit] = key.split('|');
      const want = fx.twilight.filter((t) => t.site === name && t.from_utc === from && t.limit_deg === Number(limit));
      const got = sunCrossings(site(name), utc(from), utc(from) + 36 * 3600, Number(limit));
      expect(got.length, key).toBe(want.length); // astropy scan, same 36 h span
      for (let i = 0; i < want.length; i++) {
        expect(got[i].setting).toBe(want[i].setting);
        const d = Math.abs(got[i].utcS - utc(want[i].utc));
        expect(d, `${key} #${i}`).toBeLessThan(60); // astropy get_sun crossings
        worst = Math.max(worst, d);
      }
    }
    console.info(`twilight: worst difference from astropy ${worst.toFixed(2)} s`);
  });

  it('BJD_TDB of UTC and UTC of BJD_TDB within 1 s (Rømer delay and TDB − UTC)', () => {
    let worst = 0;
    for (const row of fx.bjd) {
      const s = site(row.site);
      const g = target(row.target);
      const t = utc(row.utc);
      // Compare in seconds from the whole day (jd1) to keep double precision.
      const got = utcToBjdTdb(t, g, s);
      const d1 = Math.abs((got - row.bjd_tdb_jd1 - row.bjd_tdb_jd2) * 86400);
      expect(d1, `${row.site} ${row.target} ${row.utc}`).toBeLessThan(1); // astropy tdb + light_travel_time
      const back = bjdTdbToUtc(row.bjd_tdb_jd1 + row.bjd_tdb_jd2, g, s);
      const d2 = Math.abs(back - t);
      expect(d2, `${row.site} ${row.target} ${row.utc} inverse`).toBeLessThan(1);
      expect(Math.abs(ttMinusUtcS(t) - row.tdb_minus_utc_s)).toBeLessThan(0.01); // astropy TDB − UTC (TDB − TT < 2 ms)
      worst = Math.max(worst, d1, d2);
    }
    console.info(`BJD_TDB ↔ UTC: worst difference from astropy ${(worst * 1e3).toFixed(1)} ms`);
  });
});

describe('air mass (Kasten & Young 1989)', () => {
  it('is 1 at the zenith, near sec z at moderate altitudes and ≈ 38 at the horizon', () => {
    // Kasten & Young (1989, Applied Optics 28, 4735), their table and fit: X(90°) = 1, X(30°) ≈ 1.995, X(0°) ≈ 38.1 (from memory; sec z gives 2 at 30°).
    expect(airmassKastenYoung(90)).toBeCloseTo(1.0, 3);
    expect(airmassKastenYoung(30)).toBeCloseTo(1.9954, 2);
    expect(airmassKastenYoung(0)).toBeGreaterThan(37);
    expect(airmassKastenYoung(0)).toBeLessThan(39);
  });
});

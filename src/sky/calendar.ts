/**
 * The calendar of a campaign: every transit of the barycentre ephemeris
 * (t0 + nP, BJD_TDB) whose mid-time falls inside the campaign, and for each
 * site which part of it and of its baselines can be observed. Observable
 * means the Sun's centre below `constraints.sun_altitude` and the target's
 * air mass (Kasten & Young 1989) at most `constraints.airmass`, both from
 * geometric altitudes. The sky is sampled on a grid of at most 60 s across
 * each transit's window (first contact − baseline to last contact +
 * baseline) and each change of state placed by linear interpolation of the
 * altitude that crossed its limit between two samples.
 *
 * Pure: a function of the Scenario alone, no files.
 */
import { DAY_S } from '../physics/constants.js';
import { scenarioDurations } from '../physics/transitDuration.js';
import { InputError } from '../scenario/errors.js';
import type { Scenario, SiteSpec, TargetSpec, VisibilitySpec } from '../scenario/types.js';
import { visibleFraction, visibleStretches } from './visibilityPattern.js';
import { requireCalendarBlocks } from '../scenario/requireSky.js';
import { airmassKastenYoung, altitudeForAirmass } from './airmass.js';
import { bjdTdbToUtc } from './barycentric.js';
import { EpochSky } from './skyPosition.js';
import { isoUtc, JD_J2000, ttMinusUtcS } from './timeScales.js';
import { C_LIGHT } from '../physics/constants.js';
import { intervalUnion, type Interval } from '../numeric/intervals.js';

const DEG = Math.PI / 180;
/** Largest spacing of the sky samples across a window, s (issue 18: ≤ 1 min). */
export const CALENDAR_STEP_S = 60;
/** A transit counts as full when at least this fraction of first-to-last contact is observable (rounding only). */
const FULL = 1 - 1e-6;
/** Mean radius of the Earth, m (IUGG; Moritz 2000, Geodetic Reference System 1980), for the site's ≤ 21 ms light-time term. */
const R_EARTH_MEAN_M = 6_371_000;
/** Half-width of the booking window beyond the nominal one, in σ of the predicted mid-time (common practice, no source). */
export const BOOKING_SIGMAS = 3;
/** Most transits one calendar lists (about 500 years of a 10-day planet; bounds the work). */
export const MAX_CALENDAR_TRANSITS = 20_000;

const formatDays = (d: number) => (d >= 100 ? d.toFixed(0) : d.toPrecision(3));

export type TransitClass = 'full' | 'ingress_only' | 'egress_only' | 'ingress_and_egress' | 'middle_only' | 'none';

/** One transit at one site (JSON keys: the calendar's output vocabulary). */
export interface CalendarTransit extends TransitCoverage {
  site: string;
  epoch: number;
  mid_time_bjd_tdb: number;
  mid_time_utc: string;
  /** 1σ uncertainty of the predicted mid-time, s: √(σ_t0² + n²σ_P²). */
  mid_time_sigma_s: number;
  transit_start_utc: string;
  transit_end_utc: string;
  /** The window to book: first contact − baseline − 3σ to last contact + baseline + 3σ. */
  book_start_utc: string;
  book_end_utc: string;
  /** The observable stretch that holds most of the transit (or, when none does, the longest in the window). */
  observable_start_utc: string | null;
  observable_end_utc: string | null;
  /** Observable time inside the window (transit and baselines), s. */
  observable_duration_s: number;
  /** Every observable stretch inside the window, [start, end] UTC. */
  observable_intervals_utc: Array<[string, string]>;
}

/** How much of one transit a site sees: the calendar's entry, and the budget's bookings (BookingCoverage). */
export interface TransitCoverage {
  /** Observable fraction of first-to-last contact, 0–1. */
  transit_coverage: number;
  /** Observable fractions of the baselines before first and after last contact (null with no baseline). */
  baseline_before_coverage: number | null;
  baseline_after_coverage: number | null;
  /** Air mass at the start, middle and end of the observable stretch (null when nothing is observable). */
  airmass_start: number | null;
  airmass_middle: number | null;
  airmass_end: number | null;
  class: TransitClass;
}

/** One transit seen by the whole network (the union of the sites' observable stretches). */
export interface NetworkTransit {
  epoch: number;
  mid_time_bjd_tdb: number;
  mid_time_utc: string;
  transit_coverage: number;
  class: TransitClass;
  /** Sites that see the whole transit. */
  full_sites: string[];
  /** Chance that at least one site with the whole transit has a clear night (independent nights, clear_fraction each). */
  full_probability: number;
}

export interface CalendarCounts {
  transits: number;
  full: number;
  partial: number;
  none: number;
  /** Expected number of whole transits after weather (clear_fraction per night and site). */
  expected_full: number;
}

export interface CalendarResult {
  schema: 'moonsieve/calendar/1';
  scenario: string;
  transit_duration_s: number;
  ingress_duration_s: number;
  baseline_s: number;
  campaign: { start_utc: string; end_utc: string };
  /** The ground limits; null for a space instrument (its visibility pattern instead). */
  constraints: { sun_altitude_deg: number; airmass: number; min_target_altitude_deg: number; clear_fraction: number } | null;
  /** The ground sites; for a space instrument one entry, its name, with null position. */
  sites: Array<{ name: string; latitude_deg: number | null; longitude_deg: number | null; altitude_m: number | null; counts: CalendarCounts }>;
  /** The target's position; null when a space scenario gives none. */
  target: { ra_deg: number; dec_deg: number } | null;
  /** A space instrument's visibility pattern; null for ground sites. */
  visibility: CalendarVisibility | null;
  /** Counts over the whole network (only with more than one site; else equal to the one site's). */
  network_counts: CalendarCounts;
  notes: string[];
  assumptions: string[];
  transits: CalendarTransit[];
  /** One entry per epoch when there is more than one site, else empty. */
  network: NetworkTransit[];
}

/** A space instrument's visibility pattern as the calendar states it. */
export interface CalendarVisibility {
  name: string;
  on_s: number;
  off_s: number;
  start_bjd_tdb: number;
  block_s: number | null;
  gap_s: number;
  /** Long-run visible fraction of the pattern. */
  visible_fraction: number;
}


/** Length of the overlap of the intervals with [a, b]. */
function overlap(iv: readonly Interval[], a: number, b: number): number {
  let s = 0;
  for (const [x, y] of iv) s += Math.max(0, Math.min(y, b) - Math.max(x, a));
  return s;
}

/** Whether one interval contains all of [a, b]. */
function within(iv: readonly Interval[], a: number, b: number): boolean {
  return iv.some(([x, y]) => x <= a && y >= b);
}


/**
 * Class of a transit from its observable stretches: full (all of first to last
 * contact), else which contacts are observed: ingress_only (first contact
 * inside an observable stretch, last not), egress_only, ingress_and_egress
 * (both, with a gap between: a transit across two nights or sites),
 * middle_only (neither), none.
 */
export function classify(iv: readonly Interval[], t1: number, t4: number): { coverage: number; cls: TransitClass } {
  const coverage = t4 > t1 ? overlap(iv, t1, t4) / (t4 - t1) : 0;
  if (coverage >= FULL) return { coverage: 1, cls: 'full' };
  if (coverage <= 0) return { coverage: 0, cls: 'none' };
  const ing = within(iv, t1, t1);
  const egr = within(iv, t4, t4);
  return { coverage, cls: ing && egr ? 'ingress_and_egress' : ing ? 'ingress_only' : egr ? 'egress_only' : 'middle_only' };
}

/**
 * Observable stretches at a site over [a, b] on a grid of ≤ `CALENDAR_STEP_S`,
 * each change of state placed where the altitude that crossed its limit does
 * (linear interpolation between samples).
 */
export function observableIntervals(sky: EpochSky, site: SiteSpec, a: number, b: number, sunLimitRad: number, minAltRad: number): Interval[] {
  const n = Math.max(2, Math.ceil((b - a) / CALENDAR_STEP_S) + 1);
  const dt = (b - a) / (n - 1);
  const out: Interval[] = [];
  let prevSun = 0;
  let prevTgt = 0;
  let prevOk = false;
  let start = 0;
  for (let i = 0; i < n; i++) {
    const t = i === n - 1 ? b : a + i * dt;
    const gs = sunLimitRad - sky.sunAltitude(t, site); // > 0: dark enough
    const gt = sky.targetAltitude(t, site) - minAltRad; // > 0: high enough
    const ok = gs > 0 && gt > 0;
    if (i === 0) {
      if (ok) start = a;
    } else if (ok !== prevOk) {
      const tp = t - dt;
      const cross = (g0: number, g1: number) => tp + (dt * g0) / (g0 - g1);
      // The crossing of each limit whose state changed between the two samples.
      const xs: number[] = [];
      if (gs > 0 !== prevSun > 0) xs.push(cross(prevSun, gs));
      if (gt > 0 !== prevTgt > 0) xs.push(cross(prevTgt, gt));
      if (ok) start = Math.max(...xs);
      else out.push([start, Math.min(...xs)]);
    }
    prevSun = gs;
    prevTgt = gt;
    prevOk = ok;
  }
  if (prevOk) out.push([start, b]);
  return out.filter(([x, y]) => y > x);
}

/**
 * Epochs n whose mid-time t0 + nP may fall inside the campaign (BJD ≈ JD_UTC + 69 s
 * ± 8.3 min, with 0.01 d of margin); the exact test, in UTC, is the caller's.
 */
export function campaignEpochRange(campaign: { startUtcS: number; endUtcS: number }, t0BjdTdb: number, periodD: number): [number, number] {
  const approxBjd = (utcS: number) => JD_J2000 + (utcS + ttMinusUtcS(utcS)) / DAY_S;
  return [Math.ceil((approxBjd(campaign.startUtcS) - 0.01 - t0BjdTdb) / periodD), Math.floor((approxBjd(campaign.endUtcS) + 0.01 - t0BjdTdb) / periodD)];
}

/** The calendar's baseline on each side, s: the given one, cut at half the period less half the transit, and at 10 days. */
export function calendarBaselineS(s: Scenario, t14S: number): number {
  return Math.max(0, Math.min(s.observation.baselineS, s.planet.periodS / 2 - t14S / 2, 10 * DAY_S));
}

function counts(rows: ReadonlyArray<{ class: TransitClass }>, expectedFull: number): CalendarCounts {
  const full = rows.filter((r) => r.class === 'full').length;
  const none = rows.filter((r) => r.class === 'none').length;
  return { transits: rows.length, full, partial: rows.length - full - none, none, expected_full: expectedFull };
}

/**
 * Every transit of the campaign at each site of the scenario (and over the
 * network when there are several). Needs the scenario's `site`, `target` and
 * `campaign` blocks (an InputError names the missing ones).
 */
export function transitCalendar(s: Scenario, source = 'scenario'): CalendarResult {
  if (s.sky?.visibility) return spaceCalendar(s, s.sky.visibility, source);
  const sky = s.sky;
  requireCalendarBlocks(sky, source);
  const { target, campaign, constraints, sites } = sky;
  const dur = scenarioDurations(s);
  const t14 = dur.t14S;
  if (!(t14 > 0)) throw new InputError([{ path: 'planet', value: undefined, allowed: 'the planet does not transit (no first-to-last contact duration): a calendar needs a transit' }], source);
  const half = t14 / 2;
  const ingressS = Math.min(dur.ingressS, half);
  // Baselines beyond the half period would overlap the next transit's window; beyond 10 days
  // they are no longer a night's baseline: the calendar cuts them there and says so.
  const givenBaseline = s.observation.baselineS;
  const baseline = calendarBaselineS(s, t14);
  const periodD = s.planet.periodS / DAY_S;
  const t0 = s.observation.t0BjdTdb;
  const sunLimit = constraints.sunAltitudeRad;
  const minAltDeg = altitudeForAirmass(constraints.airmass);
  const minAlt = minAltDeg * DEG;
  const clear = constraints.clearFraction;

  const [nLo, nHi] = campaignEpochRange(campaign, t0, periodD);
  if (nHi - nLo + 1 > MAX_CALENDAR_TRANSITS) {
    throw new InputError([{ path: 'campaign', value: `${isoUtc(campaign.startUtcS)} to ${isoUtc(campaign.endUtcS)}`, allowed: `holds about ${nHi - nLo + 1} transits of the ${formatDays(periodD)}-day period; a calendar lists at most ${MAX_CALENDAR_TRANSITS}: shorten the campaign` }], source);
  }

  const rows: CalendarTransit[] = [];
  const network: NetworkTransit[] = [];
  const perSite = sites.map(() => [] as CalendarTransit[]);
  const expectedPerSite = sites.map(() => 0);
  let expectedNetwork = 0;
  const netRows: Array<{ class: TransitClass }> = [];
  for (let n = nLo; n <= nHi; n++) {
    const midBjd = t0 + n * periodD;
    const midGeo = bjdTdbToUtc(midBjd, target, null);
    if (midGeo < campaign.startUtcS || midGeo > campaign.endUtcS) continue;
    const t1 = midGeo - half;
    const t4 = midGeo + half;
    const a = t1 - baseline;
    const b = t4 + baseline;
    const epochSky = new EpochSky(a, b, target);
    const sigma = Math.sqrt(sky.t0ErrorS ** 2 + n * n * sky.periodErrorS ** 2);
    const all: Interval[] = [];
    const fullSites: string[] = [];
    let noneFull = 1;
    sites.forEach((site, k) => {
      const iv = observableIntervals(epochSky, site, a, b, sunLimit, minAlt);
      all.push(...iv);
      const { coverage, cls } = classify(iv, t1, t4);
      // The site's own light-time term: r_site · n̂ / c = ρ sin h / c (spherical Earth; ≤ 21 ms).
      const siteDelay = ((R_EARTH_MEAN_M + site.altitudeM) * Math.sin(epochSky.targetAltitude(midGeo, site))) / C_LIGHT;
      let main: Interval | null = null;
      let best = -1;
      for (const v of iv) {
        const score = overlap([v], t1, t4) * 1e6 + (v[1] - v[0]) * 1e-6;
        if (score > best) {
          best = score;
          main = v;
        }
      }
      const am = (t: number) => airmassKastenYoung(epochSky.targetAltitude(t, site) / DEG);
      const row: CalendarTransit = {
        site: site.name,
        epoch: n,
        mid_time_bjd_tdb: midBjd,
        mid_time_utc: isoUtc(midGeo - siteDelay),
        mid_time_sigma_s: sigma,
        transit_start_utc: isoUtc(t1 - siteDelay),
        transit_end_utc: isoUtc(t4 - siteDelay),
        book_start_utc: isoUtc(a - BOOKING_SIGMAS * sigma),
        book_end_utc: isoUtc(b + BOOKING_SIGMAS * sigma),
        observable_start_utc: main ? isoUtc(main[0]) : null,
        observable_end_utc: main ? isoUtc(main[1]) : null,
        observable_duration_s: overlap(iv, a, b),
        observable_intervals_utc: iv.map(([x, y]) => [isoUtc(x), isoUtc(y)]),
        transit_coverage: coverage,
        baseline_before_coverage: baseline > 0 ? overlap(iv, a, t1) / baseline : null,
        baseline_after_coverage: baseline > 0 ? overlap(iv, t4, b) / baseline : null,
        airmass_start: main ? am(main[0]) : null,
        airmass_middle: main ? am(0.5 * (main[0] + main[1])) : null,
        airmass_end: main ? am(main[1]) : null,
        class: cls,
      };
      rows.push(row);
      perSite[k].push(row);
      if (cls === 'full') {
        fullSites.push(site.name);
        noneFull *= 1 - clear;
        expectedPerSite[k] += clear;
      }
    });
    const net = classify(intervalUnion(all), t1, t4);
    const pFull = fullSites.length ? 1 - noneFull : 0;
    expectedNetwork += pFull;
    netRows.push({ class: net.cls });
    if (sites.length > 1) {
      network.push({ epoch: n, mid_time_bjd_tdb: midBjd, mid_time_utc: isoUtc(midGeo), transit_coverage: net.coverage, class: net.cls, full_sites: fullSites, full_probability: pFull });
    }
  }

  const notes: string[] = [];
  sites.forEach((site) => {
    // Highest altitude of a fixed star, at upper culmination: 90° − |φ − δ| (e.g. Smart 1977, §13).
    const highest = 90 - Math.abs(site.latitudeRad - target.decRad) / DEG;
    if (highest < minAltDeg) {
      notes.push(`${site.name}: the target never reaches air mass ${constraints.airmass} (its highest altitude is ${highest.toFixed(1)}°, air mass ${highest > 0 ? airmassKastenYoung(highest).toFixed(2) : '∞ (never rises)'}); no transit is observable from here`);
    }
  });
  if (rows.length === 0) notes.push('no transit mid-time falls inside the campaign');
  if (baseline < givenBaseline) notes.push(`the baseline of ${formatDays(givenBaseline / DAY_S)} d is cut to ${formatDays(baseline / DAY_S)} d on each side (at most half the period less half the transit, and 10 days)`);
  const siteCounts = sites.map((_, k) => counts(perSite[k], expectedPerSite[k]));
  return {
    schema: 'moonsieve/calendar/1',
    scenario: s.name,
    transit_duration_s: t14,
    ingress_duration_s: ingressS,
    baseline_s: baseline,
    campaign: { start_utc: isoUtc(campaign.startUtcS), end_utc: isoUtc(campaign.endUtcS) },
    constraints: { sun_altitude_deg: sunLimit / DEG, airmass: constraints.airmass, min_target_altitude_deg: minAltDeg, clear_fraction: clear },
    sites: sites.map((site, k) => ({ name: site.name, latitude_deg: site.latitudeRad / DEG, longitude_deg: site.longitudeRad / DEG, altitude_m: site.altitudeM, counts: siteCounts[k] })),
    target: { ra_deg: target.raRad / DEG, dec_deg: target.decRad / DEG },
    visibility: null,
    network_counts: counts(netRows, expectedNetwork),
    notes,
    assumptions: [
      'observable = the Sun\'s centre below the altitude limit and the target\'s air mass (Kasten & Young 1989) at most the limit, from geometric altitudes: no refraction, no horizon profile, no Moon, no telescope pointing limits',
      'weather enters only as the expected count: each site\'s night is clear with probability clear_fraction, independently',
      'mid-times are the barycentre ephemeris t0 + nP: the moon\'s TTV (minutes at most) is not added; the booking window adds 3σ of the ephemeris uncertainty on each side',
      'UT1 is taken as UTC (|UT1 − UTC| < 0.9 s) and TDB as TT (< 2 ms); leap seconds after 2017 are not known in advance',
    ],
    transits: rows,
    network,
  };
}

/**
 * Geocentric UTC (s since J2000.0) of a BJD_TDB: with a target, through the
 * barycentric light time (barycentric.ts); without one, JD_TDB taken as the
 * BJD (the light time, up to ±8.3 min, left out) and TDB as TT.
 */
export function approximateUtcOfBjd(bjdTdb: number, target: TargetSpec | null): number {
  if (target) return bjdTdbToUtc(bjdTdb, target, null);
  const tt = (bjdTdb - JD_J2000) * DAY_S;
  return tt - ttMinusUtcS(tt - ttMinusUtcS(tt));
}

/**
 * The calendar of a space instrument (scenario `visibility`): the same
 * transits as a ground calendar, each transit's observable part being the
 * visible stretches of the pattern (visibilityPattern.ts) on the BJD_TDB
 * axis; no air mass, no weather.
 */
function spaceCalendar(s: Scenario, v: VisibilitySpec, source: string): CalendarResult {
  const sky = s.sky!;
  const campaign = sky.campaign;
  if (!campaign) throw new InputError([{ path: 'campaign', value: undefined, allowed: 'required by calendar with visibility: add e.g. campaign: {start: 2027-01-01, end: 2028-12-31}' }], source);
  const target = sky.target;
  const dur = scenarioDurations(s);
  const t14 = dur.t14S;
  if (!(t14 > 0)) throw new InputError([{ path: 'planet', value: undefined, allowed: 'the planet does not transit (no first-to-last contact duration): a calendar needs a transit' }], source);
  const half = t14 / 2;
  const givenBaseline = s.observation.baselineS;
  const baseline = calendarBaselineS(s, t14);
  const periodD = s.planet.periodS / DAY_S;
  const t0 = s.observation.t0BjdTdb;
  const [nLo, nHi] = campaignEpochRange(campaign, t0, periodD);
  if (nHi - nLo + 1 > MAX_CALENDAR_TRANSITS) {
    throw new InputError([{ path: 'campaign', value: `${isoUtc(campaign.startUtcS)} to ${isoUtc(campaign.endUtcS)}`, allowed: `holds about ${nHi - nLo + 1} transits of the ${formatDays(periodD)}-day period; a calendar lists at most ${MAX_CALENDAR_TRANSITS}: shorten the campaign` }], source);
  }
  const rows: CalendarTransit[] = [];
  for (let n = nLo; n <= nHi; n++) {
    const midBjd = t0 + n * periodD;
    const mid = approximateUtcOfBjd(midBjd, target);
    if (mid < campaign.startUtcS || mid > campaign.endUtcS) continue;
    // Offsets from the mid-time, s: the same on the BJD_TDB and UTC axes within a window (≤ 2 s over ±5 h; observableWindows.ts).
    const iv = visibleStretches(v, midBjd, -half - baseline, half + baseline);
    const { coverage, cls } = classify(iv, -half, half);
    let main: Interval | null = null;
    let best = -1;
    for (const w of iv) {
      const score = overlap([w], -half, half) * 1e6 + (w[1] - w[0]) * 1e-6;
      if (score > best) {
        best = score;
        main = w;
      }
    }
    const sigma = Math.sqrt(sky.t0ErrorS ** 2 + n * n * sky.periodErrorS ** 2);
    const at = (off: number) => isoUtc(mid + off);
    rows.push({
      site: v.name,
      epoch: n,
      mid_time_bjd_tdb: midBjd,
      mid_time_utc: at(0),
      mid_time_sigma_s: sigma,
      transit_start_utc: at(-half),
      transit_end_utc: at(half),
      book_start_utc: at(-half - baseline - BOOKING_SIGMAS * sigma),
      book_end_utc: at(half + baseline + BOOKING_SIGMAS * sigma),
      observable_start_utc: main ? at(main[0]) : null,
      observable_end_utc: main ? at(main[1]) : null,
      observable_duration_s: overlap(iv, -half - baseline, half + baseline),
      observable_intervals_utc: iv.map(([x, y]) => [at(x), at(y)]),
      transit_coverage: coverage,
      baseline_before_coverage: baseline > 0 ? overlap(iv, -half - baseline, -half) / baseline : null,
      baseline_after_coverage: baseline > 0 ? overlap(iv, half, half + baseline) / baseline : null,
      airmass_start: null,
      airmass_middle: null,
      airmass_end: null,
      class: cls,
    });
  }
  const notes: string[] = [];
  if (rows.length === 0) notes.push('no transit mid-time falls inside the campaign');
  if (baseline < givenBaseline) notes.push(`the baseline of ${formatDays(givenBaseline / DAY_S)} d is cut to ${formatDays(baseline / DAY_S)} d on each side (at most half the period less half the transit, and 10 days)`);
  const c = counts(rows, rows.filter((r) => r.class === 'full').length);
  return {
    schema: 'moonsieve/calendar/1',
    scenario: s.name,
    transit_duration_s: t14,
    ingress_duration_s: Math.min(dur.ingressS, half),
    baseline_s: baseline,
    campaign: { start_utc: isoUtc(campaign.startUtcS), end_utc: isoUtc(campaign.endUtcS) },
    constraints: null,
    sites: [{ name: v.name, latitude_deg: null, longitude_deg: null, altitude_m: null, counts: c }],
    target: target ? { ra_deg: target.raRad / DEG, dec_deg: target.decRad / DEG } : null,
    visibility: { name: v.name, on_s: v.onS, off_s: v.offS, start_bjd_tdb: v.referenceBjdTdb, block_s: v.blockS, gap_s: v.gapS, visible_fraction: visibleFraction(v) },
    network_counts: c,
    notes,
    assumptions: [
      'observable = inside the stated visibility pattern (visible for on, hidden for off, inside observing blocks when given), strictly periodic on the BJD_TDB axis: no Earth, Sun or Moon avoidance angles, no South Atlantic Anomaly, no momentum dumps or downlinks unless folded into on/off',
      'no weather and no air mass: every visible stretch is observed, at the instrument\'s stated noise',
      'mid-times are the barycentre ephemeris t0 + nP: the moon\'s TTV (minutes at most) is not added; the booking window adds 3σ of the ephemeris uncertainty on each side',
      target
        ? 'UTC times are geocentric (the spacecraft\'s own light time, seconds at most in Earth orbit or at L2, is left out)'
        : 'no target given: UTC times take BJD_TDB as the geocentric time (off by up to ±8.3 min, the light time to the barycentre); the pattern and coverages are on BJD_TDB and are exact',
    ],
    transits: rows,
    network: [],
  };
}

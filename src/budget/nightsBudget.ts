/**
 * A transit count in the observer's units: which epochs of the campaign to
 * book, the nights and hours on sky they cost, and the calendar time needed
 * to expect the count at the stated clear fraction.
 *
 * How partial transits count. The mid-time information of a transit is in
 * its ingress and egress: for the trapezoid model of Carter et al. (2008,
 * ApJ 689, 499, eqs. 1–4) ∂F/∂t_c = ±δ/τ during the two ramps and 0
 * elsewhere, so the Fisher information on t_c of evenly sampled white-noise
 * data is proportional to the time observed inside the ramps. A transit
 * whose observed part covers a fraction f_in of the ingress and f_eg of the
 * egress therefore carries (f_in + f_eg)/2 of a whole transit's timing
 * information: its "whole-transit equivalent" w (derived here from that
 * Fisher matrix; w = 1 for a whole transit, ½ for one whole ramp, 0 for the
 * middle alone). The needed count N (from the budget's simulation of whole
 * transits) is met when the expected sum of w reaches N.
 *
 * Weather. Each night at each site is clear with probability c
 * (constraints.clear_fraction), independently (issue 18's model). For one
 * epoch the observed set is the union of the clear sites' stretches, so its
 * expected equivalent is Σ_S P(S) w(∪_{s∈S} I_s) over the subsets S of the
 * sites that see some of it (P(S) = c^|S| (1 − c)^(k − |S|)); for one site
 * this is c·w. Walking the epochs in date order from the campaign start, the
 * expected total after K epochs is the sum of those terms (linearity of
 * expectation), and the booking stops at the first K where it reaches N: for
 * one site and whole transits only, K = ⌈N / c⌉ usable epochs (derived here).
 * Reaching the expected count leaves about even odds of falling short, so the
 * plan also states the chance of reaching N with the booked epochs and the
 * calendar time for a 90 % chance, from the exact distribution of the sum
 * (the weights on a grid of 1/20, rounded down, convolved epoch by epoch).
 *
 * Pure: a function of the Scenario (its sky blocks) and the count.
 */
import { DAY_S, HOUR_S } from '../physics/constants.js';
import { transitCalendar, observableIntervals, BOOKING_SIGMAS, type CalendarResult, type CalendarTransit, type TransitCoverage } from '../sky/calendar.js';
import { EpochSky } from '../sky/skyPosition.js';
import { altitudeForAirmass } from '../sky/airmass.js';
import { isoUtc, utcSFromDate } from '../sky/timeScales.js';
import { visibleStretches } from '../sky/visibilityPattern.js';
import type { Scenario, SiteSpec } from '../scenario/types.js';
import { intervalUnion, type Interval } from '../numeric/intervals.js';

const DEG = Math.PI / 180;
/** Grid of the whole-transit equivalents in the exact distribution of the sum (1/20; weights rounded down). */
const WEIGHT_STEPS = 20;
/** The plan's confidence level for the longer campaign (common practice, no source). */
export const PLAN_CONFIDENCE = 0.9;
/** How far forward the calendar is extended when the campaign is too short, years. */
export const MAX_EXTENSION_YEARS = 30;
const YEAR_S = 365.25 * DAY_S;
/** Sites enumerated exactly per epoch (2^k subsets); beyond this the best single site is used. */
const MAX_EXACT_SITES = 12;


/** One booking: one epoch at one site. */
export interface NightBooking extends BookingCoverage {
  epoch: number;
  site: string;
  /** Local date (mean solar time at the site's longitude) of the evening the night begins. */
  night: string;
  mid_time_utc: string;
  /** What to book: the observable time inside first contact − baseline − 3σ … last contact + baseline + 3σ. */
  book_start_utc: string;
  book_end_utc: string;
  /** Observable time booked (transit and baselines), s. */
  on_sky_s: number;
  /** Of it, inside first-to-last contact, s. */
  in_transit_s: number;
}

/** How much of a transit one booking sees: the same in the plan and in its JSON (NightBookingJson). */
export interface BookingCoverage extends TransitCoverage {
  /** Observed fractions of the ingress and the egress ramps. */
  ingress_coverage: number;
  egress_coverage: number;
  /** (ingress_coverage + egress_coverage) / 2: the share of a whole transit's timing information. */
  whole_equivalent: number;
}

/** One epoch in date order: what the network expects of it after weather. */
export interface PlanEpoch {
  epoch: number;
  mid_time_utc: string;
  /** Whole-transit equivalent with every site clear (the union of the sites' stretches). */
  whole_equivalent: number;
  /** Expected whole-transit equivalent after weather. */
  expected_whole_equivalent: number;
  /** Chance that some site sees the whole transit. */
  whole_probability: number;
  /** Running sum of expected_whole_equivalent from the campaign start. */
  cumulative_expected: number;
  /** Whether the epoch lies beyond the campaign as given (the calendar extended forward). */
  beyond_campaign: boolean;
}

/** One transit at one site for the season chart. */
export interface SeasonPoint {
  epoch: number;
  site: string;
  mid_time_utc: string;
  transit_coverage: number;
  whole_equivalent: number;
  beyond_campaign: boolean;
}

export interface NightsPlan {
  /** Whole-transit equivalents needed (null: book every usable epoch of the campaign). */
  transits_needed: number | null;
  /** A space instrument (scenario `visibility`): its bookings are visits, one per epoch, with no weather; `nights` counts them. */
  visits: boolean;
  clear_fraction: number;
  sites: string[];
  campaign_start_utc: string;
  campaign_end_utc: string;
  campaign_length_s: number;
  /** What the campaign as given holds. */
  campaign: { transits: number; usable: number; full: number; expected_whole_equivalent: number };
  /** Whether the campaign as given is expected to deliver the count (true when no count is asked). */
  campaign_sufficient: boolean;
  /** Calendar time from the campaign start to the end of the last booked window (null: not reached within the extension). */
  needed_length_s: number | null;
  needed_end_utc: string | null;
  /** Chance that the booked epochs deliver at least the count (null: no count asked, or not reached). */
  probability_enough: number | null;
  /** Calendar time for a PLAN_CONFIDENCE chance of the count (null: not reached within the extension). */
  confident_length_s: number | null;
  confident_end_utc: string | null;
  /** Totals over the bookings. */
  epochs_booked: number;
  nights: number;
  on_sky_s: number;
  in_transit_s: number;
  baseline_s: number;
  expected_whole_equivalent: number;
  expected_whole_transits: number;
  bookings: NightBooking[];
  epochs: PlanEpoch[];
  season: SeasonPoint[];
  /** How far forward the calendar was extended, s (0: not extended). */
  extended_by_s: number;
  statement: string;
  counting_rule: string;
  notes: string[];
  assumptions: string[];
}

const parseUtc = (iso: string): number => utcSFromDate(new Date(iso));
/** The calendar's instants are whole seconds: a fraction within 1e-3 of 0 or 1 is that end (rounding only). */
const snap = (f: number): number => (f > 1 - 1e-3 ? 1 : f < 1e-3 ? 0 : f);
/** A date for text: an end at midnight names the day it closes. */
const endDate = (utcS: number): string => isoUtc(isoUtc(utcS).endsWith('T00:00:00Z') ? utcS - 1 : utcS).slice(0, 10);

/** Length of the overlap of the intervals with [a, b]. */
function overlap(iv: readonly Interval[], a: number, b: number): number {
  let s = 0;
  for (const [x, y] of iv) s += Math.max(0, Math.min(y, b) - Math.max(x, a));
  return s;
}


/**
 * Observed fractions of the ingress [t1, t1 + τ] and egress [t4 − τ, t4]
 * ramps and their mean, the whole-transit equivalent (file comment: Carter
 * et al. 2008's Fisher information on t_c lives in the ramps).
 */
export function rampCoverage(iv: readonly Interval[], t1: number, t4: number, ingressS: number): { ingress: number; egress: number; equivalent: number } {
  const tau = Math.min(ingressS, 0.5 * (t4 - t1));
  if (!(tau > 0)) return { ingress: 0, egress: 0, equivalent: 0 };
  const ingress = snap(overlap(iv, t1, t1 + tau) / tau);
  const egress = snap(overlap(iv, t4 - tau, t4) / tau);
  return { ingress, egress, equivalent: 0.5 * (ingress + egress) };
}

/** Local mean-solar date of the evening a night begins: UTC + longitude/15° − 12 h, as YYYY-MM-DD (derived here). */
export function nightOf(utcS: number, longitudeRad: number): string {
  return isoUtc(utcS + (longitudeRad / (2 * Math.PI)) * DAY_S - DAY_S / 2).slice(0, 10);
}

interface RowInfo {
  row: CalendarTransit;
  /** The ground site; null for a space instrument. */
  site: SiteSpec | null;
  iv: Interval[];
  t1: number;
  t4: number;
  ramps: { ingress: number; egress: number; equivalent: number };
}

interface EpochInfo {
  epoch: number;
  midUtc: string;
  rows: RowInfo[];
  equivalent: number;
  expected: number;
  wholeProbability: number;
  /** Distribution of the delivered equivalent, in 1/WEIGHT_STEPS units: [units, probability]. */
  outcomes: Array<[number, number]>;
  beyond: boolean;
}

/** Expected equivalent, chance of a whole transit and the outcome distribution of one epoch over the clear/cloudy states of its sites. */
function epochOutcomes(rows: RowInfo[], c: number, ingressS: number): Pick<EpochInfo, 'equivalent' | 'expected' | 'wholeProbability' | 'outcomes'> {
  const seeing = rows.filter((r) => r.iv.length > 0 && r.ramps.equivalent > 0);
  const t1 = rows[0].t1;
  const t4 = rows[0].t4;
  const all = rampCoverage(intervalUnion(seeing.flatMap((r) => r.iv)), t1, t4, ingressS).equivalent;
  let pNoWhole = 1;
  for (const r of rows) if (r.row.class === 'full') pNoWhole *= 1 - c;
  const wholeProbability = rows.some((r) => r.row.class === 'full') ? 1 - pNoWhole : 0;
  if (seeing.length === 0) return { equivalent: 0, expected: 0, wholeProbability, outcomes: [[0, 1]] };
  const used = seeing.length <= MAX_EXACT_SITES ? seeing : [seeing.reduce((b, r) => (r.ramps.equivalent > b.ramps.equivalent ? r : b))];
  const k = used.length;
  const dist = new Map<number, number>();
  let expected = 0;
  for (let mask = 0; mask < 1 << k; mask++) {
    let p = 1;
    const iv: Interval[] = [];
    for (let j = 0; j < k; j++) {
      if (mask & (1 << j)) {
        p *= c;
        iv.push(...used[j].iv);
      } else p *= 1 - c;
    }
    if (p === 0) continue;
    const w = mask === 0 ? 0 : rampCoverage(intervalUnion(iv), t1, t4, ingressS).equivalent;
    expected += p * w;
    const units = Math.floor(w * WEIGHT_STEPS + 1e-9);
    dist.set(units, (dist.get(units) ?? 0) + p);
  }
  return { equivalent: all, expected, wholeProbability, outcomes: [...dist.entries()] };
}

/** The calendar's rows grouped by epoch, in date order, with the ramp coverage of each. */
function epochsOf(cal: CalendarResult, s: Scenario, c: number, beyond: boolean): EpochInfo[] {
  const siteByName = new Map(s.sky!.sites.map((x) => [x.name, x]));
  const byEpoch = new Map<number, RowInfo[]>();
  for (const row of cal.transits) {
    const t1 = parseUtc(row.transit_start_utc);
    const t4 = parseUtc(row.transit_end_utc);
    const iv: Interval[] = row.observable_intervals_utc.map(([a, b]) => [parseUtc(a), parseUtc(b)]);
    const info: RowInfo = { row, site: siteByName.get(row.site) ?? null, iv, t1, t4, ramps: rampCoverage(iv, t1, t4, cal.ingress_duration_s) };
    const list = byEpoch.get(row.epoch) ?? [];
    list.push(info);
    byEpoch.set(row.epoch, list);
  }
  return [...byEpoch.entries()].sort((a, b) => a[0] - b[0]).map(([epoch, rows]) => ({
    epoch, midUtc: rows[0].row.mid_time_utc, rows, beyond, ...epochOutcomes(rows, c, cal.ingress_duration_s),
  }));
}

/** The scenario with its campaign moved to [startS, endS]. */
function withCampaign(s: Scenario, startS: number, endS: number): Scenario {
  return { ...s, sky: { ...s.sky!, campaign: { startUtcS: startS, endUtcS: endS } } };
}

/** Probability that the sum of the epochs' outcomes reaches `needUnits` (exact convolution, capped at the need). */
class SumDistribution {
  private p: Float64Array;
  constructor(private readonly needUnits: number) {
    this.p = new Float64Array(needUnits + 1);
    this.p[0] = 1;
  }
  add(outcomes: Array<[number, number]>): void {
    const next = new Float64Array(this.needUnits + 1);
    for (let u = 0; u <= this.needUnits; u++) {
      if (this.p[u] === 0) continue;
      for (const [w, q] of outcomes) next[Math.min(this.needUnits, u + w)] += this.p[u] * q;
    }
    this.p = next;
  }
  /** P(sum ≥ need). */
  reached(): number {
    return this.p[this.needUnits];
  }
}

function bookingsOf(e: EpochInfo, s: Scenario): NightBooking[] {
  const sky = s.sky!;
  const v = sky.visibility ?? null;
  const sunLimit = sky.constraints.sunAltitudeRad;
  const minAlt = altitudeForAirmass(sky.constraints.airmass) * DEG;
  const out: NightBooking[] = [];
  for (const r of e.rows) {
    if (r.ramps.equivalent <= 0) continue;
    // The booking window with the ephemeris margin (±3σ), where the sky allows.
    const a = parseUtc(r.row.book_start_utc);
    const b = parseUtc(r.row.book_end_utc);
    // With the calendar's own stretches: a sliver of a minute or so can fall between the samples of the longer window.
    let iv: Interval[];
    let nights: Set<string>;
    if (v || !r.site) {
      // A space instrument: the pattern's visible stretches of the window (offsets from the mid-time, as
      // its calendar; sky/visibilityPattern.ts); one visit, labelled by the UTC date of its first stretch.
      const mid = 0.5 * (r.t1 + r.t4);
      const seen = v ? visibleStretches(v, r.row.mid_time_bjd_tdb, a - mid, b - mid).map(([x, y]) => [x + mid, y + mid] as Interval) : [];
      iv = intervalUnion([...seen, ...r.iv]);
      nights = new Set([isoUtc(iv[0][0]).slice(0, 10)]);
    } else {
      iv = intervalUnion([...observableIntervals(new EpochSky(a, b, sky.target!), r.site, a, b, sunLimit, minAlt), ...r.iv]);
      const site = r.site;
      nights = new Set(iv.map(([x, y]) => nightOf(0.5 * (x + y), site.longitudeRad)));
    }
    const onSky = overlap(iv, a, b);
    const inTransit = overlap(iv, r.t1, r.t4);
    out.push({
      epoch: e.epoch,
      site: r.row.site,
      night: [...nights].join(', '),
      mid_time_utc: r.row.mid_time_utc,
      book_start_utc: isoUtc(iv[0][0]),
      book_end_utc: isoUtc(iv[iv.length - 1][1]),
      on_sky_s: onSky,
      in_transit_s: inTransit,
      transit_coverage: r.row.transit_coverage,
      ingress_coverage: r.ramps.ingress,
      egress_coverage: r.ramps.egress,
      whole_equivalent: r.ramps.equivalent,
      baseline_before_coverage: r.row.baseline_before_coverage,
      baseline_after_coverage: r.row.baseline_after_coverage,
      airmass_start: r.row.airmass_start,
      airmass_middle: r.row.airmass_middle,
      airmass_end: r.row.airmass_end,
      class: r.row.class,
    });
  }
  return out;
}

const days = (s: number) => `${(s / DAY_S).toFixed(0)} days (${(s / YEAR_S).toFixed(1)} years)`;
const f1 = (x: number) => x.toFixed(1);

/**
 * The nights plan for `needed` whole-transit equivalents (null: every usable
 * epoch of the campaign). The scenario must hold site, target and campaign
 * (transitCalendar throws an InputError naming the missing blocks).
 */
export function nightsPlan(s: Scenario, needed: number | null, source = 'scenario'): NightsPlan {
  const cal = transitCalendar(s, source);
  const sky = s.sky!;
  const c = sky.constraints.clearFraction;
  const start = sky.campaign!.startUtcS;
  const end = sky.campaign!.endUtcS;
  const epochs = epochsOf(cal, s, c, false);
  const inCampaign = epochs.length;
  const campaignExpected = epochs.reduce((x, e) => x + e.expected, 0);
  const need = needed === null ? null : Math.max(0, needed);
  const needUnits = need === null ? 0 : Math.ceil(need * WEIGHT_STEPS - 1e-9);

  // Extend the calendar forward, a year at a time, until both the expected count and the
  // PLAN_CONFIDENCE chance are reached (or the cap).
  let extendedTo = end;
  // The scan of the epochs in date order, resumed where it stopped when the calendar grows.
  let scanned = 0;
  let cum0 = 0;
  let expectedAt: number | null = null;
  let confidentAt: number | null = null;
  const scanDist = new SumDistribution(needUnits);
  const enough = (list: EpochInfo[]): { expectedAt: number | null; confidentAt: number | null } => {
    if (need === null) return { expectedAt: null, confidentAt: null };
    if (need === 0) return { expectedAt: -1, confidentAt: -1 };
    for (; scanned < list.length && (expectedAt === null || confidentAt === null); scanned++) {
      const e = list[scanned];
      cum0 += e.expected;
      if (e.expected > 0) scanDist.add(e.outcomes);
      if (expectedAt === null && cum0 >= need - 1e-9 && e.expected > 0) expectedAt = scanned;
      if (confidentAt === null && scanDist.reached() >= PLAN_CONFIDENCE && e.expected > 0) confidentAt = scanned;
    }
    return { expectedAt, confidentAt };
  };
  let reach = enough(epochs);
  const space = !!sky.visibility;
  const unit = space ? 'visits' : 'nights';
  const neverRises = !space && cal.notes.filter((n) => n.includes('never reaches air mass')).length === cal.sites.length;
  while (need !== null && need > 0 && (reach.expectedAt === null || reach.confidentAt === null) && !neverRises && extendedTo - end < MAX_EXTENSION_YEARS * YEAR_S) {
    const next = extendedTo + Math.max(YEAR_S, 4 * s.planet.periodS);
    const more = epochsOf(transitCalendar(withCampaign(s, extendedTo, next), source), s, c, true).filter((e) => e.epoch > (epochs.length ? epochs[epochs.length - 1].epoch : -Infinity));
    epochs.push(...more);
    extendedTo = next;
    reach = enough(epochs);
  }

  // The booked epochs: to the expected count, or every usable epoch of the campaign.
  const last = need === null ? inCampaign - 1 : reach.expectedAt === -1 ? null : reach.expectedAt;
  const bookedEpochs = last === null ? [] : epochs.slice(0, last + 1).filter((e) => e.expected > 0);
  const bookings = bookedEpochs.flatMap((e) => bookingsOf(e, s));
  const endOf = (i: number | null): number | null => {
    if (i === null) return null;
    if (i < 0) return start;
    const rows = epochs[i].rows;
    return Math.max(...rows.map((r) => parseUtc(r.row.book_end_utc)));
  };
  const neededEnd = need === null ? null : endOf(reach.expectedAt);
  const confidentEnd = need === null ? null : endOf(reach.confidentAt);
  let probabilityEnough: number | null = null;
  if (need !== null && reach.expectedAt !== null) {
    const dist = new SumDistribution(needUnits);
    for (const e of bookedEpochs) dist.add(e.outcomes);
    probabilityEnough = need === 0 ? 1 : dist.reached();
  }
  let cum = 0;
  const planEpochs: PlanEpoch[] = epochs.map((e) => {
    cum += e.expected;
    return { epoch: e.epoch, mid_time_utc: e.midUtc, whole_equivalent: e.equivalent, expected_whole_equivalent: e.expected, whole_probability: e.wholeProbability, cumulative_expected: cum, beyond_campaign: e.beyond };
  });
  const season: SeasonPoint[] = epochs.flatMap((e) => e.rows.map((r) => ({
    epoch: e.epoch, site: r.row.site, mid_time_utc: r.row.mid_time_utc, transit_coverage: r.row.transit_coverage, whole_equivalent: r.ramps.equivalent, beyond_campaign: e.beyond,
  })));
  const nights = space ? bookings.length : new Set(bookings.flatMap((b) => b.night.split(', ').map((n) => `${b.site}|${n}`))).size;
  const onSky = bookings.reduce((x, b) => x + b.on_sky_s, 0);
  const inTransit = bookings.reduce((x, b) => x + b.in_transit_s, 0);
  const expectedBooked = bookedEpochs.reduce((x, e) => x + e.expected, 0);
  const expectedWhole = bookedEpochs.reduce((x, e) => x + e.wholeProbability, 0);
  const campaignInfo = {
    transits: inCampaign,
    usable: epochs.slice(0, inCampaign).filter((e) => e.equivalent > 0).length,
    full: epochs.slice(0, inCampaign).filter((e) => e.rows.some((r) => r.row.class === 'full')).length,
    expected_whole_equivalent: campaignExpected,
  };
  const sufficient = need === null || campaignExpected >= need - 1e-9;
  const siteText = space ? `${cal.sites[0].name} (its visibility pattern)` : cal.sites.length === 1 ? cal.sites[0].name : `the network (${cal.sites.map((x) => x.name).join(', ')})`;
  const campaignText = `${isoUtc(start).slice(0, 10)} to ${endDate(end)}`;
  const holds = `The campaign ${campaignText} holds ${inCampaign} transits, ${campaignInfo.usable} of them with some ingress or egress observable from ${siteText} (${campaignInfo.full} whole); ${space ? 'with no weather' : `with clear nights ${Math.round(100 * c)} % of the time`} that is ${f1(campaignExpected)} whole-transit equivalents expected.`;
  let statement: string;
  if (need === null) {
    statement = `${holds} Booking every one of them: ${bookedEpochs.length} epochs, ${nights} ${unit}, ${f1(onSky / HOUR_S)} h on sky.`;
  } else if (neededEnd === null) {
    statement = neverRises
      ? `${holds} The target never rises high enough at ${siteText}: no campaign length gives the ${need} transits needed.`
      : `${holds} ${need} are needed, and even ${MAX_EXTENSION_YEARS} years beyond the campaign's end do not give them: this ${space ? 'visibility pattern' : 'site and target'} cannot deliver the budget.`;
  } else {
    const length = neededEnd - start;
    const head = sufficient
      ? `${holds} ${need} are needed: book ${bookedEpochs.length} epochs (${nights} ${unit}, ${f1(onSky / HOUR_S)} h on sky including ${f1((onSky - inTransit) / HOUR_S)} h of baselines), the first ${days(length)} of the campaign.`
      : `${holds} That is not enough: ${need} are needed, which takes a campaign of ${days(length)}, to ${endDate(neededEnd)} (the calendar extended forward): ${bookedEpochs.length} epochs, ${nights} ${unit}, ${f1(onSky / HOUR_S)} h on sky including ${f1((onSky - inTransit) / HOUR_S)} h of baselines.`;
    const odds = probabilityEnough !== null ? ` Those bookings deliver the ${need} with probability ${probabilityEnough.toFixed(2)}` : '';
    const conf = confidentEnd !== null ? `; a ${Math.round(100 * PLAN_CONFIDENCE)} % chance needs ${days(confidentEnd - start)}${confidentEnd > end ? ', beyond the campaign as given' : ''}.` : `; a ${Math.round(100 * PLAN_CONFIDENCE)} % chance is not reached within ${MAX_EXTENSION_YEARS} years beyond the campaign.`;
    statement = head + odds + conf;
  }
  const notes = [...cal.notes];
  if (extendedTo > end) notes.push(`the calendar was extended forward from ${endDate(end)} to ${endDate(extendedTo)} to find the campaign length that holds the count`);
  return {
    transits_needed: need,
    visits: space,
    clear_fraction: c,
    sites: cal.sites.map((x) => x.name),
    campaign_start_utc: isoUtc(start),
    campaign_end_utc: isoUtc(end),
    campaign_length_s: end - start,
    campaign: campaignInfo,
    campaign_sufficient: sufficient,
    needed_length_s: neededEnd === null ? null : neededEnd - start,
    needed_end_utc: neededEnd === null ? null : isoUtc(neededEnd),
    probability_enough: probabilityEnough,
    confident_length_s: confidentEnd === null ? null : confidentEnd - start,
    confident_end_utc: confidentEnd === null ? null : isoUtc(confidentEnd),
    epochs_booked: bookedEpochs.length,
    nights,
    on_sky_s: onSky,
    in_transit_s: inTransit,
    baseline_s: onSky - inTransit,
    expected_whole_equivalent: expectedBooked,
    expected_whole_transits: expectedWhole,
    bookings,
    epochs: planEpochs,
    season,
    extended_by_s: extendedTo - end,
    statement,
    counting_rule: `a partly observed transit counts as (ingress fraction + egress fraction) / 2 of a whole one: the share of the mid-time information it carries (Carter et al. 2008, ApJ 689, 499: for a trapezoid transit it lies in the ingress and egress); a transit seen whole counts 1, one whole ramp ½, the middle alone 0; the count is reached when the expected sum ${space ? '(no weather for a space instrument)' : `after weather (clear fraction ${c} per night and site)`} reaches it`,
    notes,
    assumptions: [
      `the needed count comes from simulating whole transits; a partial transit is counted by its timing information only: it adds nothing to the duration (TDV) channel unless both ramps are seen, and it needs the shape from the global fit and a stretch of out-of-transit flux to normalise it, which short or missing baselines weaken`,
      space
        ? 'space: the visibility pattern is taken as exact and periodic on BJD_TDB; no Earth, Sun or Moon avoidance angles, no South Atlantic Anomaly, no momentum dumps, downlinks, safe modes or slews; a visit is one epoch\'s booking window, its hours the visible time in it'
        : `weather: each night at each site is clear with probability ${c}, independently of other nights and sites; no seasonal weather, no technical losses, no overheads (acquisition, focus, calibration) in the hours`,
      `the booked windows are the observable parts of first contact − baseline − ${BOOKING_SIGMAS}σ to last contact + baseline + ${BOOKING_SIGMAS}σ of the ephemeris; the hours count that time only`,
      'the epochs are taken in date order from the campaign start: skipping the poorest epochs would save hours but lengthen the calendar',
      'the booked epochs are not consecutive: a moon\'s TTV is sampled at the epochs the sky allows, which changes its aliasing from that of consecutive transits',
    ],
  };
}

/** What a budget says about observability: the nights plan with a site, else the plain statement that every transit is assumed whole. */
export interface Observability {
  /** True when no calendar is used: every transit is assumed seen whole, consecutive, in any weather. */
  assumes_every_transit_whole: boolean;
  statement: string;
  plan: NightsPlan | null;
}

/** The statement a budget without a site makes. */
export const WHOLE_TRANSITS_ASSUMED = 'No site, target and campaign given: every transit is assumed observed whole, transit and baselines, on consecutive epochs, whatever the time of day, season or weather. On the ground that is optimistic by a large factor; add site, target and campaign blocks to get nights, hours on sky and the calendar time needed.';

/** The observability part of a budget for `needed` whole-transit equivalents (null: the target was not reached). */
export function budgetObservability(s: Scenario, needed: number | null, source = 'scenario'): Observability {
  const sky = s.sky;
  const given = sky ? [sky.sites.length > 0 ? 'site' : '', sky.target ? 'target' : '', sky.campaign ? 'campaign' : ''].filter((x) => x) : [];
  const spaceReady = !!sky?.visibility && !!sky.campaign;
  if (!sky || (given.length < 3 && !spaceReady)) {
    const missing = ['site', 'target', 'campaign'].filter((x) => !given.includes(x));
    const partial = given.length > 0 ? ` (the scenario gives ${given.join(' and ')} but not ${missing.join(' or ')}, so no calendar is computed)` : '';
    return { assumes_every_transit_whole: true, statement: WHOLE_TRANSITS_ASSUMED.replace('given:', `given${partial}:`), plan: null };
  }
  const plan = nightsPlan(s, needed, source);
  return { assumes_every_transit_whole: false, statement: needed === null ? `The detection target is not reached at any value in range, so no booking is planned; for reference: ${plan.statement}` : plan.statement, plan };
}

/** The budget's note on the site while the simulation itself still observes whole transits (the scenario's caution, reworded for the budget). */
export function siteNote(o: Observability): string {
  if (o.plan?.visits) return 'visibility: the Monte Carlo simulates whole transits; the visibility pattern turns the count it needs into the epochs, visits and calendar time below';
  return o.plan
    ? 'site: the Monte Carlo simulates whole transits at the noise budget\'s fixed air mass; the site turns the count it needs into the epochs, nights and calendar time below'
    : 'site: given, but without target and campaign no calendar is computed: the budget assumes every transit is observed whole';
}

/** The sentence after a budget's answer that turns its whole, consecutive transits into what the sky allows. */
export function wholeToSky(p: NightsPlan): string {
  const where = p.visits ? `${p.sites[0]}'s visibility pattern` : p.sites.length === 1 ? p.sites[0] : 'the network';
  if (p.needed_length_s === null) return `Those hours assume whole, consecutive transits: from ${where} the ${p.visits ? 'pattern' : 'sky'} does not allow them (see the observing calendar).`;
  return `Those hours assume whole, consecutive transits; from ${where} ${p.visits ? 'the pattern' : 'the sky'} allows them as ${p.epochs_booked} epochs, ${p.nights} ${p.visits ? 'visits' : 'nights'} and ${(p.on_sky_s / HOUR_S).toFixed(1)} h on sky over ${(p.needed_length_s / DAY_S).toFixed(0)} days (the observing calendar below).`;
}

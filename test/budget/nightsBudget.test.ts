/**
 * The budget in the observer's units (src/budget/nightsBudget.ts): booked
 * epochs lie in the calendar and are observable; the calendar time follows the
 * expected-value rule and grows as the clear fraction falls; a campaign too
 * short is extended forward and said so; the ramp coverage agrees with an
 * independent minute-by-minute computation of the sky.
 */
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { parse } from 'yaml';
import { parseScenario } from '../../src/scenario/parseScenario.js';
import { nightsPlan, rampCoverage, budgetObservability, WHOLE_TRANSITS_ASSUMED } from '../../src/budget/nightsBudget.js';
import { transitCalendar } from '../../src/sky/calendar.js';
import { sunAltitudeDeg, targetAltitudeDeg } from '../../src/sky/skyPosition.js';
import { airmassKastenYoung } from '../../src/sky/airmass.js';
import { utcSFromDate } from '../../src/sky/timeScales.js';
import type { Scenario } from '../../src/scenario/types.js';
import { planBudget } from '../../src/app/planBudget.js';
import { formatBudget } from '../../src/budget/formatBudget.js';
import { perYear } from '../../src/budget/formatNights.js';
import { budgetToJson } from '../../src/budget/budgetJson.js';
import { renderBudgetPage } from '../../src/report/budgetPage.js';
import { loadSchema, schemaProblems } from '../helpers/jsonSchema.js';

const proposalPath = new URL('../../scenarios/demo-proposal.yaml', import.meta.url).pathname;
const proposalDoc = parse(readFileSync(proposalPath, 'utf8')) as Record<string, unknown>;
const withConstraints = (clear: number): Scenario =>
  parseScenario({ ...proposalDoc, constraints: { sun_altitude: '-12 deg', airmass: 2.0, clear_fraction: clear } }, 'test');
const utc = (iso: string) => utcSFromDate(new Date(iso));

describe('nightsPlan', () => {
  it('books only epochs of the calendar whose transit is partly observable, with a window inside the observable sky', () => {
    const s = withConstraints(0.7);
    const plan = nightsPlan(s, 3);
    const cal = transitCalendar(s);
    const byEpoch = new Map(cal.transits.map((r) => [r.epoch, r]));
    expect(plan.bookings.length).toBeGreaterThan(0);
    expect(plan.campaign_sufficient).toBe(true);
    for (const b of plan.bookings) {
      const row = byEpoch.get(b.epoch);
      expect(row).toBeDefined(); // in the calendar of the campaign
      expect(row!.transit_coverage).toBeGreaterThan(0); // coverage > 0
      expect(b.whole_equivalent).toBeGreaterThan(0);
      // The booked window lies in the book window of the calendar and contains the observable stretch.
      expect(utc(b.book_start_utc)).toBeGreaterThanOrEqual(utc(row!.book_start_utc) - 1);
      expect(utc(b.book_end_utc)).toBeLessThanOrEqual(utc(row!.book_end_utc) + 1);
      expect(b.on_sky_s).toBeGreaterThanOrEqual(b.in_transit_s);
    }
    // Totals add up (common practice, no source).
    expect(plan.on_sky_s).toBeCloseTo(plan.bookings.reduce((x, b) => x + b.on_sky_s, 0), 6);
    expect(plan.baseline_s).toBeCloseTo(plan.on_sky_s - plan.in_transit_s, 6);
    expect(plan.nights).toBe(new Set(plan.bookings.map((b) => b.night)).size);
    // The per-year totals add up to the plan's (common practice, no source).
    const years = perYear(plan);
    expect(years.reduce((x, y) => x + y.nights, 0)).toBe(plan.nights);
    expect(years.reduce((x, y) => x + y.on_sky_s, 0)).toBeCloseTo(plan.on_sky_s, 6);
    expect(years.reduce((x, y) => x + y.expected_whole_equivalent, 0)).toBeCloseTo(plan.expected_whole_equivalent, 9);
  });

  it('checks each booked window against an independent point-by-point sky: Sun below −12° and air mass ≤ 2 at its ends (astronomy-engine point functions, not EpochSky)', () => {
    const s = withConstraints(0.7);
    const site = s.sky!.sites[0];
    const target = s.sky!.target!;
    const plan = nightsPlan(s, 3);
    for (const b of plan.bookings) {
      for (const t of [utc(b.book_start_utc) + 60, utc(b.book_end_utc) - 60]) {
        // 60 s inside each end: the limits are placed to ≤ 1 s by interpolation (calendar.ts); 60 s keeps clear of rounding.
        expect(sunAltitudeDeg(t, site)).toBeLessThan(-12 + 0.01);
        expect(airmassKastenYoung(targetAltitudeDeg(t, site, target))).toBeLessThan(2.0 + 0.01);
      }
    }
  });

  it('ramp coverage of partial transits agrees with a 30-s brute-force scan of the sky within 0.03 (independent: point functions of astronomy-engine)', () => {
    const s = withConstraints(0.7);
    const site = s.sky!.sites[0];
    const target = s.sky!.target!;
    const cal = transitCalendar(s);
    const plan = nightsPlan(s, 3);
    const partial = plan.bookings.filter((b) => b.class !== 'full').slice(0, 3);
    expect(partial.length).toBeGreaterThan(0);
    for (const b of partial) {
      const row = cal.transits.find((r) => r.epoch === b.epoch)!;
      const t1 = utc(row.transit_start_utc);
      const t4 = utc(row.transit_end_utc);
      const tau = cal.ingress_duration_s;
      const frac = (a: number, z: number) => {
        let n = 0;
        let ok = 0;
        for (let t = a + 15; t < z; t += 30) {
          n++;
          if (sunAltitudeDeg(t, site) < -12 && airmassKastenYoung(targetAltitudeDeg(t, site, target)) <= 2) ok++;
        }
        return ok / n;
      };
      expect(b.ingress_coverage).toBeCloseTo(frac(t1, t1 + tau), 1);
      expect(Math.abs(b.ingress_coverage - frac(t1, t1 + tau))).toBeLessThan(0.03);
      expect(Math.abs(b.egress_coverage - frac(t4 - tau, t4))).toBeLessThan(0.03);
      expect(b.whole_equivalent).toBeCloseTo((b.ingress_coverage + b.egress_coverage) / 2, 12);
    }
  });

  it('rampCoverage: a whole transit counts 1, one whole ramp ½, the middle alone 0 (Carter et al. 2008: the t_c information is in the ramps)', () => {
    expect(rampCoverage([[0, 100]], 10, 90, 10).equivalent).toBe(1);
    expect(rampCoverage([[0, 50]], 10, 90, 10).equivalent).toBe(0.5);
    expect(rampCoverage([[60, 100]], 10, 90, 10).equivalent).toBe(0.5);
    expect(rampCoverage([[30, 60]], 10, 90, 10).equivalent).toBe(0);
    expect(rampCoverage([[15, 100]], 10, 90, 10).equivalent).toBeCloseTo(0.75, 12);
  });

  it('calendar time grows as clear_fraction falls and equals the expected-value rule: the first K epochs in date order with c·Σw ≥ N (derived in nightsBudget.ts)', () => {
    const N = 4;
    // The whole-transit equivalents per epoch (they do not depend on c) from the plan that looks furthest ahead.
    const cs = [0.9, 0.7, 0.5, 0.3];
    const plans = cs.map((c) => nightsPlan(withConstraints(c), N));
    const all = plans[plans.length - 1];
    const ws = all.epochs.map((e) => e.whole_equivalent);
    const ends: number[] = [];
    for (const [j, c] of cs.entries()) {
      const plan = plans[j];
      for (const e of plan.epochs) expect(e.expected_whole_equivalent).toBeCloseTo(c * e.whole_equivalent, 9);
      let sum = 0;
      let k = -1;
      for (let i = 0; i < ws.length; i++) {
        sum += c * ws[i];
        if (sum >= N - 1e-9 && ws[i] > 0) {
          k = i;
          break;
        }
      }
      expect(k).toBeGreaterThanOrEqual(0);
      const booked = ws.slice(0, k + 1).filter((w) => w > 0).length;
      expect(plan.epochs_booked).toBe(booked);
      expect(plan.bookings[plan.bookings.length - 1].epoch).toBe(all.epochs[k].epoch);
      expect(plan.needed_length_s).not.toBeNull();
      ends.push(plan.needed_length_s!);
    }
    for (let i = 1; i < ends.length; i++) expect(ends[i]).toBeGreaterThanOrEqual(ends[i - 1]);
    expect(ends[ends.length - 1]).toBeGreaterThan(ends[0]);
  });

  it('a fractional count: booking stops at the first epoch where c·Σw reaches it (derived: expectation is linear)', () => {
    const s = withConstraints(0.5);
    const plan = nightsPlan(s, 0.5);
    let sum = 0;
    let count = 0;
    for (const e of plan.epochs) {
      if (e.whole_equivalent <= 0) continue;
      sum += 0.5 * e.whole_equivalent;
      count++;
      if (sum >= 0.5 - 1e-9) break;
    }
    expect(plan.epochs_booked).toBe(count);
  });

  it('a campaign too short says so and gives the longer campaign, extending the calendar forward', () => {
    const s = withConstraints(0.7);
    const plan = nightsPlan(s, 20);
    expect(plan.campaign_sufficient).toBe(false);
    expect(plan.statement).toContain('That is not enough');
    expect(plan.extended_by_s).toBeGreaterThan(0);
    expect(plan.needed_length_s!).toBeGreaterThan(plan.campaign_length_s);
    expect(plan.bookings.some((b) => utc(b.mid_time_utc) > utc(plan.campaign_end_utc))).toBe(true);
    // The epochs beyond the campaign are those of the extended calendar, observable (coverage > 0).
    const longer = parseScenario({ ...proposalDoc, campaign: { start: '2027-01-01', end: plan.needed_end_utc!.slice(0, 10) } }, 'test');
    const cal = transitCalendar(longer);
    const cover = new Map(cal.transits.map((r) => [r.epoch, r.transit_coverage]));
    for (const b of plan.bookings) expect(cover.get(b.epoch) ?? 0).toBeGreaterThan(0);
    // The 90 % campaign is at least as long as the expected one, and the booked chance sits below 90 % (common practice, no source).
    expect(plan.confident_length_s!).toBeGreaterThanOrEqual(plan.needed_length_s!);
    expect(plan.probability_enough!).toBeLessThan(0.9);
  });

  it('a target that never rises: no length works, said plainly', () => {
    const s = parseScenario({ ...proposalDoc, target: { ra: '08:41:12.5', dec: '+75:00:00' } }, 'test');
    const plan = nightsPlan(s, 3);
    expect(plan.needed_length_s).toBeNull();
    expect(plan.bookings).toHaveLength(0);
    expect(plan.statement).toContain('never rises');
  });
});

describe('a network', () => {
  it('each epoch expects between c·max_s w_s and min(w_union, c·Σ_s w_s) (derived: at least the best site when it alone is clear; union bound)', () => {
    const s = parseScenario(parse(readFileSync(new URL('../../scenarios/demo-calendar.yaml', import.meta.url).pathname, 'utf8')), 'test');
    const c = s.sky!.constraints.clearFraction;
    const plan = nightsPlan(s, 5);
    let both = 0;
    for (const e of plan.epochs) {
      const ws = plan.season.filter((p) => p.epoch === e.epoch).map((p) => p.whole_equivalent);
      if (ws.filter((w) => w > 0).length > 1) both++;
      expect(e.expected_whole_equivalent).toBeGreaterThanOrEqual(c * Math.max(...ws) - 1e-9);
      expect(e.expected_whole_equivalent).toBeLessThanOrEqual(Math.min(e.whole_equivalent, c * ws.reduce((a, b) => a + b, 0)) + 1e-9);
    }
    expect(both).toBeGreaterThan(0); // the bounds were tested where two sites share an epoch
  });
});

describe('budgetObservability', () => {
  it('without a site: assumes every transit whole, and says so', () => {
    const { site: _s, target: _t, campaign: _c, constraints: _k, ...rest } = proposalDoc;
    const o = budgetObservability(parseScenario(rest, 'test'), 5);
    expect(o.assumes_every_transit_whole).toBe(true);
    expect(o.plan).toBeNull();
    expect(o.statement).toBe(WHOLE_TRANSITS_ASSUMED);
    const partial = budgetObservability(parseScenario({ ...rest, site: proposalDoc.site }, 'test'), 5);
    expect(partial.assumes_every_transit_whole).toBe(true);
    expect(partial.statement).toContain('not target or campaign');
  });
});

describe('budget with and without a site: screen, JSON and page', () => {
  const quick = { forecastOnly: true };
  it('with a site: the answer in epochs, nights, hours and calendar time; the page holds the season chart and the booking table; the JSON validates', () => {
    const r = planBudget(parseScenario(proposalDoc, 'test'), quick);
    expect(r.observability.assumes_every_transit_whole).toBe(false);
    const text = formatBudget(r);
    expect(text).toContain('Observing calendar');
    expect(text).toMatch(/nights\s+\d+/);
    expect(text).toMatch(/hours on sky\s+[\d.]+ h/);
    expect(text).toContain('Epochs to book');
    const json = budgetToJson(r);
    expect(json.assumes_every_transit_whole).toBe(false);
    expect(json.observing_plan!.bookings.length).toBeGreaterThan(0);
    expect(schemaProblems(loadSchema('budget'), JSON.parse(JSON.stringify(json)))).toEqual([]);
    const html = renderBudgetPage(r);
    expect(html).toContain('<div id="season" class="plot"></div>');
    expect(html).toContain('"id":"season"');
    expect(html).toContain('<table class="bookings">');
    expect(html).not.toContain('id="whole-transits"');
  });

  it('without a site: the whole-transit assumption on screen, as a JSON field and on the page', () => {
    const { site: _s, target: _t, campaign: _c, constraints: _k, ...rest } = proposalDoc;
    const r = planBudget(parseScenario(rest, 'test'), quick);
    expect(formatBudget(r)).toContain(WHOLE_TRANSITS_ASSUMED.slice(0, 60));
    const json = budgetToJson(r);
    expect(json.assumes_every_transit_whole).toBe(true);
    expect(json.observability).toBe(WHOLE_TRANSITS_ASSUMED);
    expect(json.observing_plan).toBeNull();
    expect(schemaProblems(loadSchema('budget'), JSON.parse(JSON.stringify(json)))).toEqual([]);
    const html = renderBudgetPage(r);
    expect(html).toContain('id="whole-transits"');
    expect(html).toContain('every transit is assumed observed whole');
    expect(html).not.toContain('<table class="bookings">');
  });
});

describe('budget of a space instrument (visibility pattern)', () => {
  it('takes the pattern\'s start from the campaign, as the calendar does: the search over whole transits drops every sky block at once', () => {
    const space = parse(readFileSync(new URL('../../scenarios/demo-space.yaml', import.meta.url), 'utf8')) as Record<string, unknown>;
    const { start: _start, ...visibility } = space.visibility as Record<string, unknown>;
    const s = parseScenario({ ...space, visibility }, 'test');
    expect(transitCalendar(s).transits.length).toBeGreaterThan(0);
    // Before, the budget dropped site/target/campaign/constraints but kept `visibility`, which then lacked
    // its start (the campaign's) and was refused as an input error.
    const r = planBudget(s, { forecastOnly: true });
    expect(r.observability.assumes_every_transit_whole).toBe(false);
  });
});

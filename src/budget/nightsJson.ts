/**
 * The budget's observability in the project's vocabulary (docs/vocabulary.md):
 * snake_case keys, SI with unit suffixes, times as ISO 8601 UTC text.
 */
import type { BookingCoverage, NightBooking, NightsPlan, Observability, PlanEpoch, SeasonPoint } from './nightsBudget.js';
import { PLAN_CONFIDENCE } from './nightsBudget.js';

export interface NightBookingJson extends BookingCoverage {
  epoch: number;
  site: string;
  night_of: string;
  mid_time_utc: string;
  booked_start_utc: string;
  booked_end_utc: string;
  on_sky_time_s: number;
  in_transit_time_s: number;
}

export interface PlanEpochJson {
  epoch: number;
  mid_time_utc: string;
  whole_equivalent: number;
  expected_whole_equivalent: number;
  whole_probability: number;
  cumulative_expected_whole_equivalent: number;
  beyond_campaign: boolean;
}

/** A season point is already in the vocabulary (nightsBudget.ts). */
export type SeasonPointJson = SeasonPoint;

export interface ObservingPlanJson {
  transits_needed: number | null;
  clear_fraction: number;
  site_names: string[];
  campaign_start_utc: string;
  campaign_end_utc: string;
  campaign_length_s: number;
  campaign_transits: number;
  campaign_usable_transits: number;
  campaign_full_transits: number;
  campaign_expected_whole_equivalent: number;
  campaign_sufficient: boolean;
  needed_campaign_length_s: number | null;
  needed_campaign_end_utc: string | null;
  probability_enough: number | null;
  confidence: number;
  confident_campaign_length_s: number | null;
  confident_campaign_end_utc: string | null;
  calendar_extended_by_s: number;
  epochs_booked: number;
  nights: number;
  on_sky_time_s: number;
  in_transit_time_s: number;
  baseline_time_s: number;
  expected_whole_equivalent: number;
  expected_whole_transits: number;
  statement: string;
  counting_rule: string;
  notes: string[];
  assumptions: string[];
  bookings: NightBookingJson[];
  epochs: PlanEpochJson[];
  season: SeasonPointJson[];
}

const booking = (b: NightBooking): NightBookingJson => ({
  epoch: b.epoch,
  site: b.site,
  night_of: b.night,
  mid_time_utc: b.mid_time_utc,
  booked_start_utc: b.book_start_utc,
  booked_end_utc: b.book_end_utc,
  on_sky_time_s: b.on_sky_s,
  in_transit_time_s: b.in_transit_s,
  transit_coverage: b.transit_coverage,
  ingress_coverage: b.ingress_coverage,
  egress_coverage: b.egress_coverage,
  whole_equivalent: b.whole_equivalent,
  baseline_before_coverage: b.baseline_before_coverage,
  baseline_after_coverage: b.baseline_after_coverage,
  airmass_start: b.airmass_start,
  airmass_middle: b.airmass_middle,
  airmass_end: b.airmass_end,
  class: b.class,
});

const epoch = (e: PlanEpoch): PlanEpochJson => ({
  epoch: e.epoch,
  mid_time_utc: e.mid_time_utc,
  whole_equivalent: e.whole_equivalent,
  expected_whole_equivalent: e.expected_whole_equivalent,
  whole_probability: e.whole_probability,
  cumulative_expected_whole_equivalent: e.cumulative_expected,
  beyond_campaign: e.beyond_campaign,
});

const season = (p: SeasonPoint): SeasonPointJson => ({ ...p });

export function observingPlanToJson(p: NightsPlan): ObservingPlanJson {
  return {
    transits_needed: p.transits_needed,
    clear_fraction: p.clear_fraction,
    site_names: p.sites,
    campaign_start_utc: p.campaign_start_utc,
    campaign_end_utc: p.campaign_end_utc,
    campaign_length_s: p.campaign_length_s,
    campaign_transits: p.campaign.transits,
    campaign_usable_transits: p.campaign.usable,
    campaign_full_transits: p.campaign.full,
    campaign_expected_whole_equivalent: p.campaign.expected_whole_equivalent,
    campaign_sufficient: p.campaign_sufficient,
    needed_campaign_length_s: p.needed_length_s,
    needed_campaign_end_utc: p.needed_end_utc,
    probability_enough: p.probability_enough,
    confidence: PLAN_CONFIDENCE,
    confident_campaign_length_s: p.confident_length_s,
    confident_campaign_end_utc: p.confident_end_utc,
    calendar_extended_by_s: p.extended_by_s,
    epochs_booked: p.epochs_booked,
    nights: p.nights,
    on_sky_time_s: p.on_sky_s,
    in_transit_time_s: p.in_transit_s,
    baseline_time_s: p.baseline_s,
    expected_whole_equivalent: p.expected_whole_equivalent,
    expected_whole_transits: p.expected_whole_transits,
    statement: p.statement,
    counting_rule: p.counting_rule,
    notes: p.notes,
    assumptions: p.assumptions,
    bookings: p.bookings.map(booking),
    epochs: p.epochs.map(epoch),
    season: p.season.map(season),
  };
}

/** The three top-level keys of the budget document that carry observability. */
export function observabilityToJson(o: Observability): { assumes_every_transit_whole: boolean; observability: string; observing_plan: ObservingPlanJson | null } {
  return { assumes_every_transit_whole: o.assumes_every_transit_whole, observability: o.statement, observing_plan: o.plan && observingPlanToJson(o.plan) };
}

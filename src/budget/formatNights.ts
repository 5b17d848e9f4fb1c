/** The readable form of a budget's observability: the nights plan (epochs to book, nights, hours, calendar time), or the whole-transit statement. */
import { HOUR_S } from '../physics/constants.js';
import type { NightsPlan, Observability } from './nightsBudget.js';

const hm = (iso: string) => iso.slice(5, 16).replace('T', ' ');
const pc = (x: number | null) => (x === null ? '  -' : `${Math.round(100 * x)}`.padStart(3) + '%');
const am = (x: number | null) => (x === null ? '-' : x.toFixed(2));

/** The booking table: one line per epoch and site. */
export function bookingLines(p: NightsPlan): string[] {
  const siteW = Math.max(4, ...p.bookings.map((b) => b.site.length));
  const lines = [`  ${'epoch'.padStart(5)}  ${'site'.padEnd(siteW)}  ${'night of'.padEnd(10)}  ${'book (UTC)'.padEnd(23)}  ${'on sky'.padStart(6)}  cover  ingr/egr   equiv  air mass s/m/e   class`];
  for (const b of p.bookings) {
    lines.push(
      `  ${String(b.epoch).padStart(5)}  ${b.site.padEnd(siteW)}  ${b.night.slice(0, 10).padEnd(10)}  ${hm(b.book_start_utc)}–${b.book_end_utc.slice(11, 16)}  ${`${(b.on_sky_s / HOUR_S).toFixed(1)} h`.padStart(6)}  ${pc(b.transit_coverage)}  ${pc(b.ingress_coverage)}/${pc(b.egress_coverage).trim().padEnd(4)}  ${b.whole_equivalent.toFixed(2).padStart(5)}  ${`${am(b.airmass_start)}/${am(b.airmass_middle)}/${am(b.airmass_end)}`.padEnd(15)}  ${b.class}`,
    );
  }
  return lines;
}

/** One calendar year of the bookings (by the local date of each night). */
export interface YearTotals {
  year: string;
  nights: number;
  on_sky_s: number;
  expected_whole_equivalent: number;
}

/** Nights, hours on sky and expected whole-transit equivalents per calendar year of the bookings (for a proposal per semester or year). */
export function perYear(p: NightsPlan): YearTotals[] {
  const years = new Map<string, { nights: Set<string>; onSky: number; equivalent: number }>();
  const booked = new Set(p.bookings.map((b) => b.epoch));
  const expected = new Map(p.epochs.map((e) => [e.epoch, e.expected_whole_equivalent]));
  const counted = new Set<number>();
  for (const b of p.bookings) {
    const y = b.night.slice(0, 4);
    const e = years.get(y) ?? { nights: new Set<string>(), onSky: 0, equivalent: 0 };
    for (const n of b.night.split(', ')) e.nights.add(`${b.site}|${n}`);
    e.onSky += b.on_sky_s;
    if (booked.has(b.epoch) && !counted.has(b.epoch)) {
      counted.add(b.epoch);
      e.equivalent += expected.get(b.epoch) ?? 0;
    }
    years.set(y, e);
  }
  return [...years.entries()].sort((a, b) => (a[0] < b[0] ? -1 : 1)).map(([year, e]) => ({ year, nights: e.nights.size, on_sky_s: e.onSky, expected_whole_equivalent: e.equivalent }));
}

export function perYearLines(p: NightsPlan): string[] {
  const lines = [`  ${'year'.padEnd(6)}${'nights'.padStart(7)}${'hours on sky'.padStart(14)}${'expected equivalents'.padStart(22)}`];
  for (const y of perYear(p)) lines.push(`  ${y.year.padEnd(6)}${String(y.nights).padStart(7)}${(y.on_sky_s / HOUR_S).toFixed(1).padStart(14)}${y.expected_whole_equivalent.toFixed(2).padStart(22)}`);
  return lines;
}

export function formatObservability(o: Observability): string[] {
  if (!o.plan) return ['', 'Observability', `  ${o.statement}`];
  const p = o.plan;
  const head = p.visits ? `${p.sites[0]}, visibility pattern, no weather` : `${p.sites.join(', ')}; clear nights ${Math.round(100 * p.clear_fraction)} % of the time`;
  const lines = ['', `Observing calendar (${head})`, `  ${o.statement}`];
  if (p.transits_needed !== null && p.needed_length_s !== null) {
    lines.push(
      '',
      `  transits needed         ${p.transits_needed} whole-transit equivalents`,
      `  epochs to book          ${p.epochs_booked} (${p.expected_whole_equivalent.toFixed(1)} equivalents and ${p.expected_whole_transits.toFixed(1)} whole transits expected after weather)`,
      `  ${p.visits ? 'visits ' : 'nights '}                 ${p.nights}`,
      `  hours on sky            ${(p.on_sky_s / HOUR_S).toFixed(1)} h (${(p.in_transit_s / HOUR_S).toFixed(1)} h in transit, ${(p.baseline_s / HOUR_S).toFixed(1)} h of baselines)`,
      `  calendar time           ${(p.needed_length_s / 86400).toFixed(0)} days from ${p.campaign_start_utc.slice(0, 10)}, to ${p.needed_end_utc!.slice(0, 10)}${p.campaign_sufficient ? '' : ' (beyond the campaign as given)'}`,
      `  chance of the count     ${p.probability_enough === null ? '-' : p.probability_enough.toFixed(2)} with these bookings; ${p.confident_length_s === null ? 'a 90 % chance is not reached' : `90 % after ${(p.confident_length_s / 86400).toFixed(0)} days, to ${p.confident_end_utc!.slice(0, 10)}`}`,
    );
  }
  if (p.bookings.length > 0) lines.push('', '  Per year (by the local date of each night):', ...perYearLines(p));
  if (p.bookings.length > 0) lines.push('', '  Epochs to book (first to last contact ± baselines ± 3σ of the ephemeris, where the sky allows):', ...bookingLines(p));
  lines.push('', `  How partial transits count: ${p.counting_rule}.`);
  for (const n of p.notes) lines.push(`  note: ${n}`);
  lines.push('  What the calendar plan leaves out:');
  for (const a of p.assumptions) lines.push(`    - ${a}`);
  return lines;
}

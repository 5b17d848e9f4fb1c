/**
 * The calendar on a page: a season chart (each transit's observable fraction
 * of first-to-last contact against its date, one series per site, epochs
 * beyond the campaign as given drawn hollow, booked epochs ringed) and the
 * table of nights to book. Pure functions of a NightsPlan.
 */
import type { NightsPlan } from '../budget/nightsBudget.js';
import { escapeHtml } from './escape.js';
import type { Figure } from './plotlyPage.js';
import { perYear } from '../budget/formatNights.js';

const COLOURS = ['#1f77b4', '#d62728', '#2ca02c', '#9467bd', '#8c564b', '#e377c2'];

export function seasonFigure(p: NightsPlan, id = 'season'): Figure {
  const booked = new Set(p.bookings.map((b) => `${b.epoch}|${b.site}`));
  const data: unknown[] = [];
  p.sites.forEach((site, k) => {
    const pts = p.season.filter((x) => x.site === site);
    const colour = COLOURS[k % COLOURS.length];
    data.push({
      type: 'scatter', mode: 'markers', name: `${site}: observable fraction of the transit`,
      x: pts.map((x) => x.mid_time_utc), y: pts.map((x) => x.transit_coverage),
      text: pts.map((x) => `epoch ${x.epoch}: ${Math.round(100 * x.transit_coverage)} % of the transit, ${x.whole_equivalent.toFixed(2)} whole-transit equivalent${x.beyond_campaign ? ' (beyond the campaign)' : ''}`),
      hoverinfo: 'x+text',
      marker: { color: pts.map((x) => (x.beyond_campaign ? '#ffffff' : colour)), line: { color: colour, width: 1.5 }, size: pts.map((x) => (booked.has(`${x.epoch}|${site}`) ? 11 : 7)), symbol: pts.map((x) => (booked.has(`${x.epoch}|${site}`) ? 'diamond' : 'circle')) },
    });
  });
  const end = p.campaign_end_utc;
  const top = 1.05;
  data.push({ type: 'scatter', mode: 'lines', name: 'end of the campaign as given', x: [end, end], y: [0, top], line: { color: '#555', dash: 'dash' }, hoverinfo: 'skip' });
  if (p.needed_end_utc !== null && p.needed_end_utc !== end) {
    data.push({ type: 'scatter', mode: 'lines', name: 'end of the calendar time needed (expected count)', x: [p.needed_end_utc, p.needed_end_utc], y: [0, top], line: { color: '#ff7f0e', dash: 'dot' }, hoverinfo: 'skip' });
  }
  return {
    id,
    data,
    layout: {
      title: { text: 'Season chart: observable fraction of each transit' },
      xaxis: { title: { text: 'date of mid-transit (UTC)' }, type: 'date' },
      yaxis: { title: { text: 'observable fraction of first-to-last contact' }, range: [-0.03, top] },
      legend: { orientation: 'h', y: -0.25 },
      margin: { t: 50 },
    },
  };
}

const pc = (x: number | null) => (x === null ? '—' : `${Math.round(100 * x)} %`);
const am = (x: number | null) => (x === null ? '—' : x.toFixed(2));

/** The nights to book as an HTML table. */
export function bookingTableHtml(p: NightsPlan): string {
  if (p.bookings.length === 0) return '<p>No epoch to book: no transit of the campaign shows any ingress or egress under the constraints.</p>';
  const rows = p.bookings.map((b) => `<tr><td>${b.epoch}</td><td>${escapeHtml(b.site)}</td><td>${escapeHtml(b.night)}</td><td>${escapeHtml(b.book_start_utc.replace('T', ' ').replace('Z', ''))} – ${escapeHtml(b.book_end_utc.slice(11, 16))}</td><td>${(b.on_sky_s / 3600).toFixed(1)} h</td><td>${pc(b.transit_coverage)}</td><td>${pc(b.ingress_coverage)} / ${pc(b.egress_coverage)}</td><td>${b.whole_equivalent.toFixed(2)}</td><td>${am(b.airmass_start)} / ${am(b.airmass_middle)} / ${am(b.airmass_end)}</td><td>${escapeHtml(b.class.replace(/_/g, ' '))}</td></tr>`).join('\n');
  return `<table class="bookings"><thead><tr><th>epoch</th><th>site</th><th>night of</th><th>book (UTC)</th><th>on sky</th><th>transit seen</th><th>ingress / egress</th><th>whole-transit equivalent</th><th>air mass start / middle / end</th><th>class</th></tr></thead><tbody>
${rows}
</tbody></table>
<p class="note">Totals: ${p.epochs_booked} epochs, ${p.nights} nights, ${(p.on_sky_s / 3600).toFixed(1)} h on sky (${(p.in_transit_s / 3600).toFixed(1)} h in transit, ${(p.baseline_s / 3600).toFixed(1)} h of baselines). ${escapeHtml(p.counting_rule.charAt(0).toUpperCase() + p.counting_rule.slice(1))}.</p>`;
}

/** Nights, hours on sky and expected equivalents per year of the bookings. */
export function perYearTableHtml(p: NightsPlan): string {
  const rows = perYear(p);
  if (rows.length === 0) return '';
  return `<p>Per year, by the local date of each night:</p>
<table class="per-year"><thead><tr><th>year</th><th>nights</th><th>hours on sky</th><th>expected whole-transit equivalents</th></tr></thead><tbody>
${rows.map((y) => `<tr><td>${escapeHtml(y.year)}</td><td>${y.nights}</td><td>${(y.on_sky_s / 3600).toFixed(1)} h</td><td>${y.expected_whole_equivalent.toFixed(2)}</td></tr>`).join('\n')}
</tbody></table>
<p>Each booking:</p>`;
}

/** The calendar section of a page: statement, season chart, booking table, notes and what the plan leaves out. */
export function calendarSectionHtml(statement: string, p: NightsPlan, heading: string, id = 'season'): string {
  const list = (xs: string[]) => (xs.length ? `<ul>${xs.map((x) => `<li>${escapeHtml(x)}</li>`).join('')}</ul>` : '');
  return `<section id="calendar-section">
<h2>${escapeHtml(heading)}</h2>
<p>${escapeHtml(statement)}</p>
<div id="${id}" class="plot"></div>
<p class="note">Each point is one transit at one site: the fraction of first to last contact with the Sun below the altitude limit and the target within the air-mass limit. Diamonds: booked; filled: inside the campaign as given; hollow: beyond it (the calendar extended forward).</p>
<h3>Nights to book</h3>
${perYearTableHtml(p)}
${bookingTableHtml(p)}
${p.notes.length ? `<h3>Calendar notes</h3>${list(p.notes)}` : ''}
<h3>What the calendar plan leaves out</h3>${list(p.assumptions)}
</section>`;
}

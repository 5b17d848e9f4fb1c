/** `moonsieve calendar SCENARIO [--out FILE] [--json]`: which transits of the campaign each site can observe. */
import type { Command } from 'commander';
import { extname } from 'node:path';
import { loadScenario } from '../scenario/loadScenario.js';
import { formatCautions } from '../scenario/parseScenario.js';
import { InputError } from '../scenario/errors.js';
import { SITE_CALENDAR_ONLY } from '../scenario/readSky.js';
import { VISIBILITY_CALENDAR_ONLY } from '../scenario/readVisibility.js';
import { transitCalendar, type CalendarCounts, type CalendarResult } from '../sky/calendar.js';
import { renderTable, type TableColumn } from '../io/ecsv.js';
import { writeFileAtomic } from '../io/atomicWrite.js';
import { checkOutputFile } from '../io/outputPaths.js';
import type { CliIo } from './cliIo.js';

export function registerCalendar(program: Command, io: CliIo): void {
  program
    .command('calendar')
    .description('every transit of the campaign at the scenario\'s site(s) or for its space instrument\'s visibility pattern: which are observable, when (UTC and BJD_TDB), how much of each transit and its baselines, air mass')
    .argument('<scenario>', 'scenario YAML file with site, target and campaign blocks (or visibility and campaign)')
    .option('--out <file>', 'write the table as ECSV (.ecsv) or CSV (.csv)')
    .option('--json', 'print JSON ({"schema": "moonsieve/calendar/1", "transits": [...]}) instead of the table')
    .action((scenarioPath: string, opts: { out?: string; json?: boolean }) => {
      if (opts.out !== undefined) {
        const ext = extname(opts.out).toLowerCase();
        if (ext !== '.ecsv' && ext !== '.csv') throw new InputError([{ path: '--out', value: opts.out, allowed: 'a file name ending in .ecsv or .csv' }]);
        checkOutputFile('--out', opts.out);
      }
      const scenario = loadScenario(scenarioPath);
      // Odd but legal inputs as note: lines, except the one saying that only this command reads the site.
      const own = scenario.cautions?.filter((c) => c.message !== SITE_CALENDAR_ONLY && c.message !== VISIBILITY_CALENDAR_ONLY);
      io.err(formatCautions(own ? Object.defineProperty({ ...scenario }, 'cautions', { value: own }) : scenario));
      const cal = transitCalendar(scenario, scenarioPath);
      if (opts.out !== undefined) writeFileAtomic(opts.out, renderTable(opts.out, calendarColumns(cal), calendarMeta(cal)));
      io.out(opts.json ? JSON.stringify(cal, null, 2) + '\n' : formatCalendar(cal));
      if (opts.out !== undefined && !opts.json) io.out(`wrote ${opts.out}\n`);
    });
}

const num = (x: number | null) => (x === null ? Number.NaN : x);

/** The per-site rows as table columns (ECSV/CSV). */
export function calendarColumns(cal: CalendarResult): TableColumn[] {
  const t = cal.transits;
  const str = (name: string, description: string, f: (i: number) => string | null): TableColumn => ({ name, datatype: 'string', description, values: t.map((_, i) => f(i) ?? '') });
  const flt = (name: string, unit: string | undefined, description: string, f: (i: number) => number | null): TableColumn => ({ name, datatype: 'float64', unit, description, values: t.map((_, i) => num(f(i))) });
  return [
    str('site', 'observing site', (i) => t[i].site),
    { name: 'epoch', datatype: 'int64', description: 'transit number n of t0 + nP', values: t.map((r) => r.epoch) },
    flt('mid_time_bjd_tdb', undefined, 'predicted barycentre mid-transit time, BJD_TDB (days)', (i) => t[i].mid_time_bjd_tdb),
    str('mid_time_utc', 'predicted mid-transit time at the site, UTC (ISO 8601)', (i) => t[i].mid_time_utc),
    flt('mid_time_sigma_s', 's', '1-sigma uncertainty of the predicted mid-time from t0_error and period_error', (i) => t[i].mid_time_sigma_s),
    str('transit_start_utc', 'first contact, UTC', (i) => t[i].transit_start_utc),
    str('transit_end_utc', 'last contact, UTC', (i) => t[i].transit_end_utc),
    str('book_start_utc', 'start of the window to book: first contact - baseline - 3 sigma, UTC', (i) => t[i].book_start_utc),
    str('book_end_utc', 'end of the window to book: last contact + baseline + 3 sigma, UTC', (i) => t[i].book_end_utc),
    str('observable_start_utc', 'start of the observable stretch holding most of the transit, UTC (empty: none)', (i) => t[i].observable_start_utc),
    str('observable_end_utc', 'end of that stretch, UTC (empty: none)', (i) => t[i].observable_end_utc),
    flt('observable_duration_s', 's', 'observable time inside the transit and its baselines', (i) => t[i].observable_duration_s),
    flt('transit_coverage', undefined, 'observable fraction of first-to-last contact (0-1)', (i) => t[i].transit_coverage),
    flt('baseline_before_coverage', undefined, 'observable fraction of the baseline before first contact (nan: no baseline)', (i) => t[i].baseline_before_coverage),
    flt('baseline_after_coverage', undefined, 'observable fraction of the baseline after last contact (nan: no baseline)', (i) => t[i].baseline_after_coverage),
    flt('airmass_start', undefined, 'air mass at the start of the observable stretch (Kasten & Young 1989)', (i) => t[i].airmass_start),
    flt('airmass_middle', undefined, 'air mass in the middle of the observable stretch', (i) => t[i].airmass_middle),
    flt('airmass_end', undefined, 'air mass at the end of the observable stretch', (i) => t[i].airmass_end),
    str('class', 'full, ingress_only, egress_only, ingress_and_egress, middle_only or none', (i) => t[i].class),
  ];
}

function calendarMeta(cal: CalendarResult): Record<string, unknown> {
  return {
    schema: cal.schema,
    scenario: cal.scenario,
    time_standard: cal.visibility ? 'mid_time_bjd_tdb and the visibility pattern: BJD_TDB; *_utc: UTC, ISO 8601' : 'mid_time_bjd_tdb: BJD_TDB; *_utc: UTC, ISO 8601',
    transit_duration_s: cal.transit_duration_s,
    baseline_s: cal.baseline_s,
    campaign: cal.campaign,
    constraints: cal.constraints,
    target: cal.target,
    visibility: cal.visibility,
    sites: cal.sites.map((s) => ({ name: s.name, latitude_deg: s.latitude_deg, longitude_deg: s.longitude_deg, altitude_m: s.altitude_m })),
    notes: cal.notes,
    assumptions: cal.assumptions,
  };
}

const hm = (iso: string | null) => (iso === null ? '--:--' : iso.slice(11, 16));
const pct = (x: number | null) => (x === null ? '   -' : `${Math.round(100 * x)}`.padStart(3) + '%');
const am = (x: number | null) => (x === null ? '  -' : x.toFixed(2));

function countsLine(label: string, c: CalendarCounts, clear: number): string {
  const weather = clear < 1 ? `; about ${c.expected_full.toFixed(1)} whole transits expected with clear nights ${Math.round(100 * clear)} % of the time` : '';
  return `${label}: ${c.transits} transits in the campaign, ${c.full} fully and ${c.partial} partly observable, ${c.none} not at all${weather}`;
}

/** The calendar as a screen table, one line per transit and site, then the counts and notes. */
export function formatCalendar(cal: CalendarResult): string {
  const lines: string[] = [];
  const h = (s: number) => `${(s / 3600).toFixed(2)} h`;
  lines.push(`${cal.scenario}: transit calendar from ${cal.campaign.start_utc.slice(0, 16).replace('T', ' ')} to ${cal.campaign.end_utc.slice(0, 16).replace('T', ' ')} UTC`);
  const c = cal.constraints;
  const v = cal.visibility;
  const observable = c
    ? `Sun below ${c.sun_altitude_deg.toFixed(1)}°, air mass ≤ ${c.airmass} (altitude ≥ ${c.min_target_altitude_deg.toFixed(1)}°)`
    : v
      ? `${v.name} visible ${(v.on_s / 60).toPrecision(3)} min of every ${((v.on_s + v.off_s) / 60).toPrecision(3)} min${v.block_s !== null ? `, in blocks of ${(v.block_s / 86400).toPrecision(3)} d every ${((v.block_s + v.gap_s) / 86400).toPrecision(3)} d` : ''} (BJD_TDB from ${v.start_bjd_tdb.toFixed(5)}; ${Math.round(100 * v.visible_fraction)} % of the time)`
      : 'as stated';
  lines.push(`  transit ${h(cal.transit_duration_s)} (first to last contact), baselines ${h(cal.baseline_s)} each side; observable: ${observable}`);
  lines.push('');
  const siteW = Math.max(4, ...cal.sites.map((s) => s.name.length));
  lines.push(`${'epoch'.padStart(5)}  ${'site'.padEnd(siteW)}  ${'mid-time UTC'.padEnd(16)}  ${'BJD_TDB'.padEnd(13)}  ${'±1σ'.padStart(6)}  observable UTC  cover  base -/+    air mass s/m/e  class`);
  for (const r of cal.transits) {
    const sig = r.mid_time_sigma_s >= 60 ? `${(r.mid_time_sigma_s / 60).toFixed(1)}m` : `${r.mid_time_sigma_s.toFixed(0)}s`;
    lines.push(
      `${String(r.epoch).padStart(5)}  ${r.site.padEnd(siteW)}  ${r.mid_time_utc.slice(0, 16).replace('T', ' ')}  ${r.mid_time_bjd_tdb.toFixed(5).padEnd(13)}  ${sig.padStart(6)}  ` +
        `${hm(r.observable_start_utc)}–${hm(r.observable_end_utc)}     ${pct(r.transit_coverage)}  ${pct(r.baseline_before_coverage)}/${pct(r.baseline_after_coverage).trim().padEnd(4)}  ` +
        `${am(r.airmass_start)}/${am(r.airmass_middle)}/${am(r.airmass_end)}  ${r.class}`,
    );
  }
  lines.push('');
  const clear = c ? c.clear_fraction : 1;
  for (const s of cal.sites) lines.push(countsLine(s.name, s.counts, clear));
  if (cal.sites.length > 1) lines.push(countsLine('network (any site)', cal.network_counts, clear));
  for (const n of cal.notes) lines.push(`note: ${n}`);
  lines.push('', 'What this leaves out:');
  for (const a of cal.assumptions) lines.push(`  - ${a}`);
  return lines.join('\n') + '\n';
}

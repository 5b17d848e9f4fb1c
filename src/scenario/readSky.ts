/**
 * The optional where-and-when blocks of a scenario (issue 18): `site` (one
 * mapping, or a list of them for a network), `target` (ICRS RA and Dec,
 * sexagesimal or degrees), `campaign` (UTC start and end) and `constraints`,
 * and the ephemeris uncertainties `observation.t0_error` and
 * `planet.period_error`. Fields, defaults and ranges are in fields.ts; here
 * the special forms (sexagesimal angles, dates) and the rules between fields.
 */
import { DAY_S, JULIAN_YEAR_S } from '../physics/constants.js';
import type { FieldProblem } from './errors.js';
import { FieldReader } from './fieldReader.js';
import { scenarioField, type ScenarioField } from './fields.js';
import type { CampaignSpec, ConstraintsSpec, SiteSpec, SkySpec, TargetSpec } from './types.js';
import { readVisibility } from './readVisibility.js';

const DEG = Math.PI / 180;
/** J2000.0 in UTC as Unix ms, 2000-01-01T12:00:00Z (the zero of CampaignSpec). */
const J2000_UNIX_MS = Date.UTC(2000, 0, 1, 12);
/** Campaign years allowed: those of the leap-second table (src/sky/timeScales.ts) up to 2099. */
const FIRST_MS = Date.UTC(1972, 0, 1);
const LAST_MS = Date.UTC(2100, 0, 1);

/** A reader of one entry of a list block (`site.1`) that takes its fields' table entries from the block's (`site`). */
class ListItemReader extends FieldReader {
  private readonly tablePrefix: string;
  constructor(obj: unknown, prefix: string, tablePrefix: string, problems: FieldProblem[]) {
    super(obj, prefix, problems);
    this.tablePrefix = tablePrefix;
  }
  override entry(key: string): ScenarioField {
    const f = scenarioField(`${this.tablePrefix}.${key}`);
    if (!f) throw new Error(`scenario field ${this.tablePrefix}.${key} is missing from the field table (src/scenario/fields.ts)`);
    return { ...f, path: this.path(key) };
  }
}

/**
 * The caution a scenario with a site carries until the simulation observes
 * only what the calendar says is observable (issue 18, items 4–6).
 */
/** The top-level blocks that place the observer on the sky: where, what, when, and the limits of observing. */
export const SKY_BLOCKS = ['site', 'target', 'campaign', 'constraints', 'visibility'] as const;

/**
 * A scenario document without its sky blocks: every transit seen whole, as the analytic forecast and
 * the budget's search over the transit count assume (with a campaign the simulation would observe only
 * the calendar's epochs instead: noise/observingPlan.ts).
 */
export function withoutSkyBlocks<T extends Record<string, unknown>>(doc: T): T {
  const out: Record<string, unknown> = { ...doc };
  for (const k of SKY_BLOCKS) delete out[k];
  return out as T;
}

export const SITE_CALENDAR_ONLY = 'with target and campaign, sweep and simulate observe only what the calendar finds observable (the campaign\'s transits replace observation.transits; partial transits, each exposure\'s air mass, weather per night); limits and budget still assume every transit is observed whole, at the fixed air mass of the noise budget';

/**
 * Read the sky blocks from the top-level reader. `periodErrorS` and
 * `t0ErrorS` are read by the caller from the planet and observation readers.
 * Returns undefined when none of the blocks nor errors were given.
 */
export function readSky(top: FieldReader, periodErrorS: number, t0ErrorS: number): SkySpec | undefined {
  const given = SKY_BLOCKS.some((k) => top.has(k)) || periodErrorS > 0 || t0ErrorS > 0;
  const sites = readSites(top);
  const target = readTarget(new FieldReader(top.raw('target'), 'target', top.problems), top.has('target'));
  const campaign = readCampaign(new FieldReader(top.raw('campaign'), 'campaign', top.problems), top.has('campaign'));
  const constraints = readConstraints(new FieldReader(top.raw('constraints'), 'constraints', top.problems));
  const visibility = readVisibility(top, campaign ? campaign.startUtcS : null, parseUtcDate);
  if (!given) return undefined;
  return { sites, target, campaign, constraints, visibility, t0ErrorS: Number.isFinite(t0ErrorS) ? t0ErrorS : 0, periodErrorS: Number.isFinite(periodErrorS) ? periodErrorS : 0 };
}

function readSites(top: FieldReader): SiteSpec[] {
  const raw = top.raw('site');
  if (raw === undefined || raw === null) {
    // Absent: the fields are still looked up (their defaults), so the field table sees them read.
    readSite(new FieldReader({}, 'site', top.problems), false, 'site');
    return [];
  }
  if (!Array.isArray(raw)) return [readSite(new FieldReader(raw, 'site', top.problems), true, 'site')];
  if (raw.length === 0) {
    top.problem('site', raw, 'a site mapping {latitude, longitude, altitude} or a non-empty list of them');
    return [];
  }
  const sites = raw.map((item, i) => readSite(new ListItemReader(item, `site.${i}`, 'site', top.problems), true, `site ${i + 1}`));
  if (raw.length > 1) {
    const seen = new Map<string, number>();
    raw.forEach((item, i) => {
      const named = item && typeof item === 'object' && (item as Record<string, unknown>).name !== undefined;
      if (!named) top.problem(`site.${i}.name`, undefined, 'required in a list of sites: a name for each, to tell them apart');
      else if (seen.has(sites[i].name)) top.problem(`site.${i}.name`, sites[i].name, `each site needs its own name; "${sites[i].name}" is also site ${seen.get(sites[i].name)! + 1}`);
      seen.set(sites[i].name, i);
    });
  }
  return sites;
}

function readSite(r: FieldReader, present: boolean, fallbackName: string): SiteSpec {
  const name = r.string('name', fallbackName);
  const latitudeRad = r.field('latitude', { required: present });
  const longitudeRad = r.field('longitude', { required: present });
  const altitudeM = r.field('altitude');
  r.rejectUnknown();
  // A longitude given as 180–360° east is the same meridian as −180–0°.
  const lon = longitudeRad > Math.PI ? longitudeRad - 2 * Math.PI : longitudeRad;
  return { name, latitudeRad, longitudeRad: lon, altitudeM };
}

function readTarget(r: FieldReader, present: boolean): TargetSpec | null {
  const raRad = readAngle(r, 'ra', 'hours', present);
  const decRad = readAngle(r, 'dec', 'degrees', present);
  r.rejectUnknown();
  return present ? { raRad, decRad } : null;
}

/**
 * An angle written in degrees (a bare number or "130.3 deg") or sexagesimal:
 * "08:41:12.5", "08 41 12.5" or "8h41m12.5s" for RA (hours), "-12:33:10",
 * "-12 33 10" or "-12d33m10s" for Dec (degrees). Minutes and seconds must be
 * below 60; the range is the field table's.
 */
function readAngle(r: FieldReader, key: string, sexUnit: 'hours' | 'degrees', present: boolean): number {
  const raw = r.has(key) ? r.raw(key) : undefined;
  if (typeof raw === 'string') {
    const sex = parseSexagesimal(raw, sexUnit);
    if (sex !== undefined) {
      const f = r.entry(key);
      const example = sexUnit === 'hours' ? '"08:41:12.5" (hours, minutes, seconds)' : '"-12:33:10" (degrees, arcminutes, arcseconds)';
      if (sex === null) {
        r.problem(key, raw, `malformed sexagesimal angle: expected ${example}, minutes and seconds below 60`);
        return Number.NaN;
      }
      const ok = sex >= (f.min ?? -Infinity) && (f.maxExclusive ? sex < (f.max ?? Infinity) : sex <= (f.max ?? Infinity));
      if (!ok) {
        r.problem(key, raw, sexUnit === 'hours' ? 'expected a right ascension from 00:00:00 to below 24:00:00 hours' : 'expected a declination from -90:00:00 to +90:00:00 degrees');
        return Number.NaN;
      }
      return sex;
    }
  }
  return r.field(key, { required: present });
}

/**
 * Sexagesimal text to radians: undefined when the text is not in a
 * sexagesimal form at all (then it is read as a quantity), null when it is
 * but malformed (minutes or seconds ≥ 60, a missing part).
 */
export function parseSexagesimal(text: string, unit: 'hours' | 'degrees'): number | null | undefined {
  const t = text.trim();
  const colon = /^([+-]?)(\d{1,3})[: ](\d{1,2})(?:[: ](\d{1,2}(?:\.\d*)?))?$/.exec(t);
  const letters = unit === 'hours'
    ? /^([+-]?)(\d{1,3})h\s*(\d{1,2})m\s*(?:(\d{1,2}(?:\.\d*)?)s)?$/.exec(t)
    : /^([+-]?)(\d{1,3})[d°]\s*(\d{1,2})['m′]\s*(?:(\d{1,2}(?:\.\d*)?)(?:["s″]|''))?$/.exec(t);
  const m = colon ?? letters;
  // Sexagesimal-looking ("12:3", "12d 3", "8h"), not a quantity with a unit ("120 deg", "8 hourangle").
  if (!m) return /^[+-]?\d+\s*(?::|[hd°]\s*(?:\d|$))/.test(t) || /^[+-]?\d+ \d+/.test(t) ? null : undefined;
  const [, sign, a, b, c] = m;
  const mins = Number(b);
  const secs = c === undefined ? 0 : Number(c);
  if (!(mins < 60) || !(secs < 60)) return null;
  if (unit === 'hours' && sign === '-') return null;
  const value = Number(a) + mins / 60 + secs / 3600;
  return (sign === '-' ? -1 : 1) * value * (unit === 'hours' ? 15 : 1) * DEG;
}

const DATE_RE = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2}(?:\.\d+)?))?\s*(Z|[+-]\d{2}:?\d{2})?)?$/;

/**
 * A UTC date or ISO 8601 date-time as UTC seconds since J2000.0; `endOfDay`
 * makes a bare date mean its 24:00 (a campaign's last day is included).
 * Null when malformed or not a calendar date.
 */
export function parseUtcDate(value: unknown, endOfDay: boolean): number | null {
  if (value instanceof Date) return Number.isFinite(value.getTime()) ? (value.getTime() - J2000_UNIX_MS) / 1e3 : null;
  if (typeof value !== 'string') return null;
  const m = DATE_RE.exec(value.trim());
  if (!m) return null;
  const [, y, mo, d, hh, mm, ss, zone] = m;
  const ms0 = Date.UTC(Number(y), Number(mo) - 1, Number(d));
  const check = new Date(ms0);
  if (check.getUTCFullYear() !== Number(y) || check.getUTCMonth() !== Number(mo) - 1 || check.getUTCDate() !== Number(d)) return null;
  let ms = ms0;
  if (hh !== undefined) {
    const h = Number(hh);
    const mi = Number(mm);
    const s = ss === undefined ? 0 : Number(ss);
    if (h > 24 || mi > 59 || s >= 61 || (h === 24 && (mi > 0 || s > 0))) return null;
    ms += (h * 3600 + mi * 60 + s) * 1e3;
    if (zone && zone !== 'Z') {
      const zm = /^([+-])(\d{2}):?(\d{2})$/.exec(zone)!;
      ms -= (zm[1] === '-' ? -1 : 1) * (Number(zm[2]) * 60 + Number(zm[3])) * 60e3;
    }
  } else if (endOfDay) {
    ms += DAY_S * 1e3;
  }
  return (ms - J2000_UNIX_MS) / 1e3;
}

function readCampaign(r: FieldReader, present: boolean): CampaignSpec | null {
  const read = (key: 'start' | 'end'): number => {
    const raw = r.raw(key);
    if (raw === undefined || raw === null) {
      if (present) r.problem(key, raw, 'required: a UTC date "2027-01-01" or ISO date-time "2027-01-01T18:00:00Z"');
      return Number.NaN;
    }
    const s = parseUtcDate(raw, key === 'end');
    if (s === null) {
      r.problem(key, raw, 'expected a UTC date "2027-01-01" or ISO date-time "2027-01-01T18:00:00Z" (a real calendar date)');
      return Number.NaN;
    }
    const ms = J2000_UNIX_MS + s * 1e3;
    if (ms < FIRST_MS || ms > LAST_MS) {
      r.problem(key, raw, 'expected a date from 1972-01-01 (the leap-second table starts there) to 2099-12-31');
      return Number.NaN;
    }
    return s;
  };
  const startUtcS = read('start');
  const endUtcS = read('end');
  r.rejectUnknown();
  if (Number.isFinite(startUtcS) && Number.isFinite(endUtcS)) {
    if (endUtcS <= startUtcS) r.problem('end', r.raw('end'), `the campaign must end after it starts (start ${describeUtc(startUtcS)})`);
    else if (endUtcS - startUtcS > 100 * JULIAN_YEAR_S) r.problem('end', r.raw('end'), 'a campaign may last at most 100 years');
  }
  return present ? { startUtcS, endUtcS } : null;
}

function describeUtc(utcS: number): string {
  return new Date(J2000_UNIX_MS + utcS * 1e3).toISOString().replace('.000Z', 'Z');
}

function readConstraints(r: FieldReader): ConstraintsSpec {
  const sunAltitudeRad = r.field('sun_altitude');
  const airmass = r.field('airmass');
  const clearFraction = r.field('clear_fraction');
  r.rejectUnknown();
  return { sunAltitudeRad, airmass, clearFraction };
}

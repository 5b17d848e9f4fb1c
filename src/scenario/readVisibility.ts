/**
 * The optional `visibility` block of a scenario (issue 18, item 1): a space
 * instrument's periodic visibility of the target, instead of a site, its
 * constraints and its weather. Fields, defaults and ranges are in fields.ts;
 * here the reference instant (a BJD_TDB or a date) and the rules between
 * blocks: a site or a constraints block together with `visibility` is an
 * error naming the one to drop, and so is a ground noise budget
 * (`instrument.ground`: air mass and scintillation do not apply in space).
 */
import { DAY_S } from '../physics/constants.js';
import { FieldReader } from './fieldReader.js';
import { ttMinusUtcS } from '../sky/timeScales.js';
import type { VisibilitySpec } from './types.js';

/** Shortest cycle (on + off, block + gap) allowed, s (common practice, no source: below a minute no cadence resolves it). */
const MIN_CYCLE_S = 60;
/** JD of J2000.0 (2000-01-01T12:00:00 TT), days. */
const JD_J2000 = 2451545.0;
/** BJD_TDB range of `visibility.start` as a number: 1972-01-01 to 2100-01-01 (JD 2441317.5 to 2488069.5). */
const FIRST_JD = 2441317.5;
const LAST_JD = 2488069.5;

/** The caution a scenario with a visibility pattern carries (as SITE_CALENDAR_ONLY for a site). */
export const VISIBILITY_CALENDAR_ONLY = 'with campaign, sweep and simulate observe only the visible parts of the campaign\'s transits (the campaign\'s transits replace observation.transits; the stated noise, no weather); limits and the budget\'s Monte Carlo still assume every transit is observed whole (the budget turns its count into visits)';

/** A date reader (readSky's `parseUtcDate`, passed in to keep the two files free of an import cycle). */
export type UtcDateParser = (value: unknown, endOfDay: boolean) => number | null;

/** Read `visibility` from the top-level reader; null when the block is absent. */
export function readVisibility(top: FieldReader, campaignStartUtcS: number | null, parseUtcDate: UtcDateParser): VisibilitySpec | null {
  const block = top.raw('visibility');
  const present = block !== undefined && block !== null;
  const r = new FieldReader(present ? block : {}, 'visibility', top.problems);
  const name = r.string('name', 'space');
  const onS = r.field('on', { required: present });
  const offS = r.field('off');
  const blockGiven = r.has('block') && r.raw('block') !== null;
  const blockS = r.field('block', { required: false });
  const gapS = r.field('gap', { required: blockGiven });
  const referenceBjdTdb = readReference(r, campaignStartUtcS, present, parseUtcDate);
  r.rejectUnknown();
  if (!present) return null;
  if (!blockGiven && r.has('gap') && r.raw('gap') !== null) r.problem('gap', r.raw('gap'), 'a gap between blocks needs visibility.block (the length of a block)');
  // Each cycle at least a minute long: shorter ones are below any cadence, and they bound the number of stretches a window holds.
  if (offS > 0 && onS + offS < MIN_CYCLE_S) r.problem('off', r.raw('off'), `on + off must be at least ${MIN_CYCLE_S / 60} minute (a cycle shorter than an exposure is not a schedule)`);
  if (blockGiven && gapS > 0 && blockS + gapS < MIN_CYCLE_S) r.problem('gap', r.raw('gap'), `block + gap must be at least ${MIN_CYCLE_S / 60} minute`);
  if (top.has('site') && top.raw('site') !== null) {
    top.problem('site', '(given)', 'a site and visibility exclude each other: drop `site` for a space instrument, or drop `visibility` for a ground one');
  }
  if (top.has('constraints') && top.raw('constraints') !== null) {
    top.problem('constraints', '(given)', 'constraints (Sun altitude, air mass, clear nights) apply to ground sites: drop `constraints` with visibility (state losses in visibility.on/off)');
  }
  const inst = top.raw('instrument');
  if (inst && typeof inst === 'object' && (inst as Record<string, unknown>).ground !== undefined) {
    top.problem('instrument.ground', '(given)', 'a ground noise budget (air mass, scintillation) does not apply with visibility: drop instrument.ground and state the noise (instrument.noise)');
  }
  return { name, onS, offS, referenceBjdTdb, blockS: blockGiven ? blockS : null, gapS: blockGiven ? gapS : 0 };
}

/**
 * `visibility.start`: a BJD_TDB number, or a UTC date/date-time turned into
 * the TDB instant it names (JD_UTC + (TT − UTC), TDB taken as TT: < 2 ms);
 * the light time to the barycentre (≤ 8.3 min) is not added, as this is a
 * phase reference of the schedule, not an observation. Default: the
 * campaign's start, the same way.
 */
function readReference(r: FieldReader, campaignStartUtcS: number | null, present: boolean, parseUtcDate: UtcDateParser): number {
  const raw = r.raw('start');
  if (raw === undefined || raw === null) {
    if (!present) return Number.NaN;
    if (campaignStartUtcS === null) {
      r.problem('start', raw, 'required without a campaign start: a BJD_TDB in days (2461041.5) or a date "2027-01-01"');
      return Number.NaN;
    }
    if (!Number.isFinite(campaignStartUtcS)) return Number.NaN; // the campaign's own problem says why
    return JD_J2000 + (campaignStartUtcS + ttMinusUtcS(campaignStartUtcS)) / DAY_S;
  }
  if (typeof raw === 'number') {
    if (!(raw >= FIRST_JD && raw <= LAST_JD)) {
      r.problem('start', raw, `expected a BJD_TDB in days from ${FIRST_JD} (1972) to ${LAST_JD} (2100), or a date "2027-01-01"`);
      return Number.NaN;
    }
    return raw;
  }
  const utcS = parseUtcDate(raw, false);
  if (utcS === null) {
    r.problem('start', raw, 'expected a BJD_TDB in days (2461041.5) or a date "2027-01-01" / ISO date-time "2027-01-01T03:20:00Z"');
    return Number.NaN;
  }
  const jd = JD_J2000 + (utcS + ttMinusUtcS(utcS)) / DAY_S;
  if (!(jd >= FIRST_JD && jd <= LAST_JD)) {
    r.problem('start', raw, 'expected a date from 1972-01-01 to 2099-12-31');
    return Number.NaN;
  }
  return jd;
}

/**
 * Time scales for the sky stage. Instants inside are UTC seconds since
 * J2000.0 reckoned in UTC (2000-01-01T12:00:00 UTC), counted as the civil
 * calendar counts them (86 400 s per day, as Date and astropy's jd in the
 * UTC scale do); transit ephemerides are BJD_TDB in days.
 *
 * How astronomy-engine (2.1.19) reads time: an `AstroTime` is built from a
 * UT day count and its TT is UT + ΔT(UT), with ΔT from the Espenak–Meeus
 * polynomials by default (about 76 s in 2027, some 6 s off the real
 * TT − UTC). Here ΔT is replaced (SetDeltaTFunction, once, at load) by
 * TT − UTC = 32.184 s + (TAI − UTC) from the leap-second table below, so the
 * library's TT is exact for UTC input. The Earth's rotation then uses UTC for
 * UT1: |UT1 − UTC| < 0.9 s by IERS rule, i.e. under 14″ of hour angle.
 * TDB − TT (periodic, < 2 ms; Fairhead & Bretagnon 1990) is left out: it is
 * far below the 1 s the calendar needs.
 */
import { SetDeltaTFunction } from 'astronomy-engine';
import { DAY_S } from '../physics/constants.js';

/** Unix milliseconds of J2000.0 in UTC, 2000-01-01T12:00:00Z. */
export const J2000_UNIX_MS = Date.UTC(2000, 0, 1, 12);
/** Julian date of J2000.0. */
export const JD_J2000 = 2451545.0;
/** TT − TAI, s (IAU 1991 Resolution A4: TT = TAI + 32.184 s). */
export const TT_MINUS_TAI_S = 32.184;

/**
 * TAI − UTC steps: [UTC date of the step (Unix ms), TAI − UTC from then, s].
 * IERS Bulletin C (the step table of leap seconds since 1972-01-01); no leap
 * second has been announced after 2017-01-01, so later dates keep 37 s.
 */
const LEAP_STEPS: ReadonlyArray<readonly [number, number]> = ([
  [1972, 0, 10], [1972, 6, 11], [1973, 0, 12], [1974, 0, 13], [1975, 0, 14], [1976, 0, 15], [1977, 0, 16], [1978, 0, 17],
  [1979, 0, 18], [1980, 0, 19], [1981, 6, 20], [1982, 6, 21], [1983, 6, 22], [1985, 6, 23], [1988, 0, 24], [1990, 0, 25],
  [1991, 0, 26], [1992, 6, 27], [1993, 6, 28], [1994, 6, 29], [1996, 0, 30], [1997, 6, 31], [1999, 0, 32], [2006, 0, 33],
  [2009, 0, 34], [2012, 6, 35], [2015, 6, 36], [2017, 0, 37],
] as const).map(([y, m, s]) => [Date.UTC(y, m, 1), s] as const);

/** Earliest instant the table covers (1972-01-01 UTC, when leap seconds began). */
export const FIRST_LEAP_UNIX_MS = LEAP_STEPS[0][0];

/** TAI − UTC at a UTC instant given as Unix ms, s (10 s before 1972 is not modelled: the table starts there). */
export function taiMinusUtcS(unixMs: number): number {
  let s = LEAP_STEPS[0][1];
  for (const [at, v] of LEAP_STEPS) {
    if (unixMs >= at) s = v;
    else break;
  }
  return s;
}

/** TT − UTC at a UTC instant (seconds since J2000 UTC), s. */
export function ttMinusUtcS(utcS: number): number {
  return TT_MINUS_TAI_S + taiMinusUtcS(J2000_UNIX_MS + utcS * 1e3);
}

// astronomy-engine calls ΔT with its UT day count (days since J2000, here UTC): give it TT − UTC.
SetDeltaTFunction((utDays: number) => ttMinusUtcS(utDays * DAY_S));

/** UTC seconds since J2000 of a Date. */
export function utcSFromDate(d: Date): number {
  return (d.getTime() - J2000_UNIX_MS) / 1e3;
}

/** The Date of UTC seconds since J2000. */
export function dateFromUtcS(utcS: number): Date {
  return new Date(J2000_UNIX_MS + utcS * 1e3);
}

/** ISO 8601 text of a UTC instant, to the second ("2027-03-04T05:06:07Z"). */
export function isoUtc(utcS: number): string {
  return new Date(Math.round(J2000_UNIX_MS / 1e3 + utcS) * 1e3).toISOString().replace('.000Z', 'Z');
}

/** Julian date in the UTC scale (astropy's `Time(..., scale='utc').jd`). */
export function jdUtcFromUtcS(utcS: number): number {
  return JD_J2000 + utcS / DAY_S;
}

/** UTC seconds since J2000 of a Julian date in the UTC scale. */
export function utcSFromJdUtc(jd: number): number {
  return (jd - JD_J2000) * DAY_S;
}

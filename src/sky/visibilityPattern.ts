/**
 * A space instrument's periodic visibility (scenario block `visibility`,
 * VisibilitySpec): visible for `on`, hidden for `off`, repeating from a
 * reference instant, optionally only inside observing blocks of `block`
 * separated by `gap` (the blocks repeat from the same reference). The
 * visible stretches of a time window are the intersection of the two
 * periodic patterns (common practice, no source: a stated schedule).
 *
 * Time axis: BJD_TDB, as space instruments time-stamp their data; the
 * pattern is taken as strictly periodic there (the light time between the
 * spacecraft and the barycentre is not modelled, nor Earth, Sun or Moon
 * avoidance angles, the South Atlantic Anomaly or momentum dumps).
 *
 * Pure: a function of its arguments.
 */
import { DAY_S } from '../physics/constants.js';
import type { VisibilitySpec } from '../scenario/types.js';
import { intervalIntersection, type Interval } from '../numeric/intervals.js';


/** Most visible stretches one window may hold (bounds the work of a very short cycle). */
export const MAX_STRETCHES_PER_WINDOW = 100_000; // the reader's 1-minute cycles give at most ~30 000 in a 20-day window

/** The stretches [kT, kT + on] (k integer) that meet [a, b], cut to it; the whole window when off = 0. */
function periodicOn(a: number, b: number, on: number, off: number): Interval[] {
  if (!(b > a)) return [];
  if (off <= 0) return [[a, b]];
  const T = on + off;
  const out: Interval[] = [];
  const k0 = Math.floor(a / T);
  const k1 = Math.floor(b / T);
  if (k1 - k0 + 1 > MAX_STRETCHES_PER_WINDOW) throw new RangeError(`visibility cycle of ${T} s is too short for a window of ${b - a} s (more than ${MAX_STRETCHES_PER_WINDOW} stretches)`);
  for (let k = k0; k <= k1; k++) {
    const x = Math.max(a, k * T);
    const y = Math.min(b, k * T + on);
    if (y > x) out.push([x, y]);
  }
  return out;
}


/**
 * The visible stretches of the window [a, b], both in seconds from the
 * instant `originBjdTdb` (BJD_TDB days), as sorted [start, end] in the same
 * seconds. The origin is the transit's mid-time in the calendar, so that the
 * offsets stay small numbers whatever the date.
 */
export function visibleStretches(v: VisibilitySpec, originBjdTdb: number, a: number, b: number): Interval[] {
  // Seconds from the pattern's reference to the origin (a difference of two BJDs: ~1e-5 s rounding at 1e4 days).
  const shift = (originBjdTdb - v.referenceBjdTdb) * DAY_S;
  const orbit = periodicOn(a + shift, b + shift, v.onS, v.offS);
  const seen = v.blockS === null ? orbit : intervalIntersection(orbit, periodicOn(a + shift, b + shift, v.blockS, v.gapS));
  return seen.map(([x, y]) => [x - shift, y - shift] as Interval);
}

/**
 * The long-run visible fraction of the pattern: on/(on + off), times
 * block/(block + gap) with blocks; with blocks it is exact when the two
 * cycles are incommensurate and approximate otherwise (both start at the
 * reference, so a block may hold a part-cycle more or less).
 */
export function visibleFraction(v: VisibilitySpec): number {
  const orbit = v.onS / (v.onS + v.offS);
  return v.blockS === null ? orbit : orbit * (v.blockS / (v.blockS + v.gapS));
}

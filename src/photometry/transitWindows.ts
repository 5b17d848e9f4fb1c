/**
 * Where to compute the light curve: one window per transit epoch, around the
 * barycentre's conjunction: the planet's transit plus the requested
 * out-of-transit baseline on each side. Nothing is computed over the empty
 * time between transits.
 */
import type { Scenario } from '../scenario/types.js';
import { transitDurations } from '../physics/transitDuration.js';

export interface TransitWindow {
  epoch: number;
  /** Barycentre conjunction of this epoch, s since t0. */
  centreS: number;
  startS: number;
  endS: number;
}

/** Planet-only closed-form durations of the scenario (Winn 2010 eqs. 14–16). */
export function scenarioDurations(s: Scenario) {
  return transitDurations({
    periodS: s.planet.periodS,
    aOverRstar: s.planet.semiMajorAxisM / s.star.radiusM,
    radiusRatio: s.planet.radiusM / s.star.radiusM,
    impactParameter: s.planet.impactParameter,
    inclinationRad: s.planet.inclinationRad,
    eccentricity: s.planet.eccentricity,
    omegaRad: s.planet.omegaRad,
  });
}

/**
 * Half-width of the observing window around each conjunction, s: half the
 * planet's T14 plus the requested out-of-transit baseline — what an observer
 * schedules, knowing the planet's ephemeris but not the moon. A moon whose
 * own dip falls outside the window is not seen in it, as at the telescope.
 */
export function windowHalfWidthS(s: Scenario): number {
  return 0.5 * scenarioDurations(s).t14S + s.observation.baselineS;
}

export function transitWindows(s: Scenario): TransitWindow[] {
  const half = windowHalfWidthS(s);
  const out: TransitWindow[] = [];
  for (let n = 0; n < s.observation.transits; n++) {
    const c = n * s.planet.periodS;
    out.push({ epoch: n, centreS: c, startS: c - half, endS: c + half });
  }
  return out;
}

/**
 * Sample times (mid-exposure, s since t0) on the instrument's regular cadence
 * grid t_k = k·cadence, keeping only the points inside the windows, with the
 * epoch of each point.
 */
export function sampleWindows(windows: TransitWindow[], cadenceS: number): { timeS: Float64Array; epoch: Int32Array } {
  let total = 0;
  const ranges: Array<[number, number, number]> = [];
  for (const w of windows) {
    const k0 = Math.ceil(w.startS / cadenceS);
    const k1 = Math.floor(w.endS / cadenceS);
    if (k1 >= k0) {
      ranges.push([k0, k1, w.epoch]);
      total += k1 - k0 + 1;
    }
  }
  const timeS = new Float64Array(total);
  const epoch = new Int32Array(total);
  let i = 0;
  for (const [k0, k1, e] of ranges) {
    for (let k = k0; k <= k1; k++, i++) {
      timeS[i] = k * cadenceS;
      epoch[i] = e;
    }
  }
  return { timeS, epoch };
}

/**
 * Where to compute the light curve: one window per transit epoch, around the
 * barycentre's conjunction, wide enough for the planet's transit displaced by
 * its reflex motion, the moon's own transit wherever it is on its orbit, and
 * the requested out-of-transit baseline. Nothing is computed over the empty
 * baseline between transits.
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

/** Barycentre sky speed at conjunction, m/s: v = (2πa/P)(1 + e sin ω)/√(1 − e²) (Winn 2010, arXiv:1001.2010, §2.3). */
export function barycentreSkySpeed(s: Scenario): number {
  const { periodS, semiMajorAxisM: a, eccentricity: e, omegaRad: w } = s.planet;
  return ((2 * Math.PI * a) / periodS) * ((1 + e * Math.sin(w)) / Math.sqrt(1 - e * e));
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
 * Half-width of the window around each conjunction, s: half the planet's
 * T14, plus the time the barycentre needs to cross the moon's largest
 * distance from it (apocentre a(1+e), so the moon's own dip and the planet's
 * reflex-shifted transit both fit), plus the baseline.
 */
export function windowHalfWidthS(s: Scenario): number {
  const t14 = scenarioDurations(s).t14S;
  const v = barycentreSkySpeed(s);
  const moonReach = s.moon ? (s.moon.separationM * (1 + s.moon.eccentricity) + s.moon.radiusM) / v : 0;
  return 0.5 * t14 + moonReach + s.observation.baselineS;
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

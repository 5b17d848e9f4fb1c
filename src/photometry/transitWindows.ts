/**
 * Where to compute the light curve: one window per transit epoch, around the
 * barycentre's conjunction: the planet's transit plus the requested
 * out-of-transit baseline on each side. Nothing is computed over the empty
 * time between transits.
 *
 * Windows never overlap: when the baseline reaches past half the period,
 * consecutive windows are cut at the midpoint between their conjunctions
 * (each time stamp belongs to the nearest conjunction's epoch), so every time
 * stamp appears once, with one noise draw. The observation is then
 * continuous over those stretches.
 *
 * Size: `observationSizeProblems` refuses, before anything is allocated, a
 * light curve of more than MAX_LIGHT_CURVE_POINTS samples, and a cadence no
 * shorter than the transit (one sample per transit measures no mid-time).
 */
import type { Scenario } from '../scenario/types.js';
import { InputError, type FieldProblem } from '../scenario/errors.js';
import { scenarioDurations } from '../physics/transitDuration.js';

export { scenarioDurations };

export interface TransitWindow {
  epoch: number;
  /** Barycentre conjunction of this epoch, s since t0. */
  centreS: number;
  startS: number;
  endS: number;
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

/** Whether consecutive windows would overlap (baseline + T14/2 beyond half the period): they are then cut at the midpoints. */
export function windowsOverlap(s: Scenario): boolean {
  return s.observation.transits > 1 && 2 * windowHalfWidthS(s) > s.planet.periodS;
}

export function transitWindows(s: Scenario): TransitWindow[] {
  const half = windowHalfWidthS(s);
  const P = s.planet.periodS;
  const N = s.observation.transits;
  const out: TransitWindow[] = [];
  for (let n = 0; n < N; n++) {
    const c = n * P;
    // Cut at the midpoints to the neighbouring conjunctions (no overlap; see the file header).
    const startS = n > 0 ? Math.max(c - half, c - 0.5 * P) : c - half;
    const endS = n < N - 1 ? Math.min(c + half, c + 0.5 * P) : c + half;
    out.push({ epoch: n, centreS: c, startS, endS });
  }
  return out;
}

/** Samples of window [startS, endS] on the grid k·cadence: k from ⌈start/cadence⌉ to ⌊end/cadence⌋. */
function gridRange(w: TransitWindow, cadenceS: number): [number, number] {
  return [Math.ceil(w.startS / cadenceS), Math.floor(w.endS / cadenceS)];
}

/** Number of samples `sampleWindows` would return for the scenario (computed, nothing allocated). */
export function lightCurvePointCount(s: Scenario): number {
  let total = 0;
  let last = -Infinity;
  for (const w of transitWindows(s)) {
    const [k0raw, k1] = gridRange(w, s.instrument.cadenceS);
    const k0 = Math.max(k0raw, last + 1);
    if (k1 >= k0) total += k1 - k0 + 1;
    last = Math.max(last, k1);
  }
  return total;
}

/**
 * Most samples in one light curve. A choice of this program (common practice,
 * no source), estimated, not measured at the limit: about 60 bytes of working
 * arrays per sample (times, epochs, model, noise, flux) per worker thread, and
 * about 90 characters per row of the ECSV that `simulate` writes, which must
 * stay well below V8's largest string (2^29 characters). A 2-min cadence over
 * 1000 transits of 20-h windows is 600 000 samples.
 */
export const MAX_LIGHT_CURVE_POINTS = 2_000_000;

const fmtS = (x: number) => (x >= 3600 ? `${(x / 3600).toPrecision(3)} h` : x >= 60 ? `${(x / 60).toPrecision(3)} min` : `${x.toPrecision(3)} s`);

/**
 * Problems that make the scenario's light curve impossible to compute or to
 * measure, found before anything is allocated (empty when none):
 * - a cadence no shorter than the transit T14 (at most one sample per transit:
 *   no mid-time or duration can be fitted);
 * - more than MAX_LIGHT_CURVE_POINTS samples.
 */
export function observationSizeProblems(s: Scenario): FieldProblem[] {
  const problems: FieldProblem[] = [];
  const cad = s.instrument.cadenceS;
  const t14 = scenarioDurations(s).t14S;
  if (!(cad < t14)) {
    problems.push({
      path: 'instrument.cadence',
      value: fmtS(cad),
      allowed: `must be shorter than the transit (T14 = ${fmtS(t14)}): one sample per transit measures no mid-time or duration; a timing fit needs several samples in ingress and egress, e.g. a cadence below T14/20 = ${fmtS(t14 / 20)}`,
    });
    return problems;
  }
  const n = lightCurvePointCount(s);
  if (n > MAX_LIGHT_CURVE_POINTS) {
    const windowH = (2 * windowHalfWidthS(s)) / 3600;
    problems.push({
      path: 'instrument.cadence',
      value: fmtS(cad),
      allowed: `the light curve would need ${n.toExponential(2)} samples (${s.observation.transits} transits × ${windowH.toPrecision(3)}-h windows at this cadence), above the limit of ${MAX_LIGHT_CURVE_POINTS.toExponential(0)} per light curve; use a coarser cadence (≥ ${fmtS((cad * n) / MAX_LIGHT_CURVE_POINTS)}), fewer transits (observation.transits) or a shorter baseline (observation.baseline)`,
    });
  }
  return problems;
}

/**
 * Sample times (mid-exposure, s since t0) on the instrument's regular cadence
 * grid t_k = k·cadence, keeping only the points inside the windows (in
 * increasing time order, as transitWindows gives them), with the epoch of
 * each point; a time stamp is returned once even where windows touch.
 */
export function sampleWindows(windows: TransitWindow[], cadenceS: number): { timeS: Float64Array; epoch: Int32Array } {
  let total = 0;
  const ranges: Array<[number, number, number]> = [];
  let last = -Infinity;
  for (const w of windows) {
    const [k0raw, k1] = gridRange(w, cadenceS);
    // A grid point on the cut between two windows goes to the earlier one: each time stamp once.
    const k0 = Math.max(k0raw, last + 1);
    if (k1 >= k0) {
      ranges.push([k0, k1, w.epoch]);
      total += k1 - k0 + 1;
    }
    last = Math.max(last, k1);
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

/** Throw an InputError (exit 2, nothing written) when `observationSizeProblems` finds any. */
export function assertObservable(s: Scenario, context?: string): void {
  const problems = observationSizeProblems(s);
  if (problems.length > 0) throw new InputError(problems, context);
}

/**
 * What the data exclude: the moon mass × separation region in which a moon
 * would have been detected by `vet`'s own detection rule (signalDetection.ts)
 * in at least 95 % of realizations, with the claim's epochs and errors.
 *
 * Each cell (a_S, M_S) injects R moons, seeded by (claim seed, cell, realization)
 * (noise/rng.ts), each with a uniform orbital phase and, under the isotropic
 * prior, an isotropic orbit normal (projection Φ = sqrt(1 − u²), u uniform on
 * [−1, 1]; impliedMoon.ts). The injected signal is Kipping's barycentric TTV
 * and TDV of a circular moon (Kipping 2009a, MNRAS 392, 181, as in
 * impliedMoon.ts): TTV_n = Φ·cos w·(a_PB/v_B)·sin(2π t_n/P_S + φ),
 * TDV_n = Φ·(sin w/w)·(τ̄·2π a_PB/(P_S v_B))·cos(2π t_n/P_S + φ), with
 * a_PB = a_S M_S/(M_P + M_S), P_S from Kepler III and the transit-averaging
 * factors of physics/transitAveraging.ts, t_n = E_n·P_P; plus white Gaussian
 * noise with the table's errors. A cell is excluded when the detected
 * fraction reaches 95 %; the fraction is made non-decreasing in mass along
 * each separation (a heavier moon at the same place gives a larger signal),
 * and the upper limit at a separation is the lightest such mass, interpolated
 * in log mass between grid masses (common practice, no source).
 */
import { G, M_EARTH_KG } from '../physics/constants.js';
import { transitAveraging } from '../physics/transitAveraging.js';
import { createRng } from '../noise/rng.js';
import type { OrientationPrior } from './claimTypes.js';
import { projectionFactor } from './impliedMoon.js';
import { decideSignal, detectionScratch } from './signalDetection.js';

/** Detection fraction that counts as excluded (the "95 %" of an upper limit). */
export const EXCLUSION_LEVEL = 0.95;

export interface ExclusionInput {
  epochs: Float64Array;
  timeErrS: Float64Array;
  /** Duration errors, s; null when the data have no durations. */
  durationErrS: Float64Array | null;
  planetPeriodS: number;
  planetMassKg: number;
  planetRadiusM: number;
  barycentreVelocityMS: number;
  durationS: number;
  /** Separation range of the map, m (inner: the Roche limit or the planet radius). */
  separationMinM: number;
  separationMaxM: number;
  falseAlarm: number;
  orientation: OrientationPrior;
  seed: number;
  realizations: number;
  separations: number;
  masses: number;
}

export interface ExclusionMap {
  separationM: number[];
  massKg: number[];
  /** detected[j][i]: fraction detected at separation j, mass i (non-decreasing in i); null: not simulated, the signal is far below the errors (not excluded). */
  detectedFraction: Array<Array<number | null>>;
  /** Lightest excluded mass at each separation, kg; null when no mass up to the planet's is excluded. */
  upperLimitKg: Array<number | null>;
  realizations: number;
  level: number;
  falseAlarm: number;
}

function logGrid(lo: number, hi: number, n: number): number[] {
  const out: number[] = [];
  for (let k = 0; k < n; k++) out.push(lo * Math.pow(hi / lo, n === 1 ? 0 : k / (n - 1)));
  return out;
}

interface Buffers {
  t: Float64Array;
  d: Float64Array | null;
}

/** Detected fraction of `x.realizations` injected moons of mass m at separation a (file header). */
function detectedFraction(x: ExclusionInput, a: number, m: number, cell: number, buf: Buffers, scratch: ReturnType<typeof detectionScratch>): number {
  const n = x.epochs.length;
  const periodS = 2 * Math.PI * Math.sqrt(a ** 3 / (G * (x.planetMassKg + m)));
  const aPB = (a * m) / (x.planetMassKg + m);
  const avg = transitAveraging(x.durationS, periodS);
  const ttvAmp = (aPB / x.barycentreVelocityMS) * avg.ttvFactor;
  const tdvAmp = ((x.durationS * 2 * Math.PI * aPB) / (periodS * x.barycentreVelocityMS)) * avg.tdvFactor;
  // Far below the errors (expected χ² excess Σ A²/σ² < 1 even face-on), no test of the rule can
  // reach 95 % power: such cells are not simulated (NaN, "not excluded").
  let lambda = 0;
  for (let i = 0; i < n; i++) {
    lambda += (ttvAmp / x.timeErrS[i]) ** 2;
    if (x.durationErrS) lambda += (tdvAmp / x.durationErrS[i]) ** 2;
  }
  if (lambda < 1) return NaN;
  let hits = 0;
  for (let r = 0; r < x.realizations; r++) {
    const rng = createRng(x.seed, 1 + cell, r);
    const phase = 2 * Math.PI * rng.uniform();
    const phi = x.orientation === 'isotropic' ? projectionFactor(2 * rng.uniform() - 1) : 1;
    for (let i = 0; i < n; i++) {
      const theta = (2 * Math.PI * ((x.epochs[i] * x.planetPeriodS) % periodS)) / periodS + phase;
      buf.t[i] = x.epochs[i] * x.planetPeriodS + phi * ttvAmp * Math.sin(theta) + x.timeErrS[i] * rng.normal();
      if (buf.d && x.durationErrS) buf.d[i] = x.durationS + phi * tdvAmp * Math.cos(theta) + x.durationErrS[i] * rng.normal();
    }
    const dec = decideSignal({ epochs: x.epochs, timeS: buf.t, timeErrS: x.timeErrS, durationS: buf.d, durationErrS: x.durationErrS }, x.falseAlarm, scratch);
    if (dec.detected) hits++;
  }
  return hits / x.realizations;
}

/**
 * The exclusion map (file header). Masses from 1e-4 Earth masses (or lower when the planet is
 * lighter) to the planet's mass. Pure and seeded: the same input gives the same map.
 */
export function exclusionMap(x: ExclusionInput): ExclusionMap {
  if (!(x.separationMaxM > x.separationMinM && x.separationMinM > 0)) throw new RangeError(`separation range must be increasing and positive, got ${x.separationMinM} … ${x.separationMaxM}`);
  const seps = logGrid(x.separationMinM, x.separationMaxM, x.separations);
  const masses = logGrid(Math.min(1e-4 * M_EARTH_KG, 1e-6 * x.planetMassKg), x.planetMassKg, x.masses);
  const n = x.epochs.length;
  const buf: Buffers = { t: new Float64Array(n), d: x.durationErrS ? new Float64Array(n) : null };
  const scratch = detectionScratch(n);
  const detected: Array<Array<number | null>> = [];
  const upper: Array<number | null> = [];
  for (let j = 0; j < seps.length; j++) {
    const row: number[] = [];
    let saturated = 0;
    for (let i = 0; i < masses.length; i++) {
      // Past two grid masses detected every time, heavier moons are too (monotone signal).
      let f = saturated >= 2 ? 1 : detectedFraction(x, seps[j], masses[i], j * masses.length + i, buf, scratch);
      if (i > 0 && Number.isFinite(row[i - 1])) f = Number.isFinite(f) ? Math.max(f, row[i - 1]) : row[i - 1];
      saturated = f >= 1 ? saturated + 1 : 0;
      row.push(f);
    }
    detected.push(row.map((f) => (Number.isFinite(f) ? f : null)));
    let lim: number | null = null;
    for (let i = 0; i < masses.length; i++) {
      if (row[i] >= EXCLUSION_LEVEL) {
        if (i === 0 || !Number.isFinite(row[i - 1])) lim = masses[i];
        else {
          const t = (EXCLUSION_LEVEL - row[i - 1]) / (row[i] - row[i - 1]);
          // Interpolated in log mass, never below the last mass that missed the level.
          lim = Math.exp(Math.log(masses[i - 1]) + t * (Math.log(masses[i]) - Math.log(masses[i - 1])));
        }
        break;
      }
    }
    upper.push(lim);
  }
  return { separationM: seps, massKg: masses, detectedFraction: detected, upperLimitKg: upper, realizations: x.realizations, level: EXCLUSION_LEVEL, falseAlarm: x.falseAlarm };
}

/**
 * The generalised Lomb–Scargle periodogram of a timing series on integer
 * epochs (Zechmeister & Kürster 2009, A&A 496, 577, "ZK09"), on the same grid,
 * with the same peak refinement and Baluev (2008, MNRAS 385, 1279) false-alarm
 * probability as `lombScargle` (timing/lombScargle.ts), but with the weighted
 * trigonometric sums of every grid frequency from FFTs (epochSums.ts; the
 * idea of Press & Rybicki 1989, ApJ 338, 277, exact here because the epochs
 * are integers): O(L log L + N) for L grid points instead of O(N·L). The grid
 * points within roundoff of the highest power, and every point of the
 * golden-section refinement, are evaluated exactly by `lombScarglePower`, so
 * the peak is the one the point-by-point scan finds.
 */
import { baluevFalseAlarm, lombScarglePower, periodogramGrid } from '../timing/lombScargle.js';
import { MAX_DFT_LENGTH, epochTrigSums } from './epochSums.js';
import { goldenSectionMaximum } from '../numeric/goldenSection.js';

export interface FastPeriodogram {
  frequency: Float64Array;
  power: Float64Array;
  peakFrequency: number;
  peakPower: number;
  falseAlarmProbability: number;
  /** Baluev's (2008) upper bound on it, FAP_single + τ (the Davies bound, eq. 14), capped at 1. */
  falseAlarmBound: number;
}

const EXACT_CANDIDATES = 32;

/**
 * ZK09 power from the centred weighted sums (weights normalised to Σw = 1): eq. 20 with
 * CC, SS, CS the centred products; the one-column fallbacks where the cosine and sine columns
 * are collinear (ν = ½ on integer epochs), as in `lombScargle`.
 */
function powerFromSums(C: number, S: number, YC: number, YS: number, CC: number, SS: number, CS: number, yy: number): number {
  if (!(yy > 0)) return 0;
  CC -= C * C;
  SS -= S * S;
  CS -= C * S;
  const D = CC * SS - CS * CS;
  const scale = CC * SS;
  const bothPresent = SS > 1e-14 * CC && CC > 1e-14 * SS;
  let p: number;
  if (bothPresent && D > 1e-10 * scale && scale > 0) p = (SS * YC * YC + CC * YS * YS - 2 * CS * YC * YS) / (yy * D);
  else if (CC >= SS && CC > 0) p = (YC * YC) / (CC * yy);
  else if (SS > 0) p = (YS * YS) / (SS * yy);
  else p = 0;
  return Math.min(1, Math.max(0, p));
}

/**
 * Periodogram of `values` (s) with 1σ `errors` at integer `epochs` on ν ∈ (0, ½] cycles per epoch.
 * `baseParameters`: 1 for values about a mean, 2 for residuals about a fitted line (the FAP only).
 * @throws RangeError as `lombScarglePower` does (fewer than 4 points, non-finite values, errors
 *   not > 0), for non-integer epochs, all epochs equal, or a grid longer than MAX_DFT_LENGTH / 2.
 */
export function fastPeriodogram(epochs: Float64Array, values: Float64Array, errors: Float64Array, oversample = 10, baseParameters = 1): FastPeriodogram {
  const n = epochs.length;
  const exact = (nus: number[]) => lombScarglePower(epochs, values, errors, Float64Array.from(nus));
  exact([0.25]); // validates the data (throws RangeError like lombScargle)
  const { maxFrequency, count, step } = periodogramGrid(epochs, oversample);
  if (2 * count > MAX_DFT_LENGTH) throw new RangeError(`the frequency grid (${count} points) exceeds ${MAX_DFT_LENGTH / 2}`);
  const L = 2 * count; // grid point k (0-based) is ν = (k + 1)/L
  // Normalised weights and centred values (ZK09 §2).
  const w = new Float64Array(n);
  let sw = 0;
  for (let i = 0; i < n; i++) {
    w[i] = 1 / (errors[i] * errors[i]);
    sw += w[i];
  }
  let yMean = 0;
  for (let i = 0; i < n; i++) {
    w[i] /= sw;
    yMean += w[i] * values[i];
  }
  const wy = new Float64Array(n);
  let yy = 0;
  for (let i = 0; i < n; i++) {
    const yc = values[i] - yMean;
    wy[i] = w[i] * yc;
    yy += w[i] * yc * yc;
  }
  const sums = epochTrigSums(epochs, [w, wy], L);
  const [cw, cy] = sums.cos;
  const [sw1, sy] = sums.sin;
  const frequency = new Float64Array(count);
  const power = new Float64Array(count);
  for (let k = 0; k < count; k++) {
    const j = k + 1;
    const j2 = (2 * j) % L;
    frequency[k] = k === count - 1 ? maxFrequency : j * step;
    // Σw cos² = (1 + Σw cos 2x)/2, Σw sin² = (1 − Σw cos 2x)/2, Σw cos sin = Σw sin 2x / 2 (Σw = 1).
    power[k] = powerFromSums(cw[j], sw1[j], cy[j], sy[j], 0.5 * (1 + cw[j2]), 0.5 * (1 - cw[j2]), 0.5 * sw1[j2], yy);
  }
  // The grid points within roundoff of the highest power, evaluated exactly; the first maximum wins.
  let maxFast = 0;
  for (let k = 0; k < count; k++) if (power[k] > maxFast) maxFast = power[k];
  const near: number[] = [];
  for (let k = 0; k < count; k++) if (power[k] >= maxFast - 1e-9) near.push(k);
  near.sort((a, b) => power[b] - power[a] || a - b);
  const cand = near.slice(0, EXACT_CANDIDATES).sort((a, b) => a - b);
  const candPower = exact(cand.map((k) => frequency[k]));
  let best = cand[0];
  let bestPower = -Infinity;
  cand.forEach((k, i) => {
    power[k] = candPower[i];
    if (candPower[i] > bestPower) {
      bestPower = candPower[i];
      best = k;
    }
  });
  // Golden-section refinement of the peak within ±step, clipped to (0, ½] (as lombScargle).
  const at = (nu: number) => exact([nu])[0];
  const lo = Math.max(frequency[best] - step, 1e-3 * step);
  const hi = Math.min(frequency[best] + step, maxFrequency);
  let peakFrequency = goldenSectionMaximum({ valueAt: at }, lo, hi, 1e-12 * maxFrequency).x;
  let peakPower = at(peakFrequency);
  if (peakPower <= power[best]) {
    peakFrequency = frequency[best];
    peakPower = power[best];
  }
  // Error-weighted variance of the epochs (normalised weights), for Baluev's effective width.
  let m = 0;
  for (let i = 0; i < n; i++) m += w[i] * (epochs[i] - epochs[0]);
  let v = 0;
  for (let i = 0; i < n; i++) {
    const d = epochs[i] - epochs[0] - m;
    v += w[i] * d * d;
  }
  // Baluev's d_H counts the base model's parameters: 1 for a floating mean, 2 when the values are
  // residuals about a fitted line (TTVs), which his N − d_H and N − d_H − 2 exponents take as one
  // point fewer (Baluev 2008, MNRAS 385, 1279, eqs. 5 and 14).
  const fap = baluevFalseAlarm(peakPower, n - (baseParameters - 1), maxFrequency, v);
  return { frequency, power, peakFrequency, peakPower, falseAlarmProbability: fap.falseAlarmProbability, falseAlarmBound: Math.min(1, fap.daviesBound) };
}

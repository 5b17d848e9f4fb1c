/**
 * Gaps in the data: a duty cycle (random gaps of a typical length, or a
 * periodic on/off pattern), transits missed altogether (weather,
 * scheduling), and partial coverage of a transit by a limited observing
 * window. Pure functions: masks (1 = observed, 0 = lost) and selected epochs,
 * drawn from an injected Rng so that results are reproducible.
 */
import type { Rng } from './rng.js';

function checkSorted(timeS: Float64Array): void {
  for (let k = 0; k < timeS.length; k++) {
    if (!Number.isFinite(timeS[k])) throw new RangeError(`timeS[${k}] must be finite, got ${timeS[k]}`);
    if (k > 0 && timeS[k] < timeS[k - 1]) {
      throw new RangeError(`timeS must be non-decreasing, got timeS[${k}] = ${timeS[k]} < timeS[${k - 1}] = ${timeS[k - 1]}`);
    }
  }
}

function outMask(n: number, out: Uint8Array | undefined): Uint8Array {
  const m = out ?? new Uint8Array(n);
  if (m.length < n) throw new RangeError(`out must have length >= ${n}, got ${m.length}`);
  return m;
}

/** Exponential deviate of mean `mean` by inversion: −mean·ln(1 − U), U ∈ [0, 1). */
function exponential(rng: Rng, mean: number): number {
  return -mean * Math.log(1 - rng.uniform());
}

/**
 * Random gaps: an alternating renewal process of observed and lost spells
 * with exponential lengths (a two-state Markov process), mean gap
 * `typicalGapS` and mean observed spell typicalGapS·d/(1 − d), so the
 * long-run observed fraction, mean on/(mean on + mean off) for an alternating
 * renewal process (Cox 1962, Renewal Theory), is d = `dutyCycle`.
 * The state at the first time stamp is drawn from the stationary distribution
 * (observed with probability d). Times in s, non-decreasing.
 */
export function randomGapMask(timeS: Float64Array, dutyCycle: number, typicalGapS: number, rng: Rng, out?: Uint8Array): Uint8Array {
  if (!(dutyCycle >= 0 && dutyCycle <= 1)) throw new RangeError(`dutyCycle must be in [0, 1], got ${dutyCycle}`);
  if (!(typicalGapS > 0) || !Number.isFinite(typicalGapS)) {
    throw new RangeError(`typicalGapS must be a finite number > 0, got ${typicalGapS}`);
  }
  checkSorted(timeS);
  const n = timeS.length;
  const mask = outMask(n, out);
  if (n === 0) return mask;
  if (dutyCycle === 1 || dutyCycle === 0) {
    mask.fill(dutyCycle === 1 ? 1 : 0, 0, n);
    return mask;
  }
  const meanOnS = (typicalGapS * dutyCycle) / (1 - dutyCycle);
  let observed = rng.uniform() < dutyCycle;
  // Exponential spells are memoryless, so the residual spell at the start is exponential too.
  let switchAtS = timeS[0] + exponential(rng, observed ? meanOnS : typicalGapS);
  for (let k = 0; k < n; k++) {
    const t = timeS[k];
    while (t >= switchAtS) {
      observed = !observed;
      switchAtS += exponential(rng, observed ? meanOnS : typicalGapS);
    }
    mask[k] = observed ? 1 : 0;
  }
  return mask;
}

/**
 * Periodic on/off duty cycle (e.g. nights, orbits): observed when
 * (t − phaseS) mod (onS + offS) < onS. Deterministic; draw `phaseS` from an
 * Rng (uniform in [0, onS + offS)) for a random phase.
 */
export function periodicGapMask(timeS: Float64Array, onS: number, offS: number, phaseS = 0, out?: Uint8Array): Uint8Array {
  if (!(onS > 0) || !Number.isFinite(onS)) throw new RangeError(`onS must be a finite number > 0, got ${onS}`);
  if (!(offS >= 0) || !Number.isFinite(offS)) throw new RangeError(`offS must be a finite number >= 0, got ${offS}`);
  if (!Number.isFinite(phaseS)) throw new RangeError(`phaseS must be finite, got ${phaseS}`);
  const n = timeS.length;
  const mask = outMask(n, out);
  const period = onS + offS;
  for (let k = 0; k < n; k++) {
    const t = timeS[k];
    if (!Number.isFinite(t)) throw new RangeError(`timeS[${k}] must be finite, got ${t}`);
    let ph = (t - phaseS) % period;
    if (ph < 0) ph += period;
    mask[k] = ph < onS ? 1 : 0;
  }
  return mask;
}

/**
 * The epochs (0 … nTransits − 1) that are observed when each transit is
 * missed independently with probability `missedFraction` (Bernoulli trials;
 * weather, scheduling). Returned in increasing order.
 */
export function selectObservedEpochs(nTransits: number, missedFraction: number, rng: Rng): Int32Array {
  if (!Number.isSafeInteger(nTransits) || nTransits < 0) {
    throw new RangeError(`nTransits must be a non-negative integer, got ${nTransits}`);
  }
  if (!(missedFraction >= 0 && missedFraction <= 1)) {
    throw new RangeError(`missedFraction must be in [0, 1], got ${missedFraction}`);
  }
  const keep = new Int32Array(nTransits);
  let m = 0;
  for (let e = 0; e < nTransits; e++) if (rng.uniform() >= missedFraction) keep[m++] = e;
  return keep.slice(0, m);
}

/** An observing window [startS, endS], s. */
export interface ObservingWindow {
  startS: number;
  endS: number;
}

/**
 * A window of length `windowS` whose centre is offset from mid-transit by a
 * uniform deviate in [−maxOffsetS, +maxOffsetS]: an observer who cannot
 * centre every transit in the night. maxOffsetS = 0 centres it.
 */
export function randomObservingWindow(midTimeS: number, windowS: number, maxOffsetS: number, rng: Rng): ObservingWindow {
  if (!Number.isFinite(midTimeS)) throw new RangeError(`midTimeS must be finite, got ${midTimeS}`);
  if (!(windowS > 0) || !Number.isFinite(windowS)) throw new RangeError(`windowS must be a finite number > 0, got ${windowS}`);
  if (!(maxOffsetS >= 0) || !Number.isFinite(maxOffsetS)) {
    throw new RangeError(`maxOffsetS must be a finite number >= 0, got ${maxOffsetS}`);
  }
  const centre = midTimeS + maxOffsetS * (2 * rng.uniform() - 1);
  return { startS: centre - windowS / 2, endS: centre + windowS / 2 };
}

/** Fraction of the transit [mid − T/2, mid + T/2] (first to last contact, T = durationS) inside the window. */
export function transitCoverageFraction(window: ObservingWindow, midTimeS: number, durationS: number): number {
  if (!(durationS > 0)) throw new RangeError(`durationS must be > 0, got ${durationS}`);
  const a = Math.max(window.startS, midTimeS - durationS / 2);
  const b = Math.min(window.endS, midTimeS + durationS / 2);
  return Math.max(0, b - a) / durationS;
}

/** Mask (1 = inside some window) for sorted or unsorted times and any number of windows. */
export function windowMask(timeS: Float64Array, windows: readonly ObservingWindow[], out?: Uint8Array): Uint8Array {
  const n = timeS.length;
  const mask = outMask(n, out);
  for (let k = 0; k < n; k++) {
    const t = timeS[k];
    let inside = 0;
    for (const w of windows) {
      if (t >= w.startS && t <= w.endS) {
        inside = 1;
        break;
      }
    }
    mask[k] = inside;
  }
  return mask;
}

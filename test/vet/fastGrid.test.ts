import { describe, it, expect } from 'vitest';
import { fastPeriodogram } from '../../src/vet/fastPeriodogram.js';
import { bestCommonFrequency, fitSinusoidAt, type TimingSeriesData } from '../../src/vet/sinusoidFit.js';
import { lombScargle } from '../../src/timing/lombScargle.js';

/** Small deterministic generator for invented series (common practice, no source). */
function lcg(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

function series(seed: number, n: number, withSignal: boolean): { epochs: Float64Array; values: Float64Array; errors: Float64Array } {
  const r = lcg(seed);
  const epochs: number[] = [];
  let e = Math.floor(r() * 50) - 20;
  for (let i = 0; i < n; i++) {
    epochs.push(e);
    e += 1 + (r() < 0.2 ? Math.floor(r() * 4) : 0); // gaps
  }
  const nu = 0.05 + 0.4 * r();
  const values = epochs.map((x) => (withSignal ? 60 * Math.sin(2 * Math.PI * nu * x + 1) : 0) + 20 * (r() + r() + r() - 1.5) + 3 * x);
  const errors = epochs.map(() => 15 + 10 * r());
  return { epochs: Float64Array.from(epochs), values: Float64Array.from(values), errors: Float64Array.from(errors) };
}

/** The point-by-point scan bestCommonFrequency replaced (one weighted fit per grid frequency). */
function bestByScan(list: TimingSeriesData[], oversample = 10): number {
  let eMin = Infinity;
  let eMax = -Infinity;
  for (const s of list) for (const e of s.epochs) {
    eMin = Math.min(eMin, e);
    eMax = Math.max(eMax, e);
  }
  const count = Math.max(2, Math.ceil(0.5 * oversample * (eMax - eMin)));
  const step = 0.5 / count;
  let best = step;
  let bestChi = Infinity;
  for (let k = 1; k <= count; k++) {
    let c = 0;
    for (const s of list) c += fitSinusoidAt(s, k * step).chiSquare;
    if (c < bestChi) {
      bestChi = c;
      best = k * step;
    }
  }
  return best;
}

describe('FFT frequency grids give the point-by-point results', () => {
  it('fastPeriodogram equals lombScargle (grid powers, peak, FAP) on gapped series with and without a signal', () => {
    for (let seed = 1; seed <= 12; seed++) {
      const { epochs, values, errors } = series(seed, 8 + seed * 5, seed % 3 !== 0);
      const ref = lombScargle(epochs, values, errors);
      const got = fastPeriodogram(epochs, values, errors);
      expect(got.frequency.length).toBe(ref.frequency.length);
      for (let k = 0; k < ref.frequency.length; k++) {
        expect(got.frequency[k]).toBe(ref.frequency[k]);
        expect(Math.abs(got.power[k] - ref.power[k])).toBeLessThan(1e-9);
      }
      expect(got.peakFrequency).toBeCloseTo(ref.peakFrequency, 12);
      expect(got.peakPower).toBeCloseTo(ref.peakPower, 12);
      expect(got.falseAlarmProbability).toBeCloseTo(ref.falseAlarmProbability, 12);
    }
  });

  it('bestCommonFrequency picks the grid point of the point-by-point scan (line and constant bases, one and two series)', () => {
    for (let seed = 1; seed <= 10; seed++) {
      const a = series(seed, 10 + seed * 4, seed % 4 !== 0);
      const b = series(seed + 100, a.epochs.length, true);
      const ttv: TimingSeriesData = { ...a, base: 'line' };
      const tdv: TimingSeriesData = { epochs: a.epochs, values: b.values, errors: b.errors, base: 'const' };
      for (const list of [[ttv], [tdv], [ttv, tdv]]) {
        const count = Math.max(2, Math.ceil(5 * (a.epochs[a.epochs.length - 1] - a.epochs[0])));
        const nu = bestCommonFrequency(list);
        // The refinement moves at most one grid step from the scan's grid point.
        expect(Math.abs(nu - bestByScan(list))).toBeLessThanOrEqual(0.5 / count + 1e-12);
        const chi = (x: number) => list.reduce((s, t) => s + fitSinusoidAt(t, x).chiSquare, 0);
        expect(chi(nu)).toBeLessThanOrEqual(chi(bestByScan(list)) * (1 + 1e-12));
      }
    }
  });
});

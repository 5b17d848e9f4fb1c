import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import {
  calibrateThreshold,
  countExceedances,
  orderStatisticThresholdSorted,
  quantileSortedType7,
  wilsonInterval,
  Z_95,
} from '../../src/timing/falseAlarmCalibration.js';
import { calibrateDetection, decideDetection } from '../../src/timing/detection.js';
import { createRng } from '../../src/noise/rng.js';

// Reference values generated once by test/fixtures/detectionStatistics.py:
// wilson = scipy.stats.binomtest(k, n).proportion_ci(level, method='wilson') (scipy 1.17.1);
// quantile7 = numpy.quantile(x, p, method='linear') (numpy 2.4.6; Hyndman & Fan 1996 definition 7).
const fixture = JSON.parse(readFileSync(new URL('../fixtures/detectionStatistics.json', import.meta.url), 'utf8')) as {
  wilson: { k: number; n: number; level: number; z: number; lower: number; upper: number }[];
  quantile7: { sample: number[]; p: number; quantile: number }[];
};

describe('wilsonInterval (Wilson 1927)', () => {
  it('matches scipy binomtest(...).proportion_ci(method="wilson") at 95 % and 90 %, |Δ| ≤ 1e-14', () => {
    for (const c of fixture.wilson) {
      const w = wilsonInterval(c.k, c.n, c.z);
      expect(Math.abs(w.lower - c.lower)).toBeLessThan(1e-14);
      expect(Math.abs(w.upper - c.upper)).toBeLessThan(1e-14);
    }
  });

  it('k = 0, n = 10 → [0, 0.27753]; k = 5, n = 10 → [0.23659, 0.76341] at 95 % (computed by hand from the formula; scipy agrees)', () => {
    const a = wilsonInterval(0, 10);
    expect(a.lower).toBe(0);
    expect(a.upper).toBeCloseTo(Z_95 ** 2 / (10 + Z_95 ** 2), 15); // k = 0: upper = z²/(n + z²)
    expect(a.upper).toBeCloseTo(0.27753, 5);
    const b = wilsonInterval(5, 10);
    expect(b.lower).toBeCloseTo(0.23659, 5);
    expect(b.upper).toBeCloseTo(0.76341, 5);
  });

  it("Newcombe 1998 (Stat. Med. 17, 857) worked examples, score method without continuity correction (from memory): 81/263 → 0.2553–0.3662, 15/148 → 0.0624–0.1605, 0/20 → 0–0.1611, 1/29 → 0.0061–0.1718", () => {
    const cases: [number, number, number, number][] = [
      [81, 263, 0.2553, 0.3662],
      [15, 148, 0.0624, 0.1605],
      [0, 20, 0, 0.1611],
      [1, 29, 0.0061, 0.1718],
    ];
    for (const [k, n, lo, hi] of cases) {
      const w = wilsonInterval(k, n);
      expect(w.lower).toBeCloseTo(lo, 4);
      expect(w.upper).toBeCloseTo(hi, 4);
    }
  });

  it('rejects k outside [0, n] and n ≤ 0', () => {
    expect(() => wilsonInterval(11, 10)).toThrow(/k/);
    expect(() => wilsonInterval(0, 0)).toThrow(/n/);
    expect(() => wilsonInterval(1, 10, -1)).toThrow(/z/);
  });
});

describe('quantiles', () => {
  it('type 7 matches numpy.quantile(method="linear") to 1e-15 relative', () => {
    for (const c of fixture.quantile7) {
      const v = quantileSortedType7(Float64Array.from(c.sample), c.p);
      expect(Math.abs(v - c.quantile)).toBeLessThanOrEqual(1e-15 * Math.max(1, Math.abs(c.quantile)));
    }
  });

  it('order statistic x_(⌈(n+1)(1−α)⌉): n = 99, α = 0.05 → x_(95); n = 10, α = 0.05 → +∞ (computed by hand)', () => {
    const x = Float64Array.from({ length: 99 }, (_, i) => i + 1);
    expect(orderStatisticThresholdSorted(x, 0.05)).toBe(95);
    expect(orderStatisticThresholdSorted(x.subarray(0, 10), 0.05)).toBe(Infinity);
    expect(orderStatisticThresholdSorted(x, 0)).toBeNaN();
  });

  it('order-statistic threshold has exceedance probability (n + 1 − k)/(n + 1) = 0.1 for n = 19, α = 0.1 (rank argument; Monte Carlo, 20000 trials, 4σ)', () => {
    const rng = createRng(11, 0, 0);
    const trials = 20000;
    const x = new Float64Array(19);
    let hits = 0;
    for (let k = 0; k < trials; k++) {
      for (let i = 0; i < 19; i++) x[i] = rng.normal();
      x.sort();
      if (rng.normal() > orderStatisticThresholdSorted(x, 0.1)) hits++;
    }
    expect(Math.abs(hits / trials - 0.1)).toBeLessThan(4 * Math.sqrt((0.1 * 0.9) / trials));
  });
});

describe('calibrateThreshold', () => {
  it('splits by index parity and counts strict exceedances on the odd half (constructed case)', () => {
    // even indices 0, 2, …, 18 hold 1…10; odd indices hold 100, 1, 1, …
    const s = new Float64Array(20);
    for (let i = 0; i < 10; i++) {
      s[2 * i] = i + 1;
      s[2 * i + 1] = i === 0 ? 100 : 1;
    }
    const c = calibrateThreshold(s, 0.2);
    // type 7 on 1…10 at p = 0.8: h = 7.2 → 8.2
    expect(c.threshold).toBeCloseTo(8.2, 14);
    expect(c.calibrationCount).toBe(10);
    expect(c.validationCount).toBe(10);
    expect(c.validationExceedances).toBe(1);
    expect(c.measuredAlpha).toBe(0.1);
    expect(countExceedances(Float64Array.from([8.2, 8.3, NaN]), 8.2)).toBe(1);
  });

  it('on N(0,1) nulls (n = 4000, α = 0.05) the threshold interval covers Φ⁻¹(0.95) = 1.6448536 in ≈ 95 % of 300 repeats and the measured α is unbiased (Monte Carlo; Φ⁻¹ from scipy.stats.norm.ppf)', () => {
    const q95 = 1.6448536269514722;
    const repeats = 300;
    let covered = 0;
    let measured = 0;
    const s = new Float64Array(4000);
    for (let r = 0; r < repeats; r++) {
      createRng(21, r, 0).fillNormal(s);
      const c = calibrateThreshold(s, 0.05);
      if (c.thresholdLower <= q95 && q95 <= c.thresholdUpper) covered++;
      measured += c.measuredAlpha;
      expect(c.requestedAlpha).toBe(0.05);
    }
    // coverage SE at 0.95 with 300 repeats is 0.013; allow 0.90–0.99
    expect(covered / repeats).toBeGreaterThan(0.9);
    expect(covered / repeats).toBeLessThan(0.99);
    // mean measured α over 300×2000 validation draws: SE ≈ 0.0004 (+ threshold scatter); allow 0.003
    expect(Math.abs(measured / repeats - 0.05)).toBeLessThan(0.003);
  });

  it('holdOut = false calibrates on all statistics and reports it', () => {
    const s = Float64Array.from({ length: 101 }, (_, i) => i);
    const c = calibrateThreshold(s, 0.1, { holdOut: false, method: 'orderStatistic' });
    // k = ⌈102·0.9⌉ = 92 → x_(92) = 91 (by hand); 9 of 101 values exceed it
    expect(c.threshold).toBe(91);
    expect(c.validationExceedances).toBe(9);
    expect(c.heldOut).toBe(false);
  });

  it('rejects bad α, NaN statistics and too few statistics', () => {
    const s = Float64Array.from([1, 2, 3, 4, 5]);
    expect(() => calibrateThreshold(s, 0)).toThrow(/alpha/);
    expect(() => calibrateThreshold(s, 1)).toThrow(/alpha/);
    expect(() => calibrateThreshold(Float64Array.from([1, NaN, 3, 4]), 0.1)).toThrow(/nullStats\[1\]/);
    expect(() => calibrateThreshold(Float64Array.from([1, 2, 3]), 0.1)).toThrow(/nullStats/);
  });
});

describe('decideDetection / calibrateDetection (Bonferroni combined channel)', () => {
  const thresholds = { single: { ttv: 10, tdv: 5, dip: 3 }, combined: { ttv: 12, tdv: 6, dip: 4 } };

  it('per channel: strictly above the α threshold; combined: any channel above its α/m threshold (constructed cases)', () => {
    expect(decideDetection({ ttv: 11, tdv: 1, dip: 0 }, thresholds)).toEqual({ ttv: true, tdv: false, dip: false, combined: false });
    expect(decideDetection({ ttv: 12.5, tdv: 1, dip: 0 }, thresholds)).toEqual({ ttv: true, tdv: false, dip: false, combined: true });
    expect(decideDetection({ ttv: 10, tdv: 5, dip: 3 }, thresholds)).toEqual({ ttv: false, tdv: false, dip: false, combined: false });
    expect(decideDetection({ ttv: NaN, tdv: NaN, dip: 4.5 }, thresholds)).toEqual({ ttv: false, tdv: false, dip: true, combined: true });
    expect(decideDetection({ ttv: 100, tdv: 0, dip: 0 }, { single: { tdv: 5 }, combined: { tdv: 6 } }).combined).toBe(false);
  });

  it('independent channels: combined false-alarm rate ≈ 1 − (1 − α/3)³ = 0.0492 for α = 0.05; identical channels: ≈ α/3 (Bonferroni conservatism; Monte Carlo, 4σ)', () => {
    const n = 40000;
    const a = new Float64Array(n);
    const b = new Float64Array(n);
    const c = new Float64Array(n);
    createRng(31, 0, 0).fillNormal(a);
    createRng(31, 1, 0).fillNormal(b);
    createRng(31, 2, 0).fillNormal(c);
    const indep = calibrateDetection({ ttv: a, tdv: b, dip: c }, 0.05);
    const expectIndep = 1 - (1 - 0.05 / 3) ** 3;
    const se = (p: number): number => Math.sqrt((p * (1 - p)) / (n / 2));
    expect(Math.abs(indep.measuredCombinedAlpha - expectIndep)).toBeLessThan(4 * se(expectIndep) + 0.002);
    expect(indep.channels).toEqual(['ttv', 'tdv', 'dip']);
    expect(indep.combined.ttv!.requestedAlpha).toBeCloseTo(0.05 / 3, 15);
    const same = calibrateDetection({ ttv: a, tdv: a, dip: a }, 0.05);
    expect(Math.abs(same.measuredCombinedAlpha - 0.05 / 3)).toBeLessThan(4 * se(0.05 / 3) + 0.002);
    // two channels only: m = 2
    const two = calibrateDetection({ ttv: a, dip: c }, 0.05);
    expect(two.combined.dip!.requestedAlpha).toBeCloseTo(0.025, 15);
    expect(two.thresholds.single.tdv).toBeUndefined();
  });

  it('rejects no channels and misaligned arrays', () => {
    expect(() => calibrateDetection({}, 0.05)).toThrow(/nullStats/);
    expect(() => calibrateDetection({ ttv: new Float64Array(10), tdv: new Float64Array(11) }, 0.05)).toThrow(/nullStats.tdv/);
  });
});

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

describe('decideDetection / calibrateDetection (min-p combined rule)', () => {
  const sorted = { ttv: Float64Array.from([0, 1, 2, 3]), dip: Float64Array.from([0, 1, 2, 3]) };
  // Equal weights 1/2: M = max_c (1/2)·(N + 1)/(N − B_c + 1) + 1e-9·Σ_c B_c/(2N), N = 4.
  const thresholds = { single: { ttv: 10, tdv: 5, dip: 3, template: 2 }, combined: { sorted, threshold: 1.1, weights: { ttv: 0.5, dip: 0.5 } } };
  const none = { ttv: NaN, tdv: NaN, dip: NaN, template: NaN };

  it('per channel: strictly above the α threshold; combined: max over channels of the fraction of no-moon values below (constructed cases, by hand)', () => {
    // ttv 11 > 10; combined B = 4: 0.5·5/1 = 2.5 > 1.1
    expect(decideDetection({ ...none, ttv: 11, tdv: 1, dip: 0 }, thresholds)).toEqual({ ttv: true, tdv: false, dip: false, template: false, combined: true });
    // ttv 2.5: B = 3: 0.5·5/2 = 1.25 > 1.1 combined; no single
    expect(decideDetection({ ...none, ttv: 2.5, dip: 0 }, thresholds).combined).toBe(true);
    // ttv 1.5, dip 1.5: B = 2: 0.5·5/3 = 0.83 < 1.1
    expect(decideDetection({ ...none, ttv: 1.5, dip: 1.5 }, thresholds).combined).toBe(false);
    // NaN scores 0; equal to the threshold is not above it
    expect(decideDetection({ ...none, template: 2 }, thresholds)).toEqual({ ttv: false, tdv: false, dip: false, template: false, combined: false });
  });

  it('independent and identical channels: the combined rate in force is α on fresh no-moon draws (Monte Carlo, 4σ), and identical channels decide exactly as one channel', () => {
    const n = 4000;
    const m = 40000;
    const draw = (seed: number, len: number): Float64Array => {
      const a = new Float64Array(len);
      createRng(31, seed, 0).fillNormal(a);
      return a;
    };
    const [a, b, c, d] = [draw(0, n), draw(1, n), draw(2, n), draw(3, n)];
    const alpha = 0.05;
    const indep = calibrateDetection({ ttv: a, tdv: b, dip: c, template: d }, alpha);
    expect(indep.channels).toEqual(['ttv', 'tdv', 'dip', 'template']);
    // Rate in force: (n + 1 − k)/(n + 1), k = ⌈4001·0.95⌉ = 3801 → 200/4001 (David & Nagaraja 2003, §2.2)
    expect(indep.falseAlarmInForce).toBeCloseTo(200 / 4001, 12);
    const [fa, fb, fc, fd] = [draw(10, m), draw(11, m), draw(12, m), draw(13, m)];
    let fired = 0;
    let firedSame = 0;
    let agree = 0;
    const same = calibrateDetection({ ttv: a, tdv: a, dip: a, template: a }, alpha);
    for (let i = 0; i < m; i++) {
      if (decideDetection({ ttv: fa[i], tdv: fb[i], dip: fc[i], template: fd[i] }, indep.thresholds).combined) fired++;
      const dec = decideDetection({ ttv: fa[i], tdv: fa[i], dip: fa[i], template: fa[i] }, same.thresholds);
      if (dec.combined) firedSame++;
      if (dec.combined === dec.ttv) agree++;
    }
    // Expected rate: the Beta mean 200/4001 ≈ 0.04999; sd ≈ sqrt(α/m) ⊕ the threshold's own spread sqrt(α/n) ≈ 0.0036
    const sd = Math.sqrt((alpha * (1 - alpha)) / m + (alpha * (1 - alpha)) / n);
    expect(Math.abs(fired / m - alpha)).toBeLessThan(4 * sd);
    expect(Math.abs(firedSame / m - alpha)).toBeLessThan(4 * sd);
    // Identical channels: min-p equals the single channel (no Bonferroni loss), up to the rank ties at the threshold.
    expect(agree / m).toBeGreaterThan(0.999);
  });

  it('a channel with all the signal: the combined rule keeps most of its power (independent noise channels, min-p vs Bonferroni; Monte Carlo)', () => {
    const n = 4000;
    const rng = createRng(32, 0, 0);
    const nul = [0, 1, 2].map(() => { const x = new Float64Array(n); rng.fillNormal(x); return x; });
    const cal = calibrateDetection({ ttv: nul[0], tdv: nul[1], template: nul[2] }, 0.01);
    const m = 20000;
    const sig = [0, 1, 2].map(() => { const x = new Float64Array(m); rng.fillNormal(x); return x; });
    let single = 0;
    let combined = 0;
    for (let i = 0; i < m; i++) {
      const st = { ttv: sig[0][i], tdv: sig[1][i], dip: NaN, template: sig[2][i] + 3 };
      const dec = decideDetection(st, cal.thresholds);
      if (dec.template) single++;
      if (dec.combined) combined++;
    }
    // Normal shift 3 at α = 1 %: Φ(3 − 2.326) = 0.750 single; min-p over 3 independent channels ≈ Φ(3 − z(1 − 0.00334)) = Φ(0.287) = 0.613
    // (Šidák 1967, JASA 62, 626: per-channel level 1 − 0.99^(1/3) = 0.00334); common practice for the numbers.
    expect(single / m).toBeGreaterThan(0.73);
    expect(combined / m).toBeGreaterThan(0.58);
    expect(combined / m).toBeLessThan(single / m);
    // Weighted p-values (Genovese et al. 2006), weight 0.9 on the channel with the signal: it acts at ≈ 0.9·α,
    // Φ(3 − z(1 − 0.009)) = Φ(3 − 2.366) = 0.737 (scipy.stats.norm), just below the single channel's 0.750.
    const weighted = calibrateDetection({ ttv: nul[0], tdv: nul[1], template: nul[2] }, 0.01, { template: 0.9, ttv: 0.05, tdv: 0.05 });
    let w = 0;
    for (let i = 0; i < m; i++) if (decideDetection({ ttv: sig[0][i], tdv: sig[1][i], dip: NaN, template: sig[2][i] + 3 }, weighted.thresholds).combined) w++;
    expect(w / m).toBeGreaterThan(0.71);
    expect(w / m).toBeLessThanOrEqual(single / m + 0.01);
  });

  it('rejects no channels and misaligned arrays', () => {
    expect(() => calibrateDetection({}, 0.05)).toThrow(/nullStats/);
    expect(() => calibrateDetection({ ttv: new Float64Array(10), tdv: new Float64Array(11) }, 0.05)).toThrow(/nullStats.tdv/);
  });
});

/**
 * The tail-fit calibration of calibrateDetection (issue 17, item 3): thresholds from a generalised
 * Pareto fit of the no-moon statistics' upper tail (Knijnenburg et al. 2009) hold their false-alarm
 * rate with fewer no-moon realizations. Channels with known distributions, so every rate in force is
 * exact (single channels) or measured on a large independent sample (the combined rule).
 */
import { describe, it, expect } from 'vitest';
import { calibrateDetection, decideDetection, type DetectionStatistics } from '../../src/timing/detection.js';
import { tailRateInForce, tailThresholdSorted } from '../../src/timing/falseAlarmCalibration.js';
import { normalCdf } from '../../src/numeric/normal.js';
import { createRng, type Rng } from '../../src/noise/rng.js';

/** Four independent channels: exponential, |normal|, max of two exponentials, normal (shifted). */
function draw(rng: Rng, out: DetectionStatistics): void {
  out.ttv = -Math.log1p(-rng.uniform());
  out.tdv = Math.abs(rng.normal());
  out.dip = Math.max(-Math.log1p(-rng.uniform()), -Math.log1p(-rng.uniform()));
  out.template = 2 + rng.normal();
}
/** Their exact survival functions (closed forms; Φ from numeric/normal.ts). */
const survival: Record<keyof DetectionStatistics, (x: number) => number> = {
  ttv: (x) => Math.exp(-x),
  tdv: (x) => 2 * (1 - normalCdf(x)),
  dip: (x) => 1 - (1 - Math.exp(-x)) ** 2,
  template: (x) => 1 - normalCdf(x - 2),
};
const CH = ['ttv', 'tdv', 'dip', 'template'] as const;

function nullSet(n: number, seed: number): Record<(typeof CH)[number], Float64Array> {
  const rng = createRng(seed, 1, 0);
  const out = { ttv: new Float64Array(n), tdv: new Float64Array(n), dip: new Float64Array(n), template: new Float64Array(n) };
  const row = { ttv: 0, tdv: 0, dip: 0, template: 0 };
  for (let i = 0; i < n; i++) {
    draw(rng, row);
    for (const ch of CH) out[ch][i] = row[ch];
  }
  return out;
}

describe('tail-fit calibration (issue 17, item 3)', () => {
  it('at α = 1 % from 1500 no-moon values (15/α), pooled over 30 calibration sets, every channel and the combined rule within ±20 % of α', () => {
    // Goal of issue 17 (pooled rate in force within ±20 % of α); the set count is common practice, no source.
    // Single channels: the exact rate S(threshold). Combined: the fraction of 40 000 fresh no-moon draws per set.
    const alpha = 0.01;
    const n = 1500;
    const sets = 30;
    const pooled: Record<string, number> = { ttv: 0, tdv: 0, dip: 0, template: 0, combined: 0 };
    let covered = 0;
    const fresh = 40000;
    for (let s = 0; s < sets; s++) {
      const cal = calibrateDetection(nullSet(n, 500 + s), alpha, { template: 0.85, ttv: 0.05, tdv: 0.05, dip: 0.05 }, { method: 'tail', rng: createRng(77, s, 0) });
      expect(cal.method).toBe('tail');
      for (const ch of CH) {
        expect(cal.single[ch]!.method).toBe('tail');
        pooled[ch] += survival[ch](cal.thresholds.single[ch]!) / sets;
      }
      const rng = createRng(900 + s, 2, 0);
      const row = { ttv: 0, tdv: 0, dip: 0, template: 0 };
      let fired = 0;
      for (let i = 0; i < fresh; i++) {
        draw(rng, row);
        if (decideDetection(row, cal.thresholds).combined) fired++;
      }
      const rate = fired / fresh;
      pooled.combined += rate / sets;
      if (rate >= cal.falseAlarmInForceLower && rate <= cal.falseAlarmInForceUpper) covered++;
    }
    for (const [name, r] of Object.entries(pooled)) {
      expect(r / alpha, name).toBeGreaterThan(0.8);
      expect(r / alpha, name).toBeLessThan(1.2);
    }
    // The bootstrap interval is approximate (it ignores the GPD model's own error): it should still cover
    // the rate in most sets (a nominal 95 % interval; ≥ 80 % asked here, common practice, no source).
    expect(covered / sets).toBeGreaterThanOrEqual(0.8);
  }, 120_000);

  it('falls back to the order statistic where the tail is too short for α (fewer than 2αn exceedances) and without enough values', () => {
    const x = Float64Array.from(nullSet(100, 3).ttv).sort();
    // n = 100 < 40? no: n = 100, tail of up to 50 values; α = 0.4 asks for 80 → order statistic.
    const t = tailThresholdSorted(x, 0.4, createRng(1, 0, 0));
    expect(t.fit).toBeNull();
    const small = Float64Array.from(nullSet(30, 4).ttv).sort();
    expect(tailThresholdSorted(small, 0.05, createRng(1, 0, 0)).fit).toBeNull();
  });

  it('the tail rate-in-force bootstrap brackets α for an exponential sample and is reproducible', () => {
    const x = Float64Array.from(nullSet(2000, 5).ttv).sort();
    const t = tailThresholdSorted(x, 0.01, createRng(2, 0, 0));
    expect(t.fit).not.toBeNull();
    const a = tailRateInForce(x, 0.01, t.fit!, 200, createRng(3, 0, 0));
    const b = tailRateInForce(x, 0.01, t.fit!, 200, createRng(3, 0, 0));
    expect(a).toEqual(b);
    expect(a.lower).toBeLessThan(0.01);
    expect(a.upper).toBeGreaterThan(0.01);
    expect(a.mean).toBeGreaterThan(0.007);
    expect(a.mean).toBeLessThan(0.014);
  });

  it('the tail method needs an rng; the order statistic (default) is unchanged', () => {
    const s = nullSet(500, 6);
    expect(() => calibrateDetection(s, 0.05, {}, { method: 'tail' })).toThrow(/rng/);
    expect(calibrateDetection(s, 0.05).method).toBe('orderStatistic');
  });
});

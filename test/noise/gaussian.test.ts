import { describe, it, expect } from 'vitest';
import { createRng } from '../../src/noise/rng.js';
import { fillNormalBoxMuller, normalPolar, normalZiggurat, type UniformSource } from '../../src/noise/gaussian.js';

/**
 * erf by Abramowitz & Stegun 1964, Handbook of Mathematical Functions, eq. 7.1.26
 * (|error| ≤ 1.5e-7), far below the KS critical values used here (~4e-3).
 */
function erf(x: number): number {
  const s = Math.sign(x);
  const a = Math.abs(x);
  const t = 1 / (1 + 0.3275911 * a);
  const poly = t * (0.254829592 + t * (-0.284496736 + t * (1.421413741 + t * (-1.453152027 + t * 1.061405429))));
  return s * (1 - poly * Math.exp(-a * a));
}
const normalCdf = (x: number): number => 0.5 * (1 + erf(x / Math.SQRT2));

/** Kolmogorov–Smirnov statistic D of a sample against the standard normal CDF. */
function ksStatistic(sample: Float64Array): number {
  const s = Float64Array.from(sample).sort();
  const n = s.length;
  let d = 0;
  for (let i = 0; i < n; i++) {
    const f = normalCdf(s[i]);
    d = Math.max(d, (i + 1) / n - f, f - i / n);
  }
  return d;
}
/** KS critical value at α = 0.001: c(α)/√n with c = sqrt(−ln(α/2)/2) = 1.9495 (asymptotic Kolmogorov distribution). */
const ksCritical = (n: number): number => Math.sqrt(-Math.log(0.0005) / 2) / Math.sqrt(n);

function moments(x: Float64Array): { mean: number; variance: number; skew: number; exKurt: number } {
  const n = x.length;
  let m = 0;
  for (const v of x) m += v;
  m /= n;
  let m2 = 0, m3 = 0, m4 = 0;
  for (const v of x) {
    const d = v - m;
    const d2 = d * d;
    m2 += d2; m3 += d2 * d; m4 += d2 * d2;
  }
  m2 /= n; m3 /= n; m4 /= n;
  return { mean: m, variance: m2, skew: m3 / m2 ** 1.5, exKurt: m4 / (m2 * m2) - 3 };
}

describe('Rng.normal / fillNormal (ziggurat)', () => {
  const n = 1_000_000;
  const x = new Float64Array(n);
  createRng(12345, 0, 0).fillNormal(x);

  it('has mean 0, variance 1, skewness 0, excess kurtosis 0 within 5 standard errors for 1e6 draws', () => {
    // Standard errors of sample moments for a normal parent: mean 1/√n, variance √(2/n), skewness √(6/n),
    // excess kurtosis √(24/n) (common practice, no source). Allow 5 SE.
    const m = moments(x);
    expect(Math.abs(m.mean)).toBeLessThan(5 / Math.sqrt(n));
    expect(Math.abs(m.variance - 1)).toBeLessThan(5 * Math.sqrt(2 / n));
    expect(Math.abs(m.skew)).toBeLessThan(5 * Math.sqrt(6 / n));
    expect(Math.abs(m.exKurt)).toBeLessThan(5 * Math.sqrt(24 / n));
  });

  it('passes a Kolmogorov–Smirnov test against the normal CDF (α = 0.001)', () => {
    const sub = x.subarray(0, 200_000);
    expect(ksStatistic(sub)).toBeLessThan(ksCritical(sub.length));
  });

  it('populates the tail beyond the ziggurat edge r = 3.4426 at the normal rate', () => {
    // Expected count n·2(1 − Φ(r)) with Φ from A&S 7.1.26 in this test; binomial sd; allow 5 sd.
    // Also |x| > 4.5, checked so the tail sampler reaches far (expected n·6.8e-6 ≈ 6.8).
    const r = 3.442619855899;
    let tail = 0;
    let far = 0;
    let maxAbs = 0;
    for (const v of x) {
      const a = Math.abs(v);
      if (a > r) tail++;
      if (a > 4.5) far++;
      maxAbs = Math.max(maxAbs, a);
    }
    const p = 2 * (1 - normalCdf(r));
    expect(Math.abs(tail - n * p)).toBeLessThan(5 * Math.sqrt(n * p * (1 - p)));
    expect(far).toBeGreaterThan(0);
    expect(far).toBeLessThan(25);
    expect(maxAbs).toBeLessThan(6.5);
  });

  it('normal() and fillNormal() give the same stream; sigma scales it', () => {
    const a = createRng(3, 1, 4);
    const b = createRng(3, 1, 4);
    const buf = new Float64Array(1000);
    b.fillNormal(buf, 2.5);
    for (let i = 0; i < buf.length; i++) expect(buf[i]).toBe(2.5 * a.normal());
  });
});

describe('alternative samplers (kept for the benchmark)', () => {
  const src: UniformSource = createRng(99, 1, 1);
  const n = 100_000;
  it('polar and Box–Muller pass KS against the normal CDF (α = 0.001)', () => {
    const a = new Float64Array(n);
    for (let i = 0; i < n; i++) a[i] = normalPolar(src);
    expect(ksStatistic(a)).toBeLessThan(ksCritical(n));
    const b = new Float64Array(n);
    fillNormalBoxMuller(src, b);
    expect(ksStatistic(b)).toBeLessThan(ksCritical(n));
  });
  it('normalZiggurat called directly on another stream passes KS (α = 0.001)', () => {
    const s = createRng(100, 2, 3);
    const a = new Float64Array(n);
    for (let i = 0; i < n; i++) a[i] = normalZiggurat(s);
    expect(ksStatistic(a)).toBeLessThan(ksCritical(n));
  });
});

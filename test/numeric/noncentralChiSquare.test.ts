import { describe, it, expect } from 'vitest';
import { mulberry32 } from '../helpers/mulberry32.js';
import { readFileSync } from 'node:fs';
import {
  chiSquareSurvival,
  chiSquareCdf,
  chiSquareUpperQuantile,
  chiSquareQuantile,
  noncentralChiSquareSurvival,
  noncentralChiSquareCdf,
} from '../../src/numeric/noncentralChiSquare.js';

// Reference values: scipy.stats.ncx2 / chi2 (scipy 1.17.1, Boost.Math), cross-checked in the
// generator against a 40-digit mpmath Poisson-mixture sum; generated once by
// test/fixtures/chiSquare.py into test/fixtures/chiSquare.json.
const fixture = JSON.parse(
  readFileSync(new URL('../fixtures/chiSquare.json', import.meta.url), 'utf8'),
) as {
  noncentralSurvival: { x: number; df: number; lambda: number; sf: number }[];
  centralUpperQuantile: { alpha: number; df: number; isf: number; sf_at_isf: number }[];
};

function normalSampler(u: () => number): () => number {
  // Box–Muller (Box & Muller 1958, Ann. Math. Stat. 29, 610).
  return () => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
}

describe('noncentral chi-square survival', () => {
  it('matches scipy.stats.ncx2.sf over df 1–200, λ 0–1000, both tails (|Δ| ≤ 1e-10 and relative ≤ 1e-9)', () => {
    let worstAbs = 0;
    let worstRel = 0;
    for (const { x, df, lambda, sf } of fixture.noncentralSurvival) {
      const got = noncentralChiSquareSurvival(x, df, lambda);
      const abs = Math.abs(got - sf);
      const rel = abs / sf;
      worstAbs = Math.max(worstAbs, abs);
      worstRel = Math.max(worstRel, rel);
      expect(abs, `x=${x} df=${df} λ=${lambda}`).toBeLessThan(1e-10);
      expect(rel, `x=${x} df=${df} λ=${lambda}`).toBeLessThan(1e-9);
    }
    // measured (Node 20): worst |Δ| 4.6e-14, worst relative 5.0e-13
    expect(worstAbs).toBeLessThan(1e-10);
    expect(worstRel).toBeLessThan(1e-9);
  });

  it('CDF + survival = 1 (definition)', () => {
    for (const [x, df, lam] of [[3, 2, 1], [150, 100, 40], [900, 50, 800], [0.1, 1, 0.3]] as const) {
      expect(noncentralChiSquareCdf(x, df, lam) + noncentralChiSquareSurvival(x, df, lam)).toBeCloseTo(1, 12);
    }
  });

  it('λ = 0 reduces to the central survival function (JKB 1995 eq. 29.2, j = 0 term only)', () => {
    for (const [x, df] of [[1, 1], [10, 7], [250, 200]] as const) {
      expect(noncentralChiSquareSurvival(x, df, 0)).toBe(chiSquareSurvival(x, df));
    }
  });

  it('agrees with a seeded Monte Carlo of Σ(Z_i + μ_i)² within 4 binomial σ (computed in the test)', () => {
    const rand = mulberry32(20240917);
    const normal = normalSampler(rand);
    const df = 6;
    const mu = [1.2, -0.4, 0.8, 0, 2.0, -1.1]; // λ = Σ μ² = 7.65
    const lambda = mu.reduce((s, m) => s + m * m, 0);
    const x = 18;
    const trials = 40_000;
    let above = 0;
    for (let t = 0; t < trials; t++) {
      let s = 0;
      for (let i = 0; i < df; i++) {
        const z = normal() + mu[i];
        s += z * z;
      }
      if (s > x) above++;
    }
    const p = noncentralChiSquareSurvival(x, df, lambda);
    const sigma = Math.sqrt((p * (1 - p)) / trials);
    expect(Math.abs(above / trials - p)).toBeLessThan(4 * sigma);
  });

  it('returns NaN out of domain', () => {
    expect(noncentralChiSquareSurvival(1, 0, 1)).toBeNaN();
    expect(noncentralChiSquareSurvival(1, 2, -1)).toBeNaN();
    expect(noncentralChiSquareSurvival(NaN, 2, 1)).toBeNaN();
    expect(noncentralChiSquareSurvival(-1, 2, 1)).toBe(1);
  });
});

describe('central chi-square', () => {
  it('upper quantile matches scipy.stats.chi2.isf to 1e-12 relative for α 0.5–1e-15', () => {
    for (const { alpha, df, isf } of fixture.centralUpperQuantile) {
      const got = chiSquareUpperQuantile(alpha, df);
      expect(Math.abs(got - isf) / isf, `α=${alpha} df=${df}`).toBeLessThan(1e-12);
      // round trip through our own survival function
      expect(Math.abs(chiSquareSurvival(got, df) - alpha) / alpha).toBeLessThan(1e-11);
    }
  });
  it('df = 2: S(x) = e^{−x/2}, quantile −2 ln α (exponential distribution, JKB 1994 ch. 18)', () => {
    expect(chiSquareSurvival(3, 2)).toBeCloseTo(Math.exp(-1.5), 14);
    expect(chiSquareUpperQuantile(0.01, 2)).toBeCloseTo(-2 * Math.log(0.01), 12);
    expect(chiSquareQuantile(0.99, 2)).toBeCloseTo(-2 * Math.log(0.01), 10);
    expect(chiSquareCdf(3, 2)).toBeCloseTo(1 - Math.exp(-1.5), 14);
  });
  it('df = 1, α = 0.05 gives 3.841458820694124 (1.959963984540054², normal 97.5 % point; scipy.stats.norm.ppf)', () => {
    expect(chiSquareUpperQuantile(0.05, 1)).toBeCloseTo(1.959963984540054 ** 2, 11);
  });
  it('quantile returns NaN outside (0, 1]', () => {
    expect(chiSquareUpperQuantile(0, 3)).toBeNaN();
    expect(chiSquareUpperQuantile(1.5, 3)).toBeNaN();
    expect(chiSquareUpperQuantile(1, 3)).toBe(0);
  });
});

describe('noncentral chi-square far below its mean', () => {
  it('is 1 to double precision, on both sides of the shortcut, and still < 1 nearer the mean', () => {
    // Pr(X ≤ x) ≤ Φ(√x − √λ) (X ≥ (Z₁ + √λ)², derived here): at √λ − √x = 30, Φ(−30) ≈ 5e-198 (NIST
    // DLMF 7.12.1 asymptotics), so the full mixture sum must give 1 there within its own summation
    // tolerance (terms dropped below ~1e-10 of the sum): the shortcut at 38 joins it without a visible step.
    const lambda = 1e6;
    const x30 = (Math.sqrt(lambda) - 30) ** 2;
    const x39 = (Math.sqrt(lambda) - 39) ** 2;
    expect(noncentralChiSquareSurvival(x30, 4, lambda)).toBeGreaterThan(1 - 1e-9);
    expect(noncentralChiSquareSurvival(x39, 4, lambda)).toBe(1);
    expect(noncentralChiSquareSurvival(1e6, 5, 1e8)).toBe(1);
    // At the mean the survival is near 1/2 (normal limit of the noncentral χ², JKB 1995 ch. 29).
    const atMean = noncentralChiSquareSurvival(lambda + 4, 4, lambda);
    expect(atMean).toBeGreaterThan(0.45);
    expect(atMean).toBeLessThan(0.55);
  });
});

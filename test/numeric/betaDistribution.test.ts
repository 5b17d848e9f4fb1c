/** The Beta CDF and quantile (numeric/betaDistribution.ts) against scipy (test/fixtures/betaDistribution.py). */
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { betaQuantile, regularizedBeta } from '../../src/numeric/betaDistribution.js';

const ref = JSON.parse(readFileSync(new URL('../fixtures/betaDistribution.json', import.meta.url), 'utf8')) as {
  cdf: Array<{ x: number; a: number; b: number; value: number }>;
  quantile: Array<{ p: number; a: number; b: number; value: number }>;
};

describe('Beta distribution', () => {
  it('I_x(a, b) matches scipy.special.betainc to 1e-10 relative (the prefactor subtracts ln Γ values near 2e4 at a + b ≈ 2500: ~1e-12 lost to rounding)', () => {
    for (const c of ref.cdf) expect(Math.abs(regularizedBeta(c.x, c.a, c.b) - c.value)).toBeLessThan(1e-10 * Math.max(c.value, 1e-300) + 1e-15);
  });
  it('the quantile matches scipy.stats.beta.ppf to 1e-9 (bisection to 1e-12 in x)', () => {
    for (const q of ref.quantile) expect(Math.abs(betaQuantile(q.p, q.a, q.b) - q.value)).toBeLessThan(1e-9);
  });
  it('out of domain gives NaN (kernel convention)', () => {
    expect(regularizedBeta(-0.1, 1, 1)).toBeNaN();
    expect(betaQuantile(0.5, 0, 1)).toBeNaN();
  });
});

import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { lnGamma, regularizedGammaP, regularizedGammaQ } from '../../src/numeric/gammaFunctions.js';

// Reference values: scipy.special.gammaln / gammainc / gammaincc (scipy 1.17.1),
// generated once by test/fixtures/chiSquare.py into test/fixtures/chiSquare.json.
const fixture = JSON.parse(
  readFileSync(new URL('../fixtures/chiSquare.json', import.meta.url), 'utf8'),
) as {
  incompleteGamma: { a: number; x: number; P: number; Q: number }[];
  lnGamma: { x: number; lnGamma: number }[];
};

function relErr(got: number, want: number): number {
  return Math.abs(got - want) / Math.max(Math.abs(want), 1e-300);
}

describe('lnGamma', () => {
  it('matches scipy.special.gammaln to 1e-14 (absolute where the value is near zero)', () => {
    for (const { x, lnGamma: want } of fixture.lnGamma) {
      const got = lnGamma(x);
      expect(Math.abs(got - want) / Math.max(1, Math.abs(want)), `x=${x}`).toBeLessThan(1e-14);
    }
  });
  it('Γ(1/2) = √π and Γ(n) = (n−1)! (NIST DLMF §5.4)', () => {
    expect(lnGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 14);
    expect(Math.exp(lnGamma(11))).toBeCloseTo(3628800, 6); // 10! (DLMF §5.4)
  });
  it('returns NaN for x ≤ 0 (kernel convention)', () => {
    expect(lnGamma(0)).toBeNaN();
    expect(lnGamma(-1.5)).toBeNaN();
    expect(lnGamma(NaN)).toBeNaN();
  });
});

describe('regularized incomplete gamma', () => {
  it('matches scipy.special.gammainc / gammaincc to 1e-12 relative (a 0.5–600, x/a 1e-3–5)', () => {
    let worst = 0;
    for (const { a, x, P, Q } of fixture.incompleteGamma) {
      const eP = relErr(regularizedGammaP(a, x), P);
      const eQ = relErr(regularizedGammaQ(a, x), Q);
      worst = Math.max(worst, eP, eQ);
      expect(eP, `P(${a}, ${x})`).toBeLessThan(1e-12);
      expect(eQ, `Q(${a}, ${x})`).toBeLessThan(1e-12);
    }
    expect(worst).toBeLessThan(1e-12);
  });
  it('Q(1, x) = e^{−x} (NIST DLMF §8.4, a = 1)', () => {
    for (const x of [0.01, 0.7, 3, 20]) {
      expect(relErr(regularizedGammaQ(1, x), Math.exp(-x))).toBeLessThan(1e-14);
    }
  });
  it('P + Q = 1 (definition, DLMF §8.2) and out-of-domain input gives NaN', () => {
    for (const [a, x] of [[0.5, 0.2], [40, 41], [300, 250], [7, 30]] as const) {
      expect(regularizedGammaP(a, x) + regularizedGammaQ(a, x)).toBeCloseTo(1, 14);
    }
    expect(regularizedGammaP(0, 1)).toBeNaN();
    expect(regularizedGammaQ(1, -1)).toBeNaN();
    expect(regularizedGammaP(1, 0)).toBe(0);
  });
});

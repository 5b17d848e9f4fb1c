import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { fitMoonDip, foldedMoonDip, oseProfile, oseQuadrature, type MoonDipGeometry } from '../../src/timing/moonDipStack.js';
import { createRng } from '../../src/noise/rng.js';

// Reference profiles: scipy.integrate.quad over the moon's orbital phase (adaptive Gauss–Kronrod with
// breakpoints at the limb crossings), generated once by test/fixtures/detectionStatistics.py.
const fixture = JSON.parse(readFileSync(new URL('../fixtures/detectionStatistics.json', import.meta.url), 'utf8')) as {
  ose: { xP: number; a: number; b: number; u1: number; u2: number; f: number }[];
};
const q = oseQuadrature();

describe('oseProfile (uniform star, derived arcsine-CDF formula)', () => {
  it('check values (x_P, a, f): (0, ½, 1), (¾, ½, ⅔), (1, ½, ½), (1.2, ½, 0.36901), (½, 2, 0.35038) (computed with the derived formula; quad agrees)', () => {
    expect(oseProfile(0, 0.5)).toBe(1);
    expect(oseProfile(0.75, 0.5)).toBeCloseTo(2 / 3, 14);
    expect(oseProfile(1.0, 0.5)).toBeCloseTo(0.5, 14);
    expect(oseProfile(1.2, 0.5)).toBeCloseTo(0.36901, 5);
    expect(oseProfile(0.5, 2.0)).toBeCloseTo(0.35038, 5);
  });

  it('is symmetric, within [0, 1], and conserves ∫f dx_P = 2 (the moon spends the same time on the chord at any a; property, derived)', () => {
    fc.assert(
      fc.property(fc.double({ min: -3, max: 3, noNaN: true }), fc.double({ min: 0, max: 3, noNaN: true }), (x, a) => {
        const f = oseProfile(x, a);
        return f >= 0 && f <= 1 && Math.abs(f - oseProfile(-x, a)) < 1e-15;
      }),
    );
    for (const a of [0.1, 0.5, 1.3, 2.5]) {
      // midpoint rule on [−1 − a, 1 + a]; f is continuous for a > 0
      const m = 200_000;
      const lo = -1 - a;
      const h = (2 + 2 * a) / m;
      let s = 0;
      for (let i = 0; i < m; i++) s += oseProfile(lo + (i + 0.5) * h, a);
      expect(s * h).toBeCloseTo(2, 6);
    }
  });

  it('a = 0 is the point-moon step, NaN for a < 0', () => {
    expect(oseProfile(0.99, 0)).toBe(1);
    expect(oseProfile(1, 0)).toBe(0.5);
    expect(oseProfile(1.01, 0)).toBe(0);
    expect(oseProfile(0.5, -1)).toBeNaN();
  });
});

describe('foldedMoonDip (impact parameter, quadratic limb darkening)', () => {
  it('matches scipy quad to 1e-12 (uniform: closed form; limb-darkened: 24-node smoothstep Gauss–Legendre, measured 1.1e-15; 16 nodes give 6e-11)', () => {
    for (const c of fixture.ose) {
      const f = foldedMoonDip(c.xP, c.a, c.b, c.u1, c.u2, q);
      expect(Math.abs(f - c.f)).toBeLessThan(1e-12);
    }
  });

  it('uniform star with impact b uses chord half-length L = sqrt(1 − b²): f(x, a, b) = oseProfile(x/L, a/L) (derived)', () => {
    const L = Math.sqrt(1 - 0.6 * 0.6);
    expect(foldedMoonDip(0.7, 0.3, 0.6, 0, 0, q)).toBeCloseTo(oseProfile(0.7 / L, 0.3 / L), 15);
  });

  it('as a → 0 the limb-darkened profile tends to I(r)/(4Ω) at the planet (Mandel & Agol 2002 §5 small-planet limit)', () => {
    const u1 = 0.4;
    const u2 = 0.26;
    const x = 0.5;
    const b = 0.3;
    const mu = Math.sqrt(1 - x * x - b * b);
    const expected = (1 - u1 * (1 - mu) - u2 * (1 - mu) ** 2) / (1 - u1 / 3 - u2 / 6);
    expect(foldedMoonDip(x, 1e-7, b, u1, u2, q)).toBeCloseTo(expected, 6);
    expect(foldedMoonDip(x, 0, b, u1, u2, q)).toBeCloseTo(expected, 14);
  });

  it('NaN out of domain (kernel convention)', () => {
    expect(foldedMoonDip(0, -0.1, 0, 0.4, 0.2, q)).toBeNaN();
    expect(foldedMoonDip(0, 0.1, 1, 0.4, 0.2, q)).toBeNaN();
  });
});

/** A stack of `transits` windows sampled every `cadenceS` over ±halfWindowS, with injected depth and white noise. */
function simulateStack(geom: MoonDipGeometry, depth: number, sigma: number, seed: number, cadenceS: number, halfWindowS: number) {
  const perWindow = Math.floor((2 * halfWindowS) / cadenceS);
  const transits = 12;
  const n = perWindow * transits;
  const t = new Float64Array(n);
  const r = new Float64Array(n);
  const rng = createRng(seed, 0, 0);
  let k = 0;
  for (let j = 0; j < transits; j++) {
    const jitter = (rng.uniform() - 0.5) * cadenceS; // random phase of the cadence per transit
    for (let i = 0; i < perWindow; i++) {
      t[k] = -halfWindowS + (i + 0.5) * cadenceS + jitter;
      r[k] = -depth * foldedMoonDip(geom.skySpeed * t[k], geom.separation, geom.impact, geom.u1, geom.u2, q) + sigma * rng.normal();
      k++;
    }
  }
  return { t, r };
}

describe('fitMoonDip matched filter', () => {
  // Planet crossing a Sun-like star in ≈ 6 h: speed 2/(6 h) stellar radii per s; moon at 0.4 R*.
  const geom: MoonDipGeometry = { skySpeed: 2 / (6 * 3600), impact: 0.2, separation: 0.4, u1: 0.4, u2: 0.26 };

  it('noiseless injection is recovered exactly (by construction)', () => {
    const { t, r } = simulateStack(geom, 1e-4, 0, 1, 600, 6 * 3600);
    const fit = fitMoonDip(t, r, 1e-4, geom);
    expect(fit.depth).toBeCloseTo(1e-4, 15);
    expect(fit.chiSquare).toBeLessThan(1e-20);
  });

  it('σ_δ = (Σ f²/σ²)^{−1/2} (weighted least squares, computed in the test)', () => {
    const { t, r } = simulateStack(geom, 0, 1e-3, 2, 600, 6 * 3600);
    const prof = new Float64Array(t.length);
    const fit = fitMoonDip(t, r, 1e-3, geom, { profileOut: prof });
    let s = 0;
    for (const f of prof) s += (f * f) / 1e-6;
    expect(fit.depthError).toBeCloseTo(1 / Math.sqrt(s), 15);
    expect(fit.dof).toBe(t.length - 1);
  });

  it('injection + white noise: pulls (δ̂ − δ)/σ_δ have mean 0 ± 0.1 and std 1 ± 0.1 over 600 stacks, with and without offset / in-transit exclusion (Monte Carlo, common practice)', () => {
    const depth = 2e-4;
    const sigma = 5e-4;
    for (const opts of [{}, { fitOffset: true }, { excludeWithinS: 2.5 * 3600, fitOffset: true }]) {
      const trials = 600;
      let s1 = 0;
      let s2 = 0;
      for (let k = 0; k < trials; k++) {
        const { t, r } = simulateStack(geom, depth, sigma, 100 + k, 900, 8 * 3600);
        const fit = fitMoonDip(t, r, sigma, geom, opts);
        const pull = (fit.depth - depth) / fit.depthError;
        s1 += pull;
        s2 += pull * pull;
      }
      const mean = s1 / trials;
      const std = Math.sqrt(s2 / trials - mean * mean);
      // standard errors for 600 normal pulls: 0.041 (mean), 0.029 (std); bounds ≈ 2.5–3.5 SE
      expect(Math.abs(mean)).toBeLessThan(0.1);
      expect(Math.abs(std - 1)).toBeLessThan(0.1);
    }
  });

  it('rejects bad input with RangeError naming the field', () => {
    const t = Float64Array.from([0, 1, 2]);
    const r = Float64Array.from([0, 0, 0]);
    expect(() => fitMoonDip(t, Float64Array.from([0, 0]), 1, geom)).toThrow(/residual/);
    expect(() => fitMoonDip(t, r, 0, geom)).toThrow(/sigma/);
    expect(() => fitMoonDip(t, r, 1, { ...geom, impact: 1.2 })).toThrow(/impact/);
    expect(() => fitMoonDip(t, r, 1, { ...geom, skySpeed: 0 })).toThrow(/skySpeed/);
    // all points far outside the moon's reach: the profile is zero everywhere
    expect(() => fitMoonDip(Float64Array.from([1e6, 2e6]), Float64Array.from([0, 0]), 1, geom)).toThrow(/profile/);
  });
});

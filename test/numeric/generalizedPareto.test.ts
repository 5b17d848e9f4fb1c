/**
 * The generalised Pareto distribution and tail fits (numeric/generalizedPareto.ts) against scipy
 * (test/fixtures/generalizedPareto.py), closed forms and limits.
 */
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import {
  andersonDarlingGpd, andersonDarlingGpdPValue, fitGpdMl, fitGpdPwm, fitUpperTail, gpdCdf, gpdQuantile, gpdSurvival,
  gpdSurvivalQuantile, tailQuantile, tailSurvival,
} from '../../src/numeric/generalizedPareto.js';
import { createRng } from '../../src/noise/rng.js';

interface Sample {
  true_shape: number;
  true_scale: number;
  y: number[];
  ml: { shape: number; scale: number; loglik: number; ad: number | null };
  pwm: { shape: number; scale: number; ad: number | null };
}
const ref = JSON.parse(readFileSync(new URL('../fixtures/generalizedPareto.json', import.meta.url), 'utf8')) as {
  survival: Array<{ y: number; shape: number; scale: number; value: number }>;
  cdf: Array<{ y: number; shape: number; scale: number; value: number }>;
  survival_quantile: Array<{ q: number; shape: number; scale: number; value: number }>;
  samples: Sample[];
};

function logLik(y: number[], shape: number, scale: number): number {
  // GPD log-density ln f(y) = −ln σ − (1 + 1/ξ) ln(1 + ξy/σ) (Hosking & Wallis 1987, eq. 1 differentiated).
  let s = 0;
  for (const v of y) s += -Math.log(scale) - (Math.abs(shape) < 1e-12 ? v / scale : (1 + 1 / shape) * Math.log1p((shape * v) / scale));
  return s;
}

describe('generalised Pareto distribution', () => {
  it('survival and CDF match scipy.stats.genpareto.sf/cdf to 1e-13 relative (closed forms, rounding only)', () => {
    for (const c of ref.survival) expect(Math.abs(gpdSurvival(c.y, c.shape, c.scale) - c.value)).toBeLessThanOrEqual(1e-13 * c.value + 1e-300);
    for (const c of ref.cdf) expect(Math.abs(gpdCdf(c.y, c.shape, c.scale) - c.value)).toBeLessThanOrEqual(1e-13 * c.value + 1e-300);
  });
  it('the survival quantile matches scipy.stats.genpareto.isf to 1e-12 relative, and inverts the survival', () => {
    for (const c of ref.survival_quantile) {
      const y = gpdSurvivalQuantile(c.q, c.shape, c.scale);
      expect(Math.abs(y - c.value)).toBeLessThanOrEqual(1e-12 * c.value);
      expect(gpdSurvival(y, c.shape, c.scale)).toBeCloseTo(c.q, 12); // inverse pair: common practice, no source
      expect(Math.abs(gpdQuantile(1 - c.q, c.shape, c.scale) - y)).toBeLessThan(1e-9 * y); // 1 − q rounds at 1e-16: relative error ≲ 1e-16/q
    }
  });
  it('closed forms: ξ = 0 is the exponential, ξ = −1 the uniform on [0, σ] (Hosking & Wallis 1987, §2)', () => {
    expect(gpdSurvival(1.7, 0, 2)).toBe(Math.exp(-0.85));
    expect(gpdSurvivalQuantile(0.25, 0, 2)).toBeCloseTo(2 * Math.log(4), 15);
    expect(gpdSurvival(0.6, -1, 2)).toBeCloseTo(0.7, 15);
    expect(gpdSurvival(2.5, -1, 2)).toBe(0); // beyond the end point σ
    expect(gpdSurvivalQuantile(0.3, -1, 2)).toBeCloseTo(1.4, 14);
    expect(gpdSurvivalQuantile(0, -0.5, 2)).toBe(4); // end point −σ/ξ
    expect(gpdSurvivalQuantile(0, 0.2, 2)).toBe(Infinity);
    // |ξ| → 0 joins the exponential smoothly (the log1p/expm1 forms): limit, no source
    expect(gpdSurvival(3, 1e-10, 1)).toBeCloseTo(Math.exp(-3), 9);
  });
  it('out of domain gives NaN (kernel convention)', () => {
    expect(gpdSurvival(1, 0.1, 0)).toBeNaN();
    expect(gpdSurvivalQuantile(1.5, 0.1, 1)).toBeNaN();
    expect(gpdQuantile(-0.1, 0.1, 1)).toBeNaN();
  });
});

describe('GPD fits', () => {
  it('maximum likelihood matches scipy (genpareto.fit with floc = 0, polished) to 1e-6 in shape and scale, and its log-likelihood is no lower', () => {
    for (const s of ref.samples) {
      const f = fitGpdMl(s.y);
      expect(Math.abs(f.shape - s.ml.shape), `shape of the ξ = ${s.true_shape} sample`).toBeLessThan(1e-6);
      expect(Math.abs(f.scale - s.ml.scale) / s.ml.scale).toBeLessThan(1e-6);
      expect(logLik(s.y, f.shape, f.scale)).toBeGreaterThanOrEqual(s.ml.loglik - 1e-9);
      // The fixture's Anderson–Darling statistic (Choulakian & Stephens 2001, eq. 3, with scipy's cdf/sf).
      expect(andersonDarlingGpd(s.y, s.ml.shape, s.ml.scale)).toBeCloseTo(s.ml.ad!, 10);
    }
  });
  it('probability-weighted moments match the fixture (Hosking & Wallis 1987, eqs. 5–6, evaluated with numpy) to 1e-12', () => {
    for (const s of ref.samples) {
      const f = fitGpdPwm(s.y);
      expect(f.shape).toBeCloseTo(s.pwm.shape, 12);
      expect(f.scale).toBeCloseTo(s.pwm.scale, 12);
      const a2 = andersonDarlingGpd(s.y, s.pwm.shape, s.pwm.scale);
      if (s.pwm.ad === null) expect(a2).toBe(Infinity); // an excess beyond the PWM end point (Hosking & Wallis 1987, §4)
      else expect(a2).toBeCloseTo(s.pwm.ad, 10);
    }
  });
  it('both estimators recover ξ = 0 and ξ = −1 from samples at their exact plotting positions (population limit, error O(ln m/m))', () => {
    const m = 20000;
    const expo = new Float64Array(m);
    const unif = new Float64Array(m);
    for (let j = 0; j < m; j++) {
      const q = (j + 0.5) / m;
      expo[j] = gpdSurvivalQuantile(q, 0, 1.7);
      unif[j] = gpdSurvivalQuantile(q, -1, 3);
    }
    for (const fit of [fitGpdPwm, fitGpdMl]) {
      const e = fit(expo);
      expect(Math.abs(e.shape)).toBeLessThan(2e-3);
      expect(Math.abs(e.scale / 1.7 - 1)).toBeLessThan(2e-3);
      const u = fit(unif);
      expect(Math.abs(u.shape + 1)).toBeLessThan(2e-3);
      expect(Math.abs(u.scale / 3 - 1)).toBeLessThan(2e-3);
    }
  });
  it('bad input throws naming the argument', () => {
    expect(() => fitGpdPwm([1])).toThrow(/at least 2/);
    expect(() => fitGpdMl([1, -2, 3])).toThrow(/excesses\[1\]/);
    expect(() => fitGpdPwm([2, 2, 2])).toThrow(/all be equal/);
  });
});

describe('tail fits (Knijnenburg et al. 2009)', () => {
  function sortedSample(n: number, shape: number, scale: number, seed: number): Float64Array {
    const rng = createRng(seed, 0, 0);
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = gpdSurvivalQuantile(1 - rng.uniform(), shape, scale);
    return x.sort();
  }

  it('the threshold sits halfway between the N_exc-th and (N_exc + 1)-th largest values; the tail survival joins the empirical fraction at u', () => {
    const x = sortedSample(1000, 0, 1, 3);
    const f = fitUpperTail(x, { maxExceedances: 100 });
    expect(f.exceedances).toBe(100);
    expect(f.threshold).toBe(0.5 * (x[900] + x[899])); // Knijnenburg et al. 2009, §2.2
    expect(tailSurvival(f, f.threshold)).toBeCloseTo(0.1, 15);
    expect(tailQuantile(f, 0.1)).toBeCloseTo(f.threshold, 12);
    expect(tailSurvival(f, tailQuantile(f, 0.004))).toBeCloseTo(0.004, 12);
    expect(tailSurvival(f, f.threshold - 0.1)).toBeNaN();
    expect(tailQuantile(f, 0.2)).toBeNaN();
  });

  it('on exponential samples the 1 % tail quantile from 1000 values averages the true ln 100 within 3 % over 40 samples (exact: the exponential is a GPD with ξ = 0)', () => {
    let sum = 0;
    for (let s = 0; s < 40; s++) sum += tailQuantile(fitUpperTail(sortedSample(1000, 0, 1, 100 + s), { maxExceedances: 200 }), 0.01);
    // sd of one estimate ≈ 0.25 (ξ and σ from 200 excesses, extrapolated ×20), so ≈ 0.04 for the mean of 40: 3 % of 4.6 is 3 sd.
    expect(Math.abs(sum / 40 / Math.log(100) - 1)).toBeLessThan(0.03);
  });

  it('the Anderson–Darling bootstrap accepts a GPD sample and rejects a clearly non-GPD tail (common practice, no source)', () => {
    const rng = createRng(7, 0, 0);
    const good = sortedSample(200, 0.1, 1, 11);
    const fitGood = fitGpdPwm(good);
    expect(andersonDarlingGpdPValue(good, fitGood, 'pwm', 199, rng).pValue).toBeGreaterThan(0.05);
    // Two separated clumps: no GPD fits this.
    const bad = new Float64Array(200);
    for (let i = 0; i < 200; i++) bad[i] = i < 100 ? 0.01 + 0.0001 * i : 5 + 0.0001 * i;
    const fitBad = fitGpdPwm(bad);
    expect(andersonDarlingGpdPValue(bad, fitBad, 'pwm', 199, rng).pValue).toBeLessThan(0.05); // rejected at the 5 % level
  });

  it('stopping the bootstrap once acceptance at the level is certain gives the full test\'s decision (Besag & Clifford 1991), with a p-value no larger', () => {
    for (let seed = 0; seed < 12; seed++) {
      // Half GPD samples, half a GPD with a clump added (often rejected).
      const x = sortedSample(150, 0.1, 1, 40 + seed);
      if (seed % 2 === 1) for (let i = 0; i < 30; i++) x[i] = 0.001 * (i + 1);
      const f = fitGpdPwm(x);
      const full = andersonDarlingGpdPValue(x, f, 'pwm', 99, createRng(seed, 1, 0));
      const fast = andersonDarlingGpdPValue(x, f, 'pwm', 99, createRng(seed, 1, 0), 0.05);
      expect(fast.pValue >= 0.05).toBe(full.pValue >= 0.05);
      expect(fast.pValue).toBeLessThanOrEqual(full.pValue);
      expect(fast.statistic).toBe(full.statistic);
    }
  });

  it('the exceedance count drops by the step until the check passes, and the result is reproducible with the same seed', () => {
    // Body uniform, tail exponential above the 90 % point: a threshold in the body is rejected, one in the tail accepted.
    const n = 2000;
    const x = new Float64Array(n);
    const rng = createRng(5, 0, 0);
    for (let i = 0; i < n; i++) {
      const u = rng.uniform();
      x[i] = u < 0.9 ? u : 0.9 - 0.05 * Math.log((1 - u) / 0.1);
    }
    x.sort();
    const a = fitUpperTail(x, { maxExceedances: 600, rng: createRng(9, 0, 0) });
    const b = fitUpperTail(x, { maxExceedances: 600, rng: createRng(9, 0, 0) });
    expect(a).toEqual(b);
    expect(a.accepted).toBe(true);
    expect((600 - a.exceedances) % 10).toBe(0);
    expect(a.exceedances).toBeLessThanOrEqual(300);
  });

  it('bad options throw naming the option', () => {
    const x = Float64Array.from([1, 2, 3, 4, 5, 6, 7, 8]);
    expect(() => fitUpperTail(x, { maxExceedances: 8 })).toThrow(/maxExceedances/);
    expect(() => fitUpperTail(Float64Array.from([3, 2, 1, 0]))).toThrow(/ascending/);
    expect(() => fitUpperTail(x, { level: 2 })).toThrow(/level/);
  });
});

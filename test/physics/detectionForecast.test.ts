import { describe, it, expect } from 'vitest';
import { mulberry32 } from '../helpers/mulberry32.js';
import { anyOfIndependent, combinedChannelAlpha, forecastDetection, timingChannelAlpha } from '../../src/physics/detectionForecast.js';
import { chiSquareUpperQuantile } from '../../src/numeric/noncentralChiSquare.js';


/**
 * Seeded Monte Carlo of the same statistics (computed in the test): N epochs, TTV = A sin(2πνn + φ),
 * TDV = −B cos(2πνn + φ) with random φ, Gaussian errors; χ²_TTV about the least-squares line,
 * χ²_TDV about the mean; detection when χ² exceeds the central upper-α quantile.
 */
function simulate(n: number, nu: number | null, ttvRms: number, tdvRms: number, sigmaTc: number, sigmaDur: number, alpha: number, trials: number, seed: number) {
  const u = mulberry32(seed);
  const gauss = () => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u()); // Box & Muller 1958
  const thrTtv = chiSquareUpperQuantile(alpha, n - 2);
  const thrTdv = chiSquareUpperQuantile(alpha, n - 1);
  const thrJoint = chiSquareUpperQuantile(alpha, 2 * n - 3);
  // The Monte Carlo's combined rule (timing/detection.ts): TTV or TDV above its α/3 threshold (3 channels with the dip).
  const cTtv = chiSquareUpperQuantile(alpha / 3, n - 2);
  const cTdv = chiSquareUpperQuantile(alpha / 3, n - 1);
  let hitCombined = 0;
  const A = ttvRms * Math.SQRT2;
  const B = tdvRms * Math.SQRT2;
  const tt = new Float64Array(n);
  const dd = new Float64Array(n);
  const xm = (n - 1) / 2;
  let sxx = 0;
  for (let k = 0; k < n; k++) sxx += (k - xm) ** 2;
  let hitTtv = 0, hitTdv = 0, hitJoint = 0;
  for (let t = 0; t < trials; t++) {
    const phi = 2 * Math.PI * u();
    const nuT = nu ?? 0.5 * u(); // null: alias frequency uniform on [0, ½] per trial
    let my = 0, md = 0;
    for (let k = 0; k < n; k++) {
      const ph = 2 * Math.PI * nuT * k + phi;
      tt[k] = A * Math.sin(ph) + sigmaTc * gauss();
      dd[k] = -B * Math.cos(ph) + sigmaDur * gauss();
      my += tt[k];
      md += dd[k];
    }
    my /= n;
    md /= n;
    let sxy = 0;
    for (let k = 0; k < n; k++) sxy += (k - xm) * (tt[k] - my);
    const slope = sxy / sxx;
    let c1 = 0, c2 = 0;
    for (let k = 0; k < n; k++) {
      const r = tt[k] - my - slope * (k - xm);
      c1 += (r * r) / (sigmaTc * sigmaTc);
      c2 += ((dd[k] - md) * (dd[k] - md)) / (sigmaDur * sigmaDur);
    }
    if (c1 > thrTtv) hitTtv++;
    if (c2 > thrTdv) hitTdv++;
    if (c1 + c2 > thrJoint) hitJoint++;
    if (c1 > cTtv || c2 > cTdv) hitCombined++;
  }
  return { ttv: hitTtv / trials, tdv: hitTdv / trials, joint: hitJoint / trials, combined: hitCombined / trials };
}

describe('forecastDetection', () => {
  it('given ν = 0.36875 (Earth–Moon alias): phase-averaged forecast matches a seeded Monte Carlo within 4 binomial σ', () => {
    const trials = 20_000;
    const inp = { nTransits: 15, sigmaTcS: 60, sigmaDurS: 90, ttvRmsS: 60, tdvRmsS: 70, falseAlarm: 0.01 };
    // combinedChannels: 3 asks for the rule the simulation below applies (each channel at α/3).
    const f = forecastDetection({ ...inp, aliasFrequencyPerEpoch: 0.36875, combinedChannels: 3 });
    const mc = simulate(15, 0.36875, 60, 70, 60, 90, 0.01, trials, 7);
    for (const key of ['ttv', 'tdv', 'joint'] as const) {
      const p = f[key]!.probability;
      const sigma = Math.sqrt((p * (1 - p)) / trials);
      expect(Math.abs(mc[key] - p), `${key}: MC ${mc[key]} vs forecast ${p}`).toBeLessThan(4 * sigma);
    }
    // The combined rule, joined per phase (TTV and TDV share φ): the same seeded Monte Carlo.
    const pc = f.combined!;
    expect(Math.abs(mc.combined - pc), `combined: MC ${mc.combined} vs forecast ${pc}`).toBeLessThan(4 * Math.sqrt((pc * (1 - pc)) / trials));
  });
  it('the combination rule: Bonferroni α/m, Šidák 1 − (1 − α)^(1/m), any of independent channels', () => {
    expect(combinedChannelAlpha(0.03, 3)).toBeCloseTo(0.01, 15); // Bonferroni (1936), by hand
    expect(combinedChannelAlpha(0.05, 3, 'sidak')).toBeCloseTo(0.016952427508441503, 14); // 1 − 0.95^(1/3), by hand
    expect(anyOfIndependent([0.5, 0.5])).toBeCloseTo(0.75, 15); // by hand
    expect(anyOfIndependent([])).toBe(0);
  });
  it('the Monte Carlo\'s weighted rule tests each timing channel at α·w/Σw over the channels that exist', () => {
    // By hand from the weights (template 0.85, TTV, TDV, dip 0.05 each; Genovese, Roeder & Wasserman 2006).
    expect(timingChannelAlpha(0.01, 10)).toBeCloseTo(0.0005, 15);
    expect(timingChannelAlpha(0.01, 2)).toBeCloseTo((0.01 * 0.05) / 0.95, 15); // no TTV channel
    expect(timingChannelAlpha(0.01, 1)).toBeCloseTo((0.01 * 0.05) / 0.9, 15);
  });

  it('given a low alias frequency ν = 0.07 (signal largely absorbed by the ephemeris) the same holds', () => {
    const trials = 20_000;
    const inp = { nTransits: 10, sigmaTcS: 20, sigmaDurS: 20, ttvRmsS: 60, tdvRmsS: 15, falseAlarm: 0.003 };
    const f = forecastDetection({ ...inp, aliasFrequencyPerEpoch: 0.07 });
    // the (N−2)/N approximation would be far off here
    expect(f.ttv!.probability).toBeLessThan(forecastDetection(inp).ttv!.probability - 0.1);
    const mc = simulate(10, 0.07, 60, 15, 20, 20, 0.003, trials, 11);
    for (const key of ['ttv', 'tdv', 'joint'] as const) {
      const p = f[key]!.probability;
      const sigma = Math.sqrt(Math.max(p * (1 - p), 1e-4) / trials);
      expect(Math.abs(mc[key] - p), `${key}: MC ${mc[key]} vs forecast ${p}`).toBeLessThan(4 * sigma);
    }
  });

  it('ν unknown: the (N−2)/N approximation vs a Monte Carlo with ν uniform on [0, ½] (measured gap, see comment)', () => {
    // The default mode evaluates the probability at the frequency- and phase-averaged λ; the
    // Monte Carlo averages the probability over ν ~ U[0, ½]. Measured here: the gap (below)
    // stays within 0.03 for these values, much larger than the binomial error, because
    // P(λ) is not linear in λ; so this is a bound on the approximation, not a binomial test.
    const trials = 20_000;
    const inp = { nTransits: 15, sigmaTcS: 60, sigmaDurS: 90, ttvRmsS: 60, tdvRmsS: 70, falseAlarm: 0.01 };
    const f = forecastDetection(inp);
    const mc = simulate(15, null, 60, 70, 60, 90, 0.01, trials, 3);
    for (const key of ['ttv', 'tdv', 'joint'] as const) {
      expect(Math.abs(mc[key] - f[key]!.probability), `${key}: MC ${mc[key]} vs forecast ${f[key]!.probability}`).toBeLessThan(0.03);
    }
  });

  it('the (N−2)/N share is the average over ν ~ U[0, ½] of the exact phase-mean λ (Parseval; trapezoid rule in the test)', () => {
    const n = 9;
    const base = { nTransits: n, sigmaTcS: 10, sigmaDurS: 10, ttvRmsS: 10, tdvRmsS: 10, falseAlarm: 0.01 };
    const m = 200;
    let sumTtv = 0, sumTdv = 0;
    for (let j = 0; j <= m; j++) {
      const w = j === 0 || j === m ? 0.5 : 1;
      const f = forecastDetection({ ...base, aliasFrequencyPerEpoch: (0.5 * j) / m });
      sumTtv += w * f.ttv!.noncentrality;
      sumTdv += w * f.tdv!.noncentrality;
    }
    expect(sumTtv / m).toBeCloseTo(n - 2, 9); // (N − 2)(δ/σ)², δ = σ
    expect(sumTdv / m).toBeCloseTo(n - 1, 9); // (N − 1)(δ/σ)²
  });

  it('with no signal the detection probability equals the false-alarm probability (definition)', () => {
    const f = forecastDetection({ nTransits: 10, sigmaTcS: 30, sigmaDurS: 30, ttvRmsS: 0, tdvRmsS: 0, falseAlarm: 0.003 });
    for (const c of [f.ttv, f.tdv, f.joint]) expect(c!.probability).toBeCloseTo(0.003, 12);
    expect(f.ttv!.dof).toBe(8);
    expect(f.tdv!.dof).toBe(9);
    expect(f.joint!.dof).toBe(17);
  });

  it('noncentralities follow λ_TTV = (N−2)(δ/σ)², λ_TDV = (N−1)(δ/σ)², joint = sum (the stated approximation)', () => {
    const f = forecastDetection({ nTransits: 12, sigmaTcS: 20, sigmaDurS: 40, ttvRmsS: 10, tdvRmsS: 30, falseAlarm: 1e-3 });
    expect(f.ttv!.noncentrality).toBeCloseTo(10 * 0.25, 12);
    expect(f.tdv!.noncentrality).toBeCloseTo(11 * 0.5625, 12);
    expect(f.joint!.noncentrality).toBeCloseTo(2.5 + 6.1875, 12);
    expect(f.joint!.threshold).toBeCloseTo(chiSquareUpperQuantile(1e-3, 21), 12);
  });

  it('more transits never lower the probability for a fixed signal (property, common practice)', () => {
    let prev = 0;
    for (let n = 3; n <= 40; n++) {
      const p = forecastDetection({ nTransits: n, sigmaTcS: 60, sigmaDurS: 60, ttvRmsS: 40, tdvRmsS: 40, falseAlarm: 0.01 }).joint!.probability;
      expect(p).toBeGreaterThanOrEqual(prev - 1e-12);
      prev = p;
    }
  });

  it('rejects bad input with RangeError naming the argument', () => {
    const ok = { nTransits: 10, sigmaTcS: 30, sigmaDurS: 30, ttvRmsS: 5, tdvRmsS: 5, falseAlarm: 0.01 };
    expect(() => forecastDetection({ ...ok, nTransits: 0 })).toThrow(/nTransits/);
    expect(() => forecastDetection({ ...ok, nTransits: 4.5 })).toThrow(/nTransits/);
    expect(() => forecastDetection({ ...ok, sigmaTcS: 0 })).toThrow(/sigmaTcS/);
    expect(() => forecastDetection({ ...ok, tdvRmsS: -1 })).toThrow(/tdvRmsS/);
    expect(() => forecastDetection({ ...ok, falseAlarm: 1 })).toThrow(/falseAlarm/);
  });

  it('2 transits: no TTV channel (0 dof after the line), TDV with 1 dof, the joint test is the TDV test; 1 transit: no timing channel', () => {
    // Degrees of freedom of a χ² of residuals after a least-squares fit of k parameters to N points: N − k
    // (Seber & Lee 2003, Linear Regression Analysis, §2.4): TTV N − 2, TDV N − 1.
    const ok = { sigmaTcS: 30, sigmaDurS: 30, ttvRmsS: 60, tdvRmsS: 60, falseAlarm: 0.01 };
    for (const nu of [undefined, 0.3]) {
      const two = forecastDetection({ ...ok, nTransits: 2, aliasFrequencyPerEpoch: nu });
      expect(two.ttv).toBeNull();
      expect(two.tdv!.dof).toBe(1);
      expect(two.joint!.dof).toBe(1);
      expect(two.joint!.probability).toBeCloseTo(two.tdv!.probability, 12);
      expect(two.notes.join(' ')).toMatch(/no timing channel with 2 transits/);
      const one = forecastDetection({ ...ok, nTransits: 1, aliasFrequencyPerEpoch: nu });
      expect(one.ttv).toBeNull();
      expect(one.tdv).toBeNull();
      expect(one.joint).toBeNull();
      expect(one.notes.join(' ')).toMatch(/no timing channel with 1 transit/);
    }
    // Unknown ν: λ_TDV = (N − 1)(δ/σ)² = 4 at N = 2 (the stated approximation).
    expect(forecastDetection({ ...ok, nTransits: 2 }).tdv!.noncentrality).toBeCloseTo(4, 12);
    // Given ν: the TDV of 2 transits is B(cos φ_1 − cos φ_0)-like; residual about the mean of
    // v = cos(2πνn), n = 0, 1: Σ (v − v̄)² = (1 − cos 2πν)²/2 (direct computation).
    const nu = 0.3;
    const r = forecastDetection({ ...ok, nTransits: 2, aliasFrequencyPerEpoch: nu });
    const vv = (1 - Math.cos(2 * Math.PI * nu)) ** 2 / 2;
    const uu = Math.sin(2 * Math.PI * nu) ** 2 / 2;
    // Phase mean of λ(φ) = kd (vv cos²φ + uu sin²φ + …) is kd (vv + uu)/2, kd = 2(δ/σ)² = 8.
    expect(r.tdv!.noncentrality).toBeCloseTo((8 * (vv + uu)) / 2, 9);
    // And 3 or more transits keep all three channels.
    expect(forecastDetection({ ...ok, nTransits: 3 }).notes).toEqual([]);
  });
});


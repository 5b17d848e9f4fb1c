/**
 * The template channel's layout with a ground campaign (timing/templateSearch.ts, "Ground
 * campaign"): the observer demo (invented system and site, scenarios/demo-observer.yaml), whose
 * decade-long campaign holds more transits than observation.transits and sees only parts of them.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseScenarioText } from '../../src/scenario/loadScenario.js';
import { observingPlan, withCampaignEpochs } from '../../src/noise/observingPlan.js';
import { createRng } from '../../src/noise/rng.js';
import { runRealization } from '../../src/timing/realization.js';
import { knownTemplateBound } from '../../src/timing/knownTemplateBound.js';
import { withoutMoon } from '../../src/sweep/applyAxes.js';
import {
  binSamples, buildTemplateBank, layoutSamples, templateLayout, templateResiduals, templateStatistic,
} from '../../src/timing/templateSearch.js';

const text = readFileSync(new URL('../../scenarios/demo-observer.yaml', import.meta.url), 'utf8');
const s = parseScenarioText(text, 'demo-observer.yaml');
const noMoon = { ...s, moon: null };
const plan = observingPlan(s)!;
const L = templateLayout(noMoon);

describe('template layout with a ground campaign', () => {
  it('the scenario is a campaign whose transits differ from observation.transits (premise of the tests below)', () => {
    expect(plan).not.toBeNull();
    expect(plan.epochs).not.toBe(s.observation.transits);
    expect(plan.sigmaVaries).toBe(true); // a ground budget: each exposure's σ follows its air mass
  });

  it('has the campaign epochs (withCampaignEpochs), as the realizations (common practice, no source)', () => {
    expect(L.k0.length).toBe(withCampaignEpochs(s).observation.transits);
    expect(L.k0.length).toBe(plan.epochs);
  });

  it("its bins hold every plan exposure once, each with its weight (σ_ref/σ_i)², and no bin is empty (common practice, no source)", () => {
    const ones = new Float64Array(plan.timeS.length).fill(1);
    const binned = binSamples(L, plan.timeS, plan.epoch, ones, new Float64Array(L.bins));
    const weighted = binSamples(L, plan.timeS, plan.epoch, ones, new Float64Array(L.bins), L.exposureWeight);
    let total = 0;
    for (let b = 0; b < L.bins; b++) {
      total += binned[b];
      expect(binned[b]).toBeGreaterThan(0);
      expect(weighted[b]).toBeCloseTo(L.count[b], 12);
      expect(L.count[b]).toBeGreaterThan(0);
    }
    expect(total).toBe(plan.timeS.length);
    expect(L.exposureWeight).not.toBeNull();
    for (let i = 0; i < plan.timeS.length; i++) expect(L.exposureWeight![i]).toBeCloseTo((L.sigmaRef / plan.sigma[i]) ** 2, 12);
    expect(layoutSamples(L).timeS.length).toBe(plan.timeS.length);
  });

  it('every sample a realization observes falls in a bin (none dropped as out of range; common practice, no source)', () => {
    const { observation } = runRealization(noMoon, createRng(3, 0, 0), { withMoon: false });
    expect(observation.timeS.length).toBeGreaterThan(0);
    expect(Math.max(...observation.epoch)).toBeGreaterThanOrEqual(s.observation.transits);
    const ones = new Float64Array(observation.timeS.length).fill(1);
    const binned = binSamples(L, observation.timeS, observation.epoch, ones, new Float64Array(L.bins));
    expect(binned.reduce((a, b) => a + b, 0)).toBe(observation.timeS.length);
  });

  // The SNR of a template restricted to a subset of the samples cannot exceed its SNR on all of them
  // (the squared norm of the projected template is a sum over the samples; Kay 1998, Fundamentals of
  // Statistical Signal Processing Vol. II, §4.3, deflection d² = Σ s²/σ²): the campaign sees a part
  // of each window, so its bank's per-template SNR is below the whole windows' one.
  const bank = buildTemplateBank(s, L, { phases: 12 });
  it("each template's SNR on the campaign is below its SNR on the whole windows of the same epochs (Kay 1998 Vol. II §4.3)", () => {
    const whole = { ...s, sky: undefined, observation: { ...s.observation, transits: plan.epochs } };
    const Lw = templateLayout({ ...whole, moon: null });
    expect(Lw.exposures).toBeNull();
    expect(Lw.bins).toBeGreaterThan(L.bins);
    const bankWhole = buildTemplateBank(whole, Lw, { phases: 12 });
    expect(bankWhole.templates).toBe(bank.templates);
    for (let k = 0; k < bank.templates; k++) {
      expect(bank.snr[k]).toBeGreaterThan(0);
      expect(bank.snr[k]).toBeLessThan(bankWhole.snr[k]);
    }
  });

  it("a no-moon realization's template statistic is finite (common practice, no source)", () => {
    const { observation, recovery } = runRealization(noMoon, createRng(3, 0, 1), { withMoon: false });
    const rho = templateResiduals(L, observation.timeS, observation.epoch, observation.flux, observation.sigma, recovery.global);
    expect(Number.isFinite(templateStatistic(bank, rho))).toBe(true);
  });
});

describe('template channel with per-exposure σ (ground budget: air mass)', () => {
  // Generalised matched filter for known diagonal noise covariance (Kay 1998, Fundamentals of Statistical
  // Signal Processing Vol. II, §4.5): z = d̃ᵀC⁻¹r / sqrt(d̃ᵀC⁻¹d̃) is N(0, 1) under the noise, and its SNR
  // sqrt(d̃ᵀC⁻¹d̃) is the whitened one the known-template bound computes.
  const bank = buildTemplateBank(s, L, { phases: 12 });
  const { recovery } = runRealization(noMoon, createRng(3, 0, 2), { withMoon: false });
  const fit = recovery.global!;

  it('each filter output of pure noise with each exposure at its own σ_i is N(0, 1) (Kay 1998 Vol. II §4.5; Monte Carlo, 5σ)', () => {
    const rng = createRng(11, 0, 0);
    const n = plan.timeS.length;
    const flux = new Float64Array(n);
    const rho = new Float64Array(L.bins);
    const draws = 3000;
    const k = 5;
    const one = { ...bank, templates: 1, filters: bank.filters.subarray(k * L.bins, (k + 1) * L.bins), statistic: 'max' as const };
    const zero = { ...fit, baseline: 0 }; // residual = flux: the noise itself
    let s1 = 0;
    let s2 = 0;
    let u2 = 0;
    for (let r = 0; r < draws; r++) {
      for (let i = 0; i < n; i++) flux[i] = plan.sigma[i] * rng.normal();
      const z = templateStatistic(one, templateResiduals(L, plan.timeS, plan.epoch, flux, 1, zero, rho, undefined, plan.sigma));
      s1 += z;
      s2 += z * z;
      // the same noise with one σ for every exposure (the rms): its z is not unit-variance
      const rms = Math.sqrt(plan.sigma.reduce((a, x) => a + x * x, 0) / n);
      u2 += templateStatistic(one, templateResiduals(L, plan.timeS, plan.epoch, flux, rms, zero, rho)) ** 2;
    }
    const mean = s1 / draws;
    const variance = s2 / draws - mean * mean;
    expect(Math.abs(mean)).toBeLessThan(5 / Math.sqrt(draws));
    expect(Math.abs(variance - 1)).toBeLessThan(5 * Math.sqrt(2 / draws)); // sd of a sample variance: sqrt(2/n)
    // one σ for every exposure leaves z's variance off 1 on this plan (measured 1.74): the test can tell
    expect(u2 / draws - 1).toBeGreaterThan(5 * Math.sqrt(2 / draws));
  });

  it("a template's SNR equals the known-template bound's whitened SNR for the same moon angles: to 0.1 % with one exposure per bin, within 3 % with the default bins (Kay 1998 Vol. II §4.5)", () => {
    // A coplanar circular moon, so the bank's and the bound's templates differ only in the phase.
    const flat = parseScenarioText(text.replace(/eccentricity: 0\.005/, 'eccentricity: 0').replace(/inclination: 2 deg/, 'inclination: 0 deg'), 'flat');
    expect(flat.moon!.eccentricity).toBe(0);
    expect(flat.moon!.inclinationRad).toBe(0);
    const K = 6;
    const planetOnly = withCampaignEpochs(withoutMoon(flat));
    const bound = knownTemplateBound(withCampaignEpochs(flat), { angles: K, planetOnly });
    // the bound's phases 2π(j + ½)/K are the bank's 2π(2j + 1)/(2K)
    const Lf = templateLayout({ ...flat, moon: null });
    const b2 = buildTemplateBank(withCampaignEpochs(flat), Lf, { phases: 2 * K });
    // One exposure per bin: no binning loss, the two computations agree to the finite-difference Jacobians'
    // precision (measured 1e-5 relative).
    const L1 = templateLayout({ ...flat, moon: null }, 1);
    const b1 = buildTemplateBank(withCampaignEpochs(flat), L1, { phases: 2 * K });
    for (let j = 0; j < K; j++) {
      expect(b2.phaseRad[2 * j + 1]).toBeCloseTo((2 * Math.PI * (j + 0.5)) / K, 12);
      expect(bound.snr[j]).toBeGreaterThan(1);
      expect(Math.abs(b1.snr[2 * j + 1] / bound.snr[j] - 1), `phase ${j}, one exposure per bin`).toBeLessThan(1e-3);
      // default bins (~ingress/4): measured 2.3–2.5 % below
      expect(Math.abs(b2.snr[2 * j + 1] / bound.snr[j] - 1), `phase ${j}`).toBeLessThan(0.03);
    }
  });

  it('no-moon realizations: the statistic is finite and each filter output has unit variance (calibrated whitening; Monte Carlo, 5σ)', () => {
    const draws = 300;
    const k = 2;
    const one = { ...bank, templates: 1, filters: bank.filters.subarray(k * L.bins, (k + 1) * L.bins), statistic: 'max' as const };
    let s1 = 0;
    let s2 = 0;
    for (let r = 0; r < draws; r++) {
      const { observation, recovery: rec } = runRealization(noMoon, createRng(21, 0, r), { withMoon: false });
      expect(observation.sigmaPoint).not.toBeNull();
      const rho = templateResiduals(L, observation.timeS, observation.epoch, observation.flux, observation.sigma, rec.global, undefined, undefined, observation.sigmaPoint);
      expect(Number.isFinite(templateStatistic(bank, rho))).toBe(true);
      const z = templateStatistic(one, rho);
      s1 += z;
      s2 += z * z;
    }
    const mean = s1 / draws;
    const variance = s2 / draws - mean * mean;
    expect(Math.abs(mean)).toBeLessThan(5 / Math.sqrt(draws));
    expect(Math.abs(variance - 1)).toBeLessThan(5 * Math.sqrt(2 / draws));
  });
});

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
  });

  it('has the campaign epochs (withCampaignEpochs), as the realizations (common practice, no source)', () => {
    expect(L.k0.length).toBe(withCampaignEpochs(s).observation.transits);
    expect(L.k0.length).toBe(plan.epochs);
  });

  it("its bins hold every plan exposure once and no bin is empty (common practice, no source)", () => {
    const ones = new Float64Array(plan.timeS.length).fill(1);
    const binned = binSamples(L, plan.timeS, plan.epoch, ones, new Float64Array(L.bins));
    let total = 0;
    for (let b = 0; b < L.bins; b++) {
      total += binned[b];
      expect(binned[b]).toBe(L.count[b]);
      expect(L.count[b]).toBeGreaterThan(0);
    }
    expect(total).toBe(plan.timeS.length);
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

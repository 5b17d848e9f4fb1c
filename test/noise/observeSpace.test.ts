/**
 * A space instrument's observation (issue 18, item 1): with `visibility` and
 * `campaign`, the exposures lie only inside the visible stretches of the
 * pattern (on the BJD_TDB axis), every exposure has the instrument's stated
 * noise, there is no air mass and no weather, and the draws depend only on
 * (seed, cell, realization).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseScenarioText } from '../../src/scenario/loadScenario.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';
import { scenarioToDocument } from '../../src/scenario/scenarioDocument.js';
import { observeScenario } from '../../src/noise/observe.js';
import { hasCampaign, observingPlan } from '../../src/noise/observingPlan.js';
import { whiteNoiseSigma } from '../../src/noise/whiteNoise.js';
import { createRng } from '../../src/noise/rng.js';
import { transitCalendar } from '../../src/sky/calendar.js';
import { runRealization } from '../../src/timing/realization.js';
import type { Scenario } from '../../src/scenario/types.js';
import { knownTemplateBound } from '../../src/timing/knownTemplateBound.js';

const DAY = 86400;
const demo = readFileSync(new URL('../../scenarios/demo-space.yaml', import.meta.url), 'utf8');
const REF = 2461400.5;
const ON = 55 * 60;
const CYCLE = 95 * 60;

/** BJD_TDB of a time on the simulation's axis (s since the conjunction of calendar epoch firstEpoch). */
const bjdOf = (s: Scenario, firstEpoch: number, t: number) => s.observation.t0BjdTdb + (firstEpoch * s.planet.periodS + t) / DAY;
/** Whether a BJD_TDB is in a visible part of the demo's pattern: (t − start) mod (on + off) < on, and inside a 27-of-82-day block. */
function visible(bjd: number): boolean {
  const s = (bjd - REF) * DAY;
  const inOrbit = ((s % CYCLE) + CYCLE) % CYCLE <= ON + 1e-3; // 1 ms: the BJD's rounding
  const b = ((s % (82 * DAY)) + 82 * DAY) % (82 * DAY);
  return inOrbit && b <= 27 * DAY + 1e-3;
}

describe('a space instrument\'s observing plan', () => {
  const s = parseScenarioText(demo, 'demo-space');

  it('is a campaign without a site: exposures only inside the visible stretches, the stated noise, no air mass', () => {
    expect(hasCampaign(s)).toBe(true);
    const plan = observingPlan(s)!;
    const cal = transitCalendar(s);
    expect(plan.epochs).toBe(cal.transits.length);
    expect(plan.firstEpoch).toBe(cal.transits[0].epoch);
    expect(plan.timeS.length).toBeGreaterThan(100);
    const stated = whiteNoiseSigma(s.instrument.noiseFraction, s.instrument.noiseTimescaleS, s.instrument.exposureS);
    for (let i = 0; i < plan.timeS.length; i++) {
      // Independent check of the stated schedule (common practice, no source).
      expect(visible(bjdOf(s, plan.firstEpoch, plan.timeS[i])), `exposure ${i}`).toBe(true);
      expect(plan.sigma[i]).toBe(stated);
      expect(Number.isNaN(plan.airmass[i])).toBe(true);
      expect(plan.site[i]).toBe(0);
    }
    expect(plan.sigmaVaries).toBe(false);
    // Transits with data inside first-to-last contact: those the calendar finds partly or wholly visible.
    const seen = cal.transits.filter((r) => r.transit_coverage > 0).length;
    expect(plan.transitsSeenPerSite[0]).toBeLessThanOrEqual(seen);
    expect(plan.transitsSeenPerSite[0]).toBeGreaterThanOrEqual(seen - 1); // a stretch shorter than a cadence may hold no exposure
  });

  it('an always-visible pattern observes every transit window whole, on the cadence', () => {
    const always = parseScenarioText(demo.replace(/^visibility:\n(?: {2}.*\n)+/m, 'visibility: {on: 95 min}\n'), 'always');
    const plan = observingPlan(always)!;
    const win = 2 * plan.halfWindowS;
    const perWindow = Math.floor(win / always.instrument.cadenceS);
    // Each epoch's window holds floor or floor + 1 cadence steps (common practice, no source: counting).
    const counts = new Map<number, number>();
    for (let i = 0; i < plan.epoch.length; i++) counts.set(plan.epoch[i], (counts.get(plan.epoch[i]) ?? 0) + 1);
    expect(counts.size).toBe(plan.epochs);
    for (const n of counts.values()) expect([perWindow, perWindow + 1]).toContain(n);
  });

  it('simulates data only inside the visible stretches, the same for the same (seed, cell, realization), also for a cell rebuilt from its SI values (a worker\'s)', () => {
    const a = observeScenario(s, createRng(s.seed, 3, 1));
    const b = observeScenario(s, createRng(s.seed, 3, 1));
    expect(Array.from(a.flux)).toEqual(Array.from(b.flux));
    expect(a.firstEpoch).toBe(observingPlan(s)!.firstEpoch);
    for (let i = 0; i < a.timeS.length; i++) expect(visible(bjdOf(s, a.firstEpoch, a.timeS[i]))).toBe(true);
    // A structured clone loses the document; scenarioToDocument writes one from the SI values, and the
    // pattern must survive it, or the worker would observe every transit whole.
    const clone = parseScenario(scenarioToDocument(structuredClone(s)), 'clone');
    expect(clone.sky?.visibility).toEqual(s.sky?.visibility);
    const c = observeScenario(clone, createRng(s.seed, 3, 1));
    expect(Array.from(c.flux)).toEqual(Array.from(a.flux));
    // The whole realization (fits included) runs on these data.
    const r1 = runRealization(s, createRng(s.seed, 3, 1));
    const r2 = runRealization(clone, createRng(s.seed, 3, 1));
    expect(JSON.stringify(r1)).toBe(JSON.stringify(r2));
  });

  it('the known-template bound uses the same exposures: the gaps of the pattern lower its SNR against an always-visible instrument', () => {
    const always = parseScenarioText(demo.replace(/^visibility:\n(?: {2}.*\n)+/m, 'visibility: {on: 95 min}\n'), 'always');
    const mean = (x: Float64Array) => x.reduce((a, b) => a + b, 0) / x.length;
    const gapped = mean(knownTemplateBound(s, { angles: 8 }).snr);
    const whole = mean(knownTemplateBound(always, { angles: 8 }).snr);
    expect(Number.isFinite(gapped)).toBe(true);
    // Fewer exposures (about 19 % of the windows' time) can only lower a matched-filter SNR, which adds in
    // quadrature over exposures (e.g. Kay 1998, Fundamentals of Statistical Signal Processing II, §4.3).
    expect(gapped).toBeLessThan(whole);
    expect(gapped).toBeGreaterThan(0);
  });
});

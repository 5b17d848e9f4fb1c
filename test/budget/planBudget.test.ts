/**
 * The budget with its Monte Carlo confirmation (one sweep cell per evaluated
 * value). Few realizations and Kepler long cadence (29.4 min; Jenkins et al.
 * 2010, ApJ 713, L120) keep each budget to a few seconds. The expected number
 * of transits comes from the noncentral chi-square forecast (computeLimits /
 * src/physics/detectionForecast.ts), in the regime where it applies: white
 * noise and a dense, small moon whose photocentric TTV (Szabó et al. 2006) is
 * negligible.
 */
import { describe, it, expect } from 'vitest';
import { parse } from 'yaml';
import { readFileSync } from 'node:fs';
import { planBudget } from '../../src/app/planBudget.js';
import { renderBudgetPage } from '../../src/report/budgetPage.js';
import { formatBudget } from '../../src/budget/formatBudget.js';
import { computeLimits } from '../../src/limits/computeLimits.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';
import type { BudgetResult, BudgetTarget, PlanBudgetOptions } from '../../src/budget/budgetTypes.js';

/** planBudget of a scenario document, parsed first as a library caller does. */
const planDoc = (doc: unknown, target?: BudgetTarget, options?: PlanBudgetOptions): BudgetResult => planBudget(parseScenario(doc), target, options);

function doc(moonMass: string, separation = '10 Rp', noise = '30 ppm per 6.5 h', name = 'MC budget test (invented)'): Record<string, unknown> {
  return parse(`
name: ${JSON.stringify(name)}
seed: 4242
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, age: 4.6 Gyr, limb_darkening: {u1: 0.4, u2: 0.26}}
planet: {mass: 1 Mjup, radius: 1 Rjup, period: 365.25 d, impact_parameter: 0.2}
moon: {mass: ${moonMass}, radius: 0.1 Rearth, separation: ${separation}}
instrument: {cadence: 29.4244 min, noise: ${noise}}
observation: {transits: 8, baseline: 5 h}
detection: {false_alarm: 0.05}
`) as Record<string, unknown>;
}

const quick = { channel: 'ttv' as const, probability: 0.9, realizations: 40, nullRealizations: 60 };

describe('planBudget with Monte Carlo', () => {
  it('white noise, dense moon: the transits the Monte Carlo confirms agree with the noncentral chi-square forecast within ±1', () => {
    const d = doc('0.8 Mearth');
    const l = computeLimits(parseScenario(d));
    expect(l.forecast_regime_ok).toBe(true); // photocentric ratio ≪ 0.2: the forecast applies
    const fcast = planDoc(d, { ...quick, forecastOnly: true });
    // 400 no-moon realizations: a threshold on fewer than the default 25/α (a test of the search, not of the rate).
    const r = planDoc(d, { ...quick, realizations: 60, nullRealizations: 400 });
    expect(fcast.answer.reached).toBe(true);
    expect(r.answer.reached).toBe(true);
    expect(Math.abs(r.answer.value! - fcast.answer.value!)).toBeLessThanOrEqual(1);
    // The answer passes, its cheaper neighbour fails, and both carry Wilson intervals around their estimates.
    expect(r.answer.at!.probability).toBeGreaterThanOrEqual(0.9);
    expect(r.answer.cheaperNeighbour!.probability).toBeLessThan(0.9);
    expect(r.answer.dearerNeighbour).not.toBeNull();
    for (const e of [r.answer.at!, r.answer.cheaperNeighbour!, r.answer.dearerNeighbour!]) {
      expect(e.lower).toBeLessThanOrEqual(e.probability);
      expect(e.upper).toBeGreaterThanOrEqual(e.probability);
    }
    // Bounded cost: a handful of evaluations from the forecast's guess.
    expect(r.evaluations.length).toBeLessThanOrEqual(5);
    expect(r.answer.statement).toMatch(/\d+ transits \([\d.]+ h of telescope time/);
    expect(formatBudget(r)).toMatch(/Answer/);
  });

  it('monotone: a heavier moon, a wider moon or lower noise never needs more transits (Monte Carlo)', () => {
    const need = (d: unknown) => {
      const r = planDoc(d, quick);
      return r.answer.reached ? r.answer.value! : Infinity;
    };
    const base = need(doc('0.8 Mearth'));
    expect(base).toBeLessThan(Infinity);
    // Alias frequencies of the compared moons stay in 0.15–0.45 cycles/epoch (see budgetForecast.test.ts).
    for (const d of [doc('1.5 Mearth'), doc('0.8 Mearth', '22 Rp')]) {
      const nu = computeLimits(parseScenario(d)).ttv_alias_frequency_per_epoch!;
      expect(nu).toBeGreaterThan(0.15);
      expect(nu).toBeLessThan(0.45);
    }
    expect(need(doc('1.5 Mearth'))).toBeLessThanOrEqual(base);
    expect(need(doc('0.8 Mearth', '22 Rp'))).toBeLessThanOrEqual(base);
    expect(need(doc('0.8 Mearth', '10 Rp', '15 ppm per 6.5 h'))).toBeLessThanOrEqual(base);
  });

  it('an unreachable target: a clear statement after one evaluation at the most demanding value, not a loop', () => {
    const r = planDoc(doc('0.05 Mearth'), { ...quick, maxTransits: 10, realizations: 20, nullRealizations: 40 });
    expect(r.answer.reached).toBe(false);
    expect(r.evaluations.length).toBe(1);
    expect(r.evaluations[0].value).toBe(10);
    expect(r.answer.statement).toMatch(/cannot be reached at any number of transits in range/);
    expect(r.answer.reasons.join(' ')).toMatch(/Monte Carlo gives/);
    expect(r.answer.reasons.join(' ')).toMatch(/below the noise/);
  });

  it('correlated noise: no white-noise level reaches the target, and the statement names the red-noise floor', () => {
    // Power-law red noise of 1000 ppm per hour (Timmer & König 1995 generator, src/noise/powerLawNoise.ts)
    // against a TTV of ~40 s: timing scatter the white-noise level cannot remove (Pont et al. 2006, MNRAS 373, 231).
    const d = doc('0.8 Mearth');
    (d.instrument as Record<string, unknown>).red_noise = { model: 'power_law', amplitude: '1000 ppm per 1 h', slope: 2 };
    const r = planDoc(d, { ...quick, solve: 'noise', realizations: 12, nullRealizations: 24 });
    expect(r.forecast.applies).toBe(false);
    expect(r.answer.reached).toBe(false);
    expect(r.evaluations.length).toBeLessThanOrEqual(2 * Math.ceil(Math.log2(r.quantity.values.length + 1)) + 5);
    expect(r.answer.statement).toMatch(/cannot be reached at any noise level in range/);
    expect(r.answer.reasons.join(' ')).toMatch(/red\) noise .* floor/);
  });

  it('a moon outside the stable band is reported as such and not simulated', () => {
    const r = planDoc(doc('0.8 Mearth'), { ...quick, moonSeparation: '0.9 hill' });
    expect(r.answer.reached).toBe(false);
    expect(r.evaluations).toHaveLength(0);
    expect(r.answer.statement).toMatch(/beyond stable limit/);
  });

  it('habitable: the targets are the stable, temperate moons of the grid; the Monte Carlo fraction is over the simulated ones', () => {
    const survey = parse(readFileSync(new URL('../../scenarios/demo-survey.yaml', import.meta.url), 'utf8')) as Record<string, unknown>;
    const r = planDoc(survey, {
      habitable: { massFromKg: 0.5 * 5.9722e24, massToKg: 2 * 5.9722e24, grid: 3, fraction: 0.5, confirmMoons: 2 },
      realizations: 8, nullRealizations: 20, maxTransits: 6, probability: 0.5,
    });
    expect(r.habitable!.targets.length).toBeGreaterThan(0);
    for (const m of r.habitable!.targets) {
      expect(m.placement).toEqual(['stable']);
      expect(m.habitability).toBe('temperate');
    }
    expect(r.habitable!.simulated).toBe(2);
    for (const e of r.evaluations) expect([0, 0.5, 1]).toContain(e.probability); // k of 2 moons
    expect(r.answer.statement.length).toBeGreaterThan(20);
  });

  it('the HTML page: self-contained, the chosen value marked, user text escaped', () => {
    const r = planDoc(doc('1.5 Mearth', '10 Rp', '30 ppm per 6.5 h', 'Evil <script>alert(1)</script> b'), { ...quick, forecastOnly: true });
    const html = renderBudgetPage(r);
    expect(html).toContain('Plotly.newPlot');
    expect(html).not.toMatch(/<script[^>]+src=/);
    expect(html).not.toContain('<script>alert(1)</script>');
    expect(html).toContain('chosen: ');
    expect(JSON.parse(JSON.stringify(r)).answer.reached).toBe(true);
  });
});

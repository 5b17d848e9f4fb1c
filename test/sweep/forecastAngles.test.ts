/**
 * The analytic forecast against the Monte Carlo with the moon's angles drawn
 * per realization (an inclined moon: the node is random), where the
 * forecast's assumptions hold (white noise, barycentric TTV dominating: a
 * point-like moon). Invented system.
 */
import { describe, it, expect } from 'vitest';
import { parse } from 'yaml';
import { runCell } from '../../src/sweep/runCell.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';
import { computeLimits } from '../../src/limits/computeLimits.js';

function doc(mass: string): Record<string, unknown> {
  return parse(`
name: forecast angles test (invented)
seed: 9191
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, age: 4.6 Gyr, limb_darkening: {u1: 0.4, u2: 0.26}}
planet: {mass: 0.3 Mjup, radius: 0.8 Rjup, period: 200 d, impact_parameter: 0.2}
moon: {mass: ${mass}, radius: 10 km, separation: 0.25 hill, inclination: 75 deg}
instrument: {cadence: 10 min, noise: 300 ppm per 1 h}
observation: {transits: 8, baseline: 5 h}
detection: {false_alarm: 0.05}
`) as Record<string, unknown>;
}

const ctx = { seed: 9191, realizations: 400, simulateUnstable: false, forecastOnly: false, nullRealizations: 800 };

describe('forecast like for like', () => {
  it('an inclined moon, node drawn per realization: forecast TTV inside the Monte Carlo 95 % interval, the combined Monte Carlo between the timing forecast and the bound', () => {
    const d = doc('1 Mearth');
    const l = computeLimits(parseScenario(d));
    expect(l.forecast_regime_ok).toBe(true);
    expect(l.assumptions.join(' ')).toMatch(/averages over the moon's node/);
    const c = runCell({ index: 0, coords: [], scenario: parseScenario(d) }, ctx);
    // Monte Carlo 95 % Wilson intervals (Wilson 1927, JASA 22, 209) against the analytic forecast
    // (noncentral χ², Johnson, Kotz & Balakrishnan 1995, ch. 29), averaged over the same drawn angles.
    expect(l.pdet_forecast_ttv!).toBeGreaterThanOrEqual(c.pdet_ttv_lo as number);
    expect(l.pdet_forecast_ttv!).toBeLessThanOrEqual(c.pdet_ttv_hi as number);
    // The combined rule (weighted min-p over TTV, TDV, dip and the template channel): the forecast covers the
    // timing channels only, a lower estimate; the known-template bound (Kay 1998, matched filter) is the upper
    // one. The Monte Carlo lies between them, within its interval.
    expect(l.pdet_forecast_combined!).toBeLessThanOrEqual(c.pdet_combined_hi as number);
    expect(c.pdet_combined_lo as number).toBeLessThanOrEqual(c.pdet_bound as number);
    // Measured (before the template channel): forecast TTV 0.616 in [0.536, 0.632] (MC 0.585).
    // The test can tell: before issue 17 the forecast used the scenario's node, 0, where the line of nodes lies
    // along the sky's X axis and the moon's X motion (what the TTV measures) is that of a coplanar orbit; that
    // forecast (here 0.95 against 0.58 measured) lies far outside the interval.
    const fixed = computeLimits(parseScenario({ ...d, moon: { ...(d.moon as object), inclination: '0 deg' } }));
    expect(fixed.pdet_forecast_ttv!).toBeGreaterThan((c.pdet_ttv_hi as number) + 0.2);
  }, 300_000);
});

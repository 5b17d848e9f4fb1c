/**
 * Issue 20: "the forecast tier agrees with the Monte Carlo tier within its
 * interval where the forecast's assumptions hold", checked both ways.
 *
 * The case is built so that the forecast's assumptions hold: white noise
 * stated directly (no ground budget, no red noise), every transit observed
 * whole (no site, campaign or gaps), a high per-transit S/N (depth ≈ 1.1 %
 * against 200 ppm per hour at 5-min cadence) so that the fitted mid-times
 * reach the Cramér–Rao bound the forecast uses, and a point-like moon
 * (density 1000 g/cm³: dip ≤ 5 ppm, photocentric ratio < 0.07, Szabó et al.
 * 2006) so that its own transit and photocentric TTV play no part. The moon is
 * placed at the smallest mass the rank's forecast tier finds at a separation
 * (pdet_forecast_combined = 0.5) and the Monte Carlo cell (`runCell`, the
 * evaluation `budget` and the rank's confirmation use) is run there.
 *
 * Per channel, the forecast is the white-noise noncentral χ² of that channel
 * (detectionForecast.ts); the Monte Carlo tests the same χ² against a
 * threshold calibrated on no-moon realizations, whose false-alarm rate in
 * force differs from α by the order statistic's own scatter (±0.007 at α =
 * 5 % with 1000 no-moon realizations). The forecast is therefore evaluated at
 * the false-alarm probability the Monte Carlo's threshold stands for
 * (10^−threshold: the threshold is −log10 of the χ² p-value, nullSet.ts) and
 * must lie inside the Monte Carlo's Wilson 95 % interval, above its lower end
 * and below its upper end. (At the nominal α the TTV forecast, 0.834, lies just
 * above the inclined case's interval [0.780, 0.829]: the calibrated threshold
 * stands for α = 0.040 there, a 1.4σ draw of the order statistic.)
 *
 * What the forecast does not model is checked as such, not as agreement:
 * - the combined rule: the Monte Carlo adds the photodynamical template
 *   channel, which carries most of the signal, so its combined probability
 *   lies above the forecast's 0.5 and below the known-template bound;
 * - the TDV of an inclined moon: the forecast leaves out the transit-impact-
 *   parameter part of the TDV (Kipping 2009b, MNRAS 396, 1797; timingSignals.ts),
 *   so the TDV channel is compared on a coplanar moon only.
 */
import { describe, it, expect } from 'vitest';
import { parse } from 'yaml';
import { runCell } from '../../src/sweep/runCell.js';
import { rankListText } from '../../src/app/rankList.js';
import { planetRows, readPlanetTable } from '../../src/rank/planetTable.js';
import { moonScenario, RANK_SEPARATIONS_HILL } from '../../src/rank/rankPlanet.js';
import { computeLimits } from '../../src/limits/computeLimits.js';
import { scenarioDocumentOf } from '../../src/scenario/scenarioDocument.js';
import { scenarioMoonDensity } from '../../src/budget/targetMoon.js';
import type { ScenarioDocument } from '../../src/scenario/types.js';

/** Moon realizations per Monte Carlo cell: the Wilson 95 % half-width at pdet 0.8 is ±0.025 (the two cells take about 9 s). */
const REALIZATIONS = 1000;
/** No-moon realizations calibrating the thresholds: (n + 1)·α = 50 exceedances at α = 5 %. */
const NO_MOON = 1000;

const scenario = (inclination: string): ScenarioDocument => parse(`
name: forecast against Monte Carlo (invented)
seed: 5151
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5700 K, age: 4 Gyr, limb_darkening: {u1: 0.45, u2: 0.2}}
planet: {mass: 1 Mjup, radius: 1 Rjup, period: 30 d, impact_parameter: 0.3}
moon: {mass: 1 Mearth, density: 1000 g/cm^3, separation: 0.2 hill, inclination: ${inclination}}
instrument: {cadence: 5 min, noise: 200 ppm per 1 h}
observation: {transits: 8, baseline: 3 h}
detection: {false_alarm: 5 %}
`) as ScenarioDocument;
const LIST = 'name,star_mass_msun,star_radius_rsun,star_teff_k,planet_mass_mjup,planet_radius_rjup,period_d,impact_parameter\nOrvel-5 b,0.8,0.78,5000,0.3,0.8,150,0.2\n';

/** The rank's smallest moon at `fHill`, the Monte Carlo cell there, and the forecast at the cell's thresholds. */
function compare(inclination: string, fHill: number, cell: number) {
  const doc = scenario(inclination);
  const ranked = rankListText(doc, LIST, 'list.csv', { settings: { probability: 0.9, calendar: false } }).planets[0];
  const massKg = ranked.min_moon_mass_kg[RANK_SEPARATIONS_HILL.indexOf(fHill as never)]!;
  const row = planetRows(doc, readPlanetTable(LIST))[0].scenario!;
  const base = scenarioDocumentOf(row);
  const s = moonScenario(base, massKg, fHill, scenarioMoonDensity(row), row.name);
  const l = computeLimits(s);
  const mc = runCell({ index: cell, coords: [], scenario: s }, { seed: 5151, realizations: REALIZATIONS, simulateUnstable: false, forecastOnly: false, nullRealizations: NO_MOON });
  // The forecast of the χ² test at the false-alarm probability of the Monte Carlo's calibrated threshold.
  const at = (threshold: number | null | undefined, massScale = 1) => {
    const alpha = 10 ** -(threshold as number);
    const d = { ...base, detection: { ...(base.detection as object), false_alarm: alpha } } as ScenarioDocument;
    return computeLimits(moonScenario(d, massKg * massScale, fHill, scenarioMoonDensity(row), row.name));
  };
  return { massKg, l, mc, at };
}

describe('rank: the forecast tier against the Monte Carlo tier where the forecast holds', () => {
  it('inclined moon (node drawn per realization, the forecast averaging over the same draws): the TTV forecast lies inside the Monte Carlo\'s interval, both sides', () => {
    const { l, mc, at } = compare('40 deg', 0.2, 1);
    expect(l.forecast_regime_ok).toBe(true);
    expect(l.moon_placement).toEqual(['stable']);
    // The rank's own number: the combined forecast is 0.5 at this mass (RANK_PDET, to the search tolerance).
    expect(Math.abs(l.pdet_forecast_combined! - 0.5)).toBeLessThan(2e-3);
    expect(mc.simulated).toBe(true);
    const f = at(mc.threshold_ttv).pdet_forecast_ttv!;
    const [lo, hi] = [mc.pdet_ttv_lo as number, mc.pdet_ttv_hi as number];
    console.info(`inclined, 0.2 RH: TTV forecast ${l.pdet_forecast_ttv!.toFixed(3)} at α, ${f.toFixed(3)} at the Monte Carlo's threshold (α in force ${(10 ** -(mc.threshold_ttv as number)).toFixed(4)}); Monte Carlo ${mc.pdet_ttv} [${lo.toFixed(3)}, ${hi.toFixed(3)}]; combined: forecast ${l.pdet_forecast_combined!.toFixed(3)}, Monte Carlo ${mc.pdet_combined} [${(mc.pdet_combined_lo as number).toFixed(3)}, ${(mc.pdet_combined_hi as number).toFixed(3)}] (template alone ${mc.pdet_template}), bound ${mc.pdet_bound!.toFixed(3)}`);
    // Source: noncentral χ² of the TTV excess (Johnson, Kotz & Balakrishnan 1995, ch. 29; detectionForecast.ts) against the
    // Monte Carlo's Wilson (1927) 95 % interval: agreement both ways.
    expect(f, `forecast ${f.toFixed(3)}, Monte Carlo ${mc.pdet_ttv} [${lo.toFixed(3)}, ${hi.toFixed(3)}]`).toBeGreaterThanOrEqual(lo);
    expect(f).toBeLessThanOrEqual(hi);
    // The test has the power to see a 10 % error in the TTV amplitude (∝ moon mass, Kipping 2009a): either way, it falls outside.
    expect(at(mc.threshold_ttv, 0.9).pdet_forecast_ttv!).toBeLessThan(lo);
    expect(at(mc.threshold_ttv, 1.1).pdet_forecast_ttv!).toBeGreaterThan(hi);
    // The combined rule: the template channel, which the forecast leaves out, lifts the Monte Carlo above the forecast's 0.5,
    // and nothing beats the known-template bound (Kay 1998).
    expect(mc.pdet_combined_lo as number).toBeGreaterThan(l.pdet_forecast_combined!);
    expect(mc.pdet_bound!).toBeGreaterThanOrEqual(mc.pdet_combined_lo as number);
  }, 60_000);

  it('coplanar moon (no transit-impact-parameter TDV): the TTV and the TDV forecasts lie inside the Monte Carlo\'s intervals, both sides', () => {
    const { l, mc, at } = compare('0 deg', 0.1, 2);
    expect(l.forecast_regime_ok).toBe(true);
    expect(mc.simulated).toBe(true);
    for (const ch of ['ttv', 'tdv'] as const) {
      const f = (ch === 'ttv' ? at(mc.threshold_ttv).pdet_forecast_ttv : at(mc.threshold_tdv).pdet_forecast_tdv)!;
      const [lo, hi] = [mc[`pdet_${ch}_lo`] as number, mc[`pdet_${ch}_hi`] as number];
      console.info(`coplanar, 0.1 RH: ${ch.toUpperCase()} forecast ${(ch === 'ttv' ? l.pdet_forecast_ttv : l.pdet_forecast_tdv)!.toFixed(3)} at α, ${f.toFixed(3)} at the Monte Carlo's threshold; Monte Carlo ${mc[`pdet_${ch}`]} [${lo.toFixed(3)}, ${hi.toFixed(3)}]`);
      // Source: as above, per channel (the TDV: χ² about the mean duration, N − 1 degrees of freedom).
      expect(f, `${ch}: forecast ${f.toFixed(3)}, Monte Carlo ${mc[`pdet_${ch}`]} [${lo.toFixed(3)}, ${hi.toFixed(3)}]`).toBeGreaterThanOrEqual(lo);
      expect(f, ch).toBeLessThanOrEqual(hi);
    }
    expect(mc.pdet_combined_lo as number).toBeGreaterThan(l.pdet_forecast_combined!);
    expect(mc.pdet_bound!).toBeGreaterThanOrEqual(mc.pdet_combined_lo as number);
  }, 60_000);
});

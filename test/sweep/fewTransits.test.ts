/**
 * Few transits, lost transits, grazing geometry, overlapping windows and
 * oversized light curves in the numerical layer: answers, not crashes
 * (issue 15). Invented systems throughout.
 */
import { describe, it, expect } from 'vitest';
import { parse } from 'yaml';
import { runCell, channelsFor } from '../../src/sweep/runCell.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';
import { computeLimits } from '../../src/limits/computeLimits.js';
import { observeScenario } from '../../src/noise/observe.js';
import { createRng } from '../../src/noise/rng.js';
import { recoverTimings } from '../../src/timing/timingSeries.js';
import { runRealization } from '../../src/timing/realization.js';
import {
  lightCurvePointCount, MAX_LIGHT_CURVE_POINTS, observationSizeProblems, sampleWindows, scenarioDurations, transitWindows, windowsOverlap,
} from '../../src/photometry/transitWindows.js';
import { assumptionRows, gapsText, noiseModelText } from '../../src/report/assumptionsTable.js';
import { CELL_PARSE } from '../../src/sweep/applyAxes.js';
import type { Scenario } from '../../src/scenario/types.js';

/** A cell's typed scenario from its document, as the engine builds it (applyAxes: CELL_PARSE). */
const cellOf = (doc: unknown): Scenario => parseScenario(doc, 'cell', CELL_PARSE);

function doc(over: { transits?: number; impact?: number; cadence?: string; baseline?: string; period?: string; extraObs?: string; extraIns?: string } = {}): Record<string, unknown> {
  return parse(`
name: Ostrava b (invented, few-transit test)
seed: 515
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5700 K, age: 4 Gyr, limb_darkening: {u1: 0.4, u2: 0.25}}
planet: {mass: 0.3 Mjup, radius: 0.8 Rjup, period: ${over.period ?? '60 d'}, impact_parameter: ${over.impact ?? 0.3}}
moon: {mass: 2 Mearth, radius: 0.5 Rearth, separation: 15 Rp}
instrument: {cadence: ${over.cadence ?? '5 min'}, noise: 300 ppm per 1 h${over.extraIns ?? ''}}
observation: {transits: ${over.transits ?? 2}, baseline: ${over.baseline ?? '3 h'}${over.extraObs ?? ''}}
detection: {false_alarm: 5 %}
`) as Record<string, unknown>;
}

const ctx = (realizations: number, nullRealizations: number, forecastOnly = false) => ({ seed: 515, realizations, simulateUnstable: false, forecastOnly, nullRealizations });

describe('few transits', () => {
  it('channels: TTV needs 3 transits, TDV 2, the dip 1 (N − 2 and N − 1 degrees of freedom, Seber & Lee 2003 §2.4)', () => {
    expect(channelsFor(1)).toEqual(['dip', 'template']);
    expect(channelsFor(2)).toEqual(['tdv', 'dip', 'template']);
    expect(channelsFor(3)).toEqual(['ttv', 'tdv', 'dip', 'template']);
  });

  it('computeLimits with 2 transits: no TTV forecast, a TDV forecast, and the reason in the assumptions', () => {
    const l = computeLimits(parseScenario(doc({ transits: 2 })));
    expect(l.pdet_forecast_ttv).toBeNull();
    expect(l.pdet_forecast_tdv).toBeGreaterThan(0);
    expect(l.pdet_forecast_joint).toBe(l.pdet_forecast_tdv);
    expect(l.assumptions.join('\n')).toMatch(/no timing channel with 2 transits/);
    const one = computeLimits(parseScenario(doc({ transits: 1 })));
    expect(one.pdet_forecast_joint).toBeNull();
    expect(one.assumptions.join('\n')).toMatch(/no timing channel with 1 transit/);
  });

  it('a sweep cell with 2 transits: pdet_ttv null, the other channels measured; forecast-only too', () => {
    const r = runCell({ index: 0, coords: [], scenario: cellOf(doc({ transits: 2 })) }, ctx(6, 40));
    expect(r.simulated).toBe(true);
    expect(r.pdet_ttv).toBeNull();
    expect(typeof r.pdet_tdv).toBe('number');
    expect(typeof r.pdet_combined).toBe('number');
    expect(r.channels_used).toBe('tdv dip template');
    expect(String(r.channels_note)).toMatch(/no TTV channel with 2 transits/);
    const f = runCell({ index: 0, coords: [], scenario: cellOf(doc({ transits: 2 })) }, ctx(6, 40, true));
    expect(f.pdet_forecast_ttv).toBeNull();
    expect(typeof f.pdet_forecast_joint).toBe('number');
  });
});

describe('transits lost to gaps', () => {
  it('an observation without any sample is "no transit observed", not an error', () => {
    const s = parseScenario(doc({ transits: 3 }));
    const obs = observeScenario(s, null);
    const empty = { ...obs, timeS: new Float64Array(0), epoch: new Int32Array(0), flux: new Float64Array(0), model: new Float64Array(0) };
    const rec = recoverTimings(s, empty);
    expect(rec.noTransitObserved).toBe(true);
    expect(rec.global).toBeNull();
    expect(rec.fits.map((f) => f.status)).toEqual(['skipped-no-data', 'skipped-no-data', 'skipped-no-data']);
    expect(rec.ttv).toEqual([]);
  });

  it('a cell whose realizations lose every transit counts them as non-detections (no_transit_observed)', () => {
    // 1 transit missed with probability 0.95: about 95 % of realizations observe nothing (Bernoulli).
    const d = doc({ transits: 1, extraObs: ', missed_fraction: 0.95' });
    const r = runCell({ index: 0, coords: [], scenario: cellOf(d) }, ctx(20, 20));
    expect(r.simulated).toBe(true);
    expect(r.no_transit_observed as number).toBeGreaterThanOrEqual(12);
    expect(r.pdet_combined as number).toBeGreaterThanOrEqual(0);
    expect(r.pdet_combined as number).toBeLessThanOrEqual((20 - (r.no_transit_observed as number)) / 20);
    // The record of one such realization says so.
    const s = parseScenario(d);
    let seen = false;
    for (let k = 0; k < 20 && !seen; k++) seen = runRealization(s, createRng(1, 0, k)).record.noTransitObserved;
    expect(seen).toBe(true);
  });
});

describe('grazing geometry', () => {
  it('limits gives T14, the exact-model precision and a forecast; Carter\'s trapezoid is null (no flat bottom)', () => {
    // p = 0.8 RJ / 1 R☉ ≈ 0.082; b = 1.02 lies between 1 − p and 1 + p: grazing (Seager & Mallén-Ornelas 2003).
    const s = parseScenario(doc({ transits: 4, impact: 1.02 }));
    const d = scenarioDurations(s);
    expect(d.t23S).toBe(0);
    expect(d.t14S).toBeGreaterThan(0);
    const l = computeLimits(s);
    expect(l.timing_precision_carter_s).toBeNull();
    expect(l.timing_precision_s).toBeGreaterThan(0);
    expect(l.pdet_forecast_joint).toBeGreaterThan(0);
    expect(l.assumptions.join('\n')).toMatch(/grazing transit/);
  });
});

describe('windows and light-curve size', () => {
  it('a baseline past half the period: windows cut at the midpoints, every time stamp once', () => {
    const s = parseScenario(doc({ transits: 4, period: '5 d', baseline: '4 d', cadence: '10 min' }));
    expect(windowsOverlap(s)).toBe(true);
    const w = transitWindows(s);
    for (let k = 1; k < w.length; k++) expect(w[k].startS).toBeGreaterThanOrEqual(w[k - 1].endS);
    const g = sampleWindows(w, s.instrument.cadenceS);
    expect(new Set(g.timeS).size).toBe(g.timeS.length);
    for (let i = 1; i < g.timeS.length; i++) expect(g.timeS[i]).toBeGreaterThan(g.timeS[i - 1]);
    expect(lightCurvePointCount(s)).toBe(g.timeS.length);
    // Continuous grid: from the first window's start to the last window's end at the cadence (counting, no source).
    const first = Math.ceil(w[0].startS / s.instrument.cadenceS);
    const last = Math.floor(w[w.length - 1].endS / s.instrument.cadenceS);
    expect(g.timeS.length).toBe(last - first + 1);
  });

  it('refuses a cadence no shorter than the transit and a light curve above the size limit, with the numbers', () => {
    const slow = parseScenario(doc({ cadence: '12 h' }));
    const p1 = observationSizeProblems(slow);
    expect(p1).toHaveLength(1);
    expect(p1[0].path).toBe('instrument.cadence');
    expect(p1[0].allowed).toMatch(/shorter than the transit \(T14 = /);
    const fast = parseScenario(doc({ cadence: '0.2 s', transits: 400, baseline: '20 h' }));
    const p2 = observationSizeProblems(fast);
    expect(p2).toHaveLength(1);
    // 400 windows of T14 + 40 h at 0.2 s: about 400 × 47 h × 18 000 = 3.4e8 samples (arithmetic).
    expect(lightCurvePointCount(fast)).toBeGreaterThan(3e8);
    expect(p2[0].allowed).toContain(MAX_LIGHT_CURVE_POINTS.toExponential(0));
    expect(p2[0].allowed).toMatch(/coarser cadence/);
    expect(observationSizeProblems(parseScenario(doc()))).toEqual([]);
  });
});

describe('assumptions from the scenario that ran', () => {
  it('red noise, gaps and a ground budget are described; their absence is said', () => {
    const plain = parseScenario(doc());
    expect(noiseModelText(plain)).toMatch(/no correlated \(red\) noise/);
    expect(gapsText(plain)).toMatch(/^none/);
    const redDoc = doc({ extraIns: ', red_noise: {model: drw, amplitude: 150 ppm, timescale: 40 min}', extraObs: ', missed_fraction: 0.3, duty_cycle: 0.8' });
    const red = parseScenario(redDoc);
    expect(noiseModelText(red)).toMatch(/damped random walk.*150 ppm.*40 min/);
    expect(gapsText(red)).toMatch(/probability 0\.3.*80 % of each window/);
    const l = computeLimits(red);
    expect(l.assumptions.join('\n')).toMatch(/ignores the scenario's red noise/);
    expect(l.assumptions.join('\n')).toMatch(/assumes all 2 transits fully observed/);
    const meta = { scenario: 'x', axes: [], forecast_only: true, realizations: 1, false_alarm: 0.05, seed: 1, moonsieve_version: 't', scenario_hash: 'h', notes: [] };
    const rows = assumptionRows(meta as never, { false_alarm_measured_combined: null } as never, redDoc, null, []);
    const text = rows.map(([k, v]) => `${k}: ${v}`).join('\n');
    expect(text).toMatch(/noise model: .*damped random walk/);
    expect(text).toMatch(/gaps: each transit missed with probability 0\.3/);
    expect(text).toMatch(/detection: analytic forecast only.*ignores the red noise and the gaps/);
    expect(text).not.toMatch(/no weather or gaps/);
  });
});

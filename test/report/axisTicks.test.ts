/**
 * Log-axis ticks and axis labels of the sweep report: 1-2-5 steps labelled in
 * full with the unit in the axis title, never plotly's bare minor digits
 * (0.4 M⊕ must not read "4"). Expected tick lists are worked out by hand from
 * the rule in axisDisplay.ts (common practice, no source).
 */
import { describe, it, expect } from 'vitest';
import { axisDisplay, logTickLayout, logTickValues, tickLabel, linearTicks } from '../../src/report/axisDisplay.js';
import { gridFigures } from '../../src/report/mapFigures.js';
import { buildSummary } from '../../src/report/summary.js';
import { renderSummaryHtml } from '../../src/report/summaryText.js';
import { combinedMeaning } from '../../src/report/reportGrid.js';
import { escapeHtml } from '../../src/report/escape.js';
import { M_EARTH_KG, M_JUP_KG, MINUTE_S } from '../../src/physics/constants.js';
import type { SweepMeta, SweepAxisMeta } from '../../src/sweep/sweepMeta.js';
import type { CellResult } from '../../src/sweep/cellTypes.js';

describe('log-axis ticks', () => {
  it('0.1–30 M⊕: every 1-2-5 step, labelled in full', () => {
    expect(logTickLayout(0.1, 30)).toEqual({
      tickmode: 'array',
      tickvals: [0.1, 0.2, 0.5, 1, 2, 5, 10, 20],
      ticktext: ['0.1', '0.2', '0.5', '1', '2', '5', '10', '20'],
    });
  });

  it('1–30 min and the default moon-mass range 0.05–2 M⊕', () => {
    expect(logTickValues(1, 30)).toEqual([1, 2, 5, 10, 20]);
    expect(logTickValues(0.05, 2)).toEqual([0.05, 0.1, 0.2, 0.5, 1, 2]);
    // 0.3–0.6 M⊕: only 0.5 is a 1-2-5 step, so evenly spaced 0.1 steps: 0.4 reads "0.4".
    expect(logTickLayout(0.3, 0.6).ticktext).toEqual(['0.3', '0.4', '0.5', '0.6']);
  });

  it('a narrow cadence range 6–9 min gets whole minutes, not "6 7 8 9 1 2"', () => {
    expect(logTickLayout(6, 9).ticktext).toEqual(['6', '7', '8', '9']);
    expect(logTickValues(5.5, 12)).toEqual([6, 8, 10, 12]);
  });

  it('a wide range is labelled at decades, thinned to at most 10, in powers of ten', () => {
    expect(logTickValues(1e-4, 1)).toEqual([1e-4, 1e-3, 0.01, 0.1, 1]);
    // 1e-6–1e-2 holds 13 steps of 1-2-5 (> 12): decades only.
    expect(logTickLayout(1e-6, 1e-2).ticktext).toEqual(['10⁻⁶', '10⁻⁵', '10⁻⁴', '0.001', '0.01']);
    const many = logTickValues(1e-20, 1);
    expect(many.length).toBeLessThanOrEqual(10);
    expect(many[0]).toBe(1e-20);
    expect(tickLabel(2e-5)).toBe('2×10⁻⁵');
    expect(tickLabel(3e6)).toBe('3×10⁶');
    expect(tickLabel(1500)).toBe('1500');
  });

  it('linear 1-2-5 steps and a refusal of a non-positive range', () => {
    // step: (1 − 0)/4 = 0.25, rounded up to the 1-2-5 step 0.5.
    expect(linearTicks(0, 1)).toEqual([0, 0.5, 1]);
    expect(linearTicks(0.8, 1.2)).toEqual([0.8, 0.9, 1, 1.1, 1.2]);
    expect(() => logTickValues(0, 1)).toThrow(RangeError);
  });
});

describe('axis titles carry units', () => {
  const ax = (field: string, values: number[], extra: Partial<SweepAxisMeta> = {}) => ({ field, unit: '', spacing: 'log', values, ...extra });

  it('planet mass in Earth masses for small planets, Jupiter masses for giants', () => {
    expect(axisDisplay(ax('planet.mass', [0.1 * M_EARTH_KG, 30 * M_EARTH_KG], { unit: 'kg' })).title).toBe('planet mass (M⊕)');
    expect(axisDisplay(ax('planet.mass', [0.3 * M_JUP_KG, 3 * M_JUP_KG], { unit: 'kg' })).title).toBe('planet mass (M_J)');
  });

  it('a level axis states its timescale; ground and gap fields have readable names and units', () => {
    expect(axisDisplay(ax('instrument.noise', [1e-4, 1e-3], { timescale_s: 3600 })).title).toBe('white noise (ppm per 1 h)');
    expect(axisDisplay(ax('instrument.ground.floor', [1e-4], { timescale_s: 600 })).title).toBe('systematic floor (ppm per 10 min)');
    expect(axisDisplay(ax('instrument.red_noise.amplitude', [1e-4])).title).toBe('red-noise amplitude (ppm)');
    expect(axisDisplay(ax('instrument.ground.aperture', [1], { unit: 'm' })).title).toBe('telescope aperture (m)');
    expect(axisDisplay(ax('observation.gap_length', [60], { unit: 's' })).title).toBe('mean gap length (min)');
  });
});

describe('every log axis of the sweep figures has explicit 1-2-5 ticks', () => {
  it('map, minimum-detectable and Monte Carlo figures of a moon mass × cadence grid', () => {
    const masses = [0.1, 0.4, 1.6, 6.4, 25.6].map((m) => m * M_EARTH_KG);
    const cadences = [1, 3, 10, 30].map((c) => c * MINUTE_S);
    const axes: SweepAxisMeta[] = [
      { field: 'moon.mass', unit: 'kg', spacing: 'log', from_text: '0.1 Mearth', to_text: '25.6 Mearth', from: masses[0], to: masses[4], count: 5, values: masses },
      { field: 'instrument.cadence', unit: 's', spacing: 'log', from_text: '1 min', to_text: '30 min', from: 60, to: 1800, count: 4, values: cadences },
    ];
    const meta = { moonsieve_version: 't', scenario: 'Tick world', scenario_hash: 'h', seed: 1, false_alarm: 0.01, realizations: 10, no_moon_realizations: 200, simulate_unstable: false, forecast_only: false, axes, cells: 20, notes: [] } as SweepMeta;
    const cells: CellResult[] = [];
    for (let i = 0; i < 20; i++) {
      const m = Math.floor(i / 4);
      const c = i % 4;
      const p = Math.min(1, (m + 1) / (c + 2));
      cells.push({ index: i, coords: [masses[m], cadences[c]], simulated: true, allowed: true, placement: 'stable', habitability: 'cold', pdet_combined: p, pdet_ttv: p, pdet_tdv: 0, pdet_dip: 0, pdet_forecast_ttv: p, moon_mass_kg: masses[m] } as CellResult);
    }
    const g = gridFigures(meta, cells, null, buildSummary(meta, cells));
    const logAxes = g.figures.flatMap((f) => Object.entries(f.layout).filter(([k, v]) => /^[xy]axis/.test(k) && (v as { type?: string }).type === 'log').map(([, v]) => v as Record<string, unknown>));
    expect(logAxes.length).toBeGreaterThanOrEqual(6); // map, mindet, mcdiff × (x, y)
    for (const a of logAxes) {
      expect(a.tickmode).toBe('array');
      expect((a.ticktext as string[]).length).toBeGreaterThanOrEqual(3);
      expect((a.title as { text: string }).text).toMatch(/\((M⊕|min)\)/);
    }
    const map = g.figures.find((f) => f.id === 'map')!.layout;
    // The moon-mass axis goes up (y); its range is 0.1–25.6 M⊕ plus half a cell (×2) each side: 0.05–51.2.
    expect((map.yaxis as { ticktext: string[] }).ticktext).toEqual(['0.05', '0.1', '0.2', '0.5', '1', '2', '5', '10', '20', '50']);
    expect((map.xaxis as { ticktext: string[] }).ticktext).toEqual(['1', '2', '5', '10', '20', '50']);

    // "combined" is explained where it can read below a single channel: map title and summary.
    expect((map.title as { text: string }).text).toBe('Detection probability, combined (weighted min-p over the channels); can be below a single channel, tested at α');
    const summaryHtml = renderSummaryHtml(buildSummary(meta, cells), meta);
    expect(summaryHtml).toContain(escapeHtml(combinedMeaning(false, 0.01)));
    // The weighted min-p rule calibrated at α = 0.01 (timing/detection.ts; Westfall & Young 1993).
    expect(combinedMeaning(false, 0.01)).toMatch(/minimum of the four channels' p-values .*weighted 0\.85 for the template search.*α = 0\.01/);
  });
});

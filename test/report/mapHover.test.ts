/**
 * The map's hover text of a simulated cell names every channel's Monte Carlo probability, the
 * template channel's among them, and the known-template bound (report/mapFigures.ts). Values are
 * set by hand (common practice, no source).
 */
import { describe, it, expect } from 'vitest';
import { gridFigures } from '../../src/report/mapFigures.js';
import { buildSummary } from '../../src/report/summary.js';
import { M_EARTH_KG, MINUTE_S } from '../../src/physics/constants.js';
import type { SweepMeta, SweepAxisMeta } from '../../src/sweep/sweepMeta.js';
import type { CellResult } from '../../src/sweep/cellTypes.js';

describe('map hover text', () => {
  it('shows the template channel and the bound beside the other channels', () => {
    const masses = [0.5, 1, 2].map((m) => m * M_EARTH_KG);
    const cadences = [2, 10].map((c) => c * MINUTE_S);
    const axes: SweepAxisMeta[] = [
      { field: 'moon.mass', unit: 'kg', spacing: 'log', from_text: '0.5 Mearth', to_text: '2 Mearth', from: masses[0], to: masses[2], count: 3, values: masses },
      { field: 'instrument.cadence', unit: 's', spacing: 'log', from_text: '2 min', to_text: '10 min', from: 120, to: 600, count: 2, values: cadences },
    ];
    const meta = { moonsieve_version: 't', scenario: 'Hover world', scenario_hash: 'h', seed: 1, false_alarm: 0.01, realizations: 10, no_moon_realizations: 2500, simulate_unstable: false, forecast_only: false, axes, cells: 6, notes: [] } as SweepMeta;
    const cells: CellResult[] = [];
    for (let i = 0; i < 6; i++) {
      const m = Math.floor(i / 2);
      cells.push({
        index: i, coords: [masses[m], cadences[i % 2]], simulated: true, allowed: true, placement: 'stable', habitability: 'cold',
        pdet_combined: 0.7, pdet_combined_lo: 0.6, pdet_combined_hi: 0.8, pdet_ttv: 0.1, pdet_tdv: 0.2, pdet_dip: 0.3, pdet_template: 0.65, pdet_bound: 0.9,
        moon_mass_kg: masses[m],
      } as CellResult);
    }
    const g = gridFigures(meta, cells, null, buildSummary(meta, cells));
    const map = g.figures.find((f) => f.id === 'map')!;
    const heat = (map.data as Array<Record<string, unknown>>).find((t) => t.type === 'heatmap')!;
    const texts = (heat.hovertext as string[][]).flat().join('\n');
    expect(texts).toContain('dip 30 %, template 65 %');
    expect(texts).toContain('bound (best possible analysis) 90 %');
  });
});

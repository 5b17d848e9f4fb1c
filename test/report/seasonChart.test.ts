/**
 * The sweep page shows the campaign's calendar when the scenario gives site,
 * target and campaign: the season chart and the nights to book; without them
 * neither appears. Input: a real forecast-only sweep of the tiny scenario.
 */
import { describe, it, expect } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runSweep } from '../../src/app/sweep/runSweep.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';
import { runCell } from '../../src/sweep/runCell.js';
import { renderSweepReport } from '../../src/app/sweepReport.js';
import { tinyScenarioDoc } from './tinySweep.js';

async function forecastSweep(doc: Record<string, unknown>) {
  const out = mkdtempSync(join(tmpdir(), 'moonsieve-season-'));
  const r = await runSweep(parseScenario(doc, 'test'), { out, quiet: true, shard: null, forecastOnly: true, runner: runCell });
  return { meta: r.meta, cells: r.results, runInfo: r.runInfo };
}

describe('sweep page calendar', () => {
  it('with site, target and campaign: season chart and booking table', async () => {
    const doc = {
      ...tinyScenarioDoc(),
      observation: { transits: 5, baseline: '1.5 h', t0: 2461500.25 },
      site: { name: 'Cerro Lunel', latitude: '-29.6 deg', longitude: '-70.4 deg', altitude: '2300 m' },
      target: { ra: '14:30:00', dec: '-35:00:00' },
      campaign: { start: '2027-01-01', end: '2036-12-31' },
    };
    const { meta, cells, runInfo } = await forecastSweep(doc);
    const html = renderSweepReport({ meta, cells, runInfo, scenario: doc, examples: [] });
    expect(html).toContain('<section id="calendar-section">');
    expect(html).toContain('<div id="season" class="plot"></div>');
    expect(html).toContain('"id":"season"');
    expect(html).toContain('<table class="bookings">');
    expect(html).toMatch(/holds \d+ transits/);
  });

  it('without them: no calendar section', async () => {
    const doc = tinyScenarioDoc();
    const { meta, cells, runInfo } = await forecastSweep(doc);
    const html = renderSweepReport({ meta, cells, runInfo, scenario: doc, examples: [] });
    expect(html).not.toContain('calendar-section');
    expect(html).not.toContain('"id":"season"');
  });
});

/**
 * The sweep report as HTML text: user text escaped, forecast-only and
 * one-axis sweeps rendered, a scenario that is not the sweep's refused.
 * Inputs are real forecast-only sweeps of the tiny scenario (tinySweep.ts).
 * Expected values are the report's own contracts (common practice, no source).
 */
import { describe, it, expect } from 'vitest';
import { runSweep, type SweepOptions, type SweepOutcome } from '../../src/app/sweep/runSweep.js';
import { runCell } from '../../src/sweep/runCell.js';
import { renderSweepReport } from '../../src/app/sweepReport.js';
import { buildSummary } from '../../src/report/summary.js';
import { tinyScenarioDoc } from './tinySweep.js';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseScenario } from '../../src/scenario/parseScenario.js';

/** runSweep of a scenario document, parsed first as a library caller does (a parse error rejects, as runSweep's own do). */
const sweepDoc = async (doc: unknown, options: SweepOptions = {}): Promise<SweepOutcome> => runSweep(parseScenario(doc), options);

const EVIL = 'Quillon b <script>alert("x")</script> & <img src=x onerror=alert(1)>';

async function forecastSweep(doc: Record<string, unknown>) {
  const out = mkdtempSync(join(tmpdir(), 'moonsieve-report-'));
  const r = await sweepDoc(doc, { out, quiet: true, shard: null, forecastOnly: true, runner: runCell });
  return { meta: r.meta, cells: r.results, runInfo: r.runInfo };
}

describe('renderSweepReport', () => {
  it('escapes the scenario name everywhere it reaches the page', async () => {
    const doc = tinyScenarioDoc(EVIL);
    const { meta, cells, runInfo } = await forecastSweep(doc);
    const html = renderSweepReport({ meta, cells, runInfo, scenario: doc, examples: [] });
    expect(html).not.toContain('<script>alert(');
    expect(html).not.toContain('<img src=x');
    expect(html).toContain('Quillon b &lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &lt;img src=x onerror=alert(1)&gt;');
    // Exactly the scripts the page itself brings: plotly, the channel selector, the figures.
    expect(html.match(/<script>/g)?.length).toBe(3);
  });

  it('renders a forecast-only run: forecast basis, dip channel disabled, no Monte Carlo comparison', async () => {
    const doc = tinyScenarioDoc();
    const { meta, cells, runInfo } = await forecastSweep(doc);
    const html = renderSweepReport({ meta, cells, runInfo, scenario: doc });
    expect(meta.forecast_only).toBe(true);
    expect(html).toContain('analytic forecast only');
    expect(html).toMatch(/data-channel="dip" aria-pressed="false" disabled/);
    expect(html).not.toContain('id="mcdiff"');
    expect(html).toContain('id="mindet"');
    expect(buildSummary(meta, cells).basis).toBe('forecast');
  });

  it('renders a one-axis sweep as a line plot without the minimum-mass plot', async () => {
    const doc = tinyScenarioDoc();
    doc.sweep = { realizations: 3, axes: [{ field: 'observation.transits', from: 3, to: 9, count: 4 }] };
    const { meta, cells, runInfo } = await forecastSweep(doc);
    const html = renderSweepReport({ meta, cells, runInfo, scenario: doc, examples: [] });
    expect(html).toContain('id="map"');
    expect(html).not.toContain('id="mindet"');
    expect(html).toContain('"twoAxis":false');
    expect(buildSummary(meta, cells).min_detectable).toBeNull();
  });

  it('refuses a scenario document other than the one the sweep ran', async () => {
    const doc = tinyScenarioDoc();
    const { meta, cells, runInfo } = await forecastSweep(doc);
    const other = { ...doc, seed: 1 };
    expect(() => renderSweepReport({ meta, cells, runInfo, scenario: other })).toThrow(RangeError);
    // Without any scenario the page still renders, saying what is missing.
    expect(renderSweepReport({ meta, cells, runInfo: null, scenario: null })).toContain('scenario document');
  });
});

/**
 * `npm run bench rank`: the forecast tier of `moonsieve rank` on 1000 planets
 * of the invented demo list (src/rank/demoPlanets.ts) against the demo
 * scenario (scenarios/demo-rank.yaml), with and without the campaign
 * calendar. Issue 20 asks for 1000 planets in under a minute on this machine.
 */
import { readFileSync } from 'node:fs';
import { parseYamlWithLines } from '../src/scenario/loadScenario.js';
import type { ScenarioDocument } from '../src/scenario/types.js';
import { demoPlanetCsv } from '../src/rank/demoPlanets.js';
import { rankListText } from '../src/app/rankList.js';
import type { BenchMedian } from './measure.js';

export function benchRank(count = 1000): BenchMedian[] {
  const path = new URL('../../scenarios/demo-rank.yaml', import.meta.url).pathname;
  const doc = parseYamlWithLines(readFileSync(path, 'utf8'), path).value as ScenarioDocument;
  const text = demoPlanetCsv(count);
  const rows: BenchMedian[] = [];
  for (const calendar of [false, true]) {
    const t0 = performance.now();
    const r = rankListText(doc, text, 'demo list', { settings: { probability: 0.9, calendar } });
    const s = (performance.now() - t0) / 1000;
    rows.push({ label: `rank ${count} invented planets (${r.planets_ranked} ranked), ${calendar ? 'with' : 'without'} the campaign calendar and nights (goal < 60 s)`, median: s, unit: 's', repeats: 1, summary: `one run, ${((1000 * s) / count).toFixed(1)} ms per planet` });
  }
  return rows;
}

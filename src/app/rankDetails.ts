/**
 * `rank --detail`: each ranked planet's own detail. For the planets the page
 * lists, the planet's scenario with a small mass × separation sweep block is
 * written to `details/<row>-<name>/scenario.yaml` in the rank folder; for the
 * top `detail` planets that sweep is run (`runSweep`, the same machinery and
 * seeding as `moonsieve sweep` on that file) and its report.html linked from
 * rank.json and rank.html. The others' rows show the command that makes it.
 * In a shard the same is done for the shard's own planets; `moonsieve merge`
 * then copies the folders the whole list's page needs (`copyRankDetails`,
 * rankList.ts): the whole list's top N are among the shards' top N.
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { stringify as stringifyYaml } from 'yaml';
import { planetRows } from '../rank/planetTable.js';
import { readPlanetList } from './rankList.js';
import { detailDir, detailDocument } from '../rank/detailSweep.js';
import type { RankJson } from '../rank/rankJson.js';
import type { ScenarioDocument } from '../scenario/types.js';
import { scenarioDocumentOf } from '../scenario/scenarioDocument.js';
import { writeFileAtomic } from '../io/atomicWrite.js';
import { RANK_PAGE_ROWS } from '../report/rankPage.js';
import { runSweep } from './sweep/runSweep.js';

/** Planets given a detail sweep by default in an unsharded run. */
export const DEFAULT_DETAIL = 3;

export interface DetailOptions {
  /** Run the detail sweep for the first `detail` ranked planets (0: write nothing, as a shard and `merge` do). */
  detail: number;
  /** Worker threads of each sweep (default as `sweep`). */
  workers?: number | string;
  /** Forecast-only detail sweeps (seconds instead of tens of seconds). */
  forecastOnly?: boolean;
  signal?: AbortSignal;
  /** Called after each detail sweep with its wall time, s. */
  onDetail?: (name: string, seconds: number, done: number, total: number) => void;
}

/**
 * Write the detail scenarios of the page's planets into `outDir/details/`,
 * run the top `detail` ones, and fill `detail_scenario` / `detail_report` in
 * `r` (in place; write rank.json after). `baseDoc`, `listText`, `listSource`:
 * as given to rankListText (the rows' documents are rebuilt from them).
 */
export async function writeRankDetails(outDir: string, r: RankJson, baseDoc: ScenarioDocument, listText: string, listSource: string, o: DetailOptions): Promise<void> {
  if (o.detail <= 0) return;
  r.detail_top = o.detail;
  const rows = new Map(planetRows(baseDoc, readPlanetList(listText, listSource)).map((x) => [x.row, x.scenario]));
  const shown = r.planets.slice(0, Math.max(RANK_PAGE_ROWS, o.detail));
  const toRun: Array<{ name: string; dir: string; path: string }> = [];
  for (const p of shown) {
    const s = rows.get(p.row);
    if (!s) continue;
    const dir = detailDir(p.row, p.name);
    const abs = join(outDir, ...dir.split('/'));
    mkdirSync(abs, { recursive: true });
    const path = join(abs, 'scenario.yaml');
    writeFileAtomic(path, stringifyYaml(detailDocument(scenarioDocumentOf(s), p.best_min_moon_mass_kg)));
    p.detail_scenario = `${dir}/scenario.yaml`;
    if (toRun.length < o.detail) toRun.push({ name: p.name, dir, path });
  }
  let done = 0;
  for (const t of toRun) {
    const t0 = performance.now();
    const out = await runSweep(t.path, { out: join(outDir, ...t.dir.split('/')), shard: null, quiet: true, workers: o.workers, forecastOnly: o.forecastOnly, signal: o.signal, force: true });
    if (!out.complete) return;
    const p = r.planets.find((x) => x.detail_scenario === `${t.dir}/scenario.yaml`);
    if (p) p.detail_report = `${t.dir}/report.html`;
    done++;
    o.onDetail?.(t.name, (performance.now() - t0) / 1000, done, toRun.length);
  }
}

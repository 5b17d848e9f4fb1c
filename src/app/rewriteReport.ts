/**
 * Re-render `report.html` and `summary.json` of a finished sweep folder from
 * its `cells.json` (and `run.json`), without re-running any cell. The
 * scenario document (needed for the physical boundaries, example cells and
 * assumptions) comes from `scenarioPath`, else from `<dir>/scenario.yaml`
 * when present; either must hash to the sweep's scenario hash. The cells are
 * checked first (cellChecks.ts); the two files are written as one set under
 * the folder's lock (outputFolder.ts).
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../scenario/errors.js';
import { parseYamlWithLines } from '../scenario/loadScenario.js';
import { scenarioHash } from '../sweep/canonicalJson.js';
import { parseCellsJson, type SweepRunInfo } from './sweep/outputs.js';
import { acquireFolderLock, commitOutputs, settleStaging, STAGING_DIR } from './sweep/outputFolder.js';
import { capProblems, cellChecker, coverageProblems } from '../sweep/cellChecks.js';
import { shardCells } from '../sweep/shard.js';
import { checkOutputDir } from '../io/outputPaths.js';
import { buildSummary, renderSummaryJson, type SweepSummary } from '../report/summary.js';
import { renderSweepReport } from './sweepReport.js';

export interface RewriteReportResult {
  files: string[];
  summary: SweepSummary;
  /** Where the scenario document came from (null: none, the page omits what needs it). */
  scenarioSource: string | null;
}

function readText(path: string, what: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError([{ path: what, value: path, allowed: code === 'ENOENT' ? 'no such file: expected the output folder of a finished sweep' : `cannot read it (${code ?? String(e)})` }]);
  }
}

function readScenarioDoc(path: string): unknown {
  return parseYamlWithLines(readText(path, 'SCENARIO'), path).value;
}

export function rewriteSweepReport(dir: string, opts: { scenarioPath?: string } = {}): RewriteReportResult {
  if (!existsSync(join(dir, 'cells.json')) && !existsSync(join(dir, STAGING_DIR))) readText(join(dir, 'cells.json'), 'DIR');
  checkOutputDir('DIR', dir); // the page is written there
  // The page is rewritten in the folder: one command at a time there, and an interrupted write finished first.
  const lock = acquireFolderLock(dir, 'moonsieve report');
  try {
    settleStaging(dir);
    return rewriteLocked(dir, opts);
  } finally {
    lock.release();
  }
}

function rewriteLocked(dir: string, opts: { scenarioPath?: string }): RewriteReportResult {
  const cellsPath = join(dir, 'cells.json');
  let parsed: ReturnType<typeof parseCellsJson>;
  try {
    parsed = parseCellsJson(readText(cellsPath, 'DIR'));
  } catch (e) {
    if (e instanceof InputError) throw e;
    throw new InputError([{ path: 'DIR', value: cellsPath, allowed: `not a moonsieve cells.json (${e instanceof Error ? e.message : String(e)})` }]);
  }
  const { meta, cells } = parsed;
  const runPath = join(dir, 'run.json');
  let runInfo: SweepRunInfo | null = null;
  if (existsSync(runPath)) {
    try {
      runInfo = JSON.parse(readFileSync(runPath, 'utf8')) as SweepRunInfo;
    } catch {
      runInfo = null;
    }
  }
  // Every cell a sound result of this grid, each cell of the run (a shard's, when run.json names one) exactly once (cellChecks.ts).
  const sh = runInfo?.shard;
  const expected = sh && Number.isSafeInteger(sh.k) && Number.isSafeInteger(sh.n) && sh.k >= 1 && sh.k <= sh.n ? shardCells(meta.cells, sh) : meta.cells;
  const checker = cellChecker(meta);
  const problems = cells.flatMap((c, k) => checker.check(c, `cells.json cell ${k + 1}`));
  if (problems.length === 0) {
    // A loop, not a spread: a damaged file can give a problem per cell.
    for (const p of coverageProblems(cells.map((c, k) => ({ index: c.index, where: `cells.json cell ${k + 1}` })), expected, 'cells.json')) problems.push(p);
  }
  if (problems.length > 0) throw new InputError(capProblems(problems), `${cellsPath} is damaged; re-run the sweep (or merge) that wrote it`);
  let scenario: unknown = null;
  let scenarioSource: string | null = null;
  if (opts.scenarioPath !== undefined) {
    scenario = readScenarioDoc(opts.scenarioPath);
    const h = scenarioHash(scenario);
    if (h !== meta.scenario_hash) {
      throw new InputError([{ path: '--scenario', value: opts.scenarioPath, allowed: `this is not the scenario the sweep ran (hash ${h.slice(0, 12)}…, the sweep's is ${meta.scenario_hash.slice(0, 12)}…)` }]);
    }
    scenarioSource = opts.scenarioPath;
  } else {
    const local = join(dir, 'scenario.yaml');
    if (existsSync(local)) {
      const doc = readScenarioDoc(local);
      if (scenarioHash(doc) === meta.scenario_hash) {
        scenario = doc;
        scenarioSource = local;
      }
    }
  }
  const summary = buildSummary(meta, cells);
  const html = renderSweepReport({ meta, cells, runInfo, scenario, summary });
  const files = commitOutputs(dir, [['summary.json', renderSummaryJson(summary)], ['report.html', html]]);
  return { files, summary, scenarioSource };
}

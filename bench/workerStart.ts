/**
 * Start-up costs. A whole `limits` process on the demo; and a sweep worker's start-up: the time from `new Worker` (the real worker
 * script, the reference sweep's job, the unit values the main thread hands
 * over) to its first `ready` message, i.e. the modules it loads before it can
 * take a cell. Beside it, what loading mathjs would add to a worker that met a
 * unit outside the fast table and had no value for it from the main thread
 * (src/scenario/units.ts): the price every worker paid when mathjs loaded at
 * start-up.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { performance } from 'node:perf_hooks';
import { loadSweep } from '../src/app/sweep/runSweep.js';
import { parseScenario } from '../src/scenario/parseScenario.js';
import { workerScriptUrl } from '../src/app/sweep/workerPool.js';
import { unitValueEntries } from '../src/scenario/units.js';
import type { WorkerInit } from '../src/app/sweep/worker.js';
import type { BenchMedian } from './measure.js';
import { median } from './measure.js';

function timeToFirstMessage(script: URL | string, options: ConstructorParameters<typeof Worker>[1]): Promise<number> {
  return new Promise((resolve, reject) => {
    const t0 = performance.now();
    const w = new Worker(script, options);
    w.once('message', (m: { type?: string }) => {
      const ms = performance.now() - t0;
      void w.terminate();
      if (m.type === 'ready') resolve(ms);
      else reject(new Error(`the worker answered ${JSON.stringify(m)} instead of ready`));
    });
    w.once('error', reject);
  });
}

const LOAD_MATHJS = `
const { parentPort } = require('node:worker_threads');
const { create, all } = require('mathjs');
create(all).unit('1 kg m^-3');
parentPort.postMessage({ type: 'ready' });
`;

/** Medians over `repeats` fresh workers, ms. `scenarioDoc`: the sweep whose job the workers get. */
export async function benchWorkerStart(scenarioDoc: unknown, repeats = 7): Promise<BenchMedian[]> {
  const { doc, scenario, spec } = loadSweep(typeof scenarioDoc === 'string' ? scenarioDoc : parseScenario(scenarioDoc));
  const init: WorkerInit = {
    job: {
      baseDocument: doc,
      axes: spec.axes.map((a) => ({ field: a.field, write: a.write, values: a.values })),
      ctx: { seed: scenario.seed, realizations: spec.realizations, simulateUnstable: spec.simulateUnstable, forecastOnly: false },
    },
    runnerModule: null,
    runnerExport: 'runCell',
    calibrate: true,
    unitValues: unitValueEntries(),
  };
  const script = workerScriptUrl();
  const ready: number[] = [];
  const mathjs: number[] = [];
  await timeToFirstMessage(script, { workerData: init }); // warm the file cache
  for (let r = 0; r < repeats; r++) {
    ready.push(await timeToFirstMessage(script, { workerData: init }));
    mathjs.push(await timeToFirstMessage(LOAD_MATHJS, { eval: true }));
  }
  return [
    { label: 'sweep worker start-up: new Worker → its "ready" message (modules loaded, no mathjs; goal < 300 ms)', median: median(ready), unit: 'ms', repeats },
    { label: '  for comparison, a worker that loads mathjs and reads one unit with it (the cost the unit table and hand-over avoid)', median: median(mathjs), unit: 'ms', repeats },
  ];
}

/**
 * Wall time of whole CLI processes, `node bin/moonsieve.js limits <scenario>`,
 * median of `repeats` (after one untimed run): the demo as written, and the
 * demo with its moon density written "4000 kg m^-3" (a product of table units,
 * which once sent every command through mathjs).
 */
export function benchLimitsStart(repeats = 7): BenchMedian[] {
  // This file runs as dist/bench/workerStart.js: the repository is two folders up.
  const root = fileURLToPath(new URL('../..', import.meta.url));
  const bin = join(root, 'bin', 'moonsieve.js');
  const demo = join(root, 'scenarios', 'demo-observer.yaml');
  const text = readFileSync(demo, 'utf8');
  if (!/density: 4\.0 g\/cm\^3/.test(text)) throw new Error(`${demo} no longer writes its moon density as "4.0 g/cm^3"`);
  const dir = mkdtempSync(join(tmpdir(), 'moonsieve-bench-limits-'));
  try {
    const product = join(dir, 'demo-kg-m3.yaml');
    writeFileSync(product, text.replace('density: 4.0 g/cm^3', 'density: 4000 kg m^-3'));
    const wall = (scenario: string): number => {
      const t0 = performance.now();
      const r = spawnSync(process.execPath, [bin, 'limits', scenario], { encoding: 'utf8' });
      const ms = performance.now() - t0;
      if (r.status !== 0) throw new Error(`limits ${scenario} failed: ${r.stderr}`);
      return ms;
    };
    const rows: BenchMedian[] = [];
    for (const [label, file] of [['demo-observer.yaml', demo], ['the same, density "4000 kg m^-3"', product]] as const) {
      wall(file);
      const ts = Array.from({ length: repeats }, () => wall(file));
      rows.push({ label: `moonsieve limits ${label}: whole process, wall (goal < 0.3 s)`, median: median(ts) / 1000, unit: 's', repeats });
    }
    return rows;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * Test input for the report tests: a tiny real sweep through the library
 * (`runSweep` with `runCell` in the main thread), 3 × 3 cells over moon mass
 * × separation of an invented system, few realizations and few no-moon
 * calibration realizations so it runs in seconds. Not a test file itself.
 */
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runSweep, type SweepOptions, type SweepOutcome } from '../../src/app/sweep/runSweep.js';
import { runCell } from '../../src/sweep/runCell.js';
import { parseCellsJson, type SweepRunInfo } from '../../src/app/sweep/outputs.js';
import type { CellResult, CellContext } from '../../src/sweep/cellTypes.js';
import type { SweepMeta } from '../../src/sweep/sweepMeta.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';

/** runSweep of a scenario document, parsed first as a library caller does (a parse error rejects, as runSweep's own do). */
const sweepDoc = async (doc: unknown, options: SweepOptions = {}): Promise<SweepOutcome> => runSweep(parseScenario(doc), options);

export interface TinySweep {
  dir: string;
  doc: Record<string, unknown>;
  meta: SweepMeta;
  cells: CellResult[];
  runInfo: SweepRunInfo;
}

export function tinyScenarioDoc(name = 'Test world Quillon b'): Record<string, unknown> {
  return {
    name,
    seed: 424242,
    star: { mass: '0.8 Msun', radius: '0.78 Rsun', teff: '5000 K', age: '4 Gyr', limb_darkening: { u1: 0.5, u2: 0.2 } },
    planet: { mass: '0.5 Mjup', radius: '0.9 Rjup', period: '260 d', impact_parameter: 0.2 },
    moon: { mass: '1 Mearth', density: '4.5 g/cm^3', separation: '0.1 hill' },
    instrument: { cadence: '10 min', noise: '400 ppm per 10 min' },
    observation: { transits: 5, baseline: '1.5 h' },
    detection: { false_alarm: 0.05 },
    sweep: {
      realizations: 5,
      axes: [
        { field: 'moon.mass', from: '0.1 Mearth', to: '3 Mearth', count: 3, spacing: 'log' },
        { field: 'moon.separation', from: '0.04 hill', to: '0.55 hill', count: 3 },
      ],
    },
  };
}

/** Run the tiny sweep into a fresh temporary folder. */
export async function runTinySweep(opts: { name?: string; forecastOnly?: boolean; nullRealizations?: number } = {}): Promise<TinySweep> {
  const dir = mkdtempSync(join(tmpdir(), 'moonsieve-report-'));
  const doc = tinyScenarioDoc(opts.name);
  const nulls = opts.nullRealizations ?? 20;
  await sweepDoc(doc, {
    out: dir,
    quiet: true,
    shard: null,
    forecastOnly: opts.forecastOnly === true,
    runner: (task, ctx) => runCell(task, { ...ctx, nullRealizations: nulls } as CellContext),
  });
  const { meta, cells } = parseCellsJson(readFileSync(join(dir, 'cells.json'), 'utf8'));
  const runInfo = JSON.parse(readFileSync(join(dir, 'run.json'), 'utf8')) as SweepRunInfo;
  return { dir, doc, meta, cells, runInfo };
}

/** `moonsieve simulate SCENARIO`: one synthetic light curve and its true TTV/TDV. */
import type { Command } from 'commander';
import { join } from 'node:path';
import { loadScenario } from '../scenario/loadScenario.js';
import { InputError } from '../scenario/errors.js';
import { simulateScenario, simulationTables } from '../photometry/simulateScenario.js';
import { renderTable } from '../io/ecsv.js';
import { writeFileAtomic } from '../io/atomicWrite.js';
import { renderSimulatePage } from '../report/simulatePage.js';
import { defaultOutDir } from './outputPaths.js';
import type { CliIo } from './main.js';

export function registerSimulate(program: Command, io: CliIo): void {
  program
    .command('simulate')
    .description('one synthetic light curve (noisy or --noiseless) and its TTV/TDV, as ECSV/CSV and an HTML page')
    .argument('<scenario>', 'scenario YAML file')
    .option('--noiseless', 'write the model without noise')
    .option('--out <dir>', 'output folder (default reports/<scenario name>/)')
    .option('--format <format>', 'table format: ecsv or csv', 'ecsv')
    .option('--realization <n>', 'which noise realization to draw (seeded by scenario seed and this number)', '0')
    .action((scenarioPath: string, opts: { noiseless?: boolean; out?: string; format: string; realization: string }) => {
      if (opts.format !== 'ecsv' && opts.format !== 'csv') {
        throw new InputError([{ path: '--format', value: opts.format, allowed: 'expected "ecsv" or "csv"' }]);
      }
      const realization = Number(opts.realization);
      if (!Number.isInteger(realization) || realization < 0) {
        throw new InputError([{ path: '--realization', value: opts.realization, allowed: 'expected an integer ≥ 0' }]);
      }
      const scenario = loadScenario(scenarioPath);
      const noiseless = opts.noiseless === true;
      const sim = simulateScenario(scenario, { noiseless, realization });
      const outDir = opts.out ?? defaultOutDir(scenario.name);
      const ext = opts.format;
      const tables = simulationTables(scenario, sim, noiseless);
      // Render everything first, then write: nothing half-written on a failure.
      const files: Array<[string, string]> = [
        [join(outDir, `lightcurve.${ext}`), renderTable(`x.${ext}`, tables.lightCurve.columns, tables.lightCurve.meta)],
        [join(outDir, `transits.${ext}`), renderTable(`x.${ext}`, tables.transits.columns, tables.transits.meta)],
        [join(outDir, 'simulate.html'), renderSimulatePage(scenario, sim.observation, sim.truth, noiseless)],
      ];
      for (const [path, text] of files) writeFileAtomic(path, text);
      io.out(`${scenario.name}: ${sim.observation.timeS.length} points in ${scenario.observation.transits} transit windows` +
        `${noiseless ? ' (noiseless)' : `, white noise ${(sim.observation.sigma * 1e6).toFixed(1)} ppm per exposure`}\n`);
      io.out('epoch  planet mid-time (BJD_TDB)   TTV (s)    duration (h)   TDV (s)   [model truth]\n');
      const meanDur = sim.truth.reduce((a, t) => a + t.durationS, 0) / sim.truth.length;
      for (const t of sim.truth) {
        const ttv = t.midS - t.epoch * scenario.planet.periodS;
        io.out(`${String(t.epoch).padStart(5)}  ${(scenario.observation.t0BjdTdb + t.midS / 86400).toFixed(6).padStart(22)}  ${ttv.toFixed(1).padStart(9)}  ${(t.durationS / 3600).toFixed(5).padStart(13)}  ${(t.durationS - meanDur).toFixed(1).padStart(8)}\n`);
      }
      for (const [path] of files) io.out(`wrote ${path}\n`);
    });
}

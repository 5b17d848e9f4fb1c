/** `moonsieve report DIR [--scenario FILE]`: re-render report.html and summary.json from a finished sweep's results. */
import type { Command } from 'commander';
import { rewriteSweepReport } from '../app/rewriteReport.js';
import type { CliIo } from './cliIo.js';

export function registerReport(program: Command, io: CliIo): void {
  program
    .command('report')
    .description('re-render report.html and summary.json from the cells.json of a finished sweep (no cell is re-run)')
    .argument('<dir>', 'output folder of a sweep (holds cells.json)')
    .option('--scenario <file>', 'the scenario YAML the sweep ran (default <dir>/scenario.yaml when present); needed for the physical boundaries, example cells and assumptions')
    .action((dir: string, opts: { scenario?: string }) => {
      const res = rewriteSweepReport(dir, { scenarioPath: opts.scenario });
      if (res.scenarioSource === null) {
        io.err('note: no scenario file (pass --scenario FILE): the report omits the physical boundaries, example cells and the star/planet/instrument assumptions\n');
      }
      for (const f of res.files) io.out(`wrote ${f}\n`);
    });
}

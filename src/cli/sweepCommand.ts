/** `moonsieve sweep SCENARIO`: injection–recovery over the scenario's grid (see src/app/sweep/runSweep.ts). */
import type { Command } from 'commander';
import { runSweep } from '../app/sweep/runSweep.js';
import { SweepInterruptedError } from '../app/sweep/interrupted.js';
import type { CliIo } from './cliIo.js';

interface SweepCliOptions {
  out?: string;
  workers?: string;
  shard?: string;
  resume?: boolean;
  force?: boolean;
  forecastOnly?: boolean;
  quiet?: boolean;
}

export function registerSweep(program: Command, io: CliIo): void {
  program
    .command('sweep')
    .description('injection–recovery over the scenario grid; writes report.html, cells.ecsv, cells.json, run.json')
    .argument('<scenario>', 'scenario YAML file (its sweep: block names the axes; default moon mass × separation)')
    .option('--out <dir>', 'output folder (default reports/<scenario name>/)')
    .option('--workers <n>', 'worker threads (default SLURM_CPUS_PER_TASK, else every core)')
    .option('--shard <K/N>', 'run only cells with index mod N = K−1 (default from SLURM_ARRAY_TASK_ID/COUNT)')
    .option('--resume', 'continue an interrupted sweep from the checkpoint in --out')
    .option('--force', 'write into a folder holding another sweep\'s results or other files, or discard its checkpoint and start afresh')
    .option('--forecast-only', 'fill the grid from the analytic forecast alone (seconds)')
    .option('--quiet', 'no progress output')
    .action(async (scenarioPath: string, opts: SweepCliOptions) => {
      const controller = new AbortController();
      // Ctrl-C, and the SIGTERM a batch system sends at a time limit: stop, keep the checkpoint, release the folder.
      const onSigint = (): void => controller.abort();
      process.on('SIGINT', onSigint);
      process.on('SIGTERM', onSigint);
      try {
        const res = await runSweep(scenarioPath, {
          out: opts.out,
          workers: opts.workers,
          shard: opts.shard,
          resume: opts.resume === true,
          force: opts.force === true,
          forecastOnly: opts.forecastOnly === true,
          quiet: opts.quiet === true,
          signal: controller.signal,
          progress: { write: (t: string) => io.err(t), isTTY: process.stderr.isTTY === true },
        });
        if (!res.complete) {
          const message = res.checkpointKept
            ? `interrupted: ${res.cellsDone} of ${res.cellsInRun} cells done; resume with --resume`
            : 'interrupted while checking the grid, before any work: nothing was written';
          io.err(message + '\n');
          throw new SweepInterruptedError(message);
        }
        for (const note of res.meta.notes) io.out(`note: ${note}\n`);
        const info = res.runInfo;
        const what = info.shard ? `shard ${info.shard.k}/${info.shard.n}: ${res.cellsDone} of ${res.meta.cells} cells` : `${res.cellsDone} cells`;
        io.out(`${res.meta.scenario}: ${what}, ${res.meta.realizations} realizations each, in ${info.wall_time_s.toFixed(1)} s` +
          `${info.cells_resumed > 0 ? ` (${info.cells_resumed} from the checkpoint)` : ''}\n`);
        for (const f of res.files) io.out(`wrote ${f}\n`);
        const report = res.files.find((f) => f.endsWith('report.html'));
        if (report) io.out(`report: ${report} (one self-contained page; opens offline in any browser)\n`);
        if (info.shard) io.out(`when every shard is done: moonsieve merge <the ${info.shard.n} shard folders> --out <dir>\n`);
      } finally {
        process.off('SIGINT', onSigint);
        process.off('SIGTERM', onSigint);
      }
    });
}

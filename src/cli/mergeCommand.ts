/** `moonsieve merge DIR...`: join the shard outputs of one sweep into one result, identical to an unsharded run. */
import type { Command } from 'commander';
import { mergeShards } from '../app/sweep/merge.js';
import type { CliIo } from './cliIo.js';

export function registerMerge(program: Command, io: CliIo): void {
  program
    .command('merge')
    .description('joins shard outputs of one sweep into one result, identical to an unsharded run')
    .argument('<dirs...>', 'output folders of the shards (each with cells.json and run.json)')
    .option('--out <dir>', 'output folder (default reports/<scenario name>/)')
    .option('--force', 'write into a folder holding another sweep\'s results or other files')
    .action((dirs: string[], opts: { out?: string; force?: boolean }) => {
      const res = mergeShards(dirs, opts.out, { force: opts.force === true });
      io.out(`${res.meta.scenario}: merged ${dirs.length} folders, ${res.results.length} of ${res.meta.cells} cells\n`);
      for (const f of res.files) io.out(`wrote ${f}\n`);
    });
}

/** `moonsieve merge DIR...`: join the shard outputs of one sweep into one result, identical to an unsharded run. */
import type { Command } from 'commander';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { mergeShards } from '../app/sweep/merge.js';
import { copyRankDetails, mergeRankOutputs, writeRankOutputs } from '../app/rankList.js';
import { defaultOutDir } from '../app/defaultOutDir.js';
import { checkOutputDir } from '../io/outputPaths.js';
import type { CliIo } from './cliIo.js';

export function registerMerge(program: Command, io: CliIo): void {
  program
    .command('merge')
    .description('joins shard outputs of one sweep (or of one rank list) into one result, identical to an unsharded run')
    .argument('<dirs...>', 'output folders of the shards (each with cells.json and run.json)')
    .option('--out <dir>', 'output folder (default reports/<scenario name>/)')
    .option('--force', 'write into a folder holding another sweep\'s results or other files')
    .action((dirs: string[], opts: { out?: string; force?: boolean }) => {
      // Shards of `moonsieve rank` (rank.json, no cells.json) are joined into one ranked list.
      if (dirs.every((d) => existsSync(join(d, 'rank.json')) && !existsSync(join(d, 'cells.json')))) {
        const r = mergeRankOutputs(dirs);
        const out = opts.out ?? `${defaultOutDir(r.scenario)}-rank`;
        checkOutputDir('--out', out);
        // Shards run with --detail N hold their own top N detail sweeps: the whole list's top N are copied and linked.
        const details = copyRankDetails(dirs, out, r);
        writeRankOutputs(out, r);
        io.out(`${r.scenario}: merged ${dirs.length} rank folders, ${r.planets_ranked} of ${r.planets_in_list} planets ranked\nwrote ${join(out, 'rank.json')}\nwrote ${join(out, 'rank.ecsv')}\nwrote ${join(out, 'rank.html')}\n`);
        const reports = r.planets.filter((p) => p.detail_report !== null).length;
        if (details.copied.length) io.out(`copied ${details.copied.length} detail folders into ${join(out, 'details')} (${reports} with a sweep report, linked from rank.html)\n`);
        else io.out('no detail sweeps: the shards were run with --detail 0 (rank --shard K/N --detail N runs each shard\'s own top N, which merge copies)\n');
        for (const m of details.missing) io.err(`detail not copied: ${m}\n`);
        return;
      }
      const res = mergeShards(dirs, opts.out, { force: opts.force === true });
      io.out(`${res.meta.scenario}: merged ${dirs.length} folders, ${res.results.length} of ${res.meta.cells} cells\n`);
      for (const f of res.files) io.out(`wrote ${f}\n`);
    });
}

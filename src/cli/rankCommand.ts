/** `moonsieve rank SCENARIO LIST`: a planet list ranked by the smallest moon each could reveal, and the cost of the scenario's target moon. */
import type { Command } from 'commander';
import { join } from 'node:path';
import { DEFAULT_BOUND, DEFAULT_CONFIRM, DEFAULT_CONFIRM_REALIZATIONS, rankListText, readRankInputs, writeRankOutputs } from '../app/rankList.js';
import { DEFAULT_DETAIL, writeRankDetails } from '../app/rankDetails.js';
import { CHECKPOINT_EVERY, openRankCheckpoint, RANK_CHECKPOINT_FILE, rankIdentity } from '../app/rankCheckpoint.js';
import { defaultOutDir } from '../app/defaultOutDir.js';
import { checkOutputDir } from '../io/outputPaths.js';
import { resolveShard } from '../sweep/shard.js';
import { DEFAULT_RANK_SETTINGS } from '../rank/rankPlanet.js';
import { DETAIL_MASSES, DETAIL_REALIZATIONS, DETAIL_SEPARATIONS } from '../rank/detailSweep.js';
import type { RankJson } from '../rank/rankJson.js';
import { InputError } from '../scenario/errors.js';
import { M_EARTH_KG, HOUR_S } from '../physics/constants.js';
import type { CliIo } from './cliIo.js';

interface RankOpts {
  out?: string;
  shard?: string;
  calendar?: boolean;
  json?: boolean;
  top?: string;
  probability?: string;
  confirm?: string;
  confirmRealizations?: string;
  confirmNoMoonRealizations?: string;
  bound?: string;
  detail?: string;
  resume?: boolean;
  detailForecastOnly?: boolean;
  workers?: string;
}

function wholeNumber(option: string, text: string | undefined, min: number): number {
  const n = Number(text);
  if (!Number.isSafeInteger(n) || n < min) throw new InputError([{ path: option, value: text, allowed: `a whole number ≥ ${min}` }]);
  return n;
}

export function registerRank(program: Command, io: CliIo): void {
  program
    .command('rank')
    .description('rank a list of planets (CSV or ECSV) by the smallest moon each could reveal (analytic forecast), with the cost of the scenario\'s target moon; writes rank.json, rank.ecsv and rank.html')
    .argument('<scenario>', 'scenario YAML: instrument, observation, detection, the target moon, and optionally site, campaign and constraints, shared by every planet')
    .argument('<list>', 'planet list, CSV or ECSV (a .ecsv name or a "# %ECSV" first line; docs/rank.md names the columns); in CSV, `#` lines are comments')
    .option('--out <dir>', 'output folder (default reports/<scenario name>-rank/)')
    .option('--shard <K/N>', 'rank only the rows with index mod N = K−1 (default from SLURM_ARRAY_TASK_ID/COUNT); join with `moonsieve merge`')
    .option('--no-calendar', 'skip the campaign calendar and nights (faster; every transit assumed observed)')
    .option('--probability <p>', 'detection probability the target moon\'s transit count is solved for', String(DEFAULT_RANK_SETTINGS.probability))
    .option('--bound <n>', `known-template bound (the best any analysis can do) at every separation for the top N planets (default ${DEFAULT_BOUND}; 0 with --shard)`)
    .option('--confirm <n>', `Monte Carlo confirmation (budget's search) of the target moon's transits for the top N planets (default ${DEFAULT_CONFIRM}; 0 with --shard)`)
    .option('--confirm-realizations <n>', 'moon realizations per Monte Carlo evaluation of the confirmation', String(DEFAULT_CONFIRM_REALIZATIONS))
    .option('--confirm-no-moon-realizations <n>', 'no-moon realizations calibrating the confirmation\'s false-alarm thresholds (default: as budget, from detection.false_alarm)')
    .option('--detail <n>', `run each of the top N planets' detail sweep (moon mass × separation, ${DETAIL_MASSES} × ${DETAIL_SEPARATIONS} cells × ${DETAIL_REALIZATIONS} realizations) into details/ and link it from the page (default ${DEFAULT_DETAIL}; 0 with --shard, where N runs the shard's own top N and merge copies the whole list's top N); every listed planet's detail scenario is written there`)
    .option('--resume', `continue an interrupted run from the checkpoint in --out (${RANK_CHECKPOINT_FILE}, written every ${CHECKPOINT_EVERY} planets); finished planets are not recomputed`)
    .option('--detail-forecast-only', 'fill the detail sweeps from the analytic forecast alone (seconds)')
    .option('--workers <n>', 'worker threads of the detail sweeps (default as sweep)')
    .option('--top <n>', 'rows of the ranking printed on screen', '20')
    .option('--json', 'print rank.json instead of the table')
    .action(async (scenarioPath: string, listPath: string, opts: RankOpts) => {
      const top = wholeNumber('--top', opts.top, 0);
      const confirmRealizations = wholeNumber('--confirm-realizations', opts.confirmRealizations, 2);
      const confirmNoMoonRealizations = opts.confirmNoMoonRealizations === undefined ? undefined : wholeNumber('--confirm-no-moon-realizations', opts.confirmNoMoonRealizations, 10);
      const probability = Number(opts.probability);
      if (!(probability > 0 && probability < 1)) throw new InputError([{ path: '--probability', value: opts.probability, allowed: 'a probability between 0 and 1, e.g. 0.9' }]);
      const shard = resolveShard(opts.shard, process.env);
      const bound = opts.bound === undefined ? (shard ? 0 : DEFAULT_BOUND) : wholeNumber('--bound', opts.bound, 0);
      const confirm = opts.confirm === undefined ? (shard ? 0 : DEFAULT_CONFIRM) : wholeNumber('--confirm', opts.confirm, 0);
      const detail = opts.detail === undefined ? (shard ? 0 : DEFAULT_DETAIL) : wholeNumber('--detail', opts.detail, 0);
      if (opts.out !== undefined) checkOutputDir('--out', opts.out);
      const started = performance.now();
      let forecastDone = 0;
      const { doc, listText } = readRankInputs(scenarioPath, listPath);
      const settings = { probability, calendar: opts.calendar !== false };
      const out = opts.out ?? `${defaultOutDir(typeof doc.name === 'string' ? doc.name : 'scenario')}-rank`;
      checkOutputDir('--out', out);
      const checkpoint = openRankCheckpoint(out, rankIdentity({ doc, listText, settings, shard }), opts.resume === true);
      if (checkpoint.done.size) io.err(`resuming: ${checkpoint.done.size} planets from ${join(out, RANK_CHECKPOINT_FILE)}\n`);
      const r = rankListText(doc, listText, listPath, {
        done: checkpoint.done,
        onRanked: (p) => checkpoint.record(p),
        onForecastDone: () => checkpoint.flush(),
        shard,
        settings,
        confirm,
        bound,
        confirmRealizations,
        confirmNoMoonRealizations,
        onConfirm: (name, seconds, done, total) => {
          if (done === 1) forecastDone = performance.now() - 1000 * seconds;
          io.err(`Monte Carlo ${done}/${total}: ${name} in ${seconds.toFixed(1)} s\n`);
        },
      });
      const ended = performance.now();
      // A shard runs its own top `detail` sweeps: the whole list's top N are among the shards' top N, and merge copies them.
      const controller = new AbortController();
      const stop = () => controller.abort();
      process.once('SIGINT', stop);
      process.once('SIGTERM', stop);
      try {
        await writeRankDetails(out, r, doc, listText, listPath, {
          detail,
          workers: opts.workers,
          forecastOnly: opts.detailForecastOnly === true,
          signal: controller.signal,
          onDetail: (name, seconds, done, total) => io.err(`detail sweep ${done}/${total}: ${name} in ${seconds.toFixed(1)} s\n`),
        });
      } finally {
        process.off('SIGINT', stop);
        process.off('SIGTERM', stop);
      }
      writeRankOutputs(out, r);
      checkpoint.remove();
      const forecastS = ((forecastDone || ended) - started) / 1000;
      if (opts.json) io.out(JSON.stringify(r, null, 2) + '\n');
      else io.out(formatRank(r, top));
      for (const n of r.notes) io.err(`note: ${n}\n`);
      for (const s of r.skipped) io.err(`skipped row ${s.row} (line ${s.line}${s.name ? `, ${s.name}` : ''}): ${s.problems.join('; ')}\n`);
      io.err(`forecast tier${r.bound_computed ? ` (and the bound for the top ${r.bound_computed})` : ''}: ${r.planets_ranked} planets in ${forecastS.toFixed(1)} s (${((1000 * forecastS) / Math.max(1, r.planets_ranked)).toFixed(1)} ms per planet)\n`);
      if (r.mc_confirmed > 0) io.err(`Monte Carlo tier: ${r.mc_confirmed} planets in ${((ended - forecastDone) / 1000).toFixed(1)} s (${((ended - forecastDone) / 1000 / r.mc_confirmed).toFixed(1)} s per planet at ${confirmRealizations} realizations per evaluation)\n`);
      io.err(`wrote ${join(out, 'rank.json')}\nwrote ${join(out, 'rank.ecsv')}\nwrote ${join(out, 'rank.html')}\n`);
      if (shard) io.err(`when every shard is done: moonsieve merge <the ${shard.n} shard folders> --out <dir>${detail > 0 ? ` (give every shard the same --detail ${detail}: merge copies the whole list's top ${detail} detail sweeps from them)` : ''}\n`);
    });
}

const me = (kg: number | null) => (kg === null ? '–' : (kg / M_EARTH_KG).toPrecision(3));

/** The screen table: the first `top` planets, then the skipped rows and what the forecast leaves out. */
export function formatRank(r: RankJson, top: number): string {
  const lines: string[] = [];
  lines.push(`${r.scenario}: ${r.planets_ranked} of ${r.planets_in_list} planets ranked${r.shard ? ` (shard ${r.shard})` : ''}, ${r.skipped.length} rows skipped`);
  lines.push(`minimum moon mass (Mearth) whose forecast reaches pdet ${r.pdet_threshold}, at ${r.separations_hill.join(', ')} Hill radii; cost of the target moon at probability ${r.transits_probability}: transits (forecast; MC: Monte Carlo for the top ${r.mc_confirmed}), campaign whole transits, nights, hours`);
  lines.push('rank interval: the ranks the Chen & Kipping (2017) radius scatter allows for planets whose mass comes from the radius (empty: no stated error)');
  lines.push('');
  const head = ['rank', 'interval', 'name'.padEnd(18), ...r.separations_hill.map((f) => `${f} RH`.padStart(8)), 'transits'.padStart(8), '  MC'.padStart(5), 'campaign'.padStart(8), 'nights'.padStart(6), 'hours'.padStart(7), ' HZ moon'];
  lines.push(head.join(' '));
  for (const p of r.planets.slice(0, top)) {
    lines.push([
      String(p.rank).padStart(4),
      (p.rank_best === p.rank_worst ? '' : `${p.rank_best}–${p.rank_worst}`).padStart(8),
      p.name.slice(0, 18).padEnd(18),
      ...p.min_moon_mass_kg.map((m) => me(m).padStart(8)),
      (p.target_transits_needed !== null ? String(p.target_transits_needed) : p.target_placement && p.target_placement.join() !== 'stable' ? 'n/a' : '>max').padStart(8),
      (p.mc_realizations === null ? '' : p.mc_transits_needed === null ? '>max' : String(p.mc_transits_needed)).padStart(5),
      (p.campaign_expected_whole_transits === null ? '–' : p.campaign_expected_whole_transits.toFixed(1)).padStart(8),
      (p.nights === null ? '–' : String(p.nights)).padStart(6),
      (p.on_sky_s === null ? '–' : (p.on_sky_s / HOUR_S).toFixed(1)).padStart(7),
      p.habitable_moon_in_reach ? ' yes' : (p.target_habitability ?? ' –').padStart(8),
    ].join(' '));
  }
  if (r.planets.length > top) lines.push(`… ${r.planets.length - top} more in rank.json / rank.ecsv`);
  lines.push('', 'What this leaves out:');
  for (const a of r.assumptions) lines.push(`  - ${a}`);
  return lines.join('\n') + '\n';
}

/** `moonsieve budget SCENARIO`: the fewest transits / hours, or the coarsest cadence / worst noise, reaching a detection probability. */
import type { Command } from 'commander';
import { writeFileAtomic } from '../io/atomicWrite.js';
import { planBudget } from '../app/planBudget.js';
import { readBudgetFlags, type BudgetFlags } from '../budget/budgetSpec.js';
import { formatBudget } from '../budget/formatBudget.js';
import { renderBudgetPage } from '../report/budgetPage.js';
import { budgetToJson } from '../budget/budgetJson.js';
import type { CliIo } from './cliIo.js';
import { InputError } from '../scenario/errors.js';
import { checkOutputFile } from '../io/outputPaths.js';

export function registerBudget(program: Command, io: CliIo): void {
  program
    .command('budget')
    .description('the fewest transits (and telescope hours), or the coarsest cadence / worst white noise, that reach a target detection probability for a target moon (forecast, then Monte Carlo); with site, target and campaign blocks also the epochs to book, nights, hours on sky and the calendar time needed at the clear fraction')
    .argument('<scenario>', 'scenario YAML file (an optional budget: block holds the same settings as these options)')
    .option('--moon-mass <mass>', 'target moon mass, e.g. "0.6 Mearth" (default: the scenario\'s moon)')
    .option('--moon-separation <sep>', 'target moon separation: a length, "18 Rp" or "0.2 hill" (default: the scenario\'s moon)')
    .option('--probability <p>', 'detection probability to reach, e.g. 0.9 or "90 %" (default 0.9)')
    .option('--solve <what>', 'transits | cadence | noise (default transits; the old value precision is accepted in this release)')
    .option('--channel <ch>', 'combined | ttv | tdv | dip | template (default combined)')
    .option('--realizations <n>', 'moon realizations per Monte Carlo evaluation (default 100; 40 per moon with --habitable)')
    .option('--no-moon-realizations <n>', 'no-moon realizations calibrating the false-alarm thresholds per evaluation (default 400)')
    .option('--null-realizations <n>', 'deprecated spelling of --no-moon-realizations (accepted in this release only)')
    .option('--max-transits <n>', 'most transits considered (default 50)')
    .option('--forecast-only', 'answer from the analytic forecast alone (milliseconds; no Monte Carlo)')
    .option('--habitable', 'target the temperate, stable moons of a mass range instead of one moon')
    .option('--mass-from <mass>', 'with --habitable: lightest moon (default 0.1 Mearth)')
    .option('--mass-to <mass>', 'with --habitable: heaviest moon (default 2 Mearth)')
    .option('--grid <n>', 'with --habitable: masses × separations grid size per axis (default 8)')
    .option('--fraction <f>', 'with --habitable: fraction of the target moons that must reach the probability (default 0.5)')
    .option('--confirm-moons <n>', 'with --habitable: target moons simulated per Monte Carlo evaluation (default 8)')
    .option('--json', 'print the result as JSON (SI units) instead of the table')
    .option('--html <file>', 'also write a small HTML page: probability against the solved quantity, the chosen value marked; with a site, the season chart and the nights to book')
    .option('--quiet', 'no progress lines')
    .action((scenarioPath: string, opts: BudgetFlags & { json?: boolean; html?: string; quiet?: boolean }) => {
      if (opts.html !== undefined) checkOutputFile('--html', opts.html);
      const target = readBudgetFlags(budgetFlags(opts, io));
      const result = planBudget(scenarioPath, target, { progress: opts.quiet ? undefined : (line) => io.err(line) });
      if (opts.html) {
        try {
          writeFileAtomic(opts.html, renderBudgetPage(result));
        } catch (e) {
          // Checked up front; a place that still refuses the write (a read-only or special file system) is named here, before anything is printed.
          throw new InputError([{ path: '--html', value: opts.html, allowed: `cannot be written (${(e as NodeJS.ErrnoException).code ?? String(e)}); give a file in a writable folder` }]);
        }
      }
      io.out(opts.json ? JSON.stringify(budgetToJson(result), null, 2) + '\n' : formatBudget(result));
      if (opts.html && !opts.json) io.out(`wrote ${opts.html}\n`);
    });
}

/**
 * Commander reads a `--no-…` option as the negation of `moonRealizations` (true when absent, the
 * string when given): put it back under its own name, and take the deprecated `--null-realizations`
 * with a note on stderr when the new spelling is absent.
 */
function budgetFlags(opts: BudgetFlags, io: CliIo): BudgetFlags {
  const { moonRealizations, nullRealizations, ...rest } = opts;
  if (rest.solve === 'precision') io.err('note: --solve precision is deprecated: write --solve noise (the old value is accepted in this release only)\n');
  let given = typeof moonRealizations === 'string' ? moonRealizations : undefined;
  if (nullRealizations !== undefined) {
    io.err('note: --null-realizations is deprecated: write --no-moon-realizations (the old spelling is accepted in this release only)\n');
    given ??= nullRealizations as string;
  }
  return { ...rest, noMoonRealizations: given };
}

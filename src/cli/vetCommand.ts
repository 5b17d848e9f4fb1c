/** `moonsieve vet CLAIM [--json] [--html FILE]`: plausibility of a claimed moon signal. */
import type { Command } from 'commander';
import { writeFileAtomic } from '../io/atomicWrite.js';
import { loadClaim } from '../vet/loadClaim.js';
import { vetClaim } from '../vet/vetClaim.js';
import { formatVetReport } from '../vet/formatVetReport.js';
import { renderVetPage } from '../report/vetPage.js';
import { vetToJson } from '../vet/vetJson.js';
import type { CliIo } from './cliIo.js';
import { checkOutputFile } from '../io/outputPaths.js';

export function registerVet(program: Command, io: CliIo): void {
  program
    .command('vet')
    .description('is there a timing signal, and is a moon its plausible cause? From TTV/TDV amplitudes or a table of transit times: signal detection (look-elsewhere counted), implied moon, graded physical checks, the moons the data exclude, other explanations, and a verdict (no_signal, consistent, tension, implausible)')
    .argument('<claim>', 'claim YAML file (star, planet and a claim: block)')
    .option('--json', 'print the result as JSON (SI units) instead of the text report')
    .option('--html <file>', 'also write a self-contained HTML page with plots')
    .action((claimPath: string, opts: { json?: boolean; html?: string }) => {
      if (opts.html !== undefined) checkOutputFile('--html', opts.html);
      const claim = loadClaim(claimPath);
      for (const d of claim.deprecations ?? []) io.err(`note: ${d}\n`);
      const result = vetClaim(claim);
      const page = opts.html ? renderVetPage(result) : null;
      if (opts.html && page !== null) writeFileAtomic(opts.html, page);
      io.out(opts.json ? JSON.stringify(vetToJson(result), null, 2) + '\n' : formatVetReport(result));
      if (opts.html && !opts.json) io.out(`wrote ${opts.html}\n`);
    });
}

/** `moonsieve simulate SCENARIO`: one synthetic light curve and its true TTV/TDV. */
import type { Command } from 'commander';
import { join } from 'node:path';
import { loadScenario } from '../scenario/loadScenario.js';
import { formatCautions } from '../scenario/parseScenario.js';
import { InputError } from '../scenario/errors.js';
import { fitOf, simulateScenario, simulationTables, tdvOf, ttvOf } from '../app/simulateScenario.js';
import type { Scenario } from '../scenario/types.js';
import { renderTable } from '../io/ecsv.js';
import { writeFileAtomic } from '../io/atomicWrite.js';
import { renderSimulatePage } from '../report/simulatePage.js';
import { assertObservable, windowsOverlap } from '../photometry/transitWindows.js';
import { defaultOutDir } from '../app/defaultOutDir.js';
import type { CliIo } from './cliIo.js';
import { checkOutputDir } from '../io/outputPaths.js';

export function registerSimulate(program: Command, io: CliIo): void {
  program
    .command('simulate')
    .description('one synthetic light curve (noisy or --noiseless) and its TTV/TDV, as ECSV/CSV and an HTML page')
    .argument('<scenario>', 'scenario YAML file')
    .option('--noiseless', 'write the model without noise')
    .option('--out <dir>', 'output folder (default reports/<scenario name>/)')
    .option('--format <format>', 'table format: ecsv or csv', 'ecsv')
    .option('--draw <n>', 'index of the noise draw (seeded by the scenario seed and this number; default 0)')
    .option('--realization <n>', 'deprecated spelling of --draw (accepted in this release only)')
    .action((scenarioPath: string, opts: { noiseless?: boolean; out?: string; format: string; draw?: string; realization?: string }) => {
      if (opts.format !== 'ecsv' && opts.format !== 'csv') {
        throw new InputError([{ path: '--format', value: opts.format, allowed: 'expected "ecsv" or "csv"' }]);
      }
      if (opts.realization !== undefined) io.err('note: --realization is deprecated: write --draw (the old spelling is accepted in this release only)\n');
      const flag = opts.draw === undefined && opts.realization !== undefined ? '--realization' : '--draw';
      const drawText = opts.draw ?? opts.realization ?? '0';
      // The random stream index is a safe integer (noise/rng.ts): 0 … 2^53 − 1, written in digits.
      const realization = /^\s*\d+\s*$/.test(drawText) ? Number(drawText) : NaN;
      if (!Number.isSafeInteger(realization) || realization < 0) {
        throw new InputError([{ path: flag, value: drawText.length > 40 ? `${drawText.slice(0, 40)}…` : drawText, allowed: `expected a whole number from 0 to ${Number.MAX_SAFE_INTEGER}, written in digits` }]);
      }
      const scenario = loadScenario(scenarioPath);
      checkOutputDir(opts.out === undefined ? 'output folder (default from the scenario name)' : '--out', opts.out ?? defaultOutDir(scenario.name));
      assertObservable(scenario, scenarioPath);
      io.err(formatCautions(scenario)); // odd but legal inputs, as note: lines
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
      const perPoint = sim.observation.sigmaPoint !== null ? ' (rms over the exposures, each at its own air mass)' : '';
      io.out(`${scenario.name}: ${sim.observation.timeS.length} points in ${sim.truth.length} transit windows` +
        `${noiseless ? ' (noiseless)' : `, white noise ${(sim.observation.sigma * 1e6).toFixed(1)} ppm per exposure${perPoint}`}\n`);
      for (const line of noiseModelLines(scenario, noiseless)) io.out(`  ${line}\n`);
      if (windowsOverlap(scenario)) {
        io.out(`  note: the baseline reaches past half the period, so the windows are cut at the midpoints between conjunctions (each time stamp once, a continuous light curve there)\n`);
      }
      if (sim.recovery.noTransitObserved) {
        io.out(`  no transit observed in this realization: every transit was lost to ${sim.observation.site !== null ? 'the sky (nothing observable from the site: see `moonsieve calendar`), weather, ' : ''}missed transits or gaps (${sim.observation.timeS.length} points kept); nothing was fitted\n`);
      }
      io.out('epoch   true TTV (s)  true TDV (s) | fit    fitted TTV (s)       fitted TDV (s)\n');
      const meanDur = sim.truth.reduce((a, t) => a + t.durationS, 0) / sim.truth.length;
      const fits = fitOf(sim);
      sim.truth.forEach((t, i) => {
        const f = fits[i];
        const ok = f !== undefined && f.status === 'ok';
        const ttv = ttvOf(sim, t.epoch);
        const tdv = tdvOf(sim, t.epoch);
        const fitted = ok ? `${ttv.toFixed(1).padStart(8)} ± ${f.tcErrS.toFixed(1).padEnd(7)} ${Number.isFinite(f.durationErrS) ? `${tdv.toFixed(1).padStart(8)} ± ${f.durationErrS.toFixed(1)}` : `  (${f.contacts?.replace('_', ' ') ?? 'one contact'}: duration not measured)`}` : `(${f?.status ?? 'no data'}${f?.reason ? `: ${f.reason}` : ''})`;
        io.out(`${String(t.epoch).padStart(5)}  ${(t.midS - t.epoch * scenario.planet.periodS).toFixed(1).padStart(12)}  ${(t.durationS - meanDur).toFixed(1).padStart(12)} | ${ok ? 'ok  ' : '    '} ${fitted}\n`);
      });
      if (sim.recovery.beta) io.out(`  time-averaging beta applied to the fitted errors: ${sim.recovery.beta.beta.toFixed(2)}\n`);
      for (const [path] of files) io.out(`wrote ${path}\n`);
    });
}

/** One line per noise ingredient, so an observer sees which term limits them. */
export function noiseModelLines(s: Scenario, noiseless: boolean): string[] {
  if (noiseless) return ['noise: none (noiseless model)'];
  const ppm = (x: number) => `${(x * 1e6).toFixed(1)} ppm`;
  const out: string[] = [];
  const g = s.instrument.ground;
  if (g) {
    out.push(`ground budget per ${s.instrument.exposureS.toFixed(0)}-s exposure (${g.apertureM} m aperture, V = ${g.magnitude}, airmass ${g.airmass}, ${g.altitudeM.toFixed(0)} m):`);
    out.push(`  photon ${ppm(g.terms.photon)}, scintillation ${ppm(g.terms.scintillation)} (Osborn et al. 2015, C_Y = ${g.scintillationCoefficient}), floor ${ppm(g.terms.floor)}; total ${ppm(g.terms.total)}, dominated by ${g.terms.dominant}`);
  } else {
    out.push(`white noise: ${ppm(s.instrument.noiseFraction)} per ${(s.instrument.noiseTimescaleS / 60).toFixed(2)} min, scaled by sqrt(t) to the exposure`);
  }
  const r = s.instrument.redNoise;
  if (r) out.push(r.model === 'drw' ? `red noise: damped random walk, rms ${ppm(r.rmsFraction)}, timescale ${(r.tauS / 60).toFixed(1)} min` : `red noise: power law S ∝ f^-${r.beta}, rms ${ppm(r.rmsFraction)} per ${(r.timescaleS / 60).toFixed(1)} min`);
  const o = s.observation;
  if (o.missedFraction > 0 || o.dutyCycle < 1) out.push(`gaps: ${(100 * o.missedFraction).toFixed(0)} % of transits missed, ${(100 * o.dutyCycle).toFixed(0)} % of each window observed (mean gap ${(o.gapLengthS / 60).toFixed(0)} min)`);
  return out;
}

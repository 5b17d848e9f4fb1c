/**
 * The template bank's phase count against an ideal test (issue 17, item 2): on
 * bench/boundReference.ts's invented K-dwarf system, the bank statistic
 * (timing/templateSearch.ts, marginal) applied to ideal residuals (Gaussian
 * with each bin's variance, the planet-only freedoms exactly removed) holding
 * a moon at a phase drawn from a 256-phase bank, calibrated at α = 1 % on
 * no-moon draws; the 50 % minimum detectable mass per phase count (log-linear
 * between the masses that bracket 50 %), over the known-template bound's
 * (`knownTemplateBound`, 48 angle sets). It measures what the bank can reach
 * without the pipeline's fits, and where more phases stop helping
 * (MIN_NEIGHBOUR_CORRELATION). Seeded: the same figures on every run.
 */
import { parseScenario } from '../src/scenario/parseScenario.js';
import { CELL_PARSE, withoutMoon } from '../src/sweep/applyAxes.js';
import { knownTemplateBound } from '../src/timing/knownTemplateBound.js';
import { buildTemplateBank, freedomBasis, neighbourCorrelation, templateLayout, templateStatistic, type TemplateBank, type TemplateLayout } from '../src/timing/templateSearch.js';
import { createRng, type Rng } from '../src/noise/rng.js';
import type { Scenario } from '../src/scenario/types.js';
import type { BenchMedian } from './measure.js';
import { boundReferenceDoc } from './boundReference.js';

function cellScenario(massMearth: number, separationHill: number): Scenario {
  const doc = boundReferenceDoc({ realizations: 100, masses: 2, separations: [separationHill] }) as Record<string, unknown> & { moon: Record<string, unknown> };
  delete doc.sweep;
  doc.moon.mass = `${massMearth} Mearth`;
  doc.moon.separation = `${separationHill} hill`;
  return parseScenario(doc, 'bank phases', CELL_PARSE);
}

function mass50(ms: readonly number[], p: readonly number[]): number {
  for (let i = 1; i < ms.length; i++) {
    if (p[i - 1] < 0.5 && p[i] >= 0.5) return Math.exp(Math.log(ms[i - 1]) + ((0.5 - p[i - 1]) / (p[i] - p[i - 1])) * Math.log(ms[i] / ms[i - 1]));
  }
  return NaN;
}

/**
 * Detection probability of the bank statistic on ideal residuals (see the file header): `nNull` no-moon
 * draws set the threshold at α (order statistic ⌈(n + 1)(1 − α)⌉), then `nAlt` draws hold the moon at a
 * template of `truth` drawn uniformly. Both banks on layout L.
 */
export function idealPower(bank: TemplateBank, truth: TemplateBank, L: TemplateLayout, rng: Rng, nNull: number, nAlt: number, alpha: number): number {
  const rho = new Float64Array(L.bins);
  const nulls = new Float64Array(nNull);
  for (let r = 0; r < nNull; r++) {
    for (let b = 0; b < L.bins; b++) rho[b] = Math.sqrt(L.count[b]) * rng.normal();
    nulls[r] = templateStatistic(bank, rho);
  }
  nulls.sort();
  const threshold = nulls[Math.ceil((nNull + 1) * (1 - alpha)) - 1];
  let detected = 0;
  for (let r = 0; r < nAlt; r++) {
    const j = Math.floor(rng.uniform() * truth.templates);
    const g = truth.filters.subarray(j * L.bins, (j + 1) * L.bins);
    // the projected template in ρ units: d̃_b/σ = g_b·‖d̃‖·Σv_b/σ
    for (let b = 0; b < L.bins; b++) rho[b] = Math.sqrt(L.count[b]) * rng.normal() + (g[b] * truth.projectedNorm[j] * L.count[b]) / L.sigmaRef;
    if (templateStatistic(bank, rho) > threshold) detected++;
  }
  return detected / nAlt;
}

export function benchBankPhases(): BenchMedian[] {
  const cases: Array<{ hill: number; masses: number[]; phases: Array<number | undefined> }> = [
    { hill: 0.15, masses: [0.6, 0.85, 1.2, 1.7], phases: [12, 16, 24, 32, 48, undefined] },
    { hill: 0.3, masses: [0.3, 0.45, 0.66, 0.9], phases: [16, 32, undefined] },
    { hill: 0.45, masses: [0.2, 0.28, 0.41, 0.55], phases: [16, 32, undefined] },
  ];
  const nNull = 5000;
  const nAlt = 3000;
  const rows: BenchMedian[] = [];
  for (const cs of cases) {
    const nul = withoutMoon(cellScenario(cs.masses[0], cs.hill));
    const L = templateLayout(nul);
    const basis = freedomBasis(nul, L);
    const boundP = cs.masses.map((m) => knownTemplateBound(cellScenario(m, cs.hill), { planetOnly: nul, angles: 48 }).probability);
    const mb = mass50(cs.masses, boundP);
    for (const N of cs.phases) {
      const p: number[] = [];
      let templates = 0;
      let corr = 0;
      cs.masses.forEach((m, im) => {
        const s = cellScenario(m, cs.hill);
        const bank = buildTemplateBank(s, L, { basis, phases: N });
        const truth = buildTemplateBank(s, L, { basis, phases: 256 });
        templates = bank.templates;
        corr = neighbourCorrelation(bank, L, 1);
        // The same draws for every phase count (common random numbers: the rows differ by the bank only).
        p.push(idealPower(bank, truth, L, createRng(17, 1000 * Math.round(100 * cs.hill) + im, 0), nNull, nAlt, 0.01));
      });
      rows.push({
        label: `${cs.hill} Hill, ${N === undefined ? `refined bank (${templates})` : `${N}`} phases (neighbour correlation ${corr.toFixed(2)}): ideal 50 % mass over the bound's ${mb.toPrecision(3)} M⊕ (P ${p.map((x) => x.toFixed(2)).join(' ')} at ${cs.masses.join(', ')} M⊕)`,
        median: mass50(cs.masses, p) / mb, unit: '×', repeats: 1, summary: `${nAlt} moon, ${nNull} no-moon draws`,
      });
    }
  }
  return rows;
}

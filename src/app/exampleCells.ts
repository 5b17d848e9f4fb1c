/**
 * Example cells for the report: for two or three chosen cells (the most and
 * least detectable, and the one nearest 50 %), one noisy observation with its
 * model, the recovered TTV and TDV series with their errors, and the TTV
 * periodogram with the moon's folded (alias) frequency.
 *
 * Each example is realization 0 of its cell, drawn from
 * createRng(seed, cellIndex, 0) exactly as the sweep drew it, so the page is
 * reproducible and shows one of the realizations the cell's probability counts.
 */
import { parseScenario } from '../scenario/parseScenario.js';
import type { Scenario } from '../scenario/types.js';
import { createRng } from '../noise/rng.js';
import { runRealization } from '../timing/realization.js';
import { lombScargle } from '../timing/lombScargle.js';
import { computeLimits } from '../limits/computeLimits.js';
import { parseSweepSpec, applyAxisValues } from '../sweep/sweepSpec.js';
import type { CellResult } from '../sweep/cellTypes.js';
import type { SweepMeta } from '../sweep/sweepMeta.js';
import { cellProbability, num } from '../report/reportGrid.js';

import type { ExampleCell } from '../report/exampleFigures.js';

export type { ExampleCell };

/** At most this many points per light curve on the page (more are averaged in consecutive groups). */
export const MAX_LIGHT_CURVE_POINTS = 6000;

interface Candidate {
  c: CellResult;
  p: number;
}

/** The cells to illustrate: most detectable, least detectable, nearest 50 % (distinct, up to `max`). */
export function chooseExampleCells(meta: SweepMeta, cells: readonly CellResult[], max = 3): Array<{ cell: CellResult; label: string; probability: number }> {
  const fo = meta.forecast_only;
  const cands: Candidate[] = [];
  for (const c of cells) {
    if (fo ? c.allowed !== true : c.simulated !== true) continue;
    const p = cellProbability(c, 'combined', fo);
    if (p !== null) cands.push({ c, p });
  }
  if (cands.length === 0) return [];
  const mass = (e: Candidate) => num(e.c, 'moon_mass_kg') ?? 0;
  // Most detectable: highest p, then the lightest moon, then the lowest index.
  const most = [...cands].sort((a, b) => b.p - a.p || mass(a) - mass(b) || a.c.index - b.c.index)[0];
  // Least detectable: lowest p, then the heaviest moon (the hardest case to miss), then the lowest index.
  const least = [...cands].sort((a, b) => a.p - b.p || mass(b) - mass(a) || a.c.index - b.c.index)[0];
  const mid = [...cands].sort((a, b) => Math.abs(a.p - 0.5) - Math.abs(b.p - 0.5) || a.c.index - b.c.index)[0];
  const out: Array<{ cell: CellResult; label: string; probability: number }> = [];
  const add = (e: Candidate, label: string) => {
    if (out.length < max && !out.some((o) => o.cell.index === e.c.index)) out.push({ cell: e.c, label, probability: e.p });
  };
  add(most, 'most detectable');
  add(least, 'least detectable');
  add(mid, 'nearest 50 %');
  return out;
}

/** The parsed scenario of one cell: the base document with the cell's axis values written in. */
export function cellScenario(scenarioDoc: unknown, cell: CellResult): Scenario {
  const base = parseScenario(scenarioDoc, 'scenario');
  const spec = parseSweepSpec(scenarioDoc, base);
  return parseScenario(applyAxisValues(scenarioDoc, spec.axes, cell.coords), `cell ${cell.index}`, { moonContact: 'label' });
}

export function computeExampleCell(scenarioDoc: unknown, meta: SweepMeta, cell: CellResult, label: string, probability: number): ExampleCell {
  const s = cellScenario(scenarioDoc, cell);
  const { observation: obs, recovery } = runRealization(s, createRng(meta.seed, cell.index, 0));
  const centre = new Map(obs.windows.map((w) => [w.epoch, w.centreS]));
  const n = obs.timeS.length;
  const k = Math.max(1, Math.ceil(n / MAX_LIGHT_CURVE_POINTS));
  const timeH: number[] = [];
  const fluxPpm: number[] = [];
  for (let i = 0; i < n; ) {
    const e = obs.epoch[i];
    let m = 0;
    let st = 0;
    let sf = 0;
    while (m < k && i < n && obs.epoch[i] === e) {
      st += obs.timeS[i];
      sf += obs.flux[i];
      m++;
      i++;
    }
    timeH.push((st / m - (centre.get(e) ?? 0)) / 3600);
    fluxPpm.push((sf / m - 1) * 1e6);
  }
  const modelTimeH: Array<number | null> = [];
  const modelPpm: Array<number | null> = [];
  for (let i = 0; i < n; i += k) {
    if (i > 0 && obs.epoch[i] !== obs.epoch[i - k]) {
      modelTimeH.push(null);
      modelPpm.push(null);
    }
    modelTimeH.push((obs.timeS[i] - (centre.get(obs.epoch[i]) ?? 0)) / 3600);
    modelPpm.push((obs.model[i] - 1) * 1e6);
  }
  const ttv = { epoch: recovery.ttv.map((p) => p.epoch), valueS: recovery.ttv.map((p) => p.ttvS), errS: recovery.ttv.map((p) => p.errS) };
  const tdv = {
    epoch: recovery.tdv.points.map((p) => p.epoch),
    valueS: recovery.tdv.points.map((p) => p.tdvS),
    errS: recovery.tdv.points.map((p) => p.errS),
  };
  let periodogram: ExampleCell['periodogram'] = null;
  if (ttv.epoch.length >= 4) {
    const ls = lombScargle(Float64Array.from(ttv.epoch), Float64Array.from(ttv.valueS), Float64Array.from(ttv.errS));
    periodogram = { frequency: Array.from(ls.frequency), power: Array.from(ls.power), peakFrequency: ls.peakFrequency, falseAlarmProbability: ls.falseAlarmProbability };
  }
  const limits = computeLimits(s);
  return {
    index: cell.index,
    coords: cell.coords,
    label,
    probability,
    moonMassKg: s.moon?.massKg ?? null,
    moonSeparationM: s.moon?.separationM ?? null,
    planetPeriodS: s.planet.periodS,
    lightCurve: { timeH, fluxPpm, binFactor: k, modelTimeH, modelPpm, noisePpm: obs.sigma * 1e6 },
    ttv,
    tdv,
    periodogram,
    aliasFrequencyPerEpoch: limits.ttv_alias_frequency_per_epoch,
    aliasFamilyPeriodsS: limits.ttv_alias_family_periods_s ?? [],
  };
}

/** Examples for the chosen cells of a sweep (empty when no cell qualifies). */
export function computeExampleCells(scenarioDoc: unknown, meta: SweepMeta, cells: readonly CellResult[], max = 3): ExampleCell[] {
  return chooseExampleCells(meta, cells, max).map((e) => computeExampleCell(scenarioDoc, meta, e.cell, e.label, e.probability));
}

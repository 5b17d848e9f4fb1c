/**
 * What identifies a sweep: the scenario (by hash), seed, program version,
 * grid and per-cell settings. Written at the head of `cells.json` and of the
 * checkpoint; a resume or a merge is refused when any of it differs. Nothing
 * run-dependent (wall time, workers, shard) belongs here.
 */
import { VERSION } from '../version.js';
import type { Scenario } from '../scenario/types.js';
import { cautionNotes } from '../scenario/parseScenario.js';
import { canonicalJson } from './canonicalJson.js';
import type { SweepSpec } from './sweepSpec.js';
import { calibrationMethodOf, defaultNullRealizations } from './nullSet.js';
import type { Shard } from './shard.js';

export interface SweepAxisMeta {
  field: string;
  unit: string;
  spacing: string;
  from_text: string;
  to_text: string;
  from: number;
  to: number;
  count: number;
  values: number[];
  /** Level fields stated at a timescale ("50 ppm per 1 h"): that timescale, s (absent otherwise). */
  timescale_s?: number;
}

export interface SweepMeta {
  moonsieve_version: string;
  scenario: string;
  scenario_hash: string;
  seed: number;
  false_alarm: number;
  realizations: number;
  /**
   * No-moon calibration realizations per null class: the sweep block's
   * `no_moon_realizations`, else the default for the base scenario's α and R.
   */
  no_moon_realizations: number;
  simulate_unstable: boolean;
  forecast_only: boolean;
  axes: SweepAxisMeta[];
  /** Number of cells in the whole grid. */
  cells: number;
  notes: string[];
}

export function buildSweepMeta(scenario: Scenario, hash: string, spec: SweepSpec, forecastOnly: boolean): SweepMeta {
  return {
    moonsieve_version: VERSION,
    scenario: scenario.name,
    scenario_hash: hash,
    seed: scenario.seed,
    false_alarm: scenario.detection.falseAlarm,
    realizations: spec.realizations,
    no_moon_realizations: spec.nullRealizations ?? defaultNullRealizations(scenario.detection.falseAlarm, spec.realizations, calibrationMethodOf(scenario)),
    simulate_unstable: spec.simulateUnstable,
    forecast_only: forecastOnly,
    axes: spec.axes.map((a) => ({
      field: a.field, unit: a.unit, spacing: a.spacing, from_text: a.fromText, to_text: a.toText,
      from: a.from, to: a.to, count: a.count, values: a.values,
      ...(a.timescaleS !== undefined ? { timescale_s: a.timescaleS } : {}),
    })),
    cells: spec.axes.reduce((n, a) => n * a.values.length, 1),
    // Odd but legal inputs of the base scenario (scenario/cautions), then the axes' own notes.
    notes: [...cautionNotes(scenario), ...spec.notes],
  };
}

/** The identifying parts that differ between two metas, in words ("scenario hash a… vs b…"); empty when they match. */
export function metaDifferences(a: SweepMeta, b: SweepMeta): string[] {
  const out: string[] = [];
  const short = (h: string): string => String(h).slice(0, 12);
  if (a.scenario_hash !== b.scenario_hash) out.push(`scenario (hash ${short(a.scenario_hash)}… vs ${short(b.scenario_hash)}…${a.scenario !== b.scenario ? `, "${a.scenario}" vs "${b.scenario}"` : ''})`);
  if (a.seed !== b.seed) out.push(`seed (${a.seed} vs ${b.seed})`);
  if (a.moonsieve_version !== b.moonsieve_version) out.push(`moonsieve version (${a.moonsieve_version} vs ${b.moonsieve_version})`);
  if (canonicalJson(a.axes) !== canonicalJson(b.axes) || a.cells !== b.cells) out.push(`grid (${gridText(a)} vs ${gridText(b)})`);
  if (a.realizations !== b.realizations) out.push(`realizations per cell (${a.realizations} vs ${b.realizations})`);
  if (a.no_moon_realizations !== b.no_moon_realizations) out.push(`no-moon calibration realizations (${a.no_moon_realizations} vs ${b.no_moon_realizations})`);
  if (a.simulate_unstable !== b.simulate_unstable) out.push(`simulate_unstable (${a.simulate_unstable} vs ${b.simulate_unstable})`);
  if (a.forecast_only !== b.forecast_only) out.push(`forecast-only mode (${a.forecast_only} vs ${b.forecast_only})`);
  if (out.length === 0 && canonicalJson(a) !== canonicalJson(b)) out.push('sweep settings');
  return out;
}

function gridText(m: SweepMeta): string {
  return (m.axes ?? []).map((a) => `${a.field}×${a.values?.length ?? a.count}`).join(' by ') || '?';
}

/** run.json of a run (written by sweep/outputs.ts). */
export interface SweepRunInfo {
  moonsieve_version: string;
  scenario: string;
  scenario_hash: string;
  seed: number;
  shard: Shard | null;
  /** Worker threads used (0: cells ran in the main thread). */
  workers: number;
  host_cores: number;
  started: string;
  finished: string;
  wall_time_s: number;
  /** Cells in the whole grid, in this output, computed in this run, read back from a checkpoint. */
  cells_total: number;
  cells: number;
  cells_computed: number;
  cells_resumed: number;
  realizations: number;
  forecast_only: boolean;
  false_alarm: number;
  node_version: string;
  /** For a merge: the run.json of each shard merged. */
  merged_from?: Array<{ dir: string; run: unknown }>;
}

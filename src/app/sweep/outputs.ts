/**
 * The outputs of a finished sweep (or shard, or merge), all written
 * atomically into one folder:
 * - `cells.json`: the meta (what identifies the sweep) and one line per cell,
 *   sorted by index. Nothing run-dependent, so it is byte-identical whatever
 *   the worker count, sharding (once merged) or resumption.
 * - `cells.ecsv`: one row per cell, the axis values with units and every
 *   scalar field of the cell results (nested objects flattened with "_"),
 *   with a meta header describing the scenario (astropy-readable).
 * - `scenario.yaml`: the scenario document the sweep ran (its hash is in cells.json).
 * - `summary.json` and `report.html`: the self-contained report (src/report/).
 * - `run.json`: how this run went (version, hash, seed, workers, shard, times).
 */
import { commitOutputs } from './outputFolder.js';
import { toEcsv, type EcsvDatatype, type TableColumn } from '../../io/ecsv.js';
import { stringify as stringifyYaml } from 'yaml';
import { buildSummary, renderSummaryJson } from '../../report/summary.js';
import { renderSweepReport } from '../sweepReport.js';
import type { CellResult } from '../../sweep/cellTypes.js';
import type { SweepMeta, SweepRunInfo } from '../../sweep/sweepMeta.js';
import type { Shard } from '../../sweep/shard.js';

export type { SweepRunInfo };

/** Schema ids of the JSON files of an output folder (schemas/*.schema.json; summary.json's is SUMMARY_SCHEMA). */
export const CELLS_SCHEMA = 'moonsieve/cells/2';
export const RUN_SCHEMA = 'moonsieve/run/1';

/** run.json text: the run info under its schema id. */
export function renderRunJson(run: SweepRunInfo): string {
  return JSON.stringify({ schema: RUN_SCHEMA, ...run }, null, 2) + '\n';
}

export const OUTPUT_FILES = ['cells.json', 'cells.ecsv', 'scenario.yaml', 'summary.json', 'report.html', 'run.json'] as const;

function byIndex(results: readonly CellResult[]): CellResult[] {
  return [...results].sort((a, b) => a.index - b.index);
}

/** cells.json text: meta, then one cell per line, sorted by index. */
export function renderCellsJson(meta: SweepMeta, results: readonly CellResult[]): string {
  const cells = byIndex(results);
  const body = cells.map((c) => '    ' + JSON.stringify(c)).join(',\n');
  return `{\n  "schema": ${JSON.stringify(CELLS_SCHEMA)},\n  "meta": ${JSON.stringify(meta)},\n  "cells": [\n${body}${cells.length ? '\n' : ''}  ]\n}\n`;
}

/** Read back what `renderCellsJson` wrote. */
export function parseCellsJson(text: string): { meta: SweepMeta; cells: CellResult[] } {
  const v = JSON.parse(text) as { schema?: unknown; meta?: SweepMeta; cells?: CellResult[] };
  if (!v || typeof v !== 'object' || !v.meta || !Array.isArray(v.cells)) throw new Error('not a moonsieve cells.json (no meta or cells)');
  if (v.schema !== CELLS_SCHEMA) throw new Error(`its schema is ${v.schema === undefined ? 'not stated (an older moonsieve wrote it)' : JSON.stringify(v.schema)}, this moonsieve reads ${CELLS_SCHEMA}: re-run the sweep with this version`);
  const m = v.meta as unknown as Record<string, unknown>;
  const axes = m.axes as Array<{ values?: unknown }> | undefined;
  const gridOk = Array.isArray(axes) && axes.length >= 1 &&
    axes.every((a) => a && Array.isArray(a.values) && a.values.length >= 1 && (a.values as unknown[]).every((x) => typeof x === 'number' && Number.isFinite(x))) &&
    Number.isSafeInteger(m.cells) && m.cells === axes.reduce((n, a) => n * (a.values as unknown[]).length, 1);
  if (!gridOk) throw new Error('its meta does not describe a grid (axes with values, and cells = the product of their counts)');
  if (!(Number.isSafeInteger(m.realizations) && (m.realizations as number) >= 1)) throw new Error(`its meta.realizations is not a whole number ≥ 1 (${String(m.realizations)})`);
  if (typeof m.scenario_hash !== 'string') throw new Error('its meta has no scenario_hash');
  return { meta: v.meta, cells: v.cells };
}

/** Units guessed from SI suffixes of result keys (`ttv_rms_s` → s). */
const SUFFIX_UNITS: Array<[RegExp, string]> = [
  [/_w_m2$/i, 'W / m2'],
  [/_kg_m3$/i, 'kg / m3'],
  [/_kg$/, 'kg'],
  [/_rad$/, 'rad'],
  [/_k$/, 'K'],
  [/_w$/, 'W'],
  [/_s$/, 's'],
  [/_m$/, 'm'],
];

/** Name suffix of an axis column for its SI unit (axisFields.ts units); '' for plain numbers and fractions. */
const AXIS_UNIT_SUFFIX: Record<string, string> = { kg: '_kg', m: '_m', s: '_s', rad: '_rad', 'kg/m^3': '_kg_m3', W: '_w', K: '_k' };

function unitOf(name: string): string | undefined {
  for (const [re, u] of SUFFIX_UNITS) if (re.test(name)) return u;
  return undefined;
}

/** Scalar leaves of a result, nested objects flattened with "_"; arrays of scalars joined with "; ". */
function flatten(obj: Record<string, unknown>, prefix: string, out: Map<string, unknown>): void {
  for (const [k, v] of Object.entries(obj)) {
    const name = prefix ? `${prefix}_${k}` : k;
    if (v === null || typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean') {
      out.set(name, v);
    } else if (Array.isArray(v)) {
      if (v.every((x) => x === null || typeof x === 'number' || typeof x === 'string' || typeof x === 'boolean')) out.set(name, v.join('; '));
    } else if (typeof v === 'object') {
      flatten(v as Record<string, unknown>, name, out);
    }
  }
}

/** The cell table: index, one column per axis (SI with unit), then every scalar result field. */
export function cellsTable(meta: SweepMeta, results: readonly CellResult[]): TableColumn[] {
  const cells = byIndex(results);
  const columns: TableColumn[] = [
    { name: 'index', datatype: 'int64', description: 'cell index, row-major over the axes', values: cells.map((c) => c.index) },
  ];
  const taken = new Set(['index']);
  meta.axes.forEach((a, k) => {
    // The axis column bears the vocabulary's name for its quantity (moon.mass → moon_mass_kg), and the
    // cell result of the same name is not repeated beside it (one column per concept).
    const name = a.field.replace(/\./g, '_') + (AXIS_UNIT_SUFFIX[a.unit] ?? '');
    taken.add(name);
    columns.push({
      name, datatype: 'float64', unit: a.unit || undefined,
      description: `sweep axis ${k + 1}: ${a.field} (${a.spacing} from ${a.from_text} to ${a.to_text})`,
      values: cells.map((c) => (Array.isArray(c.coords) && typeof c.coords[k] === 'number' ? c.coords[k] : Number.NaN)),
    });
  });
  const flat = cells.map((c) => {
    const { index: _i, coords: _c, ...rest } = c;
    void _i;
    void _c;
    const m = new Map<string, unknown>();
    flatten(rest, '', m);
    return m;
  });
  const order: string[] = [];
  const kinds = new Map<string, Set<string>>();
  for (const m of flat) {
    for (const [k, v] of m) {
      let s = kinds.get(k);
      if (!s) {
        s = new Set();
        kinds.set(k, s);
        order.push(k);
      }
      s.add(v === null ? 'null' : typeof v);
    }
  }
  for (const key of order) {
    const s = kinds.get(key) as Set<string>;
    const missing = flat.some((m) => !m.has(key));
    let datatype: EcsvDatatype = 'string';
    if ([...s].every((t) => t === 'number' || t === 'null')) datatype = 'float64';
    else if (s.size === 1 && s.has('boolean') && !missing) datatype = 'bool';
    const values = flat.map((m) => {
      const v = m.get(key);
      if (datatype === 'float64') return typeof v === 'number' ? v : Number.NaN;
      if (datatype === 'bool') return v as boolean;
      return v === null || v === undefined ? '' : String(v);
    });
    if (taken.has(key)) continue; // an axis column already holds it
    const name = key;
    taken.add(name);
    columns.push({ name, datatype, unit: datatype === 'float64' ? unitOf(key) : undefined, values: values as number[] | string[] | boolean[] });
  }
  return columns;
}

function ecsvMeta(meta: SweepMeta): Record<string, unknown> {
  return {
    description: 'moonsieve injection-recovery sweep: one row per grid cell',
    scenario: meta.scenario,
    scenario_hash: meta.scenario_hash,
    seed: meta.seed,
    moonsieve_version: meta.moonsieve_version,
    axes: meta.axes.map((a) => ({ field: a.field, unit: a.unit, spacing: a.spacing, from: a.from_text, to: a.to_text, count: a.values.length })),
    cells: meta.cells,
    realizations: meta.realizations,
    false_alarm: meta.false_alarm,
    simulate_unstable: meta.simulate_unstable,
    forecast_only: meta.forecast_only,
    notes: meta.notes,
  };
}

export function renderCellsEcsv(meta: SweepMeta, results: readonly CellResult[]): string {
  return toEcsv(cellsTable(meta, results), ecsvMeta(meta));
}

/**
 * Write every output of a sweep into `dir` as one set (outputFolder.ts:
 * staged, then renamed into place), so the folder holds this set or the
 * previous one, never a mixture. The caller holds the folder's lock.
 * Returns the paths written.
 */
export function writeSweepOutputs(dir: string, meta: SweepMeta, results: readonly CellResult[], run: SweepRunInfo, scenarioDoc: unknown | null): string[] {
  const summary = buildSummary(meta, results);
  // Everything is rendered before anything is written: nothing half-written on a failure.
  const files: Array<[string, string]> = [
    ['cells.json', renderCellsJson(meta, results)],
    ['cells.ecsv', renderCellsEcsv(meta, results)],
    ...(scenarioDoc !== null ? ([['scenario.yaml', stringifyYaml(scenarioDoc)]] as Array<[string, string]>) : []),
    ['summary.json', renderSummaryJson(summary)],
    ['report.html', renderSweepReport({ meta, cells: results, runInfo: run, scenario: scenarioDoc, summary })],
    ['run.json', renderRunJson(run)],
  ];
  // Staged and renamed as one set; a previous set's file this one lacks (scenario.yaml) is removed.
  return commitOutputs(dir, files, [...OUTPUT_FILES]);
}

// The source tree is layered (DESIGN.md, "Shape"): imports run downward only
// and there are no import cycles. This test walks every import of src/**/*.ts
// and fails on an import into a higher layer and on any cycle, naming each.
// Common practice, no source: a layering rule checked by a test keeps it true.
import { describe, expect, it } from 'vitest';
import { fileURLToPath } from 'node:url';
import { importCycles, readImportGraph, type ImportEdge } from './importGraph.js';

const SRC = fileURLToPath(new URL('../../src/', import.meta.url));

/**
 * Layers, lowest first. A file may import files of its own layer or of a
 * lower one. The longest matching prefix (a folder, or a file) names a
 * file's layer.
 */
const LAYERS: { name: string; prefixes: string[] }[] = [
  // base: numerics and tiny helpers with no knowledge of moons
  { name: 'base', prefixes: ['numeric/', 'memo.ts', 'version.ts'] },
  // the scenario's types and the input-error class: the contract every layer speaks
  { name: 'contracts', prefixes: ['scenario/types.ts', 'scenario/errors.ts', 'scenario/requireSky.ts'] },
  // stages, in pipeline order: each is a set of pure functions of its stage
  { name: 'physics', prefixes: ['physics/'] },
  { name: 'sky+photometry', prefixes: ['sky/', 'photometry/'] },
  { name: 'noise', prefixes: ['noise/'] },
  { name: 'timing', prefixes: ['timing/'] },
  // scenario parsing: units, validation and the derived values (uses physics)
  { name: 'scenario', prefixes: ['scenario/'] },
  // studies: pure functions that combine the stages for one question: the
  // analytic limits, the parts of a sweep (grid, axes, one cell, calibration
  // set, result types), of a budget search and of vetting a claim
  { name: 'studies', prefixes: ['limits/', 'sweep/', 'budget/', 'vet/', 'rank/'] },
  // renderers: ECSV/JSON/HTML text from results; pure functions of results
  { name: 'renderers', prefixes: ['io/ecsv.ts', 'report/'] },
  // application: the orchestrations, the only place besides the CLI that touches files
  { name: 'application', prefixes: ['app/', 'io/', 'docs/'] },
  { name: 'cli', prefixes: ['cli/'] },
  // the public API: src/index.ts and the barrels that gather a study's API with its renderers and orchestration
  { name: 'public api', prefixes: ['index.ts', 'budget/index.ts', 'vet/index.ts'] },
];

export function layerOf(file: string): number {
  let rank = -1;
  let longest = -1;
  LAYERS.forEach((l, i) => {
    for (const p of l.prefixes) {
      if ((file === p || (p.endsWith('/') && file.startsWith(p))) && p.length > longest) {
        rank = i;
        longest = p.length;
      }
    }
  });
  if (rank < 0) throw new Error(`src/${file} belongs to no layer: add its folder to LAYERS in test/architecture/layers.test.ts`);
  return rank;
}

/**
 * Upward imports allowed for now, each with its reason (empty: none). An
 * entry that no longer occurs fails the test, so the list only shrinks.
 */
const ALLOWED_UPWARD: Record<string, string> = {
};

/** Import cycles allowed for now (files of each cycle; empty: none). Only shrinks. */
const ALLOWED_CYCLES: string[][] = [];

/** The layers that may read or write files (DESIGN.md: the application layer and the CLI). */
const FILE_LAYERS = new Set(['application', 'cli']);
/** Modules through which code touches files. */
const FILE_MODULES = new Set(['fs', 'node:fs', 'fs/promises', 'node:fs/promises', 'io/atomicWrite.ts']);

/**
 * Files outside those layers that touch files, each with its reason. Only shrinks.
 */
const ALLOWED_FILE_ACCESS: Record<string, string> = {
  'scenario/loadScenario.ts': 'loadScenario(path), the library entry point of DESIGN.md, reads the scenario file beside the parser',
  'vet/loadClaim.ts': 'loadClaim(path) reads the claim file (and its timing table) beside the claim parser',
  'report/plotlyPage.ts': "reads plotly's own script from node_modules to inline it (a library asset, not user data)",
};

const edgeKey = (e: ImportEdge): string => `${e.from} -> ${e.to}`;

describe('layers of src/', () => {
  const { files, edges, packages } = readImportGraph(SRC);

  it('reads the graph (sanity: the known files and imports are found)', () => {
    expect(files).toContain('index.ts');
    expect(edges.length).toBeGreaterThan(200);
  });

  it('every file belongs to a layer', () => {
    for (const f of files) expect(() => layerOf(f)).not.toThrow();
  });

  it('no import runs upward (beyond the listed ones)', () => {
    const upward = edges.filter((e) => layerOf(e.to) > layerOf(e.from));
    const found = [...new Set(upward.map(edgeKey))].sort();
    const unexpected = found.filter((k) => !(k in ALLOWED_UPWARD)).map((k) => {
      const [from, to] = k.split(' -> ');
      return `${k}   (${LAYERS[layerOf(from)].name} imports ${LAYERS[layerOf(to)].name})`;
    });
    const stale = Object.keys(ALLOWED_UPWARD).filter((k) => !found.includes(k));
    expect(unexpected, 'upward imports').toEqual([]);
    expect(stale, 'allowlist entries that no longer occur: remove them').toEqual([]);
  });

  it('there is no import cycle (beyond the listed ones)', () => {
    const cycles = importCycles(files, edges).map((c) => c.join(' + '));
    const allowed = ALLOWED_CYCLES.map((c) => [...c].sort().join(' + '));
    expect(cycles.filter((c) => !allowed.includes(c)), 'import cycles').toEqual([]);
    expect(allowed.filter((c) => !cycles.includes(c)), 'allowed cycles that no longer occur: remove them').toEqual([]);
  });

  it('only the application layer and the CLI touch files (beyond the listed ones)', () => {
    const touching = [...new Set([...packages, ...edges].filter((e) => FILE_MODULES.has(e.to)).map((e) => e.from))].sort();
    expect(touching.length, 'sanity: the file-touching code is found').toBeGreaterThan(5);
    const outside = touching.filter((f) => !FILE_LAYERS.has(LAYERS[layerOf(f)].name));
    expect(outside.filter((f) => !(f in ALLOWED_FILE_ACCESS)), 'files outside the application layer and the CLI that touch files').toEqual([]);
    expect(Object.keys(ALLOWED_FILE_ACCESS).filter((f) => !outside.includes(f)), 'allowlist entries that no longer occur: remove them').toEqual([]);
  });

  it('the cycle finder finds a planted cycle (so the check can fail)', () => {
    const planted = importCycles(['a.ts', 'b.ts', 'c.ts'], [
      { from: 'a.ts', to: 'b.ts' },
      { from: 'b.ts', to: 'a.ts' },
      { from: 'b.ts', to: 'c.ts' },
    ]);
    expect(planted).toEqual([['a.ts', 'b.ts']]);
  });
});

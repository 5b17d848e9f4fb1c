/**
 * The library's typed contracts, used as a caller would: everything imported
 * from the package root (src/index.ts). A parsed Scenario goes into the sweep
 * (in memory and to files) and into the budget; the cells a run returns are
 * the cells it writes. Expected values are the library's own contracts
 * (identical results whatever the entry point: "common practice, no source").
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import {
  applyAxes, loadScenario, loadSweep, parseScenario, planBudget, runSweep, runSweepInMemory, scenarioDocumentOf, withoutMoon, InputError,
  type BudgetResult, type CalendarResult, type CellResult, type InMemorySweep, type LimitsJson, type PlanBudgetOptions, type Scenario,
  type SweepMeta, type SweepSummary, type VetResult,
} from '../../src/index.js';
import { defaultOutDir } from '../../src/app/defaultOutDir.js';

/** An invented system, small enough for a sweep of 4 cells × 3 realizations. */
const DOC = {
  name: 'Api world (invented)',
  seed: 24680,
  star: { mass: '0.9 Msun', radius: '0.9 Rsun', teff: '5400 K', limb_darkening: { u1: 0.45, u2: 0.2 } },
  planet: { mass: '0.8 Mjup', radius: '1 Rjup', period: '45 d' },
  moon: { mass: '1 Mearth', density: '3 g/cm^3', separation: '0.1 hill' },
  instrument: { cadence: '10 min', noise: '400 ppm per 10 min' },
  observation: { transits: 4, baseline: '2 h' },
  detection: { false_alarm: 0.05 },
  sweep: {
    realizations: 3,
    no_moon_realizations: 20,
    axes: [
      { field: 'moon.mass', from: '0.5 Mearth', to: '2 Mearth', count: 2, spacing: 'log' },
      { field: 'moon.separation', from: '0.1 hill', to: '0.4 hill', count: 2 },
    ],
  },
};

let tmp: string;
beforeAll(() => {
  tmp = mkdtempSync(join(tmpdir(), 'moonsieve-api-'));
});
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe('a Scenario flows between stages', () => {
  it('is plain data: a structured clone holds every field (its document and cautions stay behind: non-enumerable)', () => {
    const s: Scenario = parseScenario(DOC);
    const copy = structuredClone(s);
    expect(copy).toEqual(s);
    expect(JSON.stringify(copy)).toBe(JSON.stringify(s));
    expect(copy.document).toBeUndefined();
    // The original keeps the document it was read from, a private copy of it.
    expect(scenarioDocumentOf(s)).toEqual(DOC);
    expect(scenarioDocumentOf(s)).not.toBe(DOC);
    // A copy gets a document written from its values (scenarioToDocument), which reads back to the same scenario.
    expect(parseScenario(scenarioDocumentOf(copy))).toEqual(s);
  });

  it('applyAxes: Scenario + axis values → a validated Scenario, the fixed fields kept as written', () => {
    const base = parseScenario(DOC);
    const mJup2 = 3e27; // kg: an invented heavier planet (the scenario's is 0.8 Mjup ≈ 1.5e27 kg)
    const heavier = applyAxes(base, [{ field: 'planet.mass', write: {} }], [mJup2]);
    expect(heavier.planet.massKg).toBe(mJup2);
    // "0.1 hill" follows the planet's mass, exactly as a scenario written with that mass reads it.
    const written = parseScenario({ ...DOC, planet: { ...DOC.planet, mass: `${mJup2} kg` } });
    expect(heavier.moon!.separationM).toBe(written.moon!.separationM);
    expect(heavier.moon!.separationM).toBeGreaterThan(base.moon!.separationM);
    // The base is not changed.
    expect(base.planet.massKg).not.toBe(mJup2);
  });

  it('applyAxes labels a moon that would touch its planet (as a grid cell), where parseScenario refuses one', () => {
    const base = parseScenario(DOC);
    const touching = applyAxes(base, [{ field: 'moon.separation', write: {} }], [1e7], 'cell 3'); // 10 000 km < 1 Rjup
    expect(touching.moon!.touchesPlanet).toBe(true);
    expect(() => parseScenario({ ...DOC, moon: { ...DOC.moon, separation: '1e7 m' } })).toThrow(/touch the planet/);
    // A value no scenario could have is the scenario's own error, under the cell's name.
    expect(() => applyAxes(base, [{ field: 'planet.eccentricity', write: {} }], [2], 'cell 3')).toThrow(InputError);
  });

  it('withoutMoon is the scenario validated without its moon (the no-moon calibration class)', () => {
    const s = parseScenario(DOC);
    const bare = withoutMoon(s);
    expect(bare.moon).toBeNull();
    const { moon: _m, ...rest } = DOC;
    void _m;
    expect(bare).toEqual(parseScenario(rest));
    // Kepler's third law without the moon's mass: a slightly smaller semi-major axis.
    expect(bare.planet.semiMajorAxisM).toBeLessThan(s.planet.semiMajorAxisM);
  });
});

describe('runSweepInMemory and runSweep take a Scenario', () => {
  it('the in-memory cells and summary are those the file run writes (same seed), on 1 worker and on 2', async () => {
    const scenario = parseScenario(DOC);
    const quiet = { env: {} };
    const mem: InMemorySweep = await runSweepInMemory(scenario, { ...quiet, workers: 1 });
    const out = join(tmp, 'files');
    const run = await runSweep(scenario, { ...quiet, out, quiet: true, workers: 2, shard: null });
    expect(run.complete).toBe(true);
    const written = JSON.parse(readFileSync(join(out, 'cells.json'), 'utf8')) as { meta: SweepMeta; cells: CellResult[] };
    expect(mem.cells).toEqual(written.cells);
    expect(JSON.stringify(mem.cells)).toBe(JSON.stringify(written.cells));
    expect(mem.meta).toEqual(written.meta);
    const summary = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8')) as SweepSummary;
    expect(mem.summary).toEqual(summary);
    expect(mem.cells.map((c) => c.index)).toEqual([0, 1, 2, 3]);
    expect(mem.cells.some((c) => c.simulated)).toBe(true);
    // The in-memory runs write nothing: no default output folder appears (the file run wrote to `out`).
    const mem2 = await runSweepInMemory(scenario, { ...quiet, workers: 2 });
    expect(JSON.stringify(mem2.cells)).toBe(JSON.stringify(mem.cells));
    expect(existsSync(defaultOutDir(scenario.name))).toBe(false);
  });

  it('a file path and its parsed Scenario give the same sweep', () => {
    const path = 'scenarios/demo-observer.yaml';
    const a = loadSweep(path);
    const b = loadSweep(loadScenario(path));
    expect(b.hash).toBe(a.hash);
    expect(b.spec.axes.map((x) => x.values)).toEqual(a.spec.axes.map((x) => x.values));
  });
});

describe('planBudget takes a Scenario', () => {
  it('a parsed Scenario gives the answer its file gives (forecast only)', () => {
    const path = 'scenarios/demo-observer.yaml';
    const options: PlanBudgetOptions = {};
    const fromPath: BudgetResult = planBudget(path, { forecastOnly: true }, options);
    const fromScenario: BudgetResult = planBudget(loadScenario(path), { forecastOnly: true }, options);
    const { wall_time_s: _a, ...p } = fromPath;
    const { wall_time_s: _b, ...q } = fromScenario;
    void _a;
    void _b;
    const noTimes = (x: unknown): string => JSON.stringify(x, (k, v: unknown) => (k === 'seconds' ? undefined : v));
    expect(noTimes(q)).toBe(noTimes(p));
    expect(fromScenario.answer).toBeTruthy();
  });
});

describe('the public types are exported from the root', () => {
  it('type-checks uses of each (tsc over test/ is the check; these lines also run)', () => {
    const limits: Pick<LimitsJson, 'hill_radius_m'> = { hill_radius_m: 1 };
    const cal: Pick<CalendarResult, 'transits'> | null = null;
    const vet: Pick<VetResult, 'verdict'> | null = null;
    expect(limits.hill_radius_m).toBe(1);
    expect(cal).toBeNull();
    expect(vet).toBeNull();
  });
});

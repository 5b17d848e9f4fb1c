/**
 * Every JSON output validated against its shipped schema (schemas/*.schema.json),
 * and every key it uses listed in the table of names (docs/vocabulary.md), so
 * the code speaks no other names: limits, vet and budget --json (forecast-only
 * and a small Monte Carlo), and a sweep's cells.json, summary.json and run.json
 * (Monte Carlo and forecast-only, a shard and the merge of the shards), calendar --json, and rank's rank.json.
 */
import { describe, it, expect, beforeAll } from 'vitest';
import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli as run } from '../helpers/runCli.js';
import { keysOf, loadSchema, schemaProblems, schemaPropertyNames } from '../helpers/jsonSchema.js';

const demo = new URL('../../scenarios/demo-observer.yaml', import.meta.url).pathname;
const claim = new URL('../../scenarios/demo-claim.yaml', import.meta.url).pathname;
const tiny = new URL('../cluster/tiny-array.yaml', import.meta.url).pathname;
const calendarDemo = new URL('../../scenarios/demo-calendar.yaml', import.meta.url).pathname;
const spaceDemo = new URL('../../scenarios/demo-space.yaml', import.meta.url).pathname;
const rankDemo = new URL('../../scenarios/demo-rank.yaml', import.meta.url).pathname;
const rankList = new URL('../../scenarios/demo-planets.csv', import.meta.url).pathname;
const vocabulary = readFileSync(new URL('../../docs/vocabulary.md', import.meta.url), 'utf8');
/** Names in the first column of the table under "## Names" in docs/vocabulary.md: | `name` | … */
const NAMES = new Set([...vocabulary.slice(vocabulary.indexOf('\n## Names\n')).matchAll(/^\| `([a-z0-9_]+)` \|/gm)].map((m) => m[1]));

const SCHEMAS = ['limits', 'vet', 'budget', 'cells', 'summary', 'run', 'calendar', 'rank'] as const;
type Name = (typeof SCHEMAS)[number];
/** Outputs produced once for all tests: schema name → the parsed documents. */
const outputs = new Map<Name, Array<{ what: string; doc: unknown }>>();
/** cells.ecsv texts of the sweeps above. */
const ecsvs: string[] = [];
const add = (name: Name, what: string, text: string) => {
  const list = outputs.get(name) ?? [];
  list.push({ what, doc: JSON.parse(text) });
  outputs.set(name, list);
};

async function json(args: string[]): Promise<string> {
  const r = await run(args);
  if (r.code !== 0) throw new Error(`${args.join(' ')} exited ${r.code}: ${r.err}`);
  return r.out;
}

beforeAll(async () => {
  const dir = mkdtempSync(join(tmpdir(), 'ms-schemas-'));
  add('limits', 'limits demo', await json(['limits', demo, '--json']));
  add('limits', 'limits tiny', await json(['limits', tiny, '--json']));
  add('vet', 'vet demo claim', await json(['vet', claim, '--json']));
  // The calendar: a two-site network (demo), and one site whose target never rises (every transit 'none').
  add('calendar', 'calendar demo network', await json(['calendar', calendarDemo, '--json']));
  const oneSite = readFileSync(calendarDemo, 'utf8')
    .replace(/^site:\n(?:  - .*\n)+/m, 'site: {latitude: -30.17 deg, longitude: -70.80 deg, altitude: 2400 m}\n')
    .replace(/^target: .*$/m, 'target: {ra: "08:41:12.5", dec: "+75:00:00"}');
  writeFileSync(join(dir, 'never.yaml'), oneSite);
  add('calendar', 'calendar never rises', await json(['calendar', join(dir, 'never.yaml'), '--json']));
  // A space instrument's visibility pattern (no site, constraints null, no air mass).
  add('calendar', 'calendar space visibility', await json(['calendar', spaceDemo, '--json']));
  // Claimed amplitudes (an invented system), both and TTV alone: the other branches of the vet document.
  const amplitudes = (block: string) => `name: invented amplitudes
seed: 11
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5800 K, limb_darkening: {u1: 0.4, u2: 0.25}}
planet: {mass: 2 Mjup, radius: 1.1 Rjup, period: 300 d, impact_parameter: 0.1}
claim:
${block}
  transits: 36
  noise: 100 ppm per 2 min
  moon_dip: none
`;
  writeFileSync(join(dir, 'both.yaml'), amplitudes('  ttv: {amplitude: 90 s, uncertainty: 10 s, kind: rms}\n  tdv: {amplitude: 20 s, uncertainty: 4 s, kind: rms}'));
  writeFileSync(join(dir, 'ttv.yaml'), amplitudes('  ttv: {amplitude: 90 s, uncertainty: 10 s, kind: rms}'));
  add('vet', 'vet amplitudes', await json(['vet', join(dir, 'both.yaml'), '--json']));
  add('vet', 'vet TTV amplitude', await json(['vet', join(dir, 'ttv.yaml'), '--json']));
  add('budget', 'budget habitable forecast-only', await json(['budget', demo, '--habitable', '--forecast-only', '--json', '--quiet']));
  add('budget', 'budget forecast-only', await json(['budget', demo, '--forecast-only', '--json', '--quiet']));
  add('budget', 'budget Monte Carlo', await json(['budget', tiny, '--json', '--quiet', '--realizations', '4', '--no-moon-realizations', '40', '--max-transits', '6']));
  // A ranked planet list (the invented demo list's first rows and a bad row), whole with a small Monte Carlo confirmation, and one shard.
  const list = readFileSync(rankList, 'utf8').split('\n').slice(0, 8).join('\n') + '\nBad-1 b,1,1,5800,10,V,0.5,0.9,-3,0.2,,,,10,10\n';
  writeFileSync(join(dir, 'list.csv'), list);
  for (const [name, extra] of [['rank', ['--bound', '2', '--confirm', '1', '--confirm-realizations', '4', '--confirm-no-moon-realizations', '100']], ['rank-shard', ['--shard', '2/2']]] as Array<[string, string[]]>) {
    const r = await run(['rank', rankDemo, join(dir, 'list.csv'), '--out', join(dir, name), ...extra]);
    if (r.code !== 0) throw new Error(`rank ${name}: ${r.err}`);
    add('rank', `${name}/rank.json`, readFileSync(join(dir, name, 'rank.json'), 'utf8'));
  }
  const sweeps: Array<[string, string[]]> = [
    ['mc', []], ['forecast', ['--forecast-only']], ['shard1', ['--shard', '1/2']], ['shard2', ['--shard', '2/2']],
  ];
  for (const [name, extra] of sweeps) {
    const r = await run(['sweep', tiny, '--out', join(dir, name), '--workers', '1', '--quiet', ...extra]);
    if (r.code !== 0) throw new Error(`sweep ${name}: ${r.err}`);
  }
  const m = await run(['merge', join(dir, 'shard1'), join(dir, 'shard2'), '--out', join(dir, 'merged')]);
  if (m.code !== 0) throw new Error(`merge: ${m.err}`);
  for (const name of ['mc', 'forecast', 'shard1', 'merged']) {
    const folder = join(dir, name);
    expect(readdirSync(folder)).toContain('run.json');
    add('cells', `${name}/cells.json`, readFileSync(join(folder, 'cells.json'), 'utf8'));
    add('summary', `${name}/summary.json`, readFileSync(join(folder, 'summary.json'), 'utf8'));
    add('run', `${name}/run.json`, readFileSync(join(folder, 'run.json'), 'utf8'));
    ecsvs.push(readFileSync(join(folder, 'cells.ecsv'), 'utf8'));
  }
}, 240_000);

describe('JSON outputs and their schemas', () => {
  it.each(SCHEMAS)('%s: every output validates against its schema (schemas/<name>.schema.json) and names its schema id', (name) => {
    const schema = loadSchema(name);
    const docs = outputs.get(name) ?? [];
    expect(docs.length).toBeGreaterThan(0);
    for (const { what, doc } of docs) {
      expect(schemaProblems(schema, doc), what).toEqual([]);
      expect((doc as { schema?: string }).schema, what).toMatch(new RegExp(`^moonsieve/${name}/\\d+$`));
    }
  });

  it('the outputs exercise both kinds of cell (simulated and not) and a merge', () => {
    const cells = (outputs.get('cells') ?? []).flatMap(({ doc }) => (doc as { cells: Array<{ simulated: boolean }> }).cells);
    expect(cells.some((c) => c.simulated)).toBe(true);
    expect(cells.some((c) => !c.simulated)).toBe(true);
    expect((outputs.get('run') ?? []).some(({ doc }) => Array.isArray((doc as { merged_from?: unknown[] }).merged_from))).toBe(true);
    const vets = (outputs.get('vet') ?? []).map(({ doc }) => doc as { input: string; implied: { mode: string } | null });
    expect(vets.map((v) => v.input).sort()).toEqual(['amplitudes', 'amplitudes', 'table']);
    expect(vets.filter((v) => v.implied).map((v) => v.implied!.mode).sort()).toEqual(expect.arrayContaining(['ttv only', 'ttv+tdv']));
    expect((outputs.get('budget') ?? []).some(({ doc }) => (doc as { habitable: unknown }).habitable !== null)).toBe(true);
    const mc = (outputs.get('budget') ?? []).find(({ what }) => what === 'budget Monte Carlo')?.doc as { evaluations: unknown[] };
    expect(mc.evaluations.length).toBeGreaterThan(0);
    expect(NAMES.size).toBeGreaterThan(200);
  });

  it('the checker catches what the schemas forbid (an unknown key, a wrong type, a missing key)', () => {
    const schema = loadSchema('limits');
    const doc = (outputs.get('limits') ?? [])[0].doc as Record<string, unknown>;
    expect(schemaProblems(schema, { ...doc, moon_depth_ppm: 5 })).toEqual(['$: unexpected key moon_depth_ppm']);
    expect(schemaProblems(schema, { ...doc, transits: 'four' })).toEqual(['$.transits: expected integer, got string']);
    const { hill_radius_m: _h, ...rest } = doc;
    void _h;
    expect(schemaProblems(schema, rest)).toEqual(['$: missing hill_radius_m']);
  });
});

describe('docs/vocabulary.md: one table of names', () => {
  it('names each key once (one meaning per name; merged edits must not leave two rows for a key)', () => {
    const keys = [...vocabulary.slice(vocabulary.indexOf('\n## Names\n')).matchAll(/^\| `([a-z0-9_]+)` \|/gm)].map((m) => m[1]);
    expect(keys.filter((k, i) => keys.indexOf(k) !== i)).toEqual([]);
  });
  it('lists every property name of every shipped schema', () => {
    const files = readdirSync(new URL('../../schemas/', import.meta.url)).filter((f) => f.endsWith('.schema.json'));
    expect(files.map((f) => f.replace('.schema.json', '')).sort()).toEqual([...SCHEMAS].sort());
    const missing = SCHEMAS.flatMap((s) => [...schemaPropertyNames(loadSchema(s))].filter((k) => !NAMES.has(k)).map((k) => `${s}: ${k}`));
    expect(missing).toEqual([]);
  });

  it('lists every key of every output (the code uses no other names)', () => {
    const missing = new Set<string>();
    for (const [name, docs] of outputs) for (const { doc } of docs) for (const k of keysOf(doc)) if (!NAMES.has(k)) missing.add(`${name}: ${k}`);
    expect([...missing]).toEqual([]);
  });

  it('lists every column of cells.ecsv (the cell fields flattened, and the axis columns with their unit suffix)', () => {
    expect(ecsvs.length).toBeGreaterThan(0);
    for (const text of ecsvs) {
      const columns = [...text.matchAll(/^# - \{name: "?([A-Za-z0-9_]+)"?,/gm)].map((m) => m[1]);
      expect(columns).toContain('moon_mass_kg'); // the moon.mass axis, once
      expect(columns.filter((c) => c === 'moon_mass_kg')).toHaveLength(1);
      expect(columns.filter((c) => !NAMES.has(c))).toEqual([]);
    }
  });

  it('holds no name the outputs and schemas have given up (old spellings)', () => {
    for (const old of ['null_realizations', 'moon_depth_ppm', 'forecast_joint', 'p_ttv', 'p_combined', 'stable', 'atGridEdge', 'hillRadiusM', 'periastron', 'false_alarm_probability', 'false_alarm_requested']) {
      expect(NAMES.has(old), old).toBe(false);
    }
  });
});

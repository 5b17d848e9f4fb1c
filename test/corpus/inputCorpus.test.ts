/**
 * The input corpus of issue 15: every input that once crashed, ran away or lost a result, run through
 * the compiled CLI as a user would (a child process, its own working folder). Each case states the
 * answer it must get: exit 2 with one clear message (field or option named, no stack trace, nothing
 * written), or exit 0 with the stated answer. Expectations are common practice, no source: they are
 * the README's promise for bad input.
 */
import { describe, it, expect } from 'vitest';
import { execFile } from 'node:child_process';
import { mkdtempSync, writeFileSync, readdirSync, statSync, mkdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('../..', import.meta.url));
const bin = join(root, 'bin', 'moonsieve.js');

/** A small, fast invented system: a warm Saturn around a K dwarf (demo values, invented). */
const BASE = {
  name: 'Tessaly b corpus',
  seed: 7,
  star: 'star:\n  mass: 0.78 Msun\n  radius: 0.75 Rsun\n  teff: 4900 K\n  limb_darkening: {u1: 0.5, u2: 0.2}\n',
  planet: 'planet:\n  mass: 0.3 Mjup\n  radius: 0.8 Rjup\n  period: 13.8 d\n  impact_parameter: 0.3\n',
  moon: 'moon:\n  mass: 1 Mearth\n  density: 4 g/cm^3\n  separation: 0.3 hill\n',
  instrument: 'instrument:\n  cadence: 2 min\n  noise: 300 ppm per 1 h\n',
  observation: 'observation:\n  transits: 6\n  baseline: 3 h\n',
  detection: 'detection:\n  false_alarm: 5 %\n',
  sweep:
    'sweep:\n  realizations: 4\n  axes:\n    - {field: moon.mass, from: 0.5 Mearth, to: 5 Mearth, count: 2, spacing: log}\n' +
    '    - {field: moon.separation, from: 0.2 hill, to: 0.4 hill, count: 2, spacing: linear}\n',
};
type Block = keyof typeof BASE;

function scenario(over: Partial<Record<Block, string>> = {}): string {
  const b = { ...BASE, ...over };
  return `name: ${b.name}\nseed: ${b.seed}\n${b.star}${b.planet}${b.moon}${b.instrument}${b.observation}${b.detection}${b.sweep}`;
}

interface Case {
  name: string;
  files: Record<string, string>;
  args: string[];
  env?: Record<string, string>;
  /** 2: a clear refusal; 0: an answer. */
  exit: 0 | 2;
  /** What stderr (for exit 2) or stdout+stderr (for exit 0) must mention. */
  says?: RegExp;
  /** What the output must not contain. */
  never?: RegExp;
  timeoutMs?: number;
}

interface Ran { code: number | null; out: string; err: string; ms: number }

function runCli(cwd: string, args: string[], env: Record<string, string> = {}, timeoutMs = 60_000): Promise<Ran> {
  const t0 = Date.now();
  const baseEnv: Record<string, string> = {};
  for (const [k, v] of Object.entries(process.env)) if (v !== undefined && !k.startsWith('SLURM_')) baseEnv[k] = v;
  return new Promise((resolve) => {
    execFile(process.execPath, [bin, ...args], { cwd, env: { ...baseEnv, ...env }, timeout: timeoutMs, maxBuffer: 64 << 20 }, (error, out, err) => {
      const code = error ? ((error as { code?: unknown }).code as number | null) ?? null : 0;
      resolve({ code: typeof code === 'number' ? code : null, out: String(out), err: String(err), ms: Date.now() - t0 });
    });
  });
}

function listFiles(dir: string): string[] {
  const out: string[] = [];
  for (const e of readdirSync(dir)) {
    const p = join(dir, e);
    if (statSync(p).isDirectory()) out.push(...listFiles(p).map((f) => join(e, f)), e + '/');
    else out.push(e);
  }
  return out.sort();
}

const aliasBomb =
  'a: &a ["x","x","x","x","x","x","x","x","x"]\nb: &b [*a,*a,*a,*a,*a,*a,*a,*a,*a]\nc: &c [*b,*b,*b,*b,*b,*b,*b,*b,*b]\n' +
  'd: &d [*c,*c,*c,*c,*c,*c,*c,*c,*c]\ne: &e [*d,*d,*d,*d,*d,*d,*d,*d,*d]\nf: &f [*e,*e,*e,*e,*e,*e,*e,*e,*e]\n' +
  'g: &g [*f,*f,*f,*f,*f,*f,*f,*f,*f]\nh: &h [*g,*g,*g,*g,*g,*g,*g,*g,*g]\ni: &i [*h,*h,*h,*h,*h,*h,*h,*h,*h]\n' + scenario();

const claimHeader =
  'name: Orlen c claim\nstar:\n  mass: 0.85 Msun\n  radius: 0.8 Rsun\n  teff: 5200 K\n  limb_darkening: {u1: 0.48, u2: 0.21}\n' +
  'planet:\n  mass: 0.12 Mjup\n  radius: 0.95 Rjup\n  period: 96.4 d\n  impact_parameter: 0.3\n';
function claimTable(rows: number, f: (i: number) => [number, number]): string {
  let s = 'time,time_err [d]\n';
  for (let i = 0; i < rows; i++) {
    const [t, e] = f(i);
    s += `${t.toFixed(6)},${e}\n`;
  }
  return s;
}
const exactLinear = claimTable(12, (i) => [2460000.5 + 96.4 * i, 0.0015]);

const CASES: Case[] = [
  // Fewer than three transits: an answer, not a crash.
  { name: 'limits with 2 transits', files: { 's.yaml': scenario({ observation: 'observation:\n  transits: 2\n' }) }, args: ['limits', 's.yaml'], exit: 0, says: /2 transits|two transits/i },
  { name: 'limits --json with 2 transits', files: { 's.yaml': scenario({ observation: 'observation:\n  transits: 2\n' }) }, args: ['limits', 's.yaml', '--json'], exit: 0, never: /NaN/ },
  { name: 'sweep --forecast-only with 2 transits', files: { 's.yaml': scenario({ observation: 'observation:\n  transits: 2\n' }) }, args: ['sweep', 's.yaml', '--forecast-only', '--quiet', '--out', 'o'], exit: 0 },
  { name: 'budget --forecast-only with 2 transits', files: { 's.yaml': scenario({ observation: 'observation:\n  transits: 2\n' }) }, args: ['budget', 's.yaml', '--forecast-only', '--solve', 'precision'], exit: 0 },
  { name: 'sweep with 2 transits', files: { 's.yaml': scenario({ observation: 'observation:\n  transits: 2\n' }) }, args: ['sweep', 's.yaml', '--quiet', '--workers', '1', '--out', 'o'], exit: 0, timeoutMs: 120_000 },
  // Every transit lost: an answer counted as a non-detection.
  { name: 'sweep with nearly every transit missed', files: { 's.yaml': scenario({ observation: 'observation:\n  transits: 3\n  missed_fraction: 0.95\n' }) }, args: ['sweep', 's.yaml', '--quiet', '--workers', '1', '--out', 'o'], exit: 0, timeoutMs: 120_000 },
  // Impossible or degenerate geometry and instruments: one clear line, or an honest answer.
  { name: 'planet larger than the star', files: { 's.yaml': scenario({ planet: 'planet:\n  mass: 0.3 Mjup\n  radius: 9 Rjup\n  period: 13.8 d\n', moon: '' }) }, args: ['limits', 's.yaml'], exit: 2, says: /planet\.radius/ },
  { name: 'planet orbit inside the star', files: { 's.yaml': scenario({ star: 'star:\n  mass: 0.78 Msun\n  radius: 30 Rsun\n  teff: 4900 K\n  limb_darkening: {u1: 0.5, u2: 0.2}\n', planet: 'planet:\n  mass: 0.3 Mjup\n  radius: 0.8 Rjup\n  period: 1 d\n', moon: '' }) }, args: ['limits', 's.yaml'], exit: 2 },
  { name: 'zero noise', files: { 's.yaml': scenario({ instrument: 'instrument:\n  cadence: 2 min\n  noise: 0 ppm per 1 h\n' }) }, args: ['limits', 's.yaml'], exit: 2, says: /instrument\.noise/ },
  { name: 'a 1e-30 s cadence', files: { 's.yaml': scenario({ instrument: 'instrument:\n  cadence: 1e-30 s\n  noise: 300 ppm per 1 h\n' }) }, args: ['simulate', 's.yaml', '--out', 'o'], exit: 2, says: /cadence/ },
  { name: 'a 1e-10 Msun star', files: { 's.yaml': scenario({ star: 'star:\n  mass: 1e-10 Msun\n  radius: 0.75 Rsun\n  teff: 4900 K\n  limb_darkening: {u1: 0.5, u2: 0.2}\n' }) }, args: ['limits', 's.yaml'], exit: 2, says: /star\.mass/ },
  { name: 'simulate --realization 1e20', files: { 's.yaml': scenario() }, args: ['simulate', 's.yaml', '--realization', '1e20', '--out', 'o'], exit: 2, says: /--realization/ },
  // Runaways: refused up front, with the number needed.
  { name: 'false_alarm 1e-9', files: { 's.yaml': scenario({ detection: 'detection:\n  false_alarm: 1e-9\n' }) }, args: ['sweep', 's.yaml', '--quiet', '--out', 'o'], exit: 2, says: /false_alarm|no-moon/, timeoutMs: 30_000 },
  { name: 'a 400 x 400 grid', files: { 's.yaml': scenario({ sweep: 'sweep:\n  realizations: 4\n  axes:\n    - {field: moon.mass, from: 0.5 Mearth, to: 5 Mearth, count: 400, spacing: log}\n    - {field: moon.separation, from: 0.2 hill, to: 0.4 hill, count: 400, spacing: linear}\n' }) }, args: ['sweep', 's.yaml', '--quiet', '--out', 'o'], exit: 2, says: /cells|count/, timeoutMs: 30_000 },
  { name: 'simulate at a 1 ms cadence', files: { 's.yaml': scenario({ instrument: 'instrument:\n  cadence: 1 ms\n  noise: 300 ppm per 1 h\n', observation: 'observation:\n  transits: 200\n  baseline: 3 h\n' }) }, args: ['simulate', 's.yaml', '--out', 'o'], exit: 2, says: /points|cadence/, timeoutMs: 30_000 },
  // YAML trouble.
  { name: 'a YAML alias bomb', files: { 's.yaml': aliasBomb }, args: ['limits', 's.yaml'], exit: 2, never: /internal error/ },
  { name: 'one bad bracket', files: { 's.yaml': scenario({ star: 'star:\n  mass: 0.78 Msun\n  radius: 0.75 Rsun\n  teff: 4900 K\n  limb_darkening: {u1: 0.5, u2: 0.2\n' }) }, args: ['limits', 's.yaml'], exit: 2, says: /line \d+/ },
  { name: 'control characters in the name', files: { 's.yaml': scenario({ name: '"Bad\\u001b[31m name"', star: 'star:\n  mass: 0.78 furlong\n  radius: 0.75 Rsun\n  teff: 4900 K\n  limb_darkening: {u1: 0.5, u2: 0.2}\n' }) }, args: ['limits', 's.yaml'], exit: 2, never: /\u001b/ },
  { name: 'a 100 kB value', files: { 's.yaml': scenario({ planet: `planet:\n  mass: "${'9'.repeat(100_000)} furlong"\n  radius: 0.8 Rjup\n  period: 13.8 d\n` }) }, args: ['limits', 's.yaml'], exit: 2, says: /planet\.mass/ },
  // Options that blamed the wrong field.
  { name: 'budget --moon-mass "10 Msun"', files: { 's.yaml': scenario() }, args: ['budget', 's.yaml', '--moon-mass', '10 Msun', '--forecast-only'], exit: 2, says: /--moon-mass|moon mass/i },
  { name: 'budget --probability abc', files: { 's.yaml': scenario() }, args: ['budget', 's.yaml', '--probability', 'abc', '--forecast-only'], exit: 2, says: /--probability/, never: /ppm/ },
  // Output places.
  { name: '--out naming a file', files: { 's.yaml': scenario(), 'afile': 'x' }, args: ['sweep', 's.yaml', '--forecast-only', '--quiet', '--out', 'afile'], exit: 2, says: /--out/ },
  { name: '--out under a file', files: { 's.yaml': scenario(), 'afile': 'x' }, args: ['sweep', 's.yaml', '--forecast-only', '--quiet', '--out', 'afile/sub'], exit: 2, says: /--out/ },
  { name: "--out ''", files: { 's.yaml': scenario() }, args: ['sweep', 's.yaml', '--forecast-only', '--quiet', '--out', ''], exit: 2, says: /--out/ },
  { name: 'budget --html naming a folder', files: { 's.yaml': scenario(), 'adir/keep': 'x' }, args: ['budget', 's.yaml', '--forecast-only', '--html', 'adir'], exit: 2, says: /--html/ },
  // Cluster hygiene.
  { name: 'a lone SLURM_ARRAY_TASK_ID', files: { 's.yaml': scenario() }, args: ['sweep', 's.yaml', '--forecast-only', '--quiet', '--out', 'o'], env: { SLURM_ARRAY_TASK_ID: '3' }, exit: 2, says: /SLURM_ARRAY_TASK_COUNT|--shard/ },
  { name: 'a bad SLURM_CPUS_PER_TASK', files: { 's.yaml': scenario() }, args: ['sweep', 's.yaml', '--quiet', '--out', 'o'], env: { SLURM_CPUS_PER_TASK: 'lots' }, exit: 2, says: /SLURM_CPUS_PER_TASK/ },
  // Vet.
  { name: 'a claim time_err of 1e308', files: { 'c.yaml': claimHeader + 'claim:\n  table: t.csv\n  time_standard: BJD_TDB\n', 't.csv': claimTable(10, (i) => [2460000.5 + 96.4 * i + 0.002 * Math.sin(i), i === 4 ? 1e308 : 0.0015]) }, args: ['vet', 'c.yaml', '--json'], exit: 2, says: /time_err/ },
  { name: 'times exactly on a linear ephemeris', files: { 'c.yaml': claimHeader + 'claim:\n  table: t.csv\n  time_standard: BJD_TDB\n', 't.csv': exactLinear }, args: ['vet', 'c.yaml', '--json'], exit: 0, never: /\bNaN\b|"verdict": "implausible"/i },
];

describe('input corpus (issue 15): every input gets an answer or one clear refusal', () => {
  for (const c of CASES) {
    it(c.name, async () => {
      const dir = mkdtempSync(join(tmpdir(), 'ms-corpus-'));
      for (const [f, text] of Object.entries(c.files)) {
        const p = join(dir, f);
        mkdirSync(join(p, '..'), { recursive: true });
        writeFileSync(p, text);
      }
      const before = listFiles(dir);
      const r = await runCli(dir, c.args, c.env, c.timeoutMs);
      const all = r.out + r.err;
      const ctx = `${c.args.join(' ')} → exit ${r.code} after ${r.ms} ms\nstderr: ${r.err.slice(0, 2000)}`;
      expect(all, ctx).not.toMatch(/internal error/);
      expect(all, ctx).not.toMatch(/\n\s+at [^\n]*\(?[^\n]*:\d+:\d+\)?/); // no stack trace
      expect(r.code, ctx).toBe(c.exit);
      if (c.exit === 2) {
        expect(listFiles(dir), 'nothing written on refusal').toEqual(before);
        expect(r.err.length, 'a message, not a dump').toBeLessThan(4000);
        if (c.says) expect(r.err, ctx).toMatch(c.says);
      } else if (c.says) {
        expect(all, ctx).toMatch(c.says);
      }
      if (c.never) expect(all, ctx).not.toMatch(c.never);
    });
  }

  it('simulate with baselines longer than half the period writes each time stamp once', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-corpus-'));
    writeFileSync(join(dir, 's.yaml'), scenario({
      instrument: 'instrument:\n  cadence: 30 min\n  noise: 300 ppm per 1 h\n',
      observation: 'observation:\n  transits: 3\n  baseline: 10 d\n',
    }));
    const r = await runCli(dir, ['simulate', 's.yaml', '--out', 'o', '--format', 'csv']);
    expect(r.code, r.err).toBe(0);
    const csv = readFileSync(join(dir, 'o', listFiles(join(dir, 'o')).find((f) => f.startsWith('lightcurve'))!), 'utf8');
    const times = csv.split('\n').slice(1).filter((l) => l && !l.startsWith('#')).map((l) => l.split(',')[0]);
    expect(new Set(times).size, 'each time stamp once').toBe(times.length);
  });
});

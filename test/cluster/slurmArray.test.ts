/**
 * The README's Slurm recipe, run as written on a real Slurm cluster: the
 * job-array script and the merge command are read out of README.md (section
 * "Beyond one machine (Slurm)"), so the documentation and this test cannot
 * drift apart. Only these are substituted, each on exactly one line of the
 * script, and the test fails if that line is no longer there:
 *
 *   #SBATCH --array=…          → 0-3 (four tasks)
 *   #SBATCH --cpus-per-task=…  → 1 (two tasks at a time on a 2-core node)
 *   N=…                        → 4
 *   scenarios/demo-observer.yaml → test/cluster/tiny-array.yaml (6 cells, 4 realizations)
 *
 * The script is submitted from a scratch folder laid out like a checkout
 * (`bin` links to the repository's, `logs/` exists) with `sbatch --wait`;
 * then the README's merge command runs there through bash (its glob
 * included), and the merged cells.json, cells.ecsv and summary.json must
 * equal, byte for byte, those of an unsharded `moonsieve sweep` of the same
 * scenario (the shard contract: cells assigned by index, each realization
 * seeded by (seed, cell, realization); common practice, no source).
 *
 * Needs a Slurm cluster whose node is this host (`.ci/run` installs Debian's
 * slurm-wlm and munge and starts one with scripts/slurm/one-node-cluster.sh).
 * Without it the test is skipped with the reason, unless
 * MOONSIEVE_REQUIRE_SLURM=1 (set by .ci/run), where it fails instead.
 */
import { describe, it, expect, afterAll } from 'vitest';
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const SCENARIO = join(ROOT, 'test', 'cluster', 'tiny-array.yaml');
const TASKS = 4;
const SECTION = '### Beyond one machine (Slurm)';
const COMPARED = ['cells.json', 'cells.ecsv', 'summary.json'];

/** The environment without Slurm's job variables (this test may itself run inside a job). */
function envWithoutSlurm(): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = {};
  for (const [k, v] of Object.entries(process.env)) if (!k.startsWith('SLURM_')) env[k] = v;
  return env;
}

/** Null when a Slurm node on this host takes jobs; otherwise why the test cannot run. */
function slurmUnavailable(): string | null {
  const howTo = "install Debian's slurm-wlm and munge, then run `scripts/slurm/one-node-cluster.sh start` as root (.ci/run does both)";
  const r = spawnSync('sinfo', ['-h', '-N', '-o', '%N %t'], { encoding: 'utf8', timeout: 15_000, env: envWithoutSlurm() });
  if (r.error) {
    const code = (r.error as NodeJS.ErrnoException).code;
    return code === 'ENOENT' ? `sinfo not found: Slurm is not installed; ${howTo}` : `sinfo did not answer (${code ?? r.error.message}); ${howTo}`;
  }
  if (r.status !== 0) return `sinfo failed: ${(r.stderr || r.stdout).trim().split('\n')[0] ?? ''}; ${howTo}`;
  const host = hostname().split('.')[0];
  const nodes = r.stdout.trim().split('\n').filter((l) => l !== '').map((l) => l.split(/\s+/));
  const mine = nodes.filter(([name]) => name === host);
  if (mine.length === 0) {
    return `Slurm answers but this host (${host}) is not one of its nodes (${nodes.map((n) => n[0]).join(', ') || 'none'}); the test's files live in a local temporary folder, so it needs a one-node cluster on this host; ${howTo}`;
  }
  if (!mine.some(([, state]) => state === 'idle' || state === 'mix')) {
    return `the Slurm node ${host} does not take jobs (state ${mine.map((n) => n[1]).join(', ')}); ${howTo}`;
  }
  return null;
}

/** The README's Slurm section: its job-array script (the sh block starting with #!/bin/bash) and its merge command. */
export function readmeRecipe(readme: string): { jobScript: string; mergeCommand: string } {
  const start = readme.indexOf(`\n${SECTION}\n`);
  if (start < 0) throw new Error(`README.md has no "${SECTION}" section`);
  const rest = readme.slice(start + SECTION.length + 2);
  const next = rest.search(/^#{2,3} /m); // the next heading (a "# " line is a comment in the script)
  const section = next < 0 ? rest : rest.slice(0, next);
  const blocks = [...section.matchAll(/^```sh\n([\s\S]*?)^```$/gm)].map((m) => m[1]);
  const jobs = blocks.filter((b) => b.startsWith('#!/bin/bash\n'));
  const merges = blocks.filter((b) => /^node bin\/moonsieve\.js merge /m.test(b));
  if (jobs.length !== 1) throw new Error(`expected one job script (a sh block starting with #!/bin/bash) in "${SECTION}", found ${jobs.length}`);
  if (merges.length !== 1) throw new Error(`expected one sh block with the merge command in "${SECTION}", found ${merges.length}`);
  const mergeLines = merges[0].split('\n').filter((l) => l.trim() !== '' && !l.startsWith('#'));
  if (mergeLines.length !== 1) throw new Error(`expected the merge block to hold one command, found ${mergeLines.length} lines`);
  return { jobScript: jobs[0], mergeCommand: mergeLines[0] };
}

/** Replace the one line (or text) matching `pattern`; fail if it is absent or repeated. */
function substituteOnce(text: string, pattern: RegExp, replacement: string, what: string): string {
  const global = new RegExp(pattern.source, pattern.flags.includes('g') ? pattern.flags : `${pattern.flags}g`);
  const n = [...text.matchAll(global)].length;
  if (n !== 1) throw new Error(`the README's job script should contain ${what} exactly once (pattern ${pattern}), found ${n}`);
  return text.replace(pattern, replacement);
}

/** The README script with only the array size, CPUs per task, N and the scenario path changed. */
export function adaptJobScript(script: string, scenarioPath: string): string {
  let s = script;
  s = substituteOnce(s, /^#SBATCH --array=\S+$/m, `#SBATCH --array=0-${TASKS - 1}`, 'an "#SBATCH --array=" line');
  s = substituteOnce(s, /^#SBATCH --cpus-per-task=\d+$/m, '#SBATCH --cpus-per-task=1', 'an "#SBATCH --cpus-per-task=" line');
  s = substituteOnce(s, /^N=\d+$/m, `N=${TASKS}`, 'an "N=" line');
  s = substituteOnce(s, /scenarios\/demo-observer\.yaml/, scenarioPath, 'the scenario path scenarios/demo-observer.yaml');
  return s;
}

const unavailable = slurmUnavailable();
const required = process.env.MOONSIEVE_REQUIRE_SLURM === '1';
if (unavailable !== null && !required) console.warn(`Slurm job-array test skipped: ${unavailable}`);

describe('the README recipe, as text', () => {
  it('has one job script and one merge command, and the substitutions each hit one line', () => {
    const { jobScript, mergeCommand } = readmeRecipe(readFileSync(join(ROOT, 'README.md'), 'utf8'));
    const adapted = adaptJobScript(jobScript, '/scratch/tiny.yaml');
    expect(adapted).toMatch(/^#SBATCH --array=0-3$/m);
    expect(adapted).toMatch(/^N=4$/m);
    // Only the four substituted lines differ (common practice, no source).
    const before = jobScript.split('\n');
    const after = adapted.split('\n');
    expect(after.length).toBe(before.length);
    expect(before.filter((l, i) => l !== after[i]).length).toBe(4);
    expect(mergeCommand).toMatch(/^node bin\/moonsieve\.js merge /);
  });
});

describe.skipIf(unavailable !== null && !required)('the README job array on Slurm', () => {
  let work = '';
  let jobId: string | null = null;
  let sbatch: ChildProcess | null = null;

  afterAll(() => {
    // A job still queued or running (the test timed out or failed) is cancelled, so it cannot hold the node.
    if (sbatch !== null && sbatch.exitCode === null) {
      if (jobId !== null) spawnSync('scancel', [jobId], { timeout: 15_000 });
      sbatch.kill();
    }
    if (work !== '') rmSync(work, { recursive: true, force: true });
  });

  it('runs the array, merges the shards, and equals the unsharded sweep byte for byte', async () => {
    if (unavailable !== null) throw new Error(`MOONSIEVE_REQUIRE_SLURM=1 but Slurm cannot run the test: ${unavailable}`);
    expect(existsSync(join(ROOT, 'dist', 'src', 'cli', 'main.js'))).toBe(true);

    const { jobScript, mergeCommand } = readmeRecipe(readFileSync(join(ROOT, 'README.md'), 'utf8'));
    work = mkdtempSync(join(tmpdir(), 'moonsieve-slurm-'));
    symlinkSync(join(ROOT, 'bin'), join(work, 'bin'));
    mkdirSync(join(work, 'logs')); // Slurm does not create the folder of --output
    writeFileSync(join(work, 'job.sh'), adaptJobScript(jobScript, SCENARIO));

    const env = envWithoutSlurm();
    let out = '';
    const code = await new Promise<number | null>((resolve, reject) => {
      sbatch = spawn('sbatch', ['--wait', 'job.sh'], { cwd: work, env, stdio: ['ignore', 'pipe', 'pipe'] });
      sbatch.stdout?.on('data', (d: Buffer) => {
        out += d.toString();
        jobId ??= /Submitted batch job (\d+)/.exec(out)?.[1] ?? null;
      });
      sbatch.stderr?.on('data', (d: Buffer) => (out += d.toString()));
      sbatch.on('error', reject);
      sbatch.on('close', resolve);
    });
    const logs = () => readdirSync(join(work, 'logs')).sort().map((f) => `--- ${f}\n${readFileSync(join(work, 'logs', f), 'utf8')}`).join('\n');
    if (code !== 0) throw new Error(`sbatch --wait exited with ${code}:\n${out}\n${logs()}`);
    expect(jobId).not.toBeNull();
    // One log per array task, each named with the job id and task id by the recipe's --output pattern.
    expect(readdirSync(join(work, 'logs')).sort()).toEqual([0, 1, 2, 3].map((t) => `moonsieve_${jobId}_${t}.log`));
    expect(readdirSync(join(work, 'runs')).sort()).toEqual(['shard-0', 'shard-1', 'shard-2', 'shard-3']);

    const merge = spawnSync('bash', ['-c', mergeCommand], { cwd: work, env, encoding: 'utf8', timeout: 60_000 });
    if (merge.status !== 0) throw new Error(`${mergeCommand} exited with ${merge.status}:\n${merge.stdout}\n${merge.stderr}`);

    const sweep = spawnSync(process.execPath, [join(ROOT, 'bin', 'moonsieve.js'), 'sweep', SCENARIO, '--out', join(work, 'unsharded'), '--quiet'],
      { cwd: work, env, encoding: 'utf8', timeout: 60_000 });
    if (sweep.status !== 0) throw new Error(`the unsharded sweep exited with ${sweep.status}:\n${sweep.stderr}`);

    for (const f of COMPARED) {
      const merged = readFileSync(join(work, 'runs', 'merged', f), 'utf8');
      const whole = readFileSync(join(work, 'unsharded', f), 'utf8');
      expect(merged, `${f}: merged shards vs unsharded run`).toBe(whole);
    }
    // The merge came from the four array tasks, shard k/4 from task k − 1.
    const run = JSON.parse(readFileSync(join(work, 'runs', 'merged', 'run.json'), 'utf8')) as { merged_from: { run: { shard: unknown } }[] };
    expect(run.merged_from.map((m) => m.run.shard)).toEqual([1, 2, 3, 4].map((k) => ({ k, n: TASKS })));
    const cells = JSON.parse(readFileSync(join(work, 'unsharded', 'cells.json'), 'utf8')) as { cells: { simulated: boolean }[] };
    expect(cells.cells.length).toBe(6);
    expect(cells.cells.every((c) => c.simulated)).toBe(true);
  }, 180_000);
});

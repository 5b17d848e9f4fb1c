/**
 * The README's Slurm procedure, run as written on a real Slurm cluster: the
 * job script, the submit line, the resubmission line and the merge command
 * are read out of README.md (section "Beyond one machine (Slurm)"), so the
 * documentation and this test cannot drift apart. Only these are changed,
 * each on exactly one line, and the test fails if that line is gone:
 *
 *   job script   #SBATCH --array=…             → 0-3 (four tasks)
 *                #SBATCH --cpus-per-task=…     → 1 (two tasks at a time on a 2-core node)
 *                N=…                           → 4
 *                scenarios/demo-observer.yaml  → test/cluster/tiny-array.yaml (6 cells, 4 realizations)
 *   resubmit     sbatch --array=<list>         → sbatch --array=1
 *
 * The submit line runs unchanged; the test waits for each job by polling
 * squeue twice a second (`sbatch --wait` polls at 2, 8, then every 32 s,
 * which cost this test a minute) and reads the tasks' states afterwards.
 *
 * Everything runs in a scratch folder laid out like a checkout (`bin` links
 * to the repository's). Task 1 finds the checkpoint of an interrupted earlier
 * attempt (made beforehand with runSweep's maxCells), so the first submission
 * fails on that task alone, as the README says; the failed task is found with
 * `scontrol show job` (this cluster has no accounting, so no sacct), the
 * README's resubmission line reruns it with --resume, and the README's merge
 * command (through bash, glob included) joins the shards. The merged
 * cells.json, cells.ecsv and summary.json must equal, byte for byte, those of
 * an unsharded `moonsieve sweep` of the same scenario (the shard contract:
 * cells assigned by index, each realization seeded by (seed, cell,
 * realization); common practice, no source).
 *
 * Needs a Slurm cluster whose node is this host (`.ci/run` installs Debian's
 * slurm-wlm and munge and starts one with scripts/slurm/one-node-cluster.sh).
 * Without it the test is skipped with the reason, unless
 * MOONSIEVE_REQUIRE_SLURM=1 (set by .ci/run), where it fails instead.
 */
import { describe, it, expect, afterAll } from 'vitest';
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { runSweep } from '../../src/app/sweep/runSweep.js';

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

export interface ReadmeRecipe {
  jobScript: string;
  /** The first submission, `mkdir -p logs && sbatch job.sh`. */
  submit: string;
  /** The resubmission of chosen tasks, e.g. `sbatch --array=3,7,12 job.sh --resume`. */
  resubmit: string;
  merge: string;
}

/** The one command line of a sh block (comments after # removed). */
function oneCommand(block: string, what: string): string {
  const lines = block.split('\n').map((l) => l.replace(/\s+#\s.*$/, '').trim()).filter((l) => l !== '' && !l.startsWith('#'));
  if (lines.length !== 1) throw new Error(`expected the README's ${what} block to hold one command, found ${lines.length} lines`);
  return lines[0];
}

/** The sh blocks of the README's Slurm section, found by what they do; throws naming what is missing. */
export function readmeRecipe(readme: string): ReadmeRecipe {
  const start = readme.indexOf(`\n${SECTION}\n`);
  if (start < 0) throw new Error(`README.md has no "${SECTION}" section`);
  const rest = readme.slice(start + SECTION.length + 2);
  const next = rest.search(/^#{2,3} /m); // the next heading (a "# " line is a comment in the script)
  const section = next < 0 ? rest : rest.slice(0, next);
  // Fenced sh blocks, also those indented inside a list item (dedented here).
  const blocks = [...section.matchAll(/^( *)```sh\n([\s\S]*?)^\1```$/gm)].map((m) =>
    m[2].split('\n').map((l) => l.slice(m[1].length)).join('\n'));
  const pick = (what: string, test: (b: string) => boolean): string => {
    const found = blocks.filter(test);
    if (found.length !== 1) throw new Error(`expected one ${what} block in "${SECTION}", found ${found.length}`);
    return found[0];
  };
  return {
    jobScript: pick('job script (sh, starting with #!/bin/bash)', (b) => b.startsWith('#!/bin/bash\n')),
    submit: oneCommand(pick('submission (sbatch job.sh)', (b) => /\bsbatch job\.sh\b/.test(b)), 'submission'),
    resubmit: oneCommand(pick('resubmission (sbatch --array=… job.sh)', (b) => /\bsbatch --array=\S+ job\.sh\b/.test(b)), 'resubmission'),
    merge: oneCommand(pick('merge (node bin/moonsieve.js merge …)', (b) => /^node bin\/moonsieve\.js merge /m.test(b)), 'merge'),
  };
}

/** Replace the one line (or text) matching `pattern`; fail if it is absent or repeated. */
function substituteOnce(text: string, pattern: RegExp, replacement: string, what: string): string {
  const global = new RegExp(pattern.source, pattern.flags.includes('g') ? pattern.flags : `${pattern.flags}g`);
  const n = [...text.matchAll(global)].length;
  if (n !== 1) throw new Error(`the README's recipe should contain ${what} exactly once (pattern ${pattern}), found ${n}`);
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

/** The README's resubmission line, made to rerun task `task`. */
export function adaptResubmit(line: string, task: number): string {
  return substituteOnce(line, /\bsbatch --array=\S+ /, `sbatch --array=${task} `, 'sbatch --array=… in the resubmit line');
}

/** Wait until Slurm no longer lists the job (all its tasks ended), polling squeue twice a second. */
async function waitForJob(jobId: string, timeoutMs: number): Promise<void> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const r = spawnSync('squeue', ['-h', '-j', jobId, '-o', '%i %T'], { encoding: 'utf8', timeout: 15_000 });
    // squeue answers "Invalid job id" once a finished job has been purged; that is finished too.
    if ((r.status === 0 && r.stdout.trim() === '') || /Invalid job id/i.test(r.stderr ?? '')) return;
    if (r.status !== 0) throw new Error(`squeue -j ${jobId} failed: ${r.stderr}`);
    if (Date.now() > until) throw new Error(`job ${jobId} still queued or running after ${timeoutMs / 1000} s:\n${r.stdout}`);
    await new Promise((res) => setTimeout(res, 500));
  }
}

const INTERRUPTED_TASK = 1;

interface TaskState { task: string; state: string; exit: string }

/** Each array task's state, from `scontrol show job -o` (kept MinJobAge, 5 min by default, after the end). */
function arrayTaskStates(jobId: string): TaskState[] {
  const r = spawnSync('scontrol', ['show', 'job', '-o', jobId], { encoding: 'utf8', timeout: 15_000 });
  if (r.status !== 0) throw new Error(`scontrol show job ${jobId} failed: ${r.stderr}`);
  return r.stdout.split('\n').filter((l) => l.includes('ArrayTaskId=')).map((l) => ({
    task: /ArrayTaskId=(\S+)/.exec(l)?.[1] ?? '?',
    state: /JobState=(\S+)/.exec(l)?.[1] ?? '?',
    exit: /ExitCode=(\S+)/.exec(l)?.[1] ?? '?',
  })).sort((x, y) => Number(x.task) - Number(y.task));
}

const unavailable = slurmUnavailable();
const required = process.env.MOONSIEVE_REQUIRE_SLURM === '1';
if (unavailable !== null && !required) console.warn(`Slurm job-array test skipped: ${unavailable}`);

describe('the README recipe, as text', () => {
  it('has one job script, submit, resubmit and merge command, and each substitution hits one line', () => {
    const r = readmeRecipe(readFileSync(join(ROOT, 'README.md'), 'utf8'));
    const adapted = adaptJobScript(r.jobScript, '/scratch/tiny.yaml');
    expect(adapted).toMatch(/^#SBATCH --array=0-3$/m);
    expect(adapted).toMatch(/^N=4$/m);
    // Only the four substituted lines differ (common practice, no source).
    const before = r.jobScript.split('\n');
    const after = adapted.split('\n');
    expect(after.length).toBe(before.length);
    expect(before.filter((l, i) => l !== after[i]).length).toBe(4);
    // The script hands sbatch's extra arguments to the sweep, which is how the resubmission adds --resume.
    expect(r.jobScript).toMatch(/^node bin\/moonsieve\.js sweep [\s\S]*"\$@"$/m);
    expect(r.submit).toMatch(/\bsbatch job\.sh$/);
    expect(adaptResubmit(r.resubmit, 1)).toMatch(/^sbatch --array=1 job\.sh --resume$/);
    expect(r.merge).toMatch(/^node bin\/moonsieve\.js merge /);
  });
});

describe.skipIf(unavailable !== null && !required)('the README job array on Slurm', () => {
  let work = '';
  const jobIds: string[] = [];
  const running = new Set<ChildProcess>();

  afterAll(() => {
    // Jobs still queued or running (the test timed out or failed) are cancelled, so they cannot hold the
    // node; scancel of a finished job only says so.
    if (jobIds.length > 0) spawnSync('scancel', jobIds, { timeout: 15_000 });
    for (const p of running) p.kill();
    if (work !== '') rmSync(work, { recursive: true, force: true });
  });

  /** Run one README command line through bash in the scratch folder; the job id it prints is kept for clean-up. */
  function bash(line: string): Promise<{ code: number | null; out: string; jobId: string | null }> {
    return new Promise((resolve, reject) => {
      let out = '';
      let jobId: string | null = null;
      const p = spawn('bash', ['-c', line], { cwd: work, env: envWithoutSlurm(), stdio: ['ignore', 'pipe', 'pipe'] });
      running.add(p);
      const take = (d: Buffer): void => {
        out += d.toString();
        const m = /Submitted batch job (\d+)/.exec(out);
        if (m && jobId === null) {
          jobId = m[1];
          jobIds.push(jobId);
        }
      };
      p.stdout.on('data', take);
      p.stderr.on('data', take);
      p.on('error', reject);
      p.on('close', (code) => {
        running.delete(p);
        resolve({ code, out, jobId });
      });
    });
  }

  const logs = (): string => readdirSync(join(work, 'logs')).sort()
    .map((f) => `--- ${f}\n${readFileSync(join(work, 'logs', f), 'utf8')}`).join('\n');

  it('fails on the interrupted task, reruns only it with --resume, merges, and equals the unsharded sweep byte for byte', async () => {
    if (unavailable !== null) throw new Error(`MOONSIEVE_REQUIRE_SLURM=1 but Slurm cannot run the test: ${unavailable}`);
    expect(existsSync(join(ROOT, 'dist', 'src', 'cli', 'main.js'))).toBe(true);
    const recipe = readmeRecipe(readFileSync(join(ROOT, 'README.md'), 'utf8'));
    work = mkdtempSync(join(tmpdir(), 'moonsieve-slurm-'));
    symlinkSync(join(ROOT, 'bin'), join(work, 'bin'));
    writeFileSync(join(work, 'job.sh'), adaptJobScript(recipe.jobScript, SCENARIO));

    // An earlier attempt at task 1 (shard 2/4: cells 1 and 5) was cut off after one cell.
    const shardDir = join(work, 'runs', `shard-${INTERRUPTED_TASK}`);
    const partial = await runSweep(SCENARIO, { out: shardDir, shard: `${INTERRUPTED_TASK + 1}/${TASKS}`, maxCells: 1, workers: 1, quiet: true, env: {} });
    expect(partial.complete).toBe(false);
    expect(existsSync(join(shardDir, 'cells.partial.jsonl'))).toBe(true);

    // 1. Submit: the array ends with task 1 failed (its checkpoint needs --resume), the others done.
    const first = await bash(recipe.submit);
    expect(first.code, first.out).toBe(0);
    expect(first.jobId, first.out).not.toBeNull();
    await waitForJob(first.jobId as string, 120_000);
    // 2. Find the tasks that did not complete.
    const states = arrayTaskStates(first.jobId as string);
    expect(states.map((t) => t.task)).toEqual(['0', '1', '2', '3']);
    const failed = states.filter((t) => t.state !== 'COMPLETED').map((t) => Number(t.task));
    expect(failed, JSON.stringify(states)).toEqual([INTERRUPTED_TASK]);
    expect(readFileSync(join(work, 'logs', `moonsieve_${first.jobId}_${INTERRUPTED_TASK}.log`), 'utf8')).toMatch(/--resume/);

    // 3. Resubmit only that task, with --resume: it keeps the checkpointed cell and computes the other.
    const second = await bash(adaptResubmit(recipe.resubmit, failed[0]));
    expect(second.code, second.out).toBe(0);
    expect(second.jobId, second.out).not.toBeNull();
    await waitForJob(second.jobId as string, 120_000);
    const again = arrayTaskStates(second.jobId as string);
    expect(again.map((t) => [t.task, t.state]), `${JSON.stringify(again)}\n${logs()}`).toEqual([[String(INTERRUPTED_TASK), 'COMPLETED']]);
    const shardRun = JSON.parse(readFileSync(join(shardDir, 'run.json'), 'utf8')) as { cells_resumed: number; cells_computed: number };
    expect([shardRun.cells_resumed, shardRun.cells_computed]).toEqual([1, 1]);
    expect(readdirSync(join(work, 'logs')).sort()).toEqual([
      ...[0, 1, 2, 3].map((t) => `moonsieve_${first.jobId}_${t}.log`),
      `moonsieve_${second.jobId}_${INTERRUPTED_TASK}.log`,
    ].sort());

    // 4. Merge, and compare with one unsharded run of the same scenario.
    const merge = await bash(recipe.merge);
    if (merge.code !== 0) throw new Error(`${recipe.merge} exited with ${merge.code}:\n${merge.out}`);
    const sweep = spawnSync(process.execPath, [join(ROOT, 'bin', 'moonsieve.js'), 'sweep', SCENARIO, '--out', join(work, 'unsharded'), '--quiet'],
      { cwd: work, env: envWithoutSlurm(), encoding: 'utf8', timeout: 60_000 });
    if (sweep.status !== 0) throw new Error(`the unsharded sweep exited with ${sweep.status}:\n${sweep.stderr}`);
    for (const f of COMPARED) {
      const merged = readFileSync(join(work, 'runs', 'merged', f), 'utf8');
      const whole = readFileSync(join(work, 'unsharded', f), 'utf8');
      expect(merged, `${f}: merged shards vs unsharded run`).toBe(whole);
    }
    const run = JSON.parse(readFileSync(join(work, 'runs', 'merged', 'run.json'), 'utf8')) as { merged_from: { run: { shard: unknown } }[] };
    expect(run.merged_from.map((m) => m.run.shard)).toEqual([1, 2, 3, 4].map((k) => ({ k, n: TASKS })));
    const cells = JSON.parse(readFileSync(join(work, 'unsharded', 'cells.json'), 'utf8')) as { cells: { simulated: boolean }[] };
    expect(cells.cells.length).toBe(6);
    expect(cells.cells.every((c) => c.simulated)).toBe(true);
  }, 180_000);
});

/**
 * Output paths are checked before any work (issue 15): `--out` naming a file,
 * a path under a file, an unwritable place or '' and `--html` naming a folder
 * give one clear line, exit 2, and nothing written. Expected values are the
 * CLI's own contracts ("common practice, no source").
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli as run } from '../helpers/runCli.js';
import { checkOutputDir, checkOutputFile } from '../../src/io/outputPaths.js';

const demo = new URL('../../scenarios/demo-observer.yaml', import.meta.url).pathname;
let tmp: string;
let file: string;
beforeAll(() => {
  tmp = mkdtempSync(join(tmpdir(), 'moonsieve-paths-'));
  file = join(tmp, 'a-file.txt');
  writeFileSync(file, 'x');
});
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe('checkOutputDir / checkOutputFile', () => {
  it('accepts a folder to be made, making nothing', () => {
    const dir = join(tmp, 'new', 'deeper');
    expect(() => checkOutputDir('--out', dir)).not.toThrow();
    expect(existsSync(join(tmp, 'new'))).toBe(false);
    expect(readdirSync(tmp)).toEqual(['a-file.txt']); // the probe folder is gone
    expect(() => checkOutputFile('--html', join(tmp, 'new', 'page.html'))).not.toThrow();
  });

  it('refuses empty, a file, a path under a file and an unwritable place, naming the option and value', () => {
    expect(() => checkOutputDir('--out', '')).toThrow(/^--out: got ""; expected a folder name/);
    expect(() => checkOutputDir('--out', file)).toThrow(/this is a file, not a folder/);
    expect(() => checkOutputDir('--out', join(file, 'sub'))).toThrow(/a-file\.txt is a file, so no folder can be made under it/);
    expect(() => checkOutputDir('--out', '/proc/moonsieve-out')).toThrow(/cannot write in \/proc/); // refused even for root
    expect(() => checkOutputFile('--html', '')).toThrow(/^--html: got ""; expected a file name/);
    expect(() => checkOutputFile('--html', tmp)).toThrow(/this is a folder: name a file/);
    expect(() => checkOutputFile('--html', 'somewhere/')).toThrow(/this is a folder/);
    expect(() => checkOutputFile('--html', join(file, 'page.html'))).toThrow(/is a file, so no folder can be made under it/);
  });
});

describe('every command checks its output path before any work', () => {
  const cases: Array<[string, () => string[], RegExp]> = [
    ['sweep --out FILE', () => ['sweep', demo, '--out', file, '--quiet'], /--out: got ".*a-file\.txt"; this is a file/],
    ['sweep --out FILE/sub', () => ['sweep', demo, '--out', join(file, 'sub'), '--quiet'], /is a file, so no folder can be made under it/],
    ['sweep --out ""', () => ['sweep', demo, '--out', '', '--quiet'], /--out: got ""/],
    ['sweep --out /proc/x', () => ['sweep', demo, '--out', '/proc/moonsieve-x', '--quiet'], /cannot write in \/proc/],
    ['simulate --out FILE', () => ['simulate', demo, '--noiseless', '--out', file], /this is a file, not a folder/],
    ['merge --out FILE', () => ['merge', tmp, '--out', file], /this is a file, not a folder/],
    ['budget --html DIR', () => ['budget', demo, '--html', tmp], /--html: got ".*"; this is a folder/],
    ['vet --html DIR', () => ['vet', demo, '--html', tmp], /--html: got ".*"; this is a folder/],
    ['vet --html ""', () => ['vet', demo, '--html', ''], /--html: got ""/],
  ];
  for (const [what, args, expected] of cases) {
    it(`${what}: one line, exit 2, nothing written`, async () => {
      const before = readdirSync(tmp).sort();
      const t0 = performance.now();
      const r = await run(args());
      expect(r.code).toBe(2);
      expect(r.err).toMatch(expected);
      expect(r.err.trim().split('\n')).toHaveLength(1);
      expect(r.err).not.toMatch(/\n\s+at /);
      expect(readdirSync(tmp).sort()).toEqual(before);
      expect(performance.now() - t0).toBeLessThan(3000); // refused before the work, not after
    });
  }

  it('sweep: a lone SLURM_ARRAY_TASK_ID is an error with the fix, exit 2', async () => {
    process.env.SLURM_ARRAY_TASK_ID = '2';
    try {
      const out = join(tmp, 'slurm');
      const r = await run(['sweep', demo, '--out', out, '--quiet']);
      expect(r.code).toBe(2);
      expect(r.err).toMatch(/SLURM_ARRAY_TASK_COUNT: .*--shard K\/N/);
      expect(existsSync(out)).toBe(false);
    } finally {
      delete process.env.SLURM_ARRAY_TASK_ID;
    }
  });

  it('sweep --force is accepted into a folder with other files', async () => {
    const dir = join(tmp, 'forced');
    mkdirSync(dir);
    writeFileSync(join(dir, 'keep.txt'), 'k');
    const r = await run(['sweep', demo, '--out', dir, '--quiet', '--forecast-only']);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/holds files that are not this sweep's \(keep\.txt\)/);
    const f = await run(['sweep', demo, '--out', dir, '--quiet', '--forecast-only', '--force']);
    expect(f.code).toBe(0);
    expect(existsSync(join(dir, 'cells.json'))).toBe(true);
    expect(existsSync(join(dir, 'keep.txt'))).toBe(true);
  });
});

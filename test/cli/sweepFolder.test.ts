/**
 * The sweep command as a process (issue 15 item 3): while a sweep runs, a
 * second run on its folder (with or without --resume) is refused naming the
 * holder's pid; Ctrl-C exits 130 with the checkpoint and the no-moon chunks
 * done so far saved, and releases the folder. Expected values are the CLI's
 * own contracts ("common practice, no source").
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { CHECKPOINT_FILE } from '../../src/app/sweep/checkpoint.js';
import { LOCK_FILE, NULLSET_DIR } from '../../src/app/sweep/outputFolder.js';

const BIN = resolve('bin/moonsieve.js');
const SCENARIO = `
name: Slow world (invented)
seed: 5
star: { mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, limb_darkening: { u1: 0.4, u2: 0.25 } }
planet: { mass: 1 Mjup, radius: 1 Rjup, period: 60 d }
moon: { mass: 1 Mearth, density: 3 g/cm^3, separation: 0.1 hill }
instrument: { cadence: 10 min, noise: 400 ppm per 10 min }
observation: { transits: 5 }
sweep:
  realizations: 3
  no_moon_realizations: 4000
  axes:
    - { field: moon.density, from: 2 g/cm^3, to: 4 g/cm^3, count: 2 }
`;

let tmp: string;
beforeAll(() => {
  tmp = mkdtempSync(join(tmpdir(), 'moonsieve-cli-folder-'));
  writeFileSync(join(tmp, 'slow.yaml'), SCENARIO);
});
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe('sweep folder while running', () => {
  it('a second run is refused with the holder\'s pid; Ctrl-C exits 130, keeps the checkpoint and saved chunks, and frees the folder', async () => {
    const out = join(tmp, 'out');
    const child = spawn(process.execPath, [BIN, 'sweep', join(tmp, 'slow.yaml'), '--out', out, '--workers', '1'], { stdio: ['ignore', 'pipe', 'pipe'] });
    let err = '';
    child.stderr.on('data', (d: Buffer) => { err += d.toString(); });
    let done = false;
    const exited = new Promise<number | null>((r) => child.on('exit', (code) => { done = true; r(code); }));
    try {
      // Wait until the calibration runs and has saved a chunk.
      const t0 = Date.now();
      while (!(existsSync(join(out, NULLSET_DIR)) && readdirSync(join(out, NULLSET_DIR)).some((f) => f.endsWith('.bin')))) {
        if (Date.now() - t0 > 60_000) throw new Error(`no chunk saved; stderr: ${err}`);
        await new Promise((r) => setTimeout(r, 100));
      }
      for (const extra of [[], ['--resume']]) {
        const second = spawnSync(process.execPath, [BIN, 'sweep', join(tmp, 'slow.yaml'), '--out', out, '--quiet', ...extra], { encoding: 'utf8' });
        expect(second.status).toBe(2);
        expect(second.stderr).toContain(`in use by pid ${child.pid}`);
        expect(second.stderr.trim().split('\n')).toHaveLength(1);
      }
      const tInt = Date.now();
      child.kill('SIGINT');
      expect(await exited).toBe(130);
      expect(Date.now() - tInt).toBeLessThan(5000);
      expect(err).toMatch(/interrupted: 0 of 2 cells done; resume with --resume/);
      expect(existsSync(join(out, CHECKPOINT_FILE))).toBe(true);
      expect(existsSync(join(out, LOCK_FILE))).toBe(false);
      expect(readdirSync(join(out, NULLSET_DIR)).some((f) => f.endsWith('.bin'))).toBe(true);
    } finally {
      if (!done) child.kill('SIGKILL'); // never leave the child running when an assertion failed
    }
  });
});

import { describe, it, expect } from 'vitest';
import { Command } from 'commander';
import { mkdtempSync, readFileSync, writeFileSync, copyFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { registerVet } from '../../src/cli/vetCommand.js';
import { InputError } from '../../src/scenario/errors.js';

const demo = new URL('../../scenarios/demo-claim.yaml', import.meta.url).pathname;
const demoTimes = new URL('../../scenarios/demo-claim-times.csv', import.meta.url).pathname;

async function run(args: string[]) {
  let out = '';
  const io = { out: (t: string) => { out += t; }, err: () => {} };
  const program = new Command().exitOverride();
  registerVet(program, io);
  await program.parseAsync(['node', 'moonsieve', 'vet', ...args]);
  return out;
}

describe('moonsieve vet', () => {
  it('prints a verdict with ranked reasons for the demo claim', async () => {
    const out = await run([demo]);
    expect(out).toMatch(/VERDICT: (CONSISTENT WITH A MOON|IN TENSION|IMPLAUSIBLE)/);
    expect(out).toMatch(/\n {2}1\. /);
    expect(out).toMatch(/Implied moon \(ttv\+tdv/);
    expect(out).toMatch(/Cautions/);
  });

  it('--json gives the result with SI keys; --html writes a self-contained page', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-vet-'));
    const html = join(dir, 'vet.html');
    const out = await run([demo, '--json', '--html', html]);
    const r = JSON.parse(out);
    expect(['consistent', 'tension', 'implausible']).toContain(r.verdict);
    expect(r.schema).toBe('moonsieve/vet/2');
    expect(r.implied.moon_separation_m.median).toBeGreaterThan(0);
    expect(r.table_significance.transits).toBe(13);
    expect(r.system.hill_radius_m).toBeGreaterThan(0);
    const page = readFileSync(html, 'utf8');
    expect(page).toContain('Plotly.newPlot');
    expect(page).not.toMatch(/<script[^>]+src=/);
  });

  it('old key names (claim.precision, planet.periastron) are read as the new ones, with a note on stderr', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-vet-'));
    copyFileSync(demoTimes, join(dir, 'demo-claim-times.csv'));
    const text = readFileSync(demo, 'utf8');
    expect(text).toMatch(/\n {2}noise: /);
    writeFileSync(join(dir, 'now.yaml'), text.replace('  impact_parameter: 0.3', '  impact_parameter: 0.3\n  eccentricity: 0.1\n  periapsis: 60 deg'));
    writeFileSync(join(dir, 'old.yaml'), text.replace('  impact_parameter: 0.3', '  impact_parameter: 0.3\n  eccentricity: 0.1\n  periastron: 60 deg').replace(/\n {2}noise: /, '\n  precision: '));
    let err = '';
    const runWithErr = async (file: string) => {
      let out = '';
      err = '';
      const program = new Command().exitOverride();
      registerVet(program, { out: (t) => { out += t; }, err: (t) => { err += t; } });
      await program.parseAsync(['node', 'moonsieve', 'vet', join(dir, file), '--json']);
      return out;
    };
    const now = await runWithErr('now.yaml');
    expect(err).toBe('');
    const old = await runWithErr('old.yaml');
    expect(old).toBe(now);
    expect(err).toContain('note: planet.periastron: deprecated name: write planet.periapsis');
    expect(err).toContain('note: claim.precision: deprecated name: write claim.noise');
    writeFileSync(join(dir, 'both.yaml'), text.replace(/\n {2}noise: (.*)/, '\n  noise: $1\n  precision: $1'));
    await expect(runWithErr('both.yaml')).rejects.toThrow(/claim\.precision.*give claim\.noise only/);
  });

  it('user text reaching the page is escaped', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-vet-'));
    copyFileSync(demoTimes, join(dir, 'demo-claim-times.csv'));
    const claim = join(dir, 'claim.yaml');
    writeFileSync(claim, readFileSync(demo, 'utf8').replace('name: Veyluna b (claimed moon)', 'name: "<script>alert(1)</script>"'));
    await run([claim, '--html', join(dir, 'p.html')]);
    const page = readFileSync(join(dir, 'p.html'), 'utf8');
    expect(page).not.toContain('<script>alert(1)</script>');
    expect(page).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
  });

  it('a table without a stated time standard is refused with an InputError (exit code 2 in main)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-vet-'));
    copyFileSync(demoTimes, join(dir, 'demo-claim-times.csv'));
    const claim = join(dir, 'claim.yaml');
    writeFileSync(claim, readFileSync(demo, 'utf8').replace(/\n\s*time_standard: .*\n/, '\n'));
    await expect(run([claim])).rejects.toBeInstanceOf(InputError);
    await expect(run([claim])).rejects.toThrow(/time_standard.*Eastman/s);
  });
});

/**
 * `moonsieve budget` through commander (registered here as the lead will in
 * src/cli/main.ts): flags reach the library, bad flags are InputErrors naming
 * the flag, outputs are the table, JSON and an HTML page. Forecast-only runs
 * keep this file fast; the Monte Carlo path is covered in planBudget.test.ts.
 */
import { describe, it, expect } from 'vitest';
import { Command } from 'commander';
import { mkdtempSync, readFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { registerBudget } from '../../src/cli/budgetCommand.js';
import { InputError } from '../../src/scenario/errors.js';

const demo = new URL('../../scenarios/demo-observer.yaml', import.meta.url).pathname;

async function run(args: string[]): Promise<{ out: string; err: string; error: unknown }> {
  let out = '';
  let err = '';
  const program = new Command().exitOverride().configureOutput({ writeOut: (t) => { out += t; }, writeErr: (t) => { err += t; } });
  registerBudget(program, { out: (t) => { out += t; }, err: (t) => { err += t; } });
  try {
    await program.parseAsync(['node', 'moonsieve', 'budget', ...args]);
    return { out, err, error: null };
  } catch (e) {
    return { out, err, error: e };
  }
}

describe('moonsieve budget (CLI)', () => {
  it('bad flags: an InputError naming each flag and its value, nothing printed', async () => {
    const r = await run([demo, '--probability', '0', '--channel', 'photometry', '--moon-separation', 'far']);
    expect(r.error).toBeInstanceOf(InputError);
    const msg = (r.error as InputError).message;
    expect(msg).toContain('--probability');
    expect(msg).toContain('--channel');
    expect(msg).toContain('--moon-separation: got "far"');
    expect(r.out).toBe('');
  });

  it('--no-moon-realizations sets the calibration count; the old --null-realizations still works, with a note on stderr', async () => {
    const now = await run([demo, '--forecast-only', '--json', '--quiet', '--no-moon-realizations', '60']);
    expect(now.error).toBeNull();
    expect(JSON.parse(now.out).no_moon_realizations).toBe(60);
    expect(now.err).not.toMatch(/deprecated/);
    const absent = await run([demo, '--forecast-only', '--json', '--quiet']);
    expect(JSON.parse(absent.out).no_moon_realizations).toBe(1500); // the default ⌈15/α⌉ of the tail calibration at the demo's α = 1 % (budgetSpec.ts, nullSet.ts)
    const old = await run([demo, '--forecast-only', '--json', '--quiet', '--null-realizations', '60']);
    expect(old.error).toBeNull();
    expect(JSON.parse(old.out).no_moon_realizations).toBe(60);
    expect(old.err).toMatch(/note: --null-realizations is deprecated: write --no-moon-realizations/);
    const bad = await run([demo, '--forecast-only', '--no-moon-realizations', '2']);
    expect((bad.error as InputError).message).toContain('--no-moon-realizations: got "2"');
  });

  it('--channel template is offered: the template channel exists from 1 transit and has no analytic forecast (budgetSpec.ts minTransitsFor, budgetForecast.ts; common practice, no source)', async () => {
    const r = await run([demo, '--forecast-only', '--json', '--quiet', '--channel', 'template']);
    expect(r.error).toBeNull();
    const j = JSON.parse(r.out);
    expect(j.channel).toBe('template');
    expect(j.quantity.values[0]).toBe(1);
    for (const p of j.forecast.probability) expect(p).toBeNull();
  });

  it('a target moon the scenario refuses names the flag', async () => {
    const r = await run([demo, '--forecast-only', '--moon-separation', '1 Rp']);
    expect(r.error).toBeInstanceOf(InputError);
    expect((r.error as InputError).message).toMatch(/--moon-separation \(the target moon's separation\).*touch the planet/);
  });

  it('--forecast-only --json: SI keys, the answer and the forecast curve; --html writes the page', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-budget-'));
    const page = join(dir, 'budget.html');
    const r = await run([demo, '--forecast-only', '--json', '--moon-mass', '0.6 Mearth', '--moon-separation', '18 Rp', '--probability', '90 %', '--html', page]);
    expect(r.error).toBeNull();
    const j = JSON.parse(r.out);
    expect(j.schema).toBe('moonsieve/budget/1');
    expect(j.solve).toBe('transits');
    expect(j.quantity.display_unit).toBeTypeOf('string');
    expect(j.answer.telescope_time_s).toBeGreaterThan(0);
    expect(j.probability_target).toBeCloseTo(0.9, 15);
    expect(j.answer.reached).toBe(true);
    expect(j.quantity.values[0]).toBe(1); // the combined channel exists from 1 transit (the moon dip; budgetSpec.ts minTransitsFor)
    expect(j.forecast.probability).toHaveLength(j.quantity.values.length);
    expect(existsSync(page)).toBe(true);
    expect(readFileSync(page, 'utf8')).toContain('Plotly.newPlot');
  });

  it('the table names the answer, the forecast caveat for this moon and the assumptions', async () => {
    const r = await run([demo, '--forecast-only', '--solve', 'noise']);
    expect(r.error).toBeNull();
    expect(r.out).toMatch(/worst white-noise level/);
    expect(r.err).not.toMatch(/deprecated/);
    const old = await run([demo, '--forecast-only', '--solve', 'precision']);
    expect(old.error).toBeNull();
    const untimed = (t: string) => t.replace(/\(\d+(\.\d+)? s\)/g, '(… s)'); // the wall time differs between runs
    expect(untimed(old.out)).toBe(untimed(r.out)); // the same answer
    expect(old.err).toMatch(/note: --solve precision is deprecated: write --solve noise/);
    expect(r.out).toMatch(/photocentric/); // the demo moon's dip is large for its mass
    expect(r.out).toMatch(/Assumptions/);
  });
});

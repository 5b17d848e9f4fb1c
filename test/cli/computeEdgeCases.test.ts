/**
 * Inputs that crashed limits, simulate, budget and sweep (issue 15), through
 * the CLI entry point: each exits 0 with the stated answer, or 2 with one
 * clear message naming the field or option; never a stack trace; nothing
 * written on exit 2. Invented systems.
 */
import { describe, it, expect } from 'vitest';
import { mkdtempSync, writeFileSync, existsSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli as run } from '../helpers/runCli.js';

const dir = mkdtempSync(join(tmpdir(), 'ms-edge-'));

function scenario(name: string, over: { transits?: number; impact?: number; cadence?: string; baseline?: string; period?: string } = {}): string {
  const path = join(dir, `${name}.yaml`);
  writeFileSync(path, `name: Veyra b ${name} (invented)
seed: 31
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5750 K, age: 4 Gyr, limb_darkening: {u1: 0.4, u2: 0.25}}
planet: {mass: 0.3 Mjup, radius: 0.8 Rjup, period: ${over.period ?? '60 d'}, impact_parameter: ${over.impact ?? 0.3}}
moon: {mass: 1 Mearth, density: 4 g/cm^3, separation: 15 Rp}
instrument: {cadence: ${over.cadence ?? '2 min'}, noise: 200 ppm per 1 h}
observation: {transits: ${over.transits ?? 2}, baseline: ${over.baseline ?? '3 h'}}
detection: {false_alarm: 1 %}
sweep:
  realizations: 4
  axes:
    - {field: moon.mass, from: 0.5 Mearth, to: 2 Mearth, count: 2, spacing: log}
`);
  return path;
}

const noStack = (t: string) => expect(t).not.toMatch(/\n\s+at /);

describe('fewer than 3 transits is an answer', () => {
  it('limits with 2 transits: exit 0, no TTV channel, TDV forecast', async () => {
    const r = await run(['limits', scenario('two')]);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/no TTV channel with 2 transits; TDV [\d.]+ % \(1 degree of freedom\)/);
    const j = await run(['limits', scenario('two'), '--json']);
    const obj = JSON.parse(j.out);
    expect(obj.pdet_forecast_ttv).toBeNull();
    expect(typeof obj.pdet_forecast_tdv).toBe('number');
  });

  it('limits with 1 transit: exit 0, no timing channel, moon dip only', async () => {
    const r = await run(['limits', scenario('one', { transits: 1 })]);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/no timing channel with 1 transit; moon dip only/);
  });

  it('budget --forecast-only with 2 transits: exit 0; a TTV budget at 2 transits says why it cannot be reached', async () => {
    const r = await run(['budget', scenario('two'), '--forecast-only']);
    expect(r.code).toBe(0);
    noStack(r.err);
    const t = await run(['budget', scenario('two'), '--forecast-only', '--channel', 'ttv', '--solve', 'cadence']);
    expect(t.code).toBe(0);
    expect(t.out).toMatch(/no TTV channel with 2 transits/);
  });

  it('sweep --forecast-only with 2 transits: exit 0', async () => {
    const out = join(dir, 'sweep-two');
    const r = await run(['sweep', scenario('two'), '--forecast-only', '--out', out, '--quiet', '--workers', '1']);
    noStack(r.err);
    expect(r.code).toBe(0);
    const cells = JSON.parse(readFileSync(join(out, 'cells.json'), 'utf8'));
    const list = Array.isArray(cells) ? cells : cells.cells;
    expect(list[0].pdet_forecast_ttv).toBeNull();
  });
});

describe('geometry, cadence and size', () => {
  it('grazing: limits and simulate both accept it (exit 0); limits says what it leaves out', async () => {
    const path = scenario('grazing', { transits: 3, impact: 1.02 });
    const l = await run(['limits', path]);
    expect(l.code).toBe(0);
    expect(l.out).toMatch(/grazing transit/);
    const s = await run(['simulate', path, '--noiseless', '--out', join(dir, 'sim-grazing')]);
    expect(s.code).toBe(0);
  });

  it('a cadence longer than the transit: exit 2 naming instrument.cadence and T14, nothing written', async () => {
    const path = scenario('slow', { cadence: '12 h', transits: 4 });
    for (const cmd of [['limits', path], ['budget', path, '--forecast-only'], ['simulate', path, '--out', join(dir, 'sim-slow')]]) {
      const r = await run(cmd);
      expect(r.code, cmd[0]).toBe(2);
      expect(r.err).toMatch(/instrument\.cadence.*shorter than the transit \(T14 = /);
      noStack(r.err);
    }
    expect(existsSync(join(dir, 'sim-slow'))).toBe(false);
  });

  it('a 0.2 s cadence over 400 long windows: refused up front with the samples needed and the limit', async () => {
    const path = scenario('fast', { cadence: '0.2 s', transits: 400, baseline: '20 h' });
    const r = await run(['simulate', path, '--out', join(dir, 'sim-fast')]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/would need 3\.\d+e\+8 samples .* above the limit of 2e\+6/);
    expect(r.err).toMatch(/coarser cadence/);
    expect(existsSync(join(dir, 'sim-fast'))).toBe(false);
    const l = await run(['limits', path]);
    expect(l.code).toBe(2);
  });

  it('simulate --draw 1e20: an option error with the allowed range; the old --realization names itself and is noted as deprecated', async () => {
    const r = await run(['simulate', scenario('two'), '--draw', '1e20', '--out', join(dir, 'sim-r')]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/--draw: got "1e20"; expected a whole number from 0 to 9007199254740991/);
    expect(existsSync(join(dir, 'sim-r'))).toBe(false);
    const old = await run(['simulate', scenario('two'), '--realization', '1e20', '--out', join(dir, 'sim-r')]);
    expect(old.code).toBe(2);
    expect(old.err).toMatch(/note: --realization is deprecated: write --draw/);
    expect(old.err).toMatch(/--realization: got "1e20"; expected a whole number from 0 to 9007199254740991/);
    expect(existsSync(join(dir, 'sim-r'))).toBe(false);
  });

  it('simulate --draw N and the deprecated --realization N draw the same noise', async () => {
    const a = await run(['simulate', scenario('two'), '--draw', '3', '--out', join(dir, 'sim-d3')]);
    const b = await run(['simulate', scenario('two'), '--realization', '3', '--out', join(dir, 'sim-r3')]);
    const c = await run(['simulate', scenario('two'), '--out', join(dir, 'sim-d0')]);
    expect([a.code, b.code, c.code]).toEqual([0, 0, 0]);
    const lc = (d: string) => readFileSync(join(dir, d, 'lightcurve.ecsv'), 'utf8');
    expect(lc('sim-d3')).toBe(lc('sim-r3'));
    expect(lc('sim-d3')).not.toBe(lc('sim-d0'));
    const transits = readFileSync(join(dir, 'sim-d3', 'transits.ecsv'), 'utf8');
    // Durations in SI like their errors (one unit per table).
    expect(transits).toContain('{name: "fit_duration", unit: "s",');
    expect(transits).toContain('{name: "fit_duration_err", unit: "s",');
  });

  it('a 4-day baseline around a 5-day period: each time stamp written once', async () => {
    const out = join(dir, 'sim-overlap');
    const r = await run(['simulate', scenario('overlap', { period: '5 d', baseline: '4 d', transits: 3, cadence: '10 min' }), '--out', out, '--format', 'csv']);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/windows are cut at the midpoints/);
    const times = readFileSync(join(out, 'lightcurve.csv'), 'utf8').split('\n').filter((x) => /^\d/.test(x)).map((x) => x.split(',')[0]);
    expect(times.length).toBeGreaterThan(1000);
    expect(new Set(times).size).toBe(times.length);
  });
});

describe('budget messages', () => {
  const six = () => scenario('six', { transits: 6 });

  it('--moon-mass "10 Msun" blames --moon-mass, with the value as written', async () => {
    const r = await run(['budget', six(), '--forecast-only', '--moon-mass', '10 Msun']);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/--moon-mass \(the target moon's mass\): got "10 Msun"/);
    expect(r.err).not.toMatch(/moon\.separation[^"]*: got/);
    noStack(r.err);
  });

  it('--probability abc does not suggest "60 ppm"; --moon-mass abc does not suggest a solar mass', async () => {
    const p = await run(['budget', six(), '--forecast-only', '--probability', 'abc']);
    expect(p.code).toBe(2);
    expect(p.err).toMatch(/--probability: got "abc"; expected a detection probability above 0 and below 1/);
    expect(p.err).not.toMatch(/ppm/);
    const m = await run(['budget', six(), '--forecast-only', '--moon-mass', 'abc']);
    expect(m.code).toBe(2);
    expect(m.err).toMatch(/--moon-mass: got "abc"; expected a positive moon mass/);
    expect(m.err).not.toMatch(/Msun/);
  });

  it('the answer uses the unit the user wrote', async () => {
    const e = await run(['budget', six(), '--forecast-only', '--moon-mass', '3 Mearth']);
    expect(e.code).toBe(0);
    expect(e.out).toMatch(/a 3\.00 Mearth moon/);
    const k = await run(['budget', six(), '--forecast-only', '--moon-mass', '1.2e25 kg']);
    expect(k.code).toBe(0);
    expect(k.out).toMatch(/a 1\.20e\+25 kg moon/);
    const h = await run(['budget', six(), '--forecast-only', '--moon-separation', '0.2 hill']);
    expect(h.code).toBe(0);
    expect(h.out).toMatch(/at \d+ km \(0\.200 Hill radii\)/);
  });

  it('--html naming a folder or a path under a file: exit 2 before any work, nothing written', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'ms-html-'));
    const r = await run(['budget', six(), '--forecast-only', '--html', folder]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/--html: got .*this is a folder: name a file/);
    expect(r.out).toBe('');
    const file = join(folder, 'plain.txt');
    writeFileSync(file, 'x');
    const u = await run(['budget', six(), '--forecast-only', '--html', join(file, 'page.html')]);
    expect(u.code).toBe(2);
    expect(u.err).toMatch(/is a file, so no folder can be made under it/);
    noStack(u.err);
  });

  it('a habitable mass range the wrong way round names the flag and the other end', async () => {
    const r = await run(['budget', six(), '--forecast-only', '--habitable', '--mass-to', '0.01 Mearth']);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/--mass-to: got "0.01 Mearth"; must be heavier than the lightest moon \(the default 0.10 Mearth\)/);
  });
});

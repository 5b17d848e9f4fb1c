import { describe, it, expect } from 'vitest';
import { mkdtempSync, readFileSync, existsSync, writeFileSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli as run } from '../helpers/runCli.js';

const demo = new URL('../../scenarios/demo-observer.yaml', import.meta.url).pathname;

describe('moonsieve CLI', () => {
  it('bad input: one clear message naming field, value and what is allowed; exit 2; no stack trace; nothing written', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-cli-'));
    const bad = join(dir, 'bad.yaml');
    writeFileSync(bad, readFileSync(demo, 'utf8').replace('mass: 0.32 Mjup', 'mass: 0.32 furlong'));
    const outDir = join(dir, 'out');
    const r = await run(['simulate', bad, '--noiseless', '--out', outDir]);
    expect(r.code).toBe(2);
    expect(r.err).toContain('planet.mass');
    expect(r.err).toContain('"0.32 furlong"');
    expect(r.err).toMatch(/a mass/);
    expect(r.err).not.toMatch(/\n\s+at /); // no stack trace
    expect(existsSync(outDir)).toBe(false);
  });

  it('missing file and unknown option exit with 2', async () => {
    const r1 = await run(['simulate', '/nonexistent/scenario.yaml']);
    expect(r1.code).toBe(2);
    expect(r1.err).toMatch(/no such file/);
    const r2 = await run(['simulate', demo, '--frobnicate']);
    expect(r2.code).toBe(2);
  });

  it('simulate --noiseless writes an ECSV light curve, a transit table and an HTML page', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-sim-'));
    const r = await run(['simulate', demo, '--noiseless', '--out', dir]);
    // Nothing on stderr but the scenario's own note lines (the demo's site block may carry one).
    expect(r.err.split('\n').filter((l) => l !== '' && !l.startsWith('note: site: '))).toEqual([]);
    expect(r.code).toBe(0);
    expect(readdirSync(dir).sort()).toEqual(['lightcurve.ecsv', 'simulate.html', 'transits.ecsv']);
    const ecsv = readFileSync(join(dir, 'lightcurve.ecsv'), 'utf8');
    expect(ecsv.startsWith('# %ECSV 1.0\n')).toBe(true);
    const html = readFileSync(join(dir, 'simulate.html'), 'utf8');
    expect(html).toContain('Plotly.newPlot');
    expect(html).not.toMatch(/<script[^>]+src=/); // self-contained
  });

  it('limits prints the table and --json the SI keys', async () => {
    const t = await run(['limits', demo]);
    expect(t.code).toBe(0);
    expect(t.out).toMatch(/Hill radius/);
    expect(t.out).toMatch(/verdict/);
    const j = await run(['limits', demo, '--json']);
    expect(j.code).toBe(0);
    const obj = JSON.parse(j.out);
    for (const k of ['hill_radius_m', 'stable_max_separation_m', 'stable_max_separation_retrograde_m', 'roche_limit_m', 'tidal_max_moon_mass_kg',
      'transit_duration_s', 'timing_precision_s', 'duration_precision_s', 'ttv_semi_amplitude_s', 'ttv_rms_s', 'tdv_semi_amplitude_s',
      'tdv_rms_s', 'moon_depth', 'pdet_forecast_joint', 'energy_budget']) {
      expect(obj, k).toHaveProperty(k);
      expect(obj[k], k).not.toBeNull();
    }
    expect(obj.schema).toBe('moonsieve/limits/1');
    // Dimensionless values are plain fractions in JSON (ppm is for screens): the demo moon's dip is tens of ppm.
    expect(obj.moon_depth).toBeGreaterThan(0);
    expect(obj.moon_depth).toBeLessThan(1e-3);
    expect(t.out).toMatch(/moon dip depth\s+\d+\.\d\d ppm/);
    expect(t.out).toContain('Domingos, Winter & Yokoyama 2006');
    expect(t.out).not.toContain('DWY06');
    for (const k of ['stellar_w_m2', 'reflected_w_m2', 'thermal_w_m2', 'tidal_w_m2', 'total_w_m2', 'runaway_limit_w_m2', 'verdict']) {
      expect(obj.energy_budget, k).toHaveProperty(k);
    }
  });
});

/**
 * Property test (issue 15): random scenarios drawn from the documented ranges never crash a command.
 * Each command either answers (exit 0) or refuses with one clear message (exit 2); an internal error
 * (exit 1, a stack trace) fails the test. The draws span giant and small planets, short and long
 * periods, grazing and central transits, few and many transits, coarse and fine cadences, white and
 * red noise, gaps and lost transits. Common practice, no source: the README's promise for any input.
 */
import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../src/cli/main.js';

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const io = { out: (t: string) => { out += t; }, err: (t: string) => { err += t; } };
  const code = await main(['node', 'moonsieve', ...args], io);
  return { code, out, err };
}

const g = (lo: number, hi: number) => fc.double({ min: lo, max: hi, noNaN: true, noDefaultInfinity: true });

const scenarioArb = fc.record({
  starMass: g(0.1, 2.0),
  starRadius: g(0.1, 2.5),
  teff: g(2800, 9000),
  planetMass: g(0.01, 10),
  planetRadius: g(0.1, 2.0),
  period: g(0.8, 500),
  impact: g(0, 1.15),
  moonMass: g(0.01, 30),
  moonSepHill: g(0.05, 0.6),
  transits: fc.integer({ min: 1, max: 40 }),
  cadenceMin: g(0.2, 60),
  noisePpm: g(5, 5000),
  red: fc.boolean(),
  missed: g(0, 0.95),
  duty: g(0.05, 1),
  baselineH: g(0, 12),
  seed: fc.integer({ min: 0, max: 1_000_000 }),
});

function yaml(s: Record<string, number | boolean>): string {
  return [
    'name: Random draw',
    `seed: ${s.seed}`,
    'star:',
    `  mass: ${s.starMass} Msun`,
    `  radius: ${s.starRadius} Rsun`,
    `  teff: ${s.teff} K`,
    '  limb_darkening: {u1: 0.45, u2: 0.2}',
    'planet:',
    `  mass: ${s.planetMass} Mjup`,
    `  radius: ${s.planetRadius} Rjup`,
    `  period: ${s.period} d`,
    `  impact_parameter: ${s.impact}`,
    'moon:',
    `  mass: ${s.moonMass} Mearth`,
    '  density: 3 g/cm^3',
    `  separation: ${s.moonSepHill} hill`,
    'instrument:',
    `  cadence: ${s.cadenceMin} min`,
    `  noise: ${s.noisePpm} ppm per 1 h`,
    ...(s.red ? ['  red_noise: {model: drw, amplitude: 100 ppm, timescale: 40 min}'] : []),
    'observation:',
    `  transits: ${s.transits}`,
    `  baseline: ${s.baselineH} h`,
    `  missed_fraction: ${s.missed}`,
    `  duty_cycle: ${s.duty}`,
    'sweep:',
    '  realizations: 2',
    '  axes:',
    '    - {field: moon.mass, from: 0.1 Mearth, to: 10 Mearth, count: 2, spacing: log}',
    '    - {field: moon.separation, from: 0.1 hill, to: 0.4 hill, count: 2, spacing: linear}',
    '',
  ].join('\n');
}

describe('random valid scenarios never crash a command (property, fast-check)', () => {
  it('limits, simulate, budget --forecast-only and sweep --forecast-only answer or refuse cleanly', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ms-prop-'));
    let k = 0;
    await fc.assert(
      fc.asyncProperty(scenarioArb, async (s) => {
        const file = join(dir, `s${k++}.yaml`);
        writeFileSync(file, yaml(s));
        for (const args of [
          ['limits', file, '--json'],
          ['simulate', file, '--out', join(dir, `sim${k}`), '--format', 'csv'],
          ['budget', file, '--forecast-only', '--json', '--quiet'],
          ['sweep', file, '--forecast-only', '--quiet', '--out', join(dir, `sw${k}`)],
        ]) {
          const r = await run(args);
          const ctx = `${args[0]} on\n${yaml(s)}\nexit ${r.code}: ${r.err.slice(0, 600)}`;
          expect(r.err, ctx).not.toMatch(/internal error/);
          expect([0, 2], ctx).toContain(r.code);
          if (r.code === 0 && args.includes('--json')) expect(r.out, ctx).not.toMatch(/NaN/);
        }
      }),
      { numRuns: 30, seed: 20261205 },
    );
  });
});

/**
 * Property test (fast-check): random valid claims — amplitudes, and small tables of transit
 * times with and without durations — never throw and never put NaN or ±Infinity in the result
 * (the --json output), the text report or the HTML page.
 */
import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { parseClaimText } from '../../src/vet/loadClaim.js';
import { vetClaim } from '../../src/vet/vetClaim.js';
import { formatVetReport } from '../../src/vet/formatVetReport.js';
import { renderVetPage } from '../../src/report/vetPage.js';
import { nonFinitePaths } from './nonFinite.js';

const logUniform = (lo: number, hi: number) => fc.double({ min: Math.log10(lo), max: Math.log10(hi), noNaN: true }).map((e) => 10 ** e);

// An invented system in ordinary ranges (the scenario validator's job is the star and planet; here they are sane).
const systemArb = fc.record({
  starMass: logUniform(0.1, 2), // Msun
  starRadius: logUniform(0.1, 2.5), // Rsun
  teff: fc.integer({ min: 2800, max: 9000 }),
  planetMass: logUniform(0.01, 10), // Mjup
  planetRadius: logUniform(0.1, 1.8), // Rjup
  period: logUniform(0.5, 800), // d
  impact: fc.double({ min: 0, max: 0.8, noNaN: true }),
}).filter((s) => {
  // A full (non-grazing) transit of a planet smaller than its star: k = R_P/R_* (R_Jup/R_Sun = 0.10045).
  const k = (0.10045 * s.planetRadius) / s.starRadius;
  // Orbit well outside the star: a/R_* from Kepler's third law (a = 0.0196 AU for 1 Msun, 1 d; 1 AU = 215 R_Sun).
  const aOverR = (215.03 * 0.019568 * Math.cbrt(s.starMass * s.period * s.period)) / s.starRadius;
  return k < 0.3 && s.impact < 1 - k - 0.02 && aOverR > 3;
});

type SystemDraw = { starMass: number; starRadius: number; teff: number; planetMass: number; planetRadius: number; period: number; impact: number };

function systemYaml(s: SystemDraw): string {
  return `name: invented property claim
seed: 3
star: {mass: ${s.starMass} Msun, radius: ${s.starRadius} Rsun, teff: ${s.teff} K, limb_darkening: {u1: 0.4, u2: 0.2}}
planet: {mass: ${s.planetMass} Mjup, radius: ${s.planetRadius} Rjup, period: ${s.period} d, impact_parameter: ${s.impact}}
`;
}

// Amplitude and uncertainty as fractions of the largest allowed, a quarter of the planet period (loadClaim.ts).
const amplitudeArb = fc.record({
  value: logUniform(1e-12, 0.99),
  error: logUniform(1e-12, 0.99),
  kind: fc.constantFrom('rms', 'semi-amplitude'),
});

const amplitudeClaimArb = fc.record({
  system: systemArb,
  ttv: fc.option(amplitudeArb, { nil: undefined }),
  tdv: fc.option(amplitudeArb, { nil: undefined }),
  transits: fc.integer({ min: 3, max: 2000 }),
  precision: fc.option(logUniform(1.001e-7, 1), { nil: undefined }),
  timescale: logUniform(1, 86400), // s
  cadence: fc.option(logUniform(1, 86400), { nil: undefined }),
  duration: fc.option(logUniform(60, 86400), { nil: undefined }),
  dip: fc.option(logUniform(1e-8, 1e-2), { nil: undefined }),
  phase: fc.option(fc.tuple(fc.double({ min: -360, max: 360, noNaN: true }), logUniform(0.001, 360)), { nil: undefined }),
  orientation: fc.constantFrom('isotropic', 'coplanar'),
}).filter((c) => c.ttv !== undefined || c.tdv !== undefined);

const tableClaimArb = fc.record({
  system: systemArb,
  rows: fc.integer({ min: 6, max: 30 }),
  gaps: fc.array(fc.integer({ min: 1, max: 4 }), { minLength: 30, maxLength: 30 }),
  ttvAmp: fc.oneof(fc.constant(0), logUniform(1, 3000)), // s
  tdvAmp: fc.oneof(fc.constant(0), logUniform(1, 3000)),
  nu: fc.double({ min: 0, max: 0.5, noNaN: true }),
  noise: fc.array(fc.double({ min: -2, max: 2, noNaN: true }), { minLength: 60, maxLength: 60 }),
  errMin: logUniform(1e-4, 100), // min (capped below a quarter period where the table is written)
  durations: fc.boolean(),
});

function check(yaml: string, table?: string) {
  const claim = parseClaimText(yaml, 'property.yaml', table === undefined ? {} : { readText: () => table });
  const r = vetClaim({ ...claim, draws: 200 }, { exclusionGrid: { separations: 3, masses: 4, realizations: 4 } });
  expect(nonFinitePaths(r)).toEqual([]);
  const text = formatVetReport(r);
  expect(text).not.toMatch(/NaN|Infinity/);
  // The page minus the embedded plotting library (whose own code contains "NaN").
  const page = renderVetPage(r);
  const lib = page.indexOf('var Plotly=');
  const own = lib < 0 ? page : page.slice(0, lib) + page.slice(page.indexOf('</script>', lib));
  const bad = /NaN|Infinity/.exec(own);
  expect(bad ? own.slice(Math.max(0, bad.index - 200), bad.index + 50) : null).toBeNull();
}

describe('vet never throws and never reports NaN or Infinity on valid claims (property)', () => {
  it('amplitude claims', () => {
    fc.assert(
      fc.property(amplitudeClaimArb, (c) => {
        const q = (c.system.period * 86400) / 4;
        const amp = (a: { value: number; error: number; kind: string }) => `{amplitude: ${a.value * q} s, uncertainty: ${Math.max(1e-3, a.error * q)} s, kind: ${a.kind}}`;
        let y = systemYaml(c.system) + 'claim:\n';
        if (c.ttv) y += `  ttv: ${amp(c.ttv)}\n`;
        if (c.tdv) y += `  tdv: ${amp(c.tdv)}\n`;
        y += `  transits: ${c.transits}\n  orientation: ${c.orientation}\n`;
        if (c.precision !== undefined) y += `  noise: "${c.precision * 1e6} ppm per ${c.timescale} s"\n`;
        if (c.cadence !== undefined) y += `  cadence: ${c.cadence} s\n`;
        if (c.duration !== undefined && c.duration < (c.system.period * 86400) / 2) y += `  duration: ${c.duration} s\n`;
        if (c.dip !== undefined) y += `  moon_dip: "${c.dip * 1e6} ppm"\n`;
        if (c.phase) y += `  phase_offset: {value: ${c.phase[0]} deg, uncertainty: ${c.phase[1]} deg}\n`;
        check(y);
      }),
      { numRuns: 60, seed: 15 },
    );
  });

  it('small tables of transit times, with and without durations', () => {
    fc.assert(
      fc.property(tableClaimArb, (draw) => {
        let c = draw;
        const P = c.system.period;
        c = { ...c, errMin: Math.min(c.errMin, 0.2 * P * 1440) };
        const lines = [c.durations ? 'epoch,time,time_err [min],duration [h],duration_err [min]' : 'epoch,time,time_err [min]'];
        let e = 0;
        for (let i = 0; i < c.rows; i++) {
          const ttv = c.ttvAmp * Math.sin(2 * Math.PI * c.nu * e) + c.noise[i] * c.errMin * 60;
          const t = 3000 + P * e + ttv / 86400;
          let row = `${e},${t.toFixed(9)},${c.errMin}`;
          const durErr = Math.min(c.errMin, 10); // min: keeps the 3-h durations positive
          if (c.durations) row += `,${(3 + (c.tdvAmp * Math.cos(2 * Math.PI * c.nu * e) + c.noise[30 + i] * durErr * 60) / 3600).toFixed(7)},${durErr}`;
          lines.push(row);
          e += c.gaps[i];
        }
        const y = systemYaml(c.system) + 'claim:\n  table: t.csv\n  time_standard: BJD_TDB-2457000\n  noise: "500 ppm per 2 min"\n';
        check(y, lines.join('\n') + '\n');
      }),
      { numRuns: 60, seed: 16 },
    );
  });
});

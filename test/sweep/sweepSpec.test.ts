/**
 * The sweep block: defaults, spacing, validation messages with paths, and
 * axis values written into the scenario document. Expected values are
 * computed in the test from the scenario's own constants and computeLimits.
 */
import { describe, it, expect } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseSweepSpec, applyAxisValues, spacedValues } from '../../src/sweep/sweepSpec.js';
import { loadSweep } from '../../src/app/sweep/runSweep.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';
import { computeLimits, moonPlacement } from '../../src/limits/computeLimits.js';
import { InputError } from '../../src/scenario/errors.js';
import { M_EARTH_KG, MINUTE_S } from '../../src/physics/constants.js';

const BASE: Record<string, unknown> = {
  name: 'Spec world',
  seed: 7,
  star: { mass: '1 Msun', radius: '1 Rsun', teff: '5772 K', limb_darkening: { u1: 0.4, u2: 0.25 } },
  planet: { mass: '1 Mjup', radius: '1 Rjup', period: '200 d', impact_parameter: 0.3 },
  moon: { mass: '0.5 Mearth', density: '3 g/cm^3', separation: '0.1 hill' },
  instrument: { cadence: '2 min', exposure: '1 min', noise: '300 ppm per 2 min' },
  observation: { transits: 6 },
};

function spec(doc: Record<string, unknown>) {
  return parseSweepSpec(doc, parseScenario(doc));
}

/** The problems of the InputError thrown by `f` (fails the test if none). */
function problems(f: () => unknown): Array<{ path: string; allowed: string }> {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e.problems;
    throw e;
  }
  throw new Error('expected an InputError');
}

describe('default sweep', () => {
  it('is moon mass (log, 0.05–2 Mearth) × separation (Roche → stable), 20 × 20, 100 realizations', () => {
    const s = spec(BASE);
    // The limits of the grid's lightest moon (0.05 Mearth): the stable limit grows with M_P + M_S, the
    // fluid Roche limit does not change with mass at fixed density (sweepSpec.ts, derived there).
    const lim = computeLimits(parseScenario({ ...BASE, moon: { ...(BASE.moon as object), mass: '0.05 Mearth' } }));
    expect(s.defaultAxes).toBe(true);
    expect(s.realizations).toBe(100);
    expect(s.simulateUnstable).toBe(false);
    expect(s.axes.map((a) => [a.field, a.spacing, a.values.length, a.unit])).toEqual([
      ['moon.mass', 'log', 20, 'kg'],
      ['moon.separation', 'linear', 20, 'm'],
    ]);
    // Ends exact: "0.05 Mearth" is 0.05 × M_EARTH_KG (constants in the test).
    expect(s.axes[0].values[0]).toBe(0.05 * M_EARTH_KG);
    expect(s.axes[0].values[19]).toBe(2 * M_EARTH_KG);
    // Separation ends from computeLimits of the lightest moon's scenario.
    expect(s.axes[1].values[0]).toBe(lim.roche_limit_m);
    expect(s.axes[1].values[19]).toBe(lim.stable_max_separation_m);
  });

  it('uses the retrograde stable limit for a retrograde moon', () => {
    const doc = { ...BASE, moon: { ...(BASE.moon as object), direction: 'retrograde' } };
    const lim = computeLimits(parseScenario({ ...doc, moon: { ...doc.moon, mass: '0.05 Mearth' } }));
    expect(spec(doc).axes[1].to).toBe(lim.stable_max_separation_retrograde_m);
    expect(lim.stable_max_separation_retrograde_m).toBeGreaterThan(lim.stable_max_separation_m);
  });

  it('is refused without a moon, naming the sweep block', () => {
    const { moon: _moon, ...noMoon } = BASE;
    void _moon;
    const p = problems(() => spec(noMoon));
    expect(p[0].path).toBe('sweep');
    expect(p[0].allowed).toMatch(/no moon/);
  });
});

describe('spacing', () => {
  it('log spacing is geometric with exact ends; linear is arithmetic', () => {
    const v = spacedValues(2, 2000, 4, 'log');
    expect(v[0]).toBe(2);
    expect(v[3]).toBe(2000);
    // ratio (2000/2)^(1/3) = 10, computed by hand.
    expect(v[1]).toBeCloseTo(20, 11);
    expect(v[2]).toBeCloseTo(200, 10);
    expect(spacedValues(1, 2, 5, 'linear')).toEqual([1, 1.25, 1.5, 1.75, 2]);
    expect(spacedValues(3, 9, 1, 'log')).toEqual([3]);
  });
});

describe('sweep block validation', () => {
  const withSweep = (sweep: unknown) => ({ ...BASE, sweep });

  it('names the path of each problem', () => {
    const p = problems(() => spec(withSweep({
      realisations: 10,
      axes: [
        { field: 'moon.mass', from: '0.1 Mearth', to: '1 Mearth', count: 0 },
        { field: 'moon.colour', from: 1, to: 2, count: 3 },
      ],
    })));
    const paths = p.map((x) => x.path);
    expect(paths).toContain('sweep.realisations');
    expect(p.find((x) => x.path === 'sweep.realisations')?.allowed).toMatch(/did you mean "realizations"/);
    expect(paths).toContain('sweep.axes[0].count');
    expect(paths).toContain('sweep.axes[1].field');
    expect(p.find((x) => x.path === 'sweep.axes[1].field')?.allowed).toMatch(/moon\.mass/);
  });

  it('log spacing needs positive ends', () => {
    const p = problems(() => spec(withSweep({ axes: [{ field: 'moon.mass', from: '-1 Mearth', to: '1 Mearth', count: 3, spacing: 'log' }] })));
    expect(p[0].path).toBe('sweep.axes[0].from');
    expect(p[0].allowed).toMatch(/log spacing/);
  });

  it('an end the scenario refuses is reported on that end, with the scenario field', () => {
    const p = problems(() => spec(withSweep({ axes: [{ field: 'planet.eccentricity', from: 0, to: 0.95, count: 3 }] })));
    expect(p.map((x) => x.path)).toEqual(['sweep.axes[0].to']);
    expect(p[0].allowed).toMatch(/planet\.eccentricity: expected an eccentricity from 0 to 0\.9/);
  });

  it('refuses a wrong unit, a non-list of axes, four axes and a repeated field', () => {
    expect(problems(() => spec(withSweep({ axes: [{ field: 'planet.period', from: '3 kg', to: '10 d', count: 2 }] })))[0].path).toBe('sweep.axes[0].from');
    expect(problems(() => spec(withSweep({ axes: 'moon.mass' })))[0].path).toBe('sweep.axes');
    const ax = { field: 'moon.mass', from: '0.1 Mearth', to: '1 Mearth', count: 2 };
    expect(problems(() => spec(withSweep({ axes: [ax, ax, ax, ax] })))[0].path).toBe('sweep.axes');
    expect(problems(() => spec(withSweep({ axes: [ax, ax] })))[0].path).toBe('sweep.axes[1].field');
    expect(problems(() => spec(withSweep({ simulate_unstable: 'yes' })))[0].path).toBe('sweep.simulate_unstable');
  });

  it('reads the old axis field planet.periastron as planet.periapsis, with a deprecation note; its values replace the old key', () => {
    const base = { ...BASE, planet: { ...(BASE.planet as Record<string, unknown>), eccentricity: 0.2, periastron: '40 deg' } };
    const sw = spec({ ...base, sweep: { axes: [{ field: 'planet.periastron', from: '10 deg', to: '80 deg', count: 2 }] } });
    expect(sw.axes[0].field).toBe('planet.periapsis');
    expect(sw.deprecations).toEqual([expect.stringMatching(/sweep\.axes\[0\]\.field: planet\.periastron is deprecated: write planet\.periapsis/)]);
    const cell = applyAxisValues(base, sw.axes, [sw.axes[0].values[1]]);
    const s = parseScenario(cell);
    expect(s.planet.omegaRad).toBeCloseTo((80 * Math.PI) / 180, 12); // the axis value, not the scenario's 40 deg (definition of degrees)
    expect((cell.planet as Record<string, unknown>).periastron).toBeUndefined();
  });

  it('reads no_moon_realizations, and the old spelling null_realizations with a deprecation note', () => {
    const now = spec(withSweep({ no_moon_realizations: 300 }));
    expect(now.nullRealizations).toBe(300);
    expect(now.deprecations).toEqual([]);
    const old = spec(withSweep({ null_realizations: 300 }));
    expect(old.nullRealizations).toBe(300);
    expect(old.deprecations).toEqual([expect.stringMatching(/sweep\.null_realizations is deprecated: write sweep\.no_moon_realizations/)]);
    expect(old.notes).toEqual(now.notes); // not part of the sweep's identity
    expect(problems(() => spec(withSweep({ null_realizations: 3 })))[0].path).toBe('sweep.null_realizations');
    expect(problems(() => spec(withSweep({ no_moon_realizations: 3 })))[0].path).toBe('sweep.no_moon_realizations');
  });

  it('refuses a moon axis when the scenario has no moon', () => {
    const { moon: _moon, ...noMoon } = BASE;
    void _moon;
    const p = problems(() => spec({ ...noMoon, sweep: { axes: [{ field: 'moon.mass', from: '0.1 Mearth', to: '1 Mearth', count: 2 }] } }));
    expect(p[0].path).toBe('sweep.axes[0].field');
  });

  it('rounds an integer axis and removes duplicates, and says so', () => {
    const s = spec(withSweep({ axes: [{ field: 'observation.transits', from: 2, to: 5, count: 7 }] }));
    // 2, 2.5, 3, 3.5, 4, 4.5, 5 → Math.round → 2, 3, 3, 4, 4, 5, 5 → unique.
    expect(s.axes[0].values).toEqual([2, 3, 4, 5]);
    expect(s.notes.join(' ')).toMatch(/observation\.transits.*rounded.*7 → 4/);
  });

  it('gives file line numbers for a scenario file', () => {
    const dir = mkdtempSync(join(tmpdir(), 'moonsieve-spec-'));
    try {
      const path = join(dir, 's.yaml');
      writeFileSync(path, [
        'name: Line world', 'star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, limb_darkening: {u1: 0.4, u2: 0.25}}',
        'planet: {mass: 1 Mjup, radius: 1 Rjup, period: 200 d}', 'moon: {mass: 0.5 Mearth, radius: 0.8 Rearth, separation: 0.1 hill}',
        'instrument: {cadence: 2 min, noise: 300 ppm per 2 min}', 'observation: {transits: 6}', 'sweep:', '  axes:',
        '    - field: moon.mass', '      from: 0.1 Mearth', '      to: 1 Mearth', '      count: 0', '',
      ].join('\n'));
      expect(() => loadSweep(path)).toThrow(/sweep\.axes\[0\]\.count \(line 12, column \d+\)/);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('axis values written into the scenario', () => {
  it('moon mass with a density: the radius follows (ρ kept)', () => {
    const s = spec({ ...BASE, sweep: { axes: [{ field: 'moon.mass', from: '0.1 Mearth', to: '1 Mearth', count: 2 }] } });
    const m = s.axes[0].values[1];
    const cell = parseScenario(applyAxisValues(BASE, s.axes, [m]));
    expect(cell.moon?.massKg).toBe(m); // written as "<kg> kg": exact
    // r = (3m / 4πρ)^{1/3} with ρ = 3000 kg/m³ (computed in the test).
    expect(cell.moon?.radiusM).toBeCloseTo(Math.cbrt((3 * m) / (4 * Math.PI * 3000)), 3);
  });

  it('noise level keeps the stated timescale; cadence keeps the exposure/cadence ratio', () => {
    const s = spec({ ...BASE, sweep: { axes: [
      { field: 'instrument.noise', from: '100 ppm', to: '1000 ppm', count: 2 },
      { field: 'instrument.cadence', from: '4 min', to: '10 min', count: 2 },
    ] } });
    const cell = parseScenario(applyAxisValues(BASE, s.axes, [s.axes[0].values[1], s.axes[1].values[0]]));
    expect(cell.instrument.noiseFraction).toBeCloseTo(1000e-6, 15);
    expect(cell.instrument.noiseTimescaleS).toBe(2 * MINUTE_S);
    expect(cell.instrument.cadenceS).toBe(4 * MINUTE_S);
    expect(cell.instrument.exposureS).toBeCloseTo(2 * MINUTE_S, 9); // base ratio 1 min / 2 min
    expect(s.notes.join(' ')).toMatch(/exposure follows the cadence/);
  });

  it('planet inclination replaces the impact parameter; the sweep block is dropped', () => {
    const s = spec({ ...BASE, sweep: { axes: [{ field: 'planet.inclination', from: '89.9 deg', to: '90 deg', count: 2 }] } });
    const doc = applyAxisValues({ ...BASE, sweep: {} }, s.axes, [Math.PI / 2]);
    expect('sweep' in doc).toBe(false);
    expect((doc.planet as Record<string, unknown>).impact_parameter).toBeUndefined();
    expect(parseScenario(doc).planet.impactParameter).toBeLessThan(1e-12);
  });
});

describe('roche and stable against a moon-mass axis', () => {
  it('every cell of the first and last separation columns lies inside its own limits (no false upturn at the stable edge)', () => {
    // The demo's failure: "stable" resolved with the scenario's 0.5 Mearth moon put the last column
    // beyond the (smaller) stable limit of every lighter moon. Checked cell by cell with computeLimits.
    const doc = { ...BASE, sweep: { axes: [
      { field: 'moon.mass', from: '0.05 Mearth', to: '3 Mearth', count: 6, spacing: 'log' },
      { field: 'moon.separation', from: 'roche', to: 'stable', count: 5, spacing: 'linear' },
    ] } };
    const s = spec(doc);
    expect(s.notes.join(' ')).toMatch(/lightest and the heaviest moon/);
    const seps = s.axes[1].values;
    for (const m of s.axes[0].values) {
      for (const sep of [seps[0], seps[seps.length - 1]]) {
        const cell = parseScenario(applyAxisValues(doc, s.axes, [m, sep]));
        expect(moonPlacement(cell), `${m} kg at ${sep} m`).toEqual(['stable']);
      }
    }
  });
});

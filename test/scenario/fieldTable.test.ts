import { describe, it, expect, afterEach } from 'vitest';
import { parseScenarioText } from '../../src/scenario/loadScenario.js';
import { setFieldReadHook } from '../../src/scenario/fieldReader.js';
import { SCENARIO_FIELDS } from '../../src/scenario/fields.js';
import { AXIS_FIELDS } from '../../src/sweep/axisFields.js';

/** Two scenarios that between them take every branch of the validator (u/q, radius/density, noise/ground, red-noise models, transits/duration…). */
const first = `name: Table check one
seed: 7
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, age: 4 Gyr, luminosity: 1 Lsun, limb_darkening: {u1: 0.4, u2: 0.26}}
planet: {mass: 1 Mjup, radius: 1 Rjup, period: 365.25 d, eccentricity: 0.1, periapsis: 80 deg, impact_parameter: 0.2, albedo: 0.3, love_number: 0.5, tidal_q: 1e5}
moon: {mass: 0.5 Mearth, radius: 0.8 Rearth, separation: 20 Rp, eccentricity: 0.01, inclination: 1 deg, node: 2 deg, periapsis: 3 deg, phase: 4 deg, direction: retrograde, albedo: 0.3, love_number: 0.3, tidal_q: 100}
instrument:
  cadence: 2 min
  exposure: 100 s
  noise: 100 ppm per 1 h
  red_noise: {model: power_law, amplitude: 50 ppm per 30 min, slope: 1.5}
observation: {transits: 4, t0: 2461000.5, baseline: 3 h, duty_cycle: 0.9, gap_length: 15 min, missed_fraction: 0.1}
detection: {false_alarm: 1 %}
`;
const second = `name: Table check two
star: {mass: 0.8 Msun, radius: 0.8 Rsun, teff: 5000 K, limb_darkening: {q1: 0.4, q2: 0.3}}
planet: {mass: 0.3 Mjup, mass_radius: chen_kipping_2017, period: 200 d, inclination: 89.9 deg}
moon: {mass: 0.5 Mearth, density: 3 g/cm^3, separation: 0.2 hill}
instrument:
  cadence: 2 min
  ground: {aperture: 1 m, band: R, magnitude: 11, throughput: 0.4, airmass: 1.2, altitude: 2000 m, scintillation_coefficient: 1.5, floor: 100 ppm per 10 min}
  red_noise: {model: drw, amplitude: 200 ppm, timescale: 45 min}
observation: {duration: 2 yr}
`;

const SCENARIO_SECTIONS = /^(name|seed|star|planet|moon|instrument|observation|detection)(\.|$)/;

afterEach(() => setFieldReadHook(null));

describe('the scenario field table', () => {
  it('holds every key the validator reads, and the validator reads every entry', () => {
    const read = new Set<string>();
    setFieldReadHook((p) => read.add(p));
    parseScenarioText(first, 'one');
    parseScenarioText(second, 'two');
    setFieldReadHook(null);
    const table = new Set(SCENARIO_FIELDS.map((f) => f.path));
    const readScenario = [...read].filter((p) => SCENARIO_SECTIONS.test(p));
    expect(readScenario.filter((p) => !table.has(p)), 'read by the validator but missing from fields.ts').toEqual([]);
    expect([...table].filter((p) => !read.has(p)), 'in fields.ts but never read').toEqual([]);
  });

  it('has one entry per path, each with a meaning and a consistent type', () => {
    const paths = SCENARIO_FIELDS.map((f) => f.path);
    expect(new Set(paths).size).toBe(paths.length);
    for (const f of SCENARIO_FIELDS) {
      expect(f.meaning.length, f.path).toBeGreaterThan(5);
      if (f.type === 'quantity') expect(f.kind, f.path).toBeDefined();
      if (f.type === 'choice') expect(f.choices?.length, f.path).toBeGreaterThan(0);
      if (f.min !== undefined && f.max !== undefined) expect(f.min, f.path).toBeLessThan(f.max);
      if (typeof f.default === 'number' && f.min !== undefined) expect(f.default, f.path).toBeGreaterThanOrEqual(f.min);
      if (typeof f.default === 'number' && f.max !== undefined) expect(f.default, f.path).toBeLessThanOrEqual(f.max);
    }
  });

  it('has every sweepable field (src/sweep/axisFields.ts)', () => {
    const table = new Set(SCENARIO_FIELDS.map((f) => f.path));
    expect([...AXIS_FIELDS.keys()].filter((p) => !table.has(p))).toEqual([]);
  });

  it('gives the defaults the validator applies', () => {
    const s = parseScenarioText(`star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772, limb_darkening: {u1: 0.4, u2: 0.26}}
planet: {mass: 1 Mjup, radius: 1 Rjup, period: 365.25}
instrument: {cadence: 2, noise: 100 ppm per 1 h}
observation: {transits: 3}
`);
    const d = (p: string) => SCENARIO_FIELDS.find((f) => f.path === p)!.default;
    expect(s.seed).toBe(d('seed'));
    expect(s.name).toBe(d('name'));
    expect(s.star.ageS).toBe(d('star.age'));
    expect(s.planet.eccentricity).toBe(d('planet.eccentricity'));
    expect(s.planet.omegaRad).toBe(d('planet.periapsis'));
    expect(s.planet.tidalQ).toBe(d('planet.tidal_q'));
    expect(s.observation.baselineS).toBe(d('observation.baseline'));
    expect(s.observation.t0BjdTdb).toBe(d('observation.t0'));
    expect(s.observation.gapLengthS).toBe(d('observation.gap_length'));
    expect(s.detection.falseAlarm).toBe(d('detection.false_alarm'));
  });
});

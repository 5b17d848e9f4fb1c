import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { parseScenarioText } from '../../src/scenario/loadScenario.js';
import { InputError } from '../../src/scenario/errors.js';
import { AU_M, DAY_S, M_EARTH_KG, R_JUP_M } from '../../src/physics/constants.js';

const demo = readFileSync(new URL('../../scenarios/demo-observer.yaml', import.meta.url), 'utf8');

const minimal = `
name: Test system
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, limb_darkening: {u1: 0.4, u2: 0.26}}
planet: {mass: 1 Mjup, radius: 1 Rjup, period: 365.25 d}
instrument: {cadence: 2 min, noise: 100 ppm per 1 h}
observation: {transits: 4}
`;

function problemsOf(text: string) {
  try {
    parseScenarioText(text, 'test.yaml');
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as InputError).problems;
  }
  throw new Error('expected an InputError');
}

describe('parseScenario', () => {
  it('parses the demo scenario into SI units', () => {
    const s = parseScenarioText(demo, 'demo');
    expect(s.planet.periodS).toBeCloseTo(148.3 * DAY_S, 6);
    expect(s.moon).not.toBeNull();
    expect(s.moon!.separationM).toBeCloseTo(18 * s.planet.radiusM, 3);
    expect(s.moon!.massKg).toBeCloseTo(0.6 * M_EARTH_KG, -10);
    expect(s.instrument.exposureS).toBe(100);
    expect(s.instrument.noiseTimescaleS).toBe(100); // the ground budget states its level per exposure
    expect(s.instrument.ground).not.toBeNull();
    expect(s.planet.inclinationRad).toBeLessThan(Math.PI / 2);
  });

  it('applies documented defaults and Kepler III for the semi-major axis', () => {
    const s = parseScenarioText(minimal);
    expect(s.moon).toBeNull();
    expect(s.planet.eccentricity).toBe(0);
    expect(s.planet.impactParameter).toBe(0);
    expect(s.instrument.exposureS).toBe(120);
    // A Jupiter-mass planet on a 1-yr orbit of the Sun sits at ≈ 1 au (Kepler's third law; computed).
    expect(s.planet.semiMajorAxisM / AU_M).toBeCloseTo(1.0003, 3);
    expect(s.planet.radiusM).toBe(R_JUP_M);
  });

  it('reads Kipping (2013) q1, q2 as u1, u2', () => {
    const s = parseScenarioText(minimal.replace('{u1: 0.4, u2: 0.26}', '{q1: 0.4356, q2: 0.303030303030303}'));
    // (u1, u2) = (0.4, 0.26) ↔ (q1, q2) = (0.4356, 0.30303) (Kipping 2013, eqs. 15–18; computed).
    expect(s.star.u1).toBeCloseTo(0.4, 12);
    expect(s.star.u2).toBeCloseTo(0.26, 12);
  });

  it('resolves moon separation in planet radii and in Hill radii', () => {
    const withMoon = minimal + `moon: {mass: 0.5 Mearth, radius: 0.8 Rearth, separation: 0.1 hill}\n`;
    const s = parseScenarioText(withMoon);
    // R_H = a (M_P / 3 M*)^{1/3} (Hamilton & Burns 1992): ≈ 0.06829 au for a Jupiter at 1.0003 au (computed).
    expect(s.moon!.separationM / AU_M).toBeCloseTo(0.1 * 0.06829, 5);
  });

  it('reports every problem at once, each with path, value and what is allowed', () => {
    const bad = `
name: Bad
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, limb_darkening: {u1: 0.4, u2: 0.26}}
planet: {mass: 0.3 furlong, radius: 1 Rjup, perod: 10 d, eccentricity: 1.5}
instrument: {cadence: 2 min, noise: loud}
observation: {transits: 2.5}
`;
    const probs = problemsOf(bad);
    const paths = probs.map((p) => p.path);
    expect(paths.some((p) => p.startsWith('planet.mass'))).toBe(true);
    expect(paths.some((p) => p.startsWith('planet.period'))).toBe(true);
    expect(paths.some((p) => p.startsWith('planet.perod'))).toBe(true);
    expect(paths.some((p) => p.startsWith('planet.eccentricity'))).toBe(true);
    expect(paths.some((p) => p.startsWith('instrument.noise'))).toBe(true);
    expect(paths.some((p) => p.startsWith('observation.transits'))).toBe(true);
    const typo = probs.find((p) => p.path.startsWith('planet.perod'))!;
    expect(typo.allowed).toMatch(/unknown key.*did you mean "period"/);
    const mass = probs.find((p) => p.path.startsWith('planet.mass'))!;
    expect(mass.value).toBe('0.3 furlong');
    expect(mass.allowed).toMatch(/a mass/);
    // Line numbers from the YAML file.
    expect(mass.path).toBe('planet.mass');
    expect(mass.line).toBe(4);
    expect(mass.column).toBeGreaterThan(1);
  });

  it('refuses a planet that does not transit and a moon inside its planet', () => {
    const p1 = problemsOf(minimal.replace('period: 365.25 d}', 'period: 365.25 d, impact_parameter: 1.5}'));
    expect(p1[0].allowed).toMatch(/would not transit/);
    const p2 = problemsOf(minimal + `moon: {mass: 0.5 Mearth, radius: 0.8 Rearth, separation: 0.5 Rp}\n`);
    expect(p2[0].allowed).toMatch(/touch the planet/);
  });

  it('refuses unphysical limb darkening and YAML syntax errors', () => {
    const p = problemsOf(minimal.replace('{u1: 0.4, u2: 0.26}', '{u1: 0.9, u2: 0.4}'));
    expect(p[0].path).toMatch(/star.limb_darkening/);
    expect(() => parseScenarioText('star: {mass: [1', 'x.yaml')).toThrow(/not valid YAML/);
  });
});

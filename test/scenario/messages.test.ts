import { describe, it, expect } from 'vitest';
import { parseScenarioText } from '../../src/scenario/loadScenario.js';
import { InputError, type FieldProblem } from '../../src/scenario/errors.js';
import { main } from '../../src/cli/main.js';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const base = `name: Test system
star:
  mass: 1 Msun
  radius: 1 Rsun
  teff: 5772 K
  limb_darkening: {u1: 0.4, u2: 0.26}
planet:
  mass: 1 Mjup
  radius: 1 Rjup
  period: 365.25 d
instrument: {cadence: 2 min, noise: 100 ppm per 1 h}
observation: {transits: 4}
`;

function problemsOf(text: string): { problems: FieldProblem[]; message: string } {
  try {
    parseScenarioText(text, 'test.yaml');
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return { problems: (e as InputError).problems, message: (e as InputError).message };
  }
  throw new Error('expected an InputError');
}

describe('scenario problem messages', () => {
  it('name the field with its YAML line and column', () => {
    const { problems, message } = problemsOf(base.replace('period: 365.25 d', 'period: -3 d'));
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatchObject({ path: 'planet.period', line: 10, column: 11 });
    expect(message).toContain('planet.period (line 10, column 11): got "-3 d"');
  });

  it('truncate a long value to 80 characters with an ellipsis', () => {
    const long = 'x'.repeat(100_000);
    const { message } = problemsOf(base.replace('name: Test system', `name: Test system\nnotes: ${long}`));
    const got = /got "(x+)…/.exec(message);
    expect(got).not.toBeNull();
    expect(message.length).toBeLessThan(400);
    expect(message).toMatch(/x…/);
  });

  it('state an allowed range in the unit the user wrote', () => {
    const { message } = problemsOf(base.replace('mass: 1 Msun', 'mass: 0.5 Mearth'));
    // 0.01 Msun = 3330 Mearth: 1.98841e30 kg × 0.01 / 5.9722e24 kg (IAU 2015 nominal GM values; computed).
    expect(message).toMatch(/star\.mass \(line 3, column 9\): got "0\.5 Mearth"; expected a mass from 3329 to 4\.99[0-9]*e7 Mearth \(from 0\.01 to 150 Msun\)/);
  });

  it('state a bare-number range in the bare unit', () => {
    const { message } = problemsOf(base.replace('cadence: 2 min', 'cadence: 1e-30'));
    // 0.1 s = 0.001667 min; 1 d = 1440 min.
    expect(message).toContain('instrument.cadence');
    expect(message).toMatch(/from 0\.001667 to 1440 minutes/);
  });

  it('give a YAML syntax error as one problem with line and column', () => {
    const broken = base.replace('instrument: {cadence: 2 min, noise: 100 ppm per 1 h}', 'instrument: {cadence: [2 min, noise: 100 ppm per 1 h}');
    const { problems, message } = problemsOf(broken);
    expect(problems).toHaveLength(1);
    expect(problems[0].path).toBe('(YAML syntax)');
    expect(problems[0].line).toBe(11);
    expect(problems[0].column).toBeGreaterThan(0);
    expect(message).toContain('not valid YAML');
  });

  it('turn a YAML alias bomb into an input problem', () => {
    const bomb = [
      'a: &a [x, x, x, x, x, x, x, x, x]',
      'b: &b [*a, *a, *a, *a, *a, *a, *a, *a, *a]',
      'c: &c [*b, *b, *b, *b, *b, *b, *b, *b, *b]',
      'd: &d [*c, *c, *c, *c, *c, *c, *c, *c, *c]',
      'e: [*d, *d, *d, *d, *d, *d, *d, *d, *d]',
    ].join('\n');
    const { problems } = problemsOf(bomb);
    expect(problems).toHaveLength(1);
    expect(problems[0].path).toBe('(YAML aliases)');
    expect(problems[0].allowed).toMatch(/at most 100 times/);
  });

  it('give a missing block as one problem, and a document that is not a mapping as one', () => {
    const { problems } = problemsOf(base.replace('observation: {transits: 4}\n', ''));
    expect(problems.map((p) => p.path)).toEqual(['observation']);
    expect(problems[0].line).toBeUndefined();
    expect(problemsOf('- 1\n- 2\n').problems.map((p) => p.path)).toEqual(['(top level)']);
  });

  it('give a missing field the position of its block', () => {
    const { problems } = problemsOf(base.replace('  period: 365.25 d\n', ''));
    expect(problems).toMatchObject([{ path: 'planet.period', line: 8 }]);
  });

  it('refuse a document nested too deeply, and a repeated key, as one problem each', () => {
    const deep = problemsOf('a: ' + '['.repeat(20000) + ']'.repeat(20000));
    expect(deep.problems).toHaveLength(1);
    expect(deep.problems[0].allowed).toMatch(/nested too deeply/);
    const twice = problemsOf(base + 'observation: {transits: 5}\n');
    expect(twice.problems).toMatchObject([{ path: '(YAML syntax)', line: 13, column: 1 }]);
  });

  it('suggest a field of the block for a misspelt key, also one the file does not use', () => {
    const { problems } = problemsOf(base.replace('transits: 4', 'durration: 3 yr'));
    const typo = problems.find((p) => p.path === 'observation.durration');
    expect(typo?.allowed).toMatch(/allowed keys here: .*duration.*transits.*\(did you mean "duration"\?\)/);
  });

  it('escape control characters in keys, names and values', () => {
    const evil = base.replace('name: Test system', 'name: Test system\n"\\e[31mred\\u0007": 1').replace('teff: 5772 K', 'teff: "\\e[2J"');
    const { message } = problemsOf(evil);
    expect(message).not.toMatch(/[\u0000-\u0009\u000b-\u001f\u007f]/);
    expect(message).toContain('\\u001b[31mred\\u0007');
  });

  it('the CLI prints an input error with exit 2, no stack trace and no raw control characters', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'moonsieve-msg-'));
    const file = join(dir, 'evil.yaml');
    writeFileSync(file, base.replace('name: Test system', 'name: Test system\n"\\e]0;title\\u0007": 1'));
    let err = '';
    const code = await main(['node', 'moonsieve', 'limits', file], { out: () => {}, err: (t) => (err += t) });
    expect(code).toBe(2);
    expect(err).not.toMatch(/[\u0000-\u0009\u000b-\u001f\u007f]/);
    expect(err).toContain('\\u001b]0;title\\u0007');
    expect(err).not.toMatch(/\n\s+at /);
  });
});

describe('terminal safety of everything the CLI prints', () => {
  it('escapes control characters of a scenario name in the normal output too', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'moonsieve-name-'));
    const file = join(dir, 'name.yaml');
    writeFileSync(file, base.replace('name: Test system', 'name: "Evil\\e[2J\\u202e b"'));
    let out = '';
    const code = await main(['node', 'moonsieve', 'limits', file], { out: (t) => (out += t), err: () => {} });
    expect(code).toBe(0);
    expect(out).toContain('Evil\\u001b[2J\\u202e b');
    expect(out).not.toMatch(/[\u0000-\u0009\u000b-\u001f\u007f\u202e]/);
  });
});

describe('physically impossible inputs', () => {
  it('refuse a planet as large as its star', () => {
    const { problems } = problemsOf(base.replace('radius: 1 Rjup', 'radius: 2 Rsun'));
    expect(problems[0].path).toBe('planet.radius');
    expect(problems[0].allowed).toMatch(/smaller than its star: radius 2 Rsun ≥ star radius 1 Rsun/);
  });

  it('refuse a star of 1e-10 Msun, stating the range', () => {
    const { problems } = problemsOf(base.replace('mass: 1 Msun', 'mass: 1e-10 Msun'));
    expect(problems[0].path).toBe('star.mass');
    expect(problems[0].allowed).toMatch(/from 0\.01 to 150 Msun/);
  });

  it('refuse a noise level of zero and point to --noiseless', () => {
    const { problems } = problemsOf(base.replace('100 ppm per 1 h', '0 ppm per 1 h'));
    expect(problems[0].path).toBe('instrument.noise');
    expect(problems[0].allowed).toMatch(/simulate --noiseless/);
    expect(problemsOf(base.replace('100 ppm per 1 h', '-5 ppm')).problems[0].path).toBe('instrument.noise');
  });

  it('refuse an orbit inside the star, with the shortest period allowed', () => {
    const { problems } = problemsOf(base.replace('period: 365.25 d', 'period: 1 h'));
    expect(problems[0].path).toBe('planet.period');
    // P = 2π √((R☉ + R_J)³ / G(M☉ + M_J)) = 11 585 s = 3.218 h (Kepler's third law, IAU 2015 nominal values; computed).
    expect(problems[0].allowed).toMatch(/inside the star: the period must exceed 3\.218 h/);
  });

  it('refuse a planet or a moon as heavy as the star', () => {
    expect(problemsOf(base.replace('mass: 1 Mjup', 'mass: 2 Msun')).problems[0]).toMatchObject({ path: 'planet.mass', allowed: 'a planet must be lighter than its star (1 Msun)' });
    const moon = problemsOf(base + 'moon: {mass: 10 Msun, density: 4 g/cm^3, separation: 12 Rp}\n').problems;
    expect(moon.map((p) => p.path)).toEqual(['moon.separation', 'moon.mass']);
    // The separation is told in planet radii, as written, and why the moon is so large.
    expect(moon[0].allowed).toMatch(/planet radius \+ moon radius = [0-9.]+ Rp \(the moon radius follows from its mass and density\)/);
  });

  it('refuse an exposure longer than the cadence, in the unit written', () => {
    const { problems } = problemsOf(base.replace('cadence: 2 min', 'cadence: 2 min, exposure: 300 s'));
    expect(problems[0].path).toBe('instrument.exposure');
    expect(problems[0].allowed).toMatch(/at most 120 s/);
  });
});

describe('cautions on odd but legal inputs', () => {
  it('record a moon heavier than its planet', () => {
    const s = parseScenarioText(base + 'moon: {mass: 2 Mjup, radius: 1 Rjup, separation: 30 Rp}\n');
    expect(s.cautions?.map((c) => c.path)).toEqual(['moon.mass']);
    expect(s.cautions?.[0].message).toMatch(/heavier than its planet/);
  });

  it('record a baseline longer than half the period', () => {
    const s = parseScenarioText(base.replace('period: 365.25 d', 'period: 10 d').replace('transits: 4', 'transits: 4, baseline: 6 d'));
    expect(s.cautions?.map((c) => c.path)).toEqual(['observation.baseline']);
    expect(parseScenarioText(base).cautions).toEqual([]);
  });

  it('the CLI prints them as note: lines on stderr', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'moonsieve-note-'));
    const file = join(dir, 'odd.yaml');
    writeFileSync(file, base + 'moon: {mass: 2 Mjup, radius: 1 Rjup, separation: 30 Rp}\n');
    let err = '';
    const code = await main(['node', 'moonsieve', 'limits', file], { out: () => {}, err: (t) => (err += t) });
    expect(code).toBe(0);
    expect(err).toMatch(/^note: moon\.mass: the moon .* heavier than its planet/m);
  });
});

describe('observation.duration', () => {
  it('counts the barycentre conjunctions inside the span, the one at t0 included', () => {
    const s = parseScenarioText(base.replace('transits: 4', 'duration: 3 yr'));
    // t0, t0 + P, t0 + 2P, t0 + 3P with P = 1 Julian year: 4 conjunctions (definition).
    expect(s.observation.transits).toBe(4);
    expect(s.observation.durationS).toBeCloseTo(3 * 365.25 * 86400, 3);
    const t = parseScenarioText(base.replace('transits: 4', 'duration: 2.9 yr'));
    expect(t.observation.transits).toBe(3);
    expect(parseScenarioText(base).observation.durationS).toBeUndefined();
    expect(Object.keys(parseScenarioText(base))).not.toContain('cautions');
  });

  it('refuses both transits and duration, or neither', () => {
    expect(problemsOf(base.replace('transits: 4', 'transits: 4, duration: 3 yr')).problems[0].path).toBe('observation.duration');
    expect(problemsOf(base.replace('transits: 4', 'baseline: 2 h')).problems[0].path).toBe('observation.transits');
  });

  it('refuses a span of more than 10000 conjunctions with the longest allowed', () => {
    const { problems } = problemsOf(base.replace('period: 365.25 d', 'period: 1 d').replace('transits: 4', 'duration: 100 yr'));
    expect(problems[0].path).toBe('observation.duration');
    expect(problems[0].allowed).toMatch(/below 27\.38 yr/);
  });
});

/**
 * The budget question from flags, the scenario's budget block and defaults:
 * every bad value is an InputError naming the flag or key it came from
 * (the project's error convention: path, value, what is allowed).
 */
import { describe, it, expect } from 'vitest';
import { parse } from 'yaml';
import { readBudgetFlags, resolveBudgetTarget, DEFAULT_BUDGET_REALIZATIONS, DEFAULT_HABITABLE_REALIZATIONS } from '../../src/budget/budgetSpec.js';
import { InputError } from '../../src/scenario/errors.js';
import { parseScenario } from '../../src/scenario/parseScenario.js';
import { M_EARTH_KG } from '../../src/physics/constants.js';

function problemsOf(f: () => unknown): { path: string; value: unknown; allowed: string }[] {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as InputError).problems;
  }
  throw new Error('expected an InputError');
}

const scenarioText = `
name: spec test (invented)
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, limb_darkening: {u1: 0.4, u2: 0.26}}
planet: {mass: 1 Mjup, radius: 1 Rjup, period: 365.25 d}
moon: {mass: 0.5 Mearth, radius: 0.1 Rearth, separation: 10 Rp}
instrument: {cadence: 29.4244 min, noise: 30 ppm per 6.5 h}
observation: {transits: 8}
budget:
  probability: 80 %
  solve: precision
  channel: ttv
  moon_mass: 2 Mearth
  realizations: 30
`;

describe('budget flags and block', () => {
  it('bad flags: one InputError naming every bad flag, its value and what is allowed', () => {
    const p = problemsOf(() => readBudgetFlags({ probability: '1.2', solve: 'hours', channel: 'radio', realizations: '2.5', moonMass: '3 furlong', moonSeparation: '-2 Rp', maxTransits: '0' }));
    const paths = p.map((x) => x.path).sort();
    expect(paths).toEqual(['--channel', '--max-transits', '--moon-mass', '--moon-separation', '--probability', '--realizations', '--solve'].sort());
    expect(p.find((x) => x.path === '--solve')!.allowed).toMatch(/transits.*cadence.*noise/);
    expect(p.find((x) => x.path === '--probability')!.value).toBe('1.2');
  });

  it('habitable sub-options without --habitable are refused, naming the flag', () => {
    const p = problemsOf(() => readBudgetFlags({ fraction: '0.5' }));
    expect(p[0].path).toBe('--fraction');
    expect(p[0].allowed).toMatch(/--habitable/);
  });

  it('good flags become SI values', () => {
    const t = readBudgetFlags({ probability: '90 %', moonMass: '0.6 Mearth', moonSeparation: '18 Rp', solve: 'cadence', realizations: '12' });
    expect(t.probability).toBeCloseTo(0.9, 15); // "90 %" = 0.9 (definition of percent)
    expect(t.moonMassKg).toBeCloseTo(0.6 * M_EARTH_KG, 0); // computed from constants in the test
    expect(t.moonSeparation).toBe('18 Rp'); // resolved against the scenario later
    expect(t.solve).toBe('cadence');
    expect(t.realizations).toBe(12);
  });

  it('the scenario parser accepts a budget block, and the block is read with flags taking precedence', () => {
    const doc = parse(scenarioText);
    expect(() => parseScenario(doc)).not.toThrow();
    const fromBlock = resolveBudgetTarget(doc, {});
    expect(fromBlock.probability).toBeCloseTo(0.8, 15);
    // The block still says `solve: precision`, the old name of `noise`: read as noise, with a note.
    expect(fromBlock.solve).toBe('noise');
    expect(fromBlock.deprecations).toEqual(['budget.solve: precision is deprecated: write noise (the old value is accepted in this release only)']);
    expect(resolveBudgetTarget(parse(scenarioText.replace('solve: precision', 'solve: noise')), {}).deprecations).toEqual([]);
    expect(fromBlock.channel).toBe('ttv');
    expect(fromBlock.moonMassKg).toBeCloseTo(2 * M_EARTH_KG, 0);
    expect(fromBlock.moonMassSource).toBe('budget.moon_mass');
    expect(fromBlock.realizations).toBe(30);
    const overridden = resolveBudgetTarget(doc, readBudgetFlags({ probability: '0.95', solve: 'transits' }));
    expect(overridden.probability).toBe(0.95);
    expect(overridden.solve).toBe('transits');
    expect(overridden.channel).toBe('ttv'); // still from the block
  });

  it('bad block values and unknown keys are reported under budget.<key>', () => {
    const doc = parse(scenarioText.replace('solve: precision', 'solve: money').replace('realizations: 30', 'realisations: 30'));
    const p = problemsOf(() => resolveBudgetTarget(doc, {}));
    expect(p.map((x) => x.path).sort()).toEqual(['budget.realisations', 'budget.solve']);
    expect(p.find((x) => x.path === 'budget.realisations')!.allowed).toMatch(/did you mean "realizations"/);
  });

  it('defaults: 100 realizations for one moon, 40 per moon with habitable: true', () => {
    const doc = parse(scenarioText.replace(/budget:[\s\S]*$/, ''));
    expect(resolveBudgetTarget(doc, {}).realizations).toBe(DEFAULT_BUDGET_REALIZATIONS);
    const h = resolveBudgetTarget({ ...doc, budget: { habitable: true } }, {});
    expect(h.realizations).toBe(DEFAULT_HABITABLE_REALIZATIONS);
    expect(h.habitable!.fraction).toBe(0.5);
  });

  it('library callers: a bad typed target is an InputError under target.<field>', () => {
    const doc = parse(scenarioText);
    const p = problemsOf(() => resolveBudgetTarget(doc, { probability: 1, realizations: 0 }));
    expect(p.map((x) => x.path).sort()).toEqual(['target.probability', 'target.realizations']);
  });
});

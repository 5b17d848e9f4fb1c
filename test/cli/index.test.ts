import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import * as lib from '../../src/index.js';

describe('library API (DESIGN.md names)', () => {
  it('exports the functions other tools rely on', () => {
    for (const name of ['transitFlux', 'pairTransitFlux', 'loadScenario', 'runSweep', 'computeLimits', 'vetClaim', 'planBudget']) {
      expect(typeof (lib as Record<string, unknown>)[name], name).toBe('function');
    }
  });

  it('exports the typed JSON forms of the outputs and their schema ids (docs/vocabulary.md)', () => {
    for (const name of ['limitsToJson', 'vetToJson', 'budgetToJson']) expect(typeof (lib as Record<string, unknown>)[name], name).toBe('function');
    expect([lib.LIMITS_SCHEMA, lib.VET_SCHEMA, lib.BUDGET_SCHEMA, lib.CELLS_SCHEMA, lib.RUN_SCHEMA, lib.SUMMARY_SCHEMA]).toEqual([
      'moonsieve/limits/1', 'moonsieve/vet/2', 'moonsieve/budget/1', 'moonsieve/cells/2', 'moonsieve/run/1', 'moonsieve/summary/2',
    ]);
  });

  it('VERSION matches package.json (written into every output)', () => {
    const pkg = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string };
    expect(lib.VERSION).toBe(pkg.version);
  });
});

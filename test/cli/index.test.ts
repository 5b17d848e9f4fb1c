import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import * as lib from '../../src/index.js';

describe('library API (DESIGN.md names)', () => {
  it('exports the functions other tools rely on', () => {
    for (const name of ['transitFlux', 'pairTransitFlux', 'loadScenario', 'runSweep', 'computeLimits', 'vetClaim', 'planBudget']) {
      expect(typeof (lib as Record<string, unknown>)[name], name).toBe('function');
    }
  });

  it('VERSION matches package.json (written into every output)', () => {
    const pkg = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string };
    expect(lib.VERSION).toBe(pkg.version);
  });
});

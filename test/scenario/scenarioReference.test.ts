import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { renderScenarioReference } from '../../src/docs/scenarioReference.js';
import { SCENARIO_FIELDS } from '../../src/scenario/fields.js';

const committed = readFileSync(new URL('../../docs/scenario-reference.md', import.meta.url), 'utf8');

describe('docs/scenario-reference.md', () => {
  it('equals the text generated from the field table (run `npm run docs:scenario` after changing a field)', () => {
    expect(committed).toBe(renderScenarioReference());
  });

  it('documents every field of the table', () => {
    const missing = SCENARIO_FIELDS.filter((f) => !committed.includes(`| \`${f.path}\` |`)).map((f) => f.path);
    expect(missing).toEqual([]);
  });

  it('documents the fields that once lived only in error messages', () => {
    for (const p of ['instrument.red_noise', 'observation.duty_cycle', 'observation.missed_fraction', 'observation.gap_length', 'instrument.ground.floor', 'instrument.ground.band', 'observation.duration', 'planet.mass_radius']) {
      expect(committed).toContain(`\`${p}\``);
    }
  });
});

describe("the README's scenario example", () => {
  it('is a valid scenario, also with its commented alternatives', async () => {
    const { parseScenarioText } = await import('../../src/scenario/loadScenario.js');
    const readme = readFileSync(new URL('../../README.md', import.meta.url), 'utf8');
    const m = /```yaml\n(name: Example b[\s\S]*?)```/.exec(readme);
    expect(m).not.toBeNull();
    const text = m![1];
    const s = parseScenarioText(text, 'README');
    expect(s.observation.transits).toBe(10); // 3 Julian years / 120 d = 9.13 → conjunctions n = 0…9
    const alt = text
      .replace('noise: 300 ppm per 1 h   # or a ground budget:', '')
      .replace('# ground:', 'ground:')
      .replace('# red_noise:', 'red_noise:')
      .replace('radius: 0.9 Rjup ', 'mass_radius: chen_kipping_2017 ')
      .replace('duration: 3 yr ', 'transits: 9 ')
      .replace('# duty_cycle: 0.8, gap_length: 20 min, missed_fraction: 0.2 (weather)', 'duty_cycle: 0.8\n  gap_length: 20 min\n  missed_fraction: 0.2');
    const t = parseScenarioText(alt, 'README alternatives');
    expect(t.instrument.ground?.band).toBe('R');
    expect(t.instrument.redNoise?.model).toBe('power_law');
    expect(t.planet.massRadiusRelation).toBe('chen_kipping_2017');
    expect(t.observation.missedFraction).toBe(0.2);
  });
});

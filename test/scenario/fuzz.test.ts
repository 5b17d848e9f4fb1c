import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { parseScenario } from '../../src/scenario/parseScenario.js';
import { parseScenarioText } from '../../src/scenario/loadScenario.js';
import { InputError } from '../../src/scenario/errors.js';
import { SCENARIO_FIELDS } from '../../src/scenario/fields.js';

/** Two valid documents that between them take both sides of each branch; each run replaces one or more fields. */
function validDoc(other = false): Record<string, any> {
  if (other) {
    return {
      star: { mass: '1.1 Msun', radius: '1.2 Rsun', teff: '6100 K', age: '2 Gyr', limb_darkening: { q1: 0.3, q2: 0.3 } },
      planet: { mass: '8 Mearth', mass_radius: 'chen_kipping_2017', period: 30, inclination: 89.5, eccentricity: 0.1, periapsis: 30 },
      moon: { mass: '0.1 Mearth', radius: '0.4 Rearth', separation: '0.3 hill', inclination: 10, direction: 'retrograde' },
      instrument: { cadence: 10, exposure: '9 min', noise: '400 ppm per 1 h', red_noise: { model: 'power_law', amplitude: '100 ppm per 30 min', slope: 1 } },
      observation: { transits: 6, baseline: 4, duty_cycle: 0.7, gap_length: 15, missed_fraction: 0.2 },
    };
  }
  return {
    name: 'Fuzz b',
    star: { mass: '0.9 Msun', radius: '0.9 Rsun', teff: 5400, limb_darkening: { u1: 0.4, u2: 0.2 } },
    planet: { mass: '0.5 Mjup', radius: '0.8 Rjup', period: '100 d', impact_parameter: 0.2 },
    moon: { mass: '0.5 Mearth', density: '3 g/cm^3', separation: '15 Rp' },
    instrument: { cadence: '2 min', ground: { aperture: '1 m', magnitude: 11, floor: '100 ppm per 10 min' }, red_noise: { model: 'drw', amplitude: '100 ppm', timescale: '30 min' } },
    observation: { duration: '2 yr' },
    detection: { false_alarm: '1 %' },
  };
}

const leafPaths = SCENARIO_FIELDS.filter((f) => f.type !== 'mapping').map((f) => f.path);

const anyValue = fc.oneof(
  fc.double(),
  fc.integer(),
  fc.constantFrom(0, -0, -1, 1e-300, 1e300, Number.MAX_VALUE, Number.MIN_VALUE, 0.5, 1, 2, 1e4, 1e9),
  fc.string(),
  fc.constantFrom('1e999 Msun', '-1 d', '0 ppm per 0 s', '1 ppm per -1 h', 'NaN', 'Infinity', '1 kg/s', '3 yr', '0.0001 s', '1e-30 s', '5 Rp', '0 hill', '1e9 hill', 'abc', '', ' ', '1 %', '50 ppm per 1 h', 'R', 'chen_kipping_2017', 'drw', 'power_law', '\u001b[2J'),
  fc.constant(null),
  fc.array(fc.integer(), { maxLength: 3 }),
  fc.dictionary(fc.string({ maxLength: 4 }), fc.integer(), { maxKeys: 2 }),
);

function nonFinite(x: unknown, path = ''): string[] {
  if (typeof x === 'number') return Number.isFinite(x) ? [] : [path];
  if (x === null || typeof x !== 'object') return [];
  return Object.entries(x).flatMap(([k, v]) => nonFinite(v, path ? `${path}.${k}` : k));
}

function setPath(doc: Record<string, any>, path: string, value: unknown): void {
  const keys = path.split('.');
  let node = doc;
  for (const k of keys.slice(0, -1)) {
    if (node[k] === null || typeof node[k] !== 'object') node[k] = {};
    node = node[k];
  }
  node[keys[keys.length - 1]] = value;
}

describe('the scenario validator on random input', () => {
  it('accepts the valid base documents', () => {
    expect(() => parseScenario(validDoc())).not.toThrow();
    expect(() => parseScenario(validDoc(true))).not.toThrow();
  });

  it('returns a scenario or throws an InputError, never anything else (random values in 1–4 fields)', () => {
    fc.assert(
      fc.property(fc.boolean(), fc.array(fc.tuple(fc.constantFrom(...leafPaths), anyValue), { minLength: 1, maxLength: 4 }), (other, edits) => {
        const doc = validDoc(other);
        for (const [p, v] of edits) setPath(doc, p, v);
        let s;
        try {
          s = parseScenario(doc);
        } catch (e) {
          if (!(e instanceof InputError)) throw e;
          // Every problem line is short: values are cut at 80 characters.
          for (const line of e.message.split('\n')) expect(line.length).toBeLessThan(700);
          return;
        }
        // An accepted scenario holds only finite numbers.
        expect(nonFinite(s)).toEqual([]);
      }),
      { numRuns: 400, seed: 20261205 },
    );
  });

  it('random text is a scenario or an InputError', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 200 }), (text) => {
        try {
          parseScenarioText(text, 'fuzz.yaml');
        } catch (e) {
          if (!(e instanceof InputError)) throw e;
        }
      }),
      { numRuns: 300, seed: 7 },
    );
  });
});

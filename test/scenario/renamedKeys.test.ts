/**
 * Keys renamed for one vocabulary (docs/vocabulary.md) are still read under their old name for
 * one release, with a caution naming the new one; both spellings at once are refused.
 */
import { describe, it, expect } from 'vitest';
import { parseScenarioText } from '../../src/scenario/loadScenario.js';
import { cautionNotes } from '../../src/scenario/parseScenario.js';
import { InputError } from '../../src/scenario/errors.js';

const doc = (planetExtra: string) => `name: Renamed keys
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, limb_darkening: {u1: 0.4, u2: 0.26}}
planet: {mass: 1 Mjup, radius: 1 Rjup, period: 200 d, eccentricity: 0.2, impact_parameter: 0.3${planetExtra}}
instrument: {cadence: 2 min, noise: 300 ppm}
observation: {transits: 4}
`;

describe('planet.periastron → planet.periapsis', () => {
  it('reads the old key as the new one, with a caution naming the new key', () => {
    const now = parseScenarioText(doc(', periapsis: 70 deg'), 'now');
    const old = parseScenarioText(doc(', periastron: 70 deg'), 'old');
    expect(old.planet.omegaRad).toBe(now.planet.omegaRad);
    expect(now.planet.omegaRad).toBeCloseTo((70 * Math.PI) / 180, 15); // 70 degrees in radians (definition)
    expect(old).toEqual(now); // the same model (cautions are not enumerable)
    expect(cautionNotes(now)).toEqual([]);
    expect(cautionNotes(old)).toEqual(['planet.periastron: deprecated name: write planet.periapsis (the old name is accepted in this release only)']);
  });

  it('refuses both spellings at once, naming the old key', () => {
    let err: unknown = null;
    try {
      parseScenarioText(doc(', periapsis: 70 deg, periastron: 70 deg'), 'both');
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).problems.map((p) => p.path)).toEqual(['planet.periastron']);
  });
});

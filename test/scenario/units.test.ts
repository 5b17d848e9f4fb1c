import { describe, it, expect } from 'vitest';
import { parseQuantity } from '../../src/scenario/units.js';
import { InputError } from '../../src/scenario/errors.js';
import { AU_M, M_JUP_KG, R_EARTH_M } from '../../src/physics/constants.js';

describe('parseQuantity', () => {
  // Expected SI values: IAU 2015 B3 nominal values / IAU 2012 au via constants.ts, and SI time units.
  it('parses the astronomer spellings', () => {
    expect(parseQuantity('0.3 Mjup', 'planet.mass', 'mass')).toBeCloseTo(0.3 * M_JUP_KG, -15);
    expect(parseQuantity('0.3 M_jup', 'planet.mass', 'mass')).toBeCloseTo(0.3 * M_JUP_KG, -15);
    expect(parseQuantity('2 Rearth', 'moon.radius', 'length')).toBeCloseTo(2 * R_EARTH_M, 3);
    expect(parseQuantity('2 R_earth', 'moon.radius', 'length')).toBeCloseTo(2 * R_EARTH_M, 3);
    expect(parseQuantity('1 AU', 'x', 'length')).toBe(AU_M);
    expect(parseQuantity('1 au', 'x', 'length')).toBe(AU_M);
    expect(parseQuantity('180 d', 'planet.period', 'time')).toBe(180 * 86400);
    expect(parseQuantity('2 min', 'instrument.cadence', 'time')).toBe(120);
    expect(parseQuantity('1 yr', 'x', 'time')).toBe(365.25 * 86400);
    expect(parseQuantity('60 ppm', 'instrument.noise', 'fraction')).toBeCloseTo(60e-6, 18);
    expect(parseQuantity('0.1 %', 'x', 'fraction')).toBeCloseTo(1e-3, 18);
    expect(parseQuantity('3 g/cm^3', 'moon.density', 'density')).toBeCloseTo(3000, 9);
    expect(parseQuantity('90 deg', 'x', 'angle')).toBeCloseTo(Math.PI / 2, 15);
  });

  it('reads bare numbers in the documented unit, and only where allowed', () => {
    expect(parseQuantity(12.5, 'planet.period', 'time', 86400, 'days')).toBe(12.5 * 86400);
    expect(parseQuantity('12.5', 'planet.period', 'time', 86400, 'days')).toBe(12.5 * 86400);
    expect(() => parseQuantity(12.5, 'planet.mass', 'mass')).toThrow(/a unit is required/);
  });

  it('rejects a wrong kind of unit with the field and the accepted kind', () => {
    try {
      parseQuantity('0.3 furlong', 'planet.mass', 'mass');
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      const msg = (e as Error).message;
      expect(msg).toContain('planet.mass');
      expect(msg).toContain('"0.3 furlong"');
      expect(msg).toContain('a mass');
    }
    expect(() => parseQuantity('1 Mjup', 'planet.radius', 'length')).toThrow(/planet\.radius.*not a unit of length/);
    expect(() => parseQuantity('heavy', 'planet.mass', 'mass')).toThrow(/planet\.mass/);
    expect(() => parseQuantity(Number.NaN, 'planet.mass', 'mass', 1, 'kg')).toThrow(/planet\.mass/);
  });
});

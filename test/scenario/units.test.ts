import { describe, it, expect } from 'vitest';
import { COMMON_UNITS, mathjsUnitValue, parseQuantity, productUnitValue, type QuantityKind } from '../../src/scenario/units.js';
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

describe('COMMON_UNITS (the table that spares mathjs)', () => {
  const kinds: QuantityKind[] = ['mass', 'length', 'time', 'angle', 'temperature', 'density', 'fraction', 'power'];
  // Reference: mathjs 15 (a general-purpose units library from the npm registry), the path
  // every unit outside the table takes. Each entry must give its value to 2 ulp (mathjs builds
  // g/cm^3 as 1e-3/1e-6 = 999.9999999999999) and be of no other kind.
  it('agrees with mathjs on every entry and every kind', () => {
    for (const [text, { kind, si }] of Object.entries(COMMON_UNITS)) {
      const ref = mathjsUnitValue(text, kind);
      expect(typeof ref, text).toBe('number');
      expect(Math.abs(si - (ref as number)), text).toBeLessThanOrEqual(4.5e-16 * si);
      for (const other of kinds) if (other !== kind) expect(mathjsUnitValue(text, other), `${text} as ${other}`).toBe('wrong kind');
    }
  });

  it('is what parseQuantity uses, aliases included, and the rest still goes to mathjs', () => {
    expect(parseQuantity('2 M_sun', 'x', 'mass')).toBe(2 * COMMON_UNITS.Msun.si);
    expect(parseQuantity('3 hr', 'x', 'time')).toBe(3 * 3600);
    expect(parseQuantity('4 g/cm^3', 'x', 'density')).toBe(4000);
    expect(parseQuantity('2 %', 'x', 'fraction')).toBe(0.02);
    // Outside the table (mathjs): 1 mm = 1e-3 m, 1 arcsec = π/648000 rad (BIPM 2019, SI Brochure, Table 8).
    expect(parseQuantity('5 mm', 'x', 'length')).toBeCloseTo(5e-3, 18);
    expect(parseQuantity('3600 arcsec', 'x', 'angle')).toBeCloseTo(Math.PI / 180, 15);
    expect(() => parseQuantity('1 kg', 'planet.radius', 'length')).toThrow(/planet\.radius.*not a unit of length/);
  });
});

describe('productUnitValue (products and powers of table units, without mathjs)', () => {
  const kinds: QuantityKind[] = ['mass', 'length', 'time', 'angle', 'temperature', 'density', 'fraction', 'power'];
  // Reference: mathjs 15, as above, on the same texts: the same SI value to a few ulp (the
  // order of the multiplications differs) and the same verdict for every other kind.
  const texts = [
    'kg m^-3', 'kg/m^3', 'g cm^-3', 'g/cm^3', 'g / cm^3', 'kg*m^-3', 'kg * m^-3', 'Mearth Rearth^-3', 'M_jup/R_jup^3',
    'Msun/AU^3', 'W m^-2', 'Lsun', 'kg m^2 s^-3', 'kg*m^2/s^3', 'Lsun/Rsun^2', 'm^3 kg^-1 s^-2',
    'h', 'min^1', 'd^2/d', 'km', 'cm^2/cm', 'deg', 'rad s^-1', 'K', 'K^2/K', 'kg m', 'm^-3', 'g cm^+3', 'yr/s',
  ];
  it('agrees with mathjs on every text and every kind', () => {
    for (const text of texts) {
      for (const kind of kinds) {
        const mine = productUnitValue(text, kind);
        if (mine === undefined) {
          expect(kind === 'fraction', `${text} as ${kind} was not read`).toBe(true);
          continue;
        }
        const ref = mathjsUnitValue(text, kind);
        if (mine === 'wrong kind') expect(ref, `${text} as ${kind}`).toBe('wrong kind');
        else {
          expect(typeof ref, `${text} as ${kind}`).toBe('number');
          expect(Math.abs(mine - (ref as number)), `${text} as ${kind}`).toBeLessThanOrEqual(1e-15 * mine);
        }
      }
    }
  });

  it('leaves to mathjs what is not a plain product of table units', () => {
    // Not table units, fractions in a product, two factors after "/", no caret, a fractional power.
    for (const text of ['mm', 'g/cc', 'ppm m', '% kg', 'kg/m s', 'kg m-3', 'm^1.5', 'm^(-3)', '/m', 'kg//m', 'm^0'])
      expect(productUnitValue(text, 'density'), text).toBeUndefined();
    expect(productUnitValue('kg m^-3', 'fraction')).toBeUndefined();
  });

  it('is what parseQuantity uses for such texts: "4000 kg m^-3" is the density of "4 g/cm^3"', () => {
    // 1 g cm⁻³ = 1000 kg m⁻³ (BIPM 2019, SI Brochure, Table 8: 1 g = 10⁻³ kg; 1 cm = 10⁻² m).
    expect(parseQuantity('4000 kg m^-3', 'moon.density', 'density')).toBe(4000);
    expect(parseQuantity('4 g cm^-3', 'moon.density', 'density')).toBeCloseTo(4000, 9);
    expect(() => parseQuantity('4 g cm^-2', 'moon.density', 'density')).toThrow(/moon\.density.*not a unit of density/);
  });
});

import { describe, it, expect } from 'vitest';
import { ttvAlias, aliasFamily } from '../../src/physics/ttvAlias.js';
import { DAY_S } from '../../src/physics/constants.js';

describe('ttvAlias', () => {
  it('Earth–Moon: P_B/P_S = 365.256363/27.321661 = 13.36875, ν = 0.36875 (periods from memory; computed)', () => {
    const r = ttvAlias(365.256363 * DAY_S, 27.321661 * DAY_S);
    expect(r.periodRatio).toBeCloseTo(13.36875, 5);
    expect(r.aliasFrequencyPerEpoch).toBeCloseTo(0.36875, 5);
    expect(r.aliasPeriodEpochs).toBeCloseTo(1 / 0.368750, 3); // 2.712 yr
    expect(r.aliasPeriodS / (365.256363 * DAY_S)).toBeCloseTo(2.712, 3);
  });

  it('sampling a sinusoid of frequency P_B/P_S per epoch at integer epochs equals sampling it at ν (folding, computed in the test)', () => {
    const ratio = 365.256363 / 27.321661;
    const r = ttvAlias(365.256363 * DAY_S, 27.321661 * DAY_S);
    for (let n = 0; n < 30; n++) {
      const direct = Math.cos(2 * Math.PI * ratio * n);
      const folded = Math.cos(2 * Math.PI * r.aliasFrequencyPerEpoch * n);
      expect(direct).toBeCloseTo(folded, 9);
    }
  });

  it('every member of the alias family folds back to the same ν (computed in the test)', () => {
    const pB = 120 * DAY_S;
    const nu = 0.27;
    const fam = aliasFamily(pB, nu, 6);
    expect(fam.length).toBe(12);
    for (const m of fam) {
      expect(ttvAlias(pB, m.moonPeriodS).aliasFrequencyPerEpoch).toBeCloseTo(nu, 10);
    }
    expect(fam[0]).toEqual({ harmonic: 1, sign: -1, moonPeriodS: pB / 0.73 });
  });

  it('ν = ½ lists each period once; bad input throws RangeError', () => {
    const fam = aliasFamily(10, 0.5, 3);
    expect(fam.map((m) => 10 / m.moonPeriodS)).toEqual([0.5, 1.5, 2.5, 3.5]);
    expect(() => ttvAlias(0, 1)).toThrow(/barycentrePeriodS/);
    expect(() => aliasFamily(1, 0.7)).toThrow(/aliasFrequencyPerEpoch/);
  });
});

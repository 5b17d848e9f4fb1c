import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  impactParameter,
  inclinationFromImpact,
  transitDurations,
  type TransitGeometry,
} from '../../src/physics/transitDuration.js';
import { AU_M, DAY_S, HOUR_S, R_EARTH_M, R_SUN_M } from '../../src/physics/constants.js';

const DEG = Math.PI / 180;

/**
 * Exact contact times by root-finding on the Keplerian sky separation, independent of the
 * closed forms: d(f) = r(f) √(cos²(ω+f) + sin²(ω+f) cos² i), r = a(1 − e²)/(1 + e cos f)
 * (Winn 2010, arXiv:1001.2010, eqs. 1–3); time from f via tan(E/2) = √((1−e)/(1+e)) tan(f/2) and
 * M = E − e sin E (Murray & Dermott 1999, eqs. 2.46, 2.52). Returns the time between the two
 * crossings of d = c around conjunction f = π/2 − ω (0 if d never drops below c).
 */
function exactDuration(g: TransitGeometry, c: number): number {
  const { aOverRstar: a, eccentricity: e, omegaRad: w, inclinationRad: inc, periodS } = g;
  const sep = (f: number) => {
    const r = (a * (1 - e * e)) / (1 + e * Math.cos(f));
    const s = Math.sin(w + f);
    return r * Math.sqrt(1 - s * s * Math.sin(inc) ** 2);
  };
  const fc = Math.PI / 2 - w;
  if (sep(fc) >= c) return 0;
  const root = (inner: number, outer: number) => {
    for (let k = 0; k < 200; k++) {
      const mid = 0.5 * (inner + outer);
      if (sep(mid) < c) inner = mid;
      else outer = mid;
    }
    return 0.5 * (inner + outer);
  };
  const f1 = root(fc, fc - 1);
  const f4 = root(fc, fc + 1);
  const meanAnomaly = (f: number) => {
    const E = 2 * Math.atan2(Math.sqrt(1 - e) * Math.sin(f / 2), Math.sqrt(1 + e) * Math.cos(f / 2));
    return E - e * Math.sin(E);
  };
  let dM = meanAnomaly(f4) - meanAnomaly(f1);
  dM -= 2 * Math.PI * Math.floor(dM / (2 * Math.PI));
  return (dM / (2 * Math.PI)) * periodS;
}

function geometry(over: Partial<TransitGeometry> & { aOverRstar: number; inclinationRad: number }): TransitGeometry {
  const g = { periodS: 10 * DAY_S, radiusRatio: 0.1, eccentricity: 0, omegaRad: 90 * DEG, impactParameter: 0, ...over };
  g.impactParameter = impactParameter(g.aOverRstar, g.inclinationRad, g.eccentricity, g.omegaRad);
  return g;
}

describe('transitDurations', () => {
  it('is exact for circular orbits (full and grazing) against root-finding on the sky separation', () => {
    // Expected: exactDuration above (numerical, computed in this test).
    for (const incDeg of [90, 89, 88.5, 87.5]) {
      const g = geometry({ aOverRstar: 20, inclinationRad: incDeg * DEG, eccentricity: 0 });
      const d = transitDurations(g);
      expect(d.t14S / exactDuration(g, 1.1) - 1).toBeCloseTo(0, 10);
      expect(d.t23S).toBeCloseTo(exactDuration(g, 0.9), 4);
    }
    // b = 20 cos 87° = 1.047: grazing, no second/third contact.
    const graze = geometry({ aOverRstar: 20, inclinationRad: 87 * DEG });
    expect(graze.impactParameter).toBeGreaterThan(0.9);
    const dg = transitDurations(graze);
    expect(dg.t23S).toBe(0);
    expect(dg.t14S / exactDuration(graze, 1.1) - 1).toBeCloseTo(0, 10);
    expect(dg.ingressS).toBe(dg.t14S / 2);
  });

  it('matches the exact eccentric durations to the Winn (2010) eq. 16 level', () => {
    // P = 10 d, a/R* = 20, p = 0.1, e = 0.3, ω = 90°, i = 89°: exact T14 = 3.00879 h, T23 = 2.42935 h
    // (root-finding, computed here and in the project reference notes); Winn eq. 16 gives 3.00808 h, 2.42901 h.
    const g = geometry({ aOverRstar: 20, inclinationRad: 89 * DEG, eccentricity: 0.3, omegaRad: 90 * DEG });
    expect(g.impactParameter).toBeCloseTo(0.244334, 6);
    const exact14 = exactDuration(g, 1.1);
    const exact23 = exactDuration(g, 0.9);
    expect(exact14 / HOUR_S).toBeCloseTo(3.00879, 5);
    expect(exact23 / HOUR_S).toBeCloseTo(2.42935, 5);
    const d = transitDurations(g);
    expect(d.t14S / HOUR_S).toBeCloseTo(3.00808, 5);
    expect(d.t23S / HOUR_S).toBeCloseTo(2.42901, 5);
    expect(Math.abs(d.t14S / exact14 - 1)).toBeLessThan(3e-4);
    // Other orientations and eccentricities: eq. 16 stays within 1e-3 of the exact value for these
    // moderately short transits (measured: 1.2e-5 to 8.1e-4, the largest for e = 0.6, ω = 10°).
    for (const [e, wDeg, incDeg] of [
      [0.1, 30, 89.5],
      [0.5, -60, 89.7],
      [0.3, 200, 88.8],
      [0.6, 10, 89.2],
    ]) {
      const gg = geometry({ aOverRstar: 20, inclinationRad: incDeg * DEG, eccentricity: e, omegaRad: wDeg * DEG });
      expect(gg.impactParameter).toBeLessThan(0.9);
      expect(Math.abs(transitDurations(gg).t14S / exactDuration(gg, 1.1) - 1)).toBeLessThan(1e-3);
    }
  });

  it('gives the Earth crossing the Sun edge-on about 13 h', () => {
    // Computed from IAU 2015 B3 R_sun, R_earth and the IAU 2012 au, sidereal year 365.256363 d (from memory):
    // T14 = 13.0955 h, T0 = R* P/(π a) = 12.9765 h, ingress ≈ T0 p = 7.138 min (Winn 2010 eqs. 18–19);
    // "about 13 hours" is common knowledge.
    const periodS = 365.256363 * DAY_S;
    const aOverRstar = AU_M / R_SUN_M;
    const p = R_EARTH_M / R_SUN_M;
    const d = transitDurations({
      periodS, aOverRstar, radiusRatio: p, impactParameter: 0, inclinationRad: Math.PI / 2, eccentricity: 0, omegaRad: 0,
    });
    expect(Math.abs(d.t14S / HOUR_S - 13.1)).toBeLessThan(0.01);
    const t0S = periodS / (Math.PI * aOverRstar);
    expect(t0S / HOUR_S).toBeCloseTo(12.98, 2);
    expect(Math.abs(d.tMidS / t0S - 1)).toBeLessThan(1e-4); // T ≈ T0 √(1 − b²), Winn 2010 eq. 19
    expect(Math.abs(d.ingressS / (t0S * p) - 1)).toBeLessThan(1e-3); // τ ≈ T0 p/√(1 − b²), Winn 2010 eq. 18
  });

  it('returns zero durations when there is no transit (b ≥ 1 + p)', () => {
    // Expected: definition (no contact), Winn 2010 §2.3.
    const d = transitDurations({ periodS: DAY_S, aOverRstar: 10, radiusRatio: 0.1, impactParameter: 1.2, inclinationRad: 83 * DEG, eccentricity: 0, omegaRad: 0 });
    expect(d).toEqual({ t14S: 0, t23S: 0, tMidS: 0, ingressS: 0 });
  });

  it('rejects invalid geometry with a RangeError naming the field', () => {
    const ok: TransitGeometry = { periodS: DAY_S, aOverRstar: 10, radiusRatio: 0.1, impactParameter: 0.2, inclinationRad: 1.55, eccentricity: 0, omegaRad: 0 };
    expect(() => transitDurations({ ...ok, aOverRstar: 0.5 })).toThrow(/aOverRstar/);
    expect(() => transitDurations({ ...ok, radiusRatio: Number.NaN })).toThrow(/radiusRatio/);
    expect(() => transitDurations({ ...ok, eccentricity: 1 })).toThrow(/eccentricity/);
    expect(() => transitDurations({ ...ok, impactParameter: -0.1 })).toThrow(RangeError);
  });
});

describe('impact parameter', () => {
  it('is a cos i / R* for circular orbits and scales by (1 − e²)/(1 + e sin ω)', () => {
    // Winn 2010, arXiv:1001.2010, eq. 7.
    expect(impactParameter(20, 88 * DEG, 0, 1)).toBeCloseTo(20 * Math.cos(88 * DEG), 14);
    expect(impactParameter(20, 88 * DEG, 0.5, Math.PI / 2)).toBeCloseTo((20 * Math.cos(88 * DEG) * 0.75) / 1.5, 14);
  });

  it('inclinationFromImpact inverts impactParameter (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 2, max: 300, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 0.9, noNaN: true }),
        fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
        (aR, fraction, e, w) => {
          // b from 0 up to its largest value (i = 0) for this orbit, Winn 2010 eq. 7.
          const bMax = (aR * (1 - e * e)) / (1 + e * Math.sin(w));
          const b = fraction * bMax;
          const inc = inclinationFromImpact(b, aR, e, w);
          return Math.abs(impactParameter(aR, inc, e, w) - b) <= 1e-12 * Math.max(1, bMax);
        },
      ),
      { numRuns: 3000 },
    );
    expect(() => inclinationFromImpact(30, 20, 0, 0)).toThrow(/impactParameter/);
  });
});

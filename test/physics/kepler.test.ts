import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  eccentricAnomaly,
  eccentricFromTrueAnomaly,
  meanFromEccentricAnomaly,
  solveKepler,
  trueAnomalyFromEccentric,
} from '../../src/physics/kepler.js';
import { orbitalPeriod, semiMajorAxis } from '../../src/physics/keplerThirdLaw.js';
import { AU_M, DAY_S, G, GM_EARTH, GM_SUN } from '../../src/physics/constants.js';

const DEG = Math.PI / 180;

/** Plain bisection on E − e sin E − M over [M, M + e] for M in [0, π]: slow, simple, independent. */
function bisectKepler(m: number, e: number): number {
  let lo = m;
  let hi = Math.min(m + e, Math.PI);
  for (let k = 0; k < 200; k++) {
    const mid = 0.5 * (lo + hi);
    if (mid - e * Math.sin(mid) - m < 0) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

describe('solveKepler', () => {
  it('reproduces a published worked example', () => {
    // Meeus 1998, "Astronomical Algorithms", 2nd ed., Example 30.a (values from memory):
    // e = 0.100, M = 5° gives E = 5.554589° (printed to 1e-6°, so allow half a unit).
    expect(Math.abs(solveKepler(5 * DEG, 0.1) / DEG - 5.554589)).toBeLessThan(5e-7);
  });

  it('round-trips M → E → M to 1e-12 rad on a dense grid, including e = 0.98 and M near 0 and π', () => {
    // Expected: Kepler's equation itself (Murray & Dermott 1999, eq. 2.52); the residual must vanish.
    let worst = 0;
    const ms: number[] = [];
    for (let k = -2000; k <= 2000; k++) ms.push((Math.PI * k) / 2000);
    for (let k = 0; k <= 12; k++) {
      const tiny = 10 ** -k;
      ms.push(tiny, -tiny, Math.PI - tiny, -Math.PI + tiny);
    }
    for (const e of [0, 1e-6, 0.01, 0.1, 0.3, 0.5, 0.7, 0.9, 0.95, 0.98, 0.985, 0.99]) {
      for (const m of ms) {
        const E = solveKepler(m, e);
        worst = Math.max(worst, Math.abs(meanFromEccentricAnomaly(E, e) - m));
      }
    }
    expect(worst).toBeLessThan(1e-12);
  });

  it('round-trips to 1e-12 rad for random M (any revolution) and 0 ≤ e < 0.99 (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -20, max: 20, noNaN: true }),
        fc.double({ min: 0, max: 0.99, noNaN: true, maxExcluded: true }),
        (m, e) => Math.abs(solveKepler(m, e) - e * Math.sin(solveKepler(m, e)) - m) <= 1e-12,
      ),
      { numRuns: 5000 },
    );
  });

  it('agrees with plain bisection to 1e-12 rad near the hard corner e → 1, M → 0', () => {
    // Expected values: 200-step bisection in this test (computed, independent of the solver).
    for (const e of [0.9, 0.98, 0.99]) {
      for (const m of [1e-8, 1e-5, 1e-3, 0.05, 0.5, 2, 3.1, Math.PI]) {
        expect(Math.abs(solveKepler(m, e) - bisectKepler(m, e))).toBeLessThan(1e-12);
      }
    }
  });

  it('is odd in M and advances by 2π per revolution', () => {
    // Kepler's equation is odd and E − M is 2π-periodic (Murray & Dermott 1999, eq. 2.52).
    for (const e of [0.2, 0.9]) {
      for (const m of [0.3, 1.7, 3]) {
        expect(solveKepler(-m, e)).toBeCloseTo(-solveKepler(m, e), 14);
        expect(solveKepler(m + 6 * Math.PI, e) - 6 * Math.PI).toBeCloseTo(solveKepler(m, e), 12);
      }
    }
    // e = 0: E = M exactly (Murray & Dermott 1999, eq. 2.52).
    expect(solveKepler(1.234, 0)).toBe(1.234);
  });

  it('rejects out-of-domain input: RangeError from solveKepler, NaN from the kernel', () => {
    expect(() => solveKepler(1, 1)).toThrow(RangeError);
    expect(() => solveKepler(1, -0.1)).toThrow(/e \(eccentricity\)/);
    expect(() => solveKepler(Number.NaN, 0.1)).toThrow(/meanAnomaly/);
    expect(eccentricAnomaly(1, 1.5)).toBeNaN();
    expect(eccentricAnomaly(Number.POSITIVE_INFINITY, 0.5)).toBeNaN();
  });
});

describe('true and eccentric anomaly', () => {
  it('matches tan(f/2) = √((1+e)/(1−e)) tan(E/2) in the principal branch', () => {
    // Murray & Dermott 1999, "Solar System Dynamics", eq. 2.46.
    for (const e of [0, 0.3, 0.9, 0.98]) {
      for (let E = -3; E <= 3; E += 0.25) {
        const f = trueAnomalyFromEccentric(E, e);
        const expected = 2 * Math.atan(Math.sqrt((1 + e) / (1 - e)) * Math.tan(E / 2));
        expect(f).toBeCloseTo(expected, 12);
      }
    }
  });

  it('gives cos f = −e at E = π/2 and keeps the revolution count', () => {
    // cos f = (cos E − e)/(1 − e cos E) (Murray & Dermott 1999, §2.4): at E = π/2, cos f = −e.
    expect(Math.cos(trueAnomalyFromEccentric(Math.PI / 2, 0.6))).toBeCloseTo(-0.6, 14);
    // Apsides are fixed points: E = π ⇒ f = π, and a whole turn adds 2π.
    expect(trueAnomalyFromEccentric(Math.PI, 0.7)).toBeCloseTo(Math.PI, 14);
    expect(trueAnomalyFromEccentric(2.1 + 2 * Math.PI, 0.4) - 2 * Math.PI).toBeCloseTo(
      trueAnomalyFromEccentric(2.1, 0.4),
      12,
    );
  });

  it('eccentricFromTrueAnomaly inverts trueAnomalyFromEccentric (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -10, max: 10, noNaN: true }),
        fc.double({ min: 0, max: 0.99, noNaN: true }),
        (E, e) => Math.abs(eccentricFromTrueAnomaly(trueAnomalyFromEccentric(E, e), e) - E) < 1e-12,
      ),
      { numRuns: 2000 },
    );
  });
});

describe("Kepler's third law", () => {
  it("gives the Earth's orbit 1 AU for one sidereal year", () => {
    // Sidereal year 365.256363 d (from memory); Earth's mean semi-major axis 1.000001 AU (from memory,
    // J2000 mean elements) — the two-body value must agree to 1e-5 (planetary perturbations).
    const massKg = GM_SUN / G + GM_EARTH / G;
    const a = semiMajorAxis(365.256363 * DAY_S, massKg);
    expect(Math.abs(a / AU_M - 1)).toBeLessThan(1e-5);
  });

  it('round-trips period ↔ semi-major axis (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e3, max: 1e10, noNaN: true }),
        fc.double({ min: 1e20, max: 1e32, noNaN: true }),
        (periodS, massKg) => Math.abs(orbitalPeriod(semiMajorAxis(periodS, massKg), massKg) / periodS - 1) < 1e-14,
      ),
    );
  });

  it('rejects non-positive arguments with a RangeError naming them', () => {
    expect(() => semiMajorAxis(0, 1)).toThrow(/periodS/);
    expect(() => orbitalPeriod(1, -1)).toThrow(/totalMassKg/);
    expect(() => orbitalPeriod(Number.NaN, 1)).toThrow(RangeError);
  });
});

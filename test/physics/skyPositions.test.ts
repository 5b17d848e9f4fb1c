import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  orbitSystem,
  orbitSystemFromScenario,
  skyPositions,
  type MoonOrbitParams,
  type OrbitParams,
  type OrbitSystem,
} from '../../src/physics/skyPositions.js';
import { solveKepler, trueAnomalyFromEccentric } from '../../src/physics/kepler.js';
import { semiMajorAxis } from '../../src/physics/keplerThirdLaw.js';
import { impactParameter } from '../../src/physics/transitDuration.js';
import { minimumSeparationOffsetS } from '../../src/physics/transitTimes.js';
import { AU_M, DAY_S, G, GM_EARTH, GM_JUP, GM_SUN, R_SUN_M } from '../../src/physics/constants.js';
import type { Scenario } from '../../src/scenario/types.js';

const DEG = Math.PI / 180;
const M_EARTH = GM_EARTH / G;
/** Lunar GM 4902.800 km³/s² (from memory). */
const M_MOON = 4902.8e9 / G;
const M_JUP = GM_JUP / G;

function buffers(n: number) {
  const mk = () => new Float64Array(n);
  return { xp: mk(), yp: mk(), xm: mk(), ym: mk(), zp: mk(), zm: mk(), xb: mk(), yb: mk(), zb: mk() };
}

function run(sys: OrbitSystem, times: number[]) {
  const t = Float64Array.from(times);
  const out = buffers(t.length);
  skyPositions(t, sys, out);
  return out;
}

const warmJupiter = (moon: MoonOrbitParams | null, over: Partial<OrbitParams> = {}): OrbitParams => ({
  stellarRadiusM: R_SUN_M,
  periodS: 60 * DAY_S,
  semiMajorAxisM: semiMajorAxis(60 * DAY_S, GM_SUN / G),
  eccentricity: 0,
  omegaRad: 0,
  inclinationRad: 90 * DEG,
  moon,
  ...over,
});

const bigMoon = (over: Partial<MoonOrbitParams> = {}): MoonOrbitParams => ({
  planetMassKg: M_JUP,
  moonMassKg: 0.5 * M_EARTH,
  separationM: 1.5e9,
  eccentricity: 0,
  inclinationRad: 0,
  nodeRad: 0,
  periapsisRad: 0,
  phaseRad: 0,
  retrograde: false,
  ...over,
});

describe('skyPositions: hierarchical planet–moon geometry', () => {
  it('puts the Earth 4,670 km from the Earth–Moon barycentre', () => {
    // Expected: ≈ 4,670 km (common knowledge); from constants in this test,
    // 384,399 km × M_moon/(M_E + M_moon) = 4,670.7 km with lunar GM 4902.800 km³/s² and a = 384,399 km (from memory).
    const sys = orbitSystem({
      stellarRadiusM: R_SUN_M,
      periodS: 365.256363 * DAY_S,
      semiMajorAxisM: AU_M,
      eccentricity: 0.0167,
      omegaRad: 1.8,
      inclinationRad: 89.7 * DEG,
      moon: {
        planetMassKg: M_EARTH,
        moonMassKg: M_MOON,
        separationM: 384_399e3,
        eccentricity: 0,
        inclinationRad: 5.1 * DEG,
        nodeRad: 0.7,
        periapsisRad: 0.3,
        phaseRad: 1.1,
        retrograde: false,
      },
    });
    const times = Array.from({ length: 50 }, (_, k) => k * 0.9 * DAY_S);
    const o = run(sys, times);
    for (let k = 0; k < times.length; k++) {
      const dKm =
        (Math.hypot(o.xp[k] - o.xb[k], o.yp[k] - o.yb[k], o.zp[k] - o.zb[k]) * R_SUN_M) / 1e3;
      expect(Math.abs(dKm - 4670)).toBeLessThan(2);
    }
    // Period from Kepler's third law: 27.2845 d for a two-body Earth–Moon (computed from constants in this test).
    expect(sys.moonPeriodS / DAY_S).toBeCloseTo(2 * Math.PI * Math.sqrt(384_399e3 ** 3 / (G * (M_EARTH + M_MOON))) / DAY_S, 10);
  });

  it('mass-weighted planet and moon positions average to the barycentre (property)', () => {
    // Expected: barycentre definition M_P r_P + M_S r_M = (M_P + M_S) B (exact up to rounding).
    fc.assert(
      fc.property(
        fc.record({
          e: fc.double({ min: 0, max: 0.9, noNaN: true }),
          w: fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
          i: fc.double({ min: 80 * DEG, max: 100 * DEG, noNaN: true }),
          eS: fc.double({ min: 0, max: 0.9, noNaN: true }),
          iS: fc.double({ min: 0, max: Math.PI, noNaN: true }),
          node: fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
          peri: fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
          phase: fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
          retro: fc.boolean(),
          massRatio: fc.double({ min: 1e-6, max: 0.5, noNaN: true }),
          t: fc.double({ min: -1e8, max: 1e8, noNaN: true }),
        }),
        (r) => {
          const mP = M_JUP;
          const mS = r.massRatio * M_JUP;
          const sys = orbitSystem(
            warmJupiter(
              bigMoon({ moonMassKg: mS, eccentricity: r.eS, inclinationRad: r.iS, nodeRad: r.node, periapsisRad: r.peri, phaseRad: r.phase, retrograde: r.retro }),
              { eccentricity: r.e, omegaRad: r.w, inclinationRad: r.i },
            ),
          );
          const o = run(sys, [r.t]);
          const tol = 1e-12 * 60; // a/R* ≈ 60 here
          return (
            Math.abs((mP * o.xp[0] + mS * o.xm[0]) / (mP + mS) - o.xb[0]) < tol &&
            Math.abs((mP * o.yp[0] + mS * o.ym[0]) / (mP + mS) - o.yb[0]) < tol &&
            Math.abs((mP * o.zp[0] + mS * o.zm[0]) / (mP + mS) - o.zb[0]) < tol
          );
        },
      ),
      { numRuns: 300 },
    );
  });

  it('follows Winn (2010) eqs. 2–4 for the barycentre, t = 0 at conjunction with Y = −b', () => {
    // Expected: X = −r cos(ω+f), Y = −r sin(ω+f) cos i, Z = r sin(ω+f) sin i, r = a(1−e²)/(1+e cos f)
    // (Winn 2010, arXiv:1001.2010, eqs. 1–4), evaluated here from f; at conjunction Y = −b (Winn eq. 7).
    const e = 0.3;
    const w = 40 * DEG;
    const inc = 87 * DEG;
    const params = warmJupiter(null, { eccentricity: e, omegaRad: w, inclinationRad: inc });
    const sys = orbitSystem(params);
    const aR = params.semiMajorAxisM / params.stellarRadiusM;
    const o0 = run(sys, [0]);
    expect(o0.xb[0]).toBeCloseTo(0, 12);
    expect(o0.yb[0]).toBeCloseTo(-impactParameter(aR, inc, e, w), 12);
    expect(o0.zb[0]).toBeGreaterThan(0);
    // Compare at arbitrary times, with the conjunction mean anomaly taken from the frame.
    const times = [-3e6, -1e5, 0, 2.2e4, 7.7e5, 4e6];
    const o = run(sys, times);
    times.forEach((t, k) => {
      const E = solveKepler(sys.barycentre.meanAnomalyAtZeroRad + (2 * Math.PI * t) / params.periodS, e);
      const f = trueAnomalyFromEccentric(E, e);
      const r = (aR * (1 - e * e)) / (1 + e * Math.cos(f));
      expect(o.xb[k]).toBeCloseTo(-r * Math.cos(w + f), 11);
      expect(o.yb[k]).toBeCloseTo(-r * Math.sin(w + f) * Math.cos(inc), 11);
      expect(o.zb[k]).toBeCloseTo(r * Math.sin(w + f) * Math.sin(inc), 11);
      expect(o.xp[k]).toBe(o.xb[k]); // no moon: the planet sits at B
      expect(o.xm[k]).toBeNaN();
    });
  });

  it('edge-on circular system: barycentre crosses x = 0 toward +x at t = 0; planet within the reflex offset', () => {
    // Expected: sense of motion from Winn 2010 eq. 2 (dX/df = r sin(ω+f) > 0 at f = π/2 − ω);
    // reflex offset a_S M_S/(M_P + M_S) (barycentre definition), computed here.
    const moon = bigMoon({ phaseRad: 1 });
    const sys = orbitSystem(warmJupiter(moon));
    const o = run(sys, [-60, 0, 60]);
    expect(o.xb[0]).toBeLessThan(0);
    expect(o.xb[1]).toBeCloseTo(0, 12);
    expect(o.xb[2]).toBeGreaterThan(0);
    const reflex = (moon.separationM * moon.moonMassKg) / (moon.planetMassKg + moon.moonMassKg) / R_SUN_M;
    expect(Math.abs(o.xp[1])).toBeLessThanOrEqual(reflex * (1 + 1e-12));
    expect(Math.abs(o.xp[1])).toBeGreaterThan(0.5 * reflex); // phase 1 rad: |sin| or |cos| is not small
  });

  it('a coplanar prograde moon moves across the sky in the same sense as the planet; retrograde reverses', () => {
    // Expected: convention stated in src/physics/skyPositions.ts (prograde = same sense as the planet's orbit).
    for (const inc of [90 * DEG, 88 * DEG]) {
      for (const retrograde of [false, true]) {
        const sys = orbitSystem(warmJupiter(bigMoon({ retrograde, phaseRad: 0.4 }), { inclinationRad: inc }));
        const dt = 10;
        const times: number[] = [];
        for (let k = 0; k < 200; k++) times.push(k * 0.013 * sys.moonPeriodS, k * 0.013 * sys.moonPeriodS + dt);
        const o = run(sys, times);
        let checked = 0;
        for (let k = 0; k < times.length; k += 2) {
          const relZ = o.zm[k] - o.zp[k];
          if (relZ <= 0.3 * (bigMoon().separationM / R_SUN_M)) continue; // well on the near side only
          const relVx = (o.xm[k + 1] - o.xp[k + 1] - (o.xm[k] - o.xp[k])) / dt;
          expect(retrograde ? relVx < 0 : relVx > 0).toBe(true);
          checked++;
        }
        expect(checked).toBeGreaterThan(40);
      }
    }
  });

  it('orients inclined moon orbits as documented (node on the planet orbital plane)', () => {
    // Expected (derived in this test from the stated rotation sequence, Murray & Dermott 1999 eq. 2.122):
    // edge-on planet orbit, moon at i_S = 90°: node 0 ⇒ orbit in the sky plane (relative z ≡ 0);
    // node 90° ⇒ orbit in the Y–Z plane (relative x ≡ 0).
    const times = Array.from({ length: 30 }, (_, k) => k * 3.7e4);
    const inSky = run(orbitSystem(warmJupiter(bigMoon({ inclinationRad: 90 * DEG, nodeRad: 0, eccentricity: 0.2, periapsisRad: 1 }))), times);
    const inYZ = run(orbitSystem(warmJupiter(bigMoon({ inclinationRad: 90 * DEG, nodeRad: 90 * DEG, eccentricity: 0.2, periapsisRad: 1 }))), times);
    const aS = bigMoon().separationM / R_SUN_M;
    let maxSpanXY = 0;
    for (let k = 0; k < times.length; k++) {
      expect(Math.abs(inSky.zm[k] - inSky.zp[k])).toBeLessThan(1e-12 * aS * 1e3);
      expect(Math.abs(inYZ.xm[k] - inYZ.xp[k])).toBeLessThan(1e-12 * aS * 1e3);
      maxSpanXY = Math.max(maxSpanXY, Math.abs(inSky.ym[k] - inSky.yp[k]));
    }
    expect(maxSpanXY).toBeGreaterThan(0.5 * aS); // it really leaves the orbital plane

    // Coplanar, edge-on: the moon is in front of the planet at f_S = π/2 − Ω_S − ω_S (stated convention).
    const node = 0.4;
    const peri = 0.9;
    const front = run(orbitSystem(warmJupiter(bigMoon({ nodeRad: node, periapsisRad: peri, phaseRad: Math.PI / 2 - node - peri }))), [0]);
    expect(front.xm[0] - front.xp[0]).toBeCloseTo(0, 12);
    expect(front.zm[0] - front.zp[0]).toBeCloseTo(aS, 12);
  });

  it('repeats after one period P when the moon period is P/10', () => {
    // Expected: periodicity of Keplerian motion; moon period set to P/10 by Kepler's third law (computed here).
    const P = 60 * DAY_S;
    const mS = 0.3 * M_EARTH;
    const aS = semiMajorAxis(P / 10, M_JUP + mS);
    const sys = orbitSystem(
      warmJupiter(bigMoon({ moonMassKg: mS, separationM: aS, eccentricity: 0.3, inclinationRad: 0.5, nodeRad: 1, periapsisRad: 2, phaseRad: 0.1 }), {
        eccentricity: 0.4,
        omegaRad: -1,
        inclinationRad: 89 * DEG,
      }),
    );
    expect(sys.moonPeriodS).toBeCloseTo(P / 10, 6);
    const times = Array.from({ length: 25 }, (_, k) => -P + (k * P) / 12.3);
    const a = run(sys, times);
    const b = run(sys, times.map((t) => t + P));
    const c = run(sys, times.map((t) => t + 5 * P));
    for (let k = 0; k < times.length; k++) {
      for (const key of ['xp', 'yp', 'zp', 'xm', 'ym', 'zm'] as const) {
        expect(Math.abs(b[key][k] - a[key][k])).toBeLessThan(1e-9);
        expect(Math.abs(c[key][k] - a[key][k])).toBeLessThan(1e-9);
      }
    }
  });

  it('orbitSystemFromScenario maps the SI scenario fields', () => {
    const scenario: Scenario = {
      name: 'kestrel-b test system (invented)',
      seed: 1,
      star: { massKg: GM_SUN / G, radiusM: R_SUN_M, teffK: 5772, ageS: 1e17, u1: 0.4, u2: 0.26, luminosityW: 3.8e26 },
      planet: {
        massKg: M_JUP, radiusM: 7e7, periodS: 60 * DAY_S, eccentricity: 0.1, omegaRad: 0.5,
        inclinationRad: 89.5 * DEG, impactParameter: 0.5, semiMajorAxisM: semiMajorAxis(60 * DAY_S, GM_SUN / G),
        albedo: 0.3, k2: 0.5, tidalQ: 1e5,
      },
      moon: {
        massKg: 0.5 * M_EARTH, radiusM: 5e6, separationM: 1.5e9, eccentricity: 0.05, inclinationRad: 0.1,
        nodeRad: 0.2, periapsisRad: 0.3, phaseRad: 0.4, retrograde: true, albedo: 0.3, k2: 0.3, tidalQ: 100,
      },
      instrument: { cadenceS: 60, exposureS: 60, noiseFraction: 1e-4, noiseTimescaleS: 3600, redNoise: null, ground: null },
      observation: { transits: 5, t0BjdTdb: 2_460_000, baselineS: 3 * 3600, dutyCycle: 1, gapLengthS: 1200, missedFraction: 0 },
      detection: { falseAlarm: 0.01 },
    };
    const fromScenario = orbitSystemFromScenario(scenario);
    const direct = orbitSystem({
      stellarRadiusM: R_SUN_M, periodS: 60 * DAY_S, semiMajorAxisM: scenario.planet.semiMajorAxisM,
      eccentricity: 0.1, omegaRad: 0.5, inclinationRad: 89.5 * DEG,
      moon: { planetMassKg: M_JUP, moonMassKg: 0.5 * M_EARTH, separationM: 1.5e9, eccentricity: 0.05, inclinationRad: 0.1, nodeRad: 0.2, periapsisRad: 0.3, phaseRad: 0.4, retrograde: true },
    });
    expect(fromScenario).toEqual(direct);
    expect(orbitSystemFromScenario({ ...scenario, moon: null }).moon).toBeNull();
  });

  it('rejects bad input with a RangeError naming the field; NaN times give NaN', () => {
    expect(() => orbitSystem(warmJupiter(null, { eccentricity: 1 }))).toThrow(/eccentricity/);
    expect(() => orbitSystem(warmJupiter(bigMoon({ separationM: -1 })))).toThrow(/moon\.separationM/);
    const sys = orbitSystem(warmJupiter(bigMoon()));
    expect(() => skyPositions(new Float64Array(3), sys, buffers(2))).toThrow(/out\.xp/);
    const o = run(sys, [Number.NaN]);
    expect(o.xp[0]).toBeNaN();
    expect(o.ym[0]).toBeNaN();
  });
});

describe('minimumSeparationOffsetS (conjunction → minimum sky separation)', () => {
  it('matches a brute-force minimum of the skyPositions separation', () => {
    // Expected: minimum of √(x² + y²) over a 0.01 s grid of skyPositions output (computed in this test);
    // grid resolution and the flat minimum limit agreement to ~0.05 s.
    for (const [e, wDeg, incDeg, aR] of [
      [0.3, 0, 87, 20],
      [0.3, 45, 87, 20],
      [0.5, 0, 85, 10],
      [0.1, 30, 88, 15],
      [0.4, 160, 88, 25],
    ]) {
      const P = 10 * DAY_S;
      const sys = orbitSystem({ stellarRadiusM: R_SUN_M, periodS: P, semiMajorAxisM: aR * R_SUN_M, eccentricity: e, omegaRad: wDeg * DEG, inclinationRad: incDeg * DEG, moon: null });
      const offset = minimumSeparationOffsetS(P, e, wDeg * DEG, incDeg * DEG);
      const n = 20_001;
      const t = new Float64Array(n);
      for (let k = 0; k < n; k++) t[k] = offset - 100 + k * 0.01;
      const o = buffers(n);
      skyPositions(t, sys, o);
      let best = Number.POSITIVE_INFINITY;
      let bestT = Number.NaN;
      for (let k = 0; k < n; k++) {
        const d = Math.hypot(o.xp[k], o.yp[k]);
        if (d < best) {
          best = d;
          bestT = t[k];
        }
      }
      expect(Math.abs(bestT - offset)).toBeLessThan(0.05);
      // And the offset is not negligible: first-order estimate −e cos ω cot² i (1−e²)^{3/2}/(n(1+e sin ω)³)
      // (derived in transitTimes.ts from Winn 2010 eqs. 1–3) agrees to 5 %.
      const w = wDeg * DEG;
      const approx = (-e * Math.cos(w) * (1 / Math.tan(incDeg * DEG)) ** 2 * (1 - e * e) ** 1.5) / (((2 * Math.PI) / P) * (1 + e * Math.sin(w)) ** 3);
      expect(Math.abs(offset / approx - 1)).toBeLessThan(0.05);
    }
  });

  it('is zero for circular, edge-on or ω = 90° orbits', () => {
    // Expected: symmetry of the sky track about conjunction (Winn 2010 eqs. 2–3).
    expect(minimumSeparationOffsetS(10 * DAY_S, 0, 0.3, 87 * DEG)).toBe(0);
    expect(Math.abs(minimumSeparationOffsetS(10 * DAY_S, 0.4, 0.3, Math.PI / 2))).toBeLessThan(1e-6);
    expect(Math.abs(minimumSeparationOffsetS(10 * DAY_S, 0.4, Math.PI / 2, 87 * DEG))).toBeLessThan(1e-6);
    expect(() => minimumSeparationOffsetS(-1, 0.1, 0, 1.5)).toThrow(/periodS/);
  });
});

import { describe, it, expect } from 'vitest';
import { mulberry32 } from '../helpers/mulberry32.js';
import { timingSignals, barycentreSkyVelocity, timingShapeFactors } from '../../src/physics/timingSignals.js';
import { AU_M, DAY_S, G, GM_EARTH, GM_SUN, HOUR_S, R_EARTH_M, R_SUN_M } from '../../src/physics/constants.js';

// Earth–Moon seen from afar. Lunar GM 4902.800 km³/s², a = 384,399 km, sidereal year
// 365.256363 d: from memory. Expected values computed from constants in the test.
const GM_MOON = 4.9028e12;
const earthMoon = {
  planetMassKg: GM_EARTH / G,
  moonMassKg: GM_MOON / G,
  moonSeparationM: 384_399e3,
  moonEccentricity: 0,
  moonInclinationRad: 0,
  moonNodeRad: 0,
  moonPeriapsisRad: 0,
  barycentreSemiMajorAxisM: AU_M,
  barycentrePeriodS: 365.256363 * DAY_S,
  barycentreEccentricity: 0,
  barycentreOmegaRad: 0,
  durationS: 13 * HOUR_S,
};


describe('timingSignals: Earth–Moon', () => {
  const r = timingSignals(earthMoon);
  it('barycentre offset 4670.7 km (from memory: "about 4671 km"; computed from constants in the test)', () => {
    expect(r.planetBarycentreOffsetM / 1e3).toBeCloseTo(4670.7, 0);
  });
  it('TTV semi-amplitude ≈ 156.8 s ≈ 2.61 min (computed from constants in the test: a_PB / (2π au / yr))', () => {
    const vB = (2 * Math.PI * AU_M) / (365.256363 * DAY_S);
    expect(r.barycentreVelocityMS).toBeCloseTo(vB, 9);
    expect(r.ttvSemiAmplitudeS).toBeCloseTo(156.8, 1);
    expect(r.ttvRmsS).toBeCloseTo(156.8 / Math.SQRT2, 1);
  });
  it('TDV semi-amplitude τ̄·v_PB/v_B with τ̄ = T14 of the Earth–Sun transit ≈ 19.7 s (computed in the test)', () => {
    const p = R_EARTH_M / R_SUN_M;
    // Winn 2010 T14 for b = 0: (P/π) arcsin((1 + p) R*/a)
    const t14 = ((365.256363 * DAY_S) / Math.PI) * Math.asin(((1 + p) * R_SUN_M) / AU_M);
    expect(t14 / HOUR_S).toBeCloseTo(13.0955, 3);
    const s = timingSignals({ ...earthMoon, durationS: t14 });
    expect(s.tdvSemiAmplitudeS).toBeCloseTo(19.7, 1);
    // η = A_TDV/A_TTV = 2π τ̄ / P_S (Kipping 2009a, MNRAS 392, 181)
    expect(s.tdvSemiAmplitudeS / s.ttvSemiAmplitudeS).toBeCloseTo((2 * Math.PI * t14) / s.moonPeriodS, 12);
  });
  it('moon period from Kepler’s third law (2π sqrt(a³/G(M_P+M_S)), computed in the test) and π/2 phase offset (Kipping 2009a)', () => {
    const expected = 2 * Math.PI * Math.sqrt(384_399e3 ** 3 / (GM_EARTH + GM_MOON));
    expect(r.moonPeriodS).toBeCloseTo(expected, 6);
    expect(r.phaseOffsetRad).toBe(Math.PI / 2);
  });
});

describe('timingSignals: eccentric barycentre orbit', () => {
  it('v_B = (2πa/P)(1 + e sin ω)/sqrt(1 − e²) (Winn 2010) scales the TTV as 1/v_B', () => {
    const v0 = barycentreSkyVelocity(AU_M, 365.25 * DAY_S, 0, 0);
    const v = barycentreSkyVelocity(AU_M, 365.25 * DAY_S, 0.3, Math.PI / 2);
    expect(v / v0).toBeCloseTo(1.3 / Math.sqrt(1 - 0.09), 12);
    const a = timingSignals({ ...earthMoon, barycentreEccentricity: 0.3, barycentreOmegaRad: Math.PI / 2 });
    const b = timingSignals(earthMoon);
    expect(a.ttvRmsS / b.ttvRmsS).toBeCloseTo(b.barycentreVelocityMS / a.barycentreVelocityMS, 12);
  });
});

describe('timingSignals: Φ factors vs Monte Carlo (derived here, reduces to Kipping 2009a for e = 0)', () => {
  /**
   * Monte Carlo in the test: stratified uniform moon mean anomaly (one seeded random point per
   * stratum), Kepler's equation solved by Newton, relative orbit rotated by explicit 3×3 matrices
   * R_z(Ω)R_x(i)R_z(ω) into the frame whose x axis is the chord, planet reflex = −M_S/(M_P+M_S)·r_rel.
   * TTV = x_P/v_B (rms about the mean), TDV = −τ̄ v_x,P / v_B.
   */
  function monteCarlo(e: number, inc: number, node: number, peri: number, n: number, seed: number) {
    const rand = mulberry32(seed);
    const mp = earthMoon.planetMassKg;
    const ms = earthMoon.moonMassKg;
    const a = earthMoon.moonSeparationM;
    const nMotion = Math.sqrt((G * (mp + ms)) / a ** 3);
    const vB = (2 * Math.PI * AU_M) / (365.256363 * DAY_S);
    const rz = (t: number) => [[Math.cos(t), -Math.sin(t), 0], [Math.sin(t), Math.cos(t), 0], [0, 0, 1]];
    const rx = (t: number) => [[1, 0, 0], [0, Math.cos(t), -Math.sin(t)], [0, Math.sin(t), Math.cos(t)]];
    const mul = (A: number[][], B: number[][]) =>
      A.map((row) => [0, 1, 2].map((j) => row[0] * B[0][j] + row[1] * B[1][j] + row[2] * B[2][j]));
    const R = mul(mul(rz(node), rx(inc)), rz(peri));
    const k = -ms / (mp + ms);
    let sx = 0, sxx = 0, sv = 0, svv = 0;
    for (let j = 0; j < n; j++) {
      const M = ((j + rand()) / n) * 2 * Math.PI;
      let E = e < 0.8 ? M : Math.PI;
      for (let it = 0; it < 50; it++) {
        const dE = (E - e * Math.sin(E) - M) / (1 - e * Math.cos(E));
        E -= dE;
        if (Math.abs(dE) < 1e-14) break;
      }
      const xo = a * (Math.cos(E) - e);
      const yo = a * Math.sqrt(1 - e * e) * Math.sin(E);
      const f = (nMotion * a) / (1 - e * Math.cos(E));
      const vxo = -f * Math.sin(E);
      const vyo = f * Math.sqrt(1 - e * e) * Math.cos(E);
      const x = k * (R[0][0] * xo + R[0][1] * yo);
      const vx = k * (R[0][0] * vxo + R[0][1] * vyo);
      const ttv = x / vB;
      const tdv = (-earthMoon.durationS * vx) / vB;
      sx += ttv; sxx += ttv * ttv; sv += tdv; svv += tdv * tdv;
    }
    return {
      ttvRms: Math.sqrt(sxx / n - (sx / n) ** 2),
      tdvRms: Math.sqrt(svv / n - (sv / n) ** 2),
    };
  }

  const cases = [
    { e: 0, inc: 0, node: 0, peri: 0 },
    { e: 0.3, inc: 0, node: 0, peri: 0 },
    { e: 0.3, inc: 0, node: 0, peri: Math.PI / 2 },
    { e: 0.7, inc: 0, node: 0, peri: 2.5 },
    { e: 0, inc: 1.0, node: 0.7, peri: 0.3 },
    { e: 0.5, inc: 2.2, node: -1.3, peri: 4.0 },
    { e: 0.2, inc: Math.PI / 2, node: Math.PI / 2, peri: 1.0 },
  ];
  for (const c of cases) {
    it(`e=${c.e}, i=${c.inc}, Ω=${c.node}, ω=${c.peri}: rms TTV and TDV within 1e-4 (stratified sampling error ≪ 1e-5)`, () => {
      const mc = monteCarlo(c.e, c.inc, c.node, c.peri, 50_000, 12345);
      const got = timingSignals({
        ...earthMoon, moonEccentricity: c.e, moonInclinationRad: c.inc, moonNodeRad: c.node, moonPeriapsisRad: c.peri,
      });
      expect(Math.abs(got.ttvRmsS / mc.ttvRms - 1)).toBeLessThan(1e-4);
      expect(Math.abs(got.tdvRmsS / mc.tdvRms - 1)).toBeLessThan(1e-4);
    });
  }

  it('coplanar forms: Φ_TTV = sqrt(1 − (e²/2)(1 + sin²ω)), Φ_TDV = sqrt(2[g cos²ω + (1−g) sin²ω]) (derived here)', () => {
    const e = 0.3, w = 0.8;
    const g = (1 - Math.sqrt(1 - e * e)) / (e * e);
    const f = timingShapeFactors(e, Math.cos(w), -Math.sin(w));
    expect(f.phiTtv).toBeCloseTo(Math.sqrt(1 - (e * e / 2) * (1 + Math.sin(w) ** 2)), 14);
    expect(f.phiTdv).toBeCloseTo(Math.sqrt(2 * (g * Math.cos(w) ** 2 + (1 - g) * Math.sin(w) ** 2)), 14);
    const c = timingShapeFactors(0, Math.cos(w), -Math.sin(w));
    expect(c.phiTtv).toBeCloseTo(1, 15);
    expect(c.phiTdv).toBeCloseTo(1, 15);
  });
});

describe('timingSignals input checks', () => {
  it('throws RangeError naming the argument', () => {
    expect(() => timingSignals({ ...earthMoon, moonEccentricity: 1 })).toThrow(/moonEccentricity/);
    expect(() => timingSignals({ ...earthMoon, planetMassKg: 0 })).toThrow(/planetMassKg/);
    expect(() => timingSignals({ ...earthMoon, durationS: NaN })).toThrow(RangeError);
  });
  it('a massless moon gives no signal (common practice, no source)', () => {
    const r = timingSignals({ ...earthMoon, moonMassKg: 0 });
    expect(r.ttvRmsS).toBe(0);
    expect(r.tdvRmsS).toBe(0);
  });
  it('circular v_B equals sqrt(GM☉/a) when P follows Kepler’s third law (computed from constants)', () => {
    const r = timingSignals({ ...earthMoon, barycentrePeriodS: 2 * Math.PI * Math.sqrt(AU_M ** 3 / GM_SUN) });
    expect(r.barycentreVelocityMS).toBeCloseTo(Math.sqrt(GM_SUN / AU_M), 6);
  });
});

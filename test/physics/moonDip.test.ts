import { describe, it, expect } from 'vitest';
import { moonDipDepth } from '../../src/physics/moonDip.js';
import { R_EARTH_M, R_SUN_M } from '../../src/physics/constants.js';

describe('moonDipDepth', () => {
  it('uniform star: depth = (R_S/R*)²; an Earth-size moon on the Sun gives 84.05 ppm (computed from constants)', () => {
    const r = moonDipDepth({ moonRadiusM: R_EARTH_M, starRadiusM: R_SUN_M, u1: 0, u2: 0, impactParameter: 0.3 });
    expect(r.uniformDepth * 1e6).toBeCloseTo(84.05, 2);
    expect(r.depthAtMidTransit).toBe(r.uniformDepth);
    expect(r.depthChordMean).toBeCloseTo(r.uniformDepth, 18);
  });

  it('limb darkening at disc centre: p²/(1 − u1/3 − u2/6) (Mandel & Agol 2002 §5)', () => {
    const r = moonDipDepth({ moonRadiusM: 1e7, starRadiusM: 1e9, u1: 0.4, u2: 0.26, impactParameter: 0 });
    expect(r.depthAtMidTransit).toBeCloseTo(1e-4 / (1 - 0.4 / 3 - 0.26 / 6), 15);
  });

  it('chord mean equals a brute-force average of I(μ) along the chord (computed in the test)', () => {
    const u1 = 0.4, u2 = 0.26, b = 0.5;
    const c = Math.sqrt(1 - b * b);
    const n = 200_000;
    let s = 0;
    for (let j = 0; j < n; j++) {
      const x = -c + ((j + 0.5) / n) * 2 * c;
      const mu = Math.sqrt(Math.max(0, 1 - b * b - x * x));
      s += 1 - u1 * (1 - mu) - u2 * (1 - mu) ** 2;
    }
    const r = moonDipDepth({ moonRadiusM: 1e7, starRadiusM: 1e9, u1, u2, impactParameter: b });
    expect(r.depthChordMean / (1e-4 / (1 - u1 / 3 - u2 / 6))).toBeCloseTo(s / n, 6);
  });

  it('rejects bad input with RangeError', () => {
    expect(() => moonDipDepth({ moonRadiusM: 1, starRadiusM: 0, u1: 0, u2: 0, impactParameter: 0 })).toThrow(/starRadiusM/);
    expect(() => moonDipDepth({ moonRadiusM: 1, starRadiusM: 1, u1: 0, u2: 0, impactParameter: 1 })).toThrow(/impactParameter/);
  });
});

import { describe, it, expect } from 'vitest';
import { chenKippingRadius, chenKippingIntercepts, CHEN_KIPPING_TRANSITIONS_KG } from '../../src/physics/massRadius.js';
import { M_EARTH_KG, M_JUP_KG, M_SUN_KG, R_EARTH_M } from '../../src/physics/constants.js';

const rEarths = (mEarths: number) => chenKippingRadius(mEarths * M_EARTH_KG) / R_EARTH_M;

describe('chenKippingRadius (Chen & Kipping 2017, ApJ 834, 17)', () => {
  it('gives 10^C1 = 1.008 Earth radii at one Earth mass', () => {
    // Table 1: C = 0.00346 is log10(R/R⊕) of the Terran segment at 1 M⊕.
    expect(rEarths(1)).toBeCloseTo(10 ** 0.00346, 10);
    expect(rEarths(1)).toBeCloseTo(1.008, 3);
  });

  it('follows the published slopes inside each regime', () => {
    // Table 1: S1 = 0.2790 (Terran), S2 = 0.589 (Neptunian), S3 = −0.044 (Jovian).
    expect(Math.log10(rEarths(1.5) / rEarths(0.5)) / Math.log10(3)).toBeCloseTo(0.279, 10);
    expect(Math.log10(rEarths(100) / rEarths(10)) / Math.log10(10)).toBeCloseTo(0.589, 10);
    expect(Math.log10(rEarths(10_000) / rEarths(1_000)) / Math.log10(10)).toBeCloseTo(-0.044, 10);
  });

  it('is continuous at the transitions of Table 1 (2.04 M⊕, 0.414 M_J), the first near the abstract\'s 2.0 M⊕', () => {
    const t = CHEN_KIPPING_TRANSITIONS_KG;
    expect(t.terranNeptunian / M_EARTH_KG).toBeCloseTo(2.0, 0);
    for (const m of [t.terranNeptunian, t.neptunianJovian]) {
      const below = chenKippingRadius(m * (1 - 1e-12));
      const above = chenKippingRadius(m * (1 + 1e-12));
      expect(above / below).toBeCloseTo(1, 9);
    }
    // Intercepts by continuity: C2 = C1 + (S1 − S2) log10(2.04) (computed from Table 1).
    expect(chenKippingIntercepts()[1]).toBeCloseTo(0.00346 + (0.279 - 0.589) * Math.log10(2.04), 12);
    expect(t.neptunianJovian).toBeCloseTo(0.414 * M_JUP_KG, -10);
    // 0.414 M_J = 131.58 M⊕ and 0.08 M☉ = 26 636 M⊕ with the IAU 2015 nominal GM ratios (computed).
    expect(t.neptunianJovian / M_EARTH_KG).toBeCloseTo(131.58, 1);
    expect(t.jovianStellar / M_EARTH_KG).toBeCloseTo(26636, 0);
  });

  it('is NaN outside the planetary regimes', () => {
    expect(chenKippingRadius(0)).toBeNaN();
    expect(chenKippingRadius(-1)).toBeNaN();
    expect(chenKippingRadius(0.08 * M_SUN_KG)).toBeNaN();
    expect(chenKippingRadius(0.079 * M_SUN_KG)).toBeGreaterThan(0);
  });
});

import { describe, it, expect } from 'vitest';
import { buildTransitTemplate, directTemplateFlux, templateFlux, templateFluxArray, type TemplateGeometry } from '../../src/timing/transitTemplate.js';
import { DAY_S } from '../../src/physics/constants.js';

/** Invented geometry: a warm Neptune-size planet, a/R* = 40, 12-day orbit, 2-min exposure. */
const circular: TemplateGeometry = {
  periodS: 12 * DAY_S,
  aOverRstar: 40,
  eccentricity: 0,
  omegaRad: Math.PI / 2,
  radiusRatio: 0.06,
  impactParameter: 0.45,
  u1: 0.42,
  u2: 0.24,
  exposureS: 120,
  timeScale: 1,
};

describe('transit template on a circular orbit (closed-form contacts, mirrored track)', () => {
  it('has the contacts of Winn 2010 eqs. 14–15 (exact for e = 0)', () => {
    const tpl = buildTransitTemplate(circular);
    // Winn 2010 (arXiv:1001.2010) eq. 14: T14 = (P/π) asin[√((1+p)² − b²)/(a sin i)], eq. 15 with 1 − p;
    // b = a cos i (eq. 7, e = 0). Computed here in the test.
    const a = circular.aOverRstar;
    const b = circular.impactParameter;
    const p = circular.radiusRatio;
    const sinI = Math.sqrt(1 - (b / a) ** 2);
    const t14 = (circular.periodS / Math.PI) * Math.asin(Math.sqrt((1 + p) ** 2 - b * b) / (a * sinI));
    const t23 = (circular.periodS / Math.PI) * Math.asin(Math.sqrt((1 - p) ** 2 - b * b) / (a * sinI));
    expect(Math.abs(tpl.t14S - t14)).toBeLessThan(1e-6);
    expect(Math.abs(tpl.t23S - t23)).toBeLessThan(1e-6);
  });

  it('agrees with the general (numerically searched, unmirrored) build and with direct integration', () => {
    // The general path runs for any e > 0; at e = 1e-12 the orbit differs from the circle by ~1e-12 a,
    // so both tables must agree to far below their interpolation error (common practice, no source).
    const fast = buildTransitTemplate(circular, { stepsPerT14: 1000 });
    const general = buildTransitTemplate({ ...circular, eccentricity: 1e-12 }, { stepsPerT14: 1000 });
    expect(general.values.length).toBe(fast.values.length);
    expect(Math.abs(general.t14S - fast.t14S)).toBeLessThan(1e-6);
    let worst = 0;
    for (let k = 0; k < fast.values.length; k++) worst = Math.max(worst, Math.abs(fast.values[k] - general.values[k]));
    expect(worst).toBeLessThan(1e-11);
    // Against the direct midpoint-rule exposure average (Kipping 2010, MNRAS 408, 1758, §3; 2001
    // sub-exposures): within the T14/1000 table's interpolation error (file header of transitTemplate.ts).
    const n = 400;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = (i / (n - 1) - 0.5) * (fast.t14S + 300) + 0.29 * fast.stepS;
    const direct = directTemplateFlux(fast, x, 2001);
    let err = 0;
    for (let i = 0; i < n; i++) err = Math.max(err, Math.abs(templateFlux(fast, x[i]) - direct[i]));
    expect(err).toBeLessThan(1e-6);
    // Mirror symmetry of the circular track (common practice, no source).
    for (const u of [0.1, 0.3, 0.47, 0.5]) {
      const xx = u * fast.t14S;
      expect(Math.abs(templateFlux(fast, xx) - templateFlux(fast, -xx))).toBeLessThan(1e-12);
    }
  });

  it('handles a grazing transit (no second and third contact)', () => {
    const tpl = buildTransitTemplate({ ...circular, impactParameter: 1.0 });
    expect(tpl.t23S).toBe(0);
    expect(tpl.t14S).toBeGreaterThan(0);
    expect(tpl.depth).toBeGreaterThan(0);
  });

  it('templateFluxArray equals templateFlux point by point, 1 outside the table and NaN for NaN', () => {
    // Same spline (Press et al. 2007, eq. 3.3.3), evaluated over an array: must agree exactly (common practice, no source).
    const tpl = buildTransitTemplate(circular, { stepsPerT14: 1000 });
    const n = 257;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = (i / (n - 1) - 0.5) * 1.4 * tpl.t14S;
    x[5] = NaN;
    const out = new Float64Array(n);
    templateFluxArray(tpl, x, n, out);
    for (let i = 0; i < n; i++) {
      if (i === 5) expect(out[i]).toBeNaN();
      else expect(out[i]).toBe(templateFlux(tpl, x[i]));
    }
    expect(out[0]).toBe(1);
    expect(out[n - 1]).toBe(1);
  });
});

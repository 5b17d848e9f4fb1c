/**
 * Where in time a transit "is": conjunction versus minimum sky separation.
 *
 * moonsieve's time origin is the barycentre's conjunction, true anomaly
 * f = π/2 − ω (Winn 2010, "Transits and Occultations", arXiv:1001.2010, §2).
 * On an eccentric, inclined orbit the sky-projected separation is smallest at
 * a slightly different instant. To first order in the offset (derived here
 * from Winn 2010 eqs. 1–3, not a published formula)
 *     Δt ≈ −e cos ω cot² i (1 − e²)^{3/2} / (n (1 + e sin ω)³),  n = 2π/P,
 * e.g. −98 s for P = 10 d, a/R* = 20, e = 0.3, ω = 0, i = 87°. It is the same
 * at every epoch, so a linear ephemeris absorbs it; it matters only when
 * comparing absolute mid-times with another convention.
 */

import { eccentricFromTrueAnomaly } from './kepler.js';

function fail(name: string, value: number, allowed: string): never {
  throw new RangeError(`minimumSeparationOffsetS: ${name} must be ${allowed}, got ${value}`);
}

/**
 * Time (s) from conjunction (f = π/2 − ω) to the nearest minimum of the
 * sky-projected star–body separation d = r √(1 − sin²(ω + f) sin² i)
 * (Winn 2010 eqs. 1–3). Found by bisection on dd/df over |f − f_c| ≤ π/4,
 * converted to time through Kepler's equation (Murray & Dermott 1999,
 * "Solar System Dynamics", eqs. 2.46, 2.52). Zero for e = 0, i = π/2 or
 * ω = ±π/2. Returns NaN if no minimum lies within π/4 of conjunction.
 * @throws RangeError on invalid arguments.
 */
export function minimumSeparationOffsetS(periodS: number, e: number, omegaRad: number, inclinationRad: number): number {
  if (!(periodS > 0) || !Number.isFinite(periodS)) fail('periodS', periodS, 'a positive finite number');
  if (!(e >= 0 && e < 1)) fail('e', e, 'in [0, 1)');
  if (!Number.isFinite(omegaRad)) fail('omegaRad', omegaRad, 'a finite angle');
  if (!(inclinationRad >= 0 && inclinationRad <= Math.PI)) fail('inclinationRad', inclinationRad, 'in [0, π]');
  if (e === 0) return 0;

  const sin2i = Math.sin(inclinationRad) ** 2;
  const fc = Math.PI / 2 - omegaRad;
  // (1/2r) d(d²)/df with θ = f − f_c: r′(1 − cos²θ sin²i) + r sinθ cosθ sin²i, using
  // r ∝ 1/(1 + e cos f) and r′/r = e sin f/(1 + e cos f) (Murray & Dermott 1999, eq. 2.20); r > 0 dropped.
  const slope = (theta: number): number => {
    const f = fc + theta;
    const c = Math.cos(theta);
    return (e * Math.sin(f)) / (1 + e * Math.cos(f)) * (1 - c * c * sin2i) + Math.sin(theta) * c * sin2i;
  };
  let lo = -Math.PI / 4;
  let hi = Math.PI / 4;
  if (!(slope(lo) < 0 && slope(hi) > 0)) return NaN;
  for (let k = 0; k < 80; k++) {
    const mid = 0.5 * (lo + hi);
    if (slope(mid) < 0) lo = mid;
    else hi = mid;
  }
  const fMin = fc + 0.5 * (lo + hi);
  const meanAnomaly = (f: number): number => {
    const E = eccentricFromTrueAnomaly(f, e);
    return E - e * Math.sin(E);
  };
  return ((meanAnomaly(fMin) - meanAnomaly(fc)) / (2 * Math.PI)) * periodS;
}

/**
 * Per-transit timing and duration precision from the Fisher information of
 * the exact transit model the recovery fits: the exposure-averaged, quadratic
 * limb-darkened Mandel & Agol (2002) light curve (transitTemplate.ts) with
 * free mid-time t_c, duration scale s and baseline level f0, sampled on the
 * instrument's cadence grid across the observing window, white noise σ per
 * exposure. The Cramér–Rao bound is the inverse of F = JᵀJ/σ² (Fisher 1925;
 * e.g. Kay 1993, Fundamentals of Statistical Signal Processing, ch. 3), with
 * J the model's derivatives: ∂m/∂t_c = −T′(x), ∂m/∂s = −x T′(x), ∂m/∂f0 = T(x)
 * at s = 1, f0 = 1 (as perTransitFit.ts). F is averaged over the phase of the
 * sampling grid relative to the transit (transits fall at arbitrary phases).
 * This is the analytic counterpart of Carter et al. (2008, ApJ 689, 499),
 * whose trapezoid ignores limb darkening (which lengthens the ingress signal
 * and raises the errors) — both are reported by `limits`.
 */
import { buildTransitTemplate, templateFluxSlope, type TemplateGeometry } from './transitTemplate.js';
import { invertSymmetricPositive } from '../numeric/linearAlgebra.js';
import { remembered } from '../memo.js';

export interface ModelTimingPrecision {
  /** Mid-time 1σ, s. */
  sigmaTcS: number;
  /** First-to-last-contact duration 1σ, s. */
  sigmaDurationS: number;
  /** Template T14, s. */
  t14S: number;
}

/**
 * @param geometry the planet-only transit (templateGeometryFromScenario)
 * @param sigma white noise per exposure (relative flux)
 * @param cadenceS time between samples
 * @param halfWindowS half-width of the observed window around mid-transit
 * @param phases number of sampling-grid phases averaged (default 16)
 */
export function modelTimingPrecision(geometry: TemplateGeometry, sigma: number, cadenceS: number, halfWindowS: number, phases = 16): ModelTimingPrecision {
  // A pure function of its arguments, and the same for every cell of a grid that does not change the
  // planet, the instrument or the window (a moon mass × separation grid): kept, per thread.
  const key = [
    geometry.periodS, geometry.aOverRstar, geometry.eccentricity, geometry.omegaRad, geometry.radiusRatio,
    geometry.impactParameter, geometry.u1, geometry.u2, geometry.exposureS, geometry.timeScale ?? 1,
    sigma, cadenceS, halfWindowS, phases,
  ].join(',');
  return { ...remembered(cache, CACHE_SIZE, key, () => computePrecision(geometry, sigma, cadenceS, halfWindowS, phases)) };
}

const CACHE_SIZE = 32;
const cache = new Map<string, ModelTimingPrecision>();

function computePrecision(geometry: TemplateGeometry, sigma: number, cadenceS: number, halfWindowS: number, phases: number): ModelTimingPrecision {
  const tpl = buildTransitTemplate(geometry);
  const fisher = new Float64Array(9);
  const buf = new Float64Array(2);
  const k0 = Math.ceil(halfWindowS / cadenceS) + 1;
  for (let ph = 0; ph < phases; ph++) {
    const offset = ((ph + 0.5) / phases) * cadenceS;
    for (let k = -k0; k <= k0; k++) {
      const x = k * cadenceS + offset;
      if (Math.abs(x) > halfWindowS) continue;
      templateFluxSlope(tpl, x, buf);
      const j0 = -buf[1];
      const j1 = -x * buf[1];
      const j2 = buf[0];
      fisher[0] += j0 * j0;
      fisher[1] += j0 * j1;
      fisher[2] += j0 * j2;
      fisher[4] += j1 * j1;
      fisher[5] += j1 * j2;
      fisher[8] += j2 * j2;
    }
  }
  const scale = 1 / (phases * sigma * sigma);
  for (let i = 0; i < 9; i++) fisher[i] *= scale;
  fisher[3] = fisher[1];
  fisher[6] = fisher[2];
  fisher[7] = fisher[5];
  const cov = new Float64Array(9);
  if (!invertSymmetricPositive(fisher, 3, cov)) return { sigmaTcS: NaN, sigmaDurationS: NaN, t14S: tpl.t14S };
  return { sigmaTcS: Math.sqrt(cov[0]), sigmaDurationS: tpl.t14S * Math.sqrt(cov[4]), t14S: tpl.t14S };
}

/**
 * The photodynamical light curve: at each time, the sky positions of planet
 * and moon from the nested Kepler model (physics/skyPositions), the flux of
 * the limb-darkened star they occult together (pairTransitFlux, overlap
 * counted once), averaged over each exposure by supersampling (Kipping 2010,
 * MNRAS 408, 1758, §3: the midpoint sum over N sub-exposures).
 */
import type { Scenario } from '../scenario/types.js';
import { orbitSystemFromScenario, skyPositions, type OrbitSystem } from '../physics/skyPositions.js';
import { pairTransitFlux } from './pairTransitFlux.js';
import { supersampleCount } from './exposureSmearing.js';
import { scenarioDurations } from './transitWindows.js';

export interface LightCurveModel {
  sys: OrbitSystem;
  /** Planet and moon radii in stellar radii (moon 0 when absent). */
  rp: number;
  rm: number;
  u1: number;
  u2: number;
  exposureS: number;
  /** Sub-exposures per exposure (1 = instantaneous). */
  supersample: number;
}

/** Largest flux error allowed from finite supersampling, as a fraction of the stellar flux. */
export const DEFAULT_SMEARING_TOLERANCE = 1e-6;

export function lightCurveModel(s: Scenario, opts: { supersample?: number; tolerance?: number } = {}): LightCurveModel {
  const rp = s.planet.radiusM / s.star.radiusM;
  const rm = s.moon ? s.moon.radiusM / s.star.radiusM : 0;
  const d = scenarioDurations(s);
  const ingress = d.ingressS > 0 ? d.ingressS : d.t14S / 2;
  const supersample =
    opts.supersample ??
    supersampleCount(s.instrument.exposureS, ingress, rp * rp, opts.tolerance ?? DEFAULT_SMEARING_TOLERANCE);
  return { sys: orbitSystemFromScenario(s), rp, rm, u1: s.star.u1, u2: s.star.u2, exposureS: s.instrument.exposureS, supersample };
}

/** Reusable scratch buffers so repeated evaluations allocate nothing per point. */
export class LightCurveWorkspace {
  private size = 0;
  t = new Float64Array(0);
  xp = new Float64Array(0);
  yp = new Float64Array(0);
  xm = new Float64Array(0);
  ym = new Float64Array(0);
  zp = new Float64Array(0);
  zm = new Float64Array(0);

  ensure(n: number): void {
    if (n <= this.size) return;
    this.size = n;
    this.t = new Float64Array(n);
    this.xp = new Float64Array(n);
    this.yp = new Float64Array(n);
    this.xm = new Float64Array(n);
    this.ym = new Float64Array(n);
    this.zp = new Float64Array(n);
    this.zm = new Float64Array(n);
  }
}

const FAR = 1e9;

/**
 * Relative flux at mid-exposure times `timeS` (s since t0), averaged over
 * the exposure, written into `out`.
 */
export function modelFlux(
  timeS: Float64Array,
  m: LightCurveModel,
  out: Float64Array = new Float64Array(timeS.length),
  ws: LightCurveWorkspace = new LightCurveWorkspace(),
): Float64Array {
  const n = timeS.length;
  const ns = Math.max(1, Math.round(m.supersample));
  const total = n * ns;
  ws.ensure(total);
  const { t, xp, yp, xm, ym, zp, zm } = ws;
  const dt = m.exposureS / ns;
  for (let i = 0; i < n; i++) {
    const base = i * ns;
    // Centred midpoints of ns equal sub-exposures (Kipping 2010, §3).
    for (let j = 0; j < ns; j++) t[base + j] = timeS[i] + (j - (ns - 1) / 2) * dt;
  }
  const tv = total === t.length ? t : t.subarray(0, total);
  skyPositions(tv, m.sys, { xp, yp, xm, ym, zp, zm });
  const hasMoon = m.sys.moon !== null && m.rm > 0;
  for (let i = 0; i < n; i++) {
    let acc = 0;
    const base = i * ns;
    for (let j = 0; j < ns; j++) {
      const k = base + j;
      // A body behind the star (z < 0, observer along +z) occults nothing.
      const pxk = zp[k] > 0 ? xp[k] : FAR;
      const mxk = hasMoon && zm[k] > 0 ? xm[k] : FAR;
      acc += pairTransitFlux(pxk, yp[k], m.rp, mxk, hasMoon ? ym[k] : 0, hasMoon ? m.rm : 0, m.u1, m.u2);
    }
    out[i] = acc / ns;
  }
  return out;
}

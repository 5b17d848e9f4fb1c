/**
 * The photodynamical light curve: at each time, the sky positions of planet
 * and moon from the nested Kepler model (physics/skyPositions), the flux of
 * the limb-darkened star they occult together (pairTransitFlux, overlap
 * counted once), averaged over each exposure by supersampling (Kipping 2010,
 * MNRAS 408, 1758, §3: the midpoint sum over N sub-exposures) where the
 * curve has a kink, and by one mid-exposure value where it is smooth enough
 * (see `modelFlux`).
 */
import type { Scenario } from '../scenario/types.js';
import { orbitSystemFromScenario, skyPositions, type OrbitSystem } from '../physics/skyPositions.js';
import { pairTransitFluxArray } from './pairTransitFlux.js';
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
  /** Sub-exposures per exposure where the flux has a kink (1 = instantaneous). */
  supersample: number;
  /** Give every exposure `supersample` sub-exposures, smooth or not (a reference for checks; default false). */
  supersampleEverywhere?: boolean;
  /** Smearing error allowed, relative flux (what `supersample` was chosen for; default DEFAULT_SMEARING_TOLERANCE). */
  tolerance?: number;
}

/** Largest flux error allowed from finite supersampling, as a fraction of the stellar flux. */
export const DEFAULT_SMEARING_TOLERANCE = 1e-6;

export function lightCurveModel(s: Scenario, opts: { supersample?: number; tolerance?: number } = {}): LightCurveModel {
  const rp = s.planet.radiusM / s.star.radiusM;
  const rm = s.moon ? s.moon.radiusM / s.star.radiusM : 0;
  const d = scenarioDurations(s);
  const ingress = d.ingressS > 0 ? d.ingressS : d.t14S / 2;
  const tolerance = opts.tolerance ?? DEFAULT_SMEARING_TOLERANCE;
  const supersample = opts.supersample ?? supersampleCount(s.instrument.exposureS, ingress, rp * rp, tolerance);
  return { sys: orbitSystemFromScenario(s), rp, rm, u1: s.star.u1, u2: s.star.u2, exposureS: s.instrument.exposureS, supersample, tolerance };
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
  /** Indices of the exposures that need sub-exposures. */
  rough = new Int32Array(0);
  /** 0: needs sub-exposures; 1: evaluated once at its middle; 2: both bodies off the disc throughout. */
  kind = new Uint8Array(0);
  /** Occulter centres handed to the flux kernel (a body behind the star moved far off the disc), and its fluxes. */
  ax = new Float64Array(0);
  ay = new Float64Array(0);
  bx = new Float64Array(0);
  by = new Float64Array(0);
  fa = new Float64Array(0);
  fb = new Float64Array(0);

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
    this.rough = new Int32Array(n);
    this.kind = new Uint8Array(n);
    this.ax = new Float64Array(n);
    this.ay = new Float64Array(n);
    this.bx = new Float64Array(n);
    this.by = new Float64Array(n);
    this.fa = new Float64Array(n);
    this.fb = new Float64Array(n);
  }
}

const FAR = 1e9;

/**
 * Copies the centres at position index k into slot j of the kernel's input
 * (ws.ax, ay, bx, by); a body behind the star (z < 0, observer along +z)
 * occults nothing, so it is moved far off the disc.
 */
function stage(b: LightCurveWorkspace, k: number, j: number, hasMoon: boolean): void {
  b.ax[j] = b.zp[k] > 0 ? b.xp[k] : FAR;
  b.ay[j] = b.yp[k];
  b.bx[j] = hasMoon && b.zm[k] > 0 ? b.xm[k] : FAR;
  b.by[j] = hasMoon ? b.ym[k] : 0;
}

/** Pair fluxes of the first n staged slots into ws.fa (one array call: no per-point boxing). */
function stagedFluxes(b: LightCurveWorkspace, n: number, m: LightCurveModel, hasMoon: boolean): Float64Array {
  const part = (a: Float64Array): Float64Array => (a.length === n ? a : a.subarray(0, n));
  return pairTransitFluxArray(part(b.ax), part(b.ay), m.rp, part(b.bx), part(b.by), hasMoon ? m.rm : 0, m.u1, m.u2, b.fa, b.fb);
}

/**
 * Largest sky-plane speeds (stellar radii per s) of the planet, the moon and
 * their separation: the periapsis speed n·a·√((1 + e)/(1 − e)) of each
 * Keplerian orbit (vis-viva; Murray & Dermott 1999, eqs. 2.36 and 2.22), the
 * body's offset from the barycentre adding its share of the relative speed.
 */
function speedBounds(sys: OrbitSystem): { planet: number; moon: number; relative: number } {
  const peri = (o: OrbitSystem['barycentre']): number =>
    o.meanMotionRadS * o.aRstar * Math.sqrt((1 + o.eccentricity) / (1 - o.eccentricity));
  const vb = peri(sys.barycentre);
  const vs = sys.moon ? peri(sys.moon) : 0;
  return { planet: vb + Math.abs(sys.planetWeight) * vs, moon: vb + Math.abs(sys.moonWeight) * vs, relative: vs };
}

/**
 * Relative flux at mid-exposure times `timeS` (s since t0), averaged over
 * the exposure, written into `out`.
 *
 * Sub-exposures are spent only where they are needed. An exposure in which
 * every body stays wholly off the stellar disc or wholly on it, and planet
 * and moon cannot overlap, has no kink (exposureSmearing.ts): decided from
 * its mid-exposure positions and the largest distance a body can move in half
 * an exposure (speedBounds), so conservatively. Wholly off the disc, its
 * flux is exactly 1. Otherwise it is evaluated once, at its middle, if the
 * midpoint rule's error there, T²|F″|/24 (Davis & Rabinowitz 1984, Methods
 * of Numerical Integration, 2nd ed., §2.2 [from memory]) with F″ from the
 * second difference of its neighbours' mid-exposure fluxes, is at most a
 * quarter of the model's tolerance; that check matters next to the inner
 * contacts, where F″ grows as the disc's edge nears the limb (measured
 * 8.5e-7 there with the check off, bench reference scenario). An exposure
 * without both neighbours within three exposure lengths is not checked and
 * gets sub-exposures. Every other exposure (contacts, planet–moon overlaps)
 * gets the full `supersample` sub-exposures. Measured against 65
 * sub-exposures everywhere (test/photometry/lightCurve.test.ts, tolerance
 * 1e-6): worst error 2.5e-7, with 51 % of the exposures evaluated once; the
 * bench reference realization's light curve costs 1.6 instead of 2.6 ms.
 */
export function modelFlux(
  timeS: Float64Array,
  m: LightCurveModel,
  out: Float64Array = new Float64Array(timeS.length),
  ws: LightCurveWorkspace = new LightCurveWorkspace(),
): Float64Array {
  const n = timeS.length;
  const ns = Math.max(1, Math.round(m.supersample));
  const hasMoon = m.sys.moon !== null && m.rm > 0;
  ws.ensure(Math.max(n, 1));
  // Mid-exposure positions of every exposure.
  skyPositions(timeS, m.sys, { xp: ws.xp, yp: ws.yp, xm: ws.xm, ym: ws.ym, zp: ws.zp, zm: ws.zm });
  const v = speedBounds(m.sys);
  const half = 0.5 * m.exposureS * (1 + 1e-9) + 1e-9;
  const adaptive = ns > 1 && !m.supersampleEverywhere;
  classifyExposures(ws, n, ns, adaptive, hasMoon, m.rp, hasMoon ? m.rm : 0, v.planet * half, v.moon * half, v.relative * half, out);
  // The exposures evaluated once, at their middle.
  const nSingle = stageKind(ws, n, SINGLE, hasMoon);
  if (nSingle > 0) scatterKind(ws.kind, n, SINGLE, stagedFluxes(ws, nSingle, m, hasMoon), out);
  // Curvature check of the single evaluations (not needed without sub-exposures: ns = 1).
  const limit = 0.25 * (m.tolerance ?? DEFAULT_SMEARING_TOLERANCE);
  const nRough = roughExposures(ws.kind, timeS, n, ns, out, limit, (m.exposureS * m.exposureS) / 24, 3 * m.exposureS, ws.rough);
  if (nRough === 0) return out;
  // Centred midpoints of ns equal sub-exposures (Kipping 2010, §3) for the other exposures.
  const total = nRough * ns;
  const idx = Int32Array.from(ws.rough.subarray(0, nRough));
  ws.ensure(total);
  subExposureTimes(timeS, idx, nRough, ns, m.exposureS / ns, ws.t);
  const tv = total === ws.t.length ? ws.t : ws.t.subarray(0, total);
  skyPositions(tv, m.sys, { xp: ws.xp, yp: ws.yp, xm: ws.xm, ym: ws.ym, zp: ws.zp, zm: ws.zm });
  stageAll(ws, total, hasMoon);
  meansOfGroups(stagedFluxes(ws, total, m, hasMoon), idx, nRough, ns, out);
  return out;
}

// The passes of modelFlux, each a small top-level loop (the rule in DEVELOPERS.md):
// as one large function it was recompiled nine times in a 120-cell sweep, mostly
// as on-stack replacement of its loops.

/** Exposure kinds in LightCurveWorkspace.kind. */
const ROUGH = 0;
const SINGLE = 1;
const OFF_DISC = 2;

/**
 * kind[i] for each exposure from its mid-exposure positions (see modelFlux);
 * out[i] = 1 for those wholly off the disc. reachP, reachM, reachPM: the
 * farthest the planet, the moon and their separation move in half an exposure.
 */
function classifyExposures(
  ws: LightCurveWorkspace,
  n: number,
  ns: number,
  adaptive: boolean,
  hasMoon: boolean,
  rp: number,
  rm: number,
  reachP: number,
  reachM: number,
  reachPM: number,
  out: Float64Array,
): void {
  const { xp, yp, xm, ym, kind } = ws;
  for (let i = 0; i < n; i++) {
    const dp = Math.sqrt(xp[i] * xp[i] + yp[i] * yp[i]);
    const offP = dp - reachP >= 1 + rp;
    let smooth = (ns === 1 || offP || (adaptive && dp + reachP <= 1 - rp)) && Number.isFinite(dp);
    let offM = true;
    if (smooth && hasMoon) {
      const dm = Math.sqrt(xm[i] * xm[i] + ym[i] * ym[i]);
      offM = dm - reachM >= 1 + rm;
      const dx = xp[i] - xm[i];
      const dy = yp[i] - ym[i];
      smooth =
        (ns === 1 || offM || (adaptive && dm + reachM <= 1 - rm)) &&
        (offP || offM || Math.sqrt(dx * dx + dy * dy) - reachPM >= rp + rm);
    }
    if (!smooth) {
      kind[i] = ROUGH;
    } else if (offP && offM) {
      kind[i] = OFF_DISC;
      out[i] = 1;
    } else {
      kind[i] = SINGLE;
    }
  }
}

/** Stages the exposures of kind k (in order) for stagedFluxes; returns how many. */
function stageKind(ws: LightCurveWorkspace, n: number, k: number, hasMoon: boolean): number {
  const kind = ws.kind;
  let j = 0;
  for (let i = 0; i < n; i++) if (kind[i] === k) stage(ws, i, j++, hasMoon);
  return j;
}

/** Stages the first n positions as they are. */
function stageAll(ws: LightCurveWorkspace, n: number, hasMoon: boolean): void {
  for (let k = 0; k < n; k++) stage(ws, k, k, hasMoon);
}

/** out[i] = the next of f for each exposure of kind k (the inverse of stageKind). */
function scatterKind(kind: Uint8Array, n: number, k: number, f: Float64Array, out: Float64Array): void {
  for (let i = 0, j = 0; i < n; i++) if (kind[i] === k) out[i] = f[j++];
}

/**
 * Indices (into `rough`) of the exposures that need sub-exposures: kind ROUGH,
 * and kind SINGLE where the midpoint rule's error estimate e2·|F″| exceeds
 * `limit` or cannot be formed (see modelFlux). Returns their count.
 */
function roughExposures(
  kind: Uint8Array,
  timeS: Float64Array,
  n: number,
  ns: number,
  out: Float64Array,
  limit: number,
  e2: number,
  reach: number,
  rough: Int32Array,
): number {
  let nRough = 0;
  for (let i = 0; i < n; i++) {
    if (kind[i] === OFF_DISC) continue;
    if (kind[i] === SINGLE) {
      if (ns === 1) continue;
      if (i > 0 && i < n - 1 && kind[i - 1] !== ROUGH && kind[i + 1] !== ROUGH) {
        const h1 = timeS[i] - timeS[i - 1];
        const h2 = timeS[i + 1] - timeS[i];
        if (h1 > 0 && h2 > 0 && h1 <= reach && h2 <= reach) {
          // Second divided difference on uneven steps (common practice, no source).
          const f2 = (2 * ((out[i + 1] - out[i]) / h2 - (out[i] - out[i - 1]) / h1)) / (h1 + h2);
          if (e2 * Math.abs(f2) <= limit) continue;
        }
      }
    }
    rough[nRough++] = i;
  }
  return nRough;
}

/** t[r·ns + j] = the midpoint of sub-exposure j of exposure idx[r] (ns of length dt, centred). */
function subExposureTimes(timeS: Float64Array, idx: Int32Array, nRough: number, ns: number, dt: number, t: Float64Array): void {
  for (let r = 0; r < nRough; r++) {
    const base = r * ns;
    const ti = timeS[idx[r]];
    for (let j = 0; j < ns; j++) t[base + j] = ti + (j - (ns - 1) / 2) * dt;
  }
}

/** out[idx[r]] = the mean of f[r·ns … r·ns + ns − 1]. */
function meansOfGroups(f: Float64Array, idx: Int32Array, nRough: number, ns: number, out: Float64Array): void {
  for (let r = 0; r < nRough; r++) {
    let acc = 0;
    const base = r * ns;
    for (let j = 0; j < ns; j++) acc += f[base + j];
    out[idx[r]] = acc / ns;
  }
}

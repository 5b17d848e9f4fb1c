/**
 * Planet-only transit template: the exposure-averaged light curve of one
 * opaque disc crossing a quadratically limb-darkened star, as a function of
 * time from mid-transit, tabulated once and evaluated by cubic-spline
 * interpolation so that the fits below cost one table lookup per point.
 *
 * Model
 * - Sky track: the planet alone on the barycentre's Keplerian orbit
 *   (physics/skyPositions with no moon; Winn 2010, arXiv:1001.2010, eqs. 2–4),
 *   with the inclination set from the impact parameter b by Winn 2010 eq. 7.
 *   The time axis may be stretched by `timeScale` (track time = x / timeScale):
 *   the duration scale of the fits.
 * - Instantaneous flux: Mandel & Agol 2002 (ApJ 580, L171), `transitFlux`.
 * - Exposure: the mean over an exposure of length I centred on each time, by
 *   the midpoint rule over K equal sub-exposures (Kipping 2010, MNRAS 408,
 *   1758, §3). The table step h is chosen so that I = K·h with K odd; the
 *   sub-exposure midpoints then fall on table nodes and the average is a
 *   sliding mean of K instantaneous values.
 * - Origin: x = 0 is the template's own mid-transit (t1 + t4)/2, from the
 *   instantaneous first and last contacts (separation 1 + p), found by
 *   bisection; this is the quantity physics/planetTransitTruth calls the
 *   mid-time. T14 = t4 − t1 and T23 = t3 − t2 (separation 1 − p) likewise.
 * - Interpolation: natural cubic spline on the uniform table (Press et al.
 *   2007, Numerical Recipes 3rd ed., §3.3, eqs. 3.3.3 and 3.3.5–3.3.7), with
 *   its analytic first derivative for Jacobians. Outside the table the flux is
 *   exactly 1 and the slope 0 (the table extends past the exposure-widened
 *   contacts, where the smeared flux is exactly 1).
 *
 * Accuracy: the default step is the smaller of ingress/1000 and T14/16000.
 * Measured maximum |table − direct| (direct: midpoint rule with 4001
 * sub-exposures, 6000 points across the transit; p = 0.1, b = 0.3,
 * u = (0.4, 0.25), T14 = 2.43 h, ingress 14.5 min): 2.1e-9 (instantaneous,
 * the flux has a (t − t1)^{3/2} kink at the contacts), 8e-10 (1-min exposure),
 * 6e-10 (2 min), 3e-11 (30 min) of the stellar flux; build time 7–20 ms
 * (16 000 nodes). A step of T14/4000 gives 5e-8, 1e-8, 1e-8, 1e-9 in 2 ms.
 * Same check on the test system of test/timing/perTransitFit.test.ts (p = 0.1,
 * b = 0.3, T14 = 2.09 h, ingress 12.5 min; 1500 points): T14/1000 gives
 * 6.7e-7, 1.7e-7, 1.2e-7, 1.9e-8 and T14/4000 1.8e-8, 1.2e-8, 9e-9, 1.1e-9
 * (instantaneous, 1, 2, 30 min). The global fit iterates on T14/1000 tables
 * (`stepsPerT14`, with a reused `TemplateWorkspace`) and returns a T14/4000
 * one. The default table is checked in test/timing/perTransitFit.test.ts.
 */
import { transitFlux } from '../photometry/transitFlux.js';
import { orbitSystem, skyPositions, type OrbitSystem } from '../physics/skyPositions.js';
import { inclinationFromImpact, transitDurations } from '../physics/transitDuration.js';
import type { Scenario } from '../scenario/types.js';

/** Everything a template needs, SI units and radians. */
export interface TemplateGeometry {
  /** Orbital period, s. */
  periodS: number;
  /** Semi-major axis in stellar radii. */
  aOverRstar: number;
  eccentricity: number;
  /** Argument of periastron, rad (Winn 2010 convention). */
  omegaRad: number;
  /** Radius ratio p = R_p/R*. */
  radiusRatio: number;
  /** Impact parameter at conjunction, stellar radii (Winn 2010 eq. 7); must be < 1 + p. */
  impactParameter: number;
  /** Quadratic limb darkening (u1, u2 of Mandel & Agol 2002 §4). */
  u1: number;
  u2: number;
  /** Exposure (integration) time, s; 0 = instantaneous. */
  exposureS: number;
  /** Stretch of the time axis: track time = x / timeScale (default 1). */
  timeScale?: number;
}

export interface TransitTemplate {
  readonly geometry: Readonly<Required<TemplateGeometry>>;
  /** First-to-last contact duration t4 − t1 (instantaneous), s. */
  readonly t14S: number;
  /** Second-to-third contact duration, s (0 when grazing). */
  readonly t23S: number;
  /** Mean ingress duration (t14 − t23)/2, s. */
  readonly ingressS: number;
  /** 1 − minimum of the tabulated (smeared) flux. */
  readonly depth: number;
  /** x of the first table node, s from mid-transit. */
  readonly x0S: number;
  /** Table step, s. */
  readonly stepS: number;
  /** Smeared flux at the nodes x0S + k·stepS. */
  readonly values: Float64Array;
  /** Spline second derivatives at the nodes, per s². */
  readonly curvature: Float64Array;
}

/** The template geometry of a scenario's planet (planet radius, b, limb darkening, exposure). */
export function templateGeometryFromScenario(s: Scenario): TemplateGeometry {
  return {
    periodS: s.planet.periodS,
    aOverRstar: s.planet.semiMajorAxisM / s.star.radiusM,
    eccentricity: s.planet.eccentricity,
    omegaRad: s.planet.omegaRad,
    radiusRatio: s.planet.radiusM / s.star.radiusM,
    impactParameter: s.planet.impactParameter,
    u1: s.star.u1,
    u2: s.star.u2,
    exposureS: s.instrument.exposureS,
    timeScale: 1,
  };
}

function fail(name: string, value: number, allowed: string): never {
  throw new RangeError(`transitTemplate: ${name} must be ${allowed}, got ${value}`);
}

function checkGeometry(g: TemplateGeometry): Required<TemplateGeometry> {
  const timeScale = g.timeScale ?? 1;
  if (!(g.periodS > 0) || !Number.isFinite(g.periodS)) fail('periodS', g.periodS, 'a positive finite number');
  if (!(g.aOverRstar > 1) || !Number.isFinite(g.aOverRstar)) fail('aOverRstar', g.aOverRstar, 'a finite number > 1');
  if (!(g.eccentricity >= 0 && g.eccentricity < 1)) fail('eccentricity', g.eccentricity, 'in [0, 1)');
  if (!Number.isFinite(g.omegaRad)) fail('omegaRad', g.omegaRad, 'a finite angle');
  if (!(g.radiusRatio > 0 && g.radiusRatio < 1)) fail('radiusRatio', g.radiusRatio, 'in (0, 1)');
  if (!(g.impactParameter >= 0 && g.impactParameter < 1 + g.radiusRatio)) {
    fail('impactParameter', g.impactParameter, `in [0, 1 + p) = [0, ${1 + g.radiusRatio}) for a transit`);
  }
  if (!Number.isFinite(g.u1)) fail('u1', g.u1, 'finite');
  if (!Number.isFinite(g.u2)) fail('u2', g.u2, 'finite');
  if (!(g.exposureS >= 0) || !Number.isFinite(g.exposureS)) fail('exposureS', g.exposureS, 'a finite number ≥ 0');
  if (!(timeScale > 0) || !Number.isFinite(timeScale)) fail('timeScale', timeScale, 'a positive finite number');
  return { ...g, timeScale };
}

/** Sky separation of the planet from the star's centre at track time t (s from conjunction), stellar radii. */
function separationAt(sys: OrbitSystem, buf: Float64Array[], t: number): number {
  buf[0][0] = t;
  skyPositions(buf[0], sys, { xp: buf[1], yp: buf[2], xm: buf[3], ym: buf[3], zp: buf[4] });
  return buf[4][0] > 0 ? Math.hypot(buf[1][0], buf[2][0]) : Infinity;
}

/**
 * Time (track time, s from conjunction) where the separation crosses `c`,
 * searching from the closest approach `tMin` in direction `dir` (±1) with
 * step `step`, then bisecting to 1e-7 s (common practice, no source).
 */
function crossing(sys: OrbitSystem, buf: Float64Array[], tMin: number, c: number, dir: number, step: number): number {
  let a = tMin;
  if (!(separationAt(sys, buf, a) < c)) return NaN;
  let b = a + dir * step;
  for (let k = 0; k < 100_000 && separationAt(sys, buf, b) < c; k++) {
    a = b;
    b = a + dir * step;
  }
  for (let k = 0; k < 200 && Math.abs(b - a) > 1e-7; k++) {
    const m = 0.5 * (a + b);
    if (separationAt(sys, buf, m) < c) a = m;
    else b = m;
  }
  return 0.5 * (a + b);
}

/**
 * Time after conjunction (s) at which a circular orbit's sky separation
 * reaches c stellar radii: d(t)² = a²(sin²φ + cos²i cos²φ), φ = 2πt/P, so
 * sin²φ = (c² − a²cos²i)/(a² sin²i) (Winn 2010, arXiv:1001.2010, eqs. 5 and
 * 14 with e = 0; Seager & Mallén-Ornelas 2003, ApJ 585, 1038, eq. 3). NaN
 * when the track never comes that close (c below the impact parameter).
 */
function circularContact(g: Readonly<Required<TemplateGeometry>>, inc: number, c: number): number {
  const a = g.aOverRstar;
  const cosI = Math.cos(inc);
  const sinI = Math.sin(inc);
  const s2 = (c * c - a * a * cosI * cosI) / (a * a * sinI * sinI);
  if (!(s2 >= 0)) return NaN;
  return (Math.asin(Math.sqrt(Math.min(1, s2))) * g.periodS) / (2 * Math.PI);
}

/** Time of closest approach near conjunction (golden-section search, common practice, no source). */
function closestApproach(sys: OrbitSystem, buf: Float64Array[], half: number): number {
  let a = -half;
  let b = half;
  const g = (Math.sqrt(5) - 1) / 2;
  let c = b - g * (b - a);
  let d = a + g * (b - a);
  let fc = separationAt(sys, buf, c);
  let fd = separationAt(sys, buf, d);
  for (let k = 0; k < 200 && b - a > 1e-6; k++) {
    if (fc < fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - g * (b - a);
      fc = separationAt(sys, buf, c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + g * (b - a);
      fd = separationAt(sys, buf, d);
    }
  }
  return 0.5 * (a + b);
}

/**
 * Solve the natural cubic spline for uniform step h: M₀ = M_{n−1} = 0 and
 * M_{k−1} + 4M_k + M_{k+1} = 6(y_{k+1} − 2y_k + y_{k−1})/h² (Press et al. 2007,
 * Numerical Recipes §3.3, eq. 3.3.7 with uniform spacing), by the Thomas
 * algorithm. `scratch` has length ≥ n.
 */
function naturalSplineCurvature(y: Float64Array, h: number, m: Float64Array, scratch: Float64Array): void {
  const n = y.length;
  m[0] = 0;
  m[n - 1] = 0;
  if (n < 3) return;
  const inv = 6 / (h * h);
  // Forward sweep on the interior unknowns 1..n−2 (diagonal 4, off-diagonals 1).
  let diag = 4;
  scratch[1] = 1 / diag;
  m[1] = inv * (y[2] - 2 * y[1] + y[0]) / diag;
  for (let k = 2; k <= n - 2; k++) {
    diag = 4 - scratch[k - 1];
    scratch[k] = 1 / diag;
    m[k] = (inv * (y[k + 1] - 2 * y[k] + y[k - 1]) - m[k - 1]) / diag;
  }
  for (let k = n - 3; k >= 1; k--) m[k] -= scratch[k] * m[k + 1];
}

/**
 * Reusable scratch arrays for `buildTransitTemplate` (sky track and
 * instantaneous flux). A fit that rebuilds the template many times passes one
 * workspace, so only the returned table is allocated per build: allocating
 * and collecting the scratch arrays cost as much as computing them (measured
 * with node --cpu-prof on the global fit). Not shared between threads.
 */
export class TemplateWorkspace {
  // Five empty arrays, not `[]`: one element kind for V8 (see GlobalFitWorkspace in globalTransitFit.ts).
  private buf: Float64Array[] = [0, 1, 2, 3, 4].map(() => new Float64Array(0));
  /** Five arrays of length ≥ n (grown on demand, never shrunk). */
  arrays(n: number): Float64Array[] {
    if (this.buf[0].length < n) {
      const size = Math.max(n, Math.ceil(1.25 * this.buf[0].length));
      this.buf = [0, 1, 2, 3, 4].map(() => new Float64Array(size));
    }
    return this.buf.map((a) => a.subarray(0, n));
  }
}

export interface TemplateBuildOptions {
  /** Table step, s (rounded down so that the exposure is an odd multiple of it). */
  stepS?: number;
  /**
   * Table step as T14/stepsPerT14 (T14 found by the build itself; ignored when
   * `stepS` is given). The global fit iterates with 1000 and returns a 4000 table.
   */
  stepsPerT14?: number;
  /** Scratch arrays to reuse (default: allocate). */
  workspace?: TemplateWorkspace;
}

/** The planet-only orbit of a template geometry, in stellar radii, and its inclination (b → i by Winn 2010 eq. 7). */
function templateOrbit(g: Readonly<Required<TemplateGeometry>>): { sys: OrbitSystem; inc: number } {
  const inc = inclinationFromImpact(g.impactParameter, g.aOverRstar, g.eccentricity, g.omegaRad);
  const sys = orbitSystem({
    stellarRadiusM: 1,
    periodS: g.periodS,
    semiMajorAxisM: g.aOverRstar,
    eccentricity: g.eccentricity,
    omegaRad: g.omegaRad,
    inclinationRad: inc,
    moon: null,
  });
  return { sys, inc };
}

// The loops of a build, each in a small top-level function: inside the large
// buildTransitTemplate they ran as on-stack-replacement code that V8 threw
// away at nearly every build ("wrong map" deoptimizations, measured 141 in a
// 120-cell sweep), recompiling the function seven times.

/** Node times in the orbit's time unit: tt[k] = mid + (x0S + (k − halfK)·h)/ts, k < n. */
function nodeTimes(tt: Float64Array, n: number, mid: number, x0S: number, halfK: number, h: number, ts: number): void {
  for (let k = 0; k < n; k++) tt[k] = mid + (x0S + (k - halfK) * h) / ts;
}

/** out[k] = the planet's sky separation from the star's centre, or 1e9 (no occultation) when it is behind the star (z < 0). */
function separations(xp: Float64Array, yp: Float64Array, zp: Float64Array, n: number, out: Float64Array): void {
  for (let k = 0; k < n; k++) out[k] = zp[k] > 0 ? Math.sqrt(xp[k] * xp[k] + yp[k] * yp[k]) : 1e9;
}

/** inst[c + j] = inst[c − j] = half[j], j < m: a circular orbit's track about conjunction. */
function mirror(half: Float64Array, m: number, c: number, inst: Float64Array): void {
  for (let j = 0; j < m; j++) {
    inst[c + j] = half[j];
    inst[c - j] = half[j];
  }
}

/** values[k] = mean of inst[k … k + kSub − 1], k < n, by a running sum (Kipping 2010, §3, midpoint rule). */
function slidingMean(inst: Float64Array, kSub: number, n: number, values: Float64Array): void {
  let acc = 0;
  for (let k = 0; k < kSub; k++) acc += inst[k];
  values[0] = acc / kSub;
  for (let k = 1; k < n; k++) {
    acc += inst[k + kSub - 1] - inst[k - 1];
    values[k] = acc / kSub;
  }
}

/** Sets values[k] = 1 where the node x0S + k·h lies at or beyond ±edge; returns the smallest value. */
function clampOutside(values: Float64Array, n: number, x0S: number, h: number, edge: number): number {
  let minV = 1;
  for (let k = 0; k < n; k++) {
    const x = x0S + k * h;
    if (Math.abs(x) >= edge) values[k] = 1;
    if (values[k] < minV) minV = values[k];
  }
  return minV;
}

/**
 * Build the template table for a geometry (see the file header).
 * @throws RangeError naming the first invalid field, or when the planet does not transit.
 */
export function buildTransitTemplate(geometry: TemplateGeometry, opts: TemplateBuildOptions = {}): TransitTemplate {
  const g = checkGeometry(geometry);
  const p = g.radiusRatio;
  const { sys, inc } = templateOrbit(g);
  // Closed-form durations only to size the searches (Winn 2010 eqs. 14–16).
  const approx = transitDurations({
    periodS: g.periodS,
    aOverRstar: g.aOverRstar,
    radiusRatio: p,
    impactParameter: g.impactParameter,
    inclinationRad: Math.max(inc, 1e-9),
    eccentricity: g.eccentricity,
    omegaRad: g.omegaRad,
  });
  const t14Approx = approx.t14S > 0 ? approx.t14S : g.periodS / (Math.PI * g.aOverRstar);
  const circular = g.eccentricity === 0;
  let t1: number, t2: number, t3: number, t4: number;
  if (circular) {
    // Closed form: closest approach at conjunction (t = 0) and symmetric contacts.
    t4 = circularContact(g, inc, 1 + p);
    t1 = -t4;
    t3 = circularContact(g, inc, 1 - p);
    t2 = -t3;
  } else {
    const buf = [new Float64Array(1), new Float64Array(1), new Float64Array(1), new Float64Array(1), new Float64Array(1)];
    const tMin = closestApproach(sys, buf, t14Approx);
    const step = t14Approx / 64;
    t1 = crossing(sys, buf, tMin, 1 + p, -1, step);
    t4 = crossing(sys, buf, tMin, 1 + p, +1, step);
    t2 = crossing(sys, buf, tMin, 1 - p, -1, step);
    t3 = crossing(sys, buf, tMin, 1 - p, +1, step);
  }
  if (!Number.isFinite(t1) || !Number.isFinite(t4)) {
    throw new RangeError(`transitTemplate: impactParameter ${g.impactParameter} gives no transit for p = ${p}`);
  }
  const ts = g.timeScale;
  const t14S = (t4 - t1) * ts;
  const t23S = Number.isFinite(t2) && Number.isFinite(t3) ? (t3 - t2) * ts : 0;
  const ingressS = 0.5 * (t14S - t23S);
  const mid = 0.5 * (t1 + t4);

  // Table step: exposure = K·h with K odd (sub-exposure midpoints on nodes).
  if (opts.stepS === undefined && opts.stepsPerT14 !== undefined && !(opts.stepsPerT14 >= 1)) {
    fail('stepsPerT14', opts.stepsPerT14, 'a number ≥ 1');
  }
  const hWanted = opts.stepS ?? (opts.stepsPerT14 !== undefined ? t14S / opts.stepsPerT14 : Math.min(ingressS / 1000, t14S / 16000));
  if (!(hWanted > 0) || !Number.isFinite(hWanted)) fail('stepS', hWanted, 'a positive finite number');
  let kSub = 1;
  let h = hWanted;
  if (g.exposureS > 0) {
    kSub = Math.ceil(g.exposureS / hWanted);
    if (kSub % 2 === 0) kSub += 1;
    h = g.exposureS / kSub;
  }
  const halfK = (kSub - 1) / 2;
  const pad = 8;
  const halfSpan = 0.5 * t14S + 0.5 * g.exposureS + pad * h;
  const nHalf = Math.ceil(halfSpan / h);
  const n = 2 * nHalf + 1;
  const x0S = -nHalf * h;
  // Instantaneous flux on the nodes widened by halfK on both sides.
  const nWide = n + 2 * halfK;
  const [tt, xp, yp, zp, dummy] = (opts.workspace ?? new TemplateWorkspace()).arrays(nWide);
  let inst: Float64Array;
  if (circular) {
    // A circular orbit's track is symmetric about conjunction (mid = 0 here): evaluate the centre
    // node and the nodes after it, and mirror them (halves the cost of a build).
    const c = nHalf + halfK;
    const m = nWide - c;
    const tHalf = tt.subarray(0, m);
    nodeTimes(tHalf, m, 0, 0, 0, h, ts);
    skyPositions(tHalf, sys, { xp, yp, xm: dummy, ym: dummy, zp });
    separations(xp, yp, zp, m, tHalf);
    const half = transitFlux(tHalf, p, g.u1, g.u2, xp.subarray(0, m));
    inst = yp;
    mirror(half, m, c, inst);
  } else {
    nodeTimes(tt, nWide, mid, x0S, halfK, h, ts);
    skyPositions(tt, sys, { xp, yp, xm: dummy, ym: dummy, zp });
    const z = tt; // reuse
    separations(xp, yp, zp, nWide, z);
    inst = transitFlux(z, p, g.u1, g.u2, xp);
  }
  const values = new Float64Array(n);
  slidingMean(inst, kSub, n, values);
  // Outside the exposure-widened contacts the flux is exactly 1; remove rounding drift of the running sum.
  const minV = clampOutside(values, n, x0S, h, 0.5 * t14S + 0.5 * g.exposureS + h);
  const curvature = new Float64Array(n);
  naturalSplineCurvature(values, h, curvature, dummy);
  return { geometry: g, t14S, t23S, ingressS, depth: 1 - minV, x0S, stepS: h, values, curvature };
}

/**
 * Template flux at x (s from mid-transit) and its slope dF/dx (per s), written
 * to out[0], out[1]. Natural cubic spline (Press et al. 2007, eqs. 3.3.3 and
 * 3.3.5); 1 and 0 outside the table. Allocation-free kernel.
 */
export function templateFluxSlope(tpl: TransitTemplate, x: number, out: Float64Array): void {
  const h = tpl.stepS;
  const u = (x - tpl.x0S) / h;
  const k = Math.floor(u);
  const v = tpl.values;
  if (!(k >= 0 && k < v.length - 1)) {
    out[0] = Number.isNaN(x) ? NaN : 1;
    out[1] = Number.isNaN(x) ? NaN : 0;
    return;
  }
  const m = tpl.curvature;
  const B = u - k;
  const A = 1 - B;
  const y0 = v[k];
  const y1 = v[k + 1];
  const m0 = m[k];
  const m1 = m[k + 1];
  const h26 = (h * h) / 6;
  out[0] = A * y0 + B * y1 + ((A * A * A - A) * m0 + (B * B * B - B) * m1) * h26;
  out[1] = (y1 - y0) / h + ((1 - 3 * A * A) * m0 + (3 * B * B - 1) * m1) * (h / 6);
}

/**
 * Template flux, slope and curvature d²F/dx² at x, written to out[0..2]
 * (Press et al. 2007, eqs. 3.3.3, 3.3.5 and 3.3.6: the spline's second
 * derivative is linear between nodes). 1, 0, 0 outside the table.
 */
export function templateFluxDerivatives(tpl: TransitTemplate, x: number, out: Float64Array): void {
  const h = tpl.stepS;
  const u = (x - tpl.x0S) / h;
  const k = Math.floor(u);
  const v = tpl.values;
  if (!(k >= 0 && k < v.length - 1)) {
    const nan = Number.isNaN(x);
    out[0] = nan ? NaN : 1;
    out[1] = nan ? NaN : 0;
    out[2] = nan ? NaN : 0;
    return;
  }
  const m = tpl.curvature;
  const B = u - k;
  const A = 1 - B;
  const m0 = m[k];
  const m1 = m[k + 1];
  out[0] = A * v[k] + B * v[k + 1] + ((A * A * A - A) * m0 + (B * B * B - B) * m1) * ((h * h) / 6);
  out[1] = (v[k + 1] - v[k]) / h + ((1 - 3 * A * A) * m0 + (3 * B * B - 1) * m1) * (h / 6);
  out[2] = A * m0 + B * m1;
}

/** Template flux at x (s from mid-transit); 1 outside the table. Allocation-free kernel. */
export function templateFlux(tpl: TransitTemplate, x: number): number {
  const h = tpl.stepS;
  const u = (x - tpl.x0S) / h;
  const k = Math.floor(u);
  const v = tpl.values;
  if (!(k >= 0 && k < v.length - 1)) return Number.isNaN(x) ? NaN : 1;
  const m = tpl.curvature;
  const B = u - k;
  const A = 1 - B;
  return A * v[k] + B * v[k + 1] + ((A * A * A - A) * m[k] + (B * B * B - B) * m[k + 1]) * ((h * h) / 6);
}

/**
 * Template flux at x[0..n) into out[0..n) (1 outside the table): `templateFlux`
 * over an array in one call, for loops that would otherwise pay a call per point.
 */
export function templateFluxArray(tpl: TransitTemplate, x: Float64Array, n: number, out: Float64Array): void {
  const h = tpl.stepS;
  const x0 = tpl.x0S;
  const v = tpl.values;
  const m = tpl.curvature;
  const h26 = (h * h) / 6;
  const last = v.length - 1;
  for (let i = 0; i < n; i++) {
    const xi = x[i];
    const u = (xi - x0) / h;
    const k = Math.floor(u);
    if (!(k >= 0 && k < last)) {
      out[i] = Number.isNaN(xi) ? NaN : 1;
      continue;
    }
    const B = u - k;
    const A = 1 - B;
    out[i] = A * v[k] + B * v[k + 1] + ((A * A * A - A) * m[k] + (B * B * B - B) * m[k + 1]) * h26;
  }
}

/**
 * Direct (table-free) exposure-averaged template flux at each x, s from the
 * template's mid-transit, by the midpoint rule with `subSamples` sub-exposures.
 * Slow; for checking the table's interpolation error.
 */
export function directTemplateFlux(tpl: TransitTemplate, x: Float64Array, subSamples: number): Float64Array {
  const g = tpl.geometry;
  const { sys } = templateOrbit(g);
  // Recover the track time of x = 0 from the table geometry: the contacts are symmetric about it.
  const buf = [new Float64Array(1), new Float64Array(1), new Float64Array(1), new Float64Array(1), new Float64Array(1)];
  const approx = tpl.t14S / g.timeScale;
  const tMin = closestApproach(sys, buf, approx);
  const t1 = crossing(sys, buf, tMin, 1 + g.radiusRatio, -1, approx / 64);
  const t4 = crossing(sys, buf, tMin, 1 + g.radiusRatio, +1, approx / 64);
  const mid = 0.5 * (t1 + t4);
  const ns = Math.max(1, Math.round(subSamples));
  const n = x.length;
  const tt = new Float64Array(n * ns);
  const dt = g.exposureS / ns;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < ns; j++) tt[i * ns + j] = mid + (x[i] + (j - (ns - 1) / 2) * dt) / g.timeScale;
  }
  const xp = new Float64Array(n * ns);
  const yp = new Float64Array(n * ns);
  const zp = new Float64Array(n * ns);
  const dummy = new Float64Array(n * ns);
  skyPositions(tt, sys, { xp, yp, xm: dummy, ym: dummy, zp });
  for (let k = 0; k < n * ns; k++) tt[k] = zp[k] > 0 ? Math.hypot(xp[k], yp[k]) : 1e9;
  const inst = transitFlux(tt, g.radiusRatio, g.u1, g.u2, xp);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let acc = 0;
    for (let j = 0; j < ns; j++) acc += inst[i * ns + j];
    out[i] = acc / ns;
  }
  return out;
}

/**
 * The known-template detection bound: the probability that the best possible
 * test detects the moon when everything about it is known except the angles
 * the Monte Carlo draws (phase, and node / periapsis where they matter).
 *
 * Method (matched filter with nuisance parameters, linearised). The data are
 * the exposure-averaged light curve on the scenario's time stamps, white
 * Gaussian noise σ per exposure. Under H0 the planet-only model with its own
 * freedoms θ (mid-time, period, radius ratio, impact parameter through the
 * inclination, a/R* at fixed period i.e. the stellar density, the two
 * quadratic limb-darkening coefficients, and per transit window a flux offset
 * and a linear slope); under H1 the planet+moon model, whose difference from
 * the planet-only model is Δ. Linearising the planet-only model about its
 * best fit to the planet+moon light curve in mid-time and period (the truth
 * shifted by the moon's common transit displacement, found per angle set by
 * Gauss–Newton: `recentre`; about the truth itself, a shift δ common to every
 * transit, which the planet-only fit absorbs exactly, would leave −δ²F″/2 as
 * false signal) (columns of J = ∂F/∂θ), the generalised likelihood ratio test of a
 * known Δ is a matched filter on the part of Δ that no change of θ can mimic:
 *     SNR² = Δᵀ P⊥ Δ / σ²,   P⊥ = I − J (JᵀJ)⁻¹ Jᵀ
 * (Kay 1998, Fundamentals of Statistical Signal Processing Vol. II:
 * Detection Theory, §4.3 (the deterministic-signal matched filter, Pd = Q(Q⁻¹(Pfa) − √(d²)))
 * and §7.7 (the linear model with nuisance parameters); equivalently the
 * Fisher information of a signal amplitude after the nuisance parameters
 * are marginalised, Kay 1993, Vol. I, §3.7 and eq. 3.34 for the Cramér–Rao
 * bound of a parameter with others unknown; Kay's section and equation
 * numbers from memory). The one-sided test at
 * false-alarm rate α then detects with probability
 *     Pd = Φ(SNR − z₁₋α)      (Kay 1998, eq. 4.14).
 * Pd is averaged over the moon's unknown angles exactly as
 * `drawMoonOrientation` (realization.ts) draws them: phase uniform on
 * [0, 2π), node uniform when the moon orbit is inclined, periapsis uniform
 * when it is eccentric. The average is a deterministic K-point rule: phase at
 * 2π(j + ½)/K (the trapezoid rule, spectrally accurate for a smooth periodic
 * integrand; Trefethen & Weideman 2014, SIAM Review 56, 385), node and
 * periapsis on the Kronecker sequences frac(½ + j·g) with g = (√5 − 1)/2 and
 * √2 − 1 (equidistributed for irrational g: Weyl 1916, Math. Ann. 77, 313).
 *
 * No analysis of the same data can beat this line: it knows the moon's mass,
 * radius, separation, eccentricity and inclination, and tests one template
 * per drawn angle set. It leaves out red noise (`notes` says so when the
 * scenario has it) and the scenario's gaps and missed transits (every time
 * stamp of every window counts), which make real detection harder still.
 *
 * A ground campaign (site, target and campaign: noise/observingPlan.ts): the
 * time stamps are the plan's exposures, the calendar's observable stretches
 * of each transit at each site, each with its own σ at its air mass. The
 * model is then whitened (each row divided by σ_i/σ_ref), which turns the
 * weighted test into the white one above (Kay 1998, §4.5, the generalised
 * matched filter for known coloured noise, diagonal here), and the offset and
 * slope are per transit and site. Weather is left out: the bound assumes
 * every night clear (`notes` says so).
 *
 * Models: the exact photodynamical light curve (lightCurve.ts) with a fixed
 * smearing tolerance of 1 ppm, the planet-only reference being the moonless
 * scenario (the planet at the barycentre). The Jacobian is taken by central
 * differences on a model supersampled in every exposure that touches the disc
 * (a fixed sub-exposure grid, so the differences are smooth in θ), and is
 * orthonormalised once (modified Gram–Schmidt with one reorthogonalisation;
 * Björck 1996, Numerical Methods for Least Squares Problems, §2.4.5 [from
 * memory]). The
 * basis depends only on the moonless scenario, so cells of one null class
 * share it (`remembered`).
 */
import type { Scenario } from '../scenario/types.js';
import { orbitSystem, orbitSystemFromScenario, skyPositions, type OrbitSystem } from '../physics/skyPositions.js';
import { DEFAULT_SMEARING_TOLERANCE, lightCurveModel, LightCurveWorkspace, modelFlux, type LightCurveModel } from '../photometry/lightCurve.js';
import { sampleWindows, transitWindows } from '../photometry/transitWindows.js';
import { whiteNoiseSigma } from '../noise/whiteNoise.js';
import { normalCdf } from '../numeric/normal.js';
import { chiSquareUpperQuantile } from '../numeric/noncentralChiSquare.js';
import { remembered } from '../memo.js';
import { hasCampaign, observingPlan } from '../noise/observingPlan.js';
import { medianOfFinite as medianOf } from '../numeric/quantiles.js';

/** Default number of angle sets averaged (see the file header): on the bench reference system 12 sets stay within 0.002 of 96 (bench/bound.ts), at ~0.8 ms a set. */
export const DEFAULT_BOUND_ANGLES = 12;

/** The planet-only model's orthonormal basis on the scenario's time stamps. */
export interface PlanetOnlyBasis {
  timeS: Float64Array;
  epoch: Int32Array;
  /** Planet-only flux at each time stamp (1 ppm smearing tolerance). */
  flux: Float64Array;
  /** Sky X of the planet-only model (the barycentre), stellar radii, at each time stamp. */
  xb: Float64Array;
  /** Orthonormal columns, column-major: q[c·n + i]. */
  q: Float64Array;
  columns: number;
  /** Freedoms projected out (columns of J before orthonormalisation, degenerate ones dropped). */
  freedoms: string[];
  /** Reference σ per exposure (relative flux): the white level, or with a campaign the median of the plan's. */
  sigma: number;
  /** Whitening weight σ_ref/σ_i per row (all 1 without a ground campaign). */
  weight: Float64Array;
}

export interface KnownTemplateBound {
  /** Pd averaged over the drawn angles; NaN without noise or without a moon. */
  probability: number;
  /** Per angle set: SNR after projection. */
  snr: Float64Array;
  /** z₁₋α of the one-sided test. */
  threshold: number;
  /** What the bound leaves out of the scenario (red noise, gaps). */
  notes: string[];
}

/** Smearing tolerance of the bound's models (relative flux). */
const TOLERANCE = DEFAULT_SMEARING_TOLERANCE;

/** Orbit elements of the scenario's barycentre, with overrides (the Jacobian's perturbations). */
function planetOrbit(s: Scenario, o: { semiMajorAxisM?: number; inclinationRad?: number } = {}): OrbitSystem {
  return orbitSystem({
    stellarRadiusM: s.star.radiusM,
    periodS: s.planet.periodS,
    semiMajorAxisM: o.semiMajorAxisM ?? s.planet.semiMajorAxisM,
    eccentricity: s.planet.eccentricity,
    omegaRad: s.planet.omegaRad,
    inclinationRad: o.inclinationRad ?? s.planet.inclinationRad,
    moon: null,
  });
}

/** out = (a − b)/(2h). */
function centralDifference(a: Float64Array, b: Float64Array, h: number, out: Float64Array): void {
  for (let i = 0; i < out.length; i++) out[i] = (a[i] - b[i]) / (2 * h);
}

function dot(a: Float64Array, aOff: number, b: Float64Array, bOff: number, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) s += a[aOff + i] * b[bOff + i];
  return s;
}

/** v −= (qᵀv) q for each of the first `cols` columns of q (one pass of modified Gram–Schmidt). */
function orthogonalise(q: Float64Array, cols: number, v: Float64Array, n: number): void {
  for (let c = 0; c < cols; c++) {
    const off = c * n;
    const r = dot(q, off, v, 0, n);
    for (let i = 0; i < n; i++) v[i] -= r * q[off + i];
  }
}

/** Appends v to the basis if it is not (numerically) in its span; returns the new column count. */
function appendColumn(q: Float64Array, cols: number, v: Float64Array, n: number): number {
  const norm0 = Math.sqrt(dot(v, 0, v, 0, n));
  if (!(norm0 > 0)) return cols;
  orthogonalise(q, cols, v, n);
  orthogonalise(q, cols, v, n); // "twice is enough" (Björck 1996, §2.4.5)
  const norm = Math.sqrt(dot(v, 0, v, 0, n));
  if (!(norm > 1e-9 * norm0)) return cols;
  const off = cols * n;
  for (let i = 0; i < n; i++) q[off + i] = v[i] / norm;
  return cols + 1;
}

/** Planet-only light-curve model on a given orbit, limb darkening and radius ratio, supersampled in every exposure on the disc. */
function planetModel(base: LightCurveModel, sys: OrbitSystem, rp: number, u1: number, u2: number): LightCurveModel {
  return { ...base, sys, rp, rm: 0, u1, u2, supersampleEverywhere: true };
}

/** Time stamps, epochs, groups for the per-window offsets and slopes, and per-row σ (null: one white level). */
function boundSamples(s: Scenario): { timeS: Float64Array; epoch: Int32Array; group: Int32Array; groups: number; sigmaRow: Float64Array | null } {
  const plan = observingPlan(s);
  if (plan === null) {
    const { timeS, epoch } = sampleWindows(transitWindows(s), s.instrument.cadenceS);
    return { timeS, epoch, group: epoch, groups: transitWindows(s).length, sigmaRow: null };
  }
  // One offset and slope per (transit, site): each site calibrates its own baseline.
  const sites = s.sky ? Math.max(1, s.sky.sites.length) : 1;
  const group = new Int32Array(plan.timeS.length);
  for (let i = 0; i < group.length; i++) group[i] = plan.epoch[i] * sites + plan.site[i];
  return { timeS: plan.timeS, epoch: plan.epoch, group, groups: plan.epochs * sites, sigmaRow: plan.sigma };
}

function computeBasis(s0: Scenario): PlanetOnlyBasis {
  const s: Scenario = { ...s0, moon: null };
  const { timeS, epoch, group, groups, sigmaRow } = boundSamples(s);
  const n = timeS.length;
  const sigma = sigmaRow === null ? whiteNoiseSigma(s.instrument.noiseFraction, s.instrument.noiseTimescaleS, s.instrument.exposureS) : medianOf(sigmaRow);
  const weight = new Float64Array(n).fill(1);
  if (sigmaRow !== null) for (let i = 0; i < n; i++) weight[i] = sigmaRow[i] > 0 ? sigma / sigmaRow[i] : 0;
  const ws = new LightCurveWorkspace();
  const base = lightCurveModel(s, { tolerance: TOLERANCE });
  const flux = modelFlux(timeS, base, new Float64Array(n), ws);
  const xb = new Float64Array(n);
  const scratch = new Float64Array(n);
  skyPositions(timeS, base.sys, { xp: xb, yp: scratch, xm: scratch, ym: scratch });
  const fine = planetModel(base, base.sys, base.rp, base.u1, base.u2);
  const plus = new Float64Array(n);
  const minus = new Float64Array(n);
  const col = new Float64Array(n);
  const q = new Float64Array((7 + 2 * groups) * n);
  const freedoms: string[] = [];
  let cols = 0;
  const add = (name: string, v: Float64Array): void => {
    for (let i = 0; i < n; i++) v[i] *= weight[i];
    const before = cols;
    cols = appendColumn(q, cols, v, n);
    if (cols > before) freedoms.push(name);
  };
  const diff = (mp: LightCurveModel, mm: LightCurveModel, h: number, t: Float64Array = timeS): void => {
    modelFlux(t, mp, plus, ws);
    modelFlux(t, mm, minus, ws);
    centralDifference(plus, minus, h, col);
  };
  // Mid-time and period: ∂F/∂t_c = −F′(t), ∂F/∂P = −n F′(t) for epoch n (the sign does not change the span).
  const ht = Math.min(1, 0.01 * s.instrument.exposureS);
  const tp = new Float64Array(n);
  const tm = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    tp[i] = timeS[i] + ht;
    tm[i] = timeS[i] - ht;
  }
  modelFlux(tp, fine, plus, ws);
  modelFlux(tm, fine, minus, ws);
  centralDifference(plus, minus, ht, col);
  const slope = Float64Array.from(col);
  add('mid-time', col);
  for (let i = 0; i < n; i++) col[i] = epoch[i] * slope[i];
  add('period', col);
  // Radius ratio, impact parameter (through the inclination), a/R* at fixed period, limb darkening.
  const hr = 1e-3 * base.rp;
  diff(planetModel(base, base.sys, base.rp + hr, base.u1, base.u2), planetModel(base, base.sys, base.rp - hr, base.u1, base.u2), hr);
  add('radius ratio', col);
  const aR = s.planet.semiMajorAxisM / s.star.radiusM;
  const hi = 1e-3 / aR;
  const inc = s.planet.inclinationRad;
  diff(
    planetModel(base, planetOrbit(s, { inclinationRad: Math.min(Math.PI, inc + hi) }), base.rp, base.u1, base.u2),
    planetModel(base, planetOrbit(s, { inclinationRad: Math.max(0, inc - hi) }), base.rp, base.u1, base.u2),
    hi,
  );
  add('impact parameter', col);
  const ha = 1e-4 * s.planet.semiMajorAxisM;
  diff(
    planetModel(base, planetOrbit(s, { semiMajorAxisM: s.planet.semiMajorAxisM + ha }), base.rp, base.u1, base.u2),
    planetModel(base, planetOrbit(s, { semiMajorAxisM: s.planet.semiMajorAxisM - ha }), base.rp, base.u1, base.u2),
    ha,
  );
  add('a/R* (stellar density)', col);
  const hu = 1e-3;
  diff(planetModel(base, base.sys, base.rp, base.u1 + hu, base.u2), planetModel(base, base.sys, base.rp, base.u1 - hu, base.u2), hu);
  add('limb darkening u1', col);
  diff(planetModel(base, base.sys, base.rp, base.u1, base.u2 + hu), planetModel(base, base.sys, base.rp, base.u1, base.u2 - hu), hu);
  add('limb darkening u2', col);
  // Per window: a flux offset and a linear slope about the window's conjunction.
  const P = s.planet.periodS;
  for (let g = 0; g < groups; g++) {
    col.fill(0);
    let any = false;
    for (let i = 0; i < n; i++) if (group[i] === g) { col[i] = 1; any = true; }
    if (!any) continue;
    add(`offset of window ${g}`, col);
    col.fill(0);
    for (let i = 0; i < n; i++) if (group[i] === g) col[i] = (timeS[i] - epoch[i] * P) / P;
    add(`slope of window ${g}`, col);
  }
  return { timeS, epoch, flux, xb, q: q.slice(0, cols * n), columns: cols, freedoms, sigma, weight };
}

const BASIS_CACHE_SIZE = 8;
const basisCache = new Map<string, PlanetOnlyBasis>();

/**
 * The planet-only basis of a scenario (its moon ignored). A pure function of
 * the moonless scenario, kept per thread (`remembered`): the cells of a
 * mass × separation grid share it.
 */
export function planetOnlyBasis(s: Scenario): PlanetOnlyBasis {
  const { star, planet, instrument, observation } = s;
  const key = [
    star.radiusM, star.u1, star.u2, planet.radiusM, planet.periodS, planet.semiMajorAxisM, planet.eccentricity, planet.omegaRad,
    planet.inclinationRad, instrument.cadenceS, instrument.exposureS, instrument.noiseFraction, instrument.noiseTimescaleS,
    observation.transits, observation.baselineS, observation.t0BjdTdb, JSON.stringify(s.sky ?? null), JSON.stringify(instrument.ground ?? null),
  ].join(',');
  return remembered(basisCache, BASIS_CACHE_SIZE, key, () => computeBasis(s));
}

/** ‖P⊥ d‖² for the orthonormal basis q (n × cols), d given on the rows `rows` (zero elsewhere). */
function projectedNorm2(q: Float64Array, cols: number, n: number, d: Float64Array, rows: Int32Array, m: number): number {
  let total = 0;
  for (let k = 0; k < m; k++) total += d[k] * d[k];
  for (let c = 0; c < cols; c++) {
    const off = c * n;
    let r = 0;
    for (let k = 0; k < m; k++) r += q[off + rows[k]] * d[k];
    total -= r * r;
  }
  return Math.max(0, total);
}

/** d[k] = (a[k] − b[rows[k]])·w[rows[k]] (the whitened difference). */
function subtractRows(a: Float64Array, b: Float64Array, rows: Int32Array, m: number, w: Float64Array, d: Float64Array): void {
  for (let k = 0; k < m; k++) d[k] = (a[k] - b[rows[k]]) * w[rows[k]];
}

/** The rows where the barycentre's sky X is within `reach` of the star's centre; returns their count. */
function rowsWithin(xb: Float64Array, reach: number, rows: Int32Array): number {
  let m = 0;
  for (let i = 0; i < xb.length; i++) if (Math.abs(xb[i]) <= reach) rows[m++] = i;
  return m;
}

/** Whitened slope ∂F/∂t of the planet-only model on the rows (central difference of the supersampled model). */
function timeSlope(basis: PlanetOnlyBasis, rows: Int32Array, m: number): Float64Array {
  // The mid-time column before orthonormalisation is not kept; rebuild it from the flux by central differences
  // on the rows' neighbours in time where they are one cadence apart, one-sided at the ends of a window.
  const out = new Float64Array(m);
  const { timeS, flux, weight } = basis;
  for (let k = 0; k < m; k++) {
    const i = rows[k];
    const lo = i > 0 && basis.epoch[i - 1] === basis.epoch[i] ? i - 1 : i;
    const hi = i + 1 < timeS.length && basis.epoch[i + 1] === basis.epoch[i] ? i + 1 : i;
    const dt = timeS[hi] - timeS[lo];
    out[k] = dt > 0 ? ((flux[hi] - flux[lo]) / dt) * weight[i] : 0;
  }
  return out;
}

/**
 * Gauss–Newton on the reference's mid-time τ₀ and period τ₁ (Björck 1996, §9.2.1): withMoon = the
 * planet+moon model at t + τ₀ + n·τ₁ at the end, d its whitened difference from the planet-only flux.
 * The 2 × 2 normal equations use the columns F′ and n·F′ (whitened); five iterations (the shift is
 * a fraction of an ingress, where Gauss–Newton converges in two or three).
 */
function recentre(
  t: Float64Array, ep: Float64Array, m: number, model: LightCurveModel, flux: Float64Array, rows: Int32Array, w: Float64Array,
  slope: Float64Array, ts: Float64Array, withMoon: Float64Array, d: Float64Array, ws: LightCurveWorkspace, curvature: number,
): void {
  let a00 = 0;
  let a01 = 0;
  let a11 = 0;
  for (let r = 0; r < m; r++) {
    a00 += slope[r] * slope[r];
    a01 += ep[r] * slope[r] * slope[r];
    a11 += ep[r] * ep[r] * slope[r] * slope[r];
  }
  const det = a00 * a11 - a01 * a01;
  let tau0 = 0;
  let tau1 = 0;
  for (let it = 0; it < 6; it++) {
    for (let r = 0; r < m; r++) ts[r] = t[r] + tau0 + ep[r] * tau1;
    modelFlux(ts, model, withMoon, ws);
    if (it === 5 || !(det > 0)) break;
    subtractRows(withMoon, flux, rows, m, w, d);
    let b0 = 0;
    let b1 = 0;
    for (let r = 0; r < m; r++) {
      b0 += slope[r] * d[r];
      b1 += ep[r] * slope[r] * d[r];
    }
    // d ≈ F′·(τ − δ): the least-squares coefficients are the remaining shift.
    const c0 = (a11 * b0 - a01 * b1) / det;
    const c1 = (a00 * b1 - a01 * b0) / det;
    // Stop when the step left untaken could change the SNR by at most 0.05: its first order is projected
    // out anyway, its second order is at most ½·Δτ²·‖F″‖/σ (Taylor).
    const step = Math.max(Math.abs(c0), Math.abs(c0 + c1 * ep[m - 1]));
    if (0.5 * step * step * curvature < 0.05) break;
    tau0 -= c0;
    tau1 -= c1;
  }
}

/** The j-th of K angle sets (see the file header), as `drawMoonOrientation` would set them. */
export function boundAngles(s: Scenario, j: number, k: number): { phaseRad: number; nodeRad: number; periapsisRad: number } {
  const m = s.moon!;
  const frac = (x: number): number => x - Math.floor(x);
  const twoPi = 2 * Math.PI;
  return {
    phaseRad: (twoPi * (j + 0.5)) / k,
    nodeRad: m.inclinationRad > 0 ? twoPi * frac(0.5 + j * ((Math.sqrt(5) - 1) / 2)) : m.nodeRad,
    periapsisRad: m.eccentricity > 0 ? twoPi * frac(0.5 + j * (Math.SQRT2 - 1)) : m.periapsisRad,
  };
}

/** z₁₋α = √(χ²₁ upper 2α quantile) for α < ½ (the square of a standard normal is χ²₁). */
export function oneSidedNormalThreshold(alpha: number): number {
  if (!(alpha > 0 && alpha < 0.5)) throw new RangeError(`alpha must be in (0, 0.5); got ${alpha}`);
  return Math.sqrt(chiSquareUpperQuantile(2 * alpha, 1));
}

/** What the bound leaves out of this scenario, in words. */
export function boundNotes(s: Scenario): string[] {
  const notes: string[] = [];
  const red = s.instrument.redNoise;
  if (red) notes.push(`the bound assumes white noise only: the scenario's red noise (${red.model === 'drw' ? 'damped random walk' : 'power law'}) is not in it`);
  if (hasCampaign(s)) {
    const c = s.sky?.constraints.clearFraction ?? 1;
    if (c < 1) notes.push(`the bound counts every observable stretch of the campaign as if every night were clear: the scenario's weather (clear fraction ${c}) is not in it`);
  }
  if (s.observation.missedFraction > 0 || s.observation.dutyCycle < 1) {
    notes.push('the bound counts every time stamp of every window: the scenario\'s missed transits and gaps are not in it');
  }
  return notes;
}

/**
 * The known-template bound of a scenario with a moon (see the file header).
 * @param opts.angles number K of angle sets averaged (default DEFAULT_BOUND_ANGLES)
 * @param opts.planetOnly the moonless scenario whose model (and basis) is the reference: a sweep passes
 *   its null class's, shared by the cells of the class (default: this scenario without its moon)
 * @throws RangeError without a moon, or for K < 1
 */
export function knownTemplateBound(s: Scenario, opts: { angles?: number; planetOnly?: Scenario } = {}): KnownTemplateBound {
  if (!s.moon) throw new RangeError('knownTemplateBound: the scenario has no moon');
  const k = opts.angles ?? DEFAULT_BOUND_ANGLES;
  if (!Number.isInteger(k) || k < 1) throw new RangeError(`angles must be an integer ≥ 1; got ${k}`);
  const basis = planetOnlyBasis(opts.planetOnly ?? s);
  const { timeS, flux, q, columns, sigma } = basis;
  const n = timeS.length;
  const threshold = oneSidedNormalThreshold(s.detection.falseAlarm);
  const snr = new Float64Array(k);
  const notes = boundNotes(s);
  if (!(sigma > 0)) return { probability: NaN, snr: snr.fill(NaN), threshold, notes: [...notes, 'no bound without noise'] };
  // Δ vanishes where both bodies stay off the disc whatever the angles: where the barycentre is farther
  // from the star's centre along X than 1 + R_P + R_S + the largest planet–moon distance a(1 + e) (each
  // body sits within that distance of the barycentre) + its motion in half an exposure. Only the other
  // rows are modelled (the sum over the rest is exactly zero).
  const sys = orbitSystemFromScenario(s);
  const v = sys.barycentre.meanMotionRadS * sys.barycentre.aRstar * Math.sqrt((1 + sys.barycentre.eccentricity) / (1 - sys.barycentre.eccentricity));
  const aRel = (s.moon.separationM / s.star.radiusM) * (1 + s.moon.eccentricity);
  // Widened by the reference's re-centring shift (below): at most the planet's distance from the barycentre,
  // a·m_S/(m_P + m_S), once for the mid-time and once more for the period's drift over the epochs.
  const shiftReach = (3 * aRel * s.moon.massKg) / (s.planet.massKg + s.moon.massKg);
  const reach = 1 + (s.planet.radiusM + s.moon.radiusM) / s.star.radiusM + aRel + shiftReach + v * s.instrument.exposureS + 1e-6;
  const rows = new Int32Array(n);
  const m = rowsWithin(basis.xb, reach, rows);
  const t = new Float64Array(m);
  for (let r = 0; r < m; r++) t[r] = timeS[rows[r]];
  const ws = new LightCurveWorkspace();
  const withMoon = new Float64Array(m);
  const d = new Float64Array(m);
  // The simulation's smearing tolerance (observe.ts): 2 % of the per-point noise, at least 1 ppm.
  const model = lightCurveModel(s, { tolerance: Math.max(TOLERANCE, 0.02 * sigma) });
  const ep = new Float64Array(m);
  for (let r = 0; r < m; r++) ep[r] = basis.epoch[rows[r]];
  const slope = timeSlope(basis, rows, m);
  // ‖F″‖/σ on the rows (whitened), from the slopes' differences: the re-centring's stopping rule.
  let c2 = 0;
  for (let r = 0; r < m; r++) {
    const lo = r > 0 && ep[r - 1] === ep[r] ? r - 1 : r;
    const hi = r + 1 < m && ep[r + 1] === ep[r] ? r + 1 : r;
    const dt = t[hi] - t[lo];
    if (dt > 0) c2 += ((slope[hi] - slope[lo]) / dt) ** 2;
  }
  const curvature = Math.sqrt(c2) / sigma;
  const ts = new Float64Array(m);
  let p = 0;
  for (let j = 0; j < k; j++) {
    const drawn: Scenario = { ...s, moon: { ...s.moon, ...boundAngles(s, j, k) } };
    const mj = { ...model, sys: orbitSystemFromScenario(drawn) };
    // Linearised about the best planet-only ephemeris, not the truth: the planet-only fit absorbs a
    // common displacement of every transit (a moon whose period is near-commensurate with the
    // planet's shifts all transits alike) exactly, while the Jacobian at the truth absorbs only its
    // first order and leaves −δ²F″/2 as signal, which no fit sees (SNR ~30 for δ ≈ 1000 s, a third of
    // an ingress, on the reference system). The mid-time τ₀ and period τ₁ of the reference are found by
    // Gauss–Newton on the timing columns (Björck 1996, Numerical Methods for Least Squares Problems,
    // §9.2.1), the model evaluated at t + τ₀ + n·τ₁ (equivalently the planet-only model shifted by
    // them), then Δ projected as before.
    recentre(t, ep, m, mj, flux, rows, basis.weight, slope, ts, withMoon, d, ws, curvature);
    subtractRows(withMoon, flux, rows, m, basis.weight, d);
    snr[j] = Math.sqrt(projectedNorm2(q, columns, n, d, rows, m)) / sigma;
    p += normalCdf(snr[j] - threshold);
  }
  return { probability: p / k, snr, threshold, notes };
}

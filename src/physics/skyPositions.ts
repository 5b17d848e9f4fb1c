/**
 * Sky-plane positions of a planet and its moon in front of their star: a
 * hierarchical (nested) two-Kepler model.
 *
 * Model
 * - The planet–moon barycentre B moves on a Keplerian ellipse about the star
 *   (period P, semi-major axis a_B, eccentricity e, argument of periastron ω,
 *   inclination i). The star's reflex motion is ignored: the star's centre is
 *   the origin.
 * - Planet and moon move on their mutual Keplerian ellipse (relative semi-major
 *   axis a_S, e_S, argument of periapsis ω_S, node Ω_S, inclination i_S, mean
 *   anomaly φ_S at t = 0), period from Kepler's third law with M_P + M_S
 *   (Murray & Dermott 1999, "Solar System Dynamics", eq. 2.22). With
 *   r_rel = r_moon − r_planet, the barycentre definition gives
 *   r_P = B − M_S/(M_P + M_S)·r_rel and r_M = B + M_P/(M_P + M_S)·r_rel.
 * - Mutual perturbations and the star's tide on the moon orbit are neglected.
 *
 * Axes (sky frame; Winn 2010, "Transits and Occultations", arXiv:1001.2010,
 * eqs. 2–4): X, Y span the sky plane, Z points from the star toward the
 * observer. A body is in front of the star when z > 0. The barycentre orbit
 * has its ascending node at Ω = π, so
 *     X = −r cos(ω + f),  Y = −r sin(ω + f) cos i,  Z = r sin(ω + f) sin i,
 * which is Murray & Dermott 1999 eq. 2.122 with Ω = π. Conjunction (transit)
 * is at f = π/2 − ω, where X = 0, Y = −b (b the impact parameter of Winn eq. 7)
 * and the barycentre moves toward +X. All coordinates are in stellar radii.
 *
 * Time origin: t = 0 s is the barycentre's conjunction of epoch 0, the instant
 * when its true anomaly is f = π/2 − ω (X_B = 0). For an eccentric, inclined
 * orbit the minimum sky separation comes earlier or later by a constant
 * offset (zero when e = 0, i = π/2 or ω = ±π/2; seconds to minutes otherwise,
 * e.g. −98 s for P = 10 d, a/R* = 20, e = 0.3, ω = 0, i = 87°); see
 * `minimumSeparationOffsetS` in transitTimes.ts. moonsieve uses conjunction.
 *
 * Moon orbit orientation: its elements are referred to the planet's orbital
 * plane, with the reference direction along the planet orbit's ascending node
 * on the sky (sky direction −X; the direction from which ω is measured). The moon's
 * perifocal frame is rotated into the sky frame by
 *     R = R_z(Ω = π) · R_x(i) · R_z(Ω_S) · R_x(i_S′) · R_z(ω_S)
 * (the rotation sequence of Murray & Dermott 1999, eqs. 2.119–2.122, applied
 * twice: moon orbit → planet orbital plane → sky), with i_S′ = i_S for a
 * prograde moon and i_S′ = π − i_S for a retrograde one (which reverses the
 * sense of motion). A coplanar prograde moon (i_S = 0) therefore orbits in the
 * same sense as the planet: on the near side of the planet (z_M > z_P) it
 * moves toward +X, like the planet at transit. The moon passes in front of the
 * planet (coplanar, edge-on) at f_S = π/2 − Ω_S − ω_S.
 *
 * Performance: `orbitSystem` / `orbitSystemFromScenario` precompute the
 * rotation vectors and mean motions once; `skyPositions` then solves two
 * Kepler equations per time point and allocates nothing.
 */

import { G } from './constants.js';
import { eccentricAnomaly, eccentricFromTrueAnomaly } from './kepler.js';
import type { Scenario } from '../scenario/types.js';

/** Elements of the planet–moon relative orbit, SI units and radians. */
export interface MoonOrbitParams {
  planetMassKg: number;
  moonMassKg: number;
  /** Semi-major axis of the planet–moon relative orbit, m. */
  separationM: number;
  eccentricity: number;
  /** Inclination to the planet's orbital plane, rad (0 = coplanar). */
  inclinationRad: number;
  /** Ascending node on the planet's orbital plane, rad (from the planet orbit's sky node). */
  nodeRad: number;
  /** Argument of periapsis, rad. */
  periapsisRad: number;
  /** Mean anomaly at t = 0 (barycentre conjunction, epoch 0), rad. */
  phaseRad: number;
  /** Reverse the sense of motion (i_S → π − i_S). */
  retrograde: boolean;
}

/** Everything `orbitSystem` needs, SI units and radians. */
export interface OrbitParams {
  stellarRadiusM: number;
  /** Period of the barycentre's orbit about the star, s. */
  periodS: number;
  /** Semi-major axis of the barycentre's orbit, m. */
  semiMajorAxisM: number;
  eccentricity: number;
  /** Argument of periastron ω of the barycentre orbit, rad (Winn 2010 convention). */
  omegaRad: number;
  /** Inclination to the sky plane, rad (π/2 = edge-on). */
  inclinationRad: number;
  moon: MoonOrbitParams | null;
}

/**
 * One precomputed Keplerian orbit: position at time t (s) is
 *   x_orb = a (cos E − e), y_orb = b (sin E)   (Murray & Dermott 1999, eq. 2.41, b = a√(1 − e²)),
 *   sky = x_orb · P + y_orb · Q,
 * with E from Kepler's equation at M = meanAnomalyAtZeroRad + meanMotionRadS · t.
 * Lengths in stellar radii.
 */
export interface KeplerOrbitFrame {
  readonly meanMotionRadS: number;
  readonly meanAnomalyAtZeroRad: number;
  readonly eccentricity: number;
  /** Semi-major axis, stellar radii. */
  readonly aRstar: number;
  /** Semi-minor axis a√(1 − e²), stellar radii. */
  readonly bRstar: number;
  /** Sky-frame unit vector toward periapsis. */
  readonly px: number;
  readonly py: number;
  readonly pz: number;
  /** Sky-frame unit vector 90° ahead of periapsis in the direction of motion. */
  readonly qx: number;
  readonly qy: number;
  readonly qz: number;
}

/** A planet(–moon) system ready for `skyPositions`. Build it with `orbitSystem` or `orbitSystemFromScenario`. */
export interface OrbitSystem {
  /** The barycentre's orbit about the star. */
  readonly barycentre: KeplerOrbitFrame;
  /** The moon's orbit relative to the planet (r_moon − r_planet), or null when there is no moon. */
  readonly moon: KeplerOrbitFrame | null;
  /** −M_S/(M_P + M_S): planet offset from B per unit relative vector (0 without a moon). */
  readonly planetWeight: number;
  /** M_P/(M_P + M_S): moon offset from B per unit relative vector (0 without a moon). */
  readonly moonWeight: number;
  /** Barycentre orbital period, s. */
  readonly periodS: number;
  /** Moon orbital period from Kepler's third law with M_P + M_S, s (NaN without a moon). */
  readonly moonPeriodS: number;
}

/**
 * Caller-owned output buffers, each at least as long as the time array.
 * Planet (p) and moon (m) sky coordinates in stellar radii; the optional z
 * arrays take the line-of-sight coordinate (z > 0: between star and observer);
 * the optional b arrays take the barycentre. Without a moon, the moon arrays
 * are filled with NaN and the planet sits at B.
 */
export interface SkyPositionBuffers {
  xp: Float64Array;
  yp: Float64Array;
  xm: Float64Array;
  ym: Float64Array;
  zp?: Float64Array;
  zm?: Float64Array;
  xb?: Float64Array;
  yb?: Float64Array;
  zb?: Float64Array;
}

type Matrix3 = [number, number, number, number, number, number, number, number, number];

/** Active rotation about z by angle a (Murray & Dermott 1999, eqs. 2.119 and 2.121). */
function rotZ(a: number): Matrix3 {
  const c = Math.cos(a);
  const s = Math.sin(a);
  return [c, -s, 0, s, c, 0, 0, 0, 1];
}

/** Active rotation about x by angle a (Murray & Dermott 1999, eq. 2.120). */
function rotX(a: number): Matrix3 {
  const c = Math.cos(a);
  const s = Math.sin(a);
  return [1, 0, 0, 0, c, -s, 0, s, c];
}

function mul(a: Matrix3, b: Matrix3): Matrix3 {
  const r = new Array<number>(9) as Matrix3;
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      r[3 * i + j] = a[3 * i] * b[j] + a[3 * i + 1] * b[3 + j] + a[3 * i + 2] * b[6 + j];
    }
  }
  return r;
}

function frame(
  rotation: Matrix3,
  aRstar: number,
  e: number,
  meanMotionRadS: number,
  meanAnomalyAtZeroRad: number,
): KeplerOrbitFrame {
  return {
    meanMotionRadS,
    meanAnomalyAtZeroRad,
    eccentricity: e,
    aRstar,
    bRstar: aRstar * Math.sqrt(1 - e * e),
    px: rotation[0],
    py: rotation[3],
    pz: rotation[6],
    qx: rotation[1],
    qy: rotation[4],
    qz: rotation[7],
  };
}

function check(ok: boolean, name: string, value: unknown, allowed: string): void {
  if (!ok) throw new RangeError(`orbitSystem: ${name} must be ${allowed}, got ${String(value)}`);
}

const isFiniteNumber = (x: number): boolean => Number.isFinite(x);

/**
 * Precompute an `OrbitSystem` from explicit SI elements (see the file header
 * for conventions).
 * @throws RangeError naming the first invalid field.
 */
export function orbitSystem(params: OrbitParams): OrbitSystem {
  const { stellarRadiusM, periodS, semiMajorAxisM, eccentricity: e, omegaRad, inclinationRad } = params;
  check(stellarRadiusM > 0 && isFiniteNumber(stellarRadiusM), 'stellarRadiusM', stellarRadiusM, 'a positive finite number');
  check(periodS > 0 && isFiniteNumber(periodS), 'periodS', periodS, 'a positive finite number');
  check(semiMajorAxisM > 0 && isFiniteNumber(semiMajorAxisM), 'semiMajorAxisM', semiMajorAxisM, 'a positive finite number');
  check(e >= 0 && e < 1, 'eccentricity', e, 'in [0, 1)');
  check(isFiniteNumber(omegaRad), 'omegaRad', omegaRad, 'a finite angle');
  check(inclinationRad >= 0 && inclinationRad <= Math.PI, 'inclinationRad', inclinationRad, 'in [0, π]');

  // Barycentre: sky = R_z(π) R_x(i) R_z(ω) · perifocal (Murray & Dermott 1999, eq. 2.122 with Ω = π;
  // Winn 2010 eqs. 2–4).
  const planetPlaneToSky = mul(rotZ(Math.PI), rotX(inclinationRad));
  const baryRotation = mul(planetPlaneToSky, rotZ(omegaRad));
  // t = 0 at conjunction, f = π/2 − ω (Winn 2010, §2); M = E − e sin E (Murray & Dermott 1999, eq. 2.52).
  const eConj = eccentricFromTrueAnomaly(Math.PI / 2 - omegaRad, e);
  const mConj = eConj - e * Math.sin(eConj);
  const barycentre = frame(baryRotation, semiMajorAxisM / stellarRadiusM, e, (2 * Math.PI) / periodS, mConj);

  const m = params.moon;
  if (m === null) {
    return { barycentre, moon: null, planetWeight: 0, moonWeight: 0, periodS, moonPeriodS: NaN };
  }
  check(m.planetMassKg > 0 && isFiniteNumber(m.planetMassKg), 'moon.planetMassKg', m.planetMassKg, 'a positive finite number');
  check(m.moonMassKg >= 0 && isFiniteNumber(m.moonMassKg), 'moon.moonMassKg', m.moonMassKg, 'a non-negative finite number');
  check(m.separationM > 0 && isFiniteNumber(m.separationM), 'moon.separationM', m.separationM, 'a positive finite number');
  check(m.eccentricity >= 0 && m.eccentricity < 1, 'moon.eccentricity', m.eccentricity, 'in [0, 1)');
  check(m.inclinationRad >= 0 && m.inclinationRad <= Math.PI, 'moon.inclinationRad', m.inclinationRad, 'in [0, π]');
  check(isFiniteNumber(m.nodeRad), 'moon.nodeRad', m.nodeRad, 'a finite angle');
  check(isFiniteNumber(m.periapsisRad), 'moon.periapsisRad', m.periapsisRad, 'a finite angle');
  check(isFiniteNumber(m.phaseRad), 'moon.phaseRad', m.phaseRad, 'a finite angle');

  const totalMassKg = m.planetMassKg + m.moonMassKg;
  // Kepler's third law, n = √(G (M_P + M_S) / a³) (Murray & Dermott 1999, eq. 2.22).
  const moonMeanMotion = Math.sqrt((G * totalMassKg) / (m.separationM * m.separationM * m.separationM));
  const inclination = m.retrograde ? Math.PI - m.inclinationRad : m.inclinationRad;
  const moonRotation = mul(
    mul(planetPlaneToSky, rotZ(m.nodeRad)),
    mul(rotX(inclination), rotZ(m.periapsisRad)),
  );
  const moon = frame(moonRotation, m.separationM / stellarRadiusM, m.eccentricity, moonMeanMotion, m.phaseRad);
  return {
    barycentre,
    moon,
    planetWeight: -m.moonMassKg / totalMassKg,
    moonWeight: m.planetMassKg / totalMassKg,
    periodS,
    moonPeriodS: (2 * Math.PI) / moonMeanMotion,
  };
}

/** Precompute the `OrbitSystem` of a validated scenario (SI fields of `src/scenario/types.ts`). */
export function orbitSystemFromScenario(scenario: Scenario): OrbitSystem {
  const { star, planet, moon } = scenario;
  return orbitSystem({
    stellarRadiusM: star.radiusM,
    periodS: planet.periodS,
    semiMajorAxisM: planet.semiMajorAxisM,
    eccentricity: planet.eccentricity,
    omegaRad: planet.omegaRad,
    inclinationRad: planet.inclinationRad,
    moon:
      moon === null
        ? null
        : {
            planetMassKg: planet.massKg,
            moonMassKg: moon.massKg,
            separationM: moon.separationM,
            eccentricity: moon.eccentricity,
            inclinationRad: moon.inclinationRad,
            nodeRad: moon.nodeRad,
            periapsisRad: moon.periapsisRad,
            phaseRad: moon.phaseRad,
            retrograde: moon.retrograde,
          },
  });
}

function checkLength(name: string, buf: Float64Array | undefined, n: number): void {
  if (buf !== undefined && buf.length < n) {
    throw new RangeError(`skyPositions: out.${name} has length ${buf.length}, needs at least ${n}`);
  }
}

/**
 * Kernel: sky positions (stellar radii) of planet and moon at times `t`
 * (s since the barycentre's conjunction of epoch 0), written into `out`.
 * Non-finite times give NaN positions. Allocates nothing (cheap enough for
 * single-point calls inside root finders). The same array may be passed for
 * several outputs that are not needed (the last write wins).
 * @throws RangeError if an output buffer is shorter than `t`.
 */
export function skyPositions(t: Float64Array, sys: OrbitSystem, out: SkyPositionBuffers): void {
  const n = t.length;
  const { xp, yp, xm, ym, zp, zm, xb, yb, zb } = out;
  checkLength('xp', xp, n);
  checkLength('yp', yp, n);
  checkLength('xm', xm, n);
  checkLength('ym', ym, n);
  checkLength('zp', zp, n);
  checkLength('zm', zm, n);
  checkLength('xb', xb, n);
  checkLength('yb', yb, n);
  checkLength('zb', zb, n);

  const B = sys.barycentre;
  const bn = B.meanMotionRadS;
  const bm0 = B.meanAnomalyAtZeroRad;
  const be = B.eccentricity;
  const ba = B.aRstar;
  const bb = B.bRstar;
  const S = sys.moon;
  const wp = sys.planetWeight;
  const wm = sys.moonWeight;

  for (let k = 0; k < n; k++) {
    // Barycentre: Murray & Dermott 1999 eqs. 2.41 (perifocal position) and 2.122 (rotation to sky).
    // E = M exactly when e = 0 (the solver's own first line); inline it to spare a call per point.
    const MB = bm0 + bn * t[k];
    const EB = be === 0 ? MB : eccentricAnomaly(MB, be);
    const ub = ba * (Math.cos(EB) - be);
    const vb = bb * Math.sin(EB);
    const X = ub * B.px + vb * B.qx;
    const Y = ub * B.py + vb * B.qy;
    const Z = ub * B.pz + vb * B.qz;
    if (xb !== undefined) xb[k] = X;
    if (yb !== undefined) yb[k] = Y;
    if (zb !== undefined) zb[k] = Z;
    if (S === null) {
      xp[k] = X;
      yp[k] = Y;
      if (zp !== undefined) zp[k] = Z;
      xm[k] = NaN;
      ym[k] = NaN;
      if (zm !== undefined) zm[k] = NaN;
      continue;
    }
    // Relative orbit r_rel = r_M − r_P, same equations in the moon's perifocal frame.
    const MS = S.meanAnomalyAtZeroRad + S.meanMotionRadS * t[k];
    const ES = S.eccentricity === 0 ? MS : eccentricAnomaly(MS, S.eccentricity);
    const us = S.aRstar * (Math.cos(ES) - S.eccentricity);
    const vs = S.bRstar * Math.sin(ES);
    const rx = us * S.px + vs * S.qx;
    const ry = us * S.py + vs * S.qy;
    const rz = us * S.pz + vs * S.qz;
    // Barycentre definition: M_P r_P + M_S r_M = (M_P + M_S) B.
    xp[k] = X + wp * rx;
    yp[k] = Y + wp * ry;
    xm[k] = X + wm * rx;
    ym[k] = Y + wm * ry;
    if (zp !== undefined) zp[k] = Z + wp * rz;
    if (zm !== undefined) zm[k] = Z + wm * rz;
  }
}

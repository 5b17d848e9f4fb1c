/**
 * Altitudes of the Sun and of a fixed target at a site, from astronomy-engine
 * (Cross, astronomy-engine 2.1.19: VSOP87 Sun and Earth, IAU 2006 precession
 * and IAU 2000B nutation, annual aberration). Altitudes are geometric: no
 * refraction (as astropy's AltAz frame with pressure 0). The site is on the
 * WGS 84 ellipsoid (astronomy-engine's Observer).
 *
 * Two forms: point functions (one library call chain per instant, for
 * single look-ups and for the tests' independent checks) and `EpochSky`,
 * which evaluates the library once per transit window and then the
 * spherical-astronomy altitude formula along a fine time grid.
 */
import { AstroTime, BaryState, Body, Equator, GeoVector, Horizon, Observer, RotateVector, Rotation_EQJ_EQD, SiderealTime, Vector } from 'astronomy-engine';
import { AU_M, C_LIGHT, DAY_S } from '../physics/constants.js';
import './timeScales.js'; // sets astronomy-engine's ΔT to TT − UTC (leap seconds)

const DEG = Math.PI / 180;
/** Speed of light in AU per day (IAU 2012 au, SI c). */
const C_AU_PER_DAY = (C_LIGHT * DAY_S) / AU_M;
/**
 * Rate of the Earth rotation angle, rad per UT1 second: 2π × 1.00273781191135448
 * per day (IERS Conventions 2010, Petit & Luzum, eq. 5.15).
 */
export const EARTH_ROTATION_RATE = (2 * Math.PI * 1.00273781191135448) / DAY_S;

/** A site on the Earth: geodetic latitude and east longitude, rad; height above the ellipsoid, m. */
export interface SkySite {
  latitudeRad: number;
  longitudeRad: number;
  altitudeM: number;
}

/** A fixed target: ICRS (J2000) right ascension and declination, rad. */
export interface SkyTarget {
  raRad: number;
  decRad: number;
}

export function observerOf(site: SkySite): Observer {
  return new Observer(site.latitudeRad / DEG, site.longitudeRad / DEG, site.altitudeM);
}

/** astronomy-engine time of UTC seconds since J2000 (its UT day count; TT from the leap-second table). */
export function astroTime(utcS: number): AstroTime {
  return new AstroTime(utcS / DAY_S);
}

/** Unit vector of the target's ICRS direction. */
export function targetUnitVector(t: SkyTarget): [number, number, number] {
  const cd = Math.cos(t.decRad);
  return [cd * Math.cos(t.raRad), cd * Math.sin(t.raRad), Math.sin(t.decRad)];
}

/**
 * The target's apparent direction of date: annual aberration to first order in
 * v/c, u' = u + β − (u·β)u, normalised (Bradley's aberration; e.g. Urban &
 * Seidelmann 2013, Explanatory Supplement, 3rd ed., §7.2.3), with β the Earth's
 * barycentric velocity over c; then precession and nutation from J2000 to the
 * true equator and equinox of date. Returns RA (rad) and Dec (rad) of date.
 */
export function targetOfDate(t: SkyTarget, time: AstroTime): { raRad: number; decRad: number } {
  const u = targetUnitVector(t);
  const s = BaryState(Body.Earth, time);
  const b = [s.vx / C_AU_PER_DAY, s.vy / C_AU_PER_DAY, s.vz / C_AU_PER_DAY];
  const ub = u[0] * b[0] + u[1] * b[1] + u[2] * b[2];
  const a = [u[0] + b[0] - ub * u[0], u[1] + b[1] - ub * u[1], u[2] + b[2] - ub * u[2]];
  const v = RotateVector(Rotation_EQJ_EQD(time), new Vector(a[0], a[1], a[2], time));
  return { raRad: Math.atan2(v.y, v.x), decRad: Math.atan2(v.z, Math.hypot(v.x, v.y)) };
}

/** The Sun's apparent geocentric RA and Dec of date, rad (topocentric parallax, ≤ 8.8″, left out). */
export function sunOfDate(time: AstroTime): { raRad: number; decRad: number } {
  const g = GeoVector(Body.Sun, time, true);
  const v = RotateVector(Rotation_EQJ_EQD(time), g);
  return { raRad: Math.atan2(v.y, v.x), decRad: Math.atan2(v.z, Math.hypot(v.x, v.y)) };
}

/** The Sun's topocentric geometric altitude at a UTC instant, degrees (astronomy-engine Equator + Horizon). */
export function sunAltitudeDeg(utcS: number, site: SkySite): number {
  const time = astroTime(utcS);
  const obs = observerOf(site);
  const eq = Equator(Body.Sun, time, obs, true, true);
  return Horizon(time, obs, eq.ra, eq.dec).altitude;
}

/** The target's geometric altitude at a UTC instant, degrees (apparent place of date + astronomy-engine Horizon). */
export function targetAltitudeDeg(utcS: number, site: SkySite, target: SkyTarget): number {
  const time = astroTime(utcS);
  const d = targetOfDate(target, time);
  let raH = d.raRad / DEG / 15;
  if (raH < 0) raH += 24;
  return Horizon(time, observerOf(site), raH, d.decRad / DEG).altitude;
}

/**
 * Altitude from hour angle and declination on a sphere:
 * sin h = sin φ sin δ + cos φ cos δ cos H (e.g. Smart 1977, Textbook on
 * Spherical Astronomy, §13).
 */
export function altitudeFromHourAngle(latRad: number, decRad: number, hourAngleRad: number): number {
  return Math.asin(Math.sin(latRad) * Math.sin(decRad) + Math.cos(latRad) * Math.cos(decRad) * Math.cos(hourAngleRad));
}

/** Sun spacing of the nodes of `EpochSky` (its RA and Dec are interpolated linearly between them), s. */
const SUN_NODE_S = 6 * 3600;

/**
 * The sky over one span of time (a transit window, up to a few days): the
 * library is asked once for the sidereal time and the target's place of date
 * (at the middle) and for the Sun every 6 h; altitudes along the span then
 * come from the sidereal rate and the spherical formula. Over half a day the
 * neglected changes (target's aberration and nutation, the sidereal rate's
 * drift) stay below 0.1″; linear interpolation of the Sun over 6 h errs by
 * under 1″ (its RA and Dec have second differences of ~ 2″ per 6 h, VSOP87).
 */
export class EpochSky {
  readonly startS: number;
  readonly endS: number;
  readonly centerS: number;
  /** Greenwich apparent sidereal time at the centre, rad. */
  private readonly gastCenter: number;
  readonly target: { raRad: number; decRad: number };
  private readonly sunT: Float64Array;
  private readonly sunRa: Float64Array;
  private readonly sunDec: Float64Array;

  constructor(startS: number, endS: number, target: SkyTarget) {
    this.startS = startS;
    this.endS = endS;
    this.centerS = 0.5 * (startS + endS);
    const tc = astroTime(this.centerS);
    this.gastCenter = SiderealTime(tc) * 15 * DEG;
    this.target = targetOfDate(target, tc);
    const nodes = Math.max(2, Math.ceil((endS - startS) / SUN_NODE_S) + 1);
    this.sunT = new Float64Array(nodes);
    this.sunRa = new Float64Array(nodes);
    this.sunDec = new Float64Array(nodes);
    for (let i = 0; i < nodes; i++) {
      const t = startS + ((endS - startS) * i) / (nodes - 1);
      const s = sunOfDate(astroTime(t));
      this.sunT[i] = t;
      // Unwrap RA so that interpolation never crosses the 0/2π seam.
      let ra = s.raRad;
      if (i > 0) while (ra - this.sunRa[i - 1] > Math.PI) ra -= 2 * Math.PI;
      if (i > 0) while (ra - this.sunRa[i - 1] < -Math.PI) ra += 2 * Math.PI;
      this.sunRa[i] = ra;
      this.sunDec[i] = s.decRad;
    }
  }

  /** Local apparent sidereal time at east longitude `lonRad`, rad. */
  localSidereal(utcS: number, lonRad: number): number {
    return this.gastCenter + EARTH_ROTATION_RATE * (utcS - this.centerS) + lonRad;
  }

  /** Target altitude, rad. */
  targetAltitude(utcS: number, site: SkySite): number {
    return altitudeFromHourAngle(site.latitudeRad, this.target.decRad, this.localSidereal(utcS, site.longitudeRad) - this.target.raRad);
  }

  /** Sun altitude, rad (geocentric place). */
  sunAltitude(utcS: number, site: SkySite): number {
    const n = this.sunT.length;
    let k = Math.floor(((utcS - this.sunT[0]) / (this.sunT[n - 1] - this.sunT[0])) * (n - 1));
    k = Math.min(n - 2, Math.max(0, k));
    const f = (utcS - this.sunT[k]) / (this.sunT[k + 1] - this.sunT[k]);
    const ra = this.sunRa[k] + f * (this.sunRa[k + 1] - this.sunRa[k]);
    const dec = this.sunDec[k] + f * (this.sunDec[k + 1] - this.sunDec[k]);
    return altitudeFromHourAngle(site.latitudeRad, dec, this.localSidereal(utcS, site.longitudeRad) - ra);
  }
}

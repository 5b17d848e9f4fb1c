/**
 * BJD_TDB ↔ UTC at a site. BJD_TDB = JD_TDB + (r_obs · n̂)/c: the Rømer
 * delay, the light-travel time from the observer to the Solar System
 * barycentre along the target direction n̂ (Eastman, Siverd & Gaudi 2010,
 * PASP 122, 935, eq. 2, its first term), up to ±8.3 min. r_obs is the
 * Earth's barycentric position (astronomy-engine BaryState, VSOP87) plus the
 * site's geocentric vector (≤ 21 ms). JD_TDB = JD_UTC + (TT − UTC)/86 400
 * (timeScales.ts; TDB − TT < 2 ms left out). The Shapiro delay (≤ 0.2 ms)
 * and the target's proper motion are not modelled (Eastman et al. 2010, §2).
 */
import { BaryState, Body, ObserverVector } from 'astronomy-engine';
import { AU_M, C_LIGHT, DAY_S } from '../physics/constants.js';
import { JD_J2000, ttMinusUtcS } from './timeScales.js';
import { astroTime, observerOf, targetUnitVector, type SkySite, type SkyTarget } from './skyPosition.js';

/** Rømer delay at a UTC instant, s: (r_obs · n̂)/c, r_obs from the barycentre; the geocentre when `site` is null. */
export function romerDelayS(utcS: number, target: SkyTarget, site: SkySite | null): number {
  const time = astroTime(utcS);
  const e = BaryState(Body.Earth, time);
  let x = e.x;
  let y = e.y;
  let z = e.z;
  if (site) {
    const o = ObserverVector(time, observerOf(site), false);
    x += o.x;
    y += o.y;
    z += o.z;
  }
  const n = targetUnitVector(target);
  return ((x * n[0] + y * n[1] + z * n[2]) * AU_M) / C_LIGHT;
}

/** BJD_TDB (days) of a UTC instant (seconds since J2000 UTC). */
export function utcToBjdTdb(utcS: number, target: SkyTarget, site: SkySite | null): number {
  return JD_J2000 + (utcS + ttMinusUtcS(utcS) + romerDelayS(utcS, target, site)) / DAY_S;
}

/**
 * The UTC instant (seconds since J2000 UTC) whose BJD_TDB is `bjdTdb`: fixed-point
 * iteration on utcToBjdTdb. The delay changes by at most 1e-4 s per second of
 * shift (the Earth's 30 km/s over c), so each step cuts the error ~10⁴-fold;
 * it stops below 10 µs (three steps from the first guess).
 */
export function bjdTdbToUtc(bjdTdb: number, target: SkyTarget, site: SkySite | null): number {
  const goal = (bjdTdb - JD_J2000) * DAY_S;
  let utc = goal - ttMinusUtcS(goal - 69.184);
  for (let i = 0; i < 6; i++) {
    const got = (utcToBjdTdb(utc, target, site) - JD_J2000) * DAY_S;
    utc += goal - got;
    if (Math.abs(goal - got) < 1e-5) break;
  }
  return utc;
}

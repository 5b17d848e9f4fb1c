/**
 * Times when the Sun crosses an altitude (sunset, twilight, sunrise) at a
 * site: the Sun's altitude is sampled every 10 min (it moves at most 2.5° in
 * that time, so no crossing pair is missed for limits between −18° and 0°
 * except at latitudes where the Sun grazes the limit) and each bracketed
 * crossing refined by bisection to 0.1 s.
 */
import { sunAltitudeDeg, type SkySite } from './skyPosition.js';

export interface SunCrossing {
  /** UTC seconds since J2000. */
  utcS: number;
  /** True when the Sun is going down through the limit (evening), false when rising. */
  setting: boolean;
}

/** Every crossing of `altitudeDeg` by the Sun between two UTC instants (s since J2000), in time order. */
export function sunCrossings(site: SkySite, startS: number, endS: number, altitudeDeg: number): SunCrossing[] {
  const step = 600;
  const out: SunCrossing[] = [];
  let t0 = startS;
  let f0 = sunAltitudeDeg(t0, site) - altitudeDeg;
  while (t0 < endS) {
    const t1 = Math.min(endS, t0 + step);
    const f1 = sunAltitudeDeg(t1, site) - altitudeDeg;
    if (f0 === 0 || f0 * f1 < 0) {
      let a = t0;
      let b = t1;
      let fa = f0;
      while (b - a > 0.1) {
        const m = 0.5 * (a + b);
        const fm = sunAltitudeDeg(m, site) - altitudeDeg;
        if (fa * fm <= 0) b = m;
        else {
          a = m;
          fa = fm;
        }
      }
      out.push({ utcS: 0.5 * (a + b), setting: f0 > 0 });
    }
    t0 = t1;
    f0 = f1;
  }
  return out;
}

/**
 * The true transit times and durations of the planet (not the barycentre) in
 * a planet–moon system, found by root-finding on the planet's sky separation
 * from the star's centre in the nested Kepler model: first contact t1 and
 * last contact t4 where the separation equals 1 + p. The mid-time is
 * (t1 + t4)/2 and the duration t4 − t1 — what a symmetric transit template
 * fitted to the data measures. TTV_n = mid-time − n·P, TDV_n = duration − mean.
 * Root bracketing by scanning, then bisection to 1 ms (common practice, no source).
 */
import { skyPositions, type OrbitSystem } from './skyPositions.js';

export interface PlanetTransitTruth {
  epoch: number;
  /** Planet mid-transit (t1 + t4)/2, s since t0; NaN if the planet misses the star. */
  midS: number;
  /** First-to-last-contact duration t4 − t1, s. */
  durationS: number;
}

function separationMinusContact(sys: OrbitSystem, c: number, buf: { t: Float64Array; x: Float64Array; y: Float64Array; z: Float64Array; d: Float64Array }) {
  return (time: number): number => {
    buf.t[0] = time;
    skyPositions(buf.t, sys, { xp: buf.x, yp: buf.y, xm: buf.d, ym: buf.d, zp: buf.z });
    return Math.hypot(buf.x[0], buf.y[0]) - c;
  };
}

function bisect(f: (t: number) => number, a: number, b: number, fa: number, tol: number): number {
  for (let i = 0; i < 200 && b - a > tol; i++) {
    const m = 0.5 * (a + b);
    const fm = f(m);
    if (fm === 0) return m;
    if ((fm < 0) === (fa < 0)) {
      a = m;
      fa = fm;
    } else b = m;
  }
  return 0.5 * (a + b);
}

/**
 * @param halfWindowS search ±halfWindowS around each barycentre conjunction n·P
 * @param rp planet radius in stellar radii
 */
export function planetTransitTruth(sys: OrbitSystem, rp: number, epochs: number, halfWindowS: number, toleranceS = 1e-3): PlanetTransitTruth[] {
  const buf = { t: new Float64Array(1), x: new Float64Array(1), y: new Float64Array(1), z: new Float64Array(1), d: new Float64Array(1) };
  const f = separationMinusContact(sys, 1 + rp, buf);
  const out: PlanetTransitTruth[] = [];
  const steps = 4000;
  for (let n = 0; n < epochs; n++) {
    const c = n * sys.periodS;
    const h = (2 * halfWindowS) / steps;
    let t1 = NaN;
    let t4 = NaN;
    let prevT = c - halfWindowS;
    let prevF = f(prevT);
    for (let k = 1; k <= steps; k++) {
      const tk = c - halfWindowS + k * h;
      const fk = f(tk);
      if (prevF > 0 && fk <= 0 && Number.isNaN(t1)) t1 = bisect(f, prevT, tk, prevF, toleranceS);
      if (prevF <= 0 && fk > 0) t4 = bisect(f, prevT, tk, prevF, toleranceS);
      prevT = tk;
      prevF = fk;
    }
    const ok = Number.isFinite(t1) && Number.isFinite(t4);
    out.push({ epoch: n, midS: ok ? 0.5 * (t1 + t4) : NaN, durationS: ok ? t4 - t1 : NaN });
  }
  return out;
}

/**
 * Micro-benchmarks for the photometry stage: exact quadratic-limb-darkened
 * transit flux (points per second), planet+moon pair flux (evaluations per
 * second, realistic mix and overlapping-only), and the elliptic-integral
 * choice (Bulirsch's fused cel vs Carlson's RF/RD/RJ for the αK + βE + γΠ
 * combination MA02 needs). Each figure is the median over repeats after a
 * warm-up; inputs are built before timing and the timed loops allocate nothing.
 * bench/run.ts prints them.
 */
import { performance } from 'node:perf_hooks';
import { median, rate, type BenchMedian } from './measure.js';
import { celPair } from '../src/photometry/bulirschCel.js';
import { completeCarlson } from '../src/photometry/carlson.js';
import { pairTransitFlux, pairTransitFluxArray } from '../src/photometry/pairTransitFlux.js';
import { transitFlux } from '../src/photometry/transitFlux.js';


/** Deterministic uniform [0, 1) numbers (Weyl sequence with the golden ratio; no RNG needed). */
function weyl(i: number, shift = 0): number {
  const x = (i + 1) * 0.6180339887498949 + shift;
  return x - Math.floor(x);
}

/** transitFlux in-transit points per second: p = 0.1, z uniform in [0, 1.1], u = (0.4, 0.26). */
export function benchTransitFlux(n = 1_000_000, repeats = 7): BenchMedian {
  const z = new Float64Array(n);
  for (let i = 0; i < n; i++) z[i] = 1.1 * weyl(i);
  const out = new Float64Array(n);
  return rate('transitFlux, p = 0.1, z ∈ [0, 1.1], u = (0.4, 0.26)', n, repeats, () => {
    transitFlux(z, 0.1, 0.4, 0.26, out);
    return out[n >> 1];
  });
}

/**
 * Pair-flux evaluations per second (pairTransitFluxArray, and the one-point
 * pairTransitFlux). Realistic mix: planet rp = 0.1 on a
 * chord at b = 0.3 across x ∈ [−1.2, 1.2]; moon rm = 0.02 on an edge-on orbit
 * of projected radius 0.5 about it (phase spread uniformly, slight tilt), so
 * that mutual overlaps occur at the rate geometry gives (~15 % of points).
 * Also the overlapping-only rate (lens quadrature on every call).
 */
export function benchPairTransitFlux(n = 200_000, repeats = 7): BenchMedian[] {
  const xp = new Float64Array(n);
  const xm = new Float64Array(n);
  const ym = new Float64Array(n);
  const xo = new Float64Array(n);
  const yo = new Float64Array(n);
  const yp = 0.3;
  let overlaps = 0;
  for (let i = 0; i < n; i++) {
    xp[i] = -1.2 + 2.4 * weyl(i);
    const phase = 2 * Math.PI * weyl(i, 0.5);
    xm[i] = xp[i] + 0.5 * Math.cos(phase);
    ym[i] = yp + 0.03 * Math.sin(phase);
    if (Math.hypot(xm[i] - xp[i], ym[i] - yp) < 0.12 && Math.abs(xp[i]) < 1.1) overlaps++;
    // overlapping-only set: moon within rp + rm of the planet centre
    const r = 0.11 * weyl(i, 0.25);
    xo[i] = xp[i] + r * Math.cos(phase);
    yo[i] = yp + r * Math.sin(phase);
  }
  // The array form is what the light curve calls; the scalar form allocates its one-element arrays.
  const ypA = new Float64Array(n).fill(yp);
  const out = new Float64Array(n);
  const work = new Float64Array(n);
  const pct = Math.round((100 * overlaps) / n);
  const mix = rate(`pairTransitFluxArray, realistic mix (rp = 0.1, rm = 0.02, ${pct} % overlapping)`, n, repeats, () => {
    pairTransitFluxArray(xp, ypA, 0.1, xm, ym, 0.02, 0.4, 0.26, out, work);
    return out[n >> 1];
  });
  const lens = rate('pairTransitFluxArray, discs overlapping (lens quadrature)', n, repeats, () => {
    pairTransitFluxArray(xp, ypA, 0.1, xo, yo, 0.02, 0.4, 0.26, out, work);
    return out[n >> 1];
  });
  const scalar = rate(`pairTransitFlux (one point per call), realistic mix`, n, repeats, () => {
    let s = 0;
    for (let i = 0; i < n; i++) s += pairTransitFlux(xp[i], yp, 0.1, xm[i], ym[i], 0.02, 0.4, 0.26);
    return s;
  });
  return [mix, lens, scalar];
}

/**
 * αK + βE + γΠ(n, k) per second, as MA02's λ₁/λ₂ need it: Bulirsch's fused
 * cel (one loop; the hot-path choice) vs Carlson RF + RD + RJ (three loops).
 * k² uniform in [0.01, 0.99], n uniform in [−50, −0.1].
 */
export function benchEllipticChoice(n = 1_000_000, repeats = 7): BenchMedian[] {
  const kc2 = new Float64Array(n);
  const nn = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    kc2[i] = 0.01 + 0.98 * weyl(i);
    nn[i] = -0.1 - 49.9 * weyl(i, 0.37);
  }
  const o = new Float64Array(3);
  const carlson = rate('αK + βE + γΠ via Carlson RF, RD, RJ', n, repeats, () => {
    let s = 0;
    for (let i = 0; i < n; i++) {
      completeCarlson(kc2[i], nn[i], o);
      s += 0.3 * o[0] + 0.5 * o[1] - 0.2 * o[2];
    }
    return s;
  });
  const cel = rate('αK + βE + γΠ via fused Bulirsch cel', n, repeats, () => {
    let s = 0;
    for (let i = 0; i < n; i++) {
      const c2 = kc2[i];
      // αK + βE = cel(kc, 1, α + β, α + βkc²); γΠ = cel(kc, 1 − n, γ, γ)
      s += celPair(Math.sqrt(c2), 0.8, 0.3 + 0.5 * c2, Math.sqrt(1 - nn[i]), -0.2, -0.2);
    }
    return s;
  });
  return [cel, carlson];
}

/** All photometry benchmarks. */
export function benchPhotometry(): BenchMedian[] {
  return [benchTransitFlux(), ...benchPairTransitFlux(), ...benchEllipticChoice()];
}

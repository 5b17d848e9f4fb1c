/**
 * Partial transits (issue 18, item 5): per-transit fits of ingress-only and
 * egress-only data, with the shape held at the template, give mid-time errors
 * as honest as those of whole transits: the pulls (fit − true)/σ have unit
 * standard deviation (1 ± 0.1) for full, ingress-only and egress-only
 * transits alike, also with unequal per-point noise (the sandwich covariance).
 *
 * Expected scale: the Fisher (Cramér–Rao) bound, σ_tc = Q⁻¹ T √(τ/2T) for a
 * whole transit (Carter et al. 2008, ApJ 689, 499 [from memory]); one
 * contact carries half the information, so an ingress-only error is ≈ √2
 * times a whole transit's. The maximum-likelihood estimate reaches the bound
 * only at high S/N (perTransitFit.ts: pull spread 1.03 at S/N 60 for this
 * shape); the transits here have S/N 90 over the whole transit, so a single
 * contact has the information of a whole transit at S/N ≈ 64.
 * Statistical tolerance: 1500 transits per class give a standard error of
 * 1.8 % on a standard deviation, so 1 ± 0.1 is a 5σ band.
 */
import { describe, expect, it } from 'vitest';
import type { Scenario } from '../../src/scenario/types.js';
import { createRng } from '../../src/noise/rng.js';
import { inclinationFromImpact } from '../../src/physics/transitDuration.js';
import { DAY_S, G, M_JUP_KG, M_SUN_KG, R_SUN_M } from '../../src/physics/constants.js';
import { buildTransitTemplate, templateFlux, templateGeometryFromScenario } from '../../src/timing/transitTemplate.js';
import { fitTransits, type TransitContacts } from '../../src/timing/perTransitFit.js';
import { randomGapMask } from '../../src/noise/gaps.js';

/** Invented system "Tessel b" (as in perTransitFit.test.ts): p = 0.1, b = 0.3, P = 2 d, T14 ≈ 2.09 h, ingress ≈ 12.5 min, 2-min cadence. */
function tessel(): Scenario {
  const periodS = 2 * DAY_S;
  const ms = 0.8 * M_SUN_KG;
  const rs = 0.8 * R_SUN_M;
  // Kepler's third law a³ = G(M* + Mp)P²/4π².
  const a = Math.cbrt((G * (ms + M_JUP_KG) * periodS * periodS) / (4 * Math.PI * Math.PI));
  return {
    name: 'tessel-b',
    seed: 7,
    star: { massKg: ms, radiusM: rs, teffK: 5000, ageS: 1e17, u1: 0.45, u2: 0.2, luminosityW: 1e26 },
    planet: { massKg: M_JUP_KG, radiusM: 0.1 * rs, periodS, eccentricity: 0, omegaRad: Math.PI / 2, inclinationRad: inclinationFromImpact(0.3, a / rs, 0, Math.PI / 2), impactParameter: 0.3, semiMajorAxisM: a, albedo: 0.3, k2: 0.3, tidalQ: 1e5 },
    moon: null,
    instrument: { cadenceS: 120, exposureS: 120, noiseFraction: 1e-3, noiseTimescaleS: 120, redNoise: null, ground: null },
    observation: { transits: 1, t0BjdTdb: 2_460_000, baselineS: 5400, dutyCycle: 1, gapLengthS: 1200, missedFraction: 0 },
    detection: { falseAlarm: 0.01 },
  } as Scenario;
}

const CADENCE = 120;
const tpl = buildTransitTemplate(templateGeometryFromScenario(tessel()));
const HALF = 0.5 * tpl.t14S;
const BASELINE = 5400;

/** 'gapped': a whole window observed at an 85 % duty cycle (random 20-min gaps, gaps.ts), so ingress and egress often both hold a gap. */
type Part = 'full' | 'ingress' | 'egress' | 'gapped';

/**
 * `n` transits of one part, each at its own random sampling phase, with white noise of σ_i =
 * sigma · ramp(x) (ramp ≡ 1 for equal noise); returns the pulls of the ok fits and their contacts.
 */
function pulls(part: Part, n: number, sigma: number, ramp: (x: number) => number, seed: number) {
  const rng = createRng(seed, 0, 0);
  const P = 2 * DAY_S;
  let t: number[] = [];
  let e: number[] = [];
  let sig: number[] = [];
  const truth = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    truth[k] = k * P + (rng.uniform() - 0.5) * CADENCE;
    const lo = part === 'egress' ? 0 : -HALF - BASELINE;
    const hi = part === 'ingress' ? 0 : HALF + BASELINE;
    for (let g = Math.ceil((k * P + lo) / CADENCE); g <= Math.floor((k * P + hi) / CADENCE); g++) {
      t.push(g * CADENCE);
      e.push(k);
      sig.push(sigma * ramp(g * CADENCE - k * P));
    }
  }
  if (part === 'gapped') {
    const mask = randomGapMask(Float64Array.from(t), 0.85, 1200, rng);
    const kept = (_: number, i: number) => mask[i] === 1;
    t = t.filter(kept);
    e = e.filter(kept);
    sig = sig.filter(kept);
  }
  const timeS = Float64Array.from(t);
  const epoch = Int32Array.from(e);
  const pointSigma = Float64Array.from(sig);
  const noise = new Float64Array(timeS.length);
  rng.fillNormal(noise, 1);
  const flux = new Float64Array(timeS.length);
  for (let i = 0; i < flux.length; i++) flux[i] = templateFlux(tpl, timeS[i] - truth[epoch[i]]) + pointSigma[i] * noise[i];
  const equal = sig.every((v) => v === sigma);
  const r = fitTransits(timeS, flux, sigma, epoch, tpl, { ephemeris: { t0S: 0, periodS: P }, cadenceS: CADENCE, beta: 'off', pointSigma: equal ? null : pointSigma });
  const ok = r.fits.filter((f) => f.status === 'ok');
  const z = ok.map((f) => (f.tcS - truth[f.epoch]) / f.tcErrS);
  const mean = z.reduce((a, v) => a + v, 0) / z.length;
  const sd = Math.sqrt(z.reduce((a, v) => a + (v - mean) ** 2, 0) / (z.length - 1));
  const contacts = new Set<TransitContacts | undefined>(ok.map((f) => f.contacts));
  const counts = { both: 0, ingress_only: 0, egress_only: 0 };
  for (const f of ok) counts[f.contacts!]++;
  const errMedian = ok.map((f) => f.tcErrS).sort((a, b) => a - b)[Math.floor(ok.length / 2)];
  const skipped = r.fits.filter((f) => f.status !== 'ok').map((f) => `${f.status}: ${f.reason}`);
  return { n: ok.length, mean, sd, contacts, counts, errMedian, skipped };
}

/** σ for a whole-transit S/N = depth·√(T14/cadence)/σ (the issue-4 definition, perTransitFit.ts). */
const SIGMA = (tpl.depth * Math.sqrt(tpl.t14S / CADENCE)) / 90;
const N = 1500;

describe('partial transits: honest mid-time errors (issue 18)', () => {
  const expected: Record<Exclude<Part, 'gapped'>, TransitContacts> = { full: 'both', ingress: 'ingress_only', egress: 'egress_only' };
  const flat = () => 1;
  const results = (['full', 'ingress', 'egress'] as const).map((part, j) => ({ part, ...pulls(part, N, SIGMA, flat, 31 + j) }));

  for (const r of results) {
    it(`${r.part}: every transit fitted, pull standard deviation 1 ± 0.1, mean 0 ± 0.1 (${N} transits)`, () => {
      console.info(`${r.part}: n = ${r.n}, pull mean ${r.mean.toFixed(3)}, sd ${r.sd.toFixed(3)}, median σ_tc ${r.errMedian.toFixed(2)} s`);
      expect(r.n).toBe(N);
      expect([...r.contacts]).toEqual([expected[r.part]]);
      expect(Math.abs(r.sd - 1)).toBeLessThan(0.1); // Cramér–Rao scale (Carter et al. 2008); requirement of issue 18
      expect(Math.abs(r.mean)).toBeLessThan(0.1); // unbiased (SE 0.026)
    });
  }

  it('gapped windows (85 % duty cycle, 20-min gaps): every transit fitted, from whichever contacts the gaps leave, pulls 1 ± 0.1', () => {
    // Before issue 18 a transit whose ingress and egress both held a gap was dropped (22 % of transits here).
    const r = pulls('gapped', N, SIGMA, flat, 51);
    console.info(`gapped: n = ${r.n}, contacts ${JSON.stringify(r.counts)}, pull mean ${r.mean.toFixed(3)}, sd ${r.sd.toFixed(3)}; skipped: ${JSON.stringify(r.skipped.map((x) => x.replace(/\d+/g, 'n')).reduce<Record<string, number>>((a, x) => ({ ...a, [x]: (a[x] ?? 0) + 1 }), {}))}`);
    // The only transits left out are those whose gaps took (nearly) all of both contacts, said so.
    expect(r.n).toBeGreaterThan(0.97 * N);
    // (an exponential gap of mean 20 min covers a whole 2-h transit now and then: e^−6 per gap).
    for (const why of r.skipped) expect(why).toMatch(/^skipped-partial: no timing information|^skipped-no-data: no samples inside/);
    expect(Math.abs(r.sd - 1)).toBeLessThan(0.1); // Cramér–Rao scale (Carter et al. 2008); requirement of issue 18
    expect(Math.abs(r.mean)).toBeLessThan(0.1);
  });

  it('one contact carries about half the timing information: σ_tc ≈ √2 × a whole transit\'s (Carter et al. 2008)', () => {
    const full = results[0].errMedian;
    for (const r of results.slice(1)) {
      // Within 15 %: the one-contact fit also loses the duration–time correlation and half the baseline.
      expect(r.errMedian / full).toBeGreaterThan(Math.SQRT2 * 0.85);
      expect(r.errMedian / full).toBeLessThan(Math.SQRT2 * 1.15);
    }
  });

  it('with unequal per-point noise (air mass rising through the window) the sandwich errors stay honest', () => {
    // σ_i from 1× to 2.5× across the window, as an air mass from 1.1 to 2 can give (scintillation ∝ X^1.5).
    const ramp = (x: number) => 1 + (1.5 * (x + HALF + BASELINE)) / (2 * (HALF + BASELINE));
    for (const [j, part] of (['full', 'ingress', 'egress'] as Part[]).entries()) {
      const r = pulls(part, 1000, SIGMA / 1.5, ramp, 41 + j);
      console.info(`${part}, unequal noise: n = ${r.n}, pull mean ${r.mean.toFixed(3)}, sd ${r.sd.toFixed(3)}`);
      expect(r.n).toBe(1000);
      expect(Math.abs(r.sd - 1)).toBeLessThan(0.1); // 1000 transits: SE 2.2 %
      expect(Math.abs(r.mean)).toBeLessThan(0.12);
    }
  });
});

import { describe, it, expect } from 'vitest';
import type { Scenario } from '../../src/scenario/types.js';
import { observeScenario, type Observation } from '../../src/noise/observe.js';
import { createRng } from '../../src/noise/rng.js';
import { planetTransitTruth } from '../../src/physics/planetTransitTruth.js';
import { inclinationFromImpact } from '../../src/physics/transitDuration.js';
import { DAY_S, G, M_JUP_KG, M_SUN_KG, R_SUN_M } from '../../src/physics/constants.js';
import {
  buildTransitTemplate,
  directTemplateFlux,
  templateFlux,
  templateFluxSlope,
  templateGeometryFromScenario,
} from '../../src/timing/transitTemplate.js';
import { fitTransits } from '../../src/timing/perTransitFit.js';
import { recoverTimings } from '../../src/timing/timingSeries.js';
import { GlobalFitWorkspace } from '../../src/timing/globalTransitFit.js';

/**
 * Invented test system "Tessel b": a hot Jupiter (p = 0.1) on a 2-day orbit
 * of a 0.8 M☉, 0.8 R☉ star; T14 ≈ 2.09 h, ingress ≈ 12.5 min; 2-min cadence
 * and exposure; 1.5 h of baseline on each side.
 */
function tessel(opts: { noise: number; transits: number; b?: number; e?: number; omegaRad?: number; seed?: number }): Scenario {
  const periodS = 2 * DAY_S;
  const ms = 0.8 * M_SUN_KG;
  const rs = 0.8 * R_SUN_M;
  // Kepler's third law a³ = G(M* + Mp)P²/4π² (computed in the test).
  const a = Math.cbrt((G * (ms + M_JUP_KG) * periodS * periodS) / (4 * Math.PI * Math.PI));
  const b = opts.b ?? 0.3;
  const e = opts.e ?? 0;
  const w = opts.omegaRad ?? Math.PI / 2;
  return {
    name: 'tessel-b',
    seed: opts.seed ?? 7,
    star: { massKg: ms, radiusM: rs, teffK: 5000, ageS: 1e17, u1: 0.45, u2: 0.2, luminosityW: 1e26 },
    planet: {
      massKg: M_JUP_KG,
      radiusM: 0.1 * rs,
      periodS,
      eccentricity: e,
      omegaRad: w,
      inclinationRad: inclinationFromImpact(b, a / rs, e, w),
      impactParameter: b,
      semiMajorAxisM: a,
      albedo: 0.3,
      k2: 0.3,
      tidalQ: 1e5,
    },
    moon: null,
    instrument: { cadenceS: 120, exposureS: 120, noiseFraction: opts.noise, noiseTimescaleS: 120, redNoise: null, ground: null },
    observation: { transits: opts.transits, t0BjdTdb: 2_460_000, baselineS: 5400, dutyCycle: 1, gapLengthS: 1200, missedFraction: 0 },
    detection: { falseAlarm: 0.01 },
  } as Scenario;
}

function truthOf(s: Scenario, obs: Observation, epochs: number) {
  return planetTransitTruth(obs.lightCurve.sys, obs.lightCurve.rp, epochs, 6 * 3600, 1e-6);
}

function pullStats(values: number[]) {
  const n = values.length;
  const mean = values.reduce((a, v) => a + v, 0) / n;
  const rms = Math.sqrt(values.reduce((a, v) => a + v * v, 0) / n);
  return { n, mean, rms };
}

/**
 * Cramér–Rao bound on t_c for each epoch: σ·√[(JᵀJ)⁻¹]₀₀ for the parameters (t_c, s, f0) of
 * perTransitFit.ts at the true t_c, duration scale sTrue and f0 = 1 (Fisher information for white
 * noise; Jacobian from the template slope, as in the fit). Computed in the test.
 */
function fisherTcBounds(obs: Observation, tpl: ReturnType<typeof buildTransitTemplate>, tcOf: (n: number) => number, sTrue: number, epochs: number): Float64Array {
  const a = new Float64Array(epochs * 6); // a00 a01 a02 a11 a12 a22 per epoch
  const d = new Float64Array(2);
  for (let i = 0; i < obs.timeS.length; i++) {
    const n = obs.epoch[i];
    if (n < 0 || n >= epochs) continue;
    const u = (obs.timeS[i] - tcOf(n)) / sTrue;
    templateFluxSlope(tpl, u, d);
    const j0 = -d[1] / sTrue;
    const j1 = j0 * u;
    const j2 = d[0];
    const k = 6 * n;
    a[k] += j0 * j0; a[k + 1] += j0 * j1; a[k + 2] += j0 * j2;
    a[k + 3] += j1 * j1; a[k + 4] += j1 * j2; a[k + 5] += j2 * j2;
  }
  const out = new Float64Array(epochs);
  for (let n = 0; n < epochs; n++) {
    const [a00, a01, a02, a11, a12, a22] = a.subarray(6 * n, 6 * n + 6);
    const det = a00 * (a11 * a22 - a12 * a12) - a01 * (a01 * a22 - a12 * a02) + a02 * (a01 * a12 - a11 * a02);
    out[n] = obs.sigma * Math.sqrt((a11 * a22 - a12 * a12) / det);
  }
  return out;
}

describe('transit template', () => {
  it('interpolates the exposure-averaged Mandel–Agol curve to < 1e-8 of the stellar flux', () => {
    // Reference: direct midpoint-rule exposure average (4001 sub-exposures) of transitFlux on the same
    // Keplerian track (Kipping 2010, §3); the brief asks for ≪ 1e-7. Measured 6e-10.
    const tpl = buildTransitTemplate(templateGeometryFromScenario(tessel({ noise: 0, transits: 1 })));
    const n = 800;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = (i / (n - 1) - 0.5) * (tpl.t14S + 400) + 0.37 * tpl.stepS;
    const direct = directTemplateFlux(tpl, x, 4001);
    let worst = 0;
    for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(templateFlux(tpl, x[i]) - direct[i]));
    expect(worst).toBeLessThan(1e-8);
    // Outside the exposure-widened contacts the flux is 1: to spline rounding (< 1e-12) inside the table's
    // padding, exactly beyond it (computed in the test).
    expect(Math.abs(templateFlux(tpl, 0.5 * tpl.t14S + 61) - 1)).toBeLessThan(1e-12);
    expect(templateFlux(tpl, -0.5 * tpl.t14S - 200)).toBe(1);
  });
});

describe('per-transit fits', () => {
  it('recovers noiseless injected mid-times and durations exactly (eccentric orbit)', () => {
    // Reference: planetTransitTruth (root-finding of first/last contact on the same Kepler model, 1e-6 s).
    // The stated noise is only 1e-5: observeScenario's exposure supersampling keeps its smearing error
    // below max(1e-6, 0.02σ) of the flux (src/noise/observe.ts), and that error, symmetric about
    // mid-transit, shifts both contacts; at σ = 1e-3 (tolerance 2e-5) it moved every fitted duration by
    // −0.50 s (measured), at 1e-6 by −0.036 s.
    const s = tessel({ noise: 1e-5, transits: 6, b: 0.45, e: 0.2, omegaRad: 0.7 });
    const obs = observeScenario(s, null);
    const rec = recoverTimings(s, obs);
    const truth = truthOf(s, obs, 6);
    expect(rec.global!.converged).toBe(true);
    for (const f of rec.fits) {
      expect(f.status).toBe('ok');
      expect(Math.abs(f.tcS - truth[f.epoch].midS)).toBeLessThan(0.01);
      expect(Math.abs(f.durationS - truth[f.epoch].durationS)).toBeLessThan(0.1);
    }
    // No moon: the TTVs and TDVs vanish (≪ 1 s).
    for (const t of rec.ttv) expect(Math.abs(t.ttvS)).toBeLessThan(0.01);
    for (const t of rec.tdv.points) expect(Math.abs(t.tdvS)).toBeLessThan(0.1);
  });

  it('finds TTVs up to ~half the duration by its coarse search', () => {
    // Computed in the test: noiseless data made from the template itself, shifted by 0.45·T14 sin(1.3 n).
    const tpl = buildTransitTemplate(templateGeometryFromScenario(tessel({ noise: 0, transits: 1 })));
    const periodS = 2 * DAY_S;
    const nTr = 8;
    const perTr = Math.floor((tpl.t14S + 10_800) / 120);
    const timeS = new Float64Array(nTr * perTr);
    const flux = new Float64Array(nTr * perTr);
    const epoch = new Int32Array(nTr * perTr);
    const shift = (n: number) => 0.45 * tpl.t14S * Math.sin(1.3 * n);
    for (let n = 0, k = 0; n < nTr; n++) {
      for (let j = 0; j < perTr; j++, k++) {
        timeS[k] = n * periodS + (j - perTr / 2) * 120;
        flux[k] = templateFlux(tpl, timeS[k] - n * periodS - shift(n));
        epoch[k] = n;
      }
    }
    const r = fitTransits(timeS, flux, 1e-3, epoch, tpl, { ephemeris: { t0S: 0, periodS }, cadenceS: 120 });
    for (const f of r.fits) {
      expect(f.status).toBe('ok');
      expect(Math.abs(f.tcS - (f.epoch * periodS + shift(f.epoch)))).toBeLessThan(1e-3);
      expect(Math.abs(f.durationS / tpl.t14S - 1)).toBeLessThan(1e-6);
    }
  });

  it('applies the partial-transit rule and records why', () => {
    // Rule (src/timing/perTransitFit.ts, issue 18): a transit is fitted from whichever contacts the data
    // hold (the duration only when both are); with neither contact it is skipped with the counts.
    const s = tessel({ noise: 1e-3, transits: 5 });
    const obs = observeScenario(s, createRng(s.seed, 0, 0));
    const half = 0.5 * buildTransitTemplate(templateGeometryFromScenario(s)).t14S;
    const keep = (i: number): boolean => {
      const n = obs.epoch[i];
      const x = obs.timeS[i] - n * s.planet.periodS;
      if (n === 1) return x < -0.7 * half; // the ingress, but only 15 % of the transit
      if (n === 2) return Math.abs(x) > half + 300; // baseline only
      if (n === 3) return x < 0.5 * half; // egress missing, 75 % of the transit kept
      if (n === 4) return Math.abs(x) < 0.5 * half; // the middle only: neither contact
      return true;
    };
    const idx = Array.from(obs.timeS.keys()).filter(keep);
    const pick = <T extends Float64Array | Int32Array>(a: T): T => a.constructor === Float64Array
      ? (Float64Array.from(idx, (i) => a[i]) as T)
      : (Int32Array.from(idx, (i) => a[i]) as T);
    const cut: Observation = { ...obs, timeS: pick(obs.timeS), flux: pick(obs.flux), model: pick(obs.model), epoch: pick(obs.epoch) };
    const rec = recoverTimings(s, cut);
    expect(rec.fits.map((f) => f.status)).toEqual(['ok', 'ok', 'skipped-no-data', 'ok', 'skipped-partial']);
    expect(rec.fits.map((f) => f.contacts ?? null)).toEqual(['both', 'ingress_only', null, 'ingress_only', null]);
    // One contact: the duration is the global fit's, not measured (no TDV point).
    expect(Number.isNaN(rec.fits[1].durationErrS)).toBe(true);
    expect(rec.fits[1].tcErrS).toBeGreaterThan(rec.fits[0].tcErrS); // half the timing information (Carter et al. 2008)
    expect(rec.tdv.points.map((p) => p.epoch)).toEqual([0]);
    expect(rec.fits[4].reason).toMatch(/no timing information/);
    expect(Number.isNaN(rec.fits[4].tcS)).toBe(true);
    // Skipped and fitted transits have the same keys in the same order: one object shape, so the
    // loops over fits stay optimized (a performance contract, common practice, no source).
    for (const f of rec.fits) expect(Object.keys(f)).toEqual(Object.keys(rec.fits[0]));
  });

  it('meets the issue-4 requirement at S/N 60 (10 % ingress, 2-min cadence; 2000 transits)', () => {
    // Requirement (issue 4): scatter of the fitted mid-times within 5 % of the Fisher (Cramér–Rao) bound,
    // and pull standard deviation within 1 ± 0.05. The bound is σ²(JᵀJ)⁻¹ for (t_c, s, f0) evaluated at
    // the TRUE parameters (the expected information; computed in the test from the template slope).
    // S/N = depth·√n_in/σ = 60 is about the lowest S/N where this geometry meets both (measured table in
    // src/timing/perTransitFit.ts: scatter/bound 1.05 at S/N 40, 1.03 at 60; 1.24 at 15 and 1.34 at 10).
    // Statistical tolerance: 2000 transits give a standard error of 1.6 % on a standard deviation.
    // Reference truth: planetTransitTruth (epoch 0; no moon, so t_n = t_0 + nP exactly).
    const probe = tessel({ noise: 1e-3, transits: 1 });
    const tplProbe = buildTransitTemplate(templateGeometryFromScenario(probe));
    const noise = (tplProbe.depth * Math.sqrt(tplProbe.t14S / 120)) / 60;
    const s = tessel({ noise, transits: 2000, seed: 21 });
    const obs = observeScenario(s, createRng(s.seed, 0, 0));
    const truth = truthOf(s, obs, 1)[0];
    const rec = recoverTimings(s, obs);
    const ok = rec.fits.filter((f) => f.status === 'ok');
    expect(ok.length).toBe(2000);
    const tpl = rec.global!.template;
    const bound = fisherTcBounds(obs, tpl, (n) => truth.midS + n * s.planet.periodS, truth.durationS / tpl.t14S, 2000);
    let sumErr2 = 0, sumBound2 = 0, sumMiss2 = 0;
    const tcPulls: number[] = [];
    for (const f of ok) {
      const miss = f.tcS - (truth.midS + f.epoch * s.planet.periodS);
      sumMiss2 += miss * miss;
      sumErr2 += f.tcErrS ** 2;
      sumBound2 += bound[f.epoch] ** 2;
      tcPulls.push(miss / f.tcErrS);
    }
    const tc = pullStats(tcPulls);
    // (1) efficiency: scatter against the bound at the truth.
    expect(Math.abs(Math.sqrt(sumMiss2 / sumBound2) - 1)).toBeLessThan(0.05);
    // (2) calibration: pull spread.
    expect(Math.abs(tc.rms - 1)).toBeLessThan(0.05);
    expect(Math.abs(tc.mean)).toBeLessThan(0.1); // unbiased: SE of the mean pull 0.022
    // The quoted errors (expected information at the fitted optimum) equal the bound at the truth to
    // < 1 % (measured 0.1 %): at any S/N the excess of the pulls is in the scatter, not in the errors.
    expect(Math.abs(Math.sqrt(sumErr2 / sumBound2) - 1)).toBeLessThan(0.01);
    // Durations: the spread of the pulls about their mean is the per-transit error; their common offset is
    // the global template's T14 error (shared by every transit, invisible in TDVs).
    const dur = pullStats(ok.map((f) => (f.durationS - truth.durationS) / f.durationErrS));
    expect(Math.abs(Math.sqrt(dur.rms ** 2 - dur.mean ** 2) - 1)).toBeLessThan(0.05);
    expect(Math.abs(dur.mean)).toBeLessThan(0.25);
    // White noise: β stays at its floor of 1 (the residual rms matches the stated σ).
    expect(rec.beta?.beta).toBe(1);
    // Global shape close to the injected one (p = 0.1, b = 0.3): errors from the global fit, 4σ.
    expect(Math.abs(rec.global!.radiusRatio - 0.1)).toBeLessThan(4 * rec.global!.radiusRatioErr);
    expect(Math.abs(rec.global!.impactParameter - 0.3)).toBeLessThan(4 * rec.global!.impactParameterErr);
  });

  it('stays robust and unbiased at S/N ≈ 12, where the Fisher bound is optimistic', () => {
    // Below the requirement's S/N the maximum-likelihood mid-times scatter more than the Cramér–Rao bound
    // (measured on 2000 transits: 1.24 at S/N 15, 1.34 at 10 for this geometry; src/timing/perTransitFit.ts
    // explains why and tabulates other shapes and cadences). Checked here: every transit is fitted, the
    // mean pull is unbiased (SE 0.045), and the pull spread stays < 1.4.
    const s = tessel({ noise: 8e-3, transits: 500, seed: 22 });
    const obs = observeScenario(s, createRng(s.seed, 0, 0));
    const truth = truthOf(s, obs, 1)[0];
    const rec = recoverTimings(s, obs, { fitImpact: false });
    const ok = rec.fits.filter((f) => f.status === 'ok');
    expect(ok.length).toBeGreaterThanOrEqual(490);
    const tc = pullStats(ok.map((f) => (f.tcS - (truth.midS + f.epoch * s.planet.periodS)) / f.tcErrS));
    expect(Math.abs(tc.mean)).toBeLessThan(0.15);
    expect(tc.rms).toBeLessThan(1.4);
    expect(tc.rms).toBeGreaterThan(0.95);
  });
});

describe('a reused global-fit workspace', () => {
  // Property test (common practice, no source): scratch reused across fits of different sizes
  // must not change any result, bit for bit, against a fit that allocates its own.
  it('gives the same recovery as fresh allocation, after larger and smaller fits', () => {
    const ws = new GlobalFitWorkspace();
    const runs = [
      { transits: 6, seed: 1 },
      { transits: 3, seed: 2 },
      { transits: 8, seed: 3 },
    ];
    for (const { transits, seed } of runs) {
      const s = tessel({ noise: 2e-3, transits, seed });
      const obs = observeScenario(s, createRng(seed, 0, 0));
      const fresh = recoverTimings(s, obs);
      const reused = recoverTimings(s, obs, { workspace: ws });
      expect(reused.global).toEqual(fresh.global);
      expect(reused.fits).toEqual(fresh.fits);
    }
  });
});

/**
 * `vetClaim`: is a claimed moon signal significant, what moon would it take,
 * can that moon exist there, and would it have shown itself in other ways?
 *
 * Steps: (1) the system's limits from `computeLimits` (Hill radius, DWY06
 * stable limits, Roche limits for rocky and icy moons, tidal-survival mass,
 * T14, Carter timing precision); (2) significance of the claim (amplitude
 * z-scores, or for a table χ², BIC and periodograms: tableSignificance.ts);
 * (3) the implied moon by inverting Kipping's relations (impliedMoon.ts) for
 * Monte Carlo draws over the amplitude errors and the orbit orientation,
 * seeded by (claim seed, 0, 0); (4) physical checks, each pass / tension /
 * fail; (5) the verdict: any fail → "implausible", else any tension → "in
 * tension", else "consistent with a moon".
 *
 * Threshold policy: a check fails when even the 2σ bound most favourable to
 * the claim violates the limit, and is in tension when the median does.
 */
import { computeLimits } from '../limits/computeLimits.js';
import { G, HOUR_S, MINUTE_S, R_EARTH_M } from '../physics/constants.js';
import { meanDensity, rocheLimit } from '../physics/rocheLimit.js';
import { barycentreSkyVelocity } from '../physics/timingSignals.js';
import { createRng, type Rng } from '../noise/rng.js';
import type { Scenario } from '../scenario/types.js';
import { quantileSortedType7 } from '../timing/falseAlarmCalibration.js';
import { aliasFamily } from '../timing/lombScargle.js';
import { chiSquareSurvival } from '../numeric/noncentralChiSquare.js';
import type { Claim } from './claimTypes.js';
import { earthMasses, planetRadii, sig3, timeText } from './describe.js';
import {
  averagingAtSeparation,
  invertAmplitudes,
  massFromOffsetAtSeparation,
  massFromReflexSpeedAtSeparation,
  projectionFactor,
} from './impliedMoon.js';
import { DIP_DETECTION_SIGMA, ICY_DENSITY_KG_M3, ROCKY_DENSITY_KG_M3, dipVisibility } from './moonDipVisibility.js';
import { analyseTable, type TableAnalysis } from './tableSignificance.js';
import type {
  AmplitudeSignificance,
  CheckId,
  ImpliedMoonSummary,
  RawImpliedMoonSummary as ImpliedMoonInternal,
  RawQuantileSummary,
  SystemSummary,
  TableSignificance,
  VetCheck,
  VetResult,
  Verdict,
} from './vetTypes.js';

/** Moon-to-planet mass ratio of regular satellites (Canup & Ward 2006, Nature 441, 834): a rule of thumb. */
export const REGULAR_SATELLITE_MASS_RATIO = 1e-4;
/** Ratios above ten times that call for capture or a giant impact (Moon/Earth 0.0123 is one such). */
export const MASS_RATIO_TENSION = 10 * REGULAR_SATELLITE_MASS_RATIO;
/** Plausible bulk densities of a claimed dip's moon, kg/m³: porous icy bodies ~500 to iron 7874 (from memory). */
export const DENSITY_RANGE_KG_M3: readonly [number, number] = [500, 8000];
/** ΔBIC above which the sinusoid counts as favoured: "strong" evidence (Kass & Raftery 1995, JASA 90, 773, from memory). */
export const BIC_STRONG = 6;
/** p-value below which excess scatter counts as significant (≈ 3.3σ; common practice, no source). */
export const P_SIGNIFICANT = 1e-3;
/** z-score a claimed amplitude must reach to count as a detection (common practice, no source). */
export const AMPLITUDE_SIGMA = 3;

/** Order in which reasons of the same status are listed: the most basic first. */
const CHECK_ORDER: CheckId[] = ['significance', 'stability', 'roche', 'mass-ratio', 'tidal-survival', 'phase', 'moon-dip', 'residual-noise', 'precision'];

const Q_LO2 = 0.0227501319481792; // Φ(−2), standard normal
const Q_LO1 = 0.158655253931457; // Φ(−1)

function quantiles(sample: Float64Array): RawQuantileSummary {
  for (let i = 0; i < sample.length; i++) if (Number.isNaN(sample[i])) sample[i] = Infinity;
  sample.sort();
  const q = (p: number) => quantileSortedType7(sample, p);
  return { median: q(0.5), lo1: q(Q_LO1), hi1: q(1 - Q_LO1), lo2: q(Q_LO2), hi2: q(1 - Q_LO2) };
}

function intervalText(q: RawQuantileSummary, f: (x: number) => string): string {
  return `${f(q.median)} (2σ ${f(q.lo2)} – ${f(q.hi2)})`;
}

/** A scenario shell for computeLimits: the claim's star and planet, its precision (or a placeholder), no moon. */
function limitsScenario(claim: Claim): Scenario {
  const p = claim.precision;
  const tau = p ? p.noiseTimescaleS : MINUTE_S;
  const cadence = claim.cadenceS ?? tau;
  return {
    name: claim.name,
    seed: claim.seed,
    star: claim.star,
    planet: claim.planet,
    moon: null,
    instrument: { cadenceS: cadence, exposureS: cadence, noiseFraction: p ? p.noiseFraction : 1e-3, noiseTimescaleS: tau, redNoise: null, ground: null },
    observation: { transits: claim.transits, t0BjdTdb: 0, baselineS: 3 * HOUR_S, dutyCycle: 1, gapLengthS: 1200, missedFraction: 0 },
    detection: { falseAlarm: 0.01 },
  };
}

/** Positive normal draw N(mean, sd²) truncated at 0 (redrawn; at most 100 tries). */
function positiveNormal(rng: Rng, mean: number, sd: number): number {
  for (let k = 0; k < 100; k++) {
    const x = mean + sd * rng.normal();
    if (x > 0) return x;
  }
  return Math.max(mean, 1e-12 * sd);
}

/** Draw (a, b) from a bivariate normal with covariance [caa, cab, cbb] (2×2 Cholesky). */
function drawPair(rng: Rng, a: number, b: number, cov: [number, number, number], out: [number, number]): void {
  const l11 = Math.sqrt(Math.max(cov[0], 0));
  const l21 = l11 > 0 ? cov[1] / l11 : 0;
  const l22 = Math.sqrt(Math.max(cov[2] - l21 * l21, 0));
  const z1 = rng.normal();
  const z2 = rng.normal();
  out[0] = a + l11 * z1;
  out[1] = b + l21 * z1 + l22 * z2;
}

function moonPeriodAt(separationM: number, planetMassKg: number): number {
  // Kepler's third law, moon mass neglected.
  return 2 * Math.PI * Math.sqrt(separationM ** 3 / (G * planetMassKg));
}

interface AmplitudeSource {
  mode: ImpliedMoonSummary['mode'];
  /** Writes coplanar-orientation semi-amplitudes (before the projection) into out; NaN for a missing channel. */
  draw(rng: Rng, out: { ttv: number; tdv: number; phaseProjection: number }): void;
  central: { ttv: number; tdv: number };
}

function amplitudeSourceFromClaim(claim: Claim): AmplitudeSource {
  const toSemi = (k: 'rms' | 'semi-amplitude') => (k === 'rms' ? Math.SQRT2 : 1);
  const t = claim.ttv;
  const d = claim.tdv;
  const mode: ImpliedMoonSummary['mode'] = t && d ? 'ttv+tdv' : t ? 'ttv only' : 'tdv only';
  return {
    mode,
    central: { ttv: t ? t.valueS * toSemi(t.kind) : NaN, tdv: d ? d.valueS * toSemi(d.kind) : NaN },
    draw(rng, out) {
      out.ttv = t ? positiveNormal(rng, t.valueS, t.errorS) * toSemi(t.kind) : NaN;
      out.tdv = d ? positiveNormal(rng, d.valueS, d.errorS) * toSemi(d.kind) : NaN;
      out.phaseProjection = NaN;
    },
  };
}

function amplitudeSourceFromTable(a: TableAnalysis): AmplitudeSource {
  const t = a.ttvFit;
  const d = a.tdvFit;
  const pt: [number, number] = [0, 0];
  const pd: [number, number] = [0, 0];
  return {
    mode: d ? 'ttv+tdv' : 'ttv only',
    central: { ttv: Math.hypot(t.cosAmplitude, t.sinAmplitude), tdv: d ? Math.hypot(d.cosAmplitude, d.sinAmplitude) : NaN },
    draw(rng, out) {
      drawPair(rng, t.cosAmplitude, t.sinAmplitude, t.covariance, pt);
      out.ttv = Math.hypot(pt[0], pt[1]);
      if (d) {
        drawPair(rng, d.cosAmplitude, d.sinAmplitude, d.covariance, pd);
        out.tdv = Math.hypot(pd[0], pd[1]);
        // Projection of the TDV coefficient vector on the TTV direction: 0 for a single moon (quadrature).
        out.phaseProjection = (pt[0] * pd[0] + pt[1] * pd[1]) / out.ttv;
      } else {
        out.tdv = NaN;
        out.phaseProjection = NaN;
      }
    },
  };
}

interface MonteCarloResult {
  implied: ImpliedMoonInternal;
  /** Quantiles of the single channel a_PB (TTV only, m) or v_PB (TDV only, m/s) before the averaging correction. */
  channel: RawQuantileSummary | null;
  phaseProjectionSd: number;
}

function runMonteCarlo(claim: Claim, src: AmplitudeSource, sys: SystemSummary): MonteCarloResult {
  const n = claim.draws;
  const rng = createRng(claim.seed, 0, 0);
  const mass = new Float64Array(n);
  const sep = new Float64Array(n);
  const per = new Float64Array(n);
  const ratio = new Float64Array(n);
  const channel = new Float64Array(n); // a_PB (TTV only) or v_PB (TDV only)
  const proj = new Float64Array(n);
  const out = { ttv: NaN, tdv: NaN, phaseProjection: NaN };
  const mp = sys.planetMassKg;
  const vB = sys.barycentreVelocityMS;
  const tau = sys.durationS;
  const massAtSeparationM = src.mode === 'ttv only' ? sys.stableProgradeM : src.mode === 'tdv only' ? sys.rocheRockyM : null;
  // One amplitude at an assumed separation: undo the transit averaging at that separation's period
  // (impliedMoon.ts averagingAtSeparation), then the exact single-amplitude relation.
  const at = (x: number, a: number): number => {
    const f = averagingAtSeparation(a, mp, tau);
    return src.mode === 'ttv only' ? massFromOffsetAtSeparation(x / f.ttv, a, mp) : massFromReflexSpeedAtSeparation(x / f.tdv, a, mp);
  };
  for (let i = 0; i < n; i++) {
    src.draw(rng, out);
    // Orientation: direction cosine u of the orbit normal with the chord, uniform for an isotropic normal.
    const u = claim.orientation === 'isotropic' ? 2 * rng.uniform() - 1 : 0;
    const phi = Math.max(projectionFactor(u), 1e-9);
    const ttv = out.ttv / phi;
    const tdv = out.tdv / phi;
    proj[i] = out.phaseProjection;
    if (src.mode === 'ttv+tdv') {
      if (ttv > 0 && tdv > 0) {
        const m = invertAmplitudes({ ttvSemiS: ttv, tdvSemiS: tdv }, vB, tau, mp);
        mass[i] = m.massKg;
        sep[i] = m.separationM;
        per[i] = m.moonPeriodS;
      } else {
        mass[i] = sep[i] = per[i] = NaN;
      }
    } else if (src.mode === 'ttv only') {
      channel[i] = ttv * vB;
      mass[i] = at(channel[i], massAtSeparationM!);
    } else {
      channel[i] = (tdv * vB) / tau;
      mass[i] = at(channel[i], massAtSeparationM!);
    }
    ratio[i] = mass[i] / mp;
  }
  let central: number;
  if (src.mode === 'ttv+tdv') {
    central = src.central.ttv > 0 && src.central.tdv > 0 ? invertAmplitudes({ ttvSemiS: src.central.ttv, tdvSemiS: src.central.tdv }, vB, tau, mp).massKg : NaN;
  } else if (src.mode === 'ttv only') {
    central = at(src.central.ttv * vB, massAtSeparationM!);
  } else {
    central = at((src.central.tdv * vB) / tau, massAtSeparationM!);
  }
  let degeneracy: ImpliedMoonInternal['degeneracy'] = null;
  let channelQuantiles: RawQuantileSummary | null = null;
  if (src.mode !== 'ttv+tdv') {
    const cq = quantiles(channel);
    channelQuantiles = cq;
    const lo = Math.max(sys.rocheRockyM, sys.planetRadiusM);
    const hi = sys.stableRetrogradeM;
    const separationM: number[] = [];
    const m: number[] = [];
    const mLo: number[] = [];
    const mHi: number[] = [];
    const k = 40;
    for (let j = 0; j < k; j++) {
      const a = lo * Math.pow(hi / lo, j / (k - 1));
      separationM.push(a);
      m.push(at(cq.median, a));
      mLo.push(at(cq.lo2, a));
      mHi.push(at(cq.hi2, a));
    }
    degeneracy = { separationM, massKg: m, massLoKg: mLo, massHiKg: mHi };
  }
  let sd = NaN;
  if (src.mode === 'ttv+tdv' && Number.isFinite(proj[0])) {
    let s = 0;
    let s2 = 0;
    for (let i = 0; i < n; i++) {
      s += proj[i];
      s2 += proj[i] * proj[i];
    }
    sd = Math.sqrt(Math.max(0, s2 / n - (s / n) ** 2));
  }
  const note =
    src.mode === 'ttv+tdv'
      ? 'separation from the TDV/TTV ratio (orientation-free for a circular orbit), mass from the TTV; the mass scales as 1/Φ with the orbit projection'
      : src.mode === 'ttv only'
        ? 'TTVs alone fix only a_S·M_S: the mass given is the lightest moon at the prograde stable limit; closer moons are heavier (degeneracy curve)'
        : 'TDVs alone fix only M_S/sqrt(a_S): the mass given is the lightest moon, at the rocky Roche limit; wider moons are heavier (degeneracy curve)';
  return {
    implied: {
      mode: src.mode,
      orientation: claim.orientation,
      draws: n,
      seed: claim.seed,
      moonPeriodS: src.mode === 'ttv+tdv' ? quantiles(per) : null,
      separationM: src.mode === 'ttv+tdv' ? quantiles(sep) : null,
      massKg: quantiles(mass),
      massRatio: quantiles(ratio),
      massAtSeparationM,
      coplanarMassKg: central,
      degeneracy,
      note,
    },
    phaseProjectionSd: sd,
    channel: channelQuantiles,
  };
}

function systemSummary(claim: Claim, durationS: number | null): { sys: SystemSummary; limits: ReturnType<typeof computeLimits> } {
  const limits = computeLimits(limitsScenario(claim));
  const { planet } = claim;
  const rhoP = meanDensity(planet.massKg, planet.radiusM);
  const sys: SystemSummary = {
    hillRadiusM: limits.hill_radius_m,
    stableProgradeM: limits.stable_max_separation_m,
    stableRetrogradeM: limits.stable_max_separation_retrograde_m,
    rocheRockyM: rocheLimit(planet.radiusM, rhoP, ROCKY_DENSITY_KG_M3).fluidM,
    rocheIcyM: rocheLimit(planet.radiusM, rhoP, ICY_DENSITY_KG_M3).fluidM,
    tidalMaxMassKg: limits.tidal_max_moon_mass_kg,
    durationS: durationS ?? limits.transit_duration_s,
    barycentreVelocityMS: barycentreSkyVelocity(planet.semiMajorAxisM, planet.periodS, planet.eccentricity, planet.omegaRad),
    planetMassKg: planet.massKg,
    planetRadiusM: planet.radiusM,
  };
  return { sys, limits };
}

const SOURCES = {
  stability: 'Domingos, Winter & Yokoyama 2006, MNRAS 373, 1227 (fits to numerical integrations)',
  roche: 'Roche limit d = 2.44 R_P (ρ_P/ρ_S)^{1/3} (Roche 1849, as in Murray & Dermott 1999); rocky 5500, icy 1900 kg/m³',
  massRatio: 'Canup & Ward 2006, Nature 441, 834: regular satellites total ~1e-4 of their planet (a rule of thumb, not a law)',
  tidal: 'Barnes & O\'Brien 2002, ApJ 575, 1087 (outward tidal migration over the system age, planet k2 and Q as given)',
  phase: 'Kipping 2009a, MNRAS 392, 181 (TDV in quadrature with TTV); Heller et al. 2016, A&A 591, A67 (TTV–TDV ellipse)',
  dip: `Mandel & Agol 2002 small-body depth; orbital sampling effect (Heller 2014, ApJ 787, 14); ${DIP_DETECTION_SIGMA}σ threshold (Jenkins et al. 2010, ApJ 713, L87, from memory)`,
  residual: 'χ² goodness of fit (Press et al. 2007, Numerical Recipes §15.1); runs test (Wald & Wolfowitz 1940, Ann. Math. Stat. 11, 147)',
  significance: 'χ² about a linear ephemeris; BIC = χ² + k ln N (Schwarz 1978, Ann. Stat. 6, 461), ΔBIC > 6 "strong" (Kass & Raftery 1995, from memory)',
  precision: 'Carter et al. 2008, ApJ 689, 499 timing precision at the stated photometric noise; expected white-noise χ² of the claimed rms',
};

function stabilityCheck(imp: ImpliedMoonInternal, sys: SystemSummary, offset: RawQuantileSummary | null): VetCheck {
  const rp = sys.planetRadiusM;
  const hill = (m: number) => `${sig3(m / sys.hillRadiusM)} R_H`;
  const limits = `prograde limit ${planetRadii(sys.stableProgradeM, rp)} (${hill(sys.stableProgradeM)}), retrograde ${planetRadii(sys.stableRetrogradeM, rp)} (${hill(sys.stableRetrogradeM)})`;
  const base = { id: 'stability' as const, title: 'separation vs stable limits', source: SOURCES.stability };
  if (imp.separationM) {
    const a = imp.separationM;
    const txt = `implied separation ${intervalText(a, (x) => planetRadii(x, rp))} = ${hill(a.median)}; ${limits}`;
    if (a.lo2 > sys.stableRetrogradeM) return { ...base, status: 'fail', detail: `even the 2σ-lowest separation lies beyond the retrograde stable limit, so no moon orbit there lasts: ${txt}` };
    if (a.median > sys.stableProgradeM) return { ...base, status: 'tension', detail: `the separation lies beyond the prograde stable limit: only a retrograde moon could be stable there; ${txt}` };
    return { ...base, status: 'pass', detail: `inside the prograde stable limit: ${txt}` };
  }
  if (offset && imp.mode === 'ttv only') {
    const txt = `the planet's barycentric offset alone is a_PB = ${intervalText(offset, (x) => planetRadii(x, rp))}, and a_S > a_PB; ${limits}`;
    if (offset.lo2 > sys.stableRetrogradeM) return { ...base, status: 'fail', detail: `the TTV needs a moon farther out than any stable orbit: ${txt}` };
    if (offset.median > sys.stableProgradeM) return { ...base, status: 'tension', detail: `the TTV needs a moon beyond the prograde stable limit: ${txt}` };
    return { ...base, status: 'not tested', detail: `TTVs alone do not fix the separation; solutions exist inside the stable band (${txt})` };
  }
  return { ...base, status: 'not tested', detail: `TDVs alone do not fix the separation; ${limits}` };
}

function rocheCheck(imp: ImpliedMoonInternal, sys: SystemSummary): VetCheck {
  const rp = sys.planetRadiusM;
  const base = { id: 'roche' as const, title: 'separation vs Roche limit', source: SOURCES.roche };
  const limits = `fluid Roche limit ${planetRadii(sys.rocheRockyM, rp)} (rocky) / ${planetRadii(sys.rocheIcyM, rp)} (icy)`;
  if (!imp.separationM) return { ...base, status: 'not tested', detail: `the separation is not fixed by one amplitude; ${limits}` };
  const a = imp.separationM;
  const txt = `implied separation ${intervalText(a, (x) => planetRadii(x, rp))}; ${limits}`;
  if (a.hi2 < sys.rocheRockyM) return { ...base, status: 'fail', detail: `even the 2σ-highest separation is inside the Roche limit of a rocky moon: ${txt}` };
  if (a.median < sys.rocheRockyM) return { ...base, status: 'tension', detail: `the separation is inside the Roche limit of a rocky moon: ${txt}` };
  if (a.median < sys.rocheIcyM) return { ...base, status: 'tension', detail: `only a dense (rocky) moon survives there; an icy one would be torn apart: ${txt}` };
  return { ...base, status: 'pass', detail: `outside the Roche limit: ${txt}` };
}

function massRatioCheck(imp: ImpliedMoonInternal): VetCheck {
  const q = imp.massRatio;
  const base = { id: 'mass-ratio' as const, title: 'moon-to-planet mass ratio', source: SOURCES.massRatio };
  const atLeast = imp.mode === 'ttv+tdv' ? '' : 'at least ';
  const txt = `implied M_S/M_P ${atLeast}${intervalText(q, sig3)} (mass ${atLeast}${intervalText(imp.massKg, earthMasses)}) vs ~${REGULAR_SATELLITE_MASS_RATIO} for regular satellites`;
  if (q.lo2 > 1) return { ...base, status: 'fail', detail: `the companion would outweigh its planet even at 2σ: a binary planet, not a moon; ${txt}` };
  if (q.median > MASS_RATIO_TENSION) return { ...base, status: 'tension', detail: `more than ten times the regular-satellite ratio: it would need capture or a giant impact (as for the Moon, 0.0123 of Earth); ${txt}` };
  return { ...base, status: 'pass', detail: `${txt}` };
}

function tidalCheck(imp: ImpliedMoonInternal, sys: SystemSummary): VetCheck {
  const base = { id: 'tidal-survival' as const, title: 'mass vs tidal survival', source: SOURCES.tidal };
  const m = imp.massKg;
  const txt = `implied mass ${imp.mode === 'ttv+tdv' ? '' : 'at least '}${intervalText(m, earthMasses)}; a prograde moon heavier than ${earthMasses(sys.tidalMaxMassKg)} migrates out of the stable zone within the system age`;
  if (m.lo2 > 100 * sys.tidalMaxMassKg) return { ...base, status: 'fail', detail: `more than 100 times the survival mass even at 2σ, beyond what any plausible planet Q (the limit scales with Q) would allow: ${txt}` };
  if (m.median > sys.tidalMaxMassKg) return { ...base, status: 'tension', detail: `heavier than the tidal-survival mass (a retrograde orbit or a larger planet Q could save it): ${txt}` };
  return { ...base, status: 'pass', detail: txt };
}

function phaseCheckTable(tab: TableSignificance, analysis: TableAnalysis, projSd: number): VetCheck {
  const base = { id: 'phase' as const, title: 'TTV–TDV phase relation', source: SOURCES.phase };
  const t = analysis.ttvFit;
  const d = analysis.tdvFit;
  if (!d || tab.tdvSemiAmplitudeS === null || tab.tdvSemiAmplitudeErrS === null) return { ...base, status: 'not tested', detail: 'the table has no durations' };
  const zT = tab.ttvSemiAmplitudeS / tab.ttvSemiAmplitudeErrS;
  const zD = tab.tdvSemiAmplitudeS / tab.tdvSemiAmplitudeErrS;
  if (!(zT >= 2 && zD >= 2)) return { ...base, status: 'not tested', detail: `a phase needs both sinusoids above 2σ (TTV ${sig3(zT)}σ, TDV ${sig3(zD)}σ)` };
  const aT = Math.hypot(t.cosAmplitude, t.sinAmplitude);
  const aD = Math.hypot(d.cosAmplitude, d.sinAmplitude);
  const dot = t.cosAmplitude * d.cosAmplitude + t.sinAmplitude * d.sinAmplitude;
  const angleDeg = (Math.acos(Math.max(-1, Math.min(1, dot / (aT * aD)))) * 180) / Math.PI;
  const proj = dot / aT;
  const z = Math.abs(proj) / projSd;
  const txt = `phase difference ${sig3(angleDeg)}° (a single moon gives 90°: TDV in quadrature with TTV); in-phase part of the TDV ${timeText(proj)} ± ${timeText(projSd)}, ${sig3(z)}σ from zero`;
  if (z >= 4) return { ...base, status: 'fail', detail: `the TDV is not in quadrature with the TTV: ${txt}` };
  if (z >= 2) return { ...base, status: 'tension', detail: `the TDV departs from quadrature with the TTV: ${txt}` };
  return { ...base, status: 'pass', detail: txt };
}

function phaseCheckClaim(claim: Claim): VetCheck {
  const base = { id: 'phase' as const, title: 'TTV–TDV phase relation', source: SOURCES.phase };
  const p = claim.phaseOffset;
  if (!p) return { ...base, status: 'not tested', detail: 'no phase offset was claimed (amplitudes alone carry no phase)' };
  let w = p.valueRad % (2 * Math.PI);
  if (w > Math.PI) w -= 2 * Math.PI;
  if (w < -Math.PI) w += 2 * Math.PI;
  const dev = Math.abs(Math.abs(w) - Math.PI / 2);
  const z = dev / p.errorRad;
  const txt = `claimed offset ${sig3((p.valueRad * 180) / Math.PI)}° ± ${sig3((p.errorRad * 180) / Math.PI)}° vs ±90° for a single moon: ${sig3(z)}σ away`;
  if (z >= 4) return { ...base, status: 'fail', detail: txt };
  if (z >= 2) return { ...base, status: 'tension', detail: txt };
  return { ...base, status: 'pass', detail: txt };
}

function dipCheck(claim: Claim, imp: ImpliedMoonInternal, sys: SystemSummary): VetCheck {
  const base = { id: 'moon-dip' as const, title: "the moon's own dip", source: SOURCES.dip };
  const sep = imp.separationM ? imp.separationM.median : (imp.massAtSeparationM ?? sys.stableProgradeM);
  const common = {
    starRadiusM: claim.star.radiusM,
    u1: claim.star.u1,
    u2: claim.star.u2,
    impactParameter: claim.planet.impactParameter,
    durationS: sys.durationS,
    separationM: sep,
    barycentreVelocityMS: sys.barycentreVelocityMS,
    transits: claim.transits,
  };
  const p = claim.precision;
  const m = imp.massKg.median;
  if (!Number.isFinite(m)) return { ...base, status: 'not tested', detail: 'no finite implied mass' };
  const noise = p ? { noiseFraction: p.noiseFraction, noiseTimescaleS: p.noiseTimescaleS } : { noiseFraction: 1, noiseTimescaleS: 1 };
  const rocky = dipVisibility({ ...common, ...noise, moonMassKg: m, densityKgM3: ROCKY_DENSITY_KG_M3 });
  const icy = dipVisibility({ ...common, ...noise, moonMassKg: m, densityKgM3: ICY_DENSITY_KG_M3 });
  const ppm = (x: number) => `${sig3(x * 1e6)} ppm`;
  const sizes = `a moon of ${earthMasses(m)} would be ${sig3(rocky.radiusM / R_EARTH_M)} Rearth rocky / ${sig3(icy.radiusM / R_EARTH_M)} Rearth icy, dip ${ppm(rocky.depth)} / ${ppm(icy.depth)}`;
  if (claim.moonDipDepth !== null) {
    // Radius from the claimed depth (depth ∝ R², same limb darkening), then the density with the implied mass.
    const rClaim = rocky.radiusM * Math.sqrt(claim.moonDipDepth / rocky.depth);
    const rho = (3 * m) / (4 * Math.PI * rClaim ** 3);
    const snrClaim = p ? (claim.moonDipDepth / rocky.depth) * rocky.snrOptimal : NaN;
    const txt = `claimed dip ${ppm(claim.moonDipDepth)} means a radius of ${sig3(rClaim / R_EARTH_M)} Rearth, so a bulk density of ${sig3(rho)} kg/m³ with the implied mass (plausible ${DENSITY_RANGE_KG_M3[0]}–${DENSITY_RANGE_KG_M3[1]} kg/m³)${p ? `; at the stated precision it is ${sig3(snrClaim)}σ over ${claim.transits} transits` : ''}`;
    if (rho < DENSITY_RANGE_KG_M3[0] || rho > DENSITY_RANGE_KG_M3[1]) return { ...base, status: 'tension', detail: `the dip and the timing disagree on the moon's density: ${txt}` };
    if (p && snrClaim < 3) return { ...base, status: 'tension', detail: `the claimed dip is below 3σ at the stated precision: ${txt}` };
    return { ...base, status: 'pass', detail: txt };
  }
  if (!p) return { ...base, status: 'not tested', detail: `no photometric precision was stated; ${sizes}` };
  const txt = `${sizes}: ${sig3(rocky.snrStacked)}σ rocky / ${sig3(icy.snrStacked)}σ icy in the folded stack over ${claim.transits} transits (${sig3(rocky.snrOptimal)}σ rocky with the moon's positions known)`;
  if (rocky.snrStacked >= DIP_DETECTION_SIGMA) return { ...base, status: 'tension', detail: `no dip was reported, yet even a rocky moon would have shown one above ${DIP_DETECTION_SIGMA}σ: ${txt}` };
  return { ...base, status: 'pass', detail: `its absence is expected: ${txt}` };
}

function residualCheck(tab: TableSignificance): VetCheck {
  const base = { id: 'residual-noise' as const, title: 'scatter beyond one moon (red noise, systematics)', source: SOURCES.residual };
  const r = tab.residual;
  const runs = tab.runs;
  const txt = `χ² about the moon model ${sig3(r.chiSquare)} for ${r.dof} dof (χ²/dof ${sig3(r.chiSquare / r.dof)}, p = ${sig3(r.pValue)}); ${runs.pValueFewRuns === null ? 'runs test not possible (the TTV residuals are all of one sign or zero)' : `${runs.runs} sign runs in the TTV residuals vs ${sig3(runs.expectedRuns)} expected (p = ${sig3(runs.pValueFewRuns)} for so few)`}`;
  if (r.dof >= 1 && r.pValue < P_SIGNIFICANT) return { ...base, status: 'tension', detail: `one moon does not account for the scatter: red noise, systematics or underestimated errors are needed: ${txt}` };
  if (runs.pValueFewRuns !== null && runs.pValueFewRuns < 0.01) return { ...base, status: 'tension', detail: `neighbouring transits scatter together, as red noise or slow systematics do: ${txt}` };
  return { ...base, status: 'pass', detail: txt };
}

function significanceCheckTable(tab: TableSignificance): VetCheck {
  const base = { id: 'significance' as const, title: 'significance of the timing signal', source: SOURCES.significance };
  const chi = tab.joint ?? tab.ttv;
  const b = tab.bicJoint ?? tab.bicTtv;
  const txt = `χ² ${sig3(chi.chiSquare)} for ${chi.dof} dof (p = ${sig3(chi.pValue)}) without a moon; ΔBIC ${sig3(b.delta)} for a sinusoid at ${sig3(b.frequencyPerEpoch)} cycles per epoch; TTV periodogram FAP ${sig3(tab.periodogramTtv.falseAlarmProbability)}`;
  if (!(chi.pValue < P_SIGNIFICANT)) return { ...base, status: 'fail', detail: `no significant excess scatter about a constant period${tab.tdv ? ' and duration' : ''}: χ² ${sig3(chi.chiSquare)} for ${chi.dof} dof (p = ${sig3(chi.pValue)}, a detection needs p < ${P_SIGNIFICANT}); the timing is within its stated errors, so there is nothing for a moon to explain` };
  if (!(b.delta > BIC_STRONG)) return { ...base, status: 'tension', detail: `the scatter is in excess but a sinusoid is not favoured, unlike one moon's signal: ${txt}` };
  return { ...base, status: 'pass', detail: txt };
}

function significanceCheckClaim(sig: AmplitudeSignificance): VetCheck {
  const base = { id: 'significance' as const, title: 'significance of the claimed amplitudes', source: 'amplitude / uncertainty (z-score)' };
  const parts: string[] = [];
  if (sig.ttvZ !== null) parts.push(`TTV ${sig3(sig.ttvZ)}σ`);
  if (sig.tdvZ !== null) parts.push(`TDV ${sig3(sig.tdvZ)}σ`);
  const best = Math.max(sig.ttvZ ?? 0, sig.tdvZ ?? 0);
  if (best < AMPLITUDE_SIGMA) return { ...base, status: 'fail', detail: `no claimed amplitude reaches ${AMPLITUDE_SIGMA}σ (${parts.join(', ')}): not a detection, so no moon is inferred` };
  return { ...base, status: 'pass', detail: parts.join(', ') };
}

function precisionCheck(claim: Claim, sig: AmplitudeSignificance, sys: SystemSummary): VetCheck {
  const base = { id: 'precision' as const, title: 'claimed amplitudes vs the data precision', source: SOURCES.precision };
  if (!claim.precision) return { ...base, status: 'not tested', detail: 'no photometric precision was stated' };
  if (sig.timingPrecisionS === null) {
    const cadence = claim.cadenceS ?? claim.precision.noiseTimescaleS;
    return { ...base, status: 'not tested', detail: `no per-transit timing precision can be computed at a cadence of ${timeText(cadence)} for a transit of ${timeText(sys.durationS)}` };
  }
  const parts: string[] = [];
  let bad = false;
  const toRms = (a: { valueS: number; kind: string }) => (a.kind === 'rms' ? a.valueS : a.valueS / Math.SQRT2);
  if (claim.ttv && sig.expectedTtvPValue !== null) {
    parts.push(`TTV rms ${timeText(toRms(claim.ttv))} vs per-transit mid-time precision ${timeText(sig.timingPrecisionS)}: expected white-noise χ² p = ${sig3(sig.expectedTtvPValue)}`);
    if (sig.expectedTtvPValue > 0.01 && (sig.ttvZ ?? 0) >= 3) bad = true;
  }
  if (claim.tdv && sig.expectedTdvPValue !== null && sig.durationPrecisionS !== null) {
    parts.push(`TDV rms ${timeText(toRms(claim.tdv))} vs duration precision ${timeText(sig.durationPrecisionS)}: expected p = ${sig3(sig.expectedTdvPValue)}`);
    if (sig.expectedTdvPValue > 0.01 && (sig.tdvZ ?? 0) >= 3) bad = true;
  }
  const txt = `${parts.join('; ')} over ${claim.transits} transits`;
  if (bad) return { ...base, status: 'tension', detail: `data of the stated precision could hardly have measured this amplitude: ${txt}` };
  return { ...base, status: 'pass', detail: txt };
}

export const CAUTIONS: readonly string[] = [
  'Another planet: a perturber near a mean-motion resonance also makes sinusoidal TTVs (Agol et al. 2005, MNRAS 359, 567; Holman & Murray 2005, Science 307, 1288; Lithwick, Xie & Wu 2012, ApJ 761, 122); it makes little TDV, so a TDV in quadrature with the TTV favours a moon (Kipping 2009a).',
  'Stellar activity: starspots crossed by the planet and unocculted spots distort the transit and shift fitted mid-times and durations (e.g. Oshagh et al. 2013, A&A 556, A19, from memory).',
  'Instrumental timing: clock errors, time stamps at the start instead of the middle of an exposure, and mixed time standards (UTC vs TDB, HJD vs BJD) shift transits by up to about a minute (Eastman, Siverd & Gaudi 2010, PASP 122, 935).',
  'Photometric moon TTV: a large, low-density moon blended into a planet-only fit moves the fitted mid-time against the barycentric TTV (Szabó et al. 2006, A&A 450, 395); only the barycentric part is modelled here.',
  'Correlated (red) noise in the light curves makes per-transit errors larger than white-noise estimates (Pont, Zucker & Queloz 2006, MNRAS 373, 231; Carter & Winn 2009, ApJ 704, 51).',
];

function rankChecks(checks: VetCheck[]): { verdict: Verdict; reasons: string[] } {
  const order = (c: VetCheck) => CHECK_ORDER.indexOf(c.id);
  const fails = checks.filter((c) => c.status === 'fail').sort((a, b) => order(a) - order(b));
  const tensions = checks.filter((c) => c.status === 'tension').sort((a, b) => order(a) - order(b));
  const verdict: Verdict = fails.length > 0 ? 'implausible' : tensions.length > 0 ? 'in tension' : 'consistent with a moon';
  const reasons = [...fails, ...tensions].map((c) => `${c.status === 'fail' ? 'FAIL' : 'TENSION'} ${c.title}: ${c.detail}`);
  if (reasons.length === 0) reasons.push('every physical check that could be made passes');
  return { verdict, reasons };
}

const finiteOrNull = (x: number): number | null => (Number.isFinite(x) ? x : null);
const quantilesForOutput = (q: RawQuantileSummary) => ({ median: finiteOrNull(q.median), lo1: finiteOrNull(q.lo1), hi1: finiteOrNull(q.hi1), lo2: finiteOrNull(q.lo2), hi2: finiteOrNull(q.hi2) });

/** The reported implied moon: unbounded (infinite) or undefined values become null, as JSON needs. */
function impliedForOutput(imp: ImpliedMoonInternal): ImpliedMoonSummary {
  const d = imp.degeneracy;
  return {
    ...imp,
    moonPeriodS: imp.moonPeriodS && quantilesForOutput(imp.moonPeriodS),
    separationM: imp.separationM && quantilesForOutput(imp.separationM),
    massKg: quantilesForOutput(imp.massKg),
    massRatio: quantilesForOutput(imp.massRatio),
    coplanarMassKg: imp.coplanarMassKg === null ? null : finiteOrNull(imp.coplanarMassKg),
    degeneracy: d && { separationM: d.separationM, massKg: d.massKg.map(finiteOrNull), massLoKg: d.massLoKg.map(finiteOrNull), massHiKg: d.massHiKg.map(finiteOrNull) },
  };
}

/** Is there excess timing scatter at all? The same χ² test as the significance check. */
function hasTableSignal(s: TableAnalysis['significance']): boolean {
  const chi = s.joint ?? s.ttv;
  return chi.pValue < P_SIGNIFICANT;
}

/** Does any claimed amplitude reach 3σ? The same threshold as the significance check. */
function hasAmplitudeSignal(claim: Claim): boolean {
  const z = Math.max(claim.ttv ? claim.ttv.valueS / claim.ttv.errorS : 0, claim.tdv ? claim.tdv.valueS / claim.tdv.errorS : 0);
  return z >= AMPLITUDE_SIGMA;
}

/** The moon checks skipped without a signal (listed as not tested, so the report shows what was not done). */
const NO_SIGNAL_CHECKS: Array<Pick<VetCheck, 'id' | 'title' | 'source'>> = [
  { id: 'stability', title: 'separation vs stable limits', source: SOURCES.stability },
  { id: 'roche', title: 'separation vs Roche limit', source: SOURCES.roche },
  { id: 'mass-ratio', title: 'moon-to-planet mass ratio', source: SOURCES.massRatio },
  { id: 'tidal-survival', title: 'mass vs tidal survival', source: SOURCES.tidal },
  { id: 'phase', title: 'TTV–TDV phase relation', source: SOURCES.phase },
  { id: 'moon-dip', title: "the moon's own dip", source: SOURCES.dip },
];

function noSignalVerdict(checks: VetCheck[]): { verdict: Verdict; reasons: string[] } {
  const sig = checks.find((c) => c.id === 'significance')!;
  const reasons = [`NO SIGNAL ${sig.title}: ${sig.detail}`];
  for (const c of checks) if (c.id !== 'significance' && (c.status === 'tension' || c.status === 'fail')) reasons.push(`${c.status === 'fail' ? 'FAIL' : 'TENSION'} ${c.title}: ${c.detail}`);
  return { verdict: 'no detectable signal', reasons };
}

/** Vet a claimed moon signal (see the file header). Pure: the same claim and seed give the same result. */
export function vetClaim(claim: Claim): VetResult {
  const analysis = claim.table ? analyseTable(claim.table) : null;
  const { sys, limits } = systemSummary(claim, claim.durationS ?? analysis?.meanDurationS ?? null);
  const src = analysis ? amplitudeSourceFromTable(analysis) : amplitudeSourceFromClaim(claim);
  // No significant timing variation: nothing to explain, so no implied moon and no physical checks.
  const signal = analysis ? hasTableSignal(analysis.significance) : hasAmplitudeSignal(claim);
  const mc = signal ? runMonteCarlo(claim, src, sys) : null;
  const imp = mc ? mc.implied : null;

  let tableSignificance: TableSignificance | null = null;
  let amplitudeSignificance: AmplitudeSignificance | null = null;
  const checks: VetCheck[] = [];
  let amplitudes: VetResult['amplitudes'];
  if (analysis) {
    const s = analysis.significance;
    // Alias family of the fitted frequency over the period ratios a moon can have (Roche … stable limit).
    const minRatio = claim.planet.periodS / moonPeriodAt(sys.stableRetrogradeM, sys.planetMassKg);
    const maxRatio = claim.planet.periodS / moonPeriodAt(Math.max(sys.rocheRockyM, sys.planetRadiusM), sys.planetMassKg);
    const family = maxRatio > minRatio && maxRatio - minRatio < 40000 ? aliasFamily(Math.min(0.5, s.frequencyPerEpoch), claim.planet.periodS, minRatio, maxRatio) : [];
    let nearest: number | null = null;
    if (imp?.moonPeriodS && family.length > 0) {
      const target = imp.moonPeriodS.median;
      nearest = family.reduce((best, m) => (Math.abs(Math.log(m.moonPeriod / target)) < Math.abs(Math.log(best / target)) ? m.moonPeriod : best), family[0].moonPeriod);
    }
    tableSignificance = {
      ...s,
      aliasFamily: { count: family.length, minRatio, maxRatio, periodsS: family.slice(0, 12).map((m) => m.moonPeriod), nearestToImpliedS: nearest },
    };
    amplitudes = {
      ttvRmsS: s.ttvSemiAmplitudeS / Math.SQRT2,
      ttvRmsErrS: s.ttvSemiAmplitudeErrS / Math.SQRT2,
      tdvRmsS: s.tdvSemiAmplitudeS === null ? null : s.tdvSemiAmplitudeS / Math.SQRT2,
      tdvRmsErrS: s.tdvSemiAmplitudeErrS === null ? null : s.tdvSemiAmplitudeErrS / Math.SQRT2,
    };
    checks.push(significanceCheckTable(tableSignificance));
  } else {
    const toRms = (a: { valueS: number; errorS: number; kind: string } | null) => (a ? (a.kind === 'rms' ? 1 : Math.SQRT1_2) : NaN);
    const n = claim.transits;
    const precise = claim.precision !== null;
    // Undefined (null) when the model cannot time the transit at this cadence (e.g. a cadence longer than T14).
    const finitePositive = (x: number) => (Number.isFinite(x) && x > 0 ? x : null);
    const sTc = precise ? finitePositive(limits.timing_precision_s) : null;
    const sDur = precise ? finitePositive(limits.duration_precision_s) : null;
    const ttvRms = claim.ttv ? claim.ttv.valueS * toRms(claim.ttv) : null;
    const tdvRms = claim.tdv ? claim.tdv.valueS * toRms(claim.tdv) : null;
    // Expected χ² of N white-noise points around a line (N − 2 dof) or a mean (N − 1) plus the signal: (dof + N·rms²/σ²).
    const expectedP = (rms: number | null, sigma: number | null, dof: number) =>
      rms === null || sigma === null || !(sigma > 0) ? null : chiSquareSurvival(dof + (n * rms * rms) / (sigma * sigma), dof);
    amplitudeSignificance = {
      ttvZ: claim.ttv ? claim.ttv.valueS / claim.ttv.errorS : null,
      tdvZ: claim.tdv ? claim.tdv.valueS / claim.tdv.errorS : null,
      timingPrecisionS: sTc,
      durationPrecisionS: sDur,
      expectedTtvPValue: expectedP(ttvRms, sTc, n - 2),
      expectedTdvPValue: expectedP(tdvRms, sDur, n - 1),
    };
    amplitudes = {
      ttvRmsS: ttvRms,
      ttvRmsErrS: claim.ttv ? claim.ttv.errorS * toRms(claim.ttv) : null,
      tdvRmsS: tdvRms,
      tdvRmsErrS: claim.tdv ? claim.tdv.errorS * toRms(claim.tdv) : null,
    };
    checks.push(significanceCheckClaim(amplitudeSignificance));
  }

  // The planet's barycentric offset a_PB = A_TTV v_B (TTV only): a_S must exceed it.
  let offset: RawQuantileSummary | null = null;
  if (imp && imp.mode === 'ttv only' && imp.degeneracy) {
    const m = imp.massKg;
    const back = (mass: number) => (mass * imp.massAtSeparationM!) / (sys.planetMassKg + mass);
    offset = { median: back(m.median), lo1: back(m.lo1), hi1: back(m.hi1), lo2: back(m.lo2), hi2: back(m.hi2) };
    // Where no moon at the assumed separation makes the TTV (unbounded mass), the offset is at least
    // the frozen-planet a_PB = A_TTV·v_B (transit averaging only lowers the observed TTV).
    // All five from the channel then, so the quantiles stay ordered.
    const ch = mc?.channel;
    const keys = ['median', 'lo1', 'hi1', 'lo2', 'hi2'] as const;
    if (keys.some((k) => !Number.isFinite(offset![k]))) for (const k of keys) offset[k] = ch && Number.isFinite(ch[k]) ? ch[k] : Infinity;
  }
  if (imp && mc) {
    checks.push(stabilityCheck(imp, sys, offset));
    checks.push(rocheCheck(imp, sys));
    checks.push(massRatioCheck(imp));
    checks.push(tidalCheck(imp, sys));
    checks.push(analysis && tableSignificance ? phaseCheckTable(tableSignificance, analysis, mc.phaseProjectionSd) : phaseCheckClaim(claim));
    checks.push(dipCheck(claim, imp, sys));
  } else {
    checks.push(...NO_SIGNAL_CHECKS.map((c) => ({ ...c, status: 'not tested' as const, detail: 'no detectable signal, so no moon to test' })));
  }
  if (tableSignificance) checks.push(residualCheck(tableSignificance));
  if (amplitudeSignificance) checks.push(precisionCheck(claim, amplitudeSignificance, sys));

  const { verdict, reasons } = signal ? rankChecks(checks) : noSignalVerdict(checks);
  const assumptions = [
    'circular moon orbit (tidally damped); the TDV is the velocity part only, without the transit-impact-parameter part of inclined orbits (Kipping 2009b)',
    claim.orientation === 'isotropic'
      ? 'orbit orientation unknown: isotropic orbit normal in the Monte Carlo (the coplanar mass is the minimum)'
      : 'coplanar moon orbit assumed (the minimum mass)',
    `nested two-body orbits; planet mass ${earthMasses(claim.planet.massKg)} taken as exact; τ̄ = ${timeText(sys.durationS)}${claim.durationS ? ' (given)' : analysis?.meanDurationS ? ' (mean of the table)' : ' (T14 computed from the star and planet)'}`,
    `thresholds: a check fails when even the 2σ bound most favourable to the claim violates the limit, and is in tension when the median does`,
  ];
  if (analysis) assumptions.push('amplitudes from a sinusoid fit at the best common frequency; the frequency uncertainty and aliasing are not propagated into the amplitude errors');
  if (!signal) assumptions.push('no detectable signal does not exclude a moon: one whose TTV/TDV lie below these errors would look the same (`moonsieve limits` and `budget` give the sensitivity for a given moon)');
  if (claim.table?.reordered) assumptions.push(`the rows of ${claim.table.source} were not in time order: they were sorted by time before the analysis`);
  return {
    claim: claim.name,
    input: analysis ? 'table' : 'amplitudes',
    verdict,
    reasons,
    checks,
    cautions: [...CAUTIONS],
    assumptions,
    system: sys,
    amplitudes,
    tableSignificance,
    amplitudeSignificance,
    implied: imp ? impliedForOutput(imp) : null,
    series: analysis ? analysis.series : null,
  };
}

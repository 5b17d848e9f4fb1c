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
 * fail and graded decisive or non-decisive; (5) the verdict ladder: no
 * signal by the detection rule (signalDetection.ts) → "no_signal" (no moon is
 * inferred); any decisive fail → "implausible"; else any tension →
 * "tension"; else "consistent". Beside every verdict: the moons the data
 * exclude (exclusionMap.ts) and, for a signal, the other explanations ranked
 * (alternatives.ts).
 *
 * Threshold policy: a check fails when even the 2σ bound most favourable to
 * the claim violates the limit, and is in tension when the median does; a
 * non-decisive check (a prior or a tolerance) is at most in tension.
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
import { ICY_DENSITY_KG_M3, ROCKY_DENSITY_KG_M3, dipVisibility } from './moonDipVisibility.js';
import { analyseTable, type TableAnalysis } from './tableSignificance.js';
import { decideSignal, type SignalDecision } from './signalDetection.js';
import { exclusionMap, type ExclusionMap } from './exclusionMap.js';
import { BIC_POSITIVE, rankAlternativesForAmplitudes, rankAlternativesForTable, type Alternative } from './alternatives.js';
import { normalCdf } from '../numeric/normal.js';
import type {
  AmplitudeSignificance,
  CheckGrade,
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
/**
 * Largest moon-to-planet mass ratio a known formation channel makes: giant impacts (Moon/Earth
 * 0.0123; Pluto–Charon 0.12, Canup 2005, Science 307, 546) and capture reach far above the
 * disk-formed ~1e-4 (Canup & Ward 2006). A prior on how moons form, not physics: above it the
 * claim is in tension, never implausible.
 */
export const MASS_RATIO_TENSION = 0.12;
/** Dip significance that the data "would have seen" (the issue's 5σ; common practice, no source). */
export const DIP_DECISIVE_SIGMA = 5;
/** Largest moon eccentricity allowed in the phase tolerance (tidally damped moons; from memory, no source). */
export const MOON_ECCENTRICITY_MAX = 0.1;
/** Plausible bulk densities of a claimed dip's moon, kg/m³: porous icy bodies ~500 to iron 7874 (from memory). */
export const DENSITY_RANGE_KG_M3: readonly [number, number] = [500, 8000];
/** p-value below which the scatter left about the moon model counts as significant (≈ 3.3σ; common practice, no source). */
export const P_SIGNIFICANT = 1e-3;
/** z-score a claimed amplitude must reach to count as a detection (common practice, no source). */
export const AMPLITUDE_SIGMA = 3;

/** Order in which reasons of the same status are listed: the most basic first. */
const CHECK_ORDER: CheckId[] = ['significance', 'stability', 'roche', 'mass-vs-planet', 'barycentre', 'moon-dip', 'precision', 'mass-ratio', 'tidal-survival', 'phase', 'alternatives', 'residual-noise'];

/** Which checks can make a claim implausible (issue 19 item 4). */
const GRADE: Record<CheckId, CheckGrade> = {
  significance: 'decisive',
  stability: 'decisive',
  roche: 'decisive',
  'mass-vs-planet': 'decisive',
  barycentre: 'decisive',
  'moon-dip': 'decisive',
  precision: 'decisive',
  'mass-ratio': 'non-decisive',
  'tidal-survival': 'non-decisive',
  phase: 'non-decisive',
  alternatives: 'non-decisive',
  'residual-noise': 'non-decisive',
};

/** A check as the check functions build it: grade from GRADE, strength 1 by default when not passing. */
type CheckDraft = Omit<VetCheck, 'grade' | 'strength'> & { strength?: number };

function finish(c: CheckDraft): VetCheck {
  const grade = GRADE[c.id];
  // A non-decisive check never fails: a prior or a tolerance is at most a tension.
  const status = grade === 'non-decisive' && c.status === 'fail' ? 'tension' : c.status;
  const strength = c.strength ?? (status === 'fail' || status === 'tension' ? 1 : 0);
  return { id: c.id, title: c.title, status, grade, strength: Number.isFinite(strength) ? strength : 1e300, detail: c.detail, source: c.source };
}

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
  /** Quantiles of the planet's barycentric offset a_PB, m (TTV+TDV only). */
  barycentre: RawQuantileSummary | null;
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
  const bary = new Float64Array(n); // a_PB = a_S M_S/(M_P + M_S) (TTV+TDV only)
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
        bary[i] = (m.separationM * m.massKg) / (mp + m.massKg);
      } else {
        mass[i] = sep[i] = per[i] = bary[i] = NaN;
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
    barycentre: src.mode === 'ttv+tdv' ? quantiles(bary) : null,
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
  dip: 'Mandel & Agol 2002 small-body depth; orbital sampling effect (Heller 2014, ApJ 787, 14); decisive above 5σ for the smallest moon allowed (2σ-lowest mass, densest material)',
  residual: 'χ² goodness of fit (Press et al. 2007, Numerical Recipes §15.1); runs test (Wald & Wolfowitz 1940, Ann. Math. Stat. 11, 147)',
  significance: 'χ² about a linear ephemeris and constant duration (Press et al. 2007, §15.1); periodogram false-alarm probability over the frequencies searched (Baluev 2008, MNRAS 385, 1279); Bonferroni over the tests; ΔBIC (Schwarz 1978) reported only',
  precision: 'Carter et al. 2008, ApJ 689, 499 timing precision at the stated photometric noise; expected white-noise χ² of the claimed rms',
};

function stabilityCheck(imp: ImpliedMoonInternal, sys: SystemSummary, offset: RawQuantileSummary | null): CheckDraft {
  const rp = sys.planetRadiusM;
  const hill = (m: number) => `${sig3(m / sys.hillRadiusM)} R_H`;
  const limits = `prograde limit ${planetRadii(sys.stableProgradeM, rp)} (${hill(sys.stableProgradeM)}), retrograde ${planetRadii(sys.stableRetrogradeM, rp)} (${hill(sys.stableRetrogradeM)})`;
  const base = { id: 'stability' as const, title: 'separation vs stable limits', source: SOURCES.stability };
  if (imp.separationM) {
    const a = imp.separationM;
    const txt = `implied separation ${intervalText(a, (x) => planetRadii(x, rp))} = ${hill(a.median)}; ${limits}`;
    if (a.lo2 > sys.stableRetrogradeM) return { ...base, status: 'fail', strength: a.lo2 / sys.stableRetrogradeM, detail: `even the 2σ-lowest separation lies beyond the retrograde stable limit, so no moon orbit there lasts: ${txt}` };
    if (a.median > sys.stableProgradeM) return { ...base, status: 'tension', strength: a.median / sys.stableProgradeM, detail: `the separation lies beyond the prograde stable limit: only a retrograde moon could be stable there; ${txt}` };
    return { ...base, status: 'pass', detail: `inside the prograde stable limit: ${txt}` };
  }
  if (offset && imp.mode === 'ttv only') {
    const txt = `the planet's barycentric offset alone is a_PB = ${intervalText(offset, (x) => planetRadii(x, rp))}, and a_S > a_PB; ${limits}`;
    if (offset.lo2 > sys.stableRetrogradeM) return { ...base, status: 'fail', strength: offset.lo2 / sys.stableRetrogradeM, detail: `the TTV needs a moon farther out than any stable orbit: ${txt}` };
    if (offset.median > sys.stableProgradeM) return { ...base, status: 'tension', strength: offset.median / sys.stableProgradeM, detail: `the TTV needs a moon beyond the prograde stable limit: ${txt}` };
    return { ...base, status: 'not tested', detail: `TTVs alone do not fix the separation; solutions exist inside the stable band (${txt})` };
  }
  return { ...base, status: 'not tested', detail: `TDVs alone do not fix the separation; ${limits}` };
}

function rocheCheck(imp: ImpliedMoonInternal, sys: SystemSummary): CheckDraft {
  const rp = sys.planetRadiusM;
  const base = { id: 'roche' as const, title: 'separation vs Roche limit', source: SOURCES.roche };
  const limits = `fluid Roche limit ${planetRadii(sys.rocheRockyM, rp)} (rocky) / ${planetRadii(sys.rocheIcyM, rp)} (icy)`;
  if (!imp.separationM) return { ...base, status: 'not tested', detail: `the separation is not fixed by one amplitude; ${limits}` };
  const a = imp.separationM;
  const txt = `implied separation ${intervalText(a, (x) => planetRadii(x, rp))}; ${limits}`;
  if (a.hi2 < sys.rocheRockyM) return { ...base, status: 'fail', strength: sys.rocheRockyM / a.hi2, detail: `even the 2σ-highest separation is inside the Roche limit of a rocky moon: ${txt}` };
  if (a.median < sys.rocheRockyM) return { ...base, status: 'tension', strength: sys.rocheRockyM / a.median, detail: `the separation is inside the Roche limit of a rocky moon: ${txt}` };
  if (a.median < sys.rocheIcyM) return { ...base, status: 'tension', detail: `only a dense (rocky) moon survives there; an icy one would be torn apart: ${txt}` };
  return { ...base, status: 'pass', detail: `outside the Roche limit: ${txt}` };
}

function massRatioCheck(imp: ImpliedMoonInternal): CheckDraft {
  const q = imp.massRatio;
  const base = { id: 'mass-ratio' as const, title: 'moon-to-planet mass ratio', source: SOURCES.massRatio };
  const atLeast = imp.mode === 'ttv+tdv' ? '' : 'at least ';
  const txt = `implied M_S/M_P ${atLeast}${intervalText(q, sig3)} (mass ${atLeast}${intervalText(imp.massKg, earthMasses)}); disk-formed satellites reach ~${REGULAR_SATELLITE_MASS_RATIO}, giant impacts and capture up to ~${MASS_RATIO_TENSION} (Pluto–Charon)`;
  const prior = 'a prior on how moons form, not a physical limit';
  if (q.median > MASS_RATIO_TENSION) return { ...base, status: 'tension', strength: q.median / MASS_RATIO_TENSION, detail: `heavier, relative to its planet, than any known formation channel makes (${prior}): ${txt}` };
  if (q.median > 10 * REGULAR_SATELLITE_MASS_RATIO) return { ...base, status: 'pass', detail: `too heavy for a disk-formed moon, within reach of a giant impact or capture (${prior}): ${txt}` };
  return { ...base, status: 'pass', detail: txt };
}

function massVsPlanetCheck(imp: ImpliedMoonInternal): CheckDraft {
  const q = imp.massRatio;
  const base = { id: 'mass-vs-planet' as const, title: 'moon lighter than its planet', source: 'definition of a satellite: the lighter body of the pair' };
  const atLeast = imp.mode === 'ttv+tdv' ? '' : 'at least ';
  const txt = `implied M_S/M_P ${atLeast}${intervalText(q, sig3)} (moon mass ${atLeast}${intervalText(imp.massKg, earthMasses)})`;
  if (q.lo2 > 1) return { ...base, status: 'fail', strength: q.lo2, detail: `the companion would outweigh its planet even at its 2σ-lowest mass: ${txt}` };
  if (q.median > 1) return { ...base, status: 'tension', strength: q.median, detail: `the companion would likely outweigh its planet: ${txt}` };
  return { ...base, status: 'pass', detail: txt };
}

function barycentreCheck(claim: Claim, imp: ImpliedMoonInternal, sys: SystemSummary, bary: RawQuantileSummary | null): CheckDraft {
  const base = { id: 'barycentre' as const, title: 'barycentre inside the planet', source: 'a_PB = a_S M_S/(M_P + M_S) (Kipping 2009a, MNRAS 392, 181, eq. 2) vs the planet radius' };
  const rp = sys.planetRadiusM;
  if (claim.companion !== 'moon') return { ...base, status: 'not tested', detail: 'the claim is a binary planet: its barycentre may lie outside the planet' };
  if (!bary) return { ...base, status: 'not tested', detail: 'a TDV alone does not fix the barycentric offset' };
  const txt = `the planet's barycentric offset a_PB ${intervalText(bary, (x) => planetRadii(x, rp))} vs its radius 1 Rp`;
  if (bary.lo2 > rp) return { ...base, status: 'fail', strength: bary.lo2 / rp, detail: `the pair would orbit a point outside the planet even at 2σ: a binary planet, not a moon as claimed; ${txt}` };
  if (bary.median > rp) return { ...base, status: 'tension', strength: bary.median / rp, detail: `the pair likely orbits a point outside the planet (a binary planet); ${txt}` };
  return { ...base, status: 'pass', detail: txt };
}

function tidalCheck(imp: ImpliedMoonInternal, sys: SystemSummary): CheckDraft {
  const base = { id: 'tidal-survival' as const, title: 'mass vs tidal survival', source: SOURCES.tidal };
  const m = imp.massKg;
  const txt = `implied mass ${imp.mode === 'ttv+tdv' ? '' : 'at least '}${intervalText(m, earthMasses)}; a prograde moon heavier than ${earthMasses(sys.tidalMaxMassKg)} migrates out of the stable zone within the system age`;
  if (m.lo2 > 100 * sys.tidalMaxMassKg) return { ...base, status: 'fail', detail: `more than 100 times the survival mass even at 2σ, beyond what any plausible planet Q (the limit scales with Q) would allow: ${txt}` };
  if (m.median > sys.tidalMaxMassKg) return { ...base, status: 'tension', detail: `heavier than the tidal-survival mass (a retrograde orbit or a larger planet Q could save it): ${txt}` };
  return { ...base, status: 'pass', detail: txt };
}

function phaseCheckTable(tab: TableSignificance, analysis: TableAnalysis, projSd: number, claim: Claim, sys: SystemSummary, moonPeriodS: number | null): CheckDraft {
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
  // Departure from quadrature and its 1σ (the in-phase part's spread over the TDV amplitude).
  const devRad = Math.abs(Math.PI / 2 - (angleDeg * Math.PI) / 180);
  const sdRad = Math.min(Math.PI / 2, projSd / aD);
  const tol = phaseTolerance(claim, sys, moonPeriodS);
  const z = Math.max(0, devRad - tol.rad) / sdRad;
  const deg = (x: number) => `${sig3((x * 180) / Math.PI)}°`;
  const txt = `phase difference ${sig3(angleDeg)}° (a single moon on a circular orbit transiting centrally: 90°); departure ${deg(devRad)} ± ${deg(sdRad)}; allowed ${deg(tol.rad)} (${tol.text}); ${sig3(z)}σ beyond the allowance`;
  if (z >= 3) return { ...base, status: 'tension', strength: z / 3, detail: `the TDV departs from quadrature with the TTV by more than eccentricity and inclination allow: ${txt}` };
  return { ...base, status: 'pass', detail: txt };
}

/**
 * Allowed departure of the TTV–TDV phase from quadrature, rad. (1) Eccentricity: position and
 * velocity of an orbit of eccentricity e are out of quadrature by up to ~e rad in the fundamental
 * (first order in e; derived here). (2) The transit-impact-parameter TDV of an inclined moon orbit
 * (Kipping 2009b, MNRAS 396, 1797, "TDV-TIP"), in phase with the TTV: the planet's offset across
 * the chord changes b and so the duration, δτ/τ = −b δb/(1 − b²); relative to the velocity TDV
 * (δτ/τ = −δv/v_B) its amplitude is (b/sqrt(1 − b²))·(P_S/(π τ̄))·sin i_S (derived here with
 * τ̄ = 2R*sqrt(1 − b²)/v_B), i_S the moon orbit's tilt out of the planet's orbital plane:
 * up to 90° under the isotropic prior, 0 for the coplanar one.
 */
function phaseTolerance(claim: Claim, sys: SystemSummary, moonPeriodS: number | null): { rad: number; text: string } {
  const b = Math.min(Math.abs(claim.planet.impactParameter), 0.999);
  const sinI = claim.orientation === 'isotropic' ? 1 : 0;
  const ratio = moonPeriodS !== null && Number.isFinite(moonPeriodS) ? (b / Math.sqrt(1 - b * b)) * (moonPeriodS / (Math.PI * sys.durationS)) * sinI : 0;
  const tip = Math.atan(ratio);
  const rad = Math.min(Math.PI / 2, MOON_ECCENTRICITY_MAX + tip);
  return { rad, text: `eccentricity up to ${MOON_ECCENTRICITY_MAX}: ${sig3((MOON_ECCENTRICITY_MAX * 180) / Math.PI)}°; impact-parameter TDV at b = ${sig3(b)}${sinI ? ' for any orbit tilt' : ' for a coplanar orbit'}: ${sig3((tip * 180) / Math.PI)}°` };
}

function phaseCheckClaim(claim: Claim, sys: SystemSummary, moonPeriodS: number | null): CheckDraft {
  const base = { id: 'phase' as const, title: 'TTV–TDV phase relation', source: SOURCES.phase };
  const p = claim.phaseOffset;
  if (!p) return { ...base, status: 'not tested', detail: 'no phase offset was claimed (amplitudes alone carry no phase)' };
  let w = p.valueRad % (2 * Math.PI);
  if (w > Math.PI) w -= 2 * Math.PI;
  if (w < -Math.PI) w += 2 * Math.PI;
  const dev = Math.abs(Math.abs(w) - Math.PI / 2);
  const z = dev / p.errorRad;
  const tol = phaseTolerance(claim, sys, moonPeriodS);
  const zBeyond = Math.max(0, dev - tol.rad) / p.errorRad;
  const txt = `claimed offset ${sig3((p.valueRad * 180) / Math.PI)}° ± ${sig3((p.errorRad * 180) / Math.PI)}° vs ±90° for a single moon: ${sig3(z)}σ away; allowed ${sig3((tol.rad * 180) / Math.PI)}° (${tol.text}), ${sig3(zBeyond)}σ beyond that`;
  if (zBeyond >= 3) return { ...base, status: 'tension', strength: zBeyond / 3, detail: `the TDV departs from quadrature by more than eccentricity and inclination allow: ${txt}` };
  return { ...base, status: 'pass', detail: txt };
}

function dipCheck(claim: Claim, imp: ImpliedMoonInternal, sys: SystemSummary): CheckDraft {
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
  // Decisive only for the smallest dip the claim allows: the 2σ-lowest mass at the densest bulk density.
  const mLow = imp.massKg.lo2;
  const dense = Number.isFinite(mLow) && mLow > 0 ? dipVisibility({ ...common, ...noise, moonMassKg: mLow, densityKgM3: DENSITY_RANGE_KG_M3[1] }) : null;
  if (dense && dense.snrStacked > DIP_DECISIVE_SIGMA) {
    return { ...base, status: 'fail', strength: dense.snrStacked / DIP_DECISIVE_SIGMA, detail: `no dip was reported, yet even the smallest moon the timing allows (2σ-lowest mass ${earthMasses(mLow)}, density ${DENSITY_RANGE_KG_M3[1]} kg/m³) would have shown one at ${sig3(dense.snrStacked)}σ in the folded stack, above ${DIP_DECISIVE_SIGMA}σ; ${txt}` };
  }
  if (rocky.snrStacked > DIP_DECISIVE_SIGMA) return { ...base, status: 'tension', strength: rocky.snrStacked / DIP_DECISIVE_SIGMA, detail: `no dip was reported, yet a rocky moon of the median mass would have shown one above ${DIP_DECISIVE_SIGMA}σ (only a lighter or denser moon escapes): ${txt}` };
  return { ...base, status: 'pass', detail: `its absence is expected: ${txt}` };
}

function residualCheck(tab: TableSignificance): CheckDraft {
  const base = { id: 'residual-noise' as const, title: 'scatter beyond one moon (red noise, systematics)', source: SOURCES.residual };
  const r = tab.residual;
  const runs = tab.runs;
  const txt = `χ² about the moon model ${sig3(r.chiSquare)} for ${r.dof} dof (χ²/dof ${sig3(r.chiSquare / r.dof)}, p = ${sig3(r.pValue)}); ${runs.pValueFewRuns === null ? 'runs test not possible (the TTV residuals are all of one sign or zero)' : `${runs.runs} sign runs in the TTV residuals vs ${sig3(runs.expectedRuns)} expected (p = ${sig3(runs.pValueFewRuns)} for so few)`}`;
  if (r.dof >= 1 && r.pValue < P_SIGNIFICANT) return { ...base, status: 'tension', detail: `one moon does not account for the scatter: red noise, systematics or underestimated errors are needed: ${txt}` };
  if (runs.pValueFewRuns !== null && runs.pValueFewRuns < 0.01) return { ...base, status: 'tension', detail: `neighbouring transits scatter together, as red noise or slow systematics do: ${txt}` };
  return { ...base, status: 'pass', detail: txt };
}

function signalText(d: SignalDecision): string {
  const tests = d.tests.map((t) => `${t.label}: p = ${sig3(t.pValue)}`).join('; ');
  return `${tests}; ${d.tests.length} tests, Bonferroni-adjusted p = ${sig3(d.adjustedPValue)} ${d.detected ? '<' : '≥'} α = ${sig3(d.falseAlarm)}`;
}

function significanceCheckTable(tab: TableSignificance, d: SignalDecision): CheckDraft {
  const base = { id: 'significance' as const, title: 'significance of the timing signal', source: SOURCES.significance };
  const b = tab.bicJoint ?? tab.bicTtv;
  const txt = `${signalText(d)}; ΔBIC ${sig3(b.delta)} for a sinusoid at ${sig3(b.frequencyPerEpoch)} cycles per epoch (reported, not a test: it does not count the frequencies searched)`;
  if (!d.detected) return { ...base, status: 'fail', detail: `the timing is consistent with a linear ephemeris${tab.tdv ? ' and constant duration' : ''} within its stated errors: ${txt}` };
  return { ...base, status: 'pass', detail: txt };
}


function significanceCheckClaim(d: SignalDecision): CheckDraft {
  const base = { id: 'significance' as const, title: 'significance of the claimed amplitudes', source: 'one-sided normal p-value of amplitude/uncertainty per channel, at least 3σ, Bonferroni over the channels (common practice, no source)' };
  if (!d.detected) return { ...base, status: 'fail', detail: `not a detection, so no moon is inferred: ${signalText(d)}` };
  return { ...base, status: 'pass', detail: signalText(d) };
}

/** The detection rule for claimed amplitudes: z = amplitude/uncertainty per channel, p = Φ(−z), Bonferroni over channels; and z ≥ 3. */
function amplitudeDecision(claim: Claim): SignalDecision {
  const tests: SignalDecision['tests'] = [];
  const zs: number[] = [];
  for (const [ch, a] of [['TTV', claim.ttv], ['TDV', claim.tdv]] as const) {
    if (!a) continue;
    const z = a.valueS / a.errorS;
    zs.push(z);
    tests.push({ id: ch === 'TTV' ? 'ttv_amplitude' : 'tdv_amplitude', label: `claimed ${ch} amplitude ${sig3(z)}σ`, pValue: normalCdf(-z) });
  }
  let best = tests[0];
  for (const t of tests) if (t.pValue < best.pValue) best = t;
  const adjustedPValue = Math.min(1, tests.length * best.pValue);
  const detected = adjustedPValue < claim.falseAlarm && Math.max(...zs) >= AMPLITUDE_SIGMA;
  return { falseAlarm: claim.falseAlarm, tests, adjustedPValue, strongest: best.id, detected };
}

function precisionCheck(claim: Claim, sig: AmplitudeSignificance, sys: SystemSummary): CheckDraft {
  const base = { id: 'precision' as const, title: 'claimed amplitudes vs the data precision', source: SOURCES.precision };
  if (!claim.precision) return { ...base, status: 'not tested', detail: 'no photometric precision was stated' };
  if (sig.timingPrecisionS === null) {
    const cadence = claim.cadenceS ?? claim.precision.noiseTimescaleS;
    return { ...base, status: 'not tested', detail: `no per-transit timing precision can be computed at a cadence of ${timeText(cadence)} for a transit of ${timeText(sys.durationS)}` };
  }
  // Each channel judged on its own; the message names only the channel(s) that set the status.
  const toRms = (a: { valueS: number; kind: string }) => (a.kind === 'rms' ? a.valueS : a.valueS / Math.SQRT2);
  const rows: Array<{ text: string; p: number; z: number }> = [];
  if (claim.ttv && sig.expectedTtvPValue !== null) rows.push({ text: `TTV rms ${timeText(toRms(claim.ttv))} vs per-transit mid-time precision ${timeText(sig.timingPrecisionS)}: expected white-noise χ² p = ${sig3(sig.expectedTtvPValue)}`, p: sig.expectedTtvPValue, z: sig.ttvZ ?? 0 });
  if (claim.tdv && sig.expectedTdvPValue !== null && sig.durationPrecisionS !== null) rows.push({ text: `TDV rms ${timeText(toRms(claim.tdv))} vs per-transit duration precision ${timeText(sig.durationPrecisionS)}: expected white-noise χ² p = ${sig3(sig.expectedTdvPValue)}`, p: sig.expectedTdvPValue, z: sig.tdvZ ?? 0 });
  const over = ` over ${claim.transits} transits`;
  // Decisive: on average the claimed amplitude would not even stand out of the noise (expected p > 0.5).
  const cannot = rows.filter((r) => r.z >= AMPLITUDE_SIGMA && r.p > 0.5);
  if (cannot.length > 0) return { ...base, status: 'fail', strength: Math.max(...cannot.map((r) => r.p)) / 0.5, detail: `the stated photometric precision cannot reach the claimed amplitude (it would not stand out of the noise): ${cannot.map((r) => r.text).join('; ')}${over}` };
  const hardly = rows.filter((r) => r.z >= AMPLITUDE_SIGMA && r.p > claim.falseAlarm);
  if (hardly.length > 0) return { ...base, status: 'tension', strength: Math.max(...hardly.map((r) => r.p)) / claim.falseAlarm, detail: `data of the stated precision could hardly have measured this amplitude: ${hardly.map((r) => r.text).join('; ')}${over}` };
  return { ...base, status: 'pass', detail: `${rows.map((r) => r.text).join('; ')}${over}` };
}

export const CAUTIONS: readonly string[] = [
  'Instrumental timing: clock errors, time stamps at the start instead of the middle of an exposure, and mixed time standards (UTC vs TDB, HJD vs BJD) shift transits by up to about a minute (Eastman, Siverd & Gaudi 2010, PASP 122, 935).',
  'Photometric moon TTV: a large, low-density moon blended into a planet-only fit moves the fitted mid-time against the barycentric TTV (Szabó et al. 2006, A&A 450, 395); only the barycentric part is modelled here.',
  'Correlated (red) noise in the light curves makes per-transit errors larger than white-noise estimates (Pont, Zucker & Queloz 2006, MNRAS 373, 231; Carter & Winn 2009, ApJ 704, 51).',
];

/** Verdict and reasons: decisive failures first, then tensions, each group strongest first (ties in CHECK_ORDER). */
function rankChecks(checks: VetCheck[]): { verdict: Verdict; reasons: string[] } {
  const order = (a: VetCheck, b: VetCheck) => b.strength - a.strength || CHECK_ORDER.indexOf(a.id) - CHECK_ORDER.indexOf(b.id);
  const fails = checks.filter((c) => c.status === 'fail').sort(order);
  // A moon heavier than its planet puts the barycentre outside it as a consequence: the cause goes first.
  const heavy = fails.findIndex((c) => c.id === 'mass-vs-planet');
  const bary = fails.findIndex((c) => c.id === 'barycentre');
  if (heavy > bary && bary >= 0) fails.splice(bary, 0, ...fails.splice(heavy, 1));
  const tensions = checks.filter((c) => c.status === 'tension').sort(order);
  const verdict: Verdict = fails.length > 0 ? 'implausible' : tensions.length > 0 ? 'tension' : 'consistent';
  const reasons = [...fails, ...tensions].map((c) => `${c.status === 'fail' ? 'FAIL (decisive)' : `TENSION (${c.grade})`} ${c.title}: ${c.detail}`);
  if (reasons.length === 0) reasons.push('a significant signal, and every physical check that could be made passes');
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



/** The moon checks skipped without a signal (listed as not tested, so the report shows what was not done). */
const NO_SIGNAL_CHECKS: Array<Pick<VetCheck, 'id' | 'title' | 'source'>> = [
  { id: 'stability', title: 'separation vs stable limits', source: SOURCES.stability },
  { id: 'roche', title: 'separation vs Roche limit', source: SOURCES.roche },
  { id: 'mass-ratio', title: 'moon-to-planet mass ratio', source: SOURCES.massRatio },
  { id: 'tidal-survival', title: 'mass vs tidal survival', source: SOURCES.tidal },
  { id: 'phase', title: 'TTV–TDV phase relation', source: SOURCES.phase },
  { id: 'moon-dip', title: "the moon's own dip", source: SOURCES.dip },
];

function noSignalVerdict(checks: VetCheck[], excl: ExclusionMap | null, rp: number): { verdict: Verdict; reasons: string[] } {
  const sig = checks.find((c) => c.id === 'significance')!;
  const reasons = [`NO SIGNAL ${sig.title}: ${sig.detail}`];
  if (excl) {
    const lims = excl.separationM.map((a, j) => ({ a, m: excl.upperLimitKg[j] })).filter((x) => x.m !== null);
    if (lims.length > 0) {
      const best = lims.reduce((b, x) => (x.m! < b.m! ? x : b), lims[0]);
      reasons.push(`EXCLUDED moons heavier than ${earthMasses(best.m!)} at ${planetRadii(best.a, rp)} (95 % of injected moons detected; limits at other separations below)`);
    } else reasons.push('EXCLUDED nothing up to the planet\'s mass: these errors could not detect any moon in the stable band 95 % of the time');
  }
  for (const c of checks) if (c.id !== 'significance' && (c.status === 'tension' || c.status === 'fail')) reasons.push(`${c.status === 'fail' ? 'FAIL' : 'TENSION'} ${c.title}: ${c.detail}`);
  return { verdict: 'no_signal', reasons };
}

function alternativesCheck(alts: Alternative[]): CheckDraft {
  const base = { id: 'alternatives' as const, title: 'other explanations', source: 'BIC = χ² + k ln n (Schwarz 1978, Ann. Stat. 6, 461); |ΔBIC| > 2 "positive" (Kass & Raftery 1995, from memory); alternatives.ts' };
  const withBic = alts.filter((a) => a.bicDelta !== null);
  if (withBic.length === 0) return { ...base, status: 'not tested', detail: `amplitudes alone cannot be fitted by the alternatives; most likely first: ${alts[0].title}` };
  const best = withBic[0];
  const txt = withBic.map((a) => `${a.title}: ΔBIC ${sig3(a.bicDelta!)}`).join('; ');
  if (best.bicDelta! < -BIC_POSITIVE) return { ...base, status: 'tension', strength: -best.bicDelta! / BIC_POSITIVE, detail: `${best.title} fits better than a moon (ΔBIC ${sig3(best.bicDelta!)} < −${BIC_POSITIVE}): ${[...best.favourAlternative].join('; ')}; ${txt}` };
  return { ...base, status: 'pass', detail: `no alternative fits better than a moon (ΔBIC = BIC(alternative) − BIC(moon) > 0 favours the moon): ${txt}` };
}

/** Map size and realizations: about a second on one core (about 0.3 ms per injected table of 13–30 transits). */
export const EXCLUSION_GRID = { separations: 12, masses: 20, realizations: 50 };

/** Tables above this many transits get a coarser map, above MAP_MAX_TRANSITS none (each injection re-runs the periodograms). */
const MAP_COARSE_TRANSITS = 300;
const MAP_MAX_TRANSITS = 2000;

function defaultGrid(transits: number): VetOptions['exclusionGrid'] {
  if (transits > MAP_MAX_TRANSITS) return null;
  return transits > MAP_COARSE_TRANSITS ? { separations: 6, masses: 10, realizations: 30 } : EXCLUSION_GRID;
}

export interface VetOptions {
  /** Size of the exclusion map (default EXCLUSION_GRID); null leaves the map out. */
  exclusionGrid?: { separations: number; masses: number; realizations: number } | null;
}

/** The moons the data exclude; the amplitude form uses N transits and per-transit errors from the precision or the amplitude errors. */
function exclusionFor(claim: Claim, sys: SystemSummary, limits: ReturnType<typeof computeLimits>, grid: VetOptions['exclusionGrid']): ExclusionMap | null {
  if (grid === null || grid === undefined) return null;
  const inner = Math.max(sys.rocheRockyM, sys.planetRadiusM);
  const outer = sys.stableRetrogradeM;
  if (!(outer > inner)) return null;
  let epochs: Float64Array;
  let timeErr: Float64Array;
  let durErr: Float64Array | null;
  if (claim.table) {
    epochs = claim.table.epochs;
    timeErr = claim.table.timeErrS;
    durErr = claim.table.durationErrS;
  } else {
    const n = claim.transits;
    if (n < 4) return null;
    epochs = Float64Array.from({ length: n }, (_, i) => i);
    // Per-transit error σ from an rms amplitude's uncertainty: σ_rms ≈ σ/√N for N white-noise
    // points about a least-squares sinusoid (derived here); or Carter et al. 2008 from the precision.
    const fromClaim = (a: Claim['ttv']) => (a ? a.errorS * (a.kind === 'rms' ? 1 : Math.SQRT1_2) * Math.sqrt(n) : NaN);
    const tPrec = claim.precision && limits.timing_precision_s > 0 && Number.isFinite(limits.timing_precision_s) ? limits.timing_precision_s : fromClaim(claim.ttv);
    const dPrec = claim.precision && limits.duration_precision_s > 0 && Number.isFinite(limits.duration_precision_s) ? limits.duration_precision_s : fromClaim(claim.tdv);
    // A channel neither claimed nor computable from the precision is left out (as if not measured).
    if (!(tPrec > 0)) return null;
    timeErr = new Float64Array(n).fill(tPrec);
    durErr = claim.tdv && dPrec > 0 ? new Float64Array(n).fill(dPrec) : null;
  }
  return exclusionMap({
    epochs, timeErrS: timeErr, durationErrS: durErr,
    planetPeriodS: claim.planet.periodS, planetMassKg: sys.planetMassKg, planetRadiusM: sys.planetRadiusM,
    barycentreVelocityMS: sys.barycentreVelocityMS, durationS: sys.durationS,
    separationMinM: inner, separationMaxM: outer, falseAlarm: claim.falseAlarm, orientation: claim.orientation, seed: claim.seed,
    ...grid,
  });
}

/** Vet a claimed moon signal (see the file header). Pure: the same claim and seed give the same result. */
export function vetClaim(claim: Claim, options: VetOptions = {}): VetResult {
  const analysis = claim.table ? analyseTable(claim.table) : null;
  const { sys, limits } = systemSummary(claim, claim.durationS ?? analysis?.meanDurationS ?? null);
  const src = analysis ? amplitudeSourceFromTable(analysis) : amplitudeSourceFromClaim(claim);
  // The detection rule (signalDetection.ts); without a signal there is nothing to explain, so no
  // implied moon and no physical checks.
  const decision = claim.table
    ? decideSignal({ epochs: claim.table.epochs, timeS: claim.table.timeS, timeErrS: claim.table.timeErrS, durationS: claim.table.durationS, durationErrS: claim.table.durationErrS }, claim.falseAlarm)
    : amplitudeDecision(claim);
  const signal = decision.detected;
  const mc = signal ? runMonteCarlo(claim, src, sys) : null;
  const imp = mc ? mc.implied : null;

  let tableSignificance: TableSignificance | null = null;
  let amplitudeSignificance: AmplitudeSignificance | null = null;
  const drafts: CheckDraft[] = [];
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
    drafts.push(significanceCheckTable(tableSignificance, decision));
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
    drafts.push(significanceCheckClaim(decision));
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
  let alternatives: Alternative[] | null = null;
  if (imp && mc) {
    const moonPeriod = imp.moonPeriodS ? imp.moonPeriodS.median : null;
    drafts.push(stabilityCheck(imp, sys, offset));
    drafts.push(rocheCheck(imp, sys));
    drafts.push(massVsPlanetCheck(imp));
    drafts.push(barycentreCheck(claim, imp, sys, mc.barycentre ?? offset));
    drafts.push(massRatioCheck(imp));
    drafts.push(tidalCheck(imp, sys));
    drafts.push(analysis && tableSignificance ? phaseCheckTable(tableSignificance, analysis, mc.phaseProjectionSd, claim, sys, moonPeriod) : phaseCheckClaim(claim, sys, moonPeriod));
    drafts.push(dipCheck(claim, imp, sys));
    alternatives = analysis ? rankAlternativesForTable(analysis) : rankAlternativesForAmplitudes(amplitudeSignificance?.ttvZ ?? null, amplitudeSignificance?.tdvZ ?? null);
    drafts.push(alternativesCheck(alternatives));
  } else {
    drafts.push(...NO_SIGNAL_CHECKS.map((c) => ({ ...c, status: 'not tested' as const, detail: 'no detectable signal, so no moon to test' })));
  }
  if (tableSignificance) drafts.push(residualCheck(tableSignificance));
  if (amplitudeSignificance) drafts.push(precisionCheck(claim, amplitudeSignificance, sys));
  const checks = drafts.map(finish);
  const exclusion = exclusionFor(claim, sys, limits, options.exclusionGrid === undefined ? defaultGrid(claim.transits) : options.exclusionGrid);

  const { verdict, reasons } = signal ? rankChecks(checks) : noSignalVerdict(checks, exclusion, sys.planetRadiusM);
  const assumptions = [
    'circular moon orbit (tidally damped) in the inversion and the injections; the TDV is the velocity part only: the transit-impact-parameter part of inclined orbits (Kipping 2009b) and eccentricity enter only as the tolerance of the phase check',
    claim.orientation === 'isotropic'
      ? 'orbit orientation unknown: isotropic orbit normal in the Monte Carlo (the coplanar mass is the minimum)'
      : 'coplanar moon orbit assumed (the minimum mass)',
    `nested two-body orbits; planet mass ${earthMasses(claim.planet.massKg)} taken as exact; τ̄ = ${timeText(sys.durationS)}${claim.durationS ? ' (given)' : analysis?.meanDurationS ? ' (mean of the table)' : ' (T14 computed from the star and planet)'}`,
    `thresholds: a check fails when even the 2σ bound most favourable to the claim violates the limit, and is in tension when the median does; only decisive checks (stable limit, Roche limit, moon lighter than the planet, barycentre inside it, the moon's dip, timing precision) can make a claim implausible; reasons are ordered by how far the claim lies past each limit`,
    `signal detection at false-alarm level α = ${claim.falseAlarm}: ${claim.table ? 'χ² about a linear ephemeris (and constant duration) and the periodograms\' false-alarm probabilities over every frequency searched (Baluev 2008)' : 'the claimed amplitudes\' z-scores'}, Bonferroni over the tests; white Gaussian noise with the stated errors`,
  ];
  if (!exclusion && options.exclusionGrid === undefined && claim.transits > MAP_MAX_TRANSITS) assumptions.push(`no exclusion map for more than ${MAP_MAX_TRANSITS} transits: its injections would take minutes`);
  if (exclusion) assumptions.push(`excluded region: ${exclusion.realizations} injected moons per cell (circular orbits, ${claim.orientation} orientation, random phase) into ${claim.table ? "the table's epochs and errors" : 'the claimed number of transits with errors from the stated precision or the amplitude uncertainties'}; the same detection rule; excluded where ≥ ${exclusion.level * 100} % are detected${signal ? '; with a signal present this is the sensitivity of the errors, not a limit on the moon that makes the signal' : ''}`);
  if (analysis) assumptions.push('amplitudes from a sinusoid fit at the best common frequency; the frequency uncertainty and aliasing are not propagated into the amplitude errors');
  if (!signal) assumptions.push('no signal does not exclude every moon: one whose TTV/TDV lie below these errors would look the same; the excluded region says which moons it does exclude');
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
    signal: decision,
    exclusion,
    alternatives,
  };
}

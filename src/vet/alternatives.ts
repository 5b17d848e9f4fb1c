/**
 * Other explanations of a timing signal, ranked by how well they fit the
 * table against the moon model (a common-frequency sinusoid in TTV and TDV,
 * Kipping 2009a, MNRAS 392, 181), by BIC = −2 ln L + k ln n (Schwarz 1978,
 * Ann. Stat. 6, 461; −2 ln L = χ² up to a constant for the stated errors):
 *
 * - a perturbing planet near a j:j−1 mean-motion resonance: TTV a sinusoid of
 *   the super-period P_sup = 1/|j/P′ − (j−1)/P| (Lithwick, Xie & Wu 2012, ApJ
 *   761, 122, eqs. 5–8), sampled at the transits at ν = P/P_sup = (j−1)|Δ| cycles
 *   per epoch for a normalised distance Δ from resonance (derived here from
 *   their eq. 5); "near" resonance |Δ| ≲ 0.05 with j ≤ 5 gives ν ≤ 0.2. Planet–planet
 *   TDVs are small (they need mutual inclinations; Kipping 2009a §6 from
 *   memory), so the model is a sinusoid with ν ≤ 0.2 in TTV and a constant duration;
 * - stellar activity (spot crossings and unocculted spots distort the transit:
 *   e.g. Oshagh et al. 2013, A&A 556, A19, from memory): incoherent extra
 *   scatter, modelled as a jitter s added in quadrature to each channel's
 *   errors (−2 ln L = Σ r²/(σ²+s²) + ln(1 + s²/σ²)), about the line and mean;
 * - a distant companion star's light-travel time (Irwin 1952, ApJ 116, 211):
 *   over a baseline much shorter than its orbit, a slow quadratic drift of the
 *   mid-times, constant duration.
 * Parameters k: moon 8 with durations (line 2, mean duration 1, ν, two
 * amplitudes per channel) or 5 without; perturber 6 / 5; activity 5 / 3;
 * companion 4 / 3. ΔBIC = BIC(alternative) − BIC(moon): positive favours the moon.
 */
import { invertSymmetricPositive } from '../numeric/linearAlgebra.js';
import { goldenSectionMaximum } from '../numeric/goldenSection.js';
import { sig3 } from './describe.js';
import { fitSinusoidAt, type SinusoidFit, type TimingSeriesData } from './sinusoidFit.js';
import type { TableAnalysis } from './tableSignificance.js';
import type { Alternative, AlternativeId } from './vetTypes.js';

/** Highest sampled frequency of a near-resonant perturber's TTV, cycles per epoch (file header). */
export const RESONANT_MAX_FREQUENCY = 0.2;
/** |ΔBIC| above which one model is "positively" favoured (Kass & Raftery 1995, JASA 90, 773, from memory). */
export const BIC_POSITIVE = 2;

export type { Alternative, AlternativeId } from './vetTypes.js';

const SOURCES: Record<AlternativeId, string> = {
  perturbing_planet: 'Lithwick, Xie & Wu 2012, ApJ 761, 122 (near-resonant TTV: super-period sinusoid)',
  stellar_activity: 'Oshagh et al. 2013, A&A 556, A19 (spot-induced timing and duration shifts; from memory)',
  companion_star: 'Irwin 1952, ApJ 116, 211 (light-travel time across a binary orbit)',
};

/** Weighted quadratic ephemeris fit χ² (t = c0 + c1 e + c2 e², e centred; Press et al. 2007, §15.4). */
function quadraticChiSquare(epochs: Float64Array, values: Float64Array, errors: Float64Array): number {
  const n = epochs.length;
  let eBar = 0;
  for (let i = 0; i < n; i++) eBar += epochs[i];
  eBar /= n;
  let span = 0;
  for (let i = 0; i < n; i++) span = Math.max(span, Math.abs(epochs[i] - eBar));
  span = span || 1;
  const ata = new Float64Array(9);
  const atb = new Float64Array(3);
  for (let i = 0; i < n; i++) {
    const x = (epochs[i] - eBar) / span;
    const col = [1, x, x * x];
    const w = 1 / (errors[i] * errors[i]);
    for (let j = 0; j < 3; j++) {
      atb[j] += w * col[j] * values[i];
      for (let k = 0; k < 3; k++) ata[j * 3 + k] += w * col[j] * col[k];
    }
  }
  const inv = new Float64Array(9);
  if (!invertSymmetricPositive(ata, 3, inv)) return NaN;
  const c = [0, 1, 2].map((j) => inv[j * 3] * atb[0] + inv[j * 3 + 1] * atb[1] + inv[j * 3 + 2] * atb[2]);
  let chi = 0;
  for (let i = 0; i < n; i++) {
    const x = (epochs[i] - eBar) / span;
    const z = (values[i] - c[0] - c[1] * x - c[2] * x * x) / errors[i];
    chi += z * z;
  }
  return chi;
}

/** −2 ln L (up to the no-jitter constant) of residuals r with errors σ and the best jitter s ≥ 0. */
function jitterLikelihood(r: Float64Array, err: Float64Array): { m2lnL: number; jitterS: number } {
  const f = (s: number) => {
    let t = 0;
    for (let i = 0; i < r.length; i++) {
      const v = err[i] * err[i] + s * s;
      t += (r[i] * r[i]) / v + Math.log(v / (err[i] * err[i]));
    }
    return t;
  };
  let hi = 0;
  for (let i = 0; i < r.length; i++) hi = Math.max(hi, Math.abs(r[i]));
  const best = goldenSectionMaximum({ valueAt: (s: number) => -f(s) }, 0, 2 * hi + 1e-9, 1e-6 * (hi + 1e-9));
  const s = f(0) <= -best.value ? 0 : best.x;
  return { m2lnL: f(s), jitterS: s };
}

/** Weighted Pearson correlation of two residual series and its two-sided p-value (Fisher's z, large-N; from memory). */
function correlation(a: Float64Array, ea: Float64Array, b: Float64Array, eb: Float64Array): { r: number; z: number } {
  const n = a.length;
  let sa = 0, sb = 0, saa = 0, sbb = 0, sab = 0;
  for (let i = 0; i < n; i++) {
    const x = a[i] / ea[i];
    const y = b[i] / eb[i];
    sa += x; sb += y; saa += x * x; sbb += y * y; sab += x * y;
  }
  const cov = sab / n - (sa / n) * (sb / n);
  const r = cov / Math.sqrt(Math.max(1e-300, (saa / n - (sa / n) ** 2) * (sbb / n - (sb / n) ** 2)));
  const z = n > 3 ? Math.atanh(Math.max(-0.999999, Math.min(0.999999, r))) * Math.sqrt(n - 3) : 0;
  return { r, z };
}

function bestLowFrequencyFit(s: TimingSeriesData, maxNu: number): SinusoidFit {
  let eMin = Infinity, eMax = -Infinity;
  for (const e of s.epochs) { eMin = Math.min(eMin, e); eMax = Math.max(eMax, e); }
  const span = Math.max(1, eMax - eMin);
  const count = Math.min(4000, Math.max(4, Math.ceil(10 * span * maxNu)));
  let best: SinusoidFit | null = null;
  for (let k = 1; k <= count; k++) {
    const f = fitSinusoidAt(s, (k * maxNu) / count);
    if (!best || f.chiSquare < best.chiSquare) best = f;
  }
  return best!;
}

/** Rank the alternatives for a table with a signal (file header); most competitive first. */
export function rankAlternativesForTable(a: TableAnalysis): Alternative[] {
  const s = a.series;
  const epochs = Float64Array.from(s.epochs);
  const ttv = Float64Array.from(s.ttvS);
  const ttvErr = Float64Array.from(s.ttvErrS);
  const hasTdv = s.tdvS !== null && s.tdvErrS !== null && a.tdvFit !== null;
  const tdv = hasTdv ? Float64Array.from(s.tdvS!) : null;
  const tdvErr = hasTdv ? Float64Array.from(s.tdvErrS!) : null;
  const points = hasTdv ? 2 * epochs.length : epochs.length;
  const lnN = Math.log(points);
  const sig = a.significance;
  const chiTtvLine = sig.ttv.chiSquare;
  const chiTdvConst = sig.tdv ? sig.tdv.chiSquare : 0;
  const chiMoon = a.ttvFit.chiSquare + (a.tdvFit ? a.tdvFit.chiSquare : 0);
  const bicMoon = chiMoon + (hasTdv ? 8 : 5) * lnN;
  const nu = sig.frequencyPerEpoch;
  const zT = sig.ttvSemiAmplitudeS / sig.ttvSemiAmplitudeErrS;
  const zD = sig.tdvSemiAmplitudeS !== null && sig.tdvSemiAmplitudeErrS ? sig.tdvSemiAmplitudeS / sig.tdvSemiAmplitudeErrS : null;
  // In-phase part of the TDV (a perturber's TDV, if any, follows the TTV; a moon's is in quadrature).
  let quadrature: { angleDeg: number } | null = null;
  if (a.tdvFit) {
    const t = a.ttvFit, d = a.tdvFit;
    const cos = (t.cosAmplitude * d.cosAmplitude + t.sinAmplitude * d.sinAmplitude) / (Math.hypot(t.cosAmplitude, t.sinAmplitude) * Math.hypot(d.cosAmplitude, d.sinAmplitude));
    quadrature = { angleDeg: (Math.acos(Math.max(-1, Math.min(1, cos))) * 180) / Math.PI };
  }
  const out: Alternative[] = [];

  // Perturbing planet near resonance.
  const pert = bestLowFrequencyFit({ epochs, values: ttv, errors: ttvErr, base: 'line' }, RESONANT_MAX_FREQUENCY);
  const bicPert = pert.chiSquare + chiTdvConst + (hasTdv ? 6 : 5) * lnN;
  const pM: string[] = [];
  const pA: string[] = [];
  if (nu > RESONANT_MAX_FREQUENCY) pM.push(`the signal is at ${sig3(nu)} cycles/epoch, faster than the ≤ ${RESONANT_MAX_FREQUENCY} a near-resonant super-period gives (ν = (j−1)|Δ|)`);
  else pA.push(`the signal's ${sig3(nu)} cycles/epoch (super-period ${sig3(1 / nu)} transits) fits a perturber near resonance`);
  if (zD !== null && zD >= 3) pM.push(`a TDV of ${sig3(zD)}σ at the TTV's frequency${quadrature ? `, ${sig3(quadrature.angleDeg)}° from the TTV (a moon: 90°)` : ''}; a perturbing planet makes little TDV`);
  else if (zD !== null) pA.push(`no significant TDV at the TTV's frequency (${sig3(zD)}σ), as for a perturbing planet`);
  else pA.push('no durations: the TDV that would tell a moon from a perturber is missing');
  out.push({
    id: 'perturbing_planet', title: 'a perturbing planet near a mean-motion resonance', bicDelta: bicPert - bicMoon, favourMoon: pM, favourAlternative: pA,
    test: 'search the light curves for a second transiting planet near a period ratio j/(j−1); a perturber\'s TTV keeps its super-period over a longer baseline and its amplitude follows its mass, with at most small, in-phase TDVs',
    source: SOURCES.perturbing_planet,
  });

  // Stellar activity.
  const jt = jitterLikelihood(ttv, ttvErr);
  let m2 = jt.m2lnL;
  let corrText = '';
  let corr: { r: number; z: number } | null = null;
  if (tdv && tdvErr) {
    const jd = jitterLikelihood(tdv, tdvErr);
    m2 += jd.m2lnL;
    corr = correlation(ttv, ttvErr, tdv, tdvErr);
    corrText = `TTV–TDV residual correlation r = ${sig3(corr.r)} (${sig3(Math.abs(corr.z))}σ)`;
  }
  const bicAct = m2 + (hasTdv ? 5 : 3) * lnN;
  const aM: string[] = [];
  const aA: string[] = [];
  const fap = sig.periodogramTtv.falseAlarmProbability;
  if (fap < 0.01) aM.push(`the TTV is a coherent sinusoid (periodogram false-alarm probability ${sig3(fap)}), not incoherent scatter`);
  else aA.push(`the TTV periodogram peak is weak (false-alarm probability ${sig3(fap)}): incoherent scatter fits as well`);
  if (sig.residual.dof >= 1 && sig.residual.pValue > 0.01) aM.push(`one sinusoid leaves no excess scatter (χ² ${sig3(sig.residual.chiSquare)} for ${sig.residual.dof} dof)`);
  if (corr && Math.abs(corr.z) >= 3) aA.push(`${corrText}: spots shift mid-time and duration together; a moon's are in quadrature and uncorrelated`);
  else if (corr) aM.push(`${corrText}: no sign of the correlated shifts spot crossings make`);
  out.push({
    id: 'stellar_activity', title: 'stellar activity and spot crossings', bicDelta: bicAct - bicMoon, favourMoon: aM, favourAlternative: aA,
    test: 'measure each transit\'s depth (spots change it with the timing), look for spot-crossing bumps in the transits, time the transits in two colours (spot effects are chromatic, a moon\'s are not), and compare the TTV period with the star\'s rotation period',
    source: SOURCES.stellar_activity,
  });

  // Companion star light-travel time.
  const chiQuad = quadraticChiSquare(epochs, ttv, ttvErr);
  const bicComp = chiQuad + chiTdvConst + (hasTdv ? 4 : 3) * lnN;
  const cM: string[] = [];
  const cA: string[] = [];
  const dQuad = chiTtvLine - chiQuad;
  const dSin = chiTtvLine - a.ttvFit.chiSquare;
  if (dSin > dQuad + 10) cM.push(`a sinusoid removes ${sig3(dSin)} of the TTV χ², a quadratic drift only ${sig3(dQuad)}: the timing turns back faster than a companion star's orbit would`);
  else cA.push(`a quadratic drift removes ${sig3(dQuad)} of the TTV χ² (a sinusoid ${sig3(dSin)})`);
  if (zD !== null && zD >= 3) cM.push(`a TDV of ${sig3(zD)}σ: light-travel time moves the transits but does not change their duration`);
  out.push({
    id: 'companion_star', title: "a distant companion star's light-travel time", bicDelta: bicComp - bicMoon, favourMoon: cM, favourAlternative: cA,
    test: 'extend the baseline (a light-travel-time orbit lasts years to decades), and look for the companion with radial velocities or high-resolution imaging',
    source: SOURCES.companion_star,
  });
  void zT;
  out.sort((x, y) => (x.bicDelta ?? 0) - (y.bicDelta ?? 0));
  return out;
}

/** The alternatives for a claim of amplitudes only: features, no fit (ranked: perturber first unless a TDV ≥ 3σ is claimed). */
export function rankAlternativesForAmplitudes(ttvZ: number | null, tdvZ: number | null): Alternative[] {
  const strongTdv = tdvZ !== null && tdvZ >= 3;
  const pert: Alternative = {
    id: 'perturbing_planet', title: 'a perturbing planet near a mean-motion resonance', bicDelta: null,
    favourMoon: strongTdv ? [`a TDV claimed at ${sig3(tdvZ!)}σ; a perturbing planet makes little TDV`] : [],
    favourAlternative: strongTdv ? [] : [tdvZ === null ? 'no TDV claimed: a TTV alone cannot tell a moon from a perturber' : `the claimed TDV is only ${sig3(tdvZ)}σ`],
    test: 'give the table of transit times: the frequency of the TTV (a perturber\'s super-period is long) and the TTV–TDV phase tell them apart',
    source: SOURCES.perturbing_planet,
  };
  const act: Alternative = {
    id: 'stellar_activity', title: 'stellar activity and spot crossings', bicDelta: null, favourMoon: [],
    favourAlternative: ['amplitudes alone cannot show whether the variation is coherent'],
    test: 'give the table of transit times (coherence, TTV–TDV correlation) and per-transit depths; time the transits in two colours',
    source: SOURCES.stellar_activity,
  };
  const comp: Alternative = {
    id: 'companion_star', title: "a distant companion star's light-travel time", bicDelta: null,
    favourMoon: strongTdv ? ['a claimed TDV: light-travel time does not change durations'] : [],
    favourAlternative: [], test: 'give the table of transit times: a slow quadratic drift would show', source: SOURCES.companion_star,
  };
  void ttvZ;
  return [pert, act, comp];
}

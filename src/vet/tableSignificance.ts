/**
 * Significance of the timing signal in a table of transit times (and
 * durations): χ² of the TTVs about a linear ephemeris and of the durations
 * about their mean, with p-values (chiSquareStatistics.ts); the BIC of the
 * no-moon model against the same plus a sinusoid at the best frequency,
 * BIC = χ² + k ln N (Schwarz 1978, Ann. Stat. 6, 461), with k = 2 (ephemeris)
 * vs 5 (ephemeris + a, b, ν) for the TTVs, 1 vs 4 for the durations and
 * 3 vs 8 jointly (one ν shared, Kipping 2009a); generalised Lomb–Scargle
 * periodograms with the Baluev (2008) false-alarm probability
 * (fastPeriodogram.ts: lombScargle.ts's grid and peak, with FFT sums); the χ² left about the moon model, and a runs test of its
 * TTV residuals (runsTest.ts).
 */
import { jointTimingExcess, tdvExcess, ttvExcess } from '../timing/chiSquareStatistics.js';
import { chiSquareSurvival } from '../numeric/noncentralChiSquare.js';
import type { TimingTable } from './claimTypes.js';
import { fastPeriodogram } from './fastPeriodogram.js';
import { runsTest } from './runsTest.js';
import { bestCommonFrequency, fitSinusoidAt, type SinusoidFit, type TimingSeriesData } from './sinusoidFit.js';
import type { BicComparison, ChiSquareSummary, PeriodogramSummary, TableSignificance, TimingSeriesSummary } from './vetTypes.js';

export interface TableAnalysis {
  significance: Omit<TableSignificance, 'aliasFamily'>;
  ttvFit: SinusoidFit;
  tdvFit: SinusoidFit | null;
  series: TimingSeriesSummary;
  /** Weighted mean duration, s (null without durations). */
  meanDurationS: number | null;
}

function bic(chiNoMoon: number, chiMoon: number, points: number, kNoMoon: number, kMoon: number, nu: number): BicComparison {
  const lnN = Math.log(points);
  const bicNoMoon = chiNoMoon + kNoMoon * lnN;
  const bicMoon = chiMoon + kMoon * lnN;
  return { points, kNoMoon, kMoon, bicNoMoon, bicMoon, delta: bicNoMoon - bicMoon, frequencyPerEpoch: nu };
}

function periodogramSummary(epochs: Float64Array, values: Float64Array, errors: Float64Array, baseParameters: number): PeriodogramSummary {
  const p = fastPeriodogram(epochs, values, errors, 10, baseParameters);
  return {
    frequency: Array.from(p.frequency),
    power: Array.from(p.power),
    peakFrequencyPerEpoch: p.peakFrequency,
    peakPower: p.peakPower,
    falseAlarmProbability: p.falseAlarmProbability,
  };
}

const summary = (c: { chiSquare: number; dof: number; pValue: number }): ChiSquareSummary => ({ chiSquare: c.chiSquare, dof: c.dof, pValue: c.pValue });

/** 1σ of the semi-amplitude sqrt(a² + b²) by linear propagation of the (a, b) covariance. */
function semiAmplitudeError(f: SinusoidFit): number {
  const [caa, cab, cbb] = f.covariance;
  const a = f.cosAmplitude;
  const b = f.sinAmplitude;
  const amp = Math.hypot(a, b);
  if (!(amp > 0)) return Math.sqrt(Math.max(caa, cbb));
  return Math.sqrt(Math.max(0, (a * a * caa + 2 * a * b * cab + b * b * cbb) / (amp * amp)));
}

export function analyseTable(table: TimingTable): TableAnalysis {
  const { epochs, timeS, timeErrS } = table;
  const n = epochs.length;
  const ttvResid = new Float64Array(n);
  const ttv = ttvExcess(epochs, timeS, timeErrS, ttvResid);
  const ttvSeries: TimingSeriesData = { epochs, values: ttvResid, errors: timeErrS, base: 'line' };
  const nuTtv = bestCommonFrequency([ttvSeries]);
  const ttvAlone = fitSinusoidAt(ttvSeries, nuTtv);
  const bicTtv = bic(ttv.chiSquare, ttvAlone.chiSquare, n, 2, 5, nuTtv);
  const periodogramTtv = periodogramSummary(epochs, ttvResid, timeErrS, 2);

  let tdvSummary: ChiSquareSummary | null = null;
  let jointSummary: ChiSquareSummary | null = null;
  let bicTdv: BicComparison | null = null;
  let bicJoint: BicComparison | null = null;
  let periodogramTdv: PeriodogramSummary | null = null;
  let tdvSeries: TimingSeriesData | null = null;
  let meanDurationS: number | null = null;
  let nu = nuTtv;
  let ttvFit = ttvAlone;
  let tdvFit: SinusoidFit | null = null;
  if (table.durationS && table.durationErrS) {
    const tdvResid = new Float64Array(n);
    const tdv = tdvExcess(epochs, table.durationS, table.durationErrS, tdvResid);
    meanDurationS = tdv.meanDuration;
    tdvSummary = summary(tdv);
    jointSummary = summary(jointTimingExcess(ttv, tdv));
    tdvSeries = { epochs, values: tdvResid, errors: table.durationErrS, base: 'const' };
    const nuTdv = bestCommonFrequency([tdvSeries]);
    bicTdv = bic(tdv.chiSquare, fitSinusoidAt(tdvSeries, nuTdv).chiSquare, n, 1, 4, nuTdv);
    nu = bestCommonFrequency([ttvSeries, tdvSeries]);
    ttvFit = fitSinusoidAt(ttvSeries, nu);
    tdvFit = fitSinusoidAt(tdvSeries, nu);
    bicJoint = bic(ttv.chiSquare + tdv.chiSquare, ttvFit.chiSquare + tdvFit.chiSquare, 2 * n, 3, 8, nu);
    periodogramTdv = periodogramSummary(epochs, tdvResid, table.durationErrS, 1);
  }
  const residualChi = ttvFit.chiSquare + (tdvFit ? tdvFit.chiSquare : 0);
  const residualDof = tdvFit ? 2 * n - 8 : n - 5;
  const normalised = new Float64Array(n);
  for (let i = 0; i < n; i++) normalised[i] = (ttvResid[i] - ttvFit.model[i]) / timeErrS[i];

  return {
    significance: {
      transits: n,
      ttv: summary(ttv),
      tdv: tdvSummary,
      joint: jointSummary,
      bicTtv,
      bicTdv,
      bicJoint,
      periodogramTtv,
      periodogramTdv,
      frequencyPerEpoch: nu,
      ttvSemiAmplitudeS: Math.hypot(ttvFit.cosAmplitude, ttvFit.sinAmplitude),
      ttvSemiAmplitudeErrS: semiAmplitudeError(ttvFit),
      tdvSemiAmplitudeS: tdvFit ? Math.hypot(tdvFit.cosAmplitude, tdvFit.sinAmplitude) : null,
      tdvSemiAmplitudeErrS: tdvFit ? semiAmplitudeError(tdvFit) : null,
      residual: { chiSquare: residualChi, dof: residualDof, pValue: residualDof >= 1 ? chiSquareSurvival(residualChi, residualDof) : NaN },
      runs: runsTest(normalised),
    },
    ttvFit,
    tdvFit,
    meanDurationS,
    series: {
      epochs: Array.from(epochs),
      ttvS: Array.from(ttvResid),
      ttvErrS: Array.from(timeErrS),
      ttvModelS: Array.from(ttvFit.model),
      tdvS: tdvSeries ? Array.from(tdvSeries.values) : null,
      tdvErrS: tdvSeries ? Array.from(tdvSeries.errors) : null,
      tdvModelS: tdvFit ? Array.from(tdvFit.model) : null,
      sinusoid: { frequencyPerEpoch: nu, ttvCosS: ttvFit.cosAmplitude, ttvSinS: ttvFit.sinAmplitude, tdvCosS: tdvFit ? tdvFit.cosAmplitude : null, tdvSinS: tdvFit ? tdvFit.sinAmplitude : null },
    },
  };
}

/**
 * The `vet --json` document: the `VetResult` in the project's vocabulary
 * (docs/vocabulary.md): snake_case keys, SI with unit suffixes, plain
 * fractions for dimensionless values. The vetting keeps its own camelCase
 * fields inside; this is the one place that names them for the outside.
 */
import type { RunsTest } from './runsTest.js';
import type { SignalDecision, SignalTestId } from './signalDetection.js';
import type { ExclusionMap } from './exclusionMap.js';
import type { Alternative, AlternativeId } from './alternatives.js';
import type {
  AmplitudeSignificance, BicComparison, ChiSquareSummary, CheckGrade, CheckId, CheckStatus, ImpliedMoonSummary, PeriodogramSummary,
  QuantileSummary, SystemSummary, TableSignificance, TimingSeriesSummary, Verdict, VetResult,
} from './vetTypes.js';

export const VET_SCHEMA = 'moonsieve/vet/2';

export interface QuantilesJson {
  median: number | null;
  lo_1sigma: number | null;
  hi_1sigma: number | null;
  lo_2sigma: number | null;
  hi_2sigma: number | null;
}

export interface ChiSquareJson {
  chi_square: number;
  dof: number;
  p_value: number;
}

export interface BicJson {
  points: number;
  parameters_no_moon: number;
  parameters_moon: number;
  bic_no_moon: number;
  bic_moon: number;
  bic_delta: number;
  frequency_per_epoch: number;
}

export interface PeriodogramJson {
  frequency_per_epoch: number[];
  power: number[];
  peak_frequency_per_epoch: number;
  peak_power: number;
  peak_false_alarm: number;
}

export interface RunsTestJson {
  runs: number;
  expected_runs: number;
  z: number | null;
  p_value_few_runs: number | null;
}

export interface TableSignificanceJson {
  transits: number;
  ttv: ChiSquareJson;
  tdv: ChiSquareJson | null;
  joint: ChiSquareJson | null;
  bic_ttv: BicJson;
  bic_tdv: BicJson | null;
  bic_joint: BicJson | null;
  periodogram_ttv: PeriodogramJson;
  periodogram_tdv: PeriodogramJson | null;
  frequency_per_epoch: number;
  ttv_semi_amplitude_s: number;
  ttv_semi_amplitude_err_s: number;
  tdv_semi_amplitude_s: number | null;
  tdv_semi_amplitude_err_s: number | null;
  residual: ChiSquareJson;
  runs: RunsTestJson;
  alias_family: { count: number; min_period_ratio: number; max_period_ratio: number; moon_periods_s: number[]; nearest_to_implied_s: number | null };
}

export interface AmplitudeSignificanceJson {
  ttv_z: number | null;
  tdv_z: number | null;
  timing_precision_s: number | null;
  duration_precision_s: number | null;
  expected_ttv_p_value: number | null;
  expected_tdv_p_value: number | null;
}

export interface ImpliedMoonJson {
  mode: 'ttv+tdv' | 'ttv only' | 'tdv only';
  orientation: 'isotropic' | 'coplanar';
  draws: number;
  seed: number;
  moon_period_s: QuantilesJson | null;
  moon_separation_m: QuantilesJson | null;
  moon_mass_kg: QuantilesJson;
  mass_ratio: QuantilesJson;
  mass_at_separation_m: number | null;
  coplanar_moon_mass_kg: number | null;
  degeneracy: { moon_separation_m: number[]; moon_mass_kg: Array<number | null>; moon_mass_lo_kg: Array<number | null>; moon_mass_hi_kg: Array<number | null> } | null;
  note: string;
}

export interface SystemJson {
  hill_radius_m: number;
  stable_max_separation_m: number;
  stable_max_separation_retrograde_m: number;
  roche_limit_rocky_m: number;
  roche_limit_icy_m: number;
  tidal_max_moon_mass_kg: number;
  transit_duration_s: number;
  barycentre_velocity_m_s: number;
  planet_mass_kg: number;
  planet_radius_m: number;
}

export interface TimingSeriesJson {
  epochs: number[];
  ttv_s: number[];
  ttv_err_s: number[];
  ttv_model_s: number[];
  tdv_s: number[] | null;
  tdv_err_s: number[] | null;
  tdv_model_s: number[] | null;
  sinusoid: { frequency_per_epoch: number; ttv_cos_s: number; ttv_sin_s: number; tdv_cos_s: number | null; tdv_sin_s: number | null };
}

export interface SignalJson {
  false_alarm: number;
  tests: Array<{ id: SignalTestId; label: string; p_value: number }>;
  adjusted_p_value: number;
  strongest_test: SignalTestId;
  detected: boolean;
}

export interface ExclusionJson {
  moon_separation_m: number[];
  moon_mass_kg: number[];
  /** [separation][mass]; null: not simulated (the signal is far below the errors; not excluded). */
  detected_fraction: Array<Array<number | null>>;
  upper_limit_moon_mass_kg: Array<number | null>;
  realizations: number;
  exclusion_level: number;
  false_alarm: number;
}

export interface AlternativeJson {
  id: AlternativeId;
  title: string;
  bic_delta: number | null;
  favour_moon: string[];
  favour_alternative: string[];
  test: string;
  source: string;
}

export interface VetJson {
  schema: typeof VET_SCHEMA;
  claim: string;
  input: 'amplitudes' | 'table';
  verdict: Verdict;
  reasons: string[];
  checks: Array<{ id: CheckId; title: string; status: CheckStatus; grade: CheckGrade; severity: number; detail: string; source: string }>;
  cautions: string[];
  assumptions: string[];
  system: SystemJson;
  amplitudes: { ttv_rms_s: number | null; ttv_rms_err_s: number | null; tdv_rms_s: number | null; tdv_rms_err_s: number | null };
  table_significance: TableSignificanceJson | null;
  amplitude_significance: AmplitudeSignificanceJson | null;
  implied: ImpliedMoonJson | null;
  series: TimingSeriesJson | null;
  signal: SignalJson;
  exclusion: ExclusionJson | null;
  alternatives: AlternativeJson[] | null;
}

const quantiles = (q: QuantileSummary): QuantilesJson => ({ median: q.median, lo_1sigma: q.lo1, hi_1sigma: q.hi1, lo_2sigma: q.lo2, hi_2sigma: q.hi2 });
const chi = (c: ChiSquareSummary): ChiSquareJson => ({ chi_square: c.chiSquare, dof: c.dof, p_value: c.pValue });
const bic = (b: BicComparison): BicJson => ({
  points: b.points, parameters_no_moon: b.kNoMoon, parameters_moon: b.kMoon, bic_no_moon: b.bicNoMoon, bic_moon: b.bicMoon, bic_delta: b.delta, frequency_per_epoch: b.frequencyPerEpoch,
});
const periodogram = (p: PeriodogramSummary): PeriodogramJson => ({
  frequency_per_epoch: p.frequency, power: p.power, peak_frequency_per_epoch: p.peakFrequencyPerEpoch, peak_power: p.peakPower, peak_false_alarm: p.falseAlarmProbability,
});
const runs = (r: RunsTest): RunsTestJson => ({ runs: r.runs, expected_runs: r.expectedRuns, z: r.z, p_value_few_runs: r.pValueFewRuns });

function table(t: TableSignificance): TableSignificanceJson {
  return {
    transits: t.transits,
    ttv: chi(t.ttv),
    tdv: t.tdv && chi(t.tdv),
    joint: t.joint && chi(t.joint),
    bic_ttv: bic(t.bicTtv),
    bic_tdv: t.bicTdv && bic(t.bicTdv),
    bic_joint: t.bicJoint && bic(t.bicJoint),
    periodogram_ttv: periodogram(t.periodogramTtv),
    periodogram_tdv: t.periodogramTdv && periodogram(t.periodogramTdv),
    frequency_per_epoch: t.frequencyPerEpoch,
    ttv_semi_amplitude_s: t.ttvSemiAmplitudeS,
    ttv_semi_amplitude_err_s: t.ttvSemiAmplitudeErrS,
    tdv_semi_amplitude_s: t.tdvSemiAmplitudeS,
    tdv_semi_amplitude_err_s: t.tdvSemiAmplitudeErrS,
    residual: chi(t.residual),
    runs: runs(t.runs),
    alias_family: {
      count: t.aliasFamily.count, min_period_ratio: t.aliasFamily.minRatio, max_period_ratio: t.aliasFamily.maxRatio,
      moon_periods_s: t.aliasFamily.periodsS, nearest_to_implied_s: t.aliasFamily.nearestToImpliedS,
    },
  };
}

const amplitudeSignificance = (a: AmplitudeSignificance): AmplitudeSignificanceJson => ({
  ttv_z: a.ttvZ, tdv_z: a.tdvZ, timing_precision_s: a.timingPrecisionS, duration_precision_s: a.durationPrecisionS,
  expected_ttv_p_value: a.expectedTtvPValue, expected_tdv_p_value: a.expectedTdvPValue,
});

function implied(m: ImpliedMoonSummary): ImpliedMoonJson {
  return {
    mode: m.mode,
    orientation: m.orientation,
    draws: m.draws,
    seed: m.seed,
    moon_period_s: m.moonPeriodS && quantiles(m.moonPeriodS),
    moon_separation_m: m.separationM && quantiles(m.separationM),
    moon_mass_kg: quantiles(m.massKg),
    mass_ratio: quantiles(m.massRatio),
    mass_at_separation_m: m.massAtSeparationM,
    coplanar_moon_mass_kg: m.coplanarMassKg,
    degeneracy: m.degeneracy && { moon_separation_m: m.degeneracy.separationM, moon_mass_kg: m.degeneracy.massKg, moon_mass_lo_kg: m.degeneracy.massLoKg, moon_mass_hi_kg: m.degeneracy.massHiKg },
    note: m.note,
  };
}

const system = (s: SystemSummary): SystemJson => ({
  hill_radius_m: s.hillRadiusM,
  stable_max_separation_m: s.stableProgradeM,
  stable_max_separation_retrograde_m: s.stableRetrogradeM,
  roche_limit_rocky_m: s.rocheRockyM,
  roche_limit_icy_m: s.rocheIcyM,
  tidal_max_moon_mass_kg: s.tidalMaxMassKg,
  transit_duration_s: s.durationS,
  barycentre_velocity_m_s: s.barycentreVelocityMS,
  planet_mass_kg: s.planetMassKg,
  planet_radius_m: s.planetRadiusM,
});

const series = (t: TimingSeriesSummary): TimingSeriesJson => ({
  epochs: t.epochs, ttv_s: t.ttvS, ttv_err_s: t.ttvErrS, ttv_model_s: t.ttvModelS, tdv_s: t.tdvS, tdv_err_s: t.tdvErrS, tdv_model_s: t.tdvModelS,
  sinusoid: { frequency_per_epoch: t.sinusoid.frequencyPerEpoch, ttv_cos_s: t.sinusoid.ttvCosS, ttv_sin_s: t.sinusoid.ttvSinS, tdv_cos_s: t.sinusoid.tdvCosS, tdv_sin_s: t.sinusoid.tdvSinS },
});

const signal = (d: SignalDecision): SignalJson => ({
  false_alarm: d.falseAlarm,
  tests: d.tests.map((t) => ({ id: t.id, label: t.label, p_value: t.pValue })),
  adjusted_p_value: d.adjustedPValue,
  strongest_test: d.strongest,
  detected: d.detected,
});

const exclusion = (e: ExclusionMap): ExclusionJson => ({
  moon_separation_m: e.separationM,
  moon_mass_kg: e.massKg,
  detected_fraction: e.detectedFraction,
  upper_limit_moon_mass_kg: e.upperLimitKg,
  realizations: e.realizations,
  exclusion_level: e.level,
  false_alarm: e.falseAlarm,
});

const alternative = (a: Alternative): AlternativeJson => ({
  id: a.id, title: a.title, bic_delta: a.bicDelta, favour_moon: a.favourMoon, favour_alternative: a.favourAlternative, test: a.test, source: a.source,
});

/** The `vet --json` document of a result. */
export function vetToJson(r: VetResult): VetJson {
  return {
    schema: VET_SCHEMA,
    claim: r.claim,
    input: r.input,
    verdict: r.verdict,
    reasons: r.reasons,
    checks: r.checks.map((c) => ({ id: c.id, title: c.title, status: c.status, grade: c.grade, severity: c.strength, detail: c.detail, source: c.source })),
    cautions: r.cautions,
    assumptions: r.assumptions,
    system: system(r.system),
    amplitudes: { ttv_rms_s: r.amplitudes.ttvRmsS, ttv_rms_err_s: r.amplitudes.ttvRmsErrS, tdv_rms_s: r.amplitudes.tdvRmsS, tdv_rms_err_s: r.amplitudes.tdvRmsErrS },
    table_significance: r.tableSignificance && table(r.tableSignificance),
    amplitude_significance: r.amplitudeSignificance && amplitudeSignificance(r.amplitudeSignificance),
    implied: r.implied && implied(r.implied),
    series: r.series && series(r.series),
    signal: signal(r.signal),
    exclusion: r.exclusion && exclusion(r.exclusion),
    alternatives: r.alternatives && r.alternatives.map(alternative),
  };
}

/** The result of vetting a claimed moon signal (`vetClaim`); every quantity SI. */
import type { RunsTest } from './runsTest.js';
import type { SignalDecision } from './signalDetection.js';
import type { ExclusionMap } from './exclusionMap.js';

/** Another explanation of a timing signal (alternatives.ts). */
export type AlternativeId = 'perturbing_planet' | 'stellar_activity' | 'companion_star';

export interface Alternative {
  id: AlternativeId;
  title: string;
  /** BIC(alternative) − BIC(moon); > 0 favours the moon. null: not computable from amplitudes alone. */
  bicDelta: number | null;
  /** Features of the data that favour the moon over this alternative (with numbers). */
  favourMoon: string[];
  /** Features that favour this alternative. */
  favourAlternative: string[];
  /** What would tell them apart. */
  test: string;
  source: string;
}

export type CheckStatus = 'pass' | 'tension' | 'fail' | 'not tested';
/**
 * The verdict ladder: 'no_signal' (the timing is consistent with a linear ephemeris and constant
 * duration at the false-alarm level, look-elsewhere counted: no moon is inferred), 'consistent'
 * (a signal, explained by a physically allowed moon), 'tension' (a signal whose moon conflicts
 * with a non-decisive check), 'implausible' (a decisive physical or observational contradiction).
 */
export type Verdict = 'no_signal' | 'consistent' | 'tension' | 'implausible';

/** Decisive checks can make a claim implausible; non-decisive ones (priors, tolerances) only put it in tension. */
export type CheckGrade = 'decisive' | 'non-decisive';

export type CheckId =
  | 'significance'
  | 'stability'
  | 'mass-vs-planet'
  | 'barycentre'
  | 'alternatives'
  | 'roche'
  | 'mass-ratio'
  | 'tidal-survival'
  | 'phase'
  | 'moon-dip'
  | 'residual-noise'
  | 'precision';

export interface VetCheck {
  id: CheckId;
  title: string;
  status: CheckStatus;
  grade: CheckGrade;
  /** How far past its limit the claim lies (bound most favourable to the claim / limit, ≥ 1 when violated); orders the reasons. */
  strength: number;
  /** The numbers behind the status, in words. */
  detail: string;
  /** Where the threshold comes from. */
  source: string;
}

/**
 * Median and central 1σ / 2σ intervals (quantiles 15.87/84.13 % and 2.275/97.725 %) of a Monte
 * Carlo sample. null: at that quantile no moon can make the signal (e.g. a TTV needing a
 * barycentric offset beyond the separation assumed), i.e. the value is unbounded.
 */
export interface QuantileSummary {
  median: number | null;
  lo1: number | null;
  hi1: number | null;
  lo2: number | null;
  hi2: number | null;
}

/** The same inside the vetting, where an unbounded quantile is +Infinity (so comparisons with limits work). */
export interface RawQuantileSummary {
  median: number;
  lo1: number;
  hi1: number;
  lo2: number;
  hi2: number;
}

export interface ChiSquareSummary {
  chiSquare: number;
  dof: number;
  pValue: number;
}

/** BIC = χ² + k ln N (Schwarz 1978, Ann. Stat. 6, 461) of the no-moon and moon models; delta = no-moon − moon (> 0 favours the moon). */
export interface BicComparison {
  points: number;
  kNoMoon: number;
  kMoon: number;
  bicNoMoon: number;
  bicMoon: number;
  delta: number;
  frequencyPerEpoch: number;
}

export interface PeriodogramSummary {
  frequency: number[];
  power: number[];
  peakFrequencyPerEpoch: number;
  peakPower: number;
  falseAlarmProbability: number;
}

export interface TableSignificance {
  transits: number;
  ttv: ChiSquareSummary;
  tdv: ChiSquareSummary | null;
  joint: ChiSquareSummary | null;
  bicTtv: BicComparison;
  bicTdv: BicComparison | null;
  bicJoint: BicComparison | null;
  periodogramTtv: PeriodogramSummary;
  periodogramTdv: PeriodogramSummary | null;
  /** The sinusoid behind the amplitudes: frequency, semi-amplitudes and 1σ. */
  frequencyPerEpoch: number;
  ttvSemiAmplitudeS: number;
  ttvSemiAmplitudeErrS: number;
  tdvSemiAmplitudeS: number | null;
  tdvSemiAmplitudeErrS: number | null;
  /** χ² of the data about the moon model (ephemeris + sinusoids). */
  residual: ChiSquareSummary;
  runs: RunsTest;
  /** Moon periods that alias to the frequency, within the Roche–stability range of period ratios. */
  aliasFamily: { count: number; minRatio: number; maxRatio: number; periodsS: number[]; nearestToImpliedS: number | null };
}

export interface AmplitudeSignificance {
  ttvZ: number | null;
  tdvZ: number | null;
  /** Carter et al. (2008) per-transit precisions at the stated photometric precision, s. */
  timingPrecisionS: number | null;
  durationPrecisionS: number | null;
  /** p-value a white-noise χ² test over the claimed transits would give for the claimed rms (expected χ²). */
  expectedTtvPValue: number | null;
  expectedTdvPValue: number | null;
}

/** The implied moon as reported: unbounded values are null (JSON has no Infinity). */
export type ImpliedMoonSummary = ImpliedMoonOf<QuantileSummary, number | null>;
/** The implied moon inside the vetting: unbounded values are +Infinity. */
export type RawImpliedMoonSummary = ImpliedMoonOf<RawQuantileSummary, number>;

export interface ImpliedMoonOf<Q, M> {
  mode: 'ttv+tdv' | 'ttv only' | 'tdv only';
  orientation: 'isotropic' | 'coplanar';
  draws: number;
  seed: number;
  /** With both amplitudes; null otherwise. */
  moonPeriodS: Q | null;
  separationM: Q | null;
  /** Mass (with one amplitude only: the lightest moon the stable band allows). */
  massKg: Q;
  massRatio: Q;
  /** Separation at which `massKg` is evaluated in single-amplitude mode, m. */
  massAtSeparationM: number | null;
  /** Mass for a coplanar orbit at the central amplitudes, kg; null where the central amplitudes imply none. */
  coplanarMassKg: number | null;
  /** Single-amplitude degeneracy curve M_S(a_S) at the 2.3, 50 and 97.7 % amplitude quantiles (unbounded: no moon at that separation). */
  degeneracy: { separationM: number[]; massKg: M[]; massLoKg: M[]; massHiKg: M[] } | null;
  note: string;
}

export interface SystemSummary {
  hillRadiusM: number;
  stableProgradeM: number;
  stableRetrogradeM: number;
  rocheRockyM: number;
  rocheIcyM: number;
  tidalMaxMassKg: number;
  /** τ̄ used for TDV, s. */
  durationS: number;
  barycentreVelocityMS: number;
  planetMassKg: number;
  planetRadiusM: number;
}

export interface TimingSeriesSummary {
  epochs: number[];
  ttvS: number[];
  ttvErrS: number[];
  ttvModelS: number[];
  tdvS: number[] | null;
  tdvErrS: number[] | null;
  tdvModelS: number[] | null;
  /** The fitted sinusoid (model = base + cos·cos 2πνE + sin·sin 2πνE), s; for continuous and folded curves. */
  sinusoid: { frequencyPerEpoch: number; ttvCosS: number; ttvSinS: number; tdvCosS: number | null; tdvSinS: number | null };
}

export interface VetResult {
  claim: string;
  input: 'amplitudes' | 'table';
  verdict: Verdict;
  /** Reasons, failures first then tensions, most basic first. */
  reasons: string[];
  checks: VetCheck[];
  cautions: string[];
  assumptions: string[];
  system: SystemSummary;
  /** The rms amplitudes the inversion used (claimed, or estimated from the table), s. */
  amplitudes: { ttvRmsS: number | null; ttvRmsErrS: number | null; tdvRmsS: number | null; tdvRmsErrS: number | null };
  tableSignificance: TableSignificance | null;
  amplitudeSignificance: AmplitudeSignificance | null;
  /** The implied moon; null when there is no detectable signal to explain. */
  implied: ImpliedMoonSummary | null;
  series: TimingSeriesSummary | null;
  /** The detection rule's tests and decision (signalDetection.ts). */
  signal: SignalDecision;
  /** The moons the data exclude at 95 % (exclusionMap.ts); null when the data give no epochs or errors. */
  exclusion: ExclusionMap | null;
  /** Other explanations, most competitive first; null without a signal. */
  alternatives: Alternative[] | null;
}

/**
 * A claimed moon signal, validated and in SI units: the star and planet (as
 * in a scenario) plus either claimed TTV/TDV amplitudes or a table of transit
 * times. Produced by `parseClaim` / `loadClaim`; read by `vetClaim`.
 */
import type { PlanetSpec, StarSpec } from '../scenario/types.js';

/** How an amplitude is stated: the rms over the transits, or the sinusoid's semi-amplitude (= √2 × rms). */
export type AmplitudeKind = 'rms' | 'semi-amplitude';

export interface ClaimedAmplitude {
  /** The amplitude as stated, s. */
  valueS: number;
  /** Its 1σ uncertainty, s. */
  errorS: number;
  kind: AmplitudeKind;
}

/** Prior on the moon orbit's orientation for the Monte Carlo (the timing only sees the projection on the chord). */
export type OrientationPrior = 'isotropic' | 'coplanar';

/** A table of measured transit times (and optionally durations), already checked. */
export interface TimingTable {
  /** File the table came from (for messages and reports). */
  source: string;
  /** The stated time standard, e.g. "BJD_TDB" or "BJD_TDB-2457000". */
  timeStandard: string;
  /** Integer transit epochs, strictly increasing (rows sorted by time). */
  epochs: Float64Array;
  /** True when the epochs were inferred from the planet period. */
  epochsInferred: boolean;
  /** True when the file's rows were not in time order and were sorted. */
  reordered?: boolean;
  /** Mid-transit times, s since `referenceBjdTdb`. */
  timeS: Float64Array;
  /** 1σ errors of the mid-times, s (> 0). */
  timeErrS: Float64Array;
  /** BJD_TDB (days) of timeS = 0: the first transit. */
  referenceBjdTdb: number;
  /** Durations and their errors, s; null when the table has none. */
  durationS: Float64Array | null;
  durationErrS: Float64Array | null;
}

/** Photometric white-noise level of the data behind the claim. */
export interface PhotometricPrecision {
  /** Relative flux noise at the timescale below. */
  noiseFraction: number;
  /** Timescale at which the noise is stated, s. */
  noiseTimescaleS: number;
}

export interface Claim {
  name: string;
  /** Old key names met in the claim file, one note each (the CLI prints them on stderr). */
  deprecations?: string[];
  /** Seed of the Monte Carlo propagation. */
  seed: number;
  star: StarSpec;
  planet: PlanetSpec;
  /** Claimed amplitudes (null when not claimed, or when a table is given). */
  ttv: ClaimedAmplitude | null;
  tdv: ClaimedAmplitude | null;
  /** Claimed phase by which TDV lags TTV, with its 1σ, rad (optional). */
  phaseOffset: { valueRad: number; errorRad: number } | null;
  /** Claimed depth of the moon's own dip (fraction); null when no dip was reported. */
  moonDipDepth: number | null;
  /** Photometric precision of the data; null when not stated (then the dip cannot be checked). */
  precision: PhotometricPrecision | null;
  /** Sampling cadence of the photometry, s (default: the precision's timescale). */
  cadenceS: number | null;
  /** Number of transits observed (the table's row count when a table is given). */
  transits: number;
  /** Measured transit duration τ̄ (T14), s; null: computed from the star and planet. */
  durationS: number | null;
  table: TimingTable | null;
  orientation: OrientationPrior;
  /** False-alarm level α of the signal detection (look-elsewhere counted). */
  falseAlarm: number;
  /** What the claim says the companion is: a moon (the barycentre must lie inside the planet) or a binary planet. */
  companion: 'moon' | 'binary_planet';
  /** Monte Carlo draws. */
  draws: number;
}

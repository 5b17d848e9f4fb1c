/**
 * A validated scenario, every quantity in SI units (m, kg, s, rad, W) or a
 * plain fraction. Produced by `parseScenario` / `loadScenario`; everything
 * downstream reads only this form.
 */

export interface StarSpec {
  massKg: number;
  radiusM: number;
  teffK: number;
  ageS: number;
  /** Quadratic limb-darkening coefficients, I(μ)/I(1) = 1 − u1(1−μ) − u2(1−μ)². */
  u1: number;
  u2: number;
  /** Luminosity, W: given, or σ_SB 4πR² T⁴ (Stefan–Boltzmann law). */
  luminosityW: number;
}

export interface PlanetSpec {
  massKg: number;
  radiusM: number;
  /** Orbital period of the planet–moon barycentre around the star, s. */
  periodS: number;
  eccentricity: number;
  /** Argument of periastron ω of the barycentre orbit, rad (Winn 2010 convention). */
  omegaRad: number;
  /** Orbital inclination to the sky plane, rad (π/2 = edge-on). */
  inclinationRad: number;
  /** Impact parameter of the barycentre at conjunction, in stellar radii (Winn 2010 eq. 7). */
  impactParameter: number;
  /** Semi-major axis of the barycentre orbit, m (Kepler's third law). */
  semiMajorAxisM: number;
  /** Bond albedo. */
  albedo: number;
  /** Tidal Love number k2. */
  k2: number;
  /** Tidal quality factor Q. */
  tidalQ: number;
  /**
   * The mass–radius relation the radius came from (`planet.mass_radius`), or
   * absent when the radius was given. With a relation the radius follows
   * the mass, also along a planet-mass sweep axis.
   */
  massRadiusRelation?: 'chen_kipping_2017' | null;
}

export interface MoonSpec {
  massKg: number;
  radiusM: number;
  /** Semi-major axis of the planet–moon relative orbit, m. */
  separationM: number;
  eccentricity: number;
  /** Inclination of the moon's orbit to the planet's orbital plane, rad (0 = coplanar). */
  inclinationRad: number;
  /** Longitude of the ascending node on the planet's orbital plane, rad. */
  nodeRad: number;
  /** Argument of periapsis of the moon's orbit, rad. */
  periapsisRad: number;
  /** Mean anomaly of the moon at the reference epoch (barycentre mid-transit, epoch 0), rad. */
  phaseRad: number;
  retrograde: boolean;
  /** Bond albedo (energy budget). */
  albedo: number;
  /** Set (true) only for a sweep cell whose moon disc would touch the planet's (parseScenario's moonContact: 'label'). */
  touchesPlanet?: true;
  /** Tidal Love number k2 and quality factor Q of the moon (tidal heating). */
  k2: number;
  tidalQ: number;
}

/** Correlated noise added to the white noise. */
export type RedNoiseSpec =
  | {
      /** Power-law spectrum S ∝ f^−β (Timmer & König 1995). */
      model: 'power_law';
      /** rms of the noise averaged over `timescaleS` (relative flux). */
      rmsFraction: number;
      timescaleS: number;
      beta: number;
    }
  | {
      /** Damped random walk, covariance σ² e^{−|Δt|/τ} (Kelly et al. 2009). */
      model: 'drw';
      /** Stationary rms (relative flux). */
      rmsFraction: number;
      tauS: number;
    };

/** A ground-based noise budget: the white-noise level is computed from the telescope and site. */
export interface GroundSpec {
  apertureM: number;
  /** Johnson–Cousins band of `magnitude` (`instrument.ground.band`, default V). */
  band: 'U' | 'B' | 'V' | 'R' | 'I';
  /** The star's magnitude in `band`. */
  magnitude: number;
  throughput: number;
  airmass: number;
  altitudeM: number;
  /** Osborn et al. (2015) site coefficient C_Y. */
  scintillationCoefficient: number;
  /** Systematic floor (relative flux) stated at a timescale; 0 for none. */
  floorFraction: number;
  floorTimescaleS: number;
  /** Each term per exposure and the dominant one (filled by the parser). */
  terms: { photon: number; scintillation: number; floor: number; total: number; dominant: string };
}

export interface InstrumentSpec {
  /** Time between samples, s. */
  cadenceS: number;
  /** Exposure (integration) time per sample, s; ≤ cadence. */
  exposureS: number;
  /** White-noise level as a fraction of the stellar flux, at the timescale below. */
  noiseFraction: number;
  /** Timescale at which `noiseFraction` is stated, s; scaled by √t to the exposure. */
  noiseTimescaleS: number;
  /** Correlated noise, or null for white noise only. */
  redNoise: RedNoiseSpec | null;
  /** The ground-based budget the white level came from, or null when it was stated directly. */
  ground: GroundSpec | null;
}

export interface ObservationSpec {
  /** Number of consecutive transits observed (given, or counted from `durationS`). */
  transits: number;
  /**
   * The span observed from t0, s, when `observation.duration` was given
   * (then `transits` = the barycentre conjunctions t0 + nP, n ≥ 0, with
   * nP ≤ duration); absent when the transits were given.
   */
  durationS?: number | null;
  /** Barycentre mid-transit time of epoch 0, BJD_TDB (days). */
  t0BjdTdb: number;
  /** Out-of-transit baseline observed on each side of the transit, s. */
  baselineS: number;
  /** Fraction of the windows' time actually observed (random gaps), 1 = no gaps. */
  dutyCycle: number;
  /** Mean length of a gap, s (with dutyCycle < 1). */
  gapLengthS: number;
  /** Probability that a whole transit is missed (weather, scheduling). */
  missedFraction: number;
}

export interface DetectionSpec {
  /** False-alarm probability per channel at which a moon counts as detected. */
  falseAlarm: number;
  /**
   * How thresholds are set from the no-moon realizations (timing/detection.ts): 'tail' (the default when
   * absent) or 'order_statistic'. Present only when written, so other scenarios keep their canonical JSON.
   */
  calibration?: 'tail' | 'order_statistic';
}

/**
 * A physically odd but legal input (a moon heavier than its planet, a
 * baseline longer than half the period): the scenario runs, and commands
 * print each as a "note:" line.
 */
export interface ScenarioCaution {
  /** Dotted path of the field the caution is about. */
  path: string;
  message: string;
}

/**
 * A scenario document as read from YAML: plain values (numbers, texts with
 * their units such as "0.3 hill" or "12 Rp", nested blocks), not yet
 * validated. The input edge only: stages read the validated `Scenario`.
 */
export type ScenarioDocument = Record<string, unknown>;

export interface Scenario {
  /**
   * The document this scenario was parsed from (a private copy), so that it can be varied
   * field by field and validated again with the same checks (a sweep cell's axis values, a
   * budget's solved quantity: `applyAxes`, `scenarioDocumentOf`): the document keeps what the
   * SI values do not, how each was written ("0.3 hill" follows the planet, a density makes the
   * radius follow the mass, a luminosity given or derived). Set by parseScenario; a non-enumerable
   * property like `cautions` (not in JSON, spreads, structured clones or the canonical JSON that
   * seeds the no-moon sets); absent on a Scenario built by hand or copied.
   */
  document?: ScenarioDocument;
  /**
   * Cautions about odd but legal inputs (empty when none; absent on a Scenario not made by
   * parseScenario); see `formatCautions`. A non-enumerable property: not in JSON, spreads,
   * structured clones or the canonical JSON that seeds the no-moon sets.
   */
  cautions?: ScenarioCaution[];
  name: string;
  seed: number;
  star: StarSpec;
  planet: PlanetSpec;
  moon: MoonSpec | null;
  instrument: InstrumentSpec;
  observation: ObservationSpec;
  detection: DetectionSpec;
}

/** One observing site (`site`, or one entry of a `site` list). */
export interface SiteSpec {
  name: string;
  /** Geodetic latitude, rad (north positive). */
  latitudeRad: number;
  /** East longitude, rad (west negative). */
  longitudeRad: number;
  /** Height above the WGS 84 ellipsoid, m. */
  altitudeM: number;
}

/** The target's ICRS (J2000) position. */
export interface TargetSpec {
  raRad: number;
  decRad: number;
}

/** The observing campaign, UTC seconds since J2000.0 (2000-01-01T12:00:00 UTC), civil-calendar count. */
export interface CampaignSpec {
  startUtcS: number;
  endUtcS: number;
}

/** When a target counts as observable. */
export interface ConstraintsSpec {
  /** The Sun must be below this altitude, rad (geometric, centre of the disc). */
  sunAltitudeRad: number;
  /** Largest air mass (Kasten & Young 1989). */
  airmass: number;
  /** Chance that a night at a site is usable (weather). */
  clearFraction: number;
}

/**
 * A space instrument's periodic visibility (the optional `visibility` block):
 * the target is visible for `onS`, then hidden for `offS`, repeating from the
 * reference instant (as for a low orbit), and, when `blockS` is set, only
 * inside observing blocks of `blockS` separated by `gapS` (the instrument
 * stares at the target for a block, then is away), the blocks repeating from
 * the same reference. Times on the BJD_TDB axis.
 */
export interface VisibilitySpec {
  /** Name of the instrument in tables. */
  name: string;
  /** Visible part of each cycle, s (> 0). */
  onS: number;
  /** Hidden part of each cycle, s (≥ 0; 0: always visible inside a block). */
  offS: number;
  /** Start of a visible part and of a block, BJD_TDB (days). */
  referenceBjdTdb: number;
  /** Length of an observing block, s; null: no blocks (the pattern runs through the whole campaign). */
  blockS: number | null;
  /** Time between blocks, s (0 without blocks). */
  gapS: number;
}

/**
 * Where and when (the optional `site`, `target`, `campaign`, `constraints`
 * blocks) and the ephemeris uncertainties (`observation.t0_error`,
 * `planet.period_error`). Present on a Scenario only when one of them was given.
 */
export interface SkySpec {
  /** The sites (a network when more than one); empty when no `site` block. */
  sites: SiteSpec[];
  target: TargetSpec | null;
  campaign: CampaignSpec | null;
  constraints: ConstraintsSpec;
  /** A space instrument's visibility pattern (instead of sites, constraints and weather); absent or null for a ground campaign. */
  visibility?: VisibilitySpec | null;
  /** 1σ uncertainty of t0, s (0 when not given). */
  t0ErrorS: number;
  /** 1σ uncertainty of the period, s (0 when not given). */
  periodErrorS: number;
}

export interface Scenario {
  /** Where and when; absent unless a scenario gives site, target, campaign, constraints or ephemeris errors. */
  sky?: SkySpec;
}

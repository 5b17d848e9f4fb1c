/**
 * The scenario's fields, one entry each: the single table the validator reads
 * its defaults and allowed ranges from (through `FieldReader.field`) and the
 * scenario reference (docs/scenario-reference.md) is generated from, so the
 * two cannot drift. Every range is SI here; `show` is the unit the reference
 * states it in, and a message states it in the unit the user wrote.
 *
 * To add a field: an entry here, read it in parseScenario with `r.field(key)`
 * (or `r.raw(key)` for a special form), then `npm run docs:scenario`; the
 * tests in test/scenario/fieldTable.test.ts and scenarioReference.test.ts
 * fail until all three agree.
 *
 * Ranges that are not plain definitions:
 * - star.mass, 0.01–150 M☉: from below the deuterium-burning limit of ~13 M_J
 *   (Spiegel, Burrows & Milsom 2011, ApJ 727, 57), so brown-dwarf hosts are
 *   allowed, to the observed upper mass of stars, ~150 M☉ (Figer 2005, Nature
 *   434, 192).
 * - star.radius, 0.005–2000 R☉: white dwarfs (~0.01 R☉) to the largest red
 *   supergiants (~1500 R☉, Levesque et al. 2005, ApJ 628, 973), with margin.
 * - instrument.cadence 0.1 s–1 d and exposure ≥ 0.1 s: common practice for
 *   transit photometry (no source); shorter samples only multiply points.
 */
import { DAY_S, HOUR_S, JULIAN_YEAR_S, M_SUN_KG, MINUTE_S, R_SUN_M } from '../physics/constants.js';
import type { QuantityKind } from './units.js';

const DEG = Math.PI / 180;

export type FieldType =
  /** A nested block of fields. */
  | 'mapping'
  | 'text'
  | 'integer'
  /** A plain number without a unit. */
  | 'number'
  /** A number with a unit ("148 d"), or a bare number in the field's bare unit. */
  | 'quantity'
  /** A level at a timescale: "200 ppm per 1 h". */
  | 'level'
  /** One of a fixed set of words. */
  | 'choice'
  /** moon.separation: a length, planet radii ("12 Rp") or Hill radii ("0.2 hill"). */
  | 'separation';

export interface ScenarioField {
  /** Dotted path in the scenario document. */
  path: string;
  type: FieldType;
  /** Physical kind of a quantity. */
  kind?: QuantityKind;
  /** SI size of one bare number and the unit's name; absent: a unit is required. */
  bare?: readonly [number, string];
  /** Unit the reference states defaults and ranges in: SI size and name. */
  show?: readonly [number, string];
  /** Default (SI for numbers); absent: required or derived (see `defaultText`). */
  default?: number | string;
  /** The default in words when it is derived or conditional ("= cadence"). */
  defaultText?: string;
  /** When the field must be given ("yes", or the condition). */
  required?: string;
  min?: number;
  minExclusive?: boolean;
  max?: number;
  maxExclusive?: boolean;
  /** The allowed range in words when the bounds alone do not say it, or its source. */
  rangeNote?: string;
  choices?: readonly string[];
  /** What a message calls the value ("an eccentricity"); default from the type. */
  noun?: string;
  /** One line of meaning. */
  meaning: string;
}

const Msun = [M_SUN_KG, 'Msun'] as const;
const Rsun = [R_SUN_M, 'Rsun'] as const;
const days = [DAY_S, 'days'] as const;
const minutes = [MINUTE_S, 'minutes'] as const;
const seconds = [1, 's'] as const;
const hours = [HOUR_S, 'hours'] as const;
const degrees = [DEG, 'degrees'] as const;
const kelvin = [1, 'K'] as const;
const metres = [1, 'metres'] as const;
const fraction = [1, 'a fraction'] as const;

/** Bands whose magnitude the ground budget accepts (zero points in noise/groundBudget.ts). */
export const MAGNITUDE_BANDS = ['U', 'B', 'V', 'R', 'I'] as const;
/** Planet mass–radius relations a scenario may name (physics/massRadius.ts). */
export const MASS_RADIUS_RELATIONS = ['chen_kipping_2017'] as const;

export const SCENARIO_FIELDS: readonly ScenarioField[] = [
  { path: 'name', type: 'text', default: 'unnamed', meaning: 'name of the system, used in titles and output folder names' },
  { path: 'seed', type: 'integer', default: 1, min: 0, max: 2 ** 32 - 1, meaning: 'random seed; the same seed gives the same noise and draws' },

  { path: 'star', type: 'mapping', required: 'yes', meaning: 'the host star' },
  { path: 'star.mass', type: 'quantity', kind: 'mass', show: Msun, required: 'yes', min: 0.01 * M_SUN_KG, max: 150 * M_SUN_KG,
    rangeNote: 'brown dwarfs to the most massive stars (Spiegel et al. 2011; Figer 2005)', meaning: 'stellar mass' },
  { path: 'star.radius', type: 'quantity', kind: 'length', show: Rsun, required: 'yes', min: 0.005 * R_SUN_M, max: 2000 * R_SUN_M,
    rangeNote: 'white dwarfs to the largest supergiants (Levesque et al. 2005)', meaning: 'stellar radius' },
  { path: 'star.teff', type: 'quantity', noun: 'an effective temperature', kind: 'temperature', bare: kelvin, show: kelvin, required: 'yes', min: 1000, max: 60000, meaning: 'effective temperature' },
  { path: 'star.age', type: 'quantity', kind: 'time', show: [1e9 * JULIAN_YEAR_S, 'Gyr'], default: 5e9 * JULIAN_YEAR_S, min: 0, minExclusive: true,
    meaning: 'stellar age (tidal-migration and energy-budget screens)' },
  { path: 'star.luminosity', type: 'quantity', kind: 'power', show: [3.828e26, 'Lsun'], defaultText: 'σ_SB 4πR²T⁴ (Stefan–Boltzmann)', min: 0, minExclusive: true,
    meaning: 'bolometric luminosity (habitable zone, energy budget)' },
  { path: 'star.limb_darkening', type: 'mapping', required: 'yes', meaning: 'quadratic limb darkening: {u1, u2}, or Kipping (2013) {q1, q2}' },
  { path: 'star.limb_darkening.u1', type: 'number', required: 'unless q1, q2', rangeNote: 'u1 ≥ 0, u1 + u2 ≤ 1, u1 + 2·u2 ≥ 0 (Kipping 2013)',
    meaning: 'linear coefficient of I(μ)/I(1) = 1 − u1(1−μ) − u2(1−μ)²' },
  { path: 'star.limb_darkening.u2', type: 'number', required: 'unless q1, q2', rangeNote: 'see u1', meaning: 'quadratic coefficient' },
  { path: 'star.limb_darkening.q1', type: 'number', required: 'instead of u1, u2', min: 0, max: 1, meaning: 'Kipping (2013) q1 = (u1 + u2)²' },
  { path: 'star.limb_darkening.q2', type: 'number', required: 'instead of u1, u2', min: 0, max: 1, meaning: 'Kipping (2013) q2 = u1 / (2(u1 + u2))' },

  { path: 'planet', type: 'mapping', required: 'yes', meaning: 'the transiting planet (the barycentre of planet and moon)' },
  { path: 'planet.mass', type: 'quantity', kind: 'mass', show: [5.972168e24, 'Mearth'], required: 'yes', min: 0, minExclusive: true, meaning: 'planet mass' },
  { path: 'planet.radius', type: 'quantity', kind: 'length', show: [6.3781e6, 'Rearth'], required: 'unless mass_radius names a relation', min: 0, minExclusive: true,
    rangeNote: 'must be smaller than the star', meaning: 'planet radius' },
  { path: 'planet.mass_radius', type: 'choice', choices: MASS_RADIUS_RELATIONS, defaultText: 'none',
    meaning: 'radius from the mass when `radius` is omitted: Chen & Kipping (2017) mean relation; in a sweep over planet.mass the radius then follows the mass' },
  { path: 'planet.period', type: 'quantity', kind: 'time', bare: days, show: days, required: 'yes', min: 0, minExclusive: true, max: 1e5 * DAY_S,
    rangeNote: 'up to 1e5 days (~270 yr), beyond which no transit repeats within centuries (no source)',
    meaning: 'orbital period of the planet–moon barycentre' },
  { path: 'planet.eccentricity', type: 'number', noun: 'an eccentricity', default: 0, min: 0, max: 0.9, meaning: 'orbital eccentricity' },
  { path: 'planet.periapsis', type: 'quantity', kind: 'angle', bare: degrees, show: degrees, default: Math.PI / 2, meaning: 'argument of periapsis ω of the planet (barycentre) orbit (Winn 2010 convention; `periastron` is its old name, accepted with a note in this release)' },
  { path: 'planet.impact_parameter', type: 'number', default: 0, min: 0, rangeNote: 'below 1 + Rp/R* (the planet must transit); not with inclination',
    meaning: 'impact parameter at conjunction, stellar radii' },
  { path: 'planet.inclination', type: 'quantity', noun: 'an inclination', kind: 'angle', bare: degrees, show: degrees, defaultText: 'from impact_parameter', min: 0, max: Math.PI,
    meaning: 'orbital inclination to the sky plane (90 deg = edge-on); not with impact_parameter' },
  { path: 'planet.albedo', type: 'number', default: 0.3, min: 0, max: 1, meaning: 'Bond albedo (energy budget)' },
  { path: 'planet.love_number', type: 'number', default: 0.5, min: 0, minExclusive: true, max: 1.5, meaning: 'tidal Love number k2' },
  { path: 'planet.tidal_q', type: 'number', default: 1e5, min: 1, meaning: 'tidal quality factor Q' },

  { path: 'moon', type: 'mapping', defaultText: 'none: the no-moon case', meaning: 'the moon' },
  { path: 'moon.mass', type: 'quantity', kind: 'mass', show: [5.972168e24, 'Mearth'], required: 'yes', min: 0, minExclusive: true, meaning: 'moon mass' },
  { path: 'moon.radius', type: 'quantity', kind: 'length', show: [6.3781e6, 'Rearth'], required: 'unless density', min: 0, minExclusive: true, meaning: 'moon radius' },
  { path: 'moon.density', type: 'quantity', kind: 'density', show: [1e3, 'g/cm^3'], required: 'instead of radius', min: 0, minExclusive: true, meaning: 'mean density; the radius follows from the mass' },
  { path: 'moon.separation', type: 'separation', kind: 'length', required: 'yes', min: 0, minExclusive: true,
    rangeNote: 'a length, "N Rp" planet radii or "f hill" Hill radii; beyond planet radius + moon radius', meaning: 'semi-major axis of the planet–moon orbit' },
  { path: 'moon.eccentricity', type: 'number', noun: 'an eccentricity', default: 0, min: 0, max: 0.9, meaning: 'eccentricity of the moon orbit' },
  { path: 'moon.inclination', type: 'quantity', kind: 'angle', bare: degrees, show: degrees, default: 0, min: 0, max: Math.PI, meaning: 'inclination to the planet orbit plane' },
  { path: 'moon.node', type: 'quantity', kind: 'angle', bare: degrees, show: degrees, default: 0, meaning: 'longitude of the ascending node on the planet orbit plane' },
  { path: 'moon.periapsis', type: 'quantity', kind: 'angle', bare: degrees, show: degrees, default: 0, meaning: 'argument of periapsis of the moon orbit' },
  { path: 'moon.phase', type: 'quantity', kind: 'angle', bare: degrees, show: degrees, default: 0, meaning: 'mean anomaly at t0 (barycentre mid-transit of epoch 0)' },
  { path: 'moon.direction', type: 'choice', choices: ['prograde', 'retrograde'], default: 'prograde', meaning: 'sense of the moon orbit' },
  { path: 'moon.albedo', type: 'number', default: 0.3, min: 0, max: 1, meaning: 'Bond albedo (energy budget)' },
  { path: 'moon.love_number', type: 'number', default: 0.3, min: 0, minExclusive: true, max: 1.5, meaning: 'tidal Love number k2 (tidal heating)' },
  { path: 'moon.tidal_q', type: 'number', default: 100, min: 1, meaning: 'tidal quality factor Q (tidal heating)' },

  { path: 'instrument', type: 'mapping', required: 'yes', meaning: 'sampling and noise' },
  { path: 'instrument.cadence', type: 'quantity', kind: 'time', bare: minutes, show: seconds, required: 'yes', min: 0.1, max: DAY_S,
    rangeNote: 'shorter samples add points, not timing information (common practice, no source)', meaning: 'time between samples' },
  { path: 'instrument.exposure', type: 'quantity', kind: 'time', bare: minutes, show: seconds, defaultText: '= cadence', min: 0.1,
    rangeNote: 'at most the cadence', meaning: 'integration time per sample (the light curve is averaged over it)' },
  { path: 'instrument.noise', type: 'level', kind: 'fraction', bare: fraction, show: [1e-6, 'ppm'], required: 'unless ground', min: 0, minExclusive: true,
    rangeNote: '0 only beside red_noise (a noiseless curve: `simulate --noiseless`); not with ground', meaning: 'white noise at a stated timescale, "200 ppm per 1 h", scaled by √t; a bare level is per exposure' },
  { path: 'instrument.red_noise', type: 'mapping', defaultText: 'none', meaning: 'correlated noise added to the white noise' },
  { path: 'instrument.red_noise.model', type: 'choice', choices: ['power_law', 'drw'], required: 'with red_noise',
    meaning: 'power_law: S ∝ f^−β (Timmer & König 1995); drw: damped random walk (Kelly et al. 2009)' },
  { path: 'instrument.red_noise.amplitude', type: 'level', kind: 'fraction', show: [1e-6, 'ppm'], required: 'with red_noise', min: 0,
    meaning: 'power_law: rms averaged over a timescale, "150 ppm per 30 min"; drw: stationary rms, "200 ppm"' },
  { path: 'instrument.red_noise.slope', type: 'number', default: 1, min: 0, max: 4, meaning: 'power_law only: spectral slope β' },
  { path: 'instrument.red_noise.timescale', type: 'quantity', kind: 'time', bare: minutes, show: minutes, required: 'with model drw', min: 0, minExclusive: true,
    meaning: 'drw only: damping timescale τ' },
  { path: 'instrument.ground', type: 'mapping', required: 'instead of noise', meaning: 'ground-based budget: the white level from photon noise, scintillation (Osborn et al. 2015) and a floor' },
  { path: 'instrument.ground.aperture', type: 'quantity', kind: 'length', show: metres, required: 'yes', min: 0, minExclusive: true, meaning: 'telescope aperture diameter' },
  { path: 'instrument.ground.band', type: 'choice', choices: MAGNITUDE_BANDS, default: 'V',
    meaning: 'photometric band of `magnitude` (Johnson–Cousins; zero points of Bessell 1979)' },
  { path: 'instrument.ground.magnitude', type: 'number', required: 'yes', min: -2, max: 25, meaning: 'the star\'s magnitude in `band`' },
  { path: 'instrument.ground.throughput', type: 'number', default: 0.4, min: 0.001, max: 1, meaning: 'total throughput: atmosphere, optics, detector' },
  { path: 'instrument.ground.airmass', type: 'number', default: 1.3, min: 1, max: 5, meaning: 'airmass of the observations' },
  { path: 'instrument.ground.altitude', type: 'quantity', kind: 'length', bare: metres, show: metres, default: 2000, min: 0, max: 6000, meaning: 'site altitude' },
  { path: 'instrument.ground.scintillation_coefficient', type: 'number', default: 1.5, min: 0, max: 5, meaning: 'Osborn et al. (2015) site coefficient C_Y (1.3–1.7 typical)' },
  { path: 'instrument.ground.floor', type: 'level', kind: 'fraction', show: [1e-6, 'ppm'], defaultText: 'none', min: 0, meaning: 'systematic floor at a timescale, "100 ppm per 10 min", scaled by √t' },

  { path: 'observation', type: 'mapping', required: 'yes', meaning: 'what is observed' },
  { path: 'observation.transits', type: 'integer', noun: 'a whole number of transits', required: 'unless duration', min: 1, max: 10000, meaning: 'number of consecutive transits observed; with site, target and campaign, sweep and simulate use the campaign\'s transits instead (every epoch whose mid-time falls in it, as `moonsieve calendar` lists them)' },
  { path: 'observation.duration', type: 'quantity', kind: 'time', bare: days, show: [JULIAN_YEAR_S, 'yr'], required: 'instead of transits', min: 0,
    rangeNote: 'at most 10000 conjunctions', meaning: 'span observed from t0 ("3 yr"); the transits are the barycentre conjunctions t0 + nP inside it, the one at t0 included' },
  { path: 'observation.t0', type: 'number', default: 2461000.0, min: 0, max: 1e7, rangeNote: 'a Julian date in days (2461000 is the year 2025)', meaning: 'barycentre mid-transit time of epoch 0, BJD_TDB (days)' },
  { path: 'observation.baseline', type: 'quantity', kind: 'time', bare: hours, show: hours, default: 3 * HOUR_S, min: 0, max: 1000 * DAY_S,
    rangeNote: 'up to 1000 days (no source); longer than half the period runs with a note', meaning: 'out-of-transit time observed on each side of a transit' },
  { path: 'observation.duty_cycle', type: 'number', default: 1, min: 0, minExclusive: true, max: 1, meaning: 'fraction of each window actually observed (random gaps)' },
  { path: 'observation.gap_length', type: 'quantity', kind: 'time', bare: minutes, show: minutes, default: 20 * MINUTE_S, min: 0, minExclusive: true, meaning: 'mean length of a gap (with duty_cycle < 1)' },
  { path: 'observation.missed_fraction', type: 'number', default: 0, min: 0, max: 0.95, meaning: 'probability that a whole transit is lost (weather, scheduling)' },

  { path: 'detection', type: 'mapping', defaultText: 'defaults', meaning: 'detection threshold' },
  { path: 'detection.false_alarm', type: 'quantity', kind: 'fraction', bare: fraction, show: [1e-2, '%'], default: 0.01, min: 0, minExclusive: true, max: 0.5,
    meaning: 'false-alarm probability per channel at which a moon counts as detected' },
  { path: 'detection.calibration', type: 'choice', choices: ['tail', 'order_statistic'], default: 'tail',
    meaning: 'how thresholds are set from the no-moon realizations: tail, a generalised Pareto fit of their upper tail (Knijnenburg et al. 2009; needs ⌈15/α⌉ of them by default); order_statistic, the distribution-free order statistic (⌈25/α⌉ by default)' },

  // Where and when (issue 18): read by src/scenario/readSky.ts. Latitude and altitude bounds are
  // definitions and common practice (no source); the campaign's years are those of the leap-second table.
  { path: 'planet.period_error', type: 'quantity', kind: 'time', bare: days, show: days, default: 0, min: 0, max: 10 * DAY_S,
    meaning: '1σ uncertainty of the period (widens the predicted mid-times of `moonsieve calendar`)' },
  { path: 'observation.t0_error', type: 'quantity', kind: 'time', bare: days, show: minutes, default: 0, min: 0, max: 10 * DAY_S,
    meaning: '1σ uncertainty of t0 (widens the predicted mid-times of `moonsieve calendar`)' },
  { path: 'site', type: 'mapping', defaultText: 'none', meaning: 'the observing site; a list of sites (each with a name) makes a network. With target and campaign, sweep and simulate observe only the observable parts of the campaign\'s transits (partial transits included) at each site, each exposure with the ground budget at its own air mass (instrument.ground: extinction, scintillation at the site\'s height; a stated noise level is used as is), each site\'s nights lost to weather (constraints.clear_fraction); a transit seen from several sites has each site\'s own data and noise. Space instruments: use `visibility` instead (not both)' },
  { path: 'site.name', type: 'text', default: 'site', meaning: 'name of the site in tables (required to tell the sites of a list apart)' },
  { path: 'site.latitude', noun: 'a latitude', type: 'quantity', kind: 'angle', bare: degrees, show: degrees, required: 'with site', min: -Math.PI / 2, max: Math.PI / 2, meaning: 'geodetic latitude, north positive' },
  { path: 'site.longitude', noun: 'a longitude', type: 'quantity', kind: 'angle', bare: degrees, show: degrees, required: 'with site', min: -Math.PI, max: 2 * Math.PI, meaning: 'longitude, east positive (west negative)' },
  { path: 'site.altitude', noun: 'a height', type: 'quantity', kind: 'length', bare: metres, show: metres, default: 0, min: -500, max: 6000, meaning: 'height above the WGS 84 ellipsoid' },
  { path: 'target', type: 'mapping', defaultText: 'none', meaning: 'the star\'s position, ICRS (J2000)' },
  { path: 'target.ra', noun: 'a right ascension', type: 'quantity', kind: 'angle', bare: degrees, show: degrees, required: 'with target', min: 0, max: 2 * Math.PI, maxExclusive: true,
    rangeNote: 'or sexagesimal hours "08:41:12.5" / "08 41 12.5" / "8h41m12.5s"', meaning: 'right ascension' },
  { path: 'target.dec', noun: 'a declination', type: 'quantity', kind: 'angle', bare: degrees, show: degrees, required: 'with target', min: -Math.PI / 2, max: Math.PI / 2,
    rangeNote: 'or sexagesimal degrees "-12:33:10" / "-12 33 10" / "-12d33m10s"', meaning: 'declination' },
  { path: 'campaign', type: 'mapping', defaultText: 'none', meaning: 'when the target is watched (`moonsieve calendar`)' },
  { path: 'campaign.start', type: 'text', required: 'with campaign', rangeNote: 'a UTC date "2027-01-01" (its 00:00) or ISO date-time "2027-01-01T18:00:00Z", 1972–2099',
    meaning: 'first instant of the campaign' },
  { path: 'campaign.end', type: 'text', required: 'with campaign', rangeNote: 'a UTC date "2028-12-31" (through its 24:00) or ISO date-time, after start, at most 100 years later',
    meaning: 'last instant of the campaign' },
  // A space instrument's visibility (issue 18, item 1): read by src/scenario/readVisibility.ts; the
  // pattern is a stated schedule, so its bounds are common practice (no source).
  { path: 'visibility', type: 'mapping', defaultText: 'none', meaning: 'a space instrument\'s periodic visibility of the target, instead of site and constraints: visible for `on`, hidden for `off`, repeating from `start` (as for a low orbit), optionally only inside observing blocks of `block` separated by `gap`. With campaign (target optional), `moonsieve calendar`, sweep, simulate and budget observe only the visible parts of the campaign\'s transits, every exposure at the instrument\'s stated noise, no weather. On the BJD_TDB axis; leaves out Earth, Sun and Moon avoidance angles, the South Atlantic Anomaly and momentum dumps: state them in `on`/`off` if they matter' },
  { path: 'visibility.name', type: 'text', default: 'space', meaning: 'name of the instrument in tables' },
  { path: 'visibility.on', noun: 'a visible time', type: 'quantity', kind: 'time', bare: minutes, show: minutes, required: 'with visibility', min: 0, minExclusive: true, max: 1000 * DAY_S,
    meaning: 'how long the target stays visible in each cycle' },
  { path: 'visibility.off', noun: 'a hidden time', type: 'quantity', kind: 'time', bare: minutes, show: minutes, default: 0, min: 0, max: 1000 * DAY_S,
    meaning: 'how long it is then hidden (0: always visible); the cycle is on + off' },
  { path: 'visibility.start', type: 'text', defaultText: 'campaign.start', rangeNote: 'a BJD_TDB in days (2461041.5) or a date "2027-01-01" / ISO date-time "2027-01-01T03:20:00Z" (taken as TDB: a phase reference), 1972–2099',
    meaning: 'an instant at which a visible part (and a block) begins; the pattern repeats both ways from it' },
  { path: 'visibility.block', noun: 'a block length', type: 'quantity', kind: 'time', bare: days, show: days, defaultText: 'none (no blocks)', min: 0, minExclusive: true, max: 1e5 * DAY_S,
    meaning: 'length of an observing block: the instrument watches the target only inside blocks' },
  { path: 'visibility.gap', noun: 'a gap between blocks', type: 'quantity', kind: 'time', bare: days, show: days, defaultText: 'required with block', min: 0, max: 1e5 * DAY_S,
    meaning: 'time between the end of one block and the start of the next' },
  { path: 'constraints', type: 'mapping', defaultText: 'defaults', meaning: 'when the target counts as observable' },
  { path: 'constraints.sun_altitude', noun: 'an altitude of the Sun', type: 'quantity', kind: 'angle', bare: degrees, show: degrees, default: -12 * DEG, min: -Math.PI / 2, max: 0,
    meaning: 'the Sun\'s centre must be below this geometric altitude (−12: nautical twilight, −18: astronomical)' },
  { path: 'constraints.airmass', noun: 'an air mass', type: 'number', default: 2, min: 1, max: 10, rangeNote: 'air mass by Kasten & Young (1989), valid to the horizon', meaning: 'largest air mass of the target' },
  { path: 'constraints.clear_fraction', noun: 'a fraction of nights', type: 'number', default: 1, min: 0, minExclusive: true, max: 1, meaning: 'chance that a night at a site is usable (weather); sweep and simulate draw it per site and local noon-to-noon night, seeded per (seed, cell, realization)' },
];

const BY_PATH: ReadonlyMap<string, ScenarioField> = new Map(SCENARIO_FIELDS.map((f) => [f.path, f]));

/** The table entry of a dotted path, or undefined. */
export function scenarioField(path: string): ScenarioField | undefined {
  return BY_PATH.get(path);
}

/**
 * Turns a scenario document (already parsed from YAML into plain values)
 * into a validated, SI-unit `Scenario`. Every problem is reported at once,
 * each naming its path, the value and what is allowed.
 *
 * Schema (bare numbers are read in the unit given in brackets):
 *   name, seed (integer ≥ 0)
 *   star:   mass, radius, teff [K], age (default 5 Gyr), luminosity (optional,
 *           default σ_SB 4πR²T⁴), limb_darkening: {u1, u2} or {q1, q2}
 *   planet: mass, radius, period [d], eccentricity (0), periastron [deg] (90),
 *           impact_parameter or inclination [deg] (default b = 0), albedo (0.3),
 *           love_number (0.5), tidal_q (1e5)
 *   moon:   mass, radius or density, separation (length, or "N Rp" planet
 *           radii, or "f hill" fraction of the Hill radius a(M_P/3M*)^{1/3}),
 *           eccentricity (0), inclination [deg] (0), node [deg] (0),
 *           periapsis [deg] (0), phase [deg] (0), direction prograde|retrograde,
 *           albedo (0.3), love_number (0.3), tidal_q (100)
 *   instrument: cadence [min], exposure [min] (default = cadence),
 *           noise ("200 ppm per 1 h"), or ground: {aperture, magnitude, throughput,
 *           airmass, altitude, scintillation_coefficient, floor} (Osborn et al. 2015
 *           scintillation, photon noise, floor), red_noise: {model: power_law,
 *           amplitude: "150 ppm per 30 min", slope} or {model: drw, amplitude, timescale}
 *   observation: transits (integer ≥ 1), t0 [BJD_TDB days] (2461000.0),
 *           baseline [h] (3 h out of transit on each side), duty_cycle (1),
 *           gap_length [min] (20 min), missed_fraction (0)
 *   detection: false_alarm (fraction, default 1 %): false-alarm probability per channel
 */
import { DAY_S, HOUR_S, JULIAN_YEAR_S, MINUTE_S, SIGMA_SB } from '../physics/constants.js';
import { hillRadius } from '../physics/hillRadius.js';
import { semiMajorAxis } from '../physics/keplerThirdLaw.js';
import { impactParameter, inclinationFromImpact } from '../physics/transitDuration.js';
import { isPhysicalQuadratic, uFromQ } from '../photometry/kippingLimbDarkening.js';
import { InputError, type FieldProblem } from './errors.js';
import { FieldReader } from './fieldReader.js';
import { parseQuantity, splitNumberUnit } from './units.js';
import { groundNoiseBudget } from '../noise/groundBudget.js';
import type { DetectionSpec, GroundSpec, InstrumentSpec, RedNoiseSpec, MoonSpec, ObservationSpec, PlanetSpec, Scenario, StarSpec } from './types.js';

const DEG = Math.PI / 180;

/** Keys reserved for later stages (read by their own parsers). */
export const EXTRA_TOP_LEVEL_KEYS: readonly string[] = ['sweep', 'budget'];

export function parseScenario(doc: unknown, source = 'scenario'): Scenario {
  const problems: FieldProblem[] = [];
  const top = new FieldReader(doc, '', problems);
  const name = top.string('name', 'unnamed');
  const seed = top.number('seed', { default: 1, min: 0, max: 2 ** 32 - 1, integer: true, rangeText: 'expected an integer from 0 to 4294967295' });

  const star = readStar(new FieldReader(top.raw('star'), 'star', problems));
  if (!top.has('star')) problems.push({ path: 'star', value: undefined, allowed: 'required: the host star (mass, radius, teff, limb_darkening)' });
  const planetReader = new FieldReader(top.raw('planet'), 'planet', problems);
  if (!top.has('planet')) problems.push({ path: 'planet', value: undefined, allowed: 'required: the transiting planet (mass, radius, period)' });
  const moonRaw = top.raw('moon');
  const planet = readPlanet(planetReader, star, peekMoonMass(moonRaw));
  const moon = moonRaw === undefined || moonRaw === null ? null : readMoon(new FieldReader(moonRaw, 'moon', problems), star, planet);
  const instrument = readInstrument(new FieldReader(top.raw('instrument'), 'instrument', problems));
  if (!top.has('instrument')) problems.push({ path: 'instrument', value: undefined, allowed: 'required: cadence and noise' });
  const observation = readObservation(new FieldReader(top.raw('observation'), 'observation', problems));
  if (!top.has('observation')) problems.push({ path: 'observation', value: undefined, allowed: 'required: transits' });
  const detection = readDetection(new FieldReader(top.raw('detection'), 'detection', problems));
  top.rejectUnknown(EXTRA_TOP_LEVEL_KEYS);

  if (problems.length > 0) throw new InputError(dedupe(problems), source);
  return { name, seed, star, planet, moon, instrument, observation, detection };
}

function allFinite(...xs: number[]): boolean {
  return xs.every(Number.isFinite);
}

function dedupe(problems: FieldProblem[]): FieldProblem[] {
  const seen = new Set<string>();
  return problems.filter((p) => {
    const k = p.path + '|' + p.allowed;
    if (seen.has(k)) return false;
    seen.add(k);
    return true;
  });
}

export function readStar(r: FieldReader): StarSpec {
  const massKg = r.quantity('mass', 'mass', { min: 0, minExclusive: true, rangeText: 'must be a positive mass' });
  const radiusM = r.quantity('radius', 'length', { min: 0, minExclusive: true, rangeText: 'must be a positive length' });
  const teffK = r.quantity('teff', 'temperature', { bare: [1, 'K'], min: 1000, max: 60000, rangeText: 'expected an effective temperature from 1000 K to 60000 K' });
  const ageS = r.quantity('age', 'time', { default: 5e9 * JULIAN_YEAR_S, min: 0, minExclusive: true, rangeText: 'must be a positive time' });
  const given = r.quantity('luminosity', 'power', { required: false, min: 0, minExclusive: true, rangeText: 'must be a positive power' });
  // Stefan–Boltzmann law: L = 4πR²σT⁴.
  const luminosityW = Number.isFinite(given) ? given : 4 * Math.PI * radiusM * radiusM * SIGMA_SB * teffK ** 4;
  const ld = new FieldReader(r.raw('limb_darkening'), 'star.limb_darkening', r.problems);
  let u1 = Number.NaN;
  let u2 = Number.NaN;
  if (!r.has('limb_darkening')) {
    r.problem('limb_darkening', undefined, 'required: quadratic coefficients {u1, u2} or Kipping (2013) {q1, q2}');
  } else if (ld.has('q1') || ld.has('q2')) {
    const q1 = ld.number('q1', { min: 0, max: 1 });
    const q2 = ld.number('q2', { min: 0, max: 1 });
    ({ u1, u2 } = uFromQ(q1, q2));
    if (ld.has('u1') || ld.has('u2')) ld.problem('u1', ld.raw('u1') ?? ld.raw('u2'), 'give either u1, u2 or q1, q2, not both');
  } else {
    u1 = ld.number('u1');
    u2 = ld.number('u2');
    if (Number.isFinite(u1) && Number.isFinite(u2) && !isPhysicalQuadratic(u1, u2)) {
      r.problem('limb_darkening', { u1, u2 }, 'unphysical quadratic limb darkening: need u1 + u2 ≤ 1, u1 ≥ 0, u1 + 2·u2 ≥ 0 (Kipping 2013)');
    }
  }
  ld.rejectUnknown();
  r.rejectUnknown();
  return { massKg, radiusM, teffK, ageS, u1, u2, luminosityW };
}

/** The moon's mass if it parses (0 otherwise); its errors are reported by readMoon. */
function peekMoonMass(moonRaw: unknown): number {
  if (!moonRaw || typeof moonRaw !== 'object') return 0;
  try {
    const m = parseQuantity((moonRaw as Record<string, unknown>).mass, 'moon.mass', 'mass');
    return m > 0 ? m : 0;
  } catch {
    return 0;
  }
}

export function readPlanet(r: FieldReader, star: StarSpec, moonMassKg: number): PlanetSpec {
  const massKg = r.quantity('mass', 'mass', { min: 0, minExclusive: true, rangeText: 'must be a positive mass' });
  const radiusM = r.quantity('radius', 'length', { min: 0, minExclusive: true, rangeText: 'must be a positive length' });
  const periodS = r.quantity('period', 'time', { bare: [DAY_S, 'days'], min: 0, minExclusive: true, rangeText: 'must be a positive time' });
  const eccentricity = r.number('eccentricity', { default: 0, min: 0, max: 0.9, rangeText: 'expected an eccentricity from 0 to 0.9' });
  const omegaRad = r.quantity('periastron', 'angle', { bare: [DEG, 'degrees'], default: Math.PI / 2 });
  const albedo = r.number('albedo', { default: 0.3, min: 0, max: 1 });
  const k2 = r.number('love_number', { default: 0.5, min: 0, minExclusive: true, max: 1.5 });
  const tidalQ = r.number('tidal_q', { default: 1e5, min: 1 });
  // Semi-major axis of the barycentre orbit from Kepler's third law, with the moon's mass.
  const total = star.massKg + massKg + moonMassKg;
  const semiMajorAxisM = Number.isFinite(periodS + total) ? semiMajorAxis(periodS, total) : Number.NaN;
  const aOverR = semiMajorAxisM / star.radiusM;
  let impact = Number.NaN;
  let incl = Number.NaN;
  if (r.has('impact_parameter') && r.has('inclination')) {
    r.problem('inclination', r.raw('inclination'), 'give either impact_parameter or inclination, not both');
    r.raw('impact_parameter');
  } else if (r.has('inclination')) {
    incl = r.quantity('inclination', 'angle', { bare: [DEG, 'degrees'], min: 0, max: Math.PI, rangeText: 'expected an inclination from 0 to 180 deg' });
    if (allFinite(aOverR, incl, eccentricity, omegaRad)) impact = Math.abs(impactParameter(aOverR, incl, eccentricity, omegaRad));
  } else {
    impact = r.number('impact_parameter', { default: 0, min: 0, rangeText: 'expected an impact parameter ≥ 0 (stellar radii)' });
    const bMax = (aOverR * (1 - eccentricity * eccentricity)) / (1 + eccentricity * Math.sin(omegaRad));
    if (allFinite(aOverR, impact, eccentricity, omegaRad) && impact < bMax) incl = inclinationFromImpact(impact, aOverR, eccentricity, omegaRad);
  }
  const p = radiusM / star.radiusM;
  if (Number.isFinite(impact) && Number.isFinite(p) && impact >= 1 + p) {
    r.problem(r.has('inclination') ? 'inclination' : 'impact_parameter', r.raw(r.has('inclination') ? 'inclination' : 'impact_parameter'),
      `the planet would not transit: impact parameter ${impact.toFixed(3)} must be below 1 + Rp/R* = ${(1 + p).toFixed(3)}`);
  }
  r.rejectUnknown();
  return { massKg, radiusM, periodS, eccentricity, omegaRad, inclinationRad: incl, impactParameter: impact, semiMajorAxisM, albedo, k2, tidalQ };
}

function readMoon(r: FieldReader, star: StarSpec, planet: PlanetSpec): MoonSpec {
  const massKg = r.quantity('mass', 'mass', { min: 0, minExclusive: true, rangeText: 'must be a positive mass' });
  let radiusM = Number.NaN;
  if (r.has('radius') && r.has('density')) {
    r.problem('density', r.raw('density'), 'give either radius or density, not both');
    r.raw('radius');
  } else if (r.has('density')) {
    const rho = r.quantity('density', 'density', { min: 0, minExclusive: true, rangeText: 'must be a positive density' });
    radiusM = Math.cbrt((3 * massKg) / (4 * Math.PI * rho));
  } else {
    radiusM = r.quantity('radius', 'length', { min: 0, minExclusive: true, rangeText: 'required: radius (a length) or density (e.g. "3 g/cm^3")' });
  }
  const separationM = readSeparation(r, star, planet, massKg);
  const eccentricity = r.number('eccentricity', { default: 0, min: 0, max: 0.9, rangeText: 'expected an eccentricity from 0 to 0.9' });
  const inclinationRad = r.quantity('inclination', 'angle', { bare: [DEG, 'degrees'], default: 0, min: 0, max: Math.PI, rangeText: 'expected an inclination to the planet orbit from 0 to 180 deg' });
  const nodeRad = r.quantity('node', 'angle', { bare: [DEG, 'degrees'], default: 0 });
  const periapsisRad = r.quantity('periapsis', 'angle', { bare: [DEG, 'degrees'], default: 0 });
  const phaseRad = r.quantity('phase', 'angle', { bare: [DEG, 'degrees'], default: 0 });
  const retrograde = r.choice('direction', ['prograde', 'retrograde'] as const, 'prograde') === 'retrograde';
  const albedo = r.number('albedo', { default: 0.3, min: 0, max: 1 });
  const k2 = r.number('love_number', { default: 0.3, min: 0, minExclusive: true, max: 1.5 });
  const tidalQ = r.number('tidal_q', { default: 100, min: 1 });
  if (Number.isFinite(separationM) && Number.isFinite(radiusM) && separationM <= planet.radiusM + radiusM) {
    r.problem('separation', r.raw('separation'), `the moon would touch the planet: separation must exceed planet radius + moon radius = ${((planet.radiusM + radiusM) / 1e3).toFixed(0)} km`);
  }
  r.rejectUnknown();
  return { massKg, radiusM, separationM, eccentricity, inclinationRad, nodeRad, periapsisRad, phaseRad, retrograde, albedo, k2, tidalQ };
}

function readSeparation(r: FieldReader, star: StarSpec, planet: PlanetSpec, moonMassKg: number): number {
  const raw = r.raw('separation');
  const allowed = 'expected a length ("1e9 m", "0.01 AU"), planet radii ("12 Rp") or a fraction of the Hill radius ("0.2 hill")';
  if (raw === undefined || raw === null) {
    r.problem('separation', raw, 'required: ' + allowed);
    return Number.NaN;
  }
  if (typeof raw === 'string') {
    const nu = splitNumberUnit(raw);
    if (nu && (nu.unit === 'Rp' || nu.unit === 'hill')) {
      if (!(nu.num > 0)) {
        r.problem('separation', raw, 'must be positive; ' + allowed);
        return Number.NaN;
      }
      if (nu.unit === 'Rp') return nu.num * planet.radiusM;
      // Hill radius of the circular orbit, R_H = a (M_P / 3 M*)^{1/3} (Hamilton & Burns 1992).
      return nu.num * hillRadius(planet.semiMajorAxisM, planet.massKg + moonMassKg, star.massKg);
    }
  }
  try {
    const m = parseQuantity(raw, 'moon.separation', 'length');
    if (!(m > 0)) throw new Error('not positive');
    return m;
  } catch {
    r.problem('separation', raw, allowed);
    return Number.NaN;
  }
}

function readInstrument(r: FieldReader): InstrumentSpec {
  const cadenceS = r.quantity('cadence', 'time', { bare: [MINUTE_S, 'minutes'], min: 0, minExclusive: true, rangeText: 'must be a positive time' });
  const exposureS = r.quantity('exposure', 'time', { bare: [MINUTE_S, 'minutes'], default: cadenceS, min: 0, minExclusive: true, rangeText: 'must be a positive time' });
  if (Number.isFinite(exposureS) && Number.isFinite(cadenceS) && exposureS > cadenceS * (1 + 1e-12)) {
    r.problem('exposure', r.raw('exposure'), `the exposure cannot be longer than the cadence (${cadenceS / MINUTE_S} min)`);
  }
  let noiseFraction = Number.NaN;
  let noiseTimescaleS = Number.NaN;
  let ground: GroundSpec | null = null;
  const noiseAllowed = 'expected a white-noise level with its timescale, e.g. "200 ppm per 1 h" or "800 ppm per 2 min"';
  if (r.has('ground')) {
    if (r.has('noise')) r.problem('noise', r.raw('noise'), 'give either noise or a ground budget (instrument.ground), not both');
    ground = readGround(new FieldReader(r.raw('ground'), 'instrument.ground', r.problems), exposureS, cadenceS);
    noiseFraction = ground ? ground.terms.total : Number.NaN;
    noiseTimescaleS = exposureS;
  } else if (!r.has('noise')) {
    r.problem('noise', r.raw('noise'), `required: ${noiseAllowed}, or a ground budget (instrument.ground)`);
  } else {
    ({ fraction: noiseFraction, timescaleS: noiseTimescaleS } = readLevelPer(r, 'noise', noiseAllowed, exposureS));
  }
  const redNoise = r.has('red_noise') ? readRedNoise(new FieldReader(r.raw('red_noise'), 'instrument.red_noise', r.problems)) : (r.raw('red_noise'), null);
  r.rejectUnknown();
  return { cadenceS, exposureS, noiseFraction, noiseTimescaleS, redNoise, ground };
}

/** A level stated at a timescale: "200 ppm per 1 h", or a bare fraction (then `fallbackTimescaleS`). */
function readLevelPer(r: FieldReader, key: string, allowed: string, fallbackTimescaleS: number): { fraction: number; timescaleS: number } {
  const raw = r.raw(key);
  if (typeof raw === 'string' && /\sper\s/.test(raw)) {
    const [level, scale] = raw.split(/\s+per\s+/);
    try {
      const fraction = parseQuantity(level, r.path(key), 'fraction');
      const timescaleS = parseQuantity(scale, r.path(key), 'time');
      if (!(fraction >= 0) || !(timescaleS > 0)) throw new Error('range');
      return { fraction, timescaleS };
    } catch {
      r.problem(key, raw, allowed);
      return { fraction: Number.NaN, timescaleS: Number.NaN };
    }
  }
  const fraction = r.quantity(key, 'fraction', { min: 0, rangeText: allowed });
  return { fraction, timescaleS: fallbackTimescaleS };
}

function readRedNoise(r: FieldReader): RedNoiseSpec | null {
  const model = r.choice('model', ['power_law', 'drw'] as const, 'power_law');
  if (!r.has('model')) r.problem('model', undefined, 'required: "power_law" (Timmer & König 1995) or "drw" (damped random walk)');
  if (model === 'power_law') {
    const { fraction, timescaleS } = readLevelPer(r, 'amplitude', 'expected the rms of the red noise averaged over a timescale, e.g. "150 ppm per 30 min"', Number.NaN);
    if (!Number.isFinite(timescaleS) && Number.isFinite(fraction)) r.problem('amplitude', r.raw('amplitude'), 'state the averaging timescale, e.g. "150 ppm per 30 min"');
    const beta = r.number('slope', { default: 1, min: 0, max: 4, rangeText: 'expected a spectral slope β from 0 to 4 (S ∝ f^−β)' });
    r.rejectUnknown();
    return { model, rmsFraction: fraction, timescaleS, beta };
  }
  const rmsFraction = r.quantity('amplitude', 'fraction', { min: 0, rangeText: 'expected the stationary rms, e.g. "200 ppm"' });
  const tauS = r.quantity('timescale', 'time', { bare: [MINUTE_S, 'minutes'], min: 0, minExclusive: true, rangeText: 'expected the damping timescale τ, e.g. "45 min"' });
  r.rejectUnknown();
  return { model, rmsFraction, tauS };
}

function readGround(r: FieldReader, exposureS: number, cadenceS: number): GroundSpec | null {
  const apertureM = r.quantity('aperture', 'length', { min: 0, minExclusive: true, rangeText: 'expected the telescope aperture diameter, e.g. "1.5 m"' });
  const magnitude = r.number('magnitude', { min: -2, max: 25, rangeText: 'expected the star\'s V magnitude, e.g. 11.2' });
  const throughput = r.number('throughput', { default: 0.4, min: 0, minExclusive: true, max: 1, rangeText: 'expected the total throughput (atmosphere, optics, detector) in (0, 1]' });
  const airmass = r.number('airmass', { default: 1.3, min: 1, max: 5, rangeText: 'expected an airmass from 1 to 5' });
  const altitudeM = r.quantity('altitude', 'length', { bare: [1, 'metres'], default: 2000, min: 0, max: 6000, rangeText: 'expected the site altitude, e.g. "2400 m"' });
  const scintillationCoefficient = r.number('scintillation_coefficient', { default: 1.5, min: 0, max: 5, rangeText: 'expected the Osborn et al. (2015) site coefficient C_Y, typically 1.3–1.7' });
  let floorFraction = 0;
  let floorTimescaleS = HOUR_S;
  if (r.has('floor')) ({ fraction: floorFraction, timescaleS: floorTimescaleS } = readLevelPer(r, 'floor', 'expected a systematic floor with its timescale, e.g. "300 ppm per 1 min"', exposureS));
  r.rejectUnknown();
  if (![apertureM, magnitude, throughput, airmass, altitudeM, scintillationCoefficient, floorFraction, floorTimescaleS, exposureS, cadenceS].every(Number.isFinite)) return null;
  const b = groundNoiseBudget({
    apertureDiameterM: apertureM,
    magnitude,
    throughput,
    exposureS,
    cadenceS,
    scintillation: { model: 'osborn2015', airmass, altitudeM, cY: scintillationCoefficient },
    floor: floorFraction > 0 ? { fraction: floorFraction, timescaleS: floorTimescaleS } : undefined,
  });
  const e = b.perExposure;
  return {
    apertureM, magnitude, throughput, airmass, altitudeM, scintillationCoefficient, floorFraction, floorTimescaleS,
    terms: { photon: e.photon, scintillation: e.scintillation, floor: e.floor, total: e.total, dominant: b.dominantTerm },
  };
}

function readObservation(r: FieldReader): ObservationSpec {
  const transits = r.number('transits', { integer: true, min: 1, max: 10000, rangeText: 'expected a whole number of transits from 1 to 10000' });
  const t0BjdTdb = r.number('t0', { default: 2461000.0, min: 0, rangeText: 'expected a BJD_TDB in days, e.g. 2461000.25' });
  const baselineS = r.quantity('baseline', 'time', { bare: [HOUR_S, 'hours'], default: 3 * HOUR_S, min: 0, rangeText: 'must be a time ≥ 0' });
  const dutyCycle = r.number('duty_cycle', { default: 1, min: 0, minExclusive: true, max: 1, rangeText: 'expected the observed fraction of each window, above 0 and at most 1' });
  const gapLengthS = r.quantity('gap_length', 'time', { bare: [MINUTE_S, 'minutes'], default: 20 * MINUTE_S, min: 0, minExclusive: true, rangeText: 'expected the mean length of a gap, e.g. "20 min"' });
  const missedFraction = r.number('missed_fraction', { default: 0, min: 0, max: 0.95, rangeText: 'expected the fraction of transits lost (weather, scheduling), from 0 to 0.95' });
  r.rejectUnknown();
  return { transits, t0BjdTdb, baselineS, dutyCycle, gapLengthS, missedFraction };
}

function readDetection(r: FieldReader): DetectionSpec {
  const falseAlarm = r.quantity('false_alarm', 'fraction', { bare: [1, 'a fraction'], default: 0.01, min: 0, minExclusive: true, max: 0.5, rangeText: 'expected a false-alarm probability above 0 and at most 0.5, e.g. "1 %" or 0.01' });
  r.rejectUnknown();
  return { falseAlarm };
}

/** Mass of the planet plus moon (the barycentre's mass), kg. */
export function barycentreMass(s: Scenario): number {
  return s.planet.massKg + (s.moon ? s.moon.massKg : 0);
}


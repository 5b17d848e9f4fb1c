/**
 * Turns a scenario document (already parsed from YAML into plain values)
 * into a validated, SI-unit `Scenario`. Every problem is reported at once,
 * each naming its path, the value and what is allowed.
 *
 * Every field, its default, range and bare-number unit is in the field table
 * (fields.ts), which this file reads through `FieldReader.field`, and in
 * docs/scenario-reference.md, generated from it. Here: the rules between
 * fields (radius or density, transits or duration, noise or ground, the
 * planet smaller than its star, the planet transiting, the moon clear of the
 * planet) and the cautions on odd but legal inputs.
 */
import { DAY_S, G, HOUR_S, M_SUN_KG, MINUTE_S, SIGMA_SB } from '../physics/constants.js';
import { chenKippingRadius } from '../physics/massRadius.js';
import { hillRadius } from '../physics/hillRadius.js';
import { semiMajorAxis } from '../physics/keplerThirdLaw.js';
import { impactParameter, inclinationFromImpact } from '../physics/transitDuration.js';
import { isPhysicalQuadratic, uFromQ } from '../photometry/kippingLimbDarkening.js';
import { InputError, type FieldProblem } from './errors.js';
import { FieldReader } from './fieldReader.js';
import { readSky, SITE_CALENDAR_ONLY } from './readSky.js';
import { VISIBILITY_CALENDAR_ONLY } from './readVisibility.js';
import { formatNumber, parseQuantity, splitNumberUnit, writtenUnit } from './units.js';
import { bandZeroPointPhotons, groundNoiseBudget } from '../noise/groundBudget.js';
import type {
  DetectionSpec, GroundSpec, InstrumentSpec, RedNoiseSpec, MoonSpec, ObservationSpec, PlanetSpec, Scenario, ScenarioCaution, ScenarioDocument, StarSpec,
} from './types.js';

const DEG = Math.PI / 180;

/** Keys reserved for later stages (read by their own parsers). */
export const EXTRA_TOP_LEVEL_KEYS: readonly string[] = ['sweep', 'budget'];

/** Keys renamed in this release: old → new (the old one is read, with a caution, for one release). */
export const PLANET_RENAMES: ReadonlyArray<[string, string]> = [['periastron', 'periapsis']];

/**
 * A block with its old key names moved to the new ones, one caution per old key met; both
 * spellings at once is a problem. Anything not a mapping is returned as is (the reader reports it).
 */
export function renamedKeys(raw: unknown, block: string, renames: ReadonlyArray<[string, string]>, problems: FieldProblem[], cautions: ScenarioCaution[]): unknown {
  if (raw === null || typeof raw !== 'object' || Array.isArray(raw)) return raw;
  let out = raw as Record<string, unknown>;
  for (const [old, now] of renames) {
    if (out[old] === undefined) continue;
    if (out[now] !== undefined) {
      problems.push({ path: `${block}.${old}`, value: out[old], allowed: `give ${block}.${now} only (${block}.${old} is its old name)` });
    } else {
      cautions.push({ path: `${block}.${old}`, message: `deprecated name: write ${block}.${now} (the old name is accepted in this release only)` });
    }
    const { [old]: value, ...rest } = out;
    out = out[now] !== undefined ? rest : { ...rest, [now]: value };
  }
  return out;
}

/** How `parseScenario` treats a moon whose disc would touch the planet's. */
export interface ParseOptions {
  /**
   * 'error' (the default): an input error, as for any single scenario. 'label': accepted and marked
   * (`moon.touchesPlanet`), for the cells of a sweep grid, where such a moon is a physical verdict
   * on that cell ("touches the planet", not simulated) rather than a mistake in the input.
   */
  moonContact?: 'error' | 'label';
}

export function parseScenario(doc: unknown, source = 'scenario', options: ParseOptions = {}): Scenario {
  const problems: FieldProblem[] = [];
  const cautions: ScenarioCaution[] = [];
  const top = new FieldReader(doc, '', problems);
  // A document that is not a mapping: that one problem, not one per missing field.
  if (problems.length > 0) throw new InputError(problems, source);
  const name = top.string('name', 'unnamed');
  const seed = top.field('seed');

  const star = readStar(new FieldReader(top.raw('star'), 'star', problems));
  if (!top.has('star')) problems.push({ path: 'star', value: undefined, allowed: 'required: the host star (mass, radius, teff, limb_darkening)' });
  const planetReader = new FieldReader(renamedKeys(top.raw('planet'), 'planet', PLANET_RENAMES, problems, cautions), 'planet', problems);
  const periodErrorS = planetReader.field('period_error'); // ephemeris uncertainty, for the calendar (readSky.ts)
  if (!top.has('planet')) problems.push({ path: 'planet', value: undefined, allowed: 'required: the transiting planet (mass, radius, period)' });
  const moonRaw = top.raw('moon');
  const planet = readPlanet(planetReader, star, peekMoonMass(moonRaw));
  const moon = moonRaw === undefined || moonRaw === null ? null : readMoon(new FieldReader(moonRaw, 'moon', problems), star, planet, cautions, options.moonContact === 'label');
  const instrument = readInstrument(new FieldReader(top.raw('instrument'), 'instrument', problems));
  if (!top.has('instrument')) problems.push({ path: 'instrument', value: undefined, allowed: 'required: cadence and noise' });
  const observationReader = new FieldReader(top.raw('observation'), 'observation', problems);
  const t0ErrorS = observationReader.field('t0_error'); // ephemeris uncertainty, for the calendar (readSky.ts)
  const observation = readObservation(observationReader, planet.periodS, cautions);
  if (!top.has('observation')) problems.push({ path: 'observation', value: undefined, allowed: 'required: transits or duration' });
  const detection = readDetection(new FieldReader(top.raw('detection'), 'detection', problems));
  const sky = readSky(top, periodErrorS, t0ErrorS);
  top.rejectUnknown(EXTRA_TOP_LEVEL_KEYS);

  // A missing block is one problem, not one more per field it would hold.
  const missing = ['star', 'planet', 'instrument', 'observation'].filter((k) => !top.has(k));
  const kept = problems.filter((p) => !missing.some((k) => p.path.startsWith(k + '.')));
  if (kept.length > 0) throw new InputError(dedupe(kept), source);
  const scenario: Scenario = { name, seed, star, planet, moon, instrument, observation, detection };
  if (sky) scenario.sky = sky;
  if (sky && sky.sites.length > 0) cautions.push({ path: 'site', message: SITE_CALENDAR_ONLY });
  if (sky?.visibility && sky.campaign) cautions.push({ path: 'visibility', message: VISIBILITY_CALENDAR_ONLY });
  // Not enumerable: the cautions are messages, not part of the model, so they stay out of the
  // canonical JSON that seeds and identifies the no-moon sets (sweep/nullSet.ts) and out of copies.
  Object.defineProperty(scenario, 'cautions', { value: cautions, enumerable: false, writable: true, configurable: true });
  // Not enumerable either: how the values were written, for varying the scenario (Scenario.document).
  Object.defineProperty(scenario, 'document', { value: structuredClone(doc) as ScenarioDocument, enumerable: false, writable: true, configurable: true });
  return scenario;
}

/** The scenario's cautions as "path: message" texts, for a command's list of notes. */
export function cautionNotes(s: Scenario): string[] {
  return (s.cautions ?? []).map((c) => `${c.path}: ${c.message}`);
}

/** The scenario's cautions as "note:" lines for stderr ('' when none). */
export function formatCautions(s: Scenario): string {
  return cautionNotes(s).map((n) => `note: ${n}\n`).join('');
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
  const massKg = r.field('mass');
  const radiusM = r.field('radius');
  const teffK = r.field('teff');
  const ageS = r.field('age');
  const given = r.field('luminosity', { required: false });
  // Stefan–Boltzmann law: L = 4πR²σT⁴.
  const luminosityW = Number.isFinite(given) ? given : 4 * Math.PI * radiusM * radiusM * SIGMA_SB * teffK ** 4;
  const ld = new FieldReader(r.raw('limb_darkening'), 'star.limb_darkening', r.problems);
  let u1 = Number.NaN;
  let u2 = Number.NaN;
  if (!r.has('limb_darkening')) {
    r.problem('limb_darkening', undefined, 'required: quadratic coefficients {u1, u2} or Kipping (2013) {q1, q2}');
  } else if (ld.has('q1') || ld.has('q2')) {
    const q1 = ld.field('q1');
    const q2 = ld.field('q2');
    ({ u1, u2 } = uFromQ(q1, q2));
    if (ld.has('u1') || ld.has('u2')) ld.problem('u1', ld.raw('u1') ?? ld.raw('u2'), 'give either u1, u2 or q1, q2, not both');
  } else {
    u1 = ld.field('u1');
    u2 = ld.field('u2');
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

/** A separation in the form the user wrote (planet radii, Hill radii are shown in km), or in km. */
function separationAsWritten(m: number, raw: unknown, planet: PlanetSpec): string {
  const nu = typeof raw === 'string' ? splitNumberUnit(raw) : null;
  if (nu && nu.unit === 'Rp') return `${formatNumber(m / planet.radiusM)} Rp`;
  if (nu && nu.unit === 'hill') return `${formatNumber(m / 1e3)} km`;
  return lengthAsWritten(m, raw);
}

/** A length in the unit the user wrote `raw` in (or in km when it had none), for messages. */
function lengthAsWritten(m: number, raw: unknown, bare?: readonly [number, string]): string {
  const u = writtenUnit(raw, 'length', bare);
  return u ? `${formatNumber(m / u.si)} ${u.name}` : `${formatNumber(m / 1e3)} km`;
}

export function readPlanet(r: FieldReader, star: StarSpec, moonMassKg: number): PlanetSpec {
  const massKg = r.field('mass');
  let radiusM = Number.NaN;
  let massRadiusRelation: PlanetSpec['massRadiusRelation'] = null;
  if (r.has('mass_radius')) {
    massRadiusRelation = r.fieldChoice<'chen_kipping_2017'>('mass_radius');
    if (r.has('radius')) {
      r.problem('mass_radius', r.raw('mass_radius'), 'give either radius or a mass–radius relation, not both');
      r.raw('radius');
    } else if (Number.isFinite(massKg)) {
      radiusM = chenKippingRadius(massKg);
      if (!Number.isFinite(radiusM)) {
        r.problem('mass', r.raw('mass'), 'mass_radius chen_kipping_2017 covers planets below the Jovian–stellar transition, 0.08 Msun (Chen & Kipping 2017, Table 1)');
      }
    }
  } else {
    if (!r.has('radius')) r.problem('radius', undefined, 'required: a length ("1 Rjup", "2.5 Rearth"), or name a mass–radius relation: mass_radius: chen_kipping_2017');
    else radiusM = r.field('radius');
  }
  if (Number.isFinite(radiusM) && Number.isFinite(star.radiusM) && radiusM >= star.radiusM) {
    const key = r.has('radius') ? 'radius' : 'mass_radius';
    r.problem(key, r.raw(key), `the planet must be smaller than its star: radius ${lengthAsWritten(radiusM, r.raw('radius'))} ≥ star radius ${lengthAsWritten(star.radiusM, r.raw('radius'))}`);
  }
  if (Number.isFinite(massKg) && Number.isFinite(star.massKg) && massKg >= star.massKg) {
    r.problem('mass', r.raw('mass'), `a planet must be lighter than its star (${formatNumber(star.massKg / M_SUN_KG)} Msun)`);
  }
  const periodS = r.field('period');
  const eccentricity = r.field('eccentricity');
  const omegaRad = r.field('periapsis');
  const albedo = r.field('albedo');
  const k2 = r.field('love_number');
  const tidalQ = r.field('tidal_q');
  // Semi-major axis of the barycentre orbit from Kepler's third law, with the moon's mass.
  const total = star.massKg + massKg + moonMassKg;
  const semiMajorAxisM = Number.isFinite(periodS + total) ? semiMajorAxis(periodS, total) : Number.NaN;
  let aOverR = semiMajorAxisM / star.radiusM;
  let impact = Number.NaN;
  let incl = Number.NaN;
  const touching = star.radiusM + (Number.isFinite(radiusM) ? radiusM : 0);
  if (Number.isFinite(aOverR) && semiMajorAxisM <= touching) {
    // Kepler's third law: the period of an orbit that grazes the star's surface, P = 2π √(a³ / G M).
    const pMin = 2 * Math.PI * Math.sqrt(touching ** 3 / (G * total));
    const u = writtenUnit(r.raw('period'), 'time', [DAY_S, 'days']) ?? { name: 'd', si: DAY_S };
    r.problem('period', r.raw('period'), `the orbit would lie inside the star: the period must exceed ${formatNumber(pMin / u.si)} ${u.name} (semi-major axis above star radius + planet radius)`);
    aOverR = Number.NaN;
  }
  if (r.has('impact_parameter') && r.has('inclination')) {
    r.problem('inclination', r.raw('inclination'), 'give either impact_parameter or inclination, not both');
    r.raw('impact_parameter');
  } else if (r.has('inclination')) {
    incl = r.field('inclination');
    if (allFinite(aOverR, incl, eccentricity, omegaRad)) impact = Math.abs(impactParameter(aOverR, incl, eccentricity, omegaRad));
  } else {
    impact = r.field('impact_parameter');
    const bMax = (aOverR * (1 - eccentricity * eccentricity)) / (1 + eccentricity * Math.sin(omegaRad));
    if (allFinite(aOverR, impact, eccentricity, omegaRad) && impact < bMax) incl = inclinationFromImpact(impact, aOverR, eccentricity, omegaRad);
  }
  const p = radiusM / star.radiusM;
  if (Number.isFinite(impact) && Number.isFinite(p) && impact >= 1 + p) {
    r.problem(r.has('inclination') ? 'inclination' : 'impact_parameter', r.raw(r.has('inclination') ? 'inclination' : 'impact_parameter'),
      `the planet would not transit: impact parameter ${impact.toFixed(3)} must be below 1 + Rp/R* = ${(1 + p).toFixed(3)}`);
  }
  r.rejectUnknown();
  const planet: PlanetSpec = { massKg, radiusM, periodS, eccentricity, omegaRad, inclinationRad: incl, impactParameter: impact, semiMajorAxisM, albedo, k2, tidalQ };
  // Present only when used, so scenarios without it keep their canonical JSON (and no-moon set seeds).
  if (massRadiusRelation) planet.massRadiusRelation = massRadiusRelation;
  return planet;
}

function readMoon(r: FieldReader, star: StarSpec, planet: PlanetSpec, cautions: ScenarioCaution[], labelContact: boolean): MoonSpec {
  const massKg = r.field('mass');
  let radiusM = Number.NaN;
  if (r.has('radius') && r.has('density')) {
    r.problem('density', r.raw('density'), 'give either radius or density, not both');
    r.raw('radius');
  } else if (r.has('density')) {
    const rho = r.field('density');
    radiusM = Math.cbrt((3 * massKg) / (4 * Math.PI * rho));
  } else if (!r.has('radius')) {
    r.problem('radius', r.raw('radius'), 'required: radius (a length) or density (e.g. "3 g/cm^3")');
  } else {
    radiusM = r.field('radius');
  }
  const separationM = readSeparation(r, star, planet, massKg);
  const eccentricity = r.field('eccentricity');
  const inclinationRad = r.field('inclination');
  const nodeRad = r.field('node');
  const periapsisRad = r.field('periapsis');
  const phaseRad = r.field('phase');
  const retrograde = r.fieldChoice('direction') === 'retrograde';
  const albedo = r.field('albedo');
  const k2 = r.field('love_number');
  const tidalQ = r.field('tidal_q');
  const touches = Number.isFinite(separationM) && Number.isFinite(radiusM) && separationM <= planet.radiusM + radiusM;
  if (touches && !labelContact) {
    const from = r.has('density') ? ' (the moon radius follows from its mass and density)' : '';
    r.problem('separation', r.raw('separation'),
      `the moon would touch the planet: separation must exceed planet radius + moon radius = ${separationAsWritten(planet.radiusM + radiusM, r.raw('separation'), planet)}${from}`);
  }
  if (Number.isFinite(massKg) && Number.isFinite(star.massKg) && massKg >= star.massKg) {
    r.problem('mass', r.raw('mass'), `a moon must be lighter than the star (${formatNumber(star.massKg / M_SUN_KG)} Msun)`);
  }
  if (Number.isFinite(massKg) && Number.isFinite(planet.massKg) && massKg > planet.massKg) {
    cautions.push({
      path: 'moon.mass',
      message: `the moon (${formatNumber(massKg / planet.massKg)} × the planet's mass) is heavier than its planet; the model still treats the first body as the planet that transits on the stated ephemeris and the second as the moon`,
    });
  }
  r.rejectUnknown();
  const moon: MoonSpec = { massKg, radiusM, separationM, eccentricity, inclinationRad, nodeRad, periapsisRad, phaseRad, retrograde, albedo, k2, tidalQ };
  // Present only when true, so the canonical JSON (and the seeds derived from it) of every other moon is unchanged.
  if (touches && labelContact) moon.touchesPlanet = true;
  return moon;
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
      // A planet or star already reported as invalid: nothing to scale by.
      if (!(planet.semiMajorAxisM > 0 && planet.massKg > 0 && star.massKg > 0 && moonMassKg >= 0) || !allFinite(planet.semiMajorAxisM, planet.massKg + star.massKg + moonMassKg)) return Number.NaN;
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
  const cadenceS = r.field('cadence');
  let exposureS = r.has('exposure') ? r.field('exposure') : (r.raw('exposure'), cadenceS);
  // Above the cadence by rounding only ("2 min" and "120.0000000001 s"): the cadence.
  if (exposureS > cadenceS && exposureS <= cadenceS * (1 + 1e-12)) exposureS = cadenceS;
  if (Number.isFinite(exposureS) && Number.isFinite(cadenceS) && exposureS > cadenceS * (1 + 1e-12)) {
    const u = writtenUnit(r.raw('exposure'), 'time', [MINUTE_S, 'minutes']) ?? { name: 'min', si: MINUTE_S };
    r.problem('exposure', r.raw('exposure'), `the exposure cannot be longer than the cadence: at most ${formatNumber(cadenceS / u.si)} ${u.name}`);
    exposureS = Number.NaN; // reported: nothing downstream (the ground budget) reads it
  }
  let noiseFraction = Number.NaN;
  let noiseTimescaleS = Number.NaN;
  let ground: GroundSpec | null = null;
  // A white level of 0 is allowed only beside red noise (some noise must remain).
  const noiseAllowed = 'expected a white-noise level above 0 (0 only with red_noise) with its timescale, e.g. "200 ppm per 1 h" or "800 ppm per 2 min"; for a noiseless light curve use `moonsieve simulate --noiseless`';
  if (r.has('ground')) {
    if (r.has('noise')) r.problem('noise', r.raw('noise'), 'give either noise or a ground budget (instrument.ground), not both');
    ground = readGround(new FieldReader(r.raw('ground'), 'instrument.ground', r.problems), exposureS, cadenceS);
    noiseFraction = ground ? ground.terms.total : Number.NaN;
    noiseTimescaleS = exposureS;
  } else if (!r.has('noise')) {
    r.problem('noise', r.raw('noise'), `required: ${noiseAllowed}, or a ground budget (instrument.ground)`);
  } else {
    ({ fraction: noiseFraction, timescaleS: noiseTimescaleS } = readLevelPer(r, 'noise', noiseAllowed, exposureS, !r.has('red_noise')));
  }
  const redNoise = r.has('red_noise') ? readRedNoise(new FieldReader(r.raw('red_noise'), 'instrument.red_noise', r.problems)) : (r.raw('red_noise'), null);
  r.rejectUnknown();
  return { cadenceS, exposureS, noiseFraction, noiseTimescaleS, redNoise, ground };
}

/**
 * A level stated at a timescale: "200 ppm per 1 h", or a bare fraction (then
 * `fallbackTimescaleS`). `positive`: the level must be above 0, else ≥ 0.
 */
function readLevelPer(r: FieldReader, key: string, allowed: string, fallbackTimescaleS: number, positive = false): { fraction: number; timescaleS: number } {
  const raw = r.raw(key);
  const levelOk = (f: number): boolean => (positive ? f > 0 : f >= 0);
  if (typeof raw === 'string' && /\sper\s/.test(raw)) {
    const [level, scale] = raw.split(/\s+per\s+/);
    try {
      const fraction = parseQuantity(level, r.path(key), 'fraction');
      const timescaleS = parseQuantity(scale, r.path(key), 'time');
      if (!levelOk(fraction) || !(timescaleS > 0) || !Number.isFinite(fraction * timescaleS)) throw new Error('range');
      return { fraction, timescaleS };
    } catch {
      r.problem(key, raw, allowed);
      return { fraction: Number.NaN, timescaleS: Number.NaN };
    }
  }
  const fraction = r.quantity(key, 'fraction', { min: 0, minExclusive: positive, rangeText: allowed });
  return { fraction, timescaleS: fallbackTimescaleS };
}

function readRedNoise(r: FieldReader): RedNoiseSpec | null {
  const model = r.fieldChoice<'power_law' | 'drw'>('model') || 'power_law';
  if (!r.has('model')) r.problem('model', undefined, 'required: "power_law" (Timmer & König 1995) or "drw" (damped random walk)');
  if (model === 'power_law') {
    const { fraction, timescaleS } = readLevelPer(r, 'amplitude', 'expected the rms of the red noise averaged over a timescale, e.g. "150 ppm per 30 min"', Number.NaN);
    if (!Number.isFinite(timescaleS) && Number.isFinite(fraction)) r.problem('amplitude', r.raw('amplitude'), 'state the averaging timescale, e.g. "150 ppm per 30 min"');
    const beta = r.field('slope');
    r.rejectUnknown();
    return { model, rmsFraction: fraction, timescaleS, beta };
  }
  const rmsFraction = r.quantity('amplitude', 'fraction', { min: 0, rangeText: 'expected the stationary rms, e.g. "200 ppm"' });
  const tauS = r.field('timescale');
  r.rejectUnknown();
  return { model, rmsFraction, tauS };
}

function readGround(r: FieldReader, exposureS: number, cadenceS: number): GroundSpec | null {
  const apertureM = r.field('aperture');
  const band = r.fieldChoice<GroundSpec['band']>('band');
  const magnitude = r.field('magnitude');
  const throughput = r.field('throughput');
  const airmass = r.field('airmass');
  const altitudeM = r.field('altitude');
  const scintillationCoefficient = r.field('scintillation_coefficient');
  let floorFraction = 0;
  let floorTimescaleS = HOUR_S;
  if (r.has('floor')) ({ fraction: floorFraction, timescaleS: floorTimescaleS } = readLevelPer(r, 'floor', 'expected a systematic floor ≥ 0 with its timescale, e.g. "300 ppm per 1 min"', exposureS));
  r.rejectUnknown();
  if (![apertureM, magnitude, throughput, airmass, altitudeM, scintillationCoefficient, floorFraction, floorTimescaleS, exposureS, cadenceS].every(Number.isFinite)) return null;
  const b = groundNoiseBudget({
    apertureDiameterM: apertureM,
    magnitude,
    zeroPointPhotonsPerSM2: bandZeroPointPhotons(band),
    throughput,
    exposureS,
    cadenceS,
    scintillation: { model: 'osborn2015', airmass, altitudeM, cY: scintillationCoefficient },
    floor: floorFraction > 0 ? { fraction: floorFraction, timescaleS: floorTimescaleS } : undefined,
  });
  const e = b.perExposure;
  if (!(Number.isFinite(e.total) && e.total > 0)) {
    r.problems.push({ path: 'instrument.ground', value: r.raw('magnitude'), allowed: 'these values give no finite noise level per exposure; check aperture, magnitude and throughput' });
    return null;
  }
  return {
    apertureM, band, magnitude, throughput, airmass, altitudeM, scintillationCoefficient, floorFraction, floorTimescaleS,
    terms: { photon: e.photon, scintillation: e.scintillation, floor: e.floor, total: e.total, dominant: b.dominantTerm },
  };
}

/** Most transits an observation may have (`observation.transits`, or counted from `duration`). */
const MAX_TRANSITS = 10000;

function readObservation(r: FieldReader, periodS: number, cautions: ScenarioCaution[]): ObservationSpec {
  let transits = Number.NaN;
  let durationS: number | null = null;
  if (r.has('transits') && r.has('duration')) {
    r.problem('duration', r.raw('duration'), 'give either transits or duration, not both');
    r.raw('transits');
  } else if (r.has('duration')) {
    durationS = r.field('duration');
    if (Number.isFinite(durationS) && Number.isFinite(periodS)) {
      // Barycentre conjunctions t0 + nP, n = 0, 1, …, with nP ≤ duration (a relative 1e-9 forgives rounding of "3 yr" = 3P).
      transits = Math.floor((durationS / periodS) * (1 + 1e-9)) + 1;
      if (transits > MAX_TRANSITS) {
        const u = writtenUnit(r.raw('duration'), 'time', [DAY_S, 'days']) ?? { name: 'd', si: DAY_S };
        r.problem('duration', r.raw('duration'), `spans ${transits} conjunctions; at most ${MAX_TRANSITS}, i.e. a duration below ${formatNumber((MAX_TRANSITS * periodS) / u.si)} ${u.name}`);
        transits = Number.NaN;
      }
    }
  } else if (!r.has('transits')) {
    r.problem('transits', undefined, `required: a whole number of transits from 1 to ${MAX_TRANSITS}, or a duration ("3 yr")`);
  } else {
    transits = r.field('transits');
  }
  const t0BjdTdb = r.field('t0');
  const baselineS = r.field('baseline');
  const dutyCycle = r.field('duty_cycle');
  const gapLengthS = r.field('gap_length');
  const missedFraction = r.field('missed_fraction');
  if (Number.isFinite(baselineS) && Number.isFinite(periodS) && baselineS > periodS / 2) {
    cautions.push({
      path: 'observation.baseline',
      message: `the baseline on each side of a transit (${formatNumber(baselineS / DAY_S)} d) is longer than half the planet's period (${formatNumber(periodS / (2 * DAY_S))} d): neighbouring windows overlap and the same times are observed twice, each with its own noise`,
    });
  }
  r.rejectUnknown();
  const observation: ObservationSpec = { transits, t0BjdTdb, baselineS, dutyCycle, gapLengthS, missedFraction };
  // Present only when given, so scenarios without it keep their canonical JSON (and no-moon set seeds).
  if (durationS !== null) observation.durationS = durationS;
  return observation;
}

function readDetection(r: FieldReader): DetectionSpec {
  const falseAlarm = r.field('false_alarm');
  const written = r.has('calibration');
  const calibration = r.fieldChoice<'tail' | 'order_statistic'>('calibration');
  r.rejectUnknown();
  // Present only when written (the canonical JSON, and so the no-moon seeds, of other scenarios stay as they were).
  return written ? { falseAlarm, calibration } : { falseAlarm };
}

/** Mass of the planet plus moon (the barycentre's mass), kg. */
export function barycentreMass(s: Scenario): number {
  return s.planet.massKg + (s.moon ? s.moon.massKg : 0);
}

/**
 * The document of a typed scenario: what a scenario is varied through (sweep
 * axes, a budget's solved quantity) and what the entry points that take "a
 * Scenario or a path" read its `sweep:` and `budget:` blocks from.
 *
 * A Scenario from parseScenario / loadScenario carries the document it was
 * read from (`Scenario.document`). One built by hand, or a copy (a structured
 * clone, a spread), does not: its document is written here from the SI
 * values, and validating that document gives back the same Scenario (a
 * fraction that no "<x> ppm", "ppt" or "%" reads back to exactly is written
 * to the nearest double, see `fractionText`). Such a
 * document holds every value as it stands (a separation in metres, the moon's
 * radius, the luminosity), so a value varied later moves nothing else that
 * the original wording would have moved (a "0.3 hill" separation following
 * the planet's mass): keep the parsed Scenario where that matters.
 */
import type { Scenario, ScenarioDocument } from './types.js';
import { parseScenario } from './parseScenario.js';

/** The document `s` was parsed from, else one written from its values (`scenarioToDocument`). Callers copy before writing. */
export function scenarioDocumentOf(s: Scenario): ScenarioDocument {
  return s.document ?? scenarioToDocument(s);
}

/** UTC 2000-01-01T12:00:00, ms since 1970 (the origin of `CampaignSpec`'s seconds). */
const J2000_UNIX_MS = Date.UTC(2000, 0, 1, 12);

/** "<value> <unit>": the shortest decimal that reads back as the same double, in an SI unit (factor 1). */
const si = (value: number, unit: string): string => `${value} ${unit}`;
/** Fraction units and their sizes, as units.ts reads them (a fraction needs a unit: no bare number). */
const FRACTION_UNITS: ReadonlyArray<readonly [string, number]> = [['ppm', 1e-6], ['ppt', 1e-3], ['%', 1e-2]];

/** The double next to `x` towards +∞ (dir 1) or −∞ (dir −1), for finite non-zero x. */
function nextDouble(x: number, dir: 1 | -1): number {
  const f = new Float64Array([x]);
  const b = new BigInt64Array(f.buffer);
  b[0] += (x > 0) === (dir > 0) ? 1n : -1n;
  return f[0];
}

/**
 * A fraction as text that units.ts reads back to the same double: "<x> ppm" (or ppt, %), with x
 * the decimal whose product with the unit's size is exactly `f` (parseQuantity computes
 * size × number). Some doubles are no such product in any of the three units; they are written
 * to the nearest double (a relative difference of about 1e-16).
 */
function fractionText(f: number): string {
  if (f === 0 || !Number.isFinite(f)) return `${f} ppm`;
  for (const [unit, size] of FRACTION_UNITS) {
    let x = f / size;
    for (let k = 0; k < 3; k++) {
      for (const c of [x, nextDouble(x, 1), nextDouble(x, -1)]) if (size * Number(String(c)) === f) return `${c} ${unit}`;
      x = size * x < f ? nextDouble(x, 1) : nextDouble(x, -1);
    }
  }
  return `${f / 1e-6} ppm`;
}

/** A level at its timescale ("400 ppm per 600 s"). */
const level = (fraction: number, timescaleS: number): string => `${fractionText(fraction)} per ${timescaleS} s`;

/**
 * A scenario document whose validation gives back `s` (every field, the same doubles), written
 * from the SI values: the inverse of parseScenario for its fields. Where the Scenario holds both
 * an impact parameter and an inclination, the one written is the one that reads back to both.
 * Throws RangeError when neither does (a hand-built orbit whose two values disagree).
 */
export function scenarioToDocument(s: Scenario): ScenarioDocument {
  const { star, planet, moon, instrument: ins, observation: obs } = s;
  const planetDoc: ScenarioDocument = {
    mass: si(planet.massKg, 'kg'),
    ...(planet.massRadiusRelation ? { mass_radius: planet.massRadiusRelation } : { radius: si(planet.radiusM, 'm') }),
    period: si(planet.periodS, 's'),
    eccentricity: planet.eccentricity,
    periapsis: si(planet.omegaRad, 'rad'),
    albedo: planet.albedo,
    love_number: planet.k2,
    tidal_q: planet.tidalQ,
  };
  if (s.sky && s.sky.periodErrorS > 0) planetDoc.period_error = si(s.sky.periodErrorS, 's');
  const doc: ScenarioDocument = {
    name: s.name,
    seed: s.seed,
    star: {
      mass: si(star.massKg, 'kg'), radius: si(star.radiusM, 'm'), teff: si(star.teffK, 'K'), age: si(star.ageS, 's'),
      luminosity: si(star.luminosityW, 'W'), limb_darkening: { u1: star.u1, u2: star.u2 },
    },
    planet: planetDoc,
    ...(moon ? {
      moon: {
        mass: si(moon.massKg, 'kg'), radius: si(moon.radiusM, 'm'), separation: si(moon.separationM, 'm'), eccentricity: moon.eccentricity,
        inclination: si(moon.inclinationRad, 'rad'), node: si(moon.nodeRad, 'rad'), periapsis: si(moon.periapsisRad, 'rad'), phase: si(moon.phaseRad, 'rad'),
        direction: moon.retrograde ? 'retrograde' : 'prograde', albedo: moon.albedo, love_number: moon.k2, tidal_q: moon.tidalQ,
      },
    } : {}),
    instrument: instrumentDocument(s),
    observation: {
      ...(obs.durationS !== undefined && obs.durationS !== null ? { duration: si(obs.durationS, 's') } : { transits: obs.transits }),
      t0: obs.t0BjdTdb, baseline: si(obs.baselineS, 's'), duty_cycle: obs.dutyCycle, gap_length: si(obs.gapLengthS, 's'), missed_fraction: obs.missedFraction,
      ...(s.sky && s.sky.t0ErrorS > 0 ? { t0_error: si(s.sky.t0ErrorS, 's') } : {}),
    },
    detection: { false_alarm: s.detection.falseAlarm, ...(s.detection.calibration !== undefined ? { calibration: s.detection.calibration } : {}) },
  };
  if (s.sky) {
    const { sites, target, campaign, constraints } = s.sky;
    const site = (x: (typeof sites)[number]): ScenarioDocument => ({ name: x.name, latitude: si(x.latitudeRad, 'rad'), longitude: si(x.longitudeRad, 'rad'), altitude: si(x.altitudeM, 'm') });
    if (sites.length === 1) doc.site = site(sites[0]);
    else if (sites.length > 1) doc.site = sites.map(site);
    if (target) doc.target = { ra: si(target.raRad, 'rad'), dec: si(target.decRad, 'rad') };
    // Dates as the Date values a YAML timestamp gives (read to the millisecond).
    if (campaign) doc.campaign = { start: new Date(J2000_UNIX_MS + campaign.startUtcS * 1e3), end: new Date(J2000_UNIX_MS + campaign.endUtcS * 1e3) };
    const v = s.sky.visibility;
    if (v) {
      // A space instrument: its pattern instead of constraints (which visibility excludes).
      doc.visibility = { name: v.name, on: si(v.onS, 's'), off: si(v.offS, 's'), start: v.referenceBjdTdb, ...(v.blockS !== null ? { block: si(v.blockS, 's'), gap: si(v.gapS, 's') } : {}) };
    } else {
      doc.constraints = { sun_altitude: si(constraints.sunAltitudeRad, 'rad'), airmass: constraints.airmass, clear_fraction: constraints.clearFraction };
    }
  }
  // The planet's orbit: the impact parameter, else the inclination, whichever reads back to both.
  for (const orbit of [{ impact_parameter: planet.impactParameter }, { inclination: si(planet.inclinationRad, 'rad') }]) {
    const candidate: ScenarioDocument = { ...doc, planet: { ...planetDoc, ...orbit } };
    let back: Scenario;
    try {
      back = parseScenario(candidate, 'scenario', { moonContact: moon?.touchesPlanet ? 'label' : 'error' });
    } catch {
      continue;
    }
    if (Object.is(back.planet.impactParameter, planet.impactParameter) && Object.is(back.planet.inclinationRad, planet.inclinationRad)) return candidate;
  }
  throw new RangeError(
    `scenario.planet: its impact parameter (${planet.impactParameter}) and inclination (${planet.inclinationRad} rad) do not describe one orbit (or the scenario does not validate); parse the scenario from a document instead`,
  );
}

function instrumentDocument(s: Scenario): ScenarioDocument {
  const ins = s.instrument;
  const out: ScenarioDocument = { cadence: si(ins.cadenceS, 's'), exposure: si(ins.exposureS, 's') };
  if (ins.ground) {
    const g = ins.ground;
    out.ground = {
      aperture: si(g.apertureM, 'm'), band: g.band, magnitude: g.magnitude, throughput: g.throughput, airmass: g.airmass,
      altitude: si(g.altitudeM, 'm'), scintillation_coefficient: g.scintillationCoefficient,
      floor: level(g.floorFraction, g.floorTimescaleS),
    };
  } else {
    out.noise = level(ins.noiseFraction, ins.noiseTimescaleS);
  }
  const red = ins.redNoise;
  if (red?.model === 'power_law') out.red_noise = { model: 'power_law', amplitude: level(red.rmsFraction, red.timescaleS), slope: red.beta };
  else if (red?.model === 'drw') out.red_noise = { model: 'drw', amplitude: fractionText(red.rmsFraction), timescale: si(red.tauS, 's') };
  return out;
}

/**
 * scenarioToDocument: a Scenario without its document (built by hand, or a
 * structured clone) gets one written from its SI values, whose validation
 * gives back the same Scenario, double for double. Expected values: the
 * scenario itself (a round trip; "common practice, no source").
 */
import { describe, it, expect } from 'vitest';
import { loadScenario, parseScenario, parseScenarioText, planBudget, scenarioDocumentOf, scenarioToDocument, type Scenario } from '../../src/index.js';
import { applyAxes } from '../../src/sweep/applyAxes.js';
import { canonicalJson } from '../../src/sweep/canonicalJson.js';

/** Between them, every branch of the validator (as test/scenario/fieldTable.test.ts's pair, with a sky block added). */
const VARIANTS = [
  `name: Round trip one
seed: 7
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, age: 4 Gyr, luminosity: 1 Lsun, limb_darkening: {u1: 0.4, u2: 0.26}}
planet: {mass: 1 Mjup, radius: 1 Rjup, period: 365.25 d, eccentricity: 0.1, periapsis: 80 deg, impact_parameter: 0.2, albedo: 0.3, love_number: 0.5, tidal_q: 1e5}
moon: {mass: 0.5 Mearth, radius: 0.8 Rearth, separation: 20 Rp, eccentricity: 0.01, inclination: 1 deg, node: 2 deg, periapsis: 3 deg, phase: 4 deg, direction: retrograde, albedo: 0.3, love_number: 0.3, tidal_q: 100}
instrument:
  cadence: 2 min
  exposure: 100 s
  noise: 100 ppm per 1 h
  red_noise: {model: power_law, amplitude: 50 ppm per 30 min, slope: 1.5}
observation: {transits: 4, t0: 2461000.5, baseline: 3 h, duty_cycle: 0.9, gap_length: 15 min, missed_fraction: 0.1}
detection: {false_alarm: 1 %}
`,
  `name: Round trip two
star: {mass: 0.8 Msun, radius: 0.8 Rsun, teff: 5000 K, limb_darkening: {q1: 0.4, q2: 0.3}}
planet: {mass: 0.3 Mjup, mass_radius: chen_kipping_2017, period: 200 d, inclination: 89.9 deg, period_error: 2 min}
moon: {mass: 0.5 Mearth, density: 3 g/cm^3, separation: 0.2 hill}
instrument:
  cadence: 2 min
  ground: {aperture: 1 m, band: R, magnitude: 11, throughput: 0.4, airmass: 1.2, altitude: 2000 m, scintillation_coefficient: 1.5, floor: 100 ppm per 10 min}
  red_noise: {model: drw, amplitude: 200 ppm, timescale: 45 min}
observation: {duration: 2 yr, t0_error: 3 min}
site: [{name: North, latitude: 28.76, longitude: -17.88, altitude: 2300 m}, {name: South, latitude: -29.26, longitude: -70.73}]
target: {ra: "08:41:12.5", dec: "-12:33:10"}
campaign: {start: 2027-01-01, end: "2027-06-30T18:00:00Z"}
constraints: {sun_altitude: -18, airmass: 1.8, clear_fraction: 0.7}
`,
  `name: Round trip three (no moon, one site)
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5772 K, limb_darkening: {u1: 0.4, u2: 0.26}}
planet: {mass: 1 Mjup, radius: 1 Rjup, period: 40 d}
instrument: {cadence: 2 min, noise: 300 ppm}
observation: {transits: 3}
site: {latitude: 10, longitude: 20}
`,
];

function roundTrip(s: Scenario): Scenario {
  return parseScenario(scenarioToDocument(structuredClone(s)), 'round trip', { moonContact: 'label' });
}

describe('scenarioToDocument', () => {
  const scenarios: Array<[string, Scenario]> = [
    ...['demo-observer', 'demo-survey', 'demo-calendar'].map((n): [string, Scenario] => [n, loadScenario(`scenarios/${n}.yaml`)]),
    ...VARIANTS.map((t, k): [string, Scenario] => [`variant ${k + 1}`, parseScenarioText(t, `variant ${k + 1}`)]),
  ];
  for (const [name, s] of scenarios) {
    it(`${name}: validating the written document gives back the same Scenario, double for double`, () => {
      const back = roundTrip(s);
      expect(back).toEqual(s);
      // Canonical JSON (what seeds the no-moon sets) too, so runs agree bit for bit.
      expect(canonicalJson(back)).toBe(canonicalJson(s));
    });
  }

  it('a touching moon labelled on a grid cell reads back labelled', () => {
    const base = parseScenarioText(VARIANTS[0], 'one');
    const cell = applyAxes(base, [{ field: 'moon.separation', write: {} }], [7e7], 'cell 0'); // 70 000 km, inside 1 Rjup + 0.8 Rearth ≈ 76 600 km
    expect(cell.moon!.touchesPlanet).toBe(true);
    expect(roundTrip(cell)).toEqual(cell);
  });

  it('a copy of a Scenario (no document) runs the budget as its original does', () => {
    const s = loadScenario('scenarios/demo-observer.yaml');
    const copy = structuredClone(s);
    expect(copy.document).toBeUndefined();
    // The copy has no budget block: the original's is passed as the target here, so both ask the same.
    const block = (scenarioDocumentOf(s).budget ?? {}) as Record<string, unknown>;
    expect(block).toEqual({});
    const a = planBudget(s, { forecastOnly: true });
    const b = planBudget(copy, { forecastOnly: true });
    expect(b.answer).toEqual(a.answer);
    expect(b.forecast.probability).toEqual(a.forecast.probability);
  });

  it('refuses a hand-built orbit whose impact parameter and inclination disagree, naming them', () => {
    const s = loadScenario('scenarios/demo-observer.yaml');
    const odd: Scenario = { ...structuredClone(s), planet: { ...s.planet, inclinationRad: s.planet.inclinationRad - 0.01 } };
    expect(() => scenarioToDocument(odd)).toThrow(/impact parameter .* and inclination .* do not describe one orbit/);
  });
});

/**
 * The reference system of the bound's benchmark (issue 17), invented: a K
 * dwarf with a warm Saturn, observed at 2-min cadence with 250 ppm per hour,
 * 10 transits, α = 1 %. The planet's tidal Q of 10⁶ keeps moons up to the
 * grid's 4 M⊕ past the tidal-survival limit (with 10⁵ it cuts at ~1.2 M⊕). `boundReferenceDoc` returns it with a sweep block over
 * the moon's mass (log) and separation (Hill radii).
 */
import { parse as parseYaml } from 'yaml';

export function boundReferenceDoc(o: { realizations: number; masses: number; separations: number[] }): Record<string, unknown> {
  const doc = parseYaml(`
name: Tovren-3 b (invented bound reference)
seed: 170017
star: {mass: 0.74 Msun, radius: 0.71 Rsun, teff: 4650 K, age: 4 Gyr, limb_darkening: {u1: 0.52, u2: 0.18}}
planet: {mass: 0.35 Mjup, radius: 0.82 Rjup, period: 45 d, impact_parameter: 0.35, albedo: 0.3, love_number: 0.38, tidal_q: 1e6}
moon: {mass: 1 Mearth, density: 4.5 g/cm^3, separation: 0.3 hill, eccentricity: 0, inclination: 0 deg, direction: prograde}
instrument: {cadence: 2 min, exposure: 2 min, noise: 250 ppm per 1 h}
observation: {transits: 10, baseline: 6 h}
detection: {false_alarm: 0.01}
`) as Record<string, unknown>;
  const seps = o.separations;
  doc.sweep = {
    realizations: o.realizations,
    axes: [
      { field: 'moon.mass', from: '0.05 Mearth', to: '4 Mearth', count: o.masses, spacing: 'log' },
      { field: 'moon.separation', values: seps.map((x) => `${x} hill`) },
    ],
  };
  return doc;
}

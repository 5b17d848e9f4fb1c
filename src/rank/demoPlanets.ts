/**
 * A seeded, invented planet list for `moonsieve rank` demonstrations and
 * benchmarks: names made of invented syllables, stars and planets drawn from
 * simple made-up distributions. Not a catalogue and not a population model:
 * nothing here is meant to resemble the known planets.
 */
import { createRng } from '../noise/rng.js';

const SYLLABLES = ['ar', 'bel', 'cor', 'dun', 'el', 'fen', 'gal', 'hor', 'ist', 'jur', 'kel', 'lum', 'mor', 'nav', 'ol', 'pra', 'quel', 'ros', 'sav', 'tir', 'ul', 'ven', 'wyr', 'zan'];
const LETTERS = ['b', 'c', 'd'];

/** The demo list's seed (scenarios/demo-planets.csv is this list with 300 rows). */
export const DEMO_PLANETS_SEED = 20261205;

/** The demo planet list as CSV text: `count` rows, every column of PLANET_COLUMNS but noise_ppm_per_hour. */
export function demoPlanetCsv(count: number, seed = DEMO_PLANETS_SEED): string {
  if (!Number.isSafeInteger(count) || count < 1) throw new RangeError(`count must be a positive whole number, got ${count}`);
  const cols: Record<string, Array<number | string>> = {
    name: [], star_mass_msun: [], star_radius_rsun: [], star_teff_k: [], magnitude: [], band: [],
    planet_mass_mjup: [], planet_radius_rjup: [], period_d: [], impact_parameter: [],
    t0_bjd_tdb: [], t0_error_min: [], period_error_d: [], ra_deg: [], dec_deg: [],
  };
  const round = (x: number, d: number) => Number(x.toFixed(d));
  for (let i = 0; i < count; i++) {
    const r = createRng(seed, 0, i);
    const u = () => r.uniform();
    const name = SYLLABLES[Math.floor(u() * SYLLABLES.length)] + SYLLABLES[Math.floor(u() * SYLLABLES.length)];
    cols.name.push(`${name[0].toUpperCase()}${name.slice(1)}-${100 + i} ${LETTERS[Math.floor(u() * LETTERS.length)]}`);
    const mStar = 0.35 + 0.95 * u();
    cols.star_mass_msun.push(round(mStar, 3));
    cols.star_radius_rsun.push(round(mStar ** 0.85 * (0.92 + 0.16 * u()), 3));
    cols.star_teff_k.push(Math.round(Math.min(6800, Math.max(3100, 5700 * mStar ** 0.55 * (0.96 + 0.08 * u())))));
    cols.magnitude.push(round(8.5 + 6 * u(), 2));
    cols.band.push(u() < 0.8 ? 'V' : 'R');
    // Planet radius log-uniform 0.15–1.4 Rjup; masses from a loose made-up spread around a power law.
    const rp = 0.15 * (1.4 / 0.15) ** u();
    const mp = rp < 0.5 ? 0.5 * rp ** 2 * (0.6 + 0.8 * u()) : 0.1 + 2.5 * u() * rp;
    // A quarter of the smaller planets come without a mass (the list fills it from the radius, flagged).
    cols.planet_mass_mjup.push(rp < 0.45 && u() < 0.25 ? '' : round(mp, 4));
    cols.planet_radius_rjup.push(round(rp, 3));
    const period = 4 * (250 / 4) ** u();
    cols.period_d.push(round(period, 5));
    cols.impact_parameter.push(round(0.85 * u(), 3));
    cols.t0_bjd_tdb.push(round(2461000 + period * u(), 5));
    cols.t0_error_min.push(round(0.5 + 4.5 * u(), 2));
    cols.period_error_d.push(round(1e-5 * 100 ** u(), 7));
    cols.ra_deg.push(round(360 * u(), 4));
    cols.dec_deg.push(round((Math.asin(2 * u() - 1) * 180) / Math.PI, 4));
  }
  const names = Object.keys(cols);
  const lines = [names.join(',')];
  for (let i = 0; i < count; i++) lines.push(names.map((n) => String(cols[n][i])).join(','));
  return `# Invented planet list for \`moonsieve rank\` (src/rank/demoPlanets.ts, seed ${seed}): made-up names and values, no real planets.\n` + lines.join('\n') + '\n';
}

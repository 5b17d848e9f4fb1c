/**
 * Round trip: simulate a planet with a known moon (photodynamical light curve,
 * white noise), fit its transit times and durations with the project's own
 * recovery (timing/timingSeries.ts recoverTimings), vet the table, and count
 * how often the implied mass and separation contain the truth within their
 * 2σ intervals. Expected coverage of a calibrated 2σ interval: 95.4 %
 * (normal distribution); the requirement is ≥ 90 % (issue 7).
 *
 * The moon is given a tiny radius (0.1 Rearth) so its own dip does not bias
 * the planet-only fits (the photometric TTV of Szabó et al. 2006 is not part
 * of the barycentric inversion), and a coplanar circular orbit, which the
 * claim states (orientation: coplanar). For speed, every realization uses the
 * transit-shape template fitted once to the noiseless light curve; times and
 * durations are still fitted per transit on the noisy data.
 */
import { describe, it, expect } from 'vitest';
import { parseScenarioText } from '../../src/scenario/loadScenario.js';
import { observeScenario } from '../../src/noise/observe.js';
import { createRng } from '../../src/noise/rng.js';
import { recoverTimings } from '../../src/timing/timingSeries.js';
import { vetClaim } from '../../src/vet/vetClaim.js';
import type { Claim, OrientationPrior } from '../../src/vet/claimTypes.js';

// Invented system: a puffy 0.1 Mjup planet on a 120-day orbit with a 1 Mearth moon at 0.25 Hill radii.
const scenario = parseScenarioText(`
name: round-trip system
seed: 7
star: {mass: 0.8 Msun, radius: 0.75 Rsun, teff: 5000 K, limb_darkening: {u1: 0.5, u2: 0.2}}
planet: {mass: 0.1 Mjup, radius: 1.0 Rjup, period: 120 d, impact_parameter: 0.2}
moon: {mass: 1 Mearth, radius: 0.1 Rearth, separation: 0.25 hill, phase: 30 deg}
instrument: {cadence: 2 min, noise: 500 ppm per 2 min}
observation: {transits: 15, baseline: 2 h}
`);

describe('round trip: simulate, recover, vet', () => {
  it('implied mass and separation contain the truth within 2σ in ≥ 90 % of seeded trials', () => {
    // 150 trials: the binomial standard error of a 95 % coverage is then 1.8 %, so a
    // calibrated interval passes with margin (measured: mass 141/150, separation 140/150).
    const trials = 150;
    const template = recoverTimings(scenario, observeScenario(scenario, null)).global!;
    const moon = scenario.moon!;
    const hits = { mass: 0, separation: 0, massIsotropic: 0, separationIsotropic: 0 };
    for (let r = 0; r < trials; r++) {
      const rec = recoverTimings(scenario, observeScenario(scenario, createRng(scenario.seed, 0, r)), { global: template });
      const ok = rec.fits.filter((f) => f.status === 'ok');
      const claimFor = (orientation: OrientationPrior): Claim => ({
        name: `trial ${r}`, seed: r, star: scenario.star, planet: scenario.planet,
        ttv: null, tdv: null, phaseOffset: null, moonDipDepth: null, precision: null, cadenceS: null, durationS: null,
        transits: ok.length, orientation, draws: 2000, falseAlarm: 0.01, companion: 'moon',
        table: {
          source: 'simulation', timeStandard: 'BJD_TDB', epochsInferred: false, referenceBjdTdb: scenario.observation.t0BjdTdb,
          epochs: Float64Array.from(ok.map((f) => f.epoch)),
          timeS: Float64Array.from(ok.map((f) => f.tcS)),
          timeErrS: Float64Array.from(ok.map((f) => f.tcErrS)),
          durationS: Float64Array.from(ok.map((f) => f.durationS)),
          durationErrS: Float64Array.from(ok.map((f) => f.durationErrS)),
        },
      });
      const inside = (q: { lo2: number | null; hi2: number | null }, x: number) => q.lo2 !== null && q.hi2 !== null && q.lo2 <= x && x <= q.hi2;
      // A realization whose signal is not detected implies no moon: it counts as a miss.
      const cop = vetClaim(claimFor('coplanar'), { exclusionGrid: null }).implied;
      if (cop && inside(cop.massKg, moon.massKg)) hits.mass++;
      if (cop && inside(cop.separationM!, moon.separationM)) hits.separation++;
      const iso = vetClaim(claimFor('isotropic'), { exclusionGrid: null }).implied;
      if (iso && inside(iso.massKg, moon.massKg)) hits.massIsotropic++;
      if (iso && inside(iso.separationM!, moon.separationM)) hits.separationIsotropic++;
    }
    expect(hits.mass / trials).toBeGreaterThanOrEqual(0.9);
    expect(hits.separation / trials).toBeGreaterThanOrEqual(0.9);
    // The separation does not depend on the orientation prior (η is orientation-free for circular orbits).
    expect(hits.separationIsotropic / trials).toBeGreaterThanOrEqual(0.9);
    // The isotropic prior puts a coplanar truth at the low edge of the mass interval, so its
    // coverage is lower (measured 136/150 = 90.7 % with these seeds): required ≥ 85 % only.
    expect(hits.massIsotropic / trials).toBeGreaterThanOrEqual(0.85);
  });
});

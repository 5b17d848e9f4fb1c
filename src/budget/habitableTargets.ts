/**
 * The target population of `--habitable`: a moon-mass grid (log-spaced over
 * the range) × a separation grid (linear from the fluid Roche limit to the
 * stable limit of the scenario, as the sweep's default axes), keeping the
 * moons that computeLimits places as 'stable' and whose energy budget is
 * 'temperate' (Kopparapu et al. 2013 limits; see src/physics/habitableZone.ts).
 */
import { computeLimits, type LimitsJson } from '../limits/computeLimits.js';
import { InputError } from '../scenario/errors.js';
import { parseScenario } from '../scenario/parseScenario.js';
import type { Scenario } from '../scenario/types.js';
import { spacedValues } from '../sweep/sweepSpec.js';
import type { HabitableTarget } from './budgetTypes.js';
import { isStable, moonAt, scenarioMoonDensity } from './targetMoon.js';

export interface PopulationMoon {
  doc: Record<string, unknown>;
  scenario: Scenario;
  limits: LimitsJson;
  /** Row-major position in the mass × separation grid (the moon's cell index for seeding). */
  gridIndex: number;
}

export interface HabitablePopulation {
  targets: PopulationMoon[];
  candidates: number;
  densityKgM3: number;
  separationFromM: number;
  separationToM: number;
  /** How many candidates each label excluded (for the statement when none is left). */
  excluded: Record<string, number>;
}

/** `doc` without sweep/budget blocks; `base` its parsed scenario. */
export function habitablePopulation(doc: Record<string, unknown>, base: Scenario, h: HabitableTarget): HabitablePopulation {
  const density = scenarioMoonDensity(base);
  // The separation band of the base scenario (with a moon of this density for the Roche limit).
  const probe = base.moon ? base : parseScenario(moonAt(doc, h.massFromKg, 2 * base.planet.radiusM + 1, density));
  const lim = computeLimits(probe);
  const retro = probe.moon?.retrograde === true;
  const sFrom = lim.roche_limit_m;
  const sTo = retro ? lim.stable_max_separation_retrograde_m : lim.stable_max_separation_m;
  const masses = spacedValues(h.massFromKg, h.massToKg, h.grid, 'log');
  const seps = sTo > sFrom ? spacedValues(sFrom, sTo, h.grid, 'linear') : [];
  const targets: PopulationMoon[] = [];
  const excluded: Record<string, number> = {};
  const count = (label: string) => (excluded[label] = (excluded[label] ?? 0) + 1);
  let gridIndex = 0;
  for (const m of masses) {
    for (const a of seps) {
      const idx = gridIndex++;
      const d = moonAt(doc, m, a, density);
      let s: Scenario;
      try {
        s = parseScenario(d);
      } catch (e) {
        if (!(e instanceof InputError)) throw e;
        count('refused by the scenario checks (e.g. touching the planet)');
        continue;
      }
      const l = computeLimits(s);
      if (!isStable(l)) {
        for (const p of l.moon_placement ?? []) count(p);
        continue;
      }
      const verdict = l.energy_budget?.verdict ?? 'unknown';
      if (verdict !== 'temperate') {
        count(`energy budget ${verdict}`);
        continue;
      }
      targets.push({ doc: d, scenario: s, limits: l, gridIndex: idx });
    }
  }
  return { targets, candidates: masses.length * Math.max(seps.length, 1), densityKgM3: density, separationFromM: sFrom, separationToM: sTo, excluded };
}

/** Up to `k` items spread evenly over `xs` (first and last included). */
export function spreadEvenly<T>(xs: readonly T[], k: number): T[] {
  if (xs.length <= k) return [...xs];
  if (k === 1) return [xs[Math.floor((xs.length - 1) / 2)]];
  const out: T[] = [];
  for (let i = 0; i < k; i++) out.push(xs[Math.round((i * (xs.length - 1)) / (k - 1))]);
  return out;
}

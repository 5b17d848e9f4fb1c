/**
 * Writing a target moon (mass and separation) into a scenario document, with
 * the sweep's field writer, and reading back what the physics says about it.
 */
import { DEFAULT_MOON_DENSITY_KG_M3, type LimitsJson } from '../physics/computeLimits.js';
import { meanDensity } from '../physics/rocheLimit.js';
import { InputError } from '../scenario/errors.js';
import { parseScenario } from '../scenario/parseScenario.js';
import type { Scenario } from '../scenario/types.js';
import { writeAxisValue } from '../sweep/axisFields.js';
import type { BudgetTargetMoon, ResolvedBudgetTarget } from './budgetTypes.js';

function copyWithoutBlocks(doc: unknown): Record<string, unknown> {
  const out = structuredClone(doc ?? {}) as Record<string, unknown>;
  delete out.sweep;
  delete out.budget;
  return out;
}

function moonBlock(doc: Record<string, unknown>): Record<string, unknown> | null {
  const m = doc.moon;
  return m !== null && typeof m === 'object' && !Array.isArray(m) ? (m as Record<string, unknown>) : null;
}

/**
 * The scenario document with the target moon of `t` written in (the scenario's
 * own moon when `t` names none), and its parsed scenario. A scenario without a
 * moon gets one of density 3000 kg/m³ (a rocky body), stated in `notes`.
 * Throws InputError naming the flag or budget key a problem came from.
 */
export function withTargetMoon(doc: unknown, t: ResolvedBudgetTarget, source = 'scenario'): { doc: Record<string, unknown>; scenario: Scenario; notes: string[] } {
  const out = copyWithoutBlocks(doc);
  const notes: string[] = [];
  let moon = moonBlock(out);
  if (!moon) {
    if (t.moonMassKg === null || t.moonSeparation === null) {
      const missing = t.moonMassKg === null ? 'moon mass (--moon-mass, or moon_mass in the budget block)' : 'moon separation (--moon-separation, or moon_separation in the budget block)';
      throw new InputError([{ path: t.moonMassKg === null ? '--moon-mass' : '--moon-separation', value: undefined, allowed: `the scenario has no moon: give the target moon's ${missing}` }], source);
    }
    moon = { density: `${DEFAULT_MOON_DENSITY_KG_M3} kg/m^3` };
    out.moon = moon;
    notes.push(`the scenario has no moon block: the target moon has density ${DEFAULT_MOON_DENSITY_KG_M3} kg/m³ (a rocky body) and the other moon fields their defaults`);
  }
  if (t.moonMassKg !== null) writeAxisValue(out, 'moon.mass', t.moonMassKg, {});
  if (t.moonSeparation !== null) {
    if (typeof t.moonSeparation === 'number') writeAxisValue(out, 'moon.separation', t.moonSeparation, {});
    else moon.separation = t.moonSeparation;
  }
  try {
    return { doc: out, scenario: parseScenario(out, source), notes };
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    const rename = (p: string): string => {
      if (p.startsWith('moon.mass') && t.moonMassKg !== null) return `${t.moonMassSource} (the target moon's mass)`;
      if (p.startsWith('moon.separation') && t.moonSeparation !== null) return `${t.moonSeparationSource} (the target moon's separation)`;
      return p;
    };
    throw new InputError(e.problems.map((p) => ({ ...p, path: rename(p.path) })), source);
  }
}

/** A moon document for a population grid: mass and separation (SI) at the given density, radius from it. */
export function moonAt(doc: Record<string, unknown>, massKg: number, separationM: number, densityKgM3: number): Record<string, unknown> {
  const out = structuredClone(doc);
  if (!moonBlock(out)) out.moon = {};
  writeAxisValue(out, 'moon.mass', massKg, {});
  writeAxisValue(out, 'moon.separation', separationM, {});
  writeAxisValue(out, 'moon.density', densityKgM3, {});
  return out;
}

/** The density of the scenario's moon, or a rocky 3000 kg/m³ without one. */
export function scenarioMoonDensity(s: Scenario): number {
  return s.moon ? meanDensity(s.moon.massKg, s.moon.radiusM) : DEFAULT_MOON_DENSITY_KG_M3;
}

export function targetMoonInfo(s: Scenario, l: LimitsJson): BudgetTargetMoon {
  const m = s.moon!;
  return {
    mass_kg: m.massKg,
    separation_m: m.separationM,
    radius_m: m.radiusM,
    placement: l.moon_placement ?? [],
    habitability: l.energy_budget?.verdict ?? null,
    ttv_rms_s: l.ttv_rms_s ?? 0,
    tdv_rms_s: l.tdv_rms_s ?? 0,
    photocentric_ratio: l.photocentric_ratio ?? 0,
    forecast_regime_ok: (l.photocentric_ratio ?? 0) < PHOTOCENTRIC_LIMIT,
  };
}

/**
 * Above this (R_S/R_P)²/(M_S/M_P) the moon's photocentric TTV (Szabó et al. 2006,
 * A&A 450, 395) spoils the barycentric forecast: the threshold computeLimits uses.
 */
export const PHOTOCENTRIC_LIMIT = 0.2;

/** Whether the moon sits where it may orbit (computeLimits placement 'stable' alone). */
export function isStable(l: LimitsJson): boolean {
  return l.moon_placement !== null && l.moon_placement.length === 1 && l.moon_placement[0] === 'stable';
}

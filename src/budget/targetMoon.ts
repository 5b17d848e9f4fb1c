/**
 * Writing a target moon (mass and separation) into a scenario document, with
 * the sweep's field writer, and reading back what the physics says about it.
 */
import { DEFAULT_MOON_DENSITY_KG_M3, type LimitsJson } from '../limits/computeLimits.js';
import { meanDensity } from '../physics/rocheLimit.js';
import { describeValue, InputError, type FieldProblem } from '../scenario/errors.js';
import { parseQuantity, splitNumberUnit } from '../scenario/units.js';
import { M_EARTH_KG } from '../physics/constants.js';
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
    // Blame what the user changed: a problem in moon.* that only the target's mass can have caused
    // (the scenario's own separation now too close, since the radius follows the mass at the
    // scenario's density) names the mass flag, with the value as they wrote it.
    const massValue = t.moonMassText ?? t.moonMassKg;
    const renamed = e.problems.map((p): FieldProblem => {
      if (p.path.startsWith('moon.mass') && t.moonMassKg !== null) return { ...p, path: `${t.moonMassSource} (the target moon's mass)`, value: massValue };
      if (p.path.startsWith('moon.separation') && t.moonSeparation !== null) return { ...p, path: `${t.moonSeparationSource} (the target moon's separation)` };
      if (p.path.startsWith('moon.') && t.moonMassKg !== null) {
        const what = p.path.startsWith('moon.separation') ? `at the scenario's moon.separation ${describeValue(p.value)}` : `with the scenario's ${p.path} ${describeValue(p.value)}`;
        return { path: `${t.moonMassSource} (the target moon's mass)`, value: massValue, allowed: `${what} (the moon's radius follows from this mass and the scenario's moon density): ${p.allowed}; choose a lighter moon or give --moon-separation` };
      }
      return p;
    });
    throw new InputError(renamed, source);
  }
}

/**
 * A separation in km, followed by the unit the user wrote when it was another one
 * ("18 Rp" → "857904 km (18.0 Rp)", "0.2 hill", "0.01 AU").
 */
export function separationInUserUnit(m: number, userText: string | null | undefined, planetRadiusM: number, hillRadiusM: number): string {
  const km = `${(m / 1e3).toFixed(0)} km`;
  const nu = typeof userText === 'string' ? splitNumberUnit(userText.trim()) : null;
  if (!nu || !nu.unit || nu.unit === 'km') return km;
  if (nu.unit === 'Rp') return `${km} (${(m / planetRadiusM).toPrecision(3)} Rp)`;
  if (nu.unit === 'hill') return `${km} (${(m / hillRadiusM).toPrecision(3)} Hill radii)`;
  try {
    const per = parseQuantity(`1 ${nu.unit}`, 'unit', 'length');
    if (per > 0 && Number.isFinite(per)) return `${km} (${(m / per).toPrecision(3)} ${nu.unit})`;
  } catch {
    // not a length unit: km alone
  }
  return km;
}

/**
 * A mass in the unit the user wrote (`userText`, e.g. "10 Msun" → "10.0 Msun"),
 * else in Earth masses.
 */
export function massInUserUnit(kg: number, userText: string | null | undefined): string {
  const nu = typeof userText === 'string' ? splitNumberUnit(userText.trim()) : null;
  if (nu && nu.unit) {
    try {
      const per = parseQuantity(`1 ${nu.unit}`, 'unit', 'mass');
      if (per > 0 && Number.isFinite(per)) return `${(kg / per).toPrecision(3)} ${nu.unit}`;
    } catch {
      // not a mass unit: fall through
    }
  }
  return `${(kg / M_EARTH_KG).toPrecision(3)} Mearth`;
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

export function targetMoonInfo(s: Scenario, l: LimitsJson, massText: string | null = null, separationText: string | null = null): BudgetTargetMoon {
  const m = s.moon!;
  return {
    mass_kg: m.massKg,
    mass_text: massInUserUnit(m.massKg, massText),
    separation_text: separationInUserUnit(m.separationM, separationText, s.planet.radiusM, l.hill_radius_m),
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

/**
 * Orbit- and globally-averaged energy budget at the surface of a moon.
 *
 * Terms (all W m^-2, averaged over the moon's whole surface and over both
 * orbits, as in Heller & Barnes 2013, Astrobiology 13, 18, §2 — the structure of
 * their orbit-averaged global flux; the reflected-light factor differs, below):
 *
 * 1. Stellar: F* (1 − α_S)/4 · (1 − f_E), with the orbit-averaged stellar flux
 *    F* = L* / (4π a_P² sqrt(1 − e_P²)) (the exact time average of 1/r² over a
 *    Kepler orbit; used in this form by Heller & Barnes 2013) and f_E the
 *    fraction of the moon's orbit spent in the planet's shadow.
 * 2. Reflected by the planet: F* α_P R_P²/(4 a_S²) · (1 − α_S)/4.
 * 3. Planet's thermal emission: σ T_P⁴ R_P²/a_S² · (1 − α_S)/4, with the
 *    planet's equilibrium temperature for full redistribution,
 *    T_P⁴ = F* (1 − α_P)/(4σ) (Heller & Barnes 2013 use the same T_P^eq).
 * 4. Tidal: the tidal surface heat flux h_S, passed in (see tidalHeating.ts).
 *
 * Eclipses (after Heller 2012, A&A 545, L8, who adds eclipses to the orbit
 * average): f_E = arcsin(R_P/a_S)/π. This closed form is derived here for a
 * coplanar, circular moon orbit and a cylindrical shadow of radius R_P (the
 * star's angular size and the penumbra are ignored). An inclined moon orbit is
 * eclipsed less often, so for inclined moons f_E is an upper bound.
 *
 * Reflected light — IMPORTANT: we could not read Heller & Barnes's own equation
 * for the reflected term (only the abstract was reachable), and our notes of it
 * disagree with an isotropic derivation by a factor ≈ 2π. We therefore use the
 * physically derived form: the planet reflects α_P of the power it intercepts,
 * α_P F* π R_P², and we spread it isotropically over a sphere of radius a_S,
 * giving F* α_P R_P²/(4 a_S²) at the moon. Energy conservation check: reflected
 * plus thermal incident flux at the moon equals F* R_P²/(4 a_S²) for any α_P.
 * Averaging a Lambert sphere's phase function over a coplanar circular moon
 * orbit gives 8/(3π²) ≈ 0.270 instead of 1/4 (8 % more); both are far below the
 * HB13-as-noted factor π/2. This term is small in every case we tried.
 *
 * The moon's Bond albedo α_S is applied to every radiative term, including the
 * planet's infrared emission, as Heller & Barnes (2013) do; this understates
 * the thermal term for a moon that is dark in the infrared. No planetary
 * internal heat is included (old planets; Heller & Barnes 2014, Int. J.
 * Astrobiol., "Runaway greenhouse effect on exomoons due to irradiation from
 * hot, young giant planets", add it).
 *
 * A flux budget is a first screen, not a climate model.
 */
import { SIGMA_SB } from './constants.js';

export type EnergyTerm = 'stellar' | 'reflected' | 'thermal' | 'tidal';

export interface MoonEnergyBudgetInput {
  starLuminosityW: number;
  /** Planet's (barycentre's) semi-major axis around the star, m. */
  planetSemiMajorAxisM: number;
  /** Planet's orbital eccentricity, 0 ≤ e < 1. */
  planetEccentricity: number;
  planetRadiusM: number;
  /** Planet's Bond albedo, 0 ≤ α ≤ 1. */
  planetAlbedo: number;
  /** Planet–moon separation (semi-major axis of the moon's orbit), m; > planetRadiusM. */
  moonSeparationM: number;
  /** Moon's Bond albedo, 0 ≤ α < 1. */
  moonAlbedo: number;
  /** Moon's globally averaged tidal surface heat flux, W m^-2 (≥ 0). */
  tidalHeatFluxWm2: number;
  /** Reduce the stellar term by the coplanar eclipse fraction; default true. */
  includeEclipses?: boolean;
}

export interface MoonEnergyBudget {
  /** Absorbed starlight (after eclipses), globally averaged, W m^-2. */
  stellarWm2: number;
  /** Absorbed starlight reflected by the planet, W m^-2. */
  reflectedWm2: number;
  /** Absorbed thermal emission of the planet, W m^-2. */
  thermalWm2: number;
  /** Tidal surface heat flux, W m^-2. */
  tidalWm2: number;
  /** Sum of the four terms, W m^-2. */
  totalWm2: number;
  /** The largest term. */
  dominant: EnergyTerm;
  /** Fraction of the moon's orbit in the planet's shadow (0 if eclipses are off). */
  eclipseFraction: number;
  /** Planet's equilibrium temperature (full redistribution), K. */
  planetEquilibriumTempK: number;
  /**
   * The top-of-atmosphere stellar flux that a moon of the same albedo would need
   * to absorb `totalWm2` on its own: 4 totalWm2/(1 − α_S), W m^-2. Comparable to
   * S_eff × S_sun of a stellar habitable-zone limit.
   */
  stellarEquivalentWm2: number;
}

/**
 * Fraction of a coplanar circular moon orbit spent inside the planet's
 * cylindrical shadow, arcsin(R_P/a_S)/π (derived; see module comment).
 * Kernel: NaN outside 0 < R_P ≤ a_S.
 */
export function eclipseFraction(planetRadiusM: number, moonSeparationM: number): number {
  if (!(planetRadiusM > 0 && moonSeparationM >= planetRadiusM)) return NaN;
  return Math.asin(planetRadiusM / moonSeparationM) / Math.PI;
}

function requireFinite(name: string, value: number, ok: boolean, allowed: string): void {
  if (!ok || !Number.isFinite(value)) throw new RangeError(`${name} must be ${allowed}, got ${value}`);
}

/**
 * Orbit- and globally-averaged energy budget of a moon, W m^-2
 * (structure of Heller & Barnes 2013, Astrobiology 13, 18; eclipses after
 * Heller 2012, A&A 545, L8; reflected term derived, see module comment).
 */
export function moonEnergyBudget(params: MoonEnergyBudgetInput): MoonEnergyBudget {
  const {
    starLuminosityW: L,
    planetSemiMajorAxisM: aP,
    planetEccentricity: eP,
    planetRadiusM: rP,
    planetAlbedo: albP,
    moonSeparationM: aS,
    moonAlbedo: albS,
    tidalHeatFluxWm2: tidal,
    includeEclipses = true,
  } = params;
  requireFinite('starLuminosityW', L, L > 0, 'a positive finite number');
  requireFinite('planetSemiMajorAxisM', aP, aP > 0, 'a positive finite number');
  requireFinite('planetEccentricity', eP, eP >= 0 && eP < 1, 'in [0, 1)');
  requireFinite('planetRadiusM', rP, rP > 0, 'a positive finite number');
  requireFinite('planetAlbedo', albP, albP >= 0 && albP <= 1, 'in [0, 1]');
  requireFinite('moonSeparationM', aS, aS > rP, `greater than planetRadiusM (${rP} m)`);
  requireFinite('moonAlbedo', albS, albS >= 0 && albS < 1, 'in [0, 1)');
  requireFinite('tidalHeatFluxWm2', tidal, tidal >= 0, 'a finite number ≥ 0');

  // Orbit-averaged stellar flux at the planet (and moon): <1/r²> = 1/(a² sqrt(1 − e²)).
  const fStar = L / (4 * Math.PI * aP * aP * Math.sqrt(1 - eP * eP));
  const absorb = (1 - albS) / 4; // globally averaged absorption factor of the moon
  const fE = includeEclipses ? eclipseFraction(rP, aS) : 0;
  const geometry = (rP * rP) / (aS * aS);

  const stellarWm2 = fStar * absorb * (1 - fE);
  const reflectedWm2 = ((fStar * albP * geometry) / 4) * absorb;
  // Full-redistribution equilibrium: σT⁴ = F*(1 − α_P)/4; the planet's emission
  // 4πR_P²σT⁴ spread over 4πa_S² gives σT⁴ R_P²/a_S² at the moon.
  const planetEmittedWm2 = (fStar * (1 - albP)) / 4;
  const planetEquilibriumTempK = Math.pow(planetEmittedWm2 / SIGMA_SB, 0.25);
  const thermalWm2 = planetEmittedWm2 * geometry * absorb;
  const tidalWm2 = tidal;
  const totalWm2 = stellarWm2 + reflectedWm2 + thermalWm2 + tidalWm2;

  let dominant: EnergyTerm = 'stellar';
  let largest = stellarWm2;
  if (reflectedWm2 > largest) {
    dominant = 'reflected';
    largest = reflectedWm2;
  }
  if (thermalWm2 > largest) {
    dominant = 'thermal';
    largest = thermalWm2;
  }
  if (tidalWm2 > largest) dominant = 'tidal';

  return {
    stellarWm2,
    reflectedWm2,
    thermalWm2,
    tidalWm2,
    totalWm2,
    dominant,
    eclipseFraction: fE,
    planetEquilibriumTempK,
    stellarEquivalentWm2: totalWm2 / absorb,
  };
}

/**
 * Physical and astronomical constants, SI units. One module holds them all,
 * each with its source.
 *
 * - IAU 2015 Resolution B3 (Prša et al. 2016, AJ 152, 41): nominal solar,
 *   terrestrial and Jovian conversion constants.
 * - IAU 2012 Resolution B2: the astronomical unit, exact.
 * - CODATA 2018 (Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010): G, σ_SB.
 * Masses are derived as (GM)^N / G, as astropy.constants does.
 */

/** Newtonian constant of gravitation, m^3 kg^-1 s^-2 (CODATA 2018). */
export const G = 6.6743e-11;
/** Stefan–Boltzmann constant, W m^-2 K^-4 (CODATA 2018, exact since SI 2019). */
export const SIGMA_SB = 5.670374419e-8;
/** Speed of light in vacuum, m s^-1 (exact, SI). */
export const C_LIGHT = 299_792_458;

/** Astronomical unit, m (IAU 2012 Resolution B2, exact). */
export const AU_M = 149_597_870_700;

/** Nominal solar radius, m (IAU 2015 B3). */
export const R_SUN_M = 6.957e8;
/** Nominal solar mass parameter GM, m^3 s^-2 (IAU 2015 B3). */
export const GM_SUN = 1.3271244e20;
/** Nominal solar luminosity, W (IAU 2015 B3). */
export const L_SUN_W = 3.828e26;
/** Nominal solar effective temperature, K (IAU 2015 B3). */
export const TEFF_SUN_K = 5772;
/** Nominal total solar irradiance, W m^-2 (IAU 2015 B3). */
export const S_SUN_W_M2 = 1361;

/** Nominal equatorial Earth radius, m (IAU 2015 B3). */
export const R_EARTH_M = 6.3781e6;
/** Nominal terrestrial mass parameter GM, m^3 s^-2 (IAU 2015 B3). */
export const GM_EARTH = 3.986004e14;

/** Nominal equatorial Jupiter radius, m (IAU 2015 B3). */
export const R_JUP_M = 7.1492e7;
/** Nominal Jovian mass parameter GM, m^3 s^-2 (IAU 2015 B3). */
export const GM_JUP = 1.2668653e17;

/** Solar mass, kg: (GM)_sun^N / G. */
export const M_SUN_KG = GM_SUN / G;
/** Earth mass, kg: (GM)_E^N / G. */
export const M_EARTH_KG = GM_EARTH / G;
/** Jupiter mass, kg: (GM)_J^N / G. */
export const M_JUP_KG = GM_JUP / G;

/** Time units, s. The day is 86 400 SI seconds; the year is the Julian year (IAU). */
export const MINUTE_S = 60;
export const HOUR_S = 3600;
export const DAY_S = 86_400;
export const JULIAN_YEAR_S = 365.25 * DAY_S;

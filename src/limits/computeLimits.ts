/**
 * `computeLimits`: the analytic answers for one planet (and its moon, if the
 * scenario has one), in milliseconds. Each number comes from the physics
 * function named beside it, which cites its source. All values SI.
 */
import type { Scenario } from '../scenario/types.js';
import { hillRadius, hillRadiusPericentre } from '../physics/hillRadius.js';
import { stableSeparationLimit } from '../physics/stability.js';
import { meanDensity, rocheLimit } from '../physics/rocheLimit.js';
import { tidalSurvivalMassMax } from '../physics/tidalMigration.js';
import { tidalHeatFlux } from '../physics/tidalHeating.js';
import { moonEnergyBudget } from '../physics/energyBudget.js';
import { runawayGreenhouseFlux, surfaceGravity } from '../physics/runawayGreenhouse.js';
import { FLUX_BUDGET_CAUTION, HZ_TEFF_MAX_K, HZ_TEFF_MIN_K, KOPPARAPU_2013, habitabilityVerdict, habitableZoneDistance, habitableZoneEdgeFlux } from '../physics/habitableZone.js';
import { timingSignals } from '../physics/timingSignals.js';
import { transitAveraging } from '../physics/transitAveraging.js';
import { ttvAlias, aliasFamily } from '../physics/ttvAlias.js';
import { moonDipDepth } from '../physics/moonDip.js';
import { timingPrecision } from '../physics/timingPrecision.js';
import { forecastDetection } from '../physics/detectionForecast.js';
import { transitDurations } from '../physics/transitDuration.js';
import { transitFluxScalar } from '../photometry/transitFlux.js';
import { whiteNoiseSigma } from '../noise/whiteNoise.js';
import { modelTimingPrecision } from '../timing/modelTimingPrecision.js';
import { templateGeometryFromScenario } from '../timing/transitTemplate.js';
import { windowHalfWidthS } from '../photometry/transitWindows.js';
import { boundAngles } from '../timing/knownTemplateBound.js';

/** Why a moon can or cannot be where the scenario puts it. */
export type PlacementLabel = 'stable' | 'touches the planet' | 'beyond stable limit' | 'inside Roche limit' | 'would not survive tidal migration';

export interface EnergyBudgetJson {
  stellar_w_m2: number;
  reflected_w_m2: number;
  thermal_w_m2: number;
  tidal_w_m2: number;
  total_w_m2: number;
  runaway_limit_w_m2: number;
  outer_edge_stellar_equivalent_w_m2: number;
  stellar_equivalent_w_m2: number;
  dominant: string;
  verdict: string;
  caution: string;
}

/** The `--json` form: SI keys, moon keys null when the scenario has no moon. */
export interface LimitsJson {
  scenario: string;
  hill_radius_m: number;
  hill_radius_pericentre_m: number;
  stable_max_separation_m: number;
  stable_max_separation_retrograde_m: number;
  roche_limit_m: number;
  roche_limit_rigid_m: number;
  roche_moon_density_kg_m3: number;
  tidal_max_moon_mass_kg: number;
  transit_duration_s: number;
  transit_duration_mid_s: number;
  ingress_duration_s: number;
  transit_depth: number;
  noise_per_exposure: number;
  /** Cramér–Rao bound from the exact limb-darkened, exposure-averaged model (used by the forecast). */
  timing_precision_s: number;
  duration_precision_s: number;
  /** Carter et al. (2008) trapezoid with the Price & Rogers (2014) cadence correction, for reference; null for a grazing transit (no flat bottom) or without noise. */
  timing_precision_carter_s: number | null;
  duration_precision_carter_s: number | null;
  habitable_zone_inner_m: number | null;
  habitable_zone_outer_m: number | null;
  moon_separation_m: number | null;
  moon_placement: PlacementLabel[] | null;
  moon_period_s: number | null;
  ttv_semi_amplitude_s: number | null;
  ttv_rms_s: number | null;
  tdv_semi_amplitude_s: number | null;
  tdv_rms_s: number | null;
  ttv_tdv_phase_offset_rad: number | null;
  ttv_alias_frequency_per_epoch: number | null;
  ttv_alias_period_epochs: number | null;
  ttv_alias_family_periods_s: number[] | null;
  moon_depth: number | null;
  /** (R_S/R_P)² / (M_S/M_P): above ~0.2 the moon's own dip shifts the fitted mid-times (photocentric TTV). */
  photocentric_ratio: number | null;
  /** Whether the forecast's assumptions hold (barycentric TTV dominates; see `assumptions`). Fewer than 3 transits do not break the regime: the channels that cannot be measured are null and named in `assumptions`. */
  forecast_regime_ok: boolean | null;
  false_alarm: number;
  transits: number;
  /** Null without a moon or without any timing channel (1 transit). */
  pdet_forecast_joint: number | null;
  /** Null without a moon or with fewer than 3 transits (no TTV channel against a linear ephemeris). */
  pdet_forecast_ttv: number | null;
  /** Null without a moon or with 1 transit. */
  pdet_forecast_tdv: number | null;
  /** The Monte Carlo's combined rule forecast over TTV and TDV (detectionForecast.ts, "Combined"; the moon dip not forecast); null without a timing channel. */
  pdet_forecast_combined: number | null;
  energy_budget: EnergyBudgetJson | null;
  assumptions: string[];
}

export const LIMITS_SCHEMA = 'moonsieve/limits/1';

/** The `limits --json` document: the limits (already in the vocabulary's names) under their schema id. */
export function limitsToJson(l: LimitsJson): { schema: typeof LIMITS_SCHEMA } & LimitsJson {
  return { schema: LIMITS_SCHEMA, ...l };
}

/** Roche limits are quoted for the scenario's moon, or for a rock moon of this density without one. */
export const DEFAULT_MOON_DENSITY_KG_M3 = 3000;

/** The orbital limits on a moon: Hill radius, stable separation, Roche limit and the tidal-survival mass. */
function orbitalLimits(s: Scenario) {
  const { star, planet, moon } = s;
  const aB = planet.semiMajorAxisM;
  const mBary = planet.massKg + (moon ? moon.massKg : 0);
  const rH = hillRadius(aB, mBary, star.massKg);
  const stable = stableSeparationLimit({
    planetSemiMajorAxisM: aB,
    planetEccentricity: planet.eccentricity,
    planetMassKg: mBary,
    starMassKg: star.massKg,
    moonEccentricity: moon ? moon.eccentricity : 0,
  });
  const rhoP = meanDensity(planet.massKg, planet.radiusM);
  const rhoS = moon ? meanDensity(moon.massKg, moon.radiusM) : DEFAULT_MOON_DENSITY_KG_M3;
  const roche = rocheLimit(planet.radiusM, rhoP, rhoS);
  const tidalMax = tidalSurvivalMassMax({
    planetMassKg: planet.massKg,
    planetRadiusM: planet.radiusM,
    planetK2: planet.k2,
    planetTidalQ: planet.tidalQ,
    starMassKg: star.massKg,
    planetSemiMajorAxisM: aB,
    ageS: star.ageS,
  });
  return { aB, mBary, rH, stable, rhoP, rhoS, roche, tidalMax };
}

/** Where the moon sits among the limits (the `moon_placement` of `computeLimits`), or null without a moon. */
export function moonPlacement(s: Scenario): PlacementLabel[] | null {
  return s.moon ? placementOf(s, orbitalLimits(s)) : null;
}

function placementOf(s: Scenario, l: ReturnType<typeof orbitalLimits>): PlacementLabel[] {
  const moon = s.moon!;
  const placement: PlacementLabel[] = [];
  // Separation ≤ R_P + R_S: the discs overlap, no orbit at all (sweep cells only; a single scenario refuses it).
  if (moon.touchesPlanet) placement.push('touches the planet');
  if (moon.separationM < l.roche.fluidM) placement.push('inside Roche limit');
  const limit = moon.retrograde ? l.stable.retrograde : l.stable.prograde;
  if (moon.separationM > limit) placement.push('beyond stable limit');
  if (!moon.retrograde && moon.massKg > l.tidalMax) placement.push('would not survive tidal migration');
  if (placement.length === 0) placement.push('stable');
  return placement;
}

/** Angle sets the forecast averages over when the moon's node or periapsis is drawn (boundAngles' rule). */
export const FORECAST_ANGLES = 16;

/** Kipping's (2009a) TTV/TDV of the scenario's moon at a node and periapsis, reduced by the transit averaging. */
function moonSignals(s: Scenario, t14S: number, nodeRad: number, periapsisRad: number) {
  const { planet, moon } = s;
  const frozen = timingSignals({
    planetMassKg: planet.massKg,
    moonMassKg: moon!.massKg,
    moonSeparationM: moon!.separationM,
    moonEccentricity: moon!.eccentricity,
    moonInclinationRad: moon!.retrograde ? Math.PI - moon!.inclinationRad : moon!.inclinationRad,
    moonNodeRad: nodeRad,
    moonPeriapsisRad: periapsisRad,
    barycentreSemiMajorAxisM: planet.semiMajorAxisM,
    barycentrePeriodS: planet.periodS,
    barycentreEccentricity: planet.eccentricity,
    barycentreOmegaRad: planet.omegaRad,
    durationS: t14S,
  });
  // The reflex motion during the transit averages the signals down (transitAveraging.ts).
  const avg = transitAveraging(t14S, frozen.moonPeriodS);
  const sig = {
    ...frozen,
    ttvSemiAmplitudeS: frozen.ttvSemiAmplitudeS * avg.ttvFactor,
    ttvRmsS: frozen.ttvRmsS * avg.ttvFactor,
    tdvSemiAmplitudeS: frozen.tdvSemiAmplitudeS * avg.tdvFactor,
    tdvRmsS: frozen.tdvRmsS * avg.tdvFactor,
  };
  return { frozen, avg, sig };
}

export function computeLimits(s: Scenario): LimitsJson {
  const { star, planet, moon, instrument, observation } = s;
  const lim = orbitalLimits(s);
  const { aB, mBary, rH, stable, rhoP, rhoS, roche, tidalMax } = lim;
  const rHperi = hillRadiusPericentre(aB, planet.eccentricity, mBary, star.massKg);

  const p = planet.radiusM / star.radiusM;
  const dur = transitDurations({
    periodS: planet.periodS,
    aOverRstar: aB / star.radiusM,
    radiusRatio: p,
    impactParameter: planet.impactParameter,
    inclinationRad: planet.inclinationRad,
    eccentricity: planet.eccentricity,
    omegaRad: planet.omegaRad,
  });
  // Depth at mid-transit with limb darkening (Mandel & Agol 2002).
  const depth = 1 - transitFluxScalar(planet.impactParameter, p, star.u1, star.u2);
  const sigma = whiteNoiseSigma(instrument.noiseFraction, instrument.noiseTimescaleS, instrument.exposureS);
  // Grazing (b > 1 − p): no second and third contacts, so no flat bottom (Seager & Mallén-Ornelas 2003,
  // ApJ 585, 1038, eqs. 3–4: T14 holds for b < 1 + p, T23 only for b < 1 − p). T14, the depth and the
  // exact-model Fisher bound below still hold; Carter et al.'s (2008) trapezoid (τ < T) does not.
  const grazing = !(dur.t23S > 0);
  const carterApplies = !grazing && sigma > 0 && dur.ingressS < dur.tMidS;
  const prec = carterApplies
    ? timingPrecision({
        depth,
        durationS: dur.tMidS,
        ingressS: dur.ingressS,
        noisePerSample: sigma,
        cadenceS: instrument.cadenceS,
        exposureS: instrument.exposureS,
      })
    : null;
  // The fits measure the first-to-last-contact duration T14 by stretching a template, so the
  // Carter et al. (2008) error on T (mid-ingress to mid-egress) is scaled by T14/T (approximation).
  const carterDurationPrecision = prec ? prec.sigmaDurS * (dur.t14S / dur.tMidS) : null;
  // The forecast uses the Cramér–Rao bound of the model the recovery actually fits.
  const model = modelTimingPrecision(templateGeometryFromScenario(s), sigma, instrument.cadenceS, windowHalfWidthS(s));
  const modelTcPrecision = model.sigmaTcS;
  const durationPrecision = model.sigmaDurationS;

  let hzInner: number | null = null;
  let hzOuter: number | null = null;
  const hzValid = star.teffK >= HZ_TEFF_MIN_K && star.teffK <= HZ_TEFF_MAX_K;
  if (hzValid) {
    hzInner = habitableZoneDistance(star.luminosityW, star.teffK, KOPPARAPU_2013.runawayGreenhouse);
    hzOuter = habitableZoneDistance(star.luminosityW, star.teffK, KOPPARAPU_2013.maximumGreenhouse);
  }
  const assumptions: string[] = [
    'nested two-body (Kepler) orbits: no perturbations by the star on the moon orbit, no other planets',
    'TTV/TDV amplitudes from the barycentric reflex motion (Kipping 2009a), averaged over the transit; no photocentric TTV from the moon dip',
    'per-transit precision is the Cramér–Rao bound of the limb-darkened, exposure-averaged model under white noise; red noise, spots and systematics make real errors larger',
    `detection forecast: noncentral chi-square of white-noise TTV/TDV excesses at false-alarm probability ${s.detection.falseAlarm}; the combined forecast applies the Monte Carlo's rule (each channel at α/m, any one detecting) to TTV and TDV, without the moon dip`,
    'Roche limit, stability band and tidal survival are fits and idealisations, not guarantees',
  ];
  if (grazing) {
    assumptions.push(`grazing transit (b = ${planet.impactParameter.toFixed(3)} > 1 − Rp/R* = ${(1 - p).toFixed(3)}): no flat bottom (Seager & Mallén-Ornelas 2003), so the "mid-ingress to mid-egress" duration is T14/2 and Carter et al.'s (2008) trapezoid precision is not given; the timing precision is the Fisher bound of the exact grazing model, and a grazing transit's shape is degenerate between b and Rp/R* in a real fit${planet.impactParameter >= 0.999 ? `; the moon's dip is modelled at b = 0.999 (the orbital-sampling profile, Heller 2014, needs b < 1), which overstates it for b = ${planet.impactParameter.toFixed(3)}` : ''}`);
  }
  // Say what the forecast leaves out of what the scenario sets (the Monte Carlo of sweep and budget includes it).
  const red = instrument.redNoise;
  if (red) {
    assumptions.push(`the forecast ignores the scenario's red noise (${red.model === 'drw' ? 'damped random walk' : 'power law'}, rms ${(red.rmsFraction * 1e6).toPrecision(3)} ppm): correlated noise makes the per-transit timing errors larger than the white-noise bound (Pont, Zucker & Queloz 2006, MNRAS 373, 231), so the forecast is optimistic; sweep and budget simulate it`);
  }
  if (observation.missedFraction > 0 || observation.dutyCycle < 1) {
    const kept = (1 - observation.missedFraction) * observation.transits;
    assumptions.push(`the forecast assumes all ${observation.transits} transits fully observed; the scenario misses each transit with probability ${observation.missedFraction} (about ${kept.toPrecision(3)} observed on average) and observes ${(100 * observation.dutyCycle).toPrecision(3)} % of each window: the forecast is optimistic; sweep and budget simulate the gaps`);
  }
  if (observation.transits > 1 && 2 * windowHalfWidthS(s) > planet.periodS) {
    assumptions.push(`the baseline (${(observation.baselineS / 3600).toPrecision(3)} h each side) reaches past half the period: consecutive windows are cut at the midpoints between conjunctions, so the observation is continuous there and each time stamp is simulated once`);
  }
  if (moon && moon.massKg > planet.massKg) {
    assumptions.push(`the moon (${(moon.massKg / planet.massKg).toPrecision(3)} × the planet's mass) is heavier than its planet: the labels "planet" and "moon" are swapped in a binary, and the nested-orbit formulas (Kipping 2009a) assume M_S ≪ M_P`);
  }
  if (!hzValid) assumptions.push(`Teff ${star.teffK} K is outside the Kopparapu et al. (2013) fit range 2600–7200 K: no habitable-zone limits given`);

  const out: LimitsJson = {
    scenario: s.name,
    hill_radius_m: rH,
    hill_radius_pericentre_m: rHperi,
    stable_max_separation_m: stable.prograde,
    stable_max_separation_retrograde_m: stable.retrograde,
    roche_limit_m: roche.fluidM,
    roche_limit_rigid_m: roche.rigidM,
    roche_moon_density_kg_m3: rhoS,
    tidal_max_moon_mass_kg: tidalMax,
    transit_duration_s: dur.t14S,
    transit_duration_mid_s: dur.tMidS,
    ingress_duration_s: dur.ingressS,
    transit_depth: depth,
    noise_per_exposure: sigma,
    timing_precision_s: modelTcPrecision,
    duration_precision_s: durationPrecision,
    timing_precision_carter_s: prec ? prec.sigmaTcS : null,
    duration_precision_carter_s: carterDurationPrecision,
    habitable_zone_inner_m: hzInner,
    habitable_zone_outer_m: hzOuter,
    moon_separation_m: null,
    moon_placement: null,
    moon_period_s: null,
    ttv_semi_amplitude_s: null,
    ttv_rms_s: null,
    tdv_semi_amplitude_s: null,
    tdv_rms_s: null,
    ttv_tdv_phase_offset_rad: null,
    ttv_alias_frequency_per_epoch: null,
    ttv_alias_period_epochs: null,
    ttv_alias_family_periods_s: null,
    moon_depth: null,
    photocentric_ratio: null,
    forecast_regime_ok: null,
    false_alarm: s.detection.falseAlarm,
    transits: observation.transits,
    pdet_forecast_joint: null,
    pdet_forecast_ttv: null,
    pdet_forecast_tdv: null,
    pdet_forecast_combined: null,
    energy_budget: null,
    assumptions,
  };
  if (!moon) return out;

  const placement = placementOf(s, lim);
  // A moon whose disc overlaps the planet's (a sweep cell only) has no orbit: its placement is the
  // answer, and the orbit-based quantities (signals, eclipses, energy budget) stay null.
  if (moon.touchesPlanet) return { ...out, moon_separation_m: moon.separationM, moon_placement: placement };

  // The Monte Carlo draws the moon's node (inclined orbit) and periapsis (eccentric orbit) per
  // realization (timing/realization.ts); the forecast averages its probabilities over the same
  // angles, on the known-template bound's fixed rule (boundAngles), instead of using the
  // scenario's values (issue 17: up to 2× too strong at high inclination). The phase is averaged
  // inside forecastDetection.
  const drawn = moon.inclinationRad > 0 || moon.eccentricity > 0;
  const nAngles = drawn ? FORECAST_ANGLES : 1;
  const alias0 = ttvAlias(planet.periodS, moonSignals(s, dur.t14S, moon.nodeRad, moon.periapsisRad).sig.moonPeriodS);
  const precisionOk = modelTcPrecision > 0 && durationPrecision > 0 && Number.isFinite(modelTcPrecision + durationPrecision);
  const acc = { ttv: 0, tdv: 0, joint: 0, combined: 0, ttv2: 0, tdv2: 0 };
  let first: ReturnType<typeof moonSignals> | null = null;
  let forecast: ReturnType<typeof forecastDetection> | null = null;
  for (let j = 0; j < nAngles; j++) {
    const a = drawn ? boundAngles(s, j, nAngles) : { nodeRad: moon.nodeRad, periapsisRad: moon.periapsisRad };
    const at = moonSignals(s, dur.t14S, a.nodeRad, a.periapsisRad);
    first ??= at;
    acc.ttv2 += at.sig.ttvRmsS ** 2;
    acc.tdv2 += at.sig.tdvRmsS ** 2;
    if (!precisionOk) continue;
    forecast = forecastDetection({
      nTransits: observation.transits,
      sigmaTcS: modelTcPrecision,
      sigmaDurS: durationPrecision,
      ttvRmsS: at.sig.ttvRmsS,
      tdvRmsS: at.sig.tdvRmsS,
      falseAlarm: s.detection.falseAlarm,
      aliasFrequencyPerEpoch: alias0.aliasFrequencyPerEpoch,
    });
    acc.ttv += forecast.ttv?.probability ?? NaN;
    acc.tdv += forecast.tdv?.probability ?? NaN;
    acc.joint += forecast.joint?.probability ?? NaN;
    acc.combined += forecast.combined ?? NaN;
  }
  const { frozen, avg } = first!;
  // Reported amplitudes: the rms over the drawn angles (what the realizations see on average).
  const sig = { ...first!.sig, ttvRmsS: Math.sqrt(acc.ttv2 / nAngles), tdvRmsS: Math.sqrt(acc.tdv2 / nAngles) };
  sig.ttvSemiAmplitudeS = sig.ttvRmsS * Math.SQRT2;
  sig.tdvSemiAmplitudeS = sig.tdvRmsS * Math.SQRT2;
  const meanOr = (v: number): number | null => (Number.isFinite(v) ? v / nAngles : null);
  if (avg.ttvFactor < 0.99) {
    out.assumptions.push(`the transit lasts ${(dur.t14S / frozen.moonPeriodS).toFixed(2)} of the moon's period: the reflex motion during the transit reduces the TTV by ×${avg.ttvFactor.toFixed(3)} and the TDV by ×${avg.tdvFactor.toFixed(3)} against Kipping's (2009a) frozen-planet amplitudes (included here)`);
  }
  if (drawn) {
    out.assumptions.push(`the forecast averages over the moon's ${[moon.inclinationRad > 0 ? 'node' : '', moon.eccentricity > 0 ? 'periapsis' : ''].filter(Boolean).join(' and ')} as the Monte Carlo draws them (uniform; ${FORECAST_ANGLES} fixed angle sets), not the scenario's values; the TTV/TDV rms quoted are rms over those angles`);
  }
  const alias = alias0;
  const family = aliasFamily(planet.periodS, alias.aliasFrequencyPerEpoch, 4).map((m) => m.moonPeriodS);
  const dip = moonDipDepth({ moonRadiusM: moon.radiusM, starRadiusM: star.radiusM, u1: star.u1, u2: star.u2, impactParameter: Math.min(planet.impactParameter, 0.999) });
  // Without noise the timing precision is not a positive number (no Cramér–Rao bound to compare
  // against): no forecast, said so, rather than a failure.
  const forecastNotes = forecast
    ? forecast.notes
    : [`no detection forecast: the per-transit timing precision is ${modelTcPrecision} s (noise ${sigma}), not a positive number, so there is no white-noise χ² test to forecast`];
  const probabilities = {
    ttv: forecast ? meanOr(acc.ttv) : null,
    tdv: forecast ? meanOr(acc.tdv) : null,
    joint: forecast ? meanOr(acc.joint) : null,
    combined: forecast ? meanOr(acc.combined) : null,
  };

  const tidal = tidalHeatFlux({
    planetMassKg: planet.massKg,
    moonMassKg: moon.massKg,
    moonRadiusM: moon.radiusM,
    separationM: moon.separationM,
    eccentricity: moon.eccentricity,
    moonK2: moon.k2,
    moonTidalQ: moon.tidalQ,
  });
  const budget = moonEnergyBudget({
    starLuminosityW: star.luminosityW,
    planetSemiMajorAxisM: aB,
    planetEccentricity: planet.eccentricity,
    planetRadiusM: planet.radiusM,
    planetAlbedo: planet.albedo,
    moonSeparationM: moon.separationM,
    moonAlbedo: Math.min(moon.albedo, 0.999),
    tidalHeatFluxWm2: tidal,
  });
  const runaway = runawayGreenhouseFlux(surfaceGravity(moon.massKg, moon.radiusM));
  const outerEdge = habitableZoneEdgeFlux(star.teffK, KOPPARAPU_2013.maximumGreenhouse, { allowExtrapolation: true });
  const verdict = habitabilityVerdict(budget, runaway, outerEdge);
  // Photocentric TTV (Szabó et al. 2006, A&A 450, 395; Simon et al. 2007, A&A 470, 727): a fit of a
  // planet-only template to a transit blended with the moon's dip follows the light-weighted centre,
  // which moves against the barycentric reflex with weight (R_S/R_P)² versus M_S/M_P.
  const photocentric = (moon.radiusM / planet.radiusM) ** 2 / (moon.massKg / planet.massKg);
  // Fewer than 3 transits is an answer, not a failure: the channels that exist are forecast
  // (detectionForecast.ts, "Few transits") and the missing ones are named here.
  const regimeOk = photocentric < 0.2;
  if (!regimeOk) {
    out.assumptions.push(`the moon's own dip is large for its mass ((R_S/R_P)²/(M_S/M_P) = ${photocentric.toPrecision(2)}): its photocentric TTV (Szabó et al. 2006) partly cancels or reverses the barycentric TTV, so the analytic forecast does not hold; trust the Monte Carlo sweep`);
  }
  out.assumptions.push(...forecastNotes);

  return {
    ...out,
    moon_separation_m: moon.separationM,
    moon_placement: placement,
    moon_period_s: sig.moonPeriodS,
    ttv_semi_amplitude_s: sig.ttvSemiAmplitudeS,
    ttv_rms_s: sig.ttvRmsS,
    tdv_semi_amplitude_s: sig.tdvSemiAmplitudeS,
    tdv_rms_s: sig.tdvRmsS,
    ttv_tdv_phase_offset_rad: sig.phaseOffsetRad,
    ttv_alias_frequency_per_epoch: alias.aliasFrequencyPerEpoch,
    ttv_alias_period_epochs: alias.aliasPeriodEpochs,
    ttv_alias_family_periods_s: family,
    moon_depth: dip.depthChordMean,
    photocentric_ratio: photocentric,
    forecast_regime_ok: regimeOk,
    pdet_forecast_joint: probabilities.joint,
    pdet_forecast_ttv: probabilities.ttv,
    pdet_forecast_tdv: probabilities.tdv,
    pdet_forecast_combined: probabilities.combined,
    energy_budget: {
      stellar_w_m2: budget.stellarWm2,
      reflected_w_m2: budget.reflectedWm2,
      thermal_w_m2: budget.thermalWm2,
      tidal_w_m2: budget.tidalWm2,
      total_w_m2: budget.totalWm2,
      runaway_limit_w_m2: runaway,
      outer_edge_stellar_equivalent_w_m2: outerEdge,
      stellar_equivalent_w_m2: budget.stellarEquivalentWm2,
      dominant: verdict.dominant,
      verdict: verdict.verdict,
      caution: FLUX_BUDGET_CAUTION,
    },
  };
}

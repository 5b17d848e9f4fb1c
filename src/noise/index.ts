/** Public API of the noise stage: seeded randomness, white and correlated noise, ground budgets, gaps. */
export { createRng, createRngFromState, deriveRngState, type Rng } from './rng.js';
export { addWhiteNoise, whiteNoiseSigma } from './whiteNoise.js';
export {
  powerLawNoise,
  powerLawTransformSize,
  PowerLawNoiseWorkspace,
  type PowerLawNoiseOptions,
} from './powerLawNoise.js';
export { dampedRandomWalkNoise } from './dampedRandomWalkNoise.js';
export {
  groundNoiseBudget,
  scintillationOsborn,
  scintillationYoung,
  OSBORN_MEDIAN_CY,
  V_BAND_ZERO_POINT_PHOTONS_PER_S_M2,
  type GroundBudget,
  type GroundBudgetInput,
  type NoiseTermName,
  type NoiseTerms,
  type ScintillationModel,
} from './groundBudget.js';
export {
  periodicGapMask,
  randomGapMask,
  randomObservingWindow,
  selectObservedEpochs,
  transitCoverageFraction,
  windowMask,
  type ObservingWindow,
} from './gaps.js';
export { EXTINCTION_MAG_PER_AIRMASS, groundSigmaAtAirmass } from './groundAirmass.js';
export { hasCampaign, observingPlan, withCampaignEpochs, type ObservingPlan } from './observingPlan.js';

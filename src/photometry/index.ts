/**
 * Public API of the photometry stage: occultation light curves of a
 * limb-darkened star by one or two opaque discs, exposure smearing, and the
 * complete elliptic integrals they use.
 */
export { ellipticK, ellipticE, ellipticPi } from './ellipticIntegrals.js';
export { uniformFlux, uniformFluxScalar, uniformBlockedFraction } from './uniformFlux.js';
export { transitFlux, transitFluxScalar } from './transitFlux.js';
export { pairTransitFlux, pairTransitFluxArray } from './pairTransitFlux.js';
export {
  supersampleCount,
  supersampleOffsets,
  integrateExposure,
  type FluxModel,
} from './exposureSmearing.js';
export { uFromQ, qFromU, isPhysicalQuadratic } from './kippingLimbDarkening.js';

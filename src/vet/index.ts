/** Public API of the vetting stage: `loadClaim`, `parseClaim`, `vetClaim` and their types. */
export { loadClaim, parseClaim, parseClaimText, type ParseClaimOptions } from './loadClaim.js';
export { vetClaim } from './vetClaim.js';
export { parseTimingTable, parseTimeStandard } from './timingTable.js';
export { formatVetReport } from './formatVetReport.js';
export { renderVetPage } from '../report/vetPage.js';
export type { Claim, ClaimedAmplitude, TimingTable, PhotometricPrecision, OrientationPrior } from './claimTypes.js';
export type { VetResult, VetCheck, CheckStatus, Verdict, ImpliedMoonSummary, QuantileSummary } from './vetTypes.js';
export { vetToJson, VET_SCHEMA, type VetJson } from './vetJson.js';

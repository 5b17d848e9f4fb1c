/**
 * moonsieve library API. Everything the CLI can do is a typed call here.
 * Units: SI inside (m, kg, s, rad, W); see each function's doc comment.
 */
export { VERSION } from './version.js';

// Scenario
export type {
  Scenario, ScenarioDocument, ScenarioCaution, StarSpec, PlanetSpec, MoonSpec, InstrumentSpec, RedNoiseSpec, GroundSpec, ObservationSpec, DetectionSpec,
} from './scenario/types.js';
export { loadScenario, parseScenarioText } from './scenario/loadScenario.js';
export { parseScenario, cautionNotes, formatCautions, type ParseOptions } from './scenario/parseScenario.js';
export { scenarioDocumentOf, scenarioToDocument } from './scenario/scenarioDocument.js';
export { parseQuantity } from './scenario/units.js';
export { InputError, type FieldProblem } from './scenario/errors.js';

// Physics
export * as constants from './physics/constants.js';
export { solveKepler, eccentricAnomaly } from './physics/kepler.js';
export { semiMajorAxis, orbitalPeriod } from './physics/keplerThirdLaw.js';
export { orbitSystem, orbitSystemFromScenario, skyPositions, type OrbitSystem } from './physics/skyPositions.js';
export { transitDurations, impactParameter, inclinationFromImpact } from './physics/transitDuration.js';
export { planetTransitTruth } from './physics/planetTransitTruth.js';
export { hillRadius, hillRadiusPericentre } from './physics/hillRadius.js';
export { stableSeparationLimit } from './physics/stability.js';
export { rocheLimit, meanDensity } from './physics/rocheLimit.js';
export { tidalSurvivalMassMax } from './physics/tidalMigration.js';
export { tidalHeatingPower, tidalHeatFlux } from './physics/tidalHeating.js';
export { moonEnergyBudget } from './physics/energyBudget.js';
export { runawayGreenhouseFlux } from './physics/runawayGreenhouse.js';
export { habitableZoneDistance, habitabilityVerdict } from './physics/habitableZone.js';
export { timingSignals } from './physics/timingSignals.js';
export { ttvAlias, aliasFamily } from './physics/ttvAlias.js';
export { timingPrecision } from './physics/timingPrecision.js';
export { forecastDetection } from './physics/detectionForecast.js';
export { computeLimits, limitsToJson, LIMITS_SCHEMA, type LimitsJson, type EnergyBudgetJson, type PlacementLabel } from './limits/computeLimits.js';

// Photometry
export { transitFlux } from './photometry/transitFlux.js';
export { pairTransitFlux } from './photometry/pairTransitFlux.js';
export { lightCurveModel, modelFlux } from './photometry/lightCurve.js';
export { transitWindows, sampleWindows } from './photometry/transitWindows.js';
export { simulateScenario, type Simulation } from './app/simulateScenario.js';

// Noise
export { createRng, type Rng } from './noise/rng.js';
export { whiteNoiseSigma, addWhiteNoise } from './noise/whiteNoise.js';
export { observeScenario } from './noise/observe.js';

// Timing recovery and detection
export { recoverTimings } from './timing/timingSeries.js';
export { runRealization } from './timing/realization.js';
export { ttvExcess, tdvExcess, jointTimingExcess } from './timing/chiSquareStatistics.js';
export { lombScargle } from './timing/lombScargle.js';
export {
  calibrateDetection, decideDetection, DETECTION_CHANNELS,
  type DetectionCalibration, type DetectionCalibrationOptions, type DetectionChannel, type DetectionDecision, type DetectionStatistics, type DetectionThresholds, type ChannelWeights, type NullStatistics,
} from './timing/detection.js';
export { wilsonInterval, rateInForce, tailThresholdSorted, tailRateInForce, type RateInForce, type TailThreshold } from './timing/falseAlarmCalibration.js';
export { fitUpperTail, tailSurvival, tailQuantile, fitGpd, gpdSurvival, gpdQuantile, type TailFit, type TailFitOptions, type GpdParameters, type GpdEstimator } from './numeric/generalizedPareto.js';
export { modelTimingPrecision } from './timing/modelTimingPrecision.js';

// Sweep, report, vet
export {
  runSweep, runSweepInMemory, loadSweep, type SweepOptions, type SweepOutcome, type InMemorySweep, type InMemorySweepOptions, type LoadedSweep,
} from './app/sweep/runSweep.js';
export type { RunnerModule, CalibrationStats } from './app/sweep/workerPool.js';
export { applyAxes, withoutMoon, CELL_PARSE, type AxisWrite } from './sweep/applyAxes.js';
export type { SweepSpec, SweepAxis, AxisSpacing } from './sweep/sweepSpec.js';
export type { SweepMeta, SweepAxisMeta, SweepRunInfo } from './sweep/sweepMeta.js';
export { mergeShards } from './app/sweep/merge.js';
export { runCell } from './sweep/runCell.js';
export { writeSweepOutputs, CELLS_SCHEMA, RUN_SCHEMA } from './app/sweep/outputs.js';
export type { CellTask, CellResult, CellContext, CellRunner, CellShared } from './sweep/cellTypes.js';
export { renderSweepReport } from './app/sweepReport.js';
export { buildSummary, SUMMARY_SCHEMA, type SweepSummary, type SummaryCell } from './report/summary.js';
export type { MinDetectablePoint } from './report/minDetectable.js';
export { loadClaim, parseClaimText, vetClaim, formatVetReport, vetToJson, VET_SCHEMA } from './vet/index.js';
export type {
  Claim, ClaimedAmplitude, TimingTable, PhotometricPrecision, OrientationPrior, ParseClaimOptions,
  VetResult, VetCheck, CheckStatus, Verdict, ImpliedMoonSummary, QuantileSummary, VetJson,
} from './vet/index.js';
export { planBudget, budgetToJson, BUDGET_SCHEMA } from './budget/index.js';
export type {
  BudgetJson, BudgetTarget, BudgetResult, BudgetAnswer, BudgetEvaluation, BudgetSolve, BudgetChannel, HabitableTarget, PlanBudgetOptions,
  BudgetForecastCurve, BudgetTargetMoon, BudgetQuantityInfo,
} from './budget/index.js';

// Sky: where and when (issue 18)
export type { SkySpec, SiteSpec, TargetSpec, CampaignSpec, ConstraintsSpec } from './scenario/types.js';
export { transitCalendar, type CalendarResult, type CalendarTransit, type CalendarCounts, type NetworkTransit, type TransitClass } from './sky/calendar.js';
export { sunAltitudeDeg, targetAltitudeDeg } from './sky/skyPosition.js';
export { airmassKastenYoung } from './sky/airmass.js';
export { utcToBjdTdb, bjdTdbToUtc } from './sky/barycentric.js';
export { sunCrossings } from './sky/twilight.js';
export { rankList, rankListText, mergeRankOutputs, writeRankOutputs, rankEcsv } from './app/rankList.js';
export { rankPlanet, minDetectableMass, RANK_SEPARATIONS_HILL, RANK_PDET, type PlanetRank } from './rank/rankPlanet.js';
export { readPlanetTable, planetRows, PLANET_COLUMNS, chenKippingMassFromRadius, type PlanetRow } from './rank/planetTable.js';
export { RANK_SCHEMA, type RankJson, type RankedPlanetJson } from './rank/rankJson.js';
export { renderRankPage } from './report/rankPage.js';
export { parseEcsv, ecsvValue, toEcsv, type ParsedEcsv, type EcsvColumnHeader, type EcsvRow, type TableColumn } from './io/ecsv.js';

/**
 * Public API of the Keelson projection engine (pure: no I/O).
 */
export { ENGINE_VERSION, FORMAT_VERSION } from './version';
export {
  AnnuitySchema,
  CorrelationsSchema,
  DEFAULT_PERCENTILES,
  FundSchema,
  GlidePointSchema,
  MemberSchema,
  OptionSchema,
  SCENARIO_VERSION,
  ScenarioSchema,
  ScenarioV1Schema,
  ScenarioV2Schema,
  ScenarioValidationError,
  StressSchema,
  WEIGHT_SUM_TOLERANCE,
  WeightsSchema,
  parseScenario,
  validateScenario,
  type Fund,
  type InvestmentOption,
  type Member,
  type Scenario,
  type ScenarioInput,
  type Stress,
  type ValidationIssue,
  type ValidationResult,
} from './schema';
export { checkCorrelationMatrix, cholesky, symmetricEigenvalues, type CorrelationProblem } from './cholesky';
export { lognormalFromMoments, momentsFromLognormal, type LognormalParameters } from './lognormal';
export { weightsAt, type GlidePoint } from './glidePath';
export { accumulate, growingAnnuityFutureValue, memberTimeline, type MemberTimeline } from './cashflows';
export {
  CONTRIBUTION_TIMINGS,
  ContributionBasisSchema,
  FORMAT_ONE_CONVENTIONS,
  FORMAT_TWO_DEFAULTS,
  GLIDE_WEIGHT_TIMINGS,
  TimingSchema,
  UK_QUALIFYING_EARNINGS,
  glideReadingPoint,
  type ContributionBasis,
  type Conventions,
  type Timing,
} from './conventions';
export { fastExp, spreadGrowth, spreadGrowthExact } from './fastMath';
export { annuityFactor, realRate } from './annuity';
export {
  BREAK_EVEN_RANGE,
  breakEvenLambda,
  ceAnnualReturn,
  ceRealReturn,
  certaintyEquivalentPot,
  lambdaFromGamble,
  logCertaintyEquivalent,
  logPots,
  type BreakEven,
  type ContributionSchedule,
} from './utility';
export { standardNormalQuantile } from './normal';
export { createStream, PATHS_PER_STREAM, streamSeed, type RandomStream, type StreamState } from './random';
export { Xoshiro128, drawSetStream, mix32, type XoshiroState } from './xoshiro';
export { ZIGGURAT_LAYERS, ZIGGURAT_R, ZIGGURAT_V, ZIGGURAT_X, zigguratNormal } from './ziggurat';
export { percentileOfSelected, percentileRanks, selectInPlace, selectManyInPlace } from './select';
export { marketFor, pathLogReturns, type MarketGenerator } from './market';
export {
  difference,
  influenceStandardError,
  logCeInfluence,
  separation,
  sparsityBandwidth,
  type Difference,
  type Separation,
} from './uncertainty';
export { SCAN_GRID, ceCurve, findCrossings, logCeWithSlope, type CeCurve, type Crossing, type Crossings } from './breakEven';
export {
  ceReturn,
  compareInfluences,
  compareMember,
  compareOptions,
  comparisonAtLambda,
  optionInfluence,
  optionPairs,
  pairIndexOf,
  type BreakEvenResult,
  type ComparedPair,
  type ComparisonAtLambda,
  type MemberRanking,
  type OptionComparison,
  type OptionInfluence,
  type PairAtLambda,
} from './compare';
export {
  DEFAULT_BAND_BUDGET_BYTES,
  bandBytes,
  planBatches,
  prepareScenario,
  type PreparedPair,
  type PreparedScenario,
} from './prepare';
export {
  BLOCK_PATHS,
  createPairStores,
  createWalkScratch,
  simulateRange,
  walkPair,
  type PairStore,
  type SimulateOptions,
  type StoreOptions,
  type WalkScratch,
} from './project';
export {
  SHORTFALL_LEVEL,
  assembleResult,
  resultToJson,
  summarisePair,
  type PairResult,
  type PairSummary,
  type PercentileValues,
  type ProjectionResult,
} from './summary';
export { SIMULATE_SHARE, runMemberComparison, runScenario, type RunOptions } from './run';

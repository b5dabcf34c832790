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
  ScenarioSchema,
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
export { annuityFactor, realRate } from './annuity';
export {
  BREAK_EVEN_RANGE,
  breakEvenLambda,
  ceAnnualReturn,
  certaintyEquivalentPot,
  lambdaFromGamble,
  logCertaintyEquivalent,
  logPots,
  type BreakEven,
  type ContributionSchedule,
} from './utility';
export { standardNormalQuantile } from './normal';
export { createStream, PATHS_PER_STREAM, streamSeed, type RandomStream, type StreamState } from './random';
export {
  DEFAULT_BAND_BUDGET_BYTES,
  bandBytes,
  planBatches,
  prepareScenario,
  type PreparedPair,
  type PreparedScenario,
} from './prepare';
export { pathLogReturns, simulateRange, type PairChunk, type SimulateOptions } from './project';
export {
  SHORTFALL_LEVEL,
  assembleResult,
  resultToJson,
  summarisePair,
  type BreakEvenResult,
  type PairResult,
  type PercentileValues,
  type ProjectionResult,
} from './summary';
export { runScenario, type RunOptions } from './run';

/**
 * Stochos engine: public entry points. Pure TypeScript (no React, Next or Node-only
 * imports): the same code runs in the browser worker and on the server, bit for bit.
 */
export { runModel, runModelSync, runCheckedModelSync, Simulation, ENGINE_VERSION, mergeChunks, mergeParts, inputWindow, type MergeCaches } from './simulate';
export { runChunks, prepareRun, prepareCheckedRun } from './prepare-run';
export { ChunkRunner, CHUNK_SIZE, chunkCount, chunkRange, mergeMoments, type ChunkPart, type ChunkOptions, type PreparedRun, type Moments } from './chunks';
export type { RunOptions, AsyncRunOptions, Progress, RunResult, InputReport, StackResult, CostResult, StackContributorResult, SampleSelection } from './simulate';
export type { OutputSummary, LimitReport, DriverReport, DriverItem, Convergence, ProbabilityEstimate } from './summary';
export { CONVERGENCE_RULES, DEFAULT_PERCENTILES, DRIVER_TRIAL_LIMIT, RANK_TRIAL_LIMIT } from './summary';
export { applyDials, type AppliedDials } from './dials';
export { evaluateStack, evaluateCost, contributorDistribution, threePointDistribution } from './analytic';
export type { StackAnalysis, StackContributorAnalysis, CostAnalysis, CostItemAnalysis, CostRiskAnalysis } from './analytic';
export { checkCorrelation, nearestCorrelation, symmetricSqrt, PSD_TOLERANCE, type CorrelationCheck, type NearestCorrelationResult } from './linalg';
export type { AchievedCorrelation } from './correlation';
export { PERCENTILE_DEFINITION, CONFIDENCE_LEVEL, percentileSorted, wilsonInterval, type PercentileEstimate, type Interval, type HistogramBin, type EcdfPoint } from './stats';
export { ModelValidationError, SamplingError, RunCancelledError, pathText, type ModelIssue } from './errors';
export { FormulaError, FORMULA_FUNCTIONS, FORMULA_CONSTANTS, RESERVED_NAMES } from './formula';
export { parseFormula, checkFormula } from './formula-parse';
export { RNG_NAME } from './rng';
export { normalCdf, normalSf, normalQuantile, erfc } from './special';
export { createMarginal, type DistributionSpec, type Marginal } from './distributions';
export * from './schema';
export { EXAMPLE_MODELS, exampleLinearStack, exampleCostRange, exampleFormula } from './examples';

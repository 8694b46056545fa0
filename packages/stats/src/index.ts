export type { DensityModel, ModelSpec } from "./model/density-model";
export type { RandomSource } from "./rng/random-source";
export type { CellSeries, PortfolioData } from "./data/portfolio-data";
export type { SimulationDesign, SimulatedCellDesign, PortfolioTruth, ChannelTruth, CellTruth } from "./simulate/simulation-design";
export { simulatePortfolio } from "./simulate/simulate-portfolio";
export type { SimulatedPortfolio, SimulationOverrides, CellTruthOverride } from "./simulate/simulate-portfolio";
export { adstockGeometric, adstockWeightSum } from "./model/adstock";
export { saturationExponential, saturationHill, hillShare, steadyStateResponse } from "./model/saturation";
export type { SaturationKind } from "./model/saturation";
export { absoluteWeekOf, mondayOfAbsoluteWeek } from "./model/absolute-week";

// Sampler: seeded generator, NUTS transition, warm-up adaptation, chain loop.
export { Xoshiro128StarStar } from "./rng/xoshiro128";
export { createRandomSource, restoreRandomSource } from "./rng/create-random-source";
export { NutsWorkspace, nutsTransition, createNutsState, createNutsInfo } from "./nuts/nuts-transition";
export type { NutsState, NutsSettings, NutsInfo } from "./nuts/nuts-transition";
export { dualAveraging } from "./adaptation/dual-averaging";
export type { DualAveragingState, DualAveragingSettings } from "./adaptation/dual-averaging";
export { diagonalMassMatrix } from "./adaptation/mass-matrix";
export type { MassMatrixState } from "./adaptation/mass-matrix";
export { warmupSchedule } from "./adaptation/window-schedule";
export type { WarmupSchedule, SlowWindow } from "./adaptation/window-schedule";
export { initialStepSize } from "./adaptation/initial-step-size";
export { sampleChain } from "./sampler/sample-chain";
export { defaultSamplerSettings, resolveSamplerSettings } from "./sampler/sampler-settings";
export type { SamplerSettings, ChainProgress, ChainResult, SamplerHooks } from "./sampler/sampler-settings";
export { buildModel, modelBuilders } from "./models/registry";
export type { ModelBuilder } from "./models/registry";

// Convergence diagnostics and the run summary.
export { summariseRun, summariseParameter } from "./diagnostics/summarise-run";
export type { ParameterSummary, RunDiagnostics, RunSummary, SummariseOptions } from "./diagnostics/summarise-run";
export { assessTrust, defaultTrustThresholds } from "./diagnostics/trust";
export type { TrustThresholds } from "./diagnostics/trust";
export { rhat, rhatBasic } from "./diagnostics/rhat";
export { essBulk, essTail, essMean, essQuantile } from "./diagnostics/ess";
export { mcseMean, mcseQuantile } from "./diagnostics/mcse";
export { ebfmi } from "./diagnostics/ebfmi";
export { splitChains } from "./diagnostics/split-chains";
export { rankNormalise } from "./diagnostics/rank-normalise";

// Running chains in workers (environment-neutral parts; the Node pool is in "@tributary/stats/node").
export { samplerEndpoint, createStopFlag } from "./parallel/sampler-endpoint";
export type { SamplerEndpoint } from "./parallel/sampler-endpoint";
export { sampleChainsOnEndpoints, emptyCancelledChain } from "./parallel/endpoint-pool";
export type { ChainEndpoint, EndpointPoolHooks } from "./parallel/endpoint-pool";

// Fitting a portfolio: pooled model, no-pooling comparison, diagnostics and result tables.
export { fitPortfolio, validateFitInput, unpooledCellSeed } from "./fit/fit-portfolio";
export type { FitHooks } from "./fit/fit-portfolio";
export type { FitOptions } from "./fit/fit-options";
export { RETRY_TARGET_ACCEPTANCE } from "./fit/fit-options";
export type { FitProgress, FitModelLabel } from "./fit/fit-progress";
export type {
  FitResult,
  FitDiagnostics,
  FitSettings,
  FitTiming,
  ModelDiagnostics,
  PosteriorSummary,
  ChannelResult,
  CellChannelResult,
  PoolingFactorResult,
} from "./fit/fit-result";
export { FitCancelledError, isFitCancelled } from "./fit/fit-cancelled";
export { runChainsInThread } from "./fit/chain-runner";
export type { RunChains } from "./fit/chain-runner";
export * from "./prior-check";

// The portfolio model: pooled and unpooled densities, names, simulation.
export { buildPortfolioModel, buildUnpooledCellModels, buildUnpooledCellModel, combineIndependentModels, combineIndependentDraws } from "./model/portfolio/build-portfolio-model";
export { PortfolioDensity } from "./model/portfolio/portfolio-density";
export { ParameterColumns, portfolioParameterNames } from "./model/portfolio/portfolio-names";
export { resolvePortfolioOptions, channelEffectPrior, DEFAULT_CAC_RANGE } from "./model/portfolio/portfolio-options";
export type { PortfolioModelOptions, ResolvedPortfolioOptions, LiftTest, PoolingLevels, LikelihoodKind } from "./model/portfolio/portfolio-options";
export { portfolioPooledKind, portfolioUnpooledKind } from "./model/portfolio/portfolio-model-kinds";
export type { PortfolioModelSpecData, UnpooledCellSpecData } from "./model/portfolio/portfolio-model-kinds";

// Decision quantities over a stored draw set.
export { buildDrawSet, cellIndexOf, channelIndexOf } from "./decisions/draw-set";
export type { DrawSet, DrawSetCell, NamedDraws } from "./decisions/draw-set";
export { summariseDraws, quantileSorted } from "./decisions/draw-summary";
export type { DrawSummary } from "./decisions/draw-summary";
export { cacLowSpend, averageCac, averageCacRecent, marginalCac } from "./decisions/cac";
export { responseCurve } from "./decisions/response-curve";
export type { ResponseCurvePoint } from "./decisions/response-curve";
export { probabilityProfitable } from "./decisions/probability-profitable";
export type { ProfitabilityBasis, ProfitabilityResult } from "./decisions/probability-profitable";
export { forecastSpendPlan } from "./decisions/forecast";
export type { SpendPlanForecast, ForecastWeek } from "./decisions/forecast";
export { crpsSample, holdoutAccuracy } from "./decisions/holdout-accuracy";
export type { HoldoutAccuracy, CellHoldoutAccuracy } from "./decisions/holdout-accuracy";
export { posteriorPredictiveBands } from "./decisions/posterior-predictive";
export type { PredictiveBands } from "./decisions/posterior-predictive";
export { predictCell } from "./decisions/predictive";
export type { CellPrediction } from "./decisions/predictive";
export { averageCacCombined, averageCacCombinedRecent, recentWeeklySpend } from "./decisions/combined-cac";
export { carryOverWeights } from "./decisions/carry-over";
export { weeklyContribution, columnBands } from "./decisions/weekly-contribution";
export type { WeeklyContribution, WeeklyBands } from "./decisions/weekly-contribution";
export { logHistogram, thinDraws } from "./decisions/draw-histogram";
export type { DrawHistogram } from "./decisions/draw-histogram";

// Shrinkage and pooling.
export { poolingFactor } from "./shrinkage/pooling-factor";
export { portfolioShrinkage, shrinkageInputsFrom } from "./shrinkage/portfolio-shrinkage";
export type { ShrinkageReport, CellShrinkage, LevelPooling, CandidateOutlier, ShrinkageInputs, OutlierRule } from "./shrinkage/portfolio-shrinkage";

// Planning: spend plans and scenarios, their forecast and comparison, the budget split.
export { currentPlan, spendPlanFrom, validateSpendPlan, planIndex, planSpendByCell } from "./planning/spend-plan";
export type { SpendPlan, CurrentPlan, CurrentPlanOptions } from "./planning/spend-plan";
export { MAX_PLAN_HORIZON, DEFAULT_PLAN_HORIZON, DEFAULT_RECENT_WEEKS } from "./planning/plan-cells";
export type { CellRef, PlanCell } from "./planning/plan-cells";
export type { LineTarget } from "./planning/line-target";
export { applyScenario } from "./planning/scenario";
export type { ScenarioOperation, ScenarioTarget } from "./planning/scenario";
export { forecastPlan, PLAN_CAUTION } from "./planning/plan-forecast";
export type { PlanForecast, PlanForecastOptions, CellPlanForecast, PlanWeekForecast, SelectionWeekForecast } from "./planning/plan-forecast";
export { comparePlans } from "./planning/plan-comparison";
export type { PlanComparison, PlanDifference, CellPlanDifference } from "./planning/plan-comparison";
export { costPerExtraCustomer } from "./planning/cost-per-extra-customer";
export type { CostPerExtraCustomer, RatioInterval } from "./planning/cost-per-extra-customer";
export { budgetSplit, budgetSplitPlan } from "./planning/budget-split";
export type { BudgetSplitInput, BudgetSplitResult, BudgetSplitLine, BudgetBound, BudgetObjective, BudgetOutcomeComparison } from "./planning/budget-split";
export type { RiskAttitude } from "./planning/risk-attitude";
export type { OutcomeDistribution } from "./planning/outcome-distribution";

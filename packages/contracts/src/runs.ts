import { z } from "zod";
import { modelSettingsSchema } from "./model-settings";

// Fit runs as the API sends them: status and live progress, the run report (diagnostics,
// trace and rank plots, posterior predictive check, holdout accuracy), publishing.

export const runStatuses = ["queued", "running", "succeeded", "failed", "cancelled", "interrupted"] as const;
export const runStatusSchema = z.enum(runStatuses);
export type RunStatus = z.infer<typeof runStatusSchema>;

export const runStatusLabels: Record<RunStatus, string> = {
  queued: "Waiting",
  running: "Running",
  succeeded: "Finished",
  failed: "Failed",
  cancelled: "Cancelled",
  interrupted: "Interrupted (server stopped)",
};

const userRefSchema = z.object({ id: z.string(), name: z.string() });

/** Progress of one chain. For the no-pooling comparison, iterations count over all cells of that chain. */
export const chainProgressSchema = z.object({
  model: z.enum(["pooled", "unpooled"]),
  chain: z.number().int(),
  iteration: z.number().int(),
  total: z.number().int(),
  phase: z.enum(["warmup", "sampling"]),
  divergences: z.number().int(),
  /** 2 when the model runs again at a higher target acceptance after divergences. */
  attempt: z.number().int(),
  /** No-pooling comparison: 0-based cell running now, and how many cells there are. */
  cell: z.number().int().nullable(),
  cellCount: z.number().int().nullable(),
  /** Seconds until this chain finishes its model, from its speed so far; null until it has one. */
  etaSeconds: z.number().nullable(),
});
export type RunChainProgress = z.infer<typeof chainProgressSchema>;

export const fitStages = ["queued", "preparing", "pooled", "unpooled", "summarising", "storing"] as const;
export const fitStageLabels: Record<(typeof fitStages)[number], string> = {
  queued: "Waiting for a free slot",
  preparing: "Preparing the data",
  pooled: "Fitting the pooled model",
  unpooled: "Fitting every cell on its own (comparison)",
  summarising: "Summarising the draws",
  storing: "Storing the results",
};

export const runProgressSchema = z.object({
  stage: z.enum(fitStages),
  /** Position in the queue (1 = next); null once running. */
  queuePosition: z.number().int().nullable(),
  /** Chains of the model running now. */
  chains: z.array(chainProgressSchema),
  /** Share of the whole fit done, 0–1 (an estimate: the two models' costs differ). */
  fraction: z.number(),
  elapsedSeconds: z.number(),
  /** Seconds until the whole fit ends, an estimate; null until there is one. */
  etaSeconds: z.number().nullable(),
  updatedAt: z.string(),
});
export type RunProgress = z.infer<typeof runProgressSchema>;

/** The trust mark of a finished run; null trustworthy until it has finished. */
export const runTrustSchema = z.object({
  trustworthy: z.boolean().nullable(),
  /** Why the run is not trustworthy (max R-hat, min bulk ESS, divergences). */
  reasons: z.array(z.string()),
  /** Advice that does not make the run untrustworthy. */
  warnings: z.array(z.string()),
});
export type RunTrust = z.infer<typeof runTrustSchema>;

export const runPublicationSchema = z.object({
  at: z.string(),
  by: userRefSchema.nullable(),
  /** Required when the run is not trustworthy; shown wherever its numbers appear. */
  reason: z.string().nullable(),
});

export const runSchema = z.object({
  id: z.string(),
  status: runStatusSchema,
  datasetVersionId: z.string(),
  datasetVersionNumber: z.number().int(),
  modelSettingsId: z.string(),
  settings: modelSettingsSchema,
  seed: z.number().int(),
  createdAt: z.string(),
  createdBy: userRefSchema.nullable(),
  startedAt: z.string().nullable(),
  finishedAt: z.string().nullable(),
  /** Why the run failed or was interrupted, in plain words. */
  failureReason: z.string().nullable(),
  /** The run this one restarts, and the run that restarted this one. */
  restartedFromRunId: z.string().nullable(),
  restartedByRunId: z.string().nullable(),
  progress: runProgressSchema.nullable(),
  trust: runTrustSchema,
  publication: runPublicationSchema.nullable(),
  /** True for the portfolio's current (latest published) run. */
  current: z.boolean(),
});
export type Run = z.infer<typeof runSchema>;

/** POST /api/runs */
export const startRunInput = z.object({ modelSettingsId: z.string().trim().min(1, "Choose the model settings to fit") });
export type StartRunInput = z.infer<typeof startRunInput>;

export const PUBLISH_REASON_MIN_LENGTH = 20;
/** POST /api/runs/:runId/publish; a reason is required for a run that is not trustworthy. */
export const publishRunInput = z.object({
  reason: z.string().trim().max(2000, "Keep the reason under 2000 characters").optional(),
});
export type PublishRunInput = z.infer<typeof publishRunInput>;

/** Server-sent events of GET /api/runs/:runId/events (the event name is `type`). */
export const runEventSchema = z.discriminatedUnion("type", [
  /** The run as stored, sent first and whenever its status changes. */
  z.object({ type: z.literal("run"), run: runSchema }),
  z.object({ type: z.literal("progress"), progress: runProgressSchema }),
  /** Sent once the run has finished (any way); the stream then ends. */
  z.object({ type: z.literal("end"), run: runSchema }),
]);
export type RunEvent = z.infer<typeof runEventSchema>;

// ---------------------------------------------------------------------------------
// Results
// ---------------------------------------------------------------------------------

/** A diagnostic that is not defined for some draws (e.g. R-hat of a constant) comes as null. */
const diagnosticNumber = z.number().nullable();

export const posteriorSummarySchema = z.object({
  mean: z.number(),
  sd: z.number(),
  q05: z.number(),
  q50: z.number(),
  q95: z.number(),
  rhat: diagnosticNumber,
  essBulk: diagnosticNumber,
});
export type PosteriorSummaryView = z.infer<typeof posteriorSummarySchema>;

export const modelDiagnosticsSchema = z.object({
  maxRhat: diagnosticNumber,
  minEssBulk: diagnosticNumber,
  minEssTail: diagnosticNumber,
  divergences: z.number().int(),
  treeDepthHits: z.number().int(),
  ebfmi: z.array(diagnosticNumber),
  gradientEvaluations: z.number(),
  trustworthy: z.boolean(),
  reasons: z.array(z.string()),
  warnings: z.array(z.string()),
  targetAcceptance: z.number(),
  attempts: z.number().int(),
});

export const fitDiagnosticsSchema = z.object({
  maxRhat: diagnosticNumber,
  minEssBulk: diagnosticNumber,
  minEssTail: diagnosticNumber,
  divergences: z.number().int(),
  treeDepthHits: z.number().int(),
  gradientEvaluations: z.number(),
  trustworthy: z.boolean(),
  reasons: z.array(z.string()),
  warnings: z.array(z.string()),
  pooled: modelDiagnosticsSchema,
  unpooled: modelDiagnosticsSchema.nullable(),
});
export type FitDiagnosticsView = z.infer<typeof fitDiagnosticsSchema>;

export const channelResultSchema = z.object({
  channel: z.string(),
  mu: posteriorSummarySchema,
  tauBrand: posteriorSummarySchema.nullable(),
  tauMarket: posteriorSummarySchema.nullable(),
  tauCell: posteriorSummarySchema,
  alpha: posteriorSummarySchema,
  lambda: posteriorSummarySchema,
});

export const cellChannelResultSchema = z.object({
  cellId: z.string(),
  brandId: z.string(),
  marketId: z.string(),
  brand: z.string(),
  market: z.string(),
  channel: z.string(),
  hasSpend: z.boolean(),
  cac0: posteriorSummarySchema,
  cac0Unpooled: posteriorSummarySchema.nullable(),
  /** Null without the no-pooling comparison, or when not defined (the cell's unpooled and group estimates coincide). */
  shrinkage: z.number().nullable(),
  outlier: z.boolean(),
  outlierReason: z.string().nullable(),
});
export type CellChannelResultView = z.infer<typeof cellChannelResultSchema>;

export const poolingFactorSchema = z.object({
  level: z.enum(["brand", "market", "cell"]),
  channel: z.string(),
  poolingFactor: diagnosticNumber,
});

/**
 * GET /api/runs/current (and /api/runs/:runId/results): the run's estimates. For a market
 * manager, `cells` holds only their markets' cells; channel-level numbers are the
 * portfolio's, not any one market's.
 */
export const runResultsSchema = z.object({
  run: runSchema,
  currency: z.string(),
  channels: z.array(channelResultSchema),
  cells: z.array(cellChannelResultSchema),
  poolingFactors: z.array(poolingFactorSchema),
  /** Shown beside every allocation or profitability figure. */
  caution: z.string(),
});
export type RunResults = z.infer<typeof runResultsSchema>;

// ---------------------------------------------------------------------------------
// The run report (analysts and admins)
// ---------------------------------------------------------------------------------

export const parameterDiagnosticSchema = z.object({
  name: z.string(),
  /** A readable label, e.g. "β Kestrova × Veltria, search". */
  label: z.string(),
  mean: z.number(),
  sd: z.number(),
  q05: z.number(),
  q50: z.number(),
  q95: z.number(),
  rhat: diagnosticNumber,
  essBulk: diagnosticNumber,
  essTail: diagnosticNumber,
  mcseMean: diagnosticNumber,
});
export type ParameterDiagnostic = z.infer<typeof parameterDiagnosticSchema>;

/** Trace and rank plot data of one parameter: post-warm-up draws thinned per chain, rank histograms per chain. */
export const parameterTraceSchema = z.object({
  name: z.string(),
  label: z.string(),
  rhat: diagnosticNumber,
  essBulk: diagnosticNumber,
  /** Why it is shown (e.g. "highest R-hat"). */
  why: z.string(),
  chains: z.array(
    z.object({
      chain: z.number().int(),
      /** Draw numbers (0-based, post-warm-up) of the points kept. */
      iterations: z.array(z.number().int()),
      values: z.array(z.number()),
    }),
  ),
  /** Rank plot: ranks of the draws over all chains, binned; counts per chain (uniform when chains mix). */
  rankBins: z.number().int(),
  rankCounts: z.array(z.object({ chain: z.number().int(), counts: z.array(z.number().int()) })),
});
export type ParameterTrace = z.infer<typeof parameterTraceSchema>;

/** Weekly bands of replicated outcomes from the posterior against the observed outcome, for one cell. */
export const predictiveCheckCellSchema = z.object({
  cellId: z.string(),
  brand: z.string(),
  market: z.string(),
  weeks: z.array(z.string()),
  observed: z.array(z.number()),
  q05: z.array(z.number()),
  q25: z.array(z.number()),
  q50: z.array(z.number()),
  q75: z.array(z.number()),
  q95: z.array(z.number()),
  /** First held-out week, or null without a holdout. */
  holdoutFrom: z.string().nullable(),
  /** Share of fitted weeks whose observed outcome lies inside the 90 % band. */
  coverage90: z.number(),
});
export type PredictiveCheckCell = z.infer<typeof predictiveCheckCellSchema>;

/** Forecast accuracy on the held-out weeks. */
export const holdoutAccuracySchema = z.object({
  weeks: z.number().int(),
  /** Mean continuous ranked probability score, in outcome units (lower is better). */
  crps: z.number(),
  /** Mean absolute percentage error of the posterior median forecast, in % (weeks with outcome 0 left out). */
  mape: z.number().nullable(),
  /** Share of held-out weeks inside the 90 % band. */
  coverage90: z.number(),
  cells: z.array(
    z.object({ cellId: z.string(), brand: z.string(), market: z.string(), crps: z.number(), mape: z.number().nullable(), coverage90: z.number() }),
  ),
});
export type HoldoutAccuracy = z.infer<typeof holdoutAccuracySchema>;

export const runReportSchema = z.object({
  run: runSchema,
  diagnostics: fitDiagnosticsSchema,
  /** Every parameter of the pooled model. */
  parameters: z.array(parameterDiagnosticSchema),
  /** The parameters that converged worst, for trace and rank plots. */
  traces: z.array(parameterTraceSchema),
  predictiveCheck: z.array(predictiveCheckCellSchema),
  holdout: holdoutAccuracySchema.nullable(),
  timing: z.object({ samplingSeconds: z.number(), pooledSeconds: z.number(), unpooledSeconds: z.number(), totalSeconds: z.number() }),
});
export type RunReport = z.infer<typeof runReportSchema>;

/** The words shown wherever allocations or profitability are shown. */
export const modelCaution =
  "These estimates come from a model and depend on its data and priors; they are not guarantees. Before moving a large budget, confirm with a controlled experiment (a lift test).";

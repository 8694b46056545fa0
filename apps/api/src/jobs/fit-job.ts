// The fit job: what goes to the worker thread, what it reports and what it returns.
// Plain data only (typed arrays included), so it crosses the thread boundary as is.
import type { HoldoutAccuracy, ParameterDiagnostic, ParameterTrace, PredictiveCheckCell } from "@tributary/contracts";
import type { FitOptions, FitResult, PortfolioData } from "@tributary/stats";
import type { JobRunner } from "./job-runner";
import type { FitProgressSnapshot } from "./fit-progress-tracker";

export interface FitJobInput {
  readonly data: PortfolioData;
  readonly options: FitOptions;
  /** Workspace cell ids of data.cells, for the report. */
  readonly cellIds: readonly string[];
  /** Posterior draws kept for planning, all chains together. */
  readonly keepDraws: number;
  /** Parameters given trace and rank plots. */
  readonly traceCount: number;
}

/** Options of every fit worker (not of one job). */
export interface FitWorkerOptions {
  /** Threads one fit may use for its chains (1 = chains one after another in the fit's own thread). */
  readonly chainThreads: number;
}

export interface DrawsOfChain {
  readonly kind: "pooled";
  readonly chain: number;
  readonly names: readonly string[];
  readonly drawCount: number;
  /** Row-major: draws × names. */
  readonly draws: Float64Array;
}

/** The fit's result without its draw set: the draws travel thinned, in `draws`. */
export type FitSummaries = Omit<FitResult, "drawSet">;

export interface FitJobOutput {
  readonly result: FitSummaries;
  /** The job's cellIds, echoed so the result is stored with them. */
  readonly cellIds: readonly string[];
  readonly parameters: readonly ParameterDiagnostic[];
  readonly traces: readonly ParameterTrace[];
  readonly predictiveCheck: readonly PredictiveCheckCell[];
  readonly holdout: HoldoutAccuracy | null;
  readonly draws: readonly DrawsOfChain[];
}

export type FitJobProgress = FitProgressSnapshot;

export type FitJobRunner = JobRunner<FitJobInput, FitJobProgress, FitJobOutput>;

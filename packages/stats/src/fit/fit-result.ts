import type { DrawSet } from "../decisions/draw-set";
import type { LikelihoodKind, PoolingLevels } from "../model/portfolio/portfolio-options";
import type { SaturationKind } from "../model/saturation";

/** A posterior summary of one quantity: 90 % central interval, median, and its convergence numbers. */
export interface PosteriorSummary {
  readonly mean: number;
  readonly sd: number;
  readonly q05: number;
  readonly q50: number;
  readonly q95: number;
  readonly rhat: number;
  readonly essBulk: number;
}

/** Convergence diagnostics of one model's run, with the trust rule applied. */
export interface ModelDiagnostics {
  readonly maxRhat: number;
  readonly minEssBulk: number;
  readonly minEssTail: number;
  /** Divergent transitions after warm-up, all chains (and cells). */
  readonly divergences: number;
  readonly treeDepthHits: number;
  /** E-BFMI per chain (per cell and chain for the no-pooling fit, cell by cell). */
  readonly ebfmi: readonly number[];
  readonly gradientEvaluations: number;
  readonly trustworthy: boolean;
  readonly reasons: readonly string[];
  /** Advice that does not make the run untrustworthy (low E-BFMI, tree-depth hits, a rerun). */
  readonly warnings: readonly string[];
  /** Target acceptance of the run whose draws are reported (the highest one for the no-pooling fit). */
  readonly targetAcceptance: number;
  /** Runs needed: 1, or 2 when divergences led to a second run at a higher target acceptance. */
  readonly attempts: number;
}

/** The run as a whole (pooled and no-pooling comparison together) and each model on its own. */
export interface FitDiagnostics {
  readonly maxRhat: number;
  readonly minEssBulk: number;
  readonly minEssTail: number;
  readonly divergences: number;
  readonly treeDepthHits: number;
  readonly gradientEvaluations: number;
  /** False when either model's run fails the trust rule. */
  readonly trustworthy: boolean;
  /** Each reason names the model it is about. */
  readonly reasons: readonly string[];
  readonly warnings: readonly string[];
  readonly pooled: ModelDiagnostics;
  readonly unpooled: ModelDiagnostics | null;
}

export interface FitTiming {
  /** Wall time of the samplers, warm-up included, both models. */
  readonly samplingSeconds: number;
  readonly pooledSeconds: number;
  readonly unpooledSeconds: number;
  /** Wall time of the whole fit: model building, sampling and summaries. */
  readonly totalSeconds: number;
}

export interface FitSettings {
  readonly chains: number;
  readonly warmup: number;
  readonly draws: number;
  readonly seed: number;
  readonly maxTreeDepth: number;
  readonly targetAcceptance: number;
  readonly unpooled: boolean;
  readonly retryAtHigherAcceptance: boolean;
  readonly model: {
    readonly maxLag: number;
    readonly saturation: SaturationKind;
    readonly likelihood: LikelihoodKind;
    readonly seasonalityOrder: number;
    readonly pooling: PoolingLevels;
    readonly holdoutWeeks: number;
    /** Plausible low-spend CAC per channel (90 % interval) behind the prior of μ. */
    readonly cacRange: readonly { readonly channel: string; readonly lo: number; readonly hi: number }[];
    readonly liftTests: number;
  };
}

/** Channel-level parameters of the pooled model; a τ is null when its pooling level is off. */
export interface ChannelResult {
  readonly channel: string;
  readonly mu: PosteriorSummary;
  readonly tauBrand: PosteriorSummary | null;
  readonly tauMarket: PosteriorSummary | null;
  readonly tauCell: PosteriorSummary;
  readonly alpha: PosteriorSummary;
  readonly lambda: PosteriorSummary;
}

/** One brand × market cell and channel: the low-spend CAC pooled and alone, and how far pooling moved it. */
export interface CellChannelResult {
  /** 0-based position of the cell in the data. */
  readonly cell: number;
  readonly brand: string;
  readonly market: string;
  readonly channel: string;
  /** False when the cell never spent on the channel (its CAC is then the prior's, not the data's). */
  readonly hasSpend: boolean;
  /** CAC0 = 1/β of the pooled model. */
  readonly cac0: PosteriorSummary;
  /** CAC0 of the no-pooling comparison; null when it was not fitted. */
  readonly cac0Unpooled: PosteriorSummary | null;
  /** (m_unpooled − m_pooled)/(m_unpooled − m_group) of log β, not clipped (NaN when undefined); null without the comparison. */
  readonly shrinkage: number | null;
  /** A candidate outlier (shrinkage module's rule); the analyst decides. Always false without the comparison. */
  readonly outlier: boolean;
  readonly outlierReason: string | null;
}

/** Pooling factor (Gelman & Pardoe 2006) of one level and channel. */
export interface PoolingFactorResult {
  readonly level: "brand" | "market" | "cell";
  readonly channel: string;
  readonly poolingFactor: number;
}

export interface FitResult {
  readonly settings: FitSettings;
  readonly diagnostics: FitDiagnostics;
  readonly timing: FitTiming;
  readonly channels: readonly ChannelResult[];
  readonly cells: readonly CellChannelResult[];
  /** Per level and channel; computed with the no-pooling comparison (empty without it). */
  readonly poolingFactors: readonly PoolingFactorResult[];
  /** The pooled posterior in the compact form planning works from (decisions/draw-set). */
  readonly drawSet: DrawSet;
}

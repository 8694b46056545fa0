import type { TrustThresholds } from "../diagnostics/trust";
import { resolvePortfolioOptions, type PortfolioModelOptions, type ResolvedPortfolioOptions } from "../model/portfolio/portfolio-options";
import { defaultSamplerSettings, resolveSamplerSettings, type SamplerSettings } from "../sampler/sampler-settings";

/** Options of a portfolio fit; every field is optional and defaults to the reference settings. */
export interface FitOptions {
  readonly chains?: number;
  readonly warmup?: number;
  readonly draws?: number;
  readonly seed?: number;
  readonly maxTreeDepth?: number;
  /** Target acceptance of the step-size adaptation (default 0.8). */
  readonly targetAcceptance?: number;
  /** Fit the no-pooling comparison beside the pooled model (default true). */
  readonly unpooled?: boolean;
  /**
   * When a model's run ends with divergences after warm-up, run it once more with target
   * acceptance 0.9 (the inference defaults: 0.8, 0.9 when divergences appear). Default true.
   */
  readonly retryAtHigherAcceptance?: boolean;
  readonly model?: PortfolioModelOptions;
  readonly trustThresholds?: Partial<TrustThresholds>;
}

/** Target acceptance of the second run when the first one diverged. */
export const RETRY_TARGET_ACCEPTANCE = 0.9;

export interface ResolvedFitOptions {
  readonly sampler: Required<SamplerSettings>;
  readonly unpooled: boolean;
  readonly retryAtHigherAcceptance: boolean;
  readonly model: PortfolioModelOptions;
  readonly resolvedModel: ResolvedPortfolioOptions;
  readonly trustThresholds: Partial<TrustThresholds>;
}

/** Fills in the defaults and checks everything up front; throws a RangeError naming each problem. */
export function resolveFitOptions(channels: readonly string[], options: FitOptions = {}): ResolvedFitOptions {
  let sampler: Required<SamplerSettings>;
  try {
    sampler = resolveSamplerSettings({
      chains: options.chains ?? defaultSamplerSettings.chains,
      warmup: options.warmup ?? defaultSamplerSettings.warmup,
      draws: options.draws ?? defaultSamplerSettings.draws,
      seed: options.seed ?? defaultSamplerSettings.seed,
      maxTreeDepth: options.maxTreeDepth ?? defaultSamplerSettings.maxTreeDepth,
      targetAcceptance: options.targetAcceptance ?? defaultSamplerSettings.targetAcceptance,
    });
  } catch (error) {
    throw new RangeError((error as Error).message);
  }
  const unpooled = options.unpooled ?? true;
  if (typeof unpooled !== "boolean") throw new RangeError(`unpooled must be true or false, got ${String(unpooled)}`);
  const retry = options.retryAtHigherAcceptance ?? true;
  if (typeof retry !== "boolean") throw new RangeError(`retryAtHigherAcceptance must be true or false, got ${String(retry)}`);
  const model = options.model ?? {};
  return {
    sampler,
    unpooled,
    retryAtHigherAcceptance: retry,
    model,
    resolvedModel: resolvePortfolioOptions(channels, model),
    trustThresholds: options.trustThresholds ?? {},
  };
}

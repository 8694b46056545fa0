import type { ModelSpec } from "../model/density-model";
import type { ChainProgress, ChainResult, SamplerSettings } from "../sampler/sampler-settings";
import type { RunChains } from "./chain-runner";
import { FitCancelledError } from "./fit-cancelled";
import { RETRY_TARGET_ACCEPTANCE } from "./fit-options";

/** The chains of one model (one cell's model, for the no-pooling fit), as finally kept. */
export interface ModelRun {
  readonly chains: readonly ChainResult[];
  readonly targetAcceptance: number;
  /** Target acceptance of the first run (differs from targetAcceptance after a rerun). */
  readonly firstTargetAcceptance: number;
  readonly attempts: number;
  /** Post-warm-up divergences of the first run, when it was run again. */
  readonly firstRunDivergences: number;
}

export interface ModelRunHooks {
  readonly runChains: RunChains;
  readonly signal?: AbortSignal;
  /** Progress of the run with its attempt number (1, or 2 for the rerun). */
  readonly onProgress: (progress: ChainProgress, attempt: number) => void;
}

export function postWarmupDivergences(chains: readonly ChainResult[]): number {
  let count = 0;
  for (const chain of chains) for (let i = 0; i < chain.divergent.length; i++) count += chain.divergent[i]!;
  return count;
}

/**
 * Runs the chains of one model; when divergences remain after warm-up and `retry` is on,
 * runs it once more at target acceptance 0.9 (a smaller step) and keeps the second run.
 * Throws FitCancelledError when the signal aborts.
 */
export async function runModel(spec: ModelSpec, settings: SamplerSettings, retry: boolean, hooks: ModelRunHooks): Promise<ModelRun> {
  const aborted = (): boolean => hooks.signal?.aborted === true;
  const once = async (s: SamplerSettings, attempt: number): Promise<ChainResult[]> => {
    if (aborted()) throw new FitCancelledError();
    const chains = await hooks.runChains(spec, s, (p) => hooks.onProgress(p, attempt), hooks.signal);
    if (aborted() || chains.some((c) => c.cancelled)) throw new FitCancelledError();
    if (chains.length !== s.chains) throw new Error(`the chain runner returned ${chains.length} chains, ${s.chains} were asked for`);
    return chains;
  };
  const first = await once(settings, 1);
  const divergences = postWarmupDivergences(first);
  if (!retry || divergences === 0 || settings.targetAcceptance >= RETRY_TARGET_ACCEPTANCE) {
    return { chains: first, targetAcceptance: settings.targetAcceptance, firstTargetAcceptance: settings.targetAcceptance, attempts: 1, firstRunDivergences: 0 };
  }
  const second = await once({ ...settings, targetAcceptance: RETRY_TARGET_ACCEPTANCE }, 2);
  return {
    chains: second,
    targetAcceptance: RETRY_TARGET_ACCEPTANCE,
    firstTargetAcceptance: settings.targetAcceptance,
    attempts: 2,
    firstRunDivergences: divergences,
  };
}

import type { ModelSpec } from "../model/density-model";
import { buildModel } from "../models/registry";
import { emptyCancelledChain } from "../parallel/endpoint-pool";
import { sampleChain } from "../sampler/sample-chain";
import { resolveSamplerSettings, type ChainProgress, type ChainResult, type SamplerSettings } from "../sampler/sampler-settings";

/**
 * How the chains of one model are run: all `settings.chains` chains of `spec`, reporting
 * progress, stopping promptly once `signal` aborts (the chains then come back marked
 * `cancelled`). Injected so that the same fit runs in this thread, in Node worker threads
 * (SamplerWorkerPool.run) or in browser workers (sampleChainsOnEndpoints).
 */
export type RunChains = (
  spec: ModelSpec,
  settings: SamplerSettings,
  onProgress: (progress: ChainProgress) => void,
  signal?: AbortSignal,
) => Promise<ChainResult[]>;

/**
 * The default runner: one chain after another in this thread. The thread is busy while a
 * chain runs, so an abort is seen between chains and whenever the signal is aborted from
 * inside a progress callback; for prompt stops from outside, use worker threads.
 */
export const runChainsInThread: RunChains = async (spec, settings, onProgress, signal) => {
  const s = resolveSamplerSettings(settings);
  const model = buildModel(spec);
  const results: ChainResult[] = [];
  const stopped = (): boolean => signal?.aborted === true;
  for (let chain = 0; chain < s.chains; chain++) {
    if (stopped()) {
      results.push(emptyCancelledChain(chain, model.constrainedNames, model.dimension, s.maxTreeDepth));
      continue;
    }
    results.push(sampleChain(model, settings, chain, { onProgress, shouldStop: stopped }));
    // let timers and signal handlers run between chains
    await new Promise<void>((resolve) => setTimeout(resolve, 0));
  }
  return results;
};

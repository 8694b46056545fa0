import type { ModelSpec } from "../model/density-model";
import { buildModel } from "../models/registry";
import { resolveSamplerSettings, type ChainProgress, type ChainResult, type SamplerSettings } from "../sampler/sampler-settings";
import { createStopFlag } from "./sampler-endpoint";

/** A (possibly remote, e.g. Comlink-wrapped) sampler endpoint. */
export interface ChainEndpoint {
  sampleChain(
    spec: ModelSpec,
    settings: SamplerSettings,
    chain: number,
    onProgress?: (progress: ChainProgress) => unknown,
    stopFlag?: Int32Array,
  ): ChainResult | Promise<ChainResult>;
}

export interface EndpointPoolHooks {
  onProgress?(progress: ChainProgress): void;
  signal?: AbortSignal;
  /** Wraps the progress callback before it crosses to a worker (pass `Comlink.proxy`). */
  wrapCallback?<F extends (progress: ChainProgress) => unknown>(callback: F): F;
}

/**
 * Runs `settings.chains` chains over the given endpoints (one chain per endpoint at a
 * time, the next chain going to whichever endpoint frees up first). Works wherever the
 * endpoints live: the browser's Web Workers through Comlink, or in-process. Stopping via
 * `signal` needs a SharedArrayBuffer (cross-origin isolation in browsers); without it, the
 * caller should terminate the workers.
 */
export async function sampleChainsOnEndpoints(
  endpoints: readonly ChainEndpoint[],
  spec: ModelSpec,
  settings: SamplerSettings,
  hooks: EndpointPoolHooks = {},
): Promise<ChainResult[]> {
  const s = resolveSamplerSettings(settings);
  if (endpoints.length === 0) throw new Error("at least one sampler endpoint is needed");
  const model = buildModel(spec);
  const stopFlag = createStopFlag();
  const stop = (): void => void Atomics.store(stopFlag, 0, 1);
  hooks.signal?.addEventListener("abort", stop, { once: true });
  if (hooks.signal?.aborted === true) stop();

  const results: ChainResult[] = new Array<ChainResult>(s.chains);
  let nextChain = 0;
  const progress = hooks.onProgress === undefined ? undefined : (p: ChainProgress) => hooks.onProgress!(p);
  const callback = progress === undefined || hooks.wrapCallback === undefined ? progress : hooks.wrapCallback(progress);
  const runOn = async (endpoint: ChainEndpoint): Promise<void> => {
    while (nextChain < s.chains) {
      const chain = nextChain++;
      if (Atomics.load(stopFlag, 0) !== 0) {
        results[chain] = emptyCancelledChain(chain, model.constrainedNames, model.dimension, s.maxTreeDepth);
        continue;
      }
      results[chain] = await endpoint.sampleChain(spec, settings, chain, callback, stopFlag);
    }
  };
  try {
    await Promise.all(endpoints.slice(0, s.chains).map(runOn));
  } catch (error) {
    stop();
    throw error;
  } finally {
    hooks.signal?.removeEventListener("abort", stop);
  }
  return results;
}

/** The result of a chain that never started because the run was stopped first. */
export function emptyCancelledChain(chain: number, names: readonly string[], dimension: number, maxTreeDepth: number): ChainResult {
  return {
    chain,
    names: [...names],
    draws: new Float64Array(0),
    treeDepth: new Uint8Array(0),
    leapfrogSteps: new Int32Array(0),
    divergent: new Uint8Array(0),
    energy: new Float64Array(0),
    acceptStat: new Float64Array(0),
    logDensity: new Float64Array(0),
    stepSize: Number.NaN,
    inverseMetric: new Float64Array(dimension).fill(Number.NaN),
    gradientEvaluations: 0,
    warmupDivergences: 0,
    maxTreeDepth,
    seconds: 0,
    cancelled: true,
  };
}

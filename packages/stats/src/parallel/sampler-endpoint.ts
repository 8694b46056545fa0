import type { ModelSpec } from "../model/density-model";
import { buildModel } from "../models/registry";
import { sampleChain } from "../sampler/sample-chain";
import type { ChainProgress, ChainResult, SamplerSettings } from "../sampler/sampler-settings";

/**
 * What a worker exposes: run one chain of a model given as plain data. The object holds
 * no state and imports nothing platform-specific, so the same code serves a Node worker
 * thread and a browser Web Worker (`Comlink.expose(samplerEndpoint)`; pass the progress
 * callback through `Comlink.proxy`).
 */
export interface SamplerEndpoint {
  /**
   * `stopFlag` is an Int32Array over a SharedArrayBuffer; the chain stops after the current
   * iteration once element 0 is non-zero (a worker busy in a synchronous loop cannot
   * receive messages, so cancellation goes through shared memory).
   */
  sampleChain(
    spec: ModelSpec,
    settings: SamplerSettings,
    chain: number,
    onProgress?: (progress: ChainProgress) => unknown,
    stopFlag?: Int32Array,
  ): ChainResult;
}

export const samplerEndpoint: SamplerEndpoint = {
  sampleChain(spec, settings, chain, onProgress, stopFlag) {
    const model = buildModel(spec);
    return sampleChain(model, settings, chain, {
      onProgress: onProgress === undefined ? undefined : (p) => void onProgress(p),
      shouldStop: stopFlag === undefined ? undefined : () => Atomics.load(stopFlag, 0) !== 0,
    });
  },
};

/** A shared stop flag for `sampleChain` in other threads; plain memory where SharedArrayBuffer is unavailable. */
export function createStopFlag(): Int32Array {
  const shared = typeof SharedArrayBuffer === "function";
  return new Int32Array(shared ? new SharedArrayBuffer(4) : new ArrayBuffer(4));
}

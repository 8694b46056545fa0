import { availableParallelism } from "node:os";
import { fileURLToPath } from "node:url";
import { Worker } from "node:worker_threads";
import type { ModelSpec } from "../model/density-model";
import { buildModel } from "../models/registry";
import { resolveSamplerSettings, type ChainResult, type SamplerHooks, type SamplerSettings } from "../sampler/sampler-settings";
import { emptyCancelledChain } from "./endpoint-pool";
import type { RunChainMessage, WorkerReply } from "./node-chain-worker";
import { createStopFlag } from "./sampler-endpoint";

// Workers start from a CommonJS bootstrap that requires the TypeScript entry (see there why).
const workerBootstrap = new URL("./node-chain-worker-bootstrap.cjs", import.meta.url);
const workerEntry = fileURLToPath(new URL("./node-chain-worker.ts", import.meta.url));

export interface WorkerPoolHooks extends SamplerHooks {
  signal?: AbortSignal;
  /** Most worker threads to start; default: the number of cores. */
  maxWorkers?: number;
}

/**
 * Runs the chains of a run on Node worker threads: one worker per chain, at most one per
 * core; a worker that finishes takes the next waiting chain. Workers receive only the
 * ModelSpec and rebuild the model with buildModel. Chain k uses random stream k of the
 * seed, so the draws equal those of sampleChain(model, settings, k) in this thread.
 * Stopping (signal or shouldStop) ends every chain after its current iteration and
 * resolves with the draws so far, marked `cancelled`.
 */
export async function sampleChainsInWorkers(spec: ModelSpec, settings: SamplerSettings, hooks: WorkerPoolHooks = {}): Promise<ChainResult[]> {
  const s = resolveSamplerSettings(settings);
  const model = buildModel(spec); // fail here, with the model's own message, before any thread starts
  const workerCount = Math.max(1, Math.min(s.chains, hooks.maxWorkers ?? availableParallelism()));
  const stopFlag = createStopFlag();
  const results: ChainResult[] = new Array<ChainResult>(s.chains);
  const workers: Worker[] = [];
  let nextChain = 0;
  let finished = 0;

  return new Promise<ChainResult[]>((resolve, reject) => {
    let settled = false;
    const stop = (): void => void Atomics.store(stopFlag, 0, 1);
    const cleanUp = (): void => {
      hooks.signal?.removeEventListener("abort", stop);
      for (const w of workers) void w.terminate();
    };
    const fail = (error: Error): void => {
      if (settled) return;
      settled = true;
      stop();
      cleanUp();
      reject(error);
    };
    const chainDone = (chain: number, result: ChainResult): void => {
      results[chain] = result;
      finished++;
      if (finished === s.chains && !settled) {
        settled = true;
        cleanUp();
        resolve(results);
      }
    };
    const startNext = (worker: Worker): void => {
      while (nextChain < s.chains) {
        const chain = nextChain++;
        if (Atomics.load(stopFlag, 0) !== 0) {
          chainDone(chain, emptyCancelledChain(chain, model.constrainedNames, model.dimension, s.maxTreeDepth));
          continue;
        }
        const message: RunChainMessage = { type: "run", spec, settings, chain, stopFlag };
        worker.postMessage(message);
        return;
      }
    };

    hooks.signal?.addEventListener("abort", stop, { once: true });
    if (hooks.signal?.aborted === true) stop();

    for (let i = 0; i < workerCount; i++) {
      const worker = new Worker(workerBootstrap, { execArgv: ["--import", "tsx"], workerData: { entry: workerEntry } });
      workers.push(worker);
      worker.on("message", (reply: WorkerReply) => {
        if (reply.type === "progress") {
          hooks.onProgress?.(reply.progress);
          if (hooks.shouldStop?.() === true) stop();
        } else if (reply.type === "done") {
          chainDone(reply.result.chain, reply.result);
          startNext(worker);
        } else {
          fail(new Error(`chain ${reply.chain + 1} failed: ${reply.message}`));
        }
      });
      worker.on("error", (error) => fail(error instanceof Error ? error : new Error(String(error))));
      worker.on("exit", (code) => {
        if (!settled && code !== 0) fail(new Error(`a sampler worker stopped unexpectedly (exit code ${code})`));
      });
      startNext(worker);
    }
  });
}

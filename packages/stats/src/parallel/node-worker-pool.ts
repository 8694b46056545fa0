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
 * Worker threads that run chains, kept between runs so later runs skip thread start-up
 * (about half a second per thread). One run at a time; `close` ends the threads.
 */
export class SamplerWorkerPool {
  private readonly maxWorkers: number;
  private readonly workers: Worker[] = [];
  private busy = false;
  private closed = false;

  constructor(options: { maxWorkers?: number } = {}) {
    const cores = availableParallelism();
    const requested = options.maxWorkers ?? cores;
    if (!Number.isInteger(requested) || requested < 1) throw new Error(`maxWorkers must be a positive integer, got ${String(requested)}`);
    this.maxWorkers = Math.min(requested, cores);
  }

  /**
   * Runs the chains of a run: one worker per chain, at most one per core; a worker that
   * finishes takes the next waiting chain. Workers receive only the ModelSpec and rebuild
   * the model with buildModel. Chain k uses random stream k of the seed, so its draws equal
   * sampleChain(model, settings, k) in this thread. Stopping (signal or shouldStop) ends
   * every chain after its current iteration and resolves with the draws so far, marked
   * `cancelled`.
   */
  async run(spec: ModelSpec, settings: SamplerSettings, hooks: WorkerPoolHooks = {}): Promise<ChainResult[]> {
    if (this.closed) throw new Error("this sampler worker pool is closed");
    if (this.busy) throw new Error("this sampler worker pool is already running a fit; wait for it or use another pool");
    const s = resolveSamplerSettings(settings);
    const model = buildModel(spec); // fail here, with the model's own message, before any thread starts
    this.busy = true;
    try {
      return await this.runChains(spec, settings, s.chains, hooks, model.constrainedNames, model.dimension, s.maxTreeDepth);
    } finally {
      this.busy = false;
    }
  }

  async close(): Promise<void> {
    this.closed = true;
    await Promise.all(this.workers.splice(0).map((w) => w.terminate()));
  }

  private runChains(
    spec: ModelSpec,
    settings: SamplerSettings,
    chains: number,
    hooks: WorkerPoolHooks,
    names: readonly string[],
    dimension: number,
    maxTreeDepth: number,
  ): Promise<ChainResult[]> {
    const workerCount = Math.max(1, Math.min(chains, hooks.maxWorkers ?? this.maxWorkers, this.maxWorkers));
    while (this.workers.length < workerCount) this.workers.push(new Worker(workerBootstrap, { execArgv: ["--import", "tsx"], workerData: { entry: workerEntry } }));
    const active = this.workers.slice(0, workerCount);
    const stopFlag = createStopFlag();
    const results: ChainResult[] = new Array<ChainResult>(chains);
    let nextChain = 0;
    let finished = 0;

    return new Promise<ChainResult[]>((resolve, reject) => {
      let settled = false;
      const stop = (): void => void Atomics.store(stopFlag, 0, 1);
      const detachers: (() => void)[] = [];
      const detach = (): void => {
        hooks.signal?.removeEventListener("abort", stop);
        // Only our own listeners: Node's terminate() waits on an "exit" listener of its own.
        for (const off of detachers.splice(0)) off();
      };
      const fail = (error: Error): void => {
        if (settled) return;
        settled = true;
        stop();
        detach();
        // A failed run leaves workers in an unknown state: drop them all.
        void Promise.all(this.workers.splice(0).map((w) => w.terminate()));
        reject(error);
      };
      const chainDone = (chain: number, result: ChainResult): void => {
        results[chain] = result;
        finished++;
        if (finished === chains && !settled) {
          settled = true;
          detach();
          resolve(results);
        }
      };
      const startNext = (worker: Worker): void => {
        while (nextChain < chains) {
          const chain = nextChain++;
          if (Atomics.load(stopFlag, 0) !== 0) {
            chainDone(chain, emptyCancelledChain(chain, names, dimension, maxTreeDepth));
            continue;
          }
          const message: RunChainMessage = { type: "run", spec, settings, chain, stopFlag };
          worker.postMessage(message);
          return;
        }
      };

      hooks.signal?.addEventListener("abort", stop, { once: true });
      if (hooks.signal?.aborted === true) stop();

      for (const worker of active) {
        const onMessage = (reply: WorkerReply): void => {
          if (reply.type === "progress") {
            hooks.onProgress?.(reply.progress);
            if (hooks.shouldStop?.() === true) stop();
          } else if (reply.type === "done") {
            chainDone(reply.result.chain, reply.result);
            startNext(worker);
          } else {
            fail(new Error(`chain ${reply.chain + 1} failed: ${reply.message}`));
          }
        };
        const onError = (error: unknown): void => fail(error instanceof Error ? error : new Error(String(error)));
        const onExit = (code: number): void =>
          fail(new Error(this.closed ? "the sampler worker pool was closed while chains were running" : `a sampler worker stopped unexpectedly (exit code ${code})`));
        worker.on("message", onMessage);
        worker.on("error", onError);
        worker.on("exit", onExit);
        detachers.push(() => {
          worker.off("message", onMessage);
          worker.off("error", onError);
          worker.off("exit", onExit);
        });
      }
      for (const worker of active) startNext(worker);
    });
  }
}

/** Runs all chains of a run on fresh worker threads and ends them afterwards (see SamplerWorkerPool.run). */
export async function sampleChainsInWorkers(spec: ModelSpec, settings: SamplerSettings, hooks: WorkerPoolHooks = {}): Promise<ChainResult[]> {
  resolveSamplerSettings(settings);
  buildModel(spec);
  const pool = new SamplerWorkerPool({ maxWorkers: hooks.maxWorkers });
  try {
    return await pool.run(spec, settings, hooks);
  } finally {
    await pool.close();
  }
}

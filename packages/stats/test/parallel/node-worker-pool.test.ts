import { describe, expect, it } from "vitest";
import { buildModel } from "../../src/models/registry";
import { SamplerWorkerPool, sampleChainsInWorkers } from "../../src/parallel/node-worker-pool";
import { sampleChain } from "../../src/sampler/sample-chain";
import type { ChainProgress, SamplerSettings } from "../../src/sampler/sampler-settings";

const spec = { kind: "eight-schools-noncentred", data: { y: [28, 8, -3, 7, -1, 1, 18, 12], sigma: [15, 10, 16, 11, 9, 11, 10, 18] } };
const settings: SamplerSettings = { chains: 3, warmup: 150, draws: 150, seed: 21, maxTreeDepth: 10, targetAcceptance: 0.8 };

describe("sampleChainsInWorkers (Node worker threads)", () => {
  it("gives exactly the draws of the in-thread chains for the same seed, in chain order", async () => {
    const progress: ChainProgress[] = [];
    const parallel = await sampleChainsInWorkers(spec, settings, { onProgress: (p) => progress.push(p), maxWorkers: 2 });
    const model = buildModel(spec);
    expect(parallel.map((r) => r.chain)).toEqual([0, 1, 2]);
    for (let k = 0; k < 3; k++) {
      const local = sampleChain(model, settings, k);
      expect(parallel[k]!.draws).toEqual(local.draws);
      expect(parallel[k]!.energy).toEqual(local.energy);
      expect(parallel[k]!.cancelled).toBe(false);
    }
    expect(new Set(progress.map((p) => p.chain))).toEqual(new Set([0, 1, 2]));
    expect(progress.filter((p) => p.iteration === 300)).toHaveLength(3);
  });

  it("stops all chains promptly when the signal aborts", async () => {
    const controller = new AbortController();
    const long: SamplerSettings = { ...settings, chains: 2, warmup: 200_000, draws: 200_000 };
    let seenAt = 0;
    const started = Date.now();
    const results = await sampleChainsInWorkers(spec, long, {
      signal: controller.signal,
      onProgress: (p) => {
        if (p.iteration >= 2000 && seenAt === 0) {
          seenAt = Date.now();
          controller.abort();
        }
      },
    });
    expect(results).toHaveLength(2);
    for (const r of results) {
      expect(r.cancelled).toBe(true);
      expect(r.draws.length).toBe(0); // stopped during warm-up, long before the draws
    }
    // Stopping does not wait for the 400,000 iterations (that would take minutes); no
    // assertion on time itself, only that the run ended well before its end.
    expect(seenAt).toBeGreaterThan(started);
  });

  it("rejects bad input before starting any thread", async () => {
    await expect(sampleChainsInWorkers({ kind: "nope", data: {} }, settings)).rejects.toThrow(/unknown model kind/);
    await expect(sampleChainsInWorkers(spec, { ...settings, chains: 0 })).rejects.toThrow(/chains must be an integer/);
  });
});

describe("SamplerWorkerPool", () => {
  it("reuses its threads across runs and gives the same draws each time", async () => {
    const pool = new SamplerWorkerPool({ maxWorkers: 2 });
    try {
      const first = await pool.run(spec, { ...settings, chains: 2 });
      const second = await pool.run(spec, { ...settings, chains: 2 });
      expect(second[1]!.draws).toEqual(first[1]!.draws);
      await expect(Promise.all([pool.run(spec, settings), pool.run(spec, settings)])).rejects.toThrow(/already running/);
    } finally {
      await pool.close();
    }
    await expect(pool.run(spec, settings)).rejects.toThrow(/closed/);
  });

  it("reports a failing model in a worker as a rejected run", async () => {
    const pool = new SamplerWorkerPool({ maxWorkers: 1 });
    try {
      // Passes the main-thread check but has no finite starting point in the worker.
      const bad = { kind: "normal-mean", data: { y: [1e308, -1e308, 1e308], sigma: 1e-300, priorMean: 0, priorSd: 1 } };
      await expect(pool.run(bad, { ...settings, chains: 1 })).rejects.toThrow(/chain 1 failed: no starting point/);
    } finally {
      await pool.close();
    }
  });
});

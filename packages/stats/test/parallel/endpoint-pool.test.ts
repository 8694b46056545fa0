import { describe, expect, it } from "vitest";
import { buildModel } from "../../src/models/registry";
import { sampleChainsOnEndpoints, type ChainEndpoint } from "../../src/parallel/endpoint-pool";
import { samplerEndpoint } from "../../src/parallel/sampler-endpoint";
import { sampleChain } from "../../src/sampler/sample-chain";
import type { SamplerSettings } from "../../src/sampler/sampler-settings";

const spec = { kind: "normal-mean", data: { y: [1, 2, 3], sigma: 1, priorMean: 0, priorSd: 10 } };
const settings: SamplerSettings = { chains: 4, warmup: 100, draws: 100, seed: 3, maxTreeDepth: 10, targetAcceptance: 0.8 };

/** An endpoint that answers asynchronously, as a Comlink-wrapped Web Worker does. */
const asyncEndpoint = (): ChainEndpoint => ({
  sampleChain: async (...args) => {
    await new Promise((r) => setTimeout(r, 1));
    return samplerEndpoint.sampleChain(...args);
  },
});

describe("sampleChainsOnEndpoints (the browser path, exercised in-process)", () => {
  it("spreads chains over endpoints and equals the in-thread chains", async () => {
    const results = await sampleChainsOnEndpoints([asyncEndpoint(), asyncEndpoint()], spec, settings, { wrapCallback: (f) => f });
    const model = buildModel(spec);
    expect(results.map((r) => r.chain)).toEqual([0, 1, 2, 3]);
    results.forEach((r, k) => expect(r.draws).toEqual(sampleChain(model, settings, k).draws));
  });

  it("returns cancelled, empty chains when stopped before they start", async () => {
    const controller = new AbortController();
    controller.abort();
    const results = await sampleChainsOnEndpoints([asyncEndpoint()], spec, settings, { signal: controller.signal });
    expect(results.every((r) => r.cancelled && r.draws.length === 0)).toBe(true);
  });

  it("passes a worker's error on", async () => {
    const failing: ChainEndpoint = { sampleChain: () => Promise.reject(new Error("worker lost")) };
    await expect(sampleChainsOnEndpoints([failing], spec, settings)).rejects.toThrow(/worker lost/);
  });
});

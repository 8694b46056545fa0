import { describe, expect, it } from "vitest";
import { createStopFlag, samplerEndpoint } from "../../src/parallel/sampler-endpoint";

const spec = { kind: "normal-mean", data: { y: [0.5], sigma: 1, priorMean: 0, priorSd: 1 } };
const settings = { chains: 1, warmup: 50, draws: 50, seed: 9, maxTreeDepth: 10, targetAcceptance: 0.8 };

describe("sampler endpoint (what a Web Worker exposes through Comlink)", () => {
  it("rebuilds the model from its spec and runs one chain with progress", () => {
    const seen: number[] = [];
    const r = samplerEndpoint.sampleChain(spec, settings, 0, (p) => seen.push(p.iteration));
    expect(r.names).toEqual(["mu"]);
    expect(r.draws.length).toBe(50);
    expect(seen.at(-1)).toBe(100);
  });

  it("stops at once when the shared stop flag is already set", () => {
    const flag = createStopFlag();
    Atomics.store(flag, 0, 1);
    const r = samplerEndpoint.sampleChain(spec, settings, 0, undefined, flag);
    expect(r.cancelled).toBe(true);
    expect(r.draws.length).toBe(0);
  });

  it("returns plain data that survives structured cloning", () => {
    const r = samplerEndpoint.sampleChain(spec, settings, 0);
    expect(structuredClone(r)).toEqual(r);
  });
});

import { describe, expect, it } from "vitest";
import { summariseRun } from "../../src/diagnostics/summarise-run";
import { buildModel } from "../../src/models/registry";
import { sampleChain } from "../../src/sampler/sample-chain";

describe("centred funnel (Neal 2003)", () => {
  it("reports divergent transitions and an untrustworthy run", () => {
    const model = buildModel({ kind: "funnel-centred", data: { dimension: 9 } });
    const settings = { chains: 4, warmup: 500, draws: 500, seed: 13, maxTreeDepth: 10, targetAcceptance: 0.8 };
    const chains = Array.from({ length: 4 }, (_, k) => sampleChain(model, settings, k));
    const summary = summariseRun(chains);
    expect(summary.diagnostics.divergences).toBeGreaterThan(0);
    expect(summary.diagnostics.trustworthy).toBe(false);
    expect(summary.diagnostics.reasons.some((r) => /divergent transition/.test(r))).toBe(true);
  });
});

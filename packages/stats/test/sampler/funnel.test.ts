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

  it("records where divergent transitions start and blow up, without changing the draws", () => {
    const model = buildModel({ kind: "funnel-centred", data: { dimension: 9 } });
    const settings = { chains: 1, warmup: 300, draws: 300, seed: 13, maxTreeDepth: 10, targetAcceptance: 0.8 };
    const plain = sampleChain(model, settings, 0);
    const recorded = sampleChain(model, { ...settings, recordDivergences: true }, 0);
    expect(plain.divergences).toBeUndefined();
    expect(recorded.draws).toEqual(plain.draws);
    const records = recorded.divergences!;
    const sampling = records.filter((r) => r.phase === "sampling");
    expect(sampling.length).toBeGreaterThan(0);
    expect(sampling).toHaveLength(Array.from(recorded.divergent).reduce((a, b) => a + b, 0));
    expect(records.length).toBe(sampling.length + recorded.warmupDivergences!);
    for (const r of sampling) {
      // the trajectory starts where the previous iteration's draw is (iteration − warm-up − 1)
      const previous = r.iteration - settings.warmup - 1;
      if (previous >= 0) expect(Array.from(r.startConstrained)).toEqual(Array.from(recorded.draws.subarray(previous * 10, previous * 10 + 10)));
      expect(r.start).toHaveLength(10);
      expect(r.end).toHaveLength(10);
      expect(r.stepSize).toBe(recorded.stepSize);
      // the funnel diverges at its neck or mouth: the log scale v moved away from where it started
      expect(r.end[0]).not.toBe(r.start[0]);
    }
    expect(() => sampleChain(model, { ...settings, recordDivergences: "yes" as unknown as boolean }, 0)).toThrow(/recordDivergences/);
  });
});

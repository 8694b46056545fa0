import { describe, expect, it } from "vitest";
import { mcseMean } from "../../src/diagnostics/mcse";
import { logSpacedScales } from "../../src/models/examples/scaled-gaussian";
import { buildModel } from "../../src/models/registry";
import { sampleChain } from "../../src/sampler/sample-chain";

describe("100-dimensional Gaussian with scales from 0.01 to 100", () => {
  const scales = logSpacedScales(100, 0.01, 100);
  const model = buildModel({ kind: "scaled-gaussian", data: { scales } });
  const settings = { chains: 4, warmup: 1000, draws: 1000, seed: 77, maxTreeDepth: 10, targetAcceptance: 0.8 };
  const results = Array.from({ length: 4 }, (_, k) => sampleChain(model, settings, k));
  const width = 100;

  it("recovers every variance: E[x_i²] within 4 MCSE of s_i² (exact target)", () => {
    const failures: string[] = [];
    for (let i = 0; i < width; i++) {
      const squared = results.map((r) => Float64Array.from({ length: r.draws.length / width }, (_, t) => r.draws[t * width + i]! ** 2));
      const n = squared.reduce((a, c) => a + c.length, 0);
      const second = squared.reduce((a, c) => a + c.reduce((x, y) => x + y, 0), 0) / n;
      const mcse = mcseMean(squared);
      if (!(Math.abs(second - scales[i]! ** 2) < 4 * mcse)) failures.push(`x[${i + 1}]: ${second} vs ${scales[i]! ** 2} (mcse ${mcse})`);
    }
    expect(failures).toEqual([]);
  });

  it("adapts the inverse metric to the variances (within a factor of 2 everywhere)", () => {
    for (const r of results) {
      for (let i = 0; i < width; i++) {
        const ratio = r.inverseMetric[i]! / scales[i]! ** 2;
        expect(ratio).toBeGreaterThan(0.5);
        expect(ratio).toBeLessThan(2);
      }
    }
  });

  it("needs short trajectories once adapted (mean tree depth below 4, no depth hits)", () => {
    for (const r of results) {
      const meanDepth = r.treeDepth.reduce((a, b) => a + b, 0) / r.treeDepth.length;
      expect(meanDepth).toBeLessThan(4);
      expect(r.treeDepth.every((d) => d < 10)).toBe(true);
    }
  });
});

import { describe, expect, it } from "vitest";
import { buildModel } from "../../src/models/registry";
import { sampleChain } from "../../src/sampler/sample-chain";
import type { ChainProgress, SamplerSettings } from "../../src/sampler/sampler-settings";

const spec = { kind: "eight-schools-noncentred", data: { y: [28, 8, -3, 7, -1, 1, 18, 12], sigma: [15, 10, 16, 11, 9, 11, 10, 18] } };
const model = buildModel(spec);
const settings: SamplerSettings = { chains: 2, warmup: 200, draws: 200, seed: 5, maxTreeDepth: 10, targetAcceptance: 0.8 };

describe("sampleChain", () => {
  it("gives identical draws for the same seed and chain", () => {
    const a = sampleChain(model, settings, 1);
    const b = sampleChain(model, settings, 1);
    expect(a.draws).toEqual(b.draws);
    expect(a.energy).toEqual(b.energy);
    expect(a.stepSize).toBe(b.stepSize);
  });

  it("gives different draws for another seed or another chain", () => {
    const a = sampleChain(model, settings, 0);
    expect(sampleChain(model, { ...settings, seed: 6 }, 0).draws).not.toEqual(a.draws);
    expect(sampleChain(model, settings, 1).draws).not.toEqual(a.draws);
  });

  it("fills the result: one row per kept draw, names as columns, sampler statistics", () => {
    const r = sampleChain(model, { ...settings, thin: 3 }, 0);
    const kept = Math.ceil(200 / 3);
    expect(r.names).toEqual(model.constrainedNames);
    expect(r.draws.length).toBe(kept * r.names.length);
    for (const a of [r.treeDepth, r.leapfrogSteps, r.divergent, r.energy, r.acceptStat, r.logDensity]) expect(a?.length).toBe(kept);
    expect(r.inverseMetric.length).toBe(model.dimension);
    expect(r.stepSize).toBeGreaterThan(0);
    const steps = Array.from(r.leapfrogSteps).reduce((a, b) => a + b, 0);
    expect(r.gradientEvaluations).toBeGreaterThan(steps);
    expect(r.cancelled).toBe(false);
    // tau is positive and theta_j = mu + tau * eta_j in every draw.
    const w = r.names.length;
    for (let t = 0; t < kept; t++) {
      const row = r.draws.subarray(t * w, (t + 1) * w);
      expect(row[1]).toBeGreaterThan(0);
      expect(row[2]).toBeCloseTo(row[0]! + row[1]! * row[10]!, 10);
    }
  });

  it("reports progress through both phases, ending at the total", () => {
    const seen: ChainProgress[] = [];
    sampleChain(model, settings, 0, { onProgress: (p) => seen.push(p) });
    expect(seen.length).toBeGreaterThan(10);
    expect(seen[0]!.phase).toBe("warmup");
    expect(seen.at(-1)).toMatchObject({ chain: 0, iteration: 400, total: 400, phase: "sampling" });
    expect(seen.some((p) => p.phase === "warmup" && p.iteration === 200)).toBe(true);
    for (let i = 1; i < seen.length; i++) expect(seen[i]!.iteration).toBeGreaterThan(seen[i - 1]!.iteration);
  });

  it("stops promptly when asked, keeping the draws so far", () => {
    let calls = 0;
    const r = sampleChain(model, settings, 0, { shouldStop: () => ++calls > 250 });
    expect(r.cancelled).toBe(true);
    expect(r.draws.length).toBe(50 * r.names.length);
    expect(calls).toBe(251);
  });

  it("rejects bad settings with one clear message and runs nothing", () => {
    expect(() => sampleChain(model, { ...settings, warmup: -1, targetAcceptance: 1.2 }, 0)).toThrow(
      /warmup must be an integer.*targetAcceptance must be a number strictly between 0 and 1/,
    );
    expect(() => sampleChain(model, { ...settings, draws: 0 }, 0)).toThrow(/draws/);
    expect(() => sampleChain(model, { ...settings, seed: -3 }, 0)).toThrow(/seed/);
    expect(() => sampleChain(model, { ...settings, thin: 0 }, 0)).toThrow(/thin/);
    expect(() => sampleChain(model, settings, -1)).toThrow(/chain index/);
  });

  it("explains a model whose density is never finite", () => {
    const broken = { dimension: 1, constrainedNames: ["x"], logDensityGradient: () => Number.NaN, constrain: () => undefined };
    expect(() => sampleChain(broken, settings, 0)).toThrow(/no starting point with a finite log density/);
  });
});

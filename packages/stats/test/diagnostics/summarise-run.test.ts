import { describe, expect, it } from "vitest";
import { ebfmi } from "../../src/diagnostics/ebfmi";
import { essBulk } from "../../src/diagnostics/ess";
import { quantile } from "../../src/diagnostics/quantile";
import { rhat } from "../../src/diagnostics/rhat";
import { splitChains } from "../../src/diagnostics/split-chains";
import { summariseRun } from "../../src/diagnostics/summarise-run";
import { assessTrust } from "../../src/diagnostics/trust";
import { createRandomSource } from "../../src/rng/create-random-source";
import type { ChainResult } from "../../src/sampler/sampler-settings";

/** A chain result of iid normal draws (mean `shift`) for two parameters, for testing the summary. */
function fakeChain(chain: number, draws: number, seed: number, shift = 0, divergences = 0): ChainResult {
  const rng = createRandomSource(seed, chain);
  const values = new Float64Array(draws * 2);
  for (let i = 0; i < draws; i++) {
    values[2 * i] = shift + rng.normal();
    values[2 * i + 1] = 10 + 2 * rng.normal();
  }
  const divergent = new Uint8Array(draws);
  for (let i = 0; i < divergences; i++) divergent[i] = 1;
  return {
    chain,
    names: ["a", "b"],
    draws: values,
    treeDepth: new Uint8Array(draws).fill(3),
    leapfrogSteps: new Int32Array(draws).fill(7),
    divergent,
    energy: Float64Array.from({ length: draws }, () => rng.normal()),
    acceptStat: new Float64Array(draws).fill(0.8),
    logDensity: new Float64Array(draws),
    stepSize: 0.5,
    inverseMetric: Float64Array.of(1, 4),
    gradientEvaluations: 8 * draws,
    warmupDivergences: 0,
    maxTreeDepth: 10,
    seconds: 0.1,
    cancelled: false,
  };
}

describe("E-BFMI", () => {
  it("is Σ(ΔE)² / Σ(E − Ē)² (hand-computed)", () => {
    // E = 1, 3, 2, 4: mean 2.5; squared deviations 2.25 + 0.25 + 0.25 + 2.25 = 5; steps 4 + 1 + 4 = 9.
    expect(ebfmi([1, 3, 2, 4])).toBeCloseTo(9 / 5, 14);
    expect(ebfmi([1])).toBeNaN();
  });

  it("is about 2 for independent energies (Betancourt 2016, §3)", () => {
    const rng = createRandomSource(8);
    expect(ebfmi(Float64Array.from({ length: 20000 }, () => rng.normal()))).toBeCloseTo(2, 1);
  });
});

describe("degenerate input", () => {
  it("returns NaN for constant or non-finite draws, like R's posterior", () => {
    const constant = [Float64Array.of(1, 1, 1, 1), Float64Array.of(1, 1, 1, 1)];
    expect(rhat(constant)).toBeNaN();
    expect(essBulk(constant)).toBeNaN();
    expect(rhat([Float64Array.of(1, 2, Number.NaN, 4), Float64Array.of(1, 2, 3, 4)])).toBeNaN();
  });

  it("drops the middle draw of an odd-length chain when splitting", () => {
    const [first, second] = splitChains([Float64Array.of(1, 2, 3, 4, 5)]);
    expect(Array.from(first!)).toEqual([1, 2]);
    expect(Array.from(second!)).toEqual([4, 5]);
  });

  it("computes type-7 quantiles (R's default) by hand", () => {
    // 1..10 at p = 0.05: index 0.45 → 1 + 0.45 = 1.45.
    expect(quantile(Float64Array.from({ length: 10 }, (_, i) => i + 1), 0.05)).toBeCloseTo(1.45, 14);
  });
});

describe("summariseRun", () => {
  it("summarises each parameter and trusts well-mixed chains", () => {
    const chains = [0, 1, 2, 3].map((k) => fakeChain(k, 500, 1));
    const s = summariseRun(chains);
    expect(s.parameters.map((p) => p.name)).toEqual(["a", "b"]);
    const b = s.parameters[1]!;
    expect(Math.abs(b.mean - 10)).toBeLessThan(4 * b.mcseMean);
    expect(b.sd).toBeCloseTo(2, 0);
    expect(b.q05).toBeLessThan(b.q50);
    expect(b.q50).toBeLessThan(b.q95);
    expect(s.diagnostics.trustworthy).toBe(true);
    expect(s.diagnostics.reasons).toEqual([]);
    expect(s.diagnostics.gradientEvaluations).toBe(4 * 8 * 500);
    expect(s.diagnostics.ebfmi).toHaveLength(4);
  });

  it("explains why a run is not trustworthy: shifted chain, few draws, divergences", () => {
    const chains = [fakeChain(0, 60, 2), fakeChain(1, 60, 2), fakeChain(2, 60, 2, 3, 2)];
    const s = summariseRun(chains);
    expect(s.diagnostics.trustworthy).toBe(false);
    expect(s.diagnostics.divergences).toBe(2);
    expect(s.diagnostics.reasons.join("\n")).toMatch(/R-hat is above 1.01 for 1 parameter \(worst: a at/);
    expect(s.diagnostics.reasons.join("\n")).toMatch(/Bulk ESS is below 400/);
    expect(s.diagnostics.reasons.join("\n")).toMatch(/2 divergent transitions after warm-up/);
  });

  it("cuts a stopped run to its shortest chain and says it was stopped", () => {
    const stopped = { ...fakeChain(1, 300, 3), cancelled: true };
    const s = summariseRun([fakeChain(0, 500, 3), stopped]);
    expect(s.diagnostics.reasons[0]).toMatch(/stopped before it finished/);
    expect(Number.isFinite(s.parameters[0]!.rhat)).toBe(true);
  });

  it("rejects no chains and mismatched names", () => {
    expect(() => summariseRun([])).toThrow(/at least one chain/);
    expect(() => summariseRun([fakeChain(0, 10, 1), { ...fakeChain(1, 10, 1), names: ["a", "c"] }])).toThrow(/different parameter names/);
  });

  it("advises by the target acceptance already used when divergences remain", () => {
    const input = { rhat: [{ name: "x", value: 1.001 }], essBulk: [{ name: "x", value: 1000 }], divergences: 3, draws: 4000, cancelled: false };
    const first = assessTrust({ ...input, targetAcceptance: 0.8 }).reasons.join(" ");
    expect(first).toMatch(/raise the target acceptance \(e\.g\. 0\.9; this run used 0\.8\)/);
    const rerun = assessTrust({ ...input, targetAcceptance: 0.9 }).reasons.join(" ");
    expect(rerun).toMatch(/already used target acceptance 0\.9/);
    expect(rerun).toMatch(/longer warm-up/);
    expect(rerun).not.toMatch(/raise the target acceptance/);
    expect(assessTrust(input).reasons.join(" ")).toMatch(/raise the target acceptance \(e\.g\. 0\.9\)/);
    const s = summariseRun([fakeChain(0, 500, 1, 0, 2), fakeChain(1, 500, 2)], { targetAcceptance: 0.95 });
    expect(s.diagnostics.reasons.join(" ")).toMatch(/already used target acceptance 0\.95/);
  });

  it("applies thresholds given by the caller", () => {
    const r = assessTrust({ rhat: [{ name: "x", value: 1.02 }], essBulk: [{ name: "x", value: 1000 }], divergences: 0, draws: 4000, cancelled: false }, {
      maxRhat: 1.05,
      minEssBulk: 400,
      maxDivergences: 0,
    });
    expect(r.trustworthy).toBe(true);
  });
});

import { describe, expect, it } from "vitest";
import type { ParameterSummary, RunSummary } from "../../src/diagnostics/summarise-run";
import { fitDiagnostics, unpooledModelDiagnostics, type CellRunSummary } from "../../src/fit/fit-diagnostics";
import type { ModelDiagnostics } from "../../src/fit/fit-result";
import type { ModelRun } from "../../src/fit/model-run";
import type { ChainResult } from "../../src/sampler/sampler-settings";

function parameter(name: string, rhat: number, essBulk: number): ParameterSummary {
  return { name, mean: 0, sd: 1, q05: -1.6, q50: 0, q95: 1.6, rhat, essBulk, essTail: essBulk, mcseMean: 0, mcseQ05: 0, mcseQ95: 0 };
}

function chain(k: number, draws: number, width: number): ChainResult {
  return {
    chain: k,
    names: Array.from({ length: width }, (_, i) => `p${i}`),
    draws: new Float64Array(draws * width),
    treeDepth: new Uint8Array(draws),
    leapfrogSteps: new Int32Array(draws),
    divergent: new Uint8Array(draws),
    energy: new Float64Array(draws),
    acceptStat: new Float64Array(draws),
    stepSize: 0.1,
    inverseMetric: new Float64Array(width),
    gradientEvaluations: 100,
    seconds: 1,
    cancelled: false,
  };
}

function cellRun(label: string, parameters: ParameterSummary[], divergences: number, attempts = 1): CellRunSummary {
  const summary: RunSummary = {
    parameters,
    diagnostics: {
      maxRhat: Math.max(...parameters.map((p) => p.rhat)),
      minEssBulk: Math.min(...parameters.map((p) => p.essBulk)),
      minEssTail: Math.min(...parameters.map((p) => p.essTail)),
      divergences,
      treeDepthHits: 1,
      ebfmi: [0.9, 0.8],
      gradientEvaluations: 200,
      trustworthy: false,
      reasons: [],
      warnings: ["1 transitions hit the maximum tree depth: sampling is inefficient, not necessarily wrong."],
    },
  };
  const run: ModelRun = {
    chains: [chain(0, 500, parameters.length), chain(1, 500, parameters.length)],
    targetAcceptance: attempts === 2 ? 0.9 : 0.8,
    firstTargetAcceptance: 0.8,
    attempts,
    firstRunDivergences: attempts === 2 ? 3 : 0,
  };
  return { label, summary, run };
}

describe("unpooledModelDiagnostics", () => {
  it("applies the trust rule over every cell's parameters and adds up the cells' counts", () => {
    const d = unpooledModelDiagnostics([
      cellRun("cell 0 (Alder × Northland)", [parameter("eta[0,search]", 1.002, 900), parameter("sigma[0]", 1.004, 1200)], 0),
      cellRun("cell 1 (Alder × Southmere)", [parameter("eta[1,search]", 1.03, 350), parameter("sigma[1]", NaN, NaN)], 2, 2),
    ]);
    expect(d.maxRhat).toBe(1.03);
    expect(d.minEssBulk).toBe(350);
    expect(d.divergences).toBe(2);
    expect(d.treeDepthHits).toBe(2);
    expect(d.gradientEvaluations).toBe(400);
    expect(d.ebfmi).toEqual([0.9, 0.8, 0.9, 0.8]);
    expect(d.trustworthy).toBe(false);
    // the three parts of the trust rule (Vehtari et al. 2021 for R-hat and ESS; divergences: Betancourt 2017)
    expect(d.reasons).toHaveLength(3);
    expect(d.reasons[0]).toMatch(/^R-hat is above 1\.01 for 1 parameter \(worst: eta\[1,search\] at 1\.030\)/);
    expect(d.reasons[1]).toMatch(/^Bulk ESS is below 400 for 1 parameter \(lowest: eta\[1,search\] at 350\)/);
    expect(d.reasons[2]).toMatch(/^2 divergent transitions after warm-up/);
    // the diverging cell was already rerun at 0.9: the advice says so instead of asking for 0.9
    expect(d.reasons[2]).toMatch(/already used target acceptance 0\.9/);
    expect(d.reasons[2]).not.toMatch(/raise the target acceptance/);
    expect(d.attempts).toBe(2);
    expect(d.targetAcceptance).toBe(0.9);
    expect(d.warnings).toContain(
      "The no-pooling model of cell 1 (Alder × Southmere) had 3 divergent transitions after warm-up at target acceptance 0.8; it was run again at 0.9 and the second run is reported.",
    );
    expect(d.warnings.filter((w) => w.startsWith("cell 0 (Alder × Northland): 1 transitions hit"))).toHaveLength(1);
  });

  it("is trustworthy when every cell passes", () => {
    const d = unpooledModelDiagnostics([cellRun("cell 0", [parameter("eta[0,search]", 1.001, 1500)], 0)]);
    expect(d.trustworthy).toBe(true);
    expect(d.reasons).toEqual([]);
  });
});

describe("fitDiagnostics", () => {
  const model = (over: Partial<ModelDiagnostics>): ModelDiagnostics => ({
    maxRhat: 1.001,
    minEssBulk: 800,
    minEssTail: 700,
    divergences: 0,
    treeDepthHits: 0,
    ebfmi: [1],
    gradientEvaluations: 10,
    trustworthy: true,
    reasons: [],
    warnings: [],
    targetAcceptance: 0.8,
    attempts: 1,
    ...over,
  });

  it("is untrustworthy when either model is, and says which model each reason is about", () => {
    const d = fitDiagnostics(model({}), model({ trustworthy: false, maxRhat: 1.05, minEssBulk: 120, divergences: 4, reasons: ["4 divergent transitions after warm-up"] }));
    expect(d.trustworthy).toBe(false);
    expect(d.reasons).toEqual(["No-pooling comparison: 4 divergent transitions after warm-up"]);
    expect(d).toMatchObject({ maxRhat: 1.05, minEssBulk: 120, minEssTail: 700, divergences: 4, gradientEvaluations: 20 });
    const pooledOnly = fitDiagnostics(model({ trustworthy: false, reasons: ["Bulk ESS is below 400"] }), null);
    expect(pooledOnly.reasons).toEqual(["Pooled model: Bulk ESS is below 400"]);
    expect(pooledOnly.unpooled).toBeNull();
    expect(fitDiagnostics(model({}), model({})).trustworthy).toBe(true);
  });

  it("ignores NaN (a parameter with no spread) when taking the worst values", () => {
    const d = fitDiagnostics(model({ maxRhat: NaN }), model({ maxRhat: 1.002 }));
    expect(d.maxRhat).toBe(1.002);
  });
});

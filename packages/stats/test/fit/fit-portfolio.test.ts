import { beforeAll, describe, expect, it } from "vitest";
import type { PortfolioData } from "../../src/data/portfolio-data";
import type { ModelSpec } from "../../src/model/density-model";
import { runChainsInThread, type RunChains } from "../../src/fit/chain-runner";
import { FitCancelledError } from "../../src/fit/fit-cancelled";
import { fitPortfolio, unpooledCellSeed, validateFitInput } from "../../src/fit/fit-portfolio";
import type { FitProgress } from "../../src/fit/fit-progress";
import type { FitResult, PosteriorSummary } from "../../src/fit/fit-result";
import { createRandomSource } from "../../src/rng/create-random-source";
import type { ChainResult, SamplerSettings } from "../../src/sampler/sampler-settings";
import { simulatePortfolio } from "../../src/simulate/simulate-portfolio";

/** An invented portfolio: 3 cells (2 brands × 2 markets, unbalanced), 2 channels, one cell never spends on video. */
function smallPortfolio(): PortfolioData {
  return simulatePortfolio(
    {
      channels: ["search", "video"],
      cells: [
        { brand: "Alder", market: "Northland", firstWeek: "2023-01-02", weeks: 52, typicalSpend: [4000, 6000], baseline: 400 },
        { brand: "Alder", market: "Southmere", firstWeek: "2023-02-06", weeks: 40, typicalSpend: [2000, 0], baseline: 150 },
        { brand: "Birchwood", market: "Northland", firstWeek: "2022-11-07", weeks: 48, typicalSpend: [3000, 2500], baseline: 250 },
      ],
    },
    createRandomSource(2024),
  ).data;
}

const data = smallPortfolio();
const short = { chains: 2, warmup: 60, draws: 60, seed: 11 } as const;

/** A runner that records what it was asked to run, then runs it in this thread. */
function recordingRunner(calls: { spec: ModelSpec; settings: SamplerSettings }[], chainsOut?: ChainResult[][]): RunChains {
  return async (spec, settings, onProgress, signal) => {
    calls.push({ spec, settings });
    const chains = await runChainsInThread(spec, settings, onProgress, signal);
    chainsOut?.push(chains);
    return chains;
  };
}

function expectSummary(s: PosteriorSummary | null): void {
  expect(s).not.toBeNull();
  const v = s!;
  for (const x of [v.mean, v.sd, v.q05, v.q50, v.q95, v.rhat, v.essBulk]) expect(Number.isFinite(x)).toBe(true);
  expect(v.q05).toBeLessThanOrEqual(v.q50);
  expect(v.q50).toBeLessThanOrEqual(v.q95);
  expect(v.sd).toBeGreaterThanOrEqual(0);
}

describe("fitPortfolio", () => {
  let result: FitResult;
  const calls: { spec: ModelSpec; settings: SamplerSettings }[] = [];
  const chainRuns: ChainResult[][] = [];
  const progress: FitProgress[] = [];

  beforeAll(async () => {
    result = await fitPortfolio(data, { ...short, retryAtHigherAcceptance: false }, { runChains: recordingRunner(calls, chainRuns), onProgress: (p) => progress.push(p) });
  });

  it("runs the pooled model once and each cell's no-pooling model once, with distinct seeds per cell", () => {
    expect(calls.map((c) => c.spec.kind)).toEqual(["portfolio-pooled", "portfolio-unpooled", "portfolio-unpooled", "portfolio-unpooled"]);
    expect(calls.slice(1).map((c) => (c.spec.data as { cell: number }).cell)).toEqual([0, 1, 2]);
    expect(calls[0]!.settings.seed).toBe(11);
    const seeds = calls.slice(1).map((c) => c.settings.seed);
    expect(seeds).toEqual([0, 1, 2].map((g) => unpooledCellSeed(11, g)));
    expect(new Set([11, ...seeds]).size).toBe(4);
    for (const c of calls) expect(c.settings).toMatchObject({ chains: 2, warmup: 60, draws: 60, targetAcceptance: 0.8, maxTreeDepth: 10 });
  });

  it("echoes the settings, with the model's defaults filled in", () => {
    expect(result.settings).toMatchObject({ chains: 2, warmup: 60, draws: 60, seed: 11, targetAcceptance: 0.8, unpooled: true, retryAtHigherAcceptance: false });
    expect(result.settings.model).toEqual({
      maxLag: 8,
      saturation: "exponential",
      likelihood: "normal",
      seasonalityOrder: 2,
      pooling: "crossed",
      holdoutWeeks: 0,
      cacRange: [
        { channel: "search", lo: 5, hi: 2000 },
        { channel: "video", lo: 5, hi: 2000 },
      ],
      liftTests: 0,
    });
  });

  it("summarises every channel-level parameter of the pooled model", () => {
    expect(result.channels.map((c) => c.channel)).toEqual(["search", "video"]);
    for (const ch of result.channels) {
      for (const s of [ch.mu, ch.tauBrand, ch.tauMarket, ch.tauCell, ch.alpha, ch.lambda]) expectSummary(s);
      expect(ch.alpha.q05).toBeGreaterThan(0);
      expect(ch.alpha.q95).toBeLessThan(1);
      expect(ch.tauCell.q05).toBeGreaterThan(0);
      expect(ch.lambda.q05).toBeGreaterThan(0);
    }
  });

  it("gives one row per cell and channel with the pooled and no-pooling low-spend CAC", () => {
    expect(result.cells.map((c) => `${c.cell}:${c.brand}/${c.market}/${c.channel}`)).toEqual([
      "0:Alder/Northland/search",
      "0:Alder/Northland/video",
      "1:Alder/Southmere/search",
      "1:Alder/Southmere/video",
      "2:Birchwood/Northland/search",
      "2:Birchwood/Northland/video",
    ]);
    for (const row of result.cells) {
      expectSummary(row.cac0);
      expectSummary(row.cac0Unpooled);
      expect(row.cac0.q05).toBeGreaterThan(0);
      expect(row.cac0Unpooled!.q05).toBeGreaterThan(0);
    }
    expect(result.cells.find((c) => c.cell === 1 && c.channel === "video")!.hasSpend).toBe(false);
    expect(result.cells.filter((c) => c.hasSpend)).toHaveLength(5);
  });

  it("reports CAC0 as the summary of 1/β over the draws of the right cell and channel", () => {
    // computed here from the recorded draws, independently of the result tables
    const pooledChains = chainRuns[0]!;
    const names = pooledChains[0]!.names;
    for (const row of result.cells) {
      const column = names.indexOf(`beta[${row.cell},${row.channel}]`);
      expect(column).toBeGreaterThanOrEqual(0);
      let sum = 0;
      let count = 0;
      for (const chain of pooledChains) {
        for (let d = 0; d * names.length < chain.draws.length; d++) {
          sum += 1 / chain.draws[d * names.length + column]!;
          count++;
        }
      }
      expect(row.cac0.mean).toBeCloseTo(sum / count, 8);
    }
    const cellChains = chainRuns[2]!; // cell 1's no-pooling run
    const unpooledNames = cellChains[0]!.names;
    const column = unpooledNames.indexOf("eta[1,search]");
    let sum = 0;
    let count = 0;
    for (const chain of cellChains) {
      for (let d = 0; d * unpooledNames.length < chain.draws.length; d++) {
        sum += Math.exp(-chain.draws[d * unpooledNames.length + column]!);
        count++;
      }
    }
    expect(result.cells.find((c) => c.cell === 1 && c.channel === "search")!.cac0Unpooled!.mean).toBeCloseTo(sum / count, 8);
  });

  it("reports each cell's shrinkage from the means of log β of the two fits and the group mean, unclipped", () => {
    // model specification: shrinkage = (m_unpooled − m_pooled) / (m_unpooled − m_group), m = posterior mean of log β
    const meanOf = (runs: ChainResult[], name: string, f: (x: number) => number): number => {
      const names = runs[0]!.names;
      const column = names.indexOf(name);
      let sum = 0;
      let count = 0;
      for (const chain of runs) {
        for (let d = 0; d * names.length < chain.draws.length; d++) {
          sum += f(chain.draws[d * names.length + column]!);
          count++;
        }
      }
      return sum / count;
    };
    for (const row of result.cells) {
      const mPooled = meanOf(chainRuns[0]!, `beta[${row.cell},${row.channel}]`, Math.log);
      const mGroup = meanOf(chainRuns[0]!, `logBetaGroup[${row.cell},${row.channel}]`, (x) => x);
      const mUnpooled = meanOf(chainRuns[1 + row.cell]!, `eta[${row.cell},${row.channel}]`, (x) => x);
      expect(row.shrinkage).toBeCloseTo((mUnpooled - mPooled) / (mUnpooled - mGroup), 8);
      expect(typeof row.outlier).toBe("boolean");
      if (row.outlier) expect(row.outlierReason).toMatch(new RegExp(`${row.brand} × ${row.market}`));
      else expect(row.outlierReason).toBeNull();
    }
    // a cell without spend on a channel has no data to contradict its group
    expect(result.cells.find((c) => !c.hasSpend)!.outlier).toBe(false);
  });

  it("reports the pooling factor of each level and channel", () => {
    expect(result.poolingFactors.map((p) => `${p.level}/${p.channel}`)).toEqual([
      "brand/search",
      "brand/video",
      "market/search",
      "market/video",
      "cell/search",
      "cell/video",
    ]);
    // Gelman & Pardoe (2006): λ = 1 − Var(E[ε]) / E[Var(ε)] is at most 1
    for (const p of result.poolingFactors) expect(p.poolingFactor).toBeLessThanOrEqual(1);
  });

  it("keeps the pooled draws as a draw set for planning", () => {
    const set = result.drawSet;
    expect(set.model).toBe("pooled");
    expect(set.drawCount).toBe(2 * 60);
    expect(set.channels).toEqual(["search", "video"]);
    expect(set.cells.map((c) => `${c.brand}/${c.market}`)).toEqual(["Alder/Northland", "Alder/Southmere", "Birchwood/Northland"]);
    expect(set.beta).toHaveLength(120 * 3 * 2);
    // draw d of cell g, channel c sits at (d·G + g)·C + c; CAC0 = 1/β agrees with the table
    let sum = 0;
    for (let d = 0; d < set.drawCount; d++) sum += 1 / set.beta[(d * 3 + 2) * 2 + 1]!;
    expect(sum / set.drawCount).toBeCloseTo(result.cells.find((c) => c.cell === 2 && c.channel === "video")!.cac0.mean, 8);
  });

  it("reports diagnostics for both models and the run as a whole", () => {
    const d = result.diagnostics;
    for (const m of [d.pooled, d.unpooled!]) {
      expect(m.maxRhat).toBeGreaterThan(0.9);
      expect(m.minEssBulk).toBeGreaterThan(0);
      expect(m.minEssTail).toBeGreaterThan(0);
      expect(Number.isInteger(m.divergences)).toBe(true);
      expect(Number.isInteger(m.treeDepthHits)).toBe(true);
      expect(m.gradientEvaluations).toBeGreaterThan(0);
      expect(m.attempts).toBe(1);
      expect(m.targetAcceptance).toBe(0.8);
    }
    expect(d.pooled.ebfmi).toHaveLength(2);
    expect(d.unpooled!.ebfmi).toHaveLength(6); // 3 cells × 2 chains
    expect(d.maxRhat).toBe(Math.max(d.pooled.maxRhat, d.unpooled!.maxRhat));
    expect(d.minEssBulk).toBe(Math.min(d.pooled.minEssBulk, d.unpooled!.minEssBulk));
    expect(d.divergences).toBe(d.pooled.divergences + d.unpooled!.divergences);
    expect(d.gradientEvaluations).toBe(d.pooled.gradientEvaluations + d.unpooled!.gradientEvaluations);
    expect(d.trustworthy).toBe(d.pooled.trustworthy && d.unpooled!.trustworthy);
  });

  it("applies the trust rule: 2 × 60 draws cannot reach a bulk ESS of 400, so the run is not trustworthy, with the reason", () => {
    // Trust rule of the model specification: max R-hat > 1.01, min bulk ESS < 400 or divergences > 0 ⇒ not trustworthy.
    const d = result.diagnostics;
    expect(d.minEssBulk).toBeLessThan(400);
    expect(d.trustworthy).toBe(false);
    expect(d.pooled.trustworthy).toBe(false);
    expect(d.reasons.some((r) => r.startsWith("Pooled model: Bulk ESS is below 400"))).toBe(true);
    expect(d.unpooled!.reasons.some((r) => r.startsWith("Bulk ESS is below 400"))).toBe(true);
    if (d.pooled.divergences > 0) expect(d.pooled.reasons.some((r) => r.includes("divergent transition"))).toBe(true);
    if (d.pooled.maxRhat > 1.01) expect(d.pooled.reasons.some((r) => r.startsWith("R-hat is above 1.01"))).toBe(true);
  });

  it("times the sampling and the whole fit", () => {
    const t = result.timing;
    expect(t.pooledSeconds).toBeGreaterThan(0);
    expect(t.unpooledSeconds).toBeGreaterThan(0);
    expect(t.samplingSeconds).toBeCloseTo(t.pooledSeconds + t.unpooledSeconds, 9);
    expect(t.totalSeconds).toBeGreaterThanOrEqual(t.samplingSeconds);
  });

  it("reports progress per model and chain; the no-pooling progress counts over all cells", () => {
    const pooled = progress.filter((p) => p.model === "pooled");
    const unpooled = progress.filter((p) => p.model === "unpooled");
    for (const chain of [0, 1]) {
      const its = pooled.filter((p) => p.chain === chain).map((p) => p.iteration);
      expect(its).toEqual([...its].sort((a, b) => a - b));
      expect(its.at(-1)).toBe(120);
      const unIts = unpooled.filter((p) => p.chain === chain);
      expect(unIts.map((p) => p.iteration)).toEqual(unIts.map((p) => p.iteration).sort((a, b) => a - b));
      expect(unIts.at(-1)).toMatchObject({ iteration: 360, total: 360, cell: 2, cellCount: 3, phase: "sampling" });
    }
    expect(progress.every((p) => p.attempt === 1)).toBe(true);
    expect(progress.findIndex((p) => p.model === "unpooled")).toBeGreaterThan(progress.findLastIndex((p) => p.model === "pooled"));
  });
});

describe("fitPortfolio options and hooks", () => {
  it("gives the same result for the same seed", async () => {
    const options = { chains: 1, warmup: 30, draws: 30, seed: 5, unpooled: false, retryAtHigherAcceptance: false };
    const a = await fitPortfolio(data, options);
    const b = await fitPortfolio(data, options);
    expect(a.cells).toEqual(b.cells);
    expect(a.channels).toEqual(b.channels);
    const c = await fitPortfolio(data, { ...options, seed: 6 });
    expect(c.cells[0]!.cac0.mean).not.toBe(a.cells[0]!.cac0.mean);
  });

  it("skips the no-pooling comparison with unpooled: false", async () => {
    const calls: { spec: ModelSpec; settings: SamplerSettings }[] = [];
    const r = await fitPortfolio(data, { chains: 1, warmup: 20, draws: 20, unpooled: false }, { runChains: recordingRunner(calls) });
    expect(calls.every((c) => c.spec.kind === "portfolio-pooled")).toBe(true);
    expect(r.diagnostics.unpooled).toBeNull();
    expect(r.timing.unpooledSeconds).toBe(0);
    expect(r.cells.every((c) => c.cac0Unpooled === null && c.shrinkage === null && !c.outlier && c.outlierReason === null)).toBe(true);
    expect(r.poolingFactors).toEqual([]);
    expect(r.drawSet.drawCount).toBe(20);
    expect(r.diagnostics.reasons.every((reason) => reason.startsWith("Pooled model: "))).toBe(true);
  });

  it("runs a model again at target acceptance 0.9 when its first run has divergences after warm-up", async () => {
    const calls: { spec: ModelSpec; settings: SamplerSettings }[] = [];
    const progress: FitProgress[] = [];
    // the first run is made to report one divergence; the rerun is left as it is
    const runner: RunChains = async (spec, settings, onProgress, signal) => {
      calls.push({ spec, settings });
      const chains = await runChainsInThread(spec, settings, onProgress, signal);
      if (calls.length === 1) chains[0]!.divergent[0] = 1;
      return chains;
    };
    const r = await fitPortfolio(data, { chains: 1, warmup: 20, draws: 20, unpooled: false }, { runChains: runner, onProgress: (p) => progress.push(p) });
    expect(calls.map((c) => c.settings.targetAcceptance)).toEqual([0.8, 0.9]);
    expect(r.diagnostics.pooled.attempts).toBe(2);
    expect(r.diagnostics.pooled.targetAcceptance).toBe(0.9);
    expect(r.diagnostics.pooled.warnings[0]).toMatch(/^The pooled model had \d+ divergent transitions? after warm-up at target acceptance 0\.8; it was run again at 0\.9/);
    expect(new Set(progress.map((p) => p.attempt))).toEqual(new Set([1, 2]));
  });

  it("does not run again when asked not to", async () => {
    const calls: { spec: ModelSpec; settings: SamplerSettings }[] = [];
    const runner: RunChains = async (spec, settings, onProgress, signal) => {
      calls.push({ spec, settings });
      const chains = await runChainsInThread(spec, settings, onProgress, signal);
      chains[0]!.divergent[0] = 1;
      return chains;
    };
    const r = await fitPortfolio(data, { chains: 1, warmup: 20, draws: 20, unpooled: false, retryAtHigherAcceptance: false }, { runChains: runner });
    expect(calls).toHaveLength(1);
    expect(r.diagnostics.pooled.divergences).toBeGreaterThanOrEqual(1);
    expect(r.diagnostics.trustworthy).toBe(false);
    expect(r.diagnostics.reasons.some((reason) => /divergent transition/.test(reason))).toBe(true);
  });

  it("stops when the signal aborts and rejects with FitCancelledError", async () => {
    const controller = new AbortController();
    let seen = 0;
    const fit = fitPortfolio(
      data,
      { chains: 2, warmup: 5000, draws: 5000 },
      {
        signal: controller.signal,
        onProgress: () => {
          if (++seen === 3) controller.abort();
        },
      },
    );
    await expect(fit).rejects.toBeInstanceOf(FitCancelledError);
    expect(seen).toBeLessThan(50); // stopped within a few progress reports, not after 20,000 iterations
  });

  it("rejects an already aborted signal before running anything", async () => {
    const calls: { spec: ModelSpec; settings: SamplerSettings }[] = [];
    const controller = new AbortController();
    controller.abort();
    await expect(fitPortfolio(data, { chains: 1, warmup: 10, draws: 10 }, { signal: controller.signal, runChains: recordingRunner(calls) })).rejects.toBeInstanceOf(FitCancelledError);
    expect(calls).toHaveLength(0);
  });

  it("rejects bad options and data with a RangeError before any chain runs", async () => {
    const calls: { spec: ModelSpec; settings: SamplerSettings }[] = [];
    const runner = recordingRunner(calls);
    await expect(fitPortfolio(data, { chains: 0 }, { runChains: runner })).rejects.toThrow(/chains must be an integer/);
    await expect(fitPortfolio(data, { model: { holdoutWeeks: 36 } }, { runChains: runner })).rejects.toThrow(/at least 8 weeks/);
    await expect(fitPortfolio(data, { model: { cacRange: { radio: [5, 50] } } }, { runChains: runner })).rejects.toThrow(/not in the data/);
    expect(calls).toHaveLength(0);
    expect(() => validateFitInput(data, { model: { maxLag: 0 } })).toThrow(RangeError);
    expect(() => validateFitInput(data, { chains: 2 })).not.toThrow();
  });
});

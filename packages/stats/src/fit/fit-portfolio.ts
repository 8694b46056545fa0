import type { PortfolioData } from "../data/portfolio-data";
import { buildDrawSet } from "../decisions/draw-set";
import { summariseRun, type RunSummary } from "../diagnostics/summarise-run";
import type { ModelSpec } from "../model/density-model";
import { buildPortfolioModel } from "../model/portfolio/build-portfolio-model";
import {
  portfolioPooledKind,
  portfolioUnpooledKind,
  type PortfolioModelSpecData,
  type UnpooledCellSpecData,
} from "../model/portfolio/portfolio-model-kinds";
import type { PortfolioModelOptions } from "../model/portfolio/portfolio-options";
import type { SamplerSettings } from "../sampler/sampler-settings";
import { portfolioShrinkage, shrinkageInputsFrom, type ShrinkageReport } from "../shrinkage/portfolio-shrinkage";
import { runChainsInThread, type RunChains } from "./chain-runner";
import { unpooledModelDiagnostics, fitDiagnostics, pooledModelDiagnostics, type CellRunSummary } from "./fit-diagnostics";
import { resolveFitOptions, type FitOptions, type ResolvedFitOptions } from "./fit-options";
import type { FitProgress } from "./fit-progress";
import type { CellChannelResult, FitResult, FitSettings } from "./fit-result";
import { runModel, type ModelRun } from "./model-run";
import { joinCellRuns, stackChains } from "./named-draws";
import { cellHasSpend, channelResults, SummaryTable } from "./result-tables";

export interface FitHooks {
  /** How the chains of one model run; default: in this thread, one chain after another. */
  readonly runChains?: RunChains;
  readonly onProgress?: (progress: FitProgress) => void;
  /** Aborting stops the chains; fitPortfolio then rejects with FitCancelledError. */
  readonly signal?: AbortSignal;
}

/** Seed of cell g's no-pooling run: distinct per cell, fixed by the fit's seed. */
export function unpooledCellSeed(seed: number, g: number): number {
  return (seed ^ Math.imul(g + 1, 0x9e3779b9)) >>> 0;
}

function pooledSpec(portfolio: PortfolioData, options: PortfolioModelOptions): ModelSpec {
  const data: PortfolioModelSpecData = { portfolio, options };
  return { kind: portfolioPooledKind, data };
}

function unpooledSpec(portfolio: PortfolioData, options: PortfolioModelOptions, cell: number): ModelSpec {
  const data: UnpooledCellSpecData = { portfolio, options, cell };
  return { kind: portfolioUnpooledKind, data };
}

function now(): number {
  return globalThis.performance.now();
}

function settingsEcho(data: PortfolioData, o: ResolvedFitOptions): FitSettings {
  const m = o.resolvedModel;
  return {
    chains: o.sampler.chains,
    warmup: o.sampler.warmup,
    draws: o.sampler.draws,
    seed: o.sampler.seed,
    maxTreeDepth: o.sampler.maxTreeDepth,
    targetAcceptance: o.sampler.targetAcceptance,
    unpooled: o.unpooled,
    retryAtHigherAcceptance: o.retryAtHigherAcceptance,
    model: {
      maxLag: m.maxLag,
      saturation: m.saturation,
      likelihood: m.likelihood,
      seasonalityOrder: m.seasonalityOrder,
      pooling: m.pooling,
      holdoutWeeks: m.holdoutWeeks,
      cacRange: data.channels.map((channel, c) => ({ channel, lo: m.cacRange[c]![0], hi: m.cacRange[c]![1] })),
      liftTests: m.liftTests.length,
    },
  };
}

interface UnpooledFit {
  readonly cells: readonly CellRunSummary[];
  readonly runs: readonly ModelRun[];
}

/**
 * The no-pooling comparison: each cell's model on its own, cell after cell (each run uses
 * all chains at once). Progress counts over all cells, per chain.
 */
async function fitUnpooled(data: PortfolioData, o: ResolvedFitOptions, runChains: RunChains, hooks: FitHooks): Promise<UnpooledFit> {
  const G = data.cells.length;
  const chains = o.sampler.chains;
  const perRun = o.sampler.warmup + o.sampler.draws;
  const doneWarmup = new Float64Array(chains);
  const doneSampling = new Float64Array(chains);
  const cells: CellRunSummary[] = [];
  const runs: ModelRun[] = [];
  for (let g = 0; g < G; g++) {
    const settings: SamplerSettings = { ...o.sampler, seed: unpooledCellSeed(o.sampler.seed, g) };
    const run = await runModel(unpooledSpec(data, o.model, g), settings, o.retryAtHigherAcceptance, {
      runChains,
      signal: hooks.signal,
      onProgress: (p, attempt) => {
        const done = p.phase === "warmup" ? doneWarmup : doneSampling;
        hooks.onProgress?.({
          model: "unpooled",
          chain: p.chain,
          iteration: g * perRun + p.iteration,
          total: G * perRun,
          phase: p.phase,
          divergences: (done[p.chain] ?? 0) + p.divergences,
          attempt,
          cell: g,
          cellCount: G,
        });
      },
    });
    for (const chain of run.chains) {
      if (chain.chain < 0 || chain.chain >= chains) continue;
      doneWarmup[chain.chain] = doneWarmup[chain.chain]! + (chain.warmupDivergences ?? 0);
      let sampling = 0;
      for (let i = 0; i < chain.divergent.length; i++) sampling += chain.divergent[i]!;
      doneSampling[chain.chain] = doneSampling[chain.chain]! + sampling;
    }
    const cell = data.cells[g]!;
    cells.push({ label: `cell ${g} (${cell.brand} × ${cell.market})`, summary: summariseRun(run.chains, { thresholds: o.trustThresholds, targetAcceptance: run.targetAcceptance }), run });
    runs.push(run);
  }
  return { cells, runs };
}

/**
 * Checks data and options as fitPortfolio will, without running anything: throws a
 * RangeError naming the first problem (e.g. a holdout longer than a cell allows).
 */
export function validateFitInput(data: PortfolioData, options: FitOptions = {}): void {
  const o = resolveFitOptions(data.channels, options);
  buildPortfolioModel(data, o.model);
}

/**
 * Fits the portfolio model (model.md) and, unless `unpooled: false`, the no-pooling
 * comparison, and assembles the result: settings, diagnostics with the trust rule,
 * timing, channel parameters and each cell's low-spend CAC. Throws a RangeError on bad
 * data or options before any chain runs, and FitCancelledError when `hooks.signal` aborts.
 */
export async function fitPortfolio(data: PortfolioData, options: FitOptions = {}, hooks: FitHooks = {}): Promise<FitResult> {
  const started = now();
  const o = resolveFitOptions(data.channels, options);
  buildPortfolioModel(data, o.model); // checks the data against the model before any chain runs
  const runChains = hooks.runChains ?? runChainsInThread;

  const pooledStart = now();
  const pooledRun = await runModel(pooledSpec(data, o.model), o.sampler, o.retryAtHigherAcceptance, {
    runChains,
    signal: hooks.signal,
    onProgress: (p, attempt) => hooks.onProgress?.({ model: "pooled", ...p, attempt }),
  });
  const pooledSeconds = (now() - pooledStart) / 1000;
  const pooledSummary: RunSummary = summariseRun(pooledRun.chains, { thresholds: o.trustThresholds, targetAcceptance: pooledRun.targetAcceptance });
  const pooled = new SummaryTable(pooledSummary.parameters);

  let unpooledSeconds = 0;
  let unpooledFit: UnpooledFit | null = null;
  if (o.unpooled) {
    const unpooledStart = now();
    unpooledFit = await fitUnpooled(data, o, runChains, hooks);
    unpooledSeconds = (now() - unpooledStart) / 1000;
  }
  const unpooled = unpooledFit === null ? null : new SummaryTable(unpooledFit.cells.flatMap((c) => c.summary.parameters));

  const pooledDraws = stackChains(pooledRun.chains);
  const shrinkage: ShrinkageReport | null =
    unpooledFit === null ? null : portfolioShrinkage(shrinkageInputsFrom(data, o.model, pooledDraws, joinCellRuns(unpooledFit.runs.map((r) => r.chains))));
  const cells: CellChannelResult[] = [];
  data.cells.forEach((cell, g) => {
    data.channels.forEach((channel, c) => {
      const moved = shrinkage?.cells.find((s) => s.cell === g && s.channel === channel);
      const outlier = shrinkage?.candidateOutliers.find((s) => s.cell === g && s.channel === channel);
      cells.push({
        cell: g,
        brand: cell.brand,
        market: cell.market,
        channel,
        hasSpend: cellHasSpend(data, g, c),
        cac0: pooled.get(`cac0[${g},${channel}]`),
        cac0Unpooled: unpooled === null ? null : unpooled.get(`cac0[${g},${channel}]`),
        shrinkage: moved === undefined ? null : moved.shrinkage,
        outlier: outlier !== undefined,
        outlierReason: outlier?.reason ?? null,
      });
    });
  });

  const diagnostics = fitDiagnostics(
    pooledModelDiagnostics(pooledSummary, pooledRun),
    unpooledFit === null ? null : unpooledModelDiagnostics(unpooledFit.cells, o.trustThresholds),
  );
  return {
    settings: settingsEcho(data, o),
    diagnostics,
    timing: { samplingSeconds: pooledSeconds + unpooledSeconds, pooledSeconds, unpooledSeconds, totalSeconds: (now() - started) / 1000 },
    channels: channelResults(data.channels, pooled),
    cells,
    poolingFactors: shrinkage?.levels ?? [],
    drawSet: buildDrawSet(data, o.model, pooledDraws),
  };
}

import type { ChainResult } from "../sampler/sampler-settings";
import { ebfmi } from "./ebfmi";
import { essOfChains, essQuantile } from "./ess";
import { mcseMean, mcseQuantile } from "./mcse";
import { isDegenerate, mean, pooled, variance } from "./moments";
import { quantileSorted, sortedCopy } from "./quantile";
import { rankNormalise } from "./rank-normalise";
import { rhatOfChains } from "./rhat";
import { splitChains } from "./split-chains";
import { assessTrust, defaultTrustThresholds, type TrustThresholds } from "./trust";

export interface ParameterSummary {
  name: string;
  mean: number;
  sd: number;
  q05: number;
  q50: number;
  q95: number;
  rhat: number;
  essBulk: number;
  essTail: number;
  mcseMean: number;
  mcseQ05: number;
  mcseQ95: number;
}

export interface RunDiagnostics {
  maxRhat: number;
  minEssBulk: number;
  minEssTail: number;
  /** Divergent transitions after warm-up, all chains. */
  divergences: number;
  /** Post-warm-up transitions that stopped at the maximum tree depth. */
  treeDepthHits: number;
  ebfmi: number[];
  gradientEvaluations: number;
  trustworthy: boolean;
  reasons: string[];
  /** Advice that does not make a run untrustworthy (low E-BFMI, tree-depth hits). */
  warnings: string[];
}

export interface RunSummary {
  parameters: ParameterSummary[];
  diagnostics: RunDiagnostics;
}

export interface SummariseOptions {
  thresholds?: Partial<TrustThresholds>;
  /** Only summarise these parameter names (default: all). */
  names?: readonly string[];
  /** Target acceptance the chains ran with, for the advice on divergences (see TrustInput). */
  targetAcceptance?: number;
}

/**
 * Per-parameter summary table and run diagnostics (Vehtari et al. 2021 for R-hat, ESS and
 * MCSE; Betancourt 2016 for E-BFMI), with the trust rule applied. Chains of unequal length
 * (a stopped run) are cut to the shortest; chains without draws are left out.
 */
export function summariseRun(chains: readonly ChainResult[], options: SummariseOptions = {}): RunSummary {
  if (!Array.isArray(chains) || chains.length === 0) throw new Error("summariseRun needs at least one chain result");
  const names = chains[0]!.names;
  for (const c of chains) {
    if (c.names.length !== names.length || c.names.some((n: string, i: number) => n !== names[i])) {
      throw new Error(`chain ${c.chain} has different parameter names from chain ${chains[0]!.chain}`);
    }
  }
  const width = names.length;
  const withDraws = chains.filter((c) => c.draws.length >= width && width > 0);
  const length = withDraws.length === 0 ? 0 : Math.min(...withDraws.map((c) => c.draws.length / width));
  const selected = options.names ?? names;
  const thresholds = { ...defaultTrustThresholds, ...options.thresholds };

  const parameters: ParameterSummary[] = [];
  for (const name of selected) {
    const column = names.indexOf(name);
    if (column < 0) throw new Error(`unknown parameter "${name}"`);
    const columnChains = withDraws.map((c) => {
      const out = new Float64Array(length);
      for (let i = 0; i < length; i++) out[i] = c.draws[i * width + column]!;
      return out;
    });
    parameters.push(summariseParameter(name, columnChains));
  }

  let divergences = 0;
  let treeDepthHits = 0;
  let gradientEvaluations = 0;
  for (const c of chains) {
    for (let i = 0; i < c.divergent.length; i++) divergences += c.divergent[i]!;
    for (let i = 0; i < c.treeDepth.length; i++) if (c.treeDepth[i]! >= (c.maxTreeDepth ?? 10)) treeDepthHits++;
    gradientEvaluations += c.gradientEvaluations;
  }
  const energy = chains.map((c) => ebfmi(c.energy));
  const finite = (xs: number[]): number[] => xs.filter((x) => !Number.isNaN(x));
  const rhats = finite(parameters.map((p) => p.rhat));
  const bulk = finite(parameters.map((p) => p.essBulk));
  const tail = finite(parameters.map((p) => p.essTail));
  const trust = assessTrust(
    {
      rhat: parameters.map((p) => ({ name: p.name, value: p.rhat })),
      essBulk: parameters.map((p) => ({ name: p.name, value: p.essBulk })),
      divergences,
      draws: length * withDraws.length,
      cancelled: chains.some((c) => c.cancelled),
      targetAcceptance: options.targetAcceptance,
    },
    thresholds,
  );
  const warnings: string[] = [];
  energy.forEach((value, i) => {
    // Below 0.3 is a warning sign (common practice, after Betancourt 2016).
    if (value < 0.3) warnings.push(`E-BFMI of chain ${chains[i]!.chain + 1} is ${value.toFixed(2)} (below 0.3): the sampler may explore the tails poorly.`);
  });
  if (treeDepthHits > 0) {
    warnings.push(`${treeDepthHits} transitions hit the maximum tree depth: sampling is inefficient, not necessarily wrong.`);
  }
  return {
    parameters,
    diagnostics: {
      maxRhat: rhats.length > 0 ? Math.max(...rhats) : Number.NaN,
      minEssBulk: bulk.length > 0 ? Math.min(...bulk) : Number.NaN,
      minEssTail: tail.length > 0 ? Math.min(...tail) : Number.NaN,
      divergences,
      treeDepthHits,
      ebfmi: energy,
      gradientEvaluations,
      trustworthy: trust.trustworthy,
      reasons: trust.reasons,
      warnings,
    },
  };
}

/** One row of the summary table from the per-chain draws of one parameter. */
export function summariseParameter(name: string, chains: readonly Float64Array[]): ParameterSummary {
  const all = pooled(chains);
  if (all.length === 0) {
    return { name, mean: NaN, sd: NaN, q05: NaN, q50: NaN, q95: NaN, rhat: NaN, essBulk: NaN, essTail: NaN, mcseMean: NaN, mcseQ05: NaN, mcseQ95: NaN };
  }
  // Sort once and rank-normalise once: the same numbers as rhat(), essBulk(), essQuantile()
  // and mcseQuantile() called one by one, at a fraction of the cost for wide models.
  const sorted = sortedCopy(all);
  const q50 = quantileSorted(sorted, 0.5);
  const degenerate = isDegenerate(chains);
  let rhatValue = Number.NaN;
  let essBulkValue = Number.NaN;
  if (!degenerate) {
    const bulk = splitChains(rankNormalise(chains, sorted));
    essBulkValue = essOfChains(bulk);
    const folded = chains.map((c) => Float64Array.from(c, (v) => Math.abs(v - q50)));
    rhatValue = Math.max(rhatOfChains(bulk), rhatOfChains(splitChains(rankNormalise(folded))));
  }
  const ess05 = essQuantile(chains, 0.05, sorted);
  const ess95 = essQuantile(chains, 0.95, sorted);
  return {
    name,
    mean: mean(all),
    sd: Math.sqrt(variance(all)),
    q05: quantileSorted(sorted, 0.05),
    q50,
    q95: quantileSorted(sorted, 0.95),
    rhat: rhatValue,
    essBulk: essBulkValue,
    essTail: Math.min(ess05, ess95),
    mcseMean: mcseMean(chains),
    mcseQ05: mcseQuantile(chains, 0.05, ess05, sorted),
    mcseQ95: mcseQuantile(chains, 0.95, ess95, sorted),
  };
}

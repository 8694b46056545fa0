import type { ParameterSummary, RunSummary } from "../diagnostics/summarise-run";
import { assessTrust, defaultTrustThresholds, type TrustThresholds } from "../diagnostics/trust";
import type { FitDiagnostics, ModelDiagnostics } from "./fit-result";
import type { ModelRun } from "./model-run";

function rerunWarning(run: ModelRun, what: string): string[] {
  if (run.attempts < 2) return [];
  return [
    `${what} had ${run.firstRunDivergences} divergent transition${run.firstRunDivergences === 1 ? "" : "s"} after warm-up at target acceptance ` +
      `${run.firstTargetAcceptance}; it was run again at ${run.targetAcceptance} and the second run is reported.`,
  ];
}

/** Diagnostics of the pooled model: its run summary plus how it was run. */
export function pooledModelDiagnostics(summary: RunSummary, run: ModelRun): ModelDiagnostics {
  const d = summary.diagnostics;
  return {
    maxRhat: d.maxRhat,
    minEssBulk: d.minEssBulk,
    minEssTail: d.minEssTail,
    divergences: d.divergences,
    treeDepthHits: d.treeDepthHits,
    ebfmi: d.ebfmi,
    gradientEvaluations: d.gradientEvaluations,
    trustworthy: d.trustworthy,
    reasons: d.reasons,
    warnings: [...rerunWarning(run, "The pooled model"), ...d.warnings],
    targetAcceptance: run.targetAcceptance,
    attempts: run.attempts,
  };
}

export interface CellRunSummary {
  readonly label: string;
  readonly summary: RunSummary;
  readonly run: ModelRun;
}

const finite = (xs: readonly number[]): number[] => xs.filter((x) => !Number.isNaN(x));

/** The lowest target acceptance among the cells whose kept run diverged (undefined when none did). */
function divergedTarget(cells: readonly CellRunSummary[]): number | undefined {
  const targets = cells.filter((c) => c.summary.diagnostics.divergences > 0).map((c) => c.run.targetAcceptance);
  return targets.length > 0 ? Math.min(...targets) : undefined;
}

/**
 * Diagnostics of the no-pooling comparison (one run per cell) as one run: the trust rule
 * over every cell's parameters and the divergences of all cells together.
 */
export function unpooledModelDiagnostics(cells: readonly CellRunSummary[], thresholds: Partial<TrustThresholds> = {}): ModelDiagnostics {
  if (cells.length === 0) throw new Error("unpooledModelDiagnostics needs at least one cell");
  const parameters: ParameterSummary[] = cells.flatMap((c) => c.summary.parameters);
  let divergences = 0;
  let treeDepthHits = 0;
  let gradientEvaluations = 0;
  let draws = Number.POSITIVE_INFINITY;
  const warnings: string[] = [];
  for (const cell of cells) {
    const d = cell.summary.diagnostics;
    divergences += d.divergences;
    treeDepthHits += d.treeDepthHits;
    gradientEvaluations += d.gradientEvaluations;
    const width = cell.run.chains[0]?.names.length ?? 0;
    const cellDraws = cell.run.chains.reduce((sum, c) => sum + (width > 0 ? c.draws.length / width : 0), 0);
    draws = Math.min(draws, cellDraws);
    warnings.push(...rerunWarning(cell.run, `The no-pooling model of ${cell.label}`));
    for (const w of d.warnings) warnings.push(`${cell.label}: ${w}`);
  }
  const trust = assessTrust(
    {
      rhat: parameters.map((p) => ({ name: p.name, value: p.rhat })),
      essBulk: parameters.map((p) => ({ name: p.name, value: p.essBulk })),
      divergences,
      draws,
      cancelled: cells.some((c) => c.run.chains.some((chain) => chain.cancelled)),
      targetAcceptance: divergedTarget(cells),
    },
    { ...defaultTrustThresholds, ...thresholds },
  );
  const rhats = finite(parameters.map((p) => p.rhat));
  const bulk = finite(parameters.map((p) => p.essBulk));
  const tail = finite(parameters.map((p) => p.essTail));
  return {
    maxRhat: rhats.length > 0 ? Math.max(...rhats) : Number.NaN,
    minEssBulk: bulk.length > 0 ? Math.min(...bulk) : Number.NaN,
    minEssTail: tail.length > 0 ? Math.min(...tail) : Number.NaN,
    divergences,
    treeDepthHits,
    ebfmi: cells.flatMap((c) => c.summary.diagnostics.ebfmi),
    gradientEvaluations,
    trustworthy: trust.trustworthy,
    reasons: trust.reasons,
    warnings,
    targetAcceptance: Math.max(...cells.map((c) => c.run.targetAcceptance)),
    attempts: Math.max(...cells.map((c) => c.run.attempts)),
  };
}

/** The run as a whole: the worst of both models; untrustworthy when either model is. */
export function fitDiagnostics(pooled: ModelDiagnostics, unpooled: ModelDiagnostics | null): FitDiagnostics {
  const models = unpooled === null ? [pooled] : [pooled, unpooled];
  const worst = (values: number[], pick: (...xs: number[]) => number): number => {
    const ok = finite(values);
    return ok.length > 0 ? pick(...ok) : Number.NaN;
  };
  const name = (m: ModelDiagnostics): string => (m === pooled ? "Pooled model" : "No-pooling comparison");
  return {
    maxRhat: worst(models.map((m) => m.maxRhat), Math.max),
    minEssBulk: worst(models.map((m) => m.minEssBulk), Math.min),
    minEssTail: worst(models.map((m) => m.minEssTail), Math.min),
    divergences: models.reduce((sum, m) => sum + m.divergences, 0),
    treeDepthHits: models.reduce((sum, m) => sum + m.treeDepthHits, 0),
    gradientEvaluations: models.reduce((sum, m) => sum + m.gradientEvaluations, 0),
    trustworthy: models.every((m) => m.trustworthy),
    reasons: models.flatMap((m) => m.reasons.map((r) => `${name(m)}: ${r}`)),
    warnings: models.flatMap((m) => m.warnings.map((w) => `${name(m)}: ${w}`)),
    pooled,
    unpooled,
  };
}

// The posterior predictive check and the holdout accuracy of a run, from the draws kept
// for planning (the same draw set the planning screens use).
import { mondayOfAbsoluteWeek } from "@tributary/stats";
import { buildDrawSet, createRandomSource, holdoutAccuracy, posteriorPredictiveBands, type DrawSet, type FitOptions, type PortfolioData } from "@tributary/stats";
import type { HoldoutAccuracy, PredictiveCheckCell } from "@tributary/contracts";

export interface NamedDrawRows {
  readonly names: readonly string[];
  /** Row-major: draws × names. */
  readonly draws: Float64Array;
}

/** All chains' rows in one matrix (the chains share their names). */
export function concatenateDraws(chains: readonly NamedDrawRows[]): NamedDrawRows {
  if (chains.length === 0) throw new RangeError("no draws");
  const names = chains[0]!.names;
  const total = chains.reduce((n, c) => n + c.draws.length, 0);
  const draws = new Float64Array(total);
  let at = 0;
  for (const chain of chains) {
    draws.set(chain.draws, at);
    at += chain.draws.length;
  }
  return { names, draws };
}

export function runDrawSet(data: PortfolioData, options: FitOptions, chains: readonly NamedDrawRows[]): DrawSet {
  return buildDrawSet(data, options.model ?? {}, concatenateDraws(chains));
}

const finiteOrNull = (x: number) => (Number.isFinite(x) ? x : null);

/** Bands per cell-week and, with a holdout, the forecast accuracy on the held-out weeks. */
export function posteriorPredictiveCheck(
  set: DrawSet,
  cellIds: readonly string[],
  seed: number,
): { cells: PredictiveCheckCell[]; holdout: HoldoutAccuracy | null } {
  const bands = posteriorPredictiveBands(set, createRandomSource(seed ^ 0x5bd1e995));
  const weeksOf = (g: number) => {
    const cell = set.cells[g]!;
    return Array.from({ length: cell.weeks }, (_, t) => mondayOfAbsoluteWeek(cell.firstAbsoluteWeek + t));
  };
  const cells: PredictiveCheckCell[] = bands.map((b, g) => {
    const weeks = weeksOf(g);
    return {
      cellId: cellIds[g]!,
      brand: b.brand,
      market: b.market,
      weeks,
      observed: Array.from(b.observed),
      q05: Array.from(b.q05),
      q25: Array.from(b.q25),
      q50: Array.from(b.q50),
      q75: Array.from(b.q75),
      q95: Array.from(b.q95),
      holdoutFrom: b.trainWeeks < weeks.length ? weeks[b.trainWeeks]! : null,
      coverage90: b.coverage90,
    };
  });
  const hasHoldout = set.cells.some((cell) => cell.trainWeeks < cell.weeks);
  if (!hasHoldout) return { cells, holdout: null };
  const accuracy = holdoutAccuracy(set, createRandomSource(seed ^ 0x27d4eb2f));
  const idOf = new Map(set.cells.map((cell, g) => [`${cell.brand}\u0000${cell.market}`, cellIds[g]!] as const));
  return {
    cells,
    holdout: {
      weeks: Math.max(...set.cells.map((cell) => cell.weeks - cell.trainWeeks)),
      crps: accuracy.crps,
      mape: finiteOrNull(accuracy.mape),
      coverage90: accuracy.coverage90,
      cells: accuracy.cells.map((c) => ({
        cellId: idOf.get(`${c.brand}\u0000${c.market}`)!,
        brand: c.brand,
        market: c.market,
        crps: c.crps,
        mape: finiteOrNull(c.mape),
        coverage90: c.coverage90,
      })),
    },
  };
}

// One shape for a split as the screen shows it, whether it was just computed in the
// worker or saved (and recomputed) by the server, and the equal-marginal-return check.
import type { BudgetSplitResultView, DecodedDrawSet, DrawSummaryView, RiskAttitudeView } from "@tributary/contracts";
import type { SplitResult } from "../worker/split-api";

export type SplitLineView = {
  key: string;
  cellId: string;
  brand: string;
  market: string;
  channel: string;
  /** Spend over the horizon. */
  allocation: number;
  current: number;
  lower: number;
  upper: number | null;
  activeBound: "lower" | "upper" | "fixed" | null;
  /** Expected cost of one more customer at the allocation; null when an extra unit brings no customer. */
  marginalCac: number | null;
  /** Customers: expected new customers per extra currency unit; profit: customer value × that. */
  weightedReturn: number;
  expectedCustomers: number;
  beyondObservedSpend: boolean;
};

export type HistogramView = { mean: number; sd: number; q05: number; q50: number; q95: number; edges: number[]; counts: number[] };

export type SplitView = {
  objective: "customers" | "profit";
  risk: RiskAttitudeView;
  horizon: number;
  totalBudget: number;
  allocatedTotal: number;
  currentTotal: number;
  exact: boolean;
  method: string;
  lines: SplitLineView[];
  outcome: { allocation: HistogramView; current: HistogramView };
  customers: { allocation: DrawSummaryView; current: DrawSummaryView; difference: DrawSummaryView };
  profit: { allocation: DrawSummaryView; current: DrawSummaryView; difference: DrawSummaryView } | null;
  riskCriterion: { name: string; allocation: number; expectedValueSolution: number; current: number } | null;
  notes: string[];
};

const histogram = (o: { mean: number; sd: number; q05: number; q50: number; q95: number; histogram: { edges: ArrayLike<number>; counts: ArrayLike<number> } }): HistogramView => ({
  mean: o.mean,
  sd: o.sd,
  q05: o.q05,
  q50: o.q50,
  q95: o.q95,
  edges: Array.from(o.histogram.edges),
  counts: Array.from(o.histogram.counts),
});

/** A split computed in the worker, its lines named by the draw set's cell ids. */
export function splitViewOfResult(result: SplitResult, drawSet: Pick<DecodedDrawSet, "cells">): SplitView {
  return {
    objective: result.objective,
    risk: result.risk.kind === "expected" ? { kind: "expected" } : result.risk.kind === "lower-quantile" ? { kind: "lower-quantile", quantile: result.risk.quantile } : { kind: "mean-minus-sd", penalty: result.risk.penalty },
    horizon: result.horizon,
    totalBudget: result.totalBudget,
    allocatedTotal: result.allocatedTotal,
    currentTotal: result.currentTotal,
    exact: result.exact,
    method: result.method,
    lines: result.lines.map((line) => {
      const cellId = drawSet.cells[line.cellIndex]?.cellId ?? String(line.cellIndex);
      return {
        key: `${cellId}|${line.channel}`,
        cellId,
        brand: line.brand,
        market: line.market,
        channel: line.channel,
        allocation: line.allocation,
        current: line.current,
        lower: line.lower,
        upper: Number.isFinite(line.upper) ? line.upper : null,
        activeBound: line.activeBound,
        marginalCac: line.marginalReturn > 0 && Number.isFinite(line.marginalCac) ? line.marginalCac : null,
        weightedReturn: line.weightedMarginalReturn,
        expectedCustomers: line.expectedCustomers,
        beyondObservedSpend: line.beyondObservedSpend,
      };
    }),
    outcome: { allocation: histogram(result.outcome.allocation), current: histogram(result.outcome.current) },
    customers: result.customers,
    profit: result.profit,
    riskCriterion: result.riskCriterion,
    notes: [...result.notes],
  };
}

/** A split saved by the server; the weighted return comes back from the marginal CAC and the customer values. */
export function splitViewOfSaved(result: BudgetSplitResultView, objective: { kind: "customers" } | { kind: "profit"; customerValue: Record<string, number> }, risk: RiskAttitudeView): SplitView {
  const weight = (brand: string) => (objective.kind === "profit" ? (objective.customerValue[brand] ?? 0) : 1);
  return {
    objective: result.objective,
    risk,
    horizon: result.horizon,
    totalBudget: result.totalBudget,
    allocatedTotal: result.allocatedTotal,
    currentTotal: result.currentTotal,
    exact: result.exact,
    method: result.method,
    lines: result.lines.map((line) => ({
      key: `${line.cellId}|${line.channel}`,
      cellId: line.cellId,
      brand: line.brand,
      market: line.market,
      channel: line.channel,
      allocation: line.allocation,
      current: line.current,
      lower: line.lower,
      upper: line.upper,
      activeBound: line.activeBound,
      marginalCac: line.marginalCac,
      weightedReturn: line.marginalCac === null ? 0 : weight(line.brand) / line.marginalCac,
      expectedCustomers: line.expectedCustomers,
      beyondObservedSpend: line.beyondObservedSpend,
    })),
    outcome: { allocation: histogram(result.outcome.allocation), current: histogram(result.outcome.current) },
    customers: result.customers,
    profit: result.profit,
    riskCriterion: result.riskCriterion,
    notes: result.notes,
  };
}

export type MarginalCheck = {
  /** Lines not at a bound. */
  freeLines: number;
  /** Mean weighted marginal return over the lines not at a bound (null with none). */
  multiplier: number | null;
  /** (largest − smallest) / mean over those lines; 0 with fewer than two. */
  spread: number;
  /** The spread is at the level of rounding: the lines not at a bound earn the same at the margin. */
  equal: boolean;
};

/** Below this relative spread the marginal returns count as equal (solver tolerance, with room for saved rounding). */
export const EQUAL_SPREAD = 1e-4;

/**
 * The optimality check of a split: at the optimum of a concave expected-value problem
 * every line not at a bound has the same (weighted) expected marginal return, the
 * budget's multiplier (the Karush–Kuhn–Tucker conditions).
 */
export function marginalCheck(lines: readonly Pick<SplitLineView, "activeBound" | "weightedReturn">[]): MarginalCheck {
  const free = lines.filter((line) => line.activeBound === null).map((line) => line.weightedReturn);
  if (free.length === 0) return { freeLines: 0, multiplier: null, spread: 0, equal: true };
  const mean = free.reduce((a, b) => a + b, 0) / free.length;
  const spread = free.length < 2 || mean === 0 ? 0 : (Math.max(...free) - Math.min(...free)) / mean;
  return { freeLines: free.length, multiplier: mean, spread, equal: spread <= EQUAL_SPREAD };
}

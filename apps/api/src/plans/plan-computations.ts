// The numbers of a saved plan, computed on the server from the plan's inputs and the
// run's draws: a scenario's headline against the current plan, and a budget split
// (recomputed to check the allocation the browser sent). Errors of the stats package
// (RangeError with a readable message) become 400s.
import {
  ALLOCATION_TOLERANCE,
  type BudgetSplitResultView,
  type CostPerExtraCustomerView,
  type DrawSummaryView,
  type ScenarioHeadline,
} from "@tributary/contracts";
import {
  applyScenario,
  budgetSplit,
  comparePlans,
  currentPlan,
  forecastPlan,
  spendPlanFrom,
  type BudgetSplitResult,
  type DrawSet,
  type DrawSummary,
  type OutcomeDistribution,
  type PlanForecast,
  type ScenarioOperation,
  type BudgetBound,
  type BudgetObjective,
  type RiskAttitude,
  type SpendPlan,
  type CostPerExtraCustomer,
} from "@tributary/stats";
import { Invalid, type FieldIssue } from "../http/errors";

/** Runs a stats computation, turning its RangeErrors (bad plan input) into a 400 with the same words. */
export function checked<T>(what: string, compute: () => T): T {
  try {
    return compute();
  } catch (error) {
    if (error instanceof RangeError) throw new Invalid(`${what}: ${error.message}`);
    throw error;
  }
}

const finiteOrNull = (x: number): number | null => (Number.isFinite(x) ? x : null);

export function summaryView(s: DrawSummary): DrawSummaryView {
  return { mean: s.mean, sd: s.sd, q05: s.q05, q25: s.q25, q50: s.q50, q75: s.q75, q95: s.q95 };
}

function costView(cost: CostPerExtraCustomer): CostPerExtraCustomerView {
  if (cost.kind === "cost" || cost.kind === "saving-per-customer-lost") {
    const i = cost.interval;
    return {
      kind: cost.kind,
      text: cost.text,
      interval: { q05: finiteOrNull(i.q05), q25: finiteOrNull(i.q25), q50: finiteOrNull(i.q50), q75: finiteOrNull(i.q75), q95: finiteOrNull(i.q95), unboundedShare: i.unboundedShare },
    };
  }
  return { kind: cost.kind, text: cost.text, interval: null };
}

export interface ScenarioInputs {
  readonly horizon: number;
  readonly recentWeeks: number;
  readonly seed: number;
  readonly operations: readonly ScenarioOperation[];
}

/** The current plan and the scenario over all cells of `set` (a draw set of the plan's cells). */
export function scenarioPlans(set: DrawSet, input: ScenarioInputs): { reference: SpendPlan; scenario: SpendPlan } {
  return checked("The scenario cannot be applied", () => {
    const reference = currentPlan(set, { horizon: input.horizon, recentWeeks: input.recentWeeks });
    return { reference, scenario: applyScenario(reference, input.operations) };
  });
}

/** The scenario against the current plan on the same draws. `cellIds` name the cells of `set` in order. */
export function scenarioHeadline(set: DrawSet, cellIds: readonly string[], input: ScenarioInputs, now = new Date()): ScenarioHeadline {
  const { reference, scenario } = scenarioPlans(set, input);
  const comparison = checked("The scenario cannot be forecast", () => comparePlans(set, reference, scenario, { seed: input.seed }));
  const ref = comparison.reference;
  const alt = comparison.scenario;
  return {
    horizon: input.horizon,
    currentSpend: ref.selection.totalSpend,
    scenarioSpend: alt.selection.totalSpend,
    extraSpend: comparison.selection.extraSpend,
    currentOutcome: summaryView(ref.selection.total),
    scenarioOutcome: summaryView(alt.selection.total),
    extraCustomers: summaryView(comparison.selection.extraCustomers),
    costPerExtraCustomer: costView(comparison.selection.costPerExtraCustomer),
    cells: comparison.cells.map((cell, i) => ({
      cellId: cellIds[i]!,
      brand: cell.brand,
      market: cell.market,
      currentSpend: ref.cells[i]!.totalSpend,
      scenarioSpend: alt.cells[i]!.totalSpend,
      currentOutcome: summaryView(ref.cells[i]!.total),
      scenarioOutcome: summaryView(alt.cells[i]!.total),
      extraCustomers: summaryView(cell.extraCustomers),
    })),
    drawCount: set.drawCount,
    computedAt: now.toISOString(),
  };
}

export interface BudgetSplitInputs {
  readonly totalBudget: number;
  readonly horizon: number;
  readonly recentWeeks: number;
  readonly bounds: readonly BudgetBound[];
  readonly objective: BudgetObjective;
  readonly risk: RiskAttitude;
}

/** The split over every cell of `set` (a draw set of the plan's cells, in the plan's order). */
export function computeBudgetSplit(set: DrawSet, input: BudgetSplitInputs): BudgetSplitResult {
  return checked("The budget cannot be split", () =>
    budgetSplit(set, {
      totalBudget: input.totalBudget,
      horizon: input.horizon,
      recentWeeks: input.recentWeeks,
      bounds: input.bounds,
      objective: input.objective,
      risk: input.risk,
    }),
  );
}

function distributionView(o: OutcomeDistribution) {
  return { mean: o.mean, sd: o.sd, q05: o.q05, q50: o.q50, q95: o.q95, histogram: { edges: Array.from(o.histogram.edges), counts: Array.from(o.histogram.counts) } };
}

export function budgetSplitView(result: BudgetSplitResult, cellIds: readonly string[], drawCount: number, now = new Date()): BudgetSplitResultView {
  const comparison = (c: BudgetSplitResult["customers"]) => ({ allocation: summaryView(c.allocation), current: summaryView(c.current), difference: summaryView(c.difference) });
  return {
    objective: result.objective,
    horizon: result.horizon,
    totalBudget: result.totalBudget,
    allocatedTotal: result.allocatedTotal,
    currentTotal: result.currentTotal,
    budgetBinding: result.budgetBinding,
    exact: result.exact,
    method: result.method,
    lines: result.lines.map((line) => ({
      cellId: cellIds[line.cellIndex]!,
      brand: line.brand,
      market: line.market,
      channel: line.channel,
      allocation: line.allocation,
      weeklyAllocation: line.weeklyAllocation,
      current: line.current,
      lower: line.lower,
      upper: finiteOrNull(line.upper),
      activeBound: line.activeBound,
      marginalCac: finiteOrNull(line.marginalCac),
      expectedCustomers: line.expectedCustomers,
      beyondObservedSpend: line.beyondObservedSpend,
    })),
    outcome: { allocation: distributionView(result.outcome.allocation), current: distributionView(result.outcome.current) },
    customers: comparison(result.customers),
    profit: result.profit ? comparison(result.profit) : null,
    riskCriterion: result.riskCriterion ? { ...result.riskCriterion } : null,
    notes: [...result.notes],
    drawCount,
    computedAt: now.toISOString(),
  };
}

export interface SentAllocationLine {
  readonly cellId: string;
  readonly channel: string;
  readonly amount: number;
}

/**
 * Checks the allocation the browser sent against the total, the bounds and the server's
 * own split of the same inputs; throws a 400 listing every line that disagrees.
 */
export function checkSentAllocation(sent: readonly SentAllocationLine[], split: BudgetSplitResultView): void {
  const key = (cellId: string, channel: string) => `${cellId}|${channel}`;
  const issues: FieldIssue[] = [];
  const byLine = new Map<string, number>();
  sent.forEach((line, k) => {
    const id = key(line.cellId, line.channel);
    if (byLine.has(id)) issues.push({ path: `allocation.${k}`, message: `The line ${line.channel} of cell ${line.cellId} is sent twice` });
    byLine.set(id, line.amount);
  });
  const expected = new Set(split.lines.map((line) => key(line.cellId, line.channel)));
  sent.forEach((line, k) => {
    if (!expected.has(key(line.cellId, line.channel))) issues.push({ path: `allocation.${k}`, message: `The split has no line ${line.channel} for cell ${line.cellId}` });
  });
  if (issues.length > 0) throw new Invalid("The allocation does not match the plan's cells and channels", issues);

  const total = split.totalBudget;
  const tolerance = ALLOCATION_TOLERANCE * total;
  const label = (line: BudgetSplitResultView["lines"][number]) => `${line.brand} × ${line.market}, ${line.channel}`;
  let sum = 0;
  for (const line of split.lines) {
    const amount = byLine.get(key(line.cellId, line.channel));
    if (amount === undefined) {
      issues.push({ path: "allocation", message: `The allocation has no amount for ${label(line)}` });
      continue;
    }
    sum += amount;
    if (amount < line.lower - tolerance) issues.push({ path: "allocation", message: `${label(line)}: ${amount} is below its lower bound ${line.lower}` });
    if (line.upper !== null && amount > line.upper + tolerance) issues.push({ path: "allocation", message: `${label(line)}: ${amount} is above its upper bound ${line.upper}` });
  }
  if (sum > total + tolerance) issues.push({ path: "allocation", message: `The allocation adds up to ${sum}, more than the total budget ${total}` });
  if (split.objective === "customers" && sum < total - tolerance) {
    issues.push({ path: "allocation", message: `The allocation adds up to ${sum}; a split for customers spends the whole budget of ${total}` });
  }
  if (issues.length > 0) throw new Invalid("The allocation breaks the total budget or a bound", issues);

  for (const line of split.lines) {
    const amount = byLine.get(key(line.cellId, line.channel))!;
    if (Math.abs(amount - line.allocation) > tolerance) {
      issues.push({ path: "allocation", message: `${label(line)}: sent ${amount}, the split of these inputs gives ${line.allocation}` });
    }
  }
  if (issues.length > 0) {
    throw new Invalid("The allocation differs from the split the server computed from the same inputs on the same fit; compute the split again and save it", issues);
  }
}

/** A budget split's allocation as a constant weekly spend plan over its cells (`set` holds the plan's cells in order). */
export function splitSpendPlan(set: DrawSet, cellIds: readonly string[], split: BudgetSplitResultView): SpendPlan {
  const C = set.channels.length;
  const H = split.horizon;
  const spend = new Float64Array(cellIds.length * C * H);
  for (const line of split.lines) {
    const i = cellIds.indexOf(line.cellId);
    const c = set.channels.indexOf(line.channel);
    if (i < 0 || c < 0) throw new Invalid(`The stored split names ${line.brand} × ${line.market}, ${line.channel}, which is not in its fit`);
    spend.fill(line.weeklyAllocation, (i * C + c) * H, (i * C + c + 1) * H);
  }
  return checked("The split cannot be forecast", () => spendPlanFrom(set, { cells: set.cells.map((c) => ({ brand: c.brand, market: c.market })), horizon: H, spend }));
}

/** Week-by-week forecast of a plan (for the CSV export). */
export function forecastOf(set: DrawSet, plan: SpendPlan, seed: number): PlanForecast {
  return checked("The plan cannot be forecast", () => forecastPlan(set, plan, { seed }));
}


import type { DrawSet } from "../decisions/draw-set";
import { summariseDraws, type DrawSummary } from "../decisions/draw-summary";
import { solveEqualMarginalReturn, type LineStatus } from "./equal-marginal-return";
import { matchLines, type LineTarget } from "./line-target";
import { LineResponses, type BudgetLineRef } from "./line-response";
import { outcomeDistributions, type OutcomeDistribution } from "./outcome-distribution";
import { checkHorizon, cellLabel, DEFAULT_PLAN_HORIZON, DEFAULT_RECENT_WEEKS, planCellsOf, resolveCells, type CellRef } from "./plan-cells";
import { PLAN_CAUTION } from "./plan-forecast";
import { optimiseRisk, outcomeDraws, riskValue, type DrawOutcome, type RiskAttitude } from "./risk-attitude";
import type { SpendPlan } from "./spend-plan";

/**
 * Bounds on the spend of every line a target selects, over the whole horizon (the same
 * unit as the total budget). A bound on a channel or a market applies to each of its
 * lines separately, not to their sum. Several bounds on one line combine (the highest
 * lower, the lowest upper).
 */
export interface BudgetBound {
  readonly target?: LineTarget;
  readonly lower?: number;
  readonly upper?: number;
}

/** What the split maximises: expected new customers, or expected profit = value × customers − spend. */
export type BudgetObjective =
  | { readonly kind: "customers" }
  /** Value of a new customer per brand, in the reporting currency. */
  | { readonly kind: "profit"; readonly customerValue: Readonly<Record<string, number>> };

export interface BudgetSplitInput {
  /** Cells whose lines share the budget (default: every cell of the run); all their channels are lines. */
  readonly cells?: readonly CellRef[];
  /** Total budget over the horizon, in the reporting currency. */
  readonly totalBudget: number;
  /** Weeks the budget covers (default 13). */
  readonly horizon?: number;
  readonly bounds?: readonly BudgetBound[];
  readonly objective?: BudgetObjective;
  readonly risk?: RiskAttitude;
  /** Recent data weeks whose average weekly spend is the current allocation (default 13). */
  readonly recentWeeks?: number;
  /** Histogram bins of the outcome distributions (default 30). */
  readonly histogramBins?: number;
}

export interface BudgetSplitLine {
  readonly cellIndex: number;
  readonly brand: string;
  readonly market: string;
  readonly channelIndex: number;
  readonly channel: string;
  /** Spend over the horizon, and per week. */
  readonly allocation: number;
  readonly weeklyAllocation: number;
  /** Spend over the horizon at the current weekly spend (average of the recent weeks). */
  readonly current: number;
  readonly lower: number;
  readonly upper: number;
  /** The bound the allocation sits on, if any ("fixed" when lower = upper). */
  readonly activeBound: "lower" | "upper" | "fixed" | null;
  /** E_d R′(s) at the weekly allocation: expected new customers per extra currency unit. */
  readonly marginalReturn: number;
  /** 1 / marginalReturn: expected cost of one more customer at the allocation. */
  readonly marginalCac: number;
  /** Customer value × marginalReturn for profit (profit per extra currency unit is this − 1); marginalReturn for customers. */
  readonly weightedMarginalReturn: number;
  /** Expected new customers over the horizon from this line at steady state. */
  readonly expectedCustomers: number;
  /** The weekly allocation is above the highest weekly spend of this line in the data (the response there is extrapolated). */
  readonly beyondObservedSpend: boolean;
}

export interface BudgetOutcomeComparison {
  readonly allocation: DrawSummary;
  readonly current: DrawSummary;
  /** Allocation minus current, draw by draw. */
  readonly difference: DrawSummary;
}

export interface BudgetSplitResult {
  readonly objective: "customers" | "profit";
  readonly risk: RiskAttitude;
  readonly horizon: number;
  readonly totalBudget: number;
  readonly allocatedTotal: number;
  readonly currentTotal: number;
  /** Whether the whole budget is spent; for profit it need not be. */
  readonly budgetBinding: boolean;
  /**
   * Of the expected-value solution: the common weighted expected marginal return of the
   * lines not at a bound (customers: new customers per extra currency unit; profit:
   * value × marginal return, 1 when the budget is not all spent).
   */
  readonly multiplier: number;
  readonly lines: readonly BudgetSplitLine[];
  /** Positions in `lines` of the lines at a bound. */
  readonly linesAtBounds: readonly number[];
  /**
   * Over lines not at a bound: (max − min) / mean of the weighted expected marginal return
   * (0 with fewer than two). About 1e-9 or less for an exact expected-value solution.
   */
  readonly equalMarginalSpread: number;
  /** True when the allocation is the exact optimum (expected value with concave responses). */
  readonly exact: boolean;
  readonly method: string;
  /** The objective (customers or profit over the horizon) over posterior draws, on shared histogram edges. */
  readonly outcome: { readonly allocation: OutcomeDistribution; readonly current: OutcomeDistribution };
  readonly customers: BudgetOutcomeComparison;
  readonly profit: BudgetOutcomeComparison | null;
  /** For a risk attitude other than "expected": the criterion at this allocation, at the expected-value solution and at the current allocation. */
  readonly riskCriterion: {
    readonly name: string;
    readonly allocation: number;
    readonly expectedValueSolution: number;
    readonly current: number;
    readonly iterations: number;
  } | null;
  /** Allocation over the horizon per line of the expected-value solution (when a risk attitude was used). */
  readonly expectedValueAllocation: Float64Array | null;
  readonly notes: readonly string[];
}

const STEADY_STATE_NOTE =
  "Each line's outcome over the horizon is the horizon's weeks × its steady-state weekly response to a constant weekly spend (adstock settled at the new level). The ramp-up from the current spend and the carry-over after the horizon are not counted; forecast the allocation as a spend plan to see them week by week.";

/**
 * Splits a total budget over the lines (cell × channel) of the chosen cells. With the
 * expected objective the split is the exact optimum of the concave problem: every line
 * not at a bound has the same expected marginal return. With a risk attitude the split
 * optimises that criterion over the posterior draws from the expected-value solution
 * (approximate). For profit, the budget is an upper limit: a line is funded only while
 * value × expected marginal return is at least 1.
 */
export function budgetSplit(set: DrawSet, input: BudgetSplitInput): BudgetSplitResult {
  const horizon = input.horizon ?? DEFAULT_PLAN_HORIZON;
  checkHorizon(horizon, "the budget horizon");
  const recent = input.recentWeeks ?? DEFAULT_RECENT_WEEKS;
  if (!Number.isInteger(recent) || recent < 1) throw new RangeError(`the current allocation averages a whole number of recent weeks (1 or more), got ${recent}`);
  const total = input.totalBudget;
  if (!(typeof total === "number" && Number.isFinite(total) && total > 0)) throw new RangeError(`the total budget must be a positive number, got ${total}`);
  const bins = input.histogramBins ?? 30;
  if (!Number.isInteger(bins) || bins < 1 || bins > 1000) throw new RangeError(`histogram bins must be a whole number from 1 to 1000, got ${bins}`);
  const objective = input.objective ?? { kind: "customers" };
  const risk = input.risk ?? { kind: "expected" };
  checkRisk(risk);

  const indices = resolveCells(set, input.cells);
  const cells = planCellsOf(set, indices);
  const C = set.channels.length;
  const lines: BudgetLineRef[] = [];
  for (const g of indices) for (let c = 0; c < C; c++) lines.push({ cellIndex: g, channelIndex: c });
  const n = lines.length;
  const label = (l: number): string => `${cellLabel(cells[Math.floor(l / C)]!)}, ${set.channels[l % C]}`;

  // Weights: 1 per line for customers, the brand's customer value for profit.
  const weight = new Float64Array(n).fill(1);
  if (objective.kind === "profit") {
    const values = objective.customerValue;
    if (values === null || typeof values !== "object") throw new RangeError("profit needs the value of a new customer per brand");
    const brands = new Set(cells.map((c) => c.brand));
    for (const brand of Object.keys(values)) if (!brands.has(brand)) throw new RangeError(`customer value given for brand "${brand}", which has no chosen cell (${[...brands].join(", ")})`);
    lines.forEach((_, l) => {
      const brand = cells[Math.floor(l / C)]!.brand;
      const v = values[brand];
      if (!(typeof v === "number" && Number.isFinite(v) && v > 0)) throw new RangeError(`profit needs a positive value of a new customer for brand ${brand}, got ${v}`);
      weight[l] = v;
    });
  } else if (objective.kind !== "customers") throw new RangeError(`unknown objective; use customers or profit`);

  // Bounds over the horizon, combined per line, then in weekly units for the solver.
  const lowerTotal = new Float64Array(n);
  const upperTotal = new Float64Array(n).fill(Infinity);
  (input.bounds ?? []).forEach((bound, k) => {
    const what = `bound ${k + 1}`;
    const lo = bound.lower ?? 0;
    const hi = bound.upper ?? Infinity;
    if (!(typeof lo === "number" && Number.isFinite(lo) && lo >= 0)) throw new RangeError(`${what}: the lower bound must be a number ≥ 0, got ${lo}`);
    if (!(typeof hi === "number" && hi >= 0 && !Number.isNaN(hi))) throw new RangeError(`${what}: the upper bound must be a number ≥ 0, got ${hi}`);
    if (lo > hi) throw new RangeError(`${what}: the lower bound ${lo} is above the upper bound ${hi}`);
    const mask = matchLines(bound.target, cells, set.channels, what);
    for (let l = 0; l < n; l++) {
      if (mask[l] === 0) continue;
      lowerTotal[l] = Math.max(lowerTotal[l]!, lo);
      upperTotal[l] = Math.min(upperTotal[l]!, hi);
    }
  });
  for (let l = 0; l < n; l++) {
    if (lowerTotal[l]! > upperTotal[l]!) throw new RangeError(`the bounds on ${label(l)} contradict each other: lower ${lowerTotal[l]} is above upper ${upperTotal[l]}`);
  }
  const sumLower = lowerTotal.reduce((a, b) => a + b, 0);
  const sumUpper = upperTotal.reduce((a, b) => a + b, 0);
  if (sumLower > total * (1 + 1e-12)) throw new RangeError(`the lower bounds add up to ${sumLower}, more than the total budget ${total}; lower them or raise the budget`);
  if (objective.kind === "customers" && sumUpper < total * (1 - 1e-12)) {
    throw new RangeError(`the upper bounds add up to ${sumUpper}, less than the total budget ${total}; raise them or lower the budget`);
  }
  const lower = Float64Array.from(lowerTotal, (x) => x / horizon);
  const upper = Float64Array.from(upperTotal, (x) => x / horizon);
  const budget = total / horizon;

  const responses = new LineResponses(set, lines);
  const spendAtMost = objective.kind === "profit";
  const ev = solveEqualMarginalReturn({ responses, weight, lower, upper, budget, spendAtMost });
  const drawProblem: DrawOutcome = { responses, weight, spendCost: spendAtMost ? 1 : 0, horizon };
  const box = { lower, upper, budget, spendAtMost };

  let spend = ev.spend;
  let status: readonly LineStatus[] = ev.status;
  let exact = ev.exact;
  let method = "exact KKT solution: one multiplier for the budget (safeguarded Newton on its logarithm), per line equal expected marginal return inside the bounds (safeguarded Newton)";
  const notes: string[] = [STEADY_STATE_NOTE];
  if (!ev.exact) {
    // S-shaped Hill responses: polish the stationary split on the expected objective itself.
    const polished = optimiseRisk(drawProblem, box, { kind: "expected" }, ev.spend);
    if (polished.value > polished.startValue) spend = polished.spend;
    status = statusOf(spend, lower, upper);
    method = "equal expected marginal return with S-shaped (Hill, shape > 1) responses, polished by projected gradient ascent; a good local optimum, not guaranteed global";
    notes.push("Some lines have S-shaped responses (Hill shape above 1 in some draws), so the expected objective is not concave at low spend and the split is approximate.");
  }

  let riskCriterion: BudgetSplitResult["riskCriterion"] = null;
  let expectedValueAllocation: Float64Array | null = null;
  const currentWeekly = Float64Array.from(lines, (line) => {
    const cell = set.cells[line.cellIndex]!;
    const T = cell.weeks;
    const k = Math.min(recent, T);
    let sum = 0;
    for (let t = T - k; t < T; t++) sum += cell.spend[line.channelIndex]![t]!;
    return sum / k;
  });
  if (risk.kind !== "expected") {
    const optimum = optimiseRisk(drawProblem, box, risk, spend);
    expectedValueAllocation = Float64Array.from(spend, (s) => s * horizon);
    const currentDraws = new Float64Array(set.drawCount);
    outcomeDraws(drawProblem, currentWeekly, currentDraws);
    riskCriterion = {
      name: risk.kind === "lower-quantile" ? `${Math.round(risk.quantile * 1000) / 10} % quantile of the ${objective.kind === "profit" ? "profit" : "new customers"} over the posterior draws` : `mean − ${risk.penalty} × standard deviation of the ${objective.kind === "profit" ? "profit" : "new customers"} over the posterior draws`,
      allocation: optimum.value,
      expectedValueSolution: optimum.startValue,
      current: riskValue(risk, currentDraws),
      iterations: optimum.iterations,
    };
    spend = optimum.spend;
    status = statusOf(spend, lower, upper);
    exact = false;
    method = "projected gradient ascent over the posterior draws (smoothed quantile or mean − k·sd) from the expected-value solution; approximate, never worse than the expected-value solution on this criterion";
    notes.push("The risk-adjusted split is an approximate optimum of its criterion; it is compared with the expected-value split on the same criterion.");
  }
  if (spendAtMost) {
    const spent = spend.reduce((a, b) => a + b, 0) * horizon;
    notes.push(
      spent < total * (1 - 1e-9)
        ? `Profit objective: spending more than ${round(spent)} of the ${round(total)} budget would cost more than the customers it brings are worth (value × expected marginal return below 1), so the rest is left unspent.`
        : "Profit objective: the budget is an upper limit; here all of it is worth spending.",
    );
  }
  notes.push(PLAN_CAUTION);

  // Per line report.
  const scratch = new Float64Array(2);
  const maxObserved = lines.map((line) => {
    const series = set.cells[line.cellIndex]!.spend[line.channelIndex]!;
    let max = 0;
    for (let t = 0; t < series.length; t++) max = Math.max(max, series[t]!);
    return max;
  });
  const resultLines = lines.map((line, l): BudgetSplitLine => {
    const s = spend[l]!;
    const marginal = responses.meanSlope(l, s, scratch);
    const st = status[l]!;
    return {
      cellIndex: line.cellIndex,
      brand: set.cells[line.cellIndex]!.brand,
      market: set.cells[line.cellIndex]!.market,
      channelIndex: line.channelIndex,
      channel: set.channels[line.channelIndex]!,
      allocation: s * horizon,
      weeklyAllocation: s,
      current: currentWeekly[l]! * horizon,
      lower: lowerTotal[l]!,
      upper: upperTotal[l]!,
      activeBound: st === "interior" ? null : st,
      marginalReturn: marginal,
      marginalCac: 1 / marginal,
      weightedMarginalReturn: weight[l]! * marginal,
      expectedCustomers: horizon * responses.meanResponse(l, s),
      beyondObservedSpend: s > maxObserved[l]! * (1 + 1e-9),
    };
  });
  const free = resultLines.filter((line) => line.activeBound === null).map((line) => line.weightedMarginalReturn);
  let spread = 0;
  if (free.length >= 2) {
    const mean = free.reduce((a, b) => a + b, 0) / free.length;
    spread = (Math.max(...free) - Math.min(...free)) / mean;
  }
  if (resultLines.some((line) => line.beyondObservedSpend && line.allocation > 0)) {
    notes.push("Some lines get more weekly spend than they ever had in the data; their response there is an extrapolation of the fitted curve.");
  }

  // Outcome over draws for the allocation and the current spend.
  const D = set.drawCount;
  const customersProblem: DrawOutcome = { responses, weight: new Float64Array(n).fill(1), spendCost: 0, horizon };
  const customersNew = new Float64Array(D);
  const customersNow = new Float64Array(D);
  outcomeDraws(customersProblem, spend, customersNew);
  outcomeDraws(customersProblem, currentWeekly, customersNow);
  const compare = (a: Float64Array, b: Float64Array): BudgetOutcomeComparison => ({
    allocation: summariseDraws(a),
    current: summariseDraws(b),
    difference: summariseDraws(Float64Array.from(a, (x, d) => x - b[d]!)),
  });
  let objectiveNew = customersNew;
  let objectiveNow = customersNow;
  let profit: BudgetOutcomeComparison | null = null;
  if (spendAtMost) {
    objectiveNew = new Float64Array(D);
    objectiveNow = new Float64Array(D);
    outcomeDraws(drawProblem, spend, objectiveNew);
    outcomeDraws(drawProblem, currentWeekly, objectiveNow);
    profit = compare(objectiveNew, objectiveNow);
  }
  const [allocationOutcome, currentOutcome] = outcomeDistributions([objectiveNew, objectiveNow], bins);

  const allocatedTotal = spend.reduce((a, b) => a + b, 0) * horizon;
  return {
    objective: objective.kind,
    risk,
    horizon,
    totalBudget: total,
    allocatedTotal,
    currentTotal: currentWeekly.reduce((a, b) => a + b, 0) * horizon,
    budgetBinding: allocatedTotal >= total * (1 - 1e-9),
    multiplier: ev.multiplier,
    lines: resultLines,
    linesAtBounds: resultLines.flatMap((line, l) => (line.activeBound === null ? [] : [l])),
    equalMarginalSpread: spread,
    exact,
    method,
    outcome: { allocation: allocationOutcome!, current: currentOutcome! },
    customers: compare(customersNew, customersNow),
    profit,
    riskCriterion,
    expectedValueAllocation,
    notes,
  };
}

/** The allocation as a spend plan (constant weekly spend per line), to forecast week by week with carry-over. */
export function budgetSplitPlan(set: DrawSet, split: BudgetSplitResult): SpendPlan {
  const C = set.channels.length;
  const indices: number[] = [];
  for (const line of split.lines) if (!indices.includes(line.cellIndex)) indices.push(line.cellIndex);
  const cells = planCellsOf(set, indices);
  const H = split.horizon;
  const spend = new Float64Array(indices.length * C * H);
  for (const line of split.lines) {
    const i = indices.indexOf(line.cellIndex);
    spend.fill(line.weeklyAllocation, (i * C + line.channelIndex) * H, (i * C + line.channelIndex + 1) * H);
  }
  return { horizon: H, channels: [...set.channels], cells, spend };
}

function statusOf(spend: Float64Array, lower: Float64Array, upper: Float64Array): LineStatus[] {
  return Array.from(spend, (s, l) => {
    const lo = lower[l]!;
    const hi = upper[l]!;
    if (lo === hi) return "fixed";
    const tol = 1e-9 * Math.max(1, Math.abs(s));
    if (s <= lo + tol) return "lower";
    if (s >= hi - tol) return "upper";
    return "interior";
  });
}

function checkRisk(risk: RiskAttitude): void {
  if (risk.kind === "expected") return;
  if (risk.kind === "lower-quantile") {
    if (!(typeof risk.quantile === "number" && risk.quantile > 0 && risk.quantile < 1)) throw new RangeError(`the quantile must be between 0 and 1 (e.g. 0.1), got ${risk.quantile}`);
    return;
  }
  if (risk.kind === "mean-minus-sd") {
    if (!(typeof risk.penalty === "number" && Number.isFinite(risk.penalty) && risk.penalty >= 0)) throw new RangeError(`the penalty on the standard deviation must be a number ≥ 0, got ${risk.penalty}`);
    return;
  }
  throw new RangeError("unknown risk attitude; use expected, lower-quantile or mean-minus-sd");
}

function round(x: number): string {
  return String(Math.round(x));
}

import type { DrawSet } from "../decisions/draw-set";
import { summariseDraws, type DrawSummary } from "../decisions/draw-summary";
import { costPerExtraCustomer, type CostPerExtraCustomer } from "./cost-per-extra-customer";
import { cellLabel } from "./plan-cells";
import { forecastPlan, PLAN_CAUTION, type PlanForecast, type PlanForecastOptions } from "./plan-forecast";
import type { SpendPlan } from "./spend-plan";

export interface PlanDifference {
  /** Scenario minus reference, draw by draw (same posterior draw in both). */
  readonly extraCustomers: DrawSummary;
  readonly extraCustomerDraws: Float64Array;
  readonly extraSpend: number;
  readonly costPerExtraCustomer: CostPerExtraCustomer;
}

export interface CellPlanDifference extends PlanDifference {
  readonly cellIndex: number;
  readonly brand: string;
  readonly market: string;
}

export interface PlanComparison {
  readonly reference: PlanForecast;
  readonly scenario: PlanForecast;
  readonly cells: readonly CellPlanDifference[];
  readonly selection: PlanDifference;
  readonly note: string;
}

/**
 * A scenario against a reference plan (usually the current plan) over the same cells and
 * weeks. Both are forecast on the same posterior draws with the same predictive noise
 * (common random numbers). The noise is additive and does not depend on spend, so it
 * cancels exactly: the extra customers per draw are the difference of expected outcomes,
 * and their interval is the parameter uncertainty of the difference itself (not the
 * difference of two intervals).
 */
export function comparePlans(set: DrawSet, reference: SpendPlan, scenario: SpendPlan, options: PlanForecastOptions = {}): PlanComparison {
  if (reference.horizon !== scenario.horizon) throw new RangeError(`the plans cover different horizons (${reference.horizon} and ${scenario.horizon} weeks)`);
  if (reference.cells.length !== scenario.cells.length || reference.cells.some((c, i) => c.cellIndex !== scenario.cells[i]!.cellIndex)) {
    throw new RangeError(`the plans cover different cells (${reference.cells.map(cellLabel).join(", ")} and ${scenario.cells.map(cellLabel).join(", ")})`);
  }
  const ref = forecastPlan(set, reference, options);
  const alt = forecastPlan(set, scenario, options);
  const difference = (a: Float64Array, b: Float64Array, extraSpend: number): PlanDifference => {
    const draws = new Float64Array(a.length);
    for (let d = 0; d < a.length; d++) draws[d] = b[d]! - a[d]!;
    return { extraCustomers: summariseDraws(draws), extraCustomerDraws: draws, extraSpend, costPerExtraCustomer: costPerExtraCustomer(extraSpend, draws) };
  };
  const cells = ref.cells.map((r, i): CellPlanDifference => {
    const s = alt.cells[i]!;
    return { cellIndex: r.cellIndex, brand: r.brand, market: r.market, ...difference(r.expectedTotalDraws, s.expectedTotalDraws, s.totalSpend - r.totalSpend) };
  });
  return {
    reference: ref,
    scenario: alt,
    cells,
    selection: difference(ref.selection.expectedTotalDraws, alt.selection.expectedTotalDraws, alt.selection.totalSpend - ref.selection.totalSpend),
    note: `Differences are scenario minus reference on the same posterior draws; the predictive noise is shared and cancels. ${PLAN_CAUTION}`,
  };
}

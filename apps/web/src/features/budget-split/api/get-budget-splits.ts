import { planSummarySchema, type PlanSummary } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";

const planListSchema = z.array(planSummarySchema);

/** GET /api/plans?kind=budget_split: the budget splits the viewer may see. */
export function getBudgetSplits(): Promise<PlanSummary[]> {
  return api.get("/api/plans?kind=budget_split", planListSchema);
}

/** Every plan query sits under this key, so a change to any plan refreshes every list. */
export const plansQueryKey = ["plans"] as const;

export const budgetSplitsQueryOptions = () =>
  queryOptions({ queryKey: [...plansQueryKey, "list", { kind: "budget_split" }] as const, queryFn: getBudgetSplits });

export function useBudgetSplits() {
  return useQuery(budgetSplitsQueryOptions());
}

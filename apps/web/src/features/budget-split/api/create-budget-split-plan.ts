import { budgetSplitPlanInput, planSchema, type BudgetSplitPlanInput, type Plan } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { onPlanChanged } from "./get-plan";

export { budgetSplitPlanInput as createBudgetSplitPlanInput };

/**
 * POST /api/plans/budget-splits: saves a split as a draft plan. The server recomputes it
 * from the same inputs and refuses an allocation that differs from its own.
 */
export function createBudgetSplitPlan(input: BudgetSplitPlanInput): Promise<Plan> {
  return api.post("/api/plans/budget-splits", planSchema, budgetSplitPlanInput.parse(input));
}

export function useCreateBudgetSplitPlan() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createBudgetSplitPlan,
    onSuccess: (plan) => onPlanChanged(queryClient, plan),
  });
}

import { planSchema, type Plan } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { onPlanChanged } from "./get-plan";

/** POST /api/plans/:planId/withdraw: a submitted plan back to draft. */
export function withdrawPlan(planId: string): Promise<Plan> {
  return api.post(`/api/plans/${encodeURIComponent(planId)}/withdraw`, planSchema);
}

export function useWithdrawPlan() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: withdrawPlan, onSuccess: (plan) => onPlanChanged(queryClient, plan) });
}

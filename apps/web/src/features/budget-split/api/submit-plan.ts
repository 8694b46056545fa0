import { planSchema, type Plan } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { onPlanChanged } from "./get-plan";

/** POST /api/plans/:planId/submit: a draft goes to the portfolio leads for approval (they are e-mailed). */
export function submitPlan(planId: string): Promise<Plan> {
  return api.post(`/api/plans/${encodeURIComponent(planId)}/submit`, planSchema);
}

export function useSubmitPlan() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: submitPlan, onSuccess: (plan) => onPlanChanged(queryClient, plan) });
}

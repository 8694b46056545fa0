import { planDecisionInput, planSchema, type Plan, type PlanDecisionInput } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { onPlanChanged } from "./get-plan";

export { planDecisionInput };

/** POST /api/plans/:planId/decision: approve, or reject with a comment (portfolio leads and admins; the author is e-mailed). */
export function decidePlan({ planId, ...input }: PlanDecisionInput & { planId: string }): Promise<Plan> {
  return api.post(`/api/plans/${encodeURIComponent(planId)}/decision`, planSchema, planDecisionInput.parse(input));
}

export function useDecidePlan() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: decidePlan, onSuccess: (plan) => onPlanChanged(queryClient, plan) });
}

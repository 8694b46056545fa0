import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { plansQueryKey } from "./get-budget-splits";

/** DELETE /api/plans/:planId. */
export function deletePlan(planId: string): Promise<void> {
  return api.delete<void>(`/api/plans/${encodeURIComponent(planId)}`, null);
}

export function useDeletePlan() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: deletePlan, onSuccess: () => queryClient.invalidateQueries({ queryKey: plansQueryKey }) });
}

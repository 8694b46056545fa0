import { planSchema, type Plan } from "@tributary/contracts";
import { queryOptions, useQuery, type QueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { plansQueryKey } from "./get-budget-splits";

/** GET /api/plans/:planId: one saved plan with its inputs, the server's result and what the viewer may do with it. */
export function getPlan(planId: string): Promise<Plan> {
  return api.get(`/api/plans/${encodeURIComponent(planId)}`, planSchema);
}

export const planQueryOptions = (planId: string) => queryOptions({ queryKey: [...plansQueryKey, "detail", planId] as const, queryFn: () => getPlan(planId) });

export function usePlan(planId: string | null) {
  return useQuery({ ...planQueryOptions(planId ?? ""), enabled: planId !== null });
}

/** After a plan changed: keep its answer as the detail, refresh every plan list. */
export function onPlanChanged(queryClient: QueryClient, plan: Plan | void): Promise<void> {
  if (plan) queryClient.setQueryData(planQueryOptions(plan.id).queryKey, plan);
  return queryClient.invalidateQueries({ queryKey: plansQueryKey, predicate: (query) => query.queryKey[1] === "list" });
}

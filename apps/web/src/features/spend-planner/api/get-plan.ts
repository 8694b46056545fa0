import { planSchema, type Plan } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { plansQueryKey } from "./get-saved-plans";

/** GET /api/plans/:planId: one saved plan with its inputs and the numbers the server computed. */
export function getPlan(planId: string): Promise<Plan> {
  return api.get(`/api/plans/${encodeURIComponent(planId)}`, planSchema);
}

export const planQueryOptions = (planId: string) => queryOptions({ queryKey: [...plansQueryKey, "detail", planId] as const, queryFn: () => getPlan(planId) });

export function usePlan(planId: string | null) {
  return useQuery({ ...planQueryOptions(planId ?? ""), enabled: planId !== null });
}

import { useMutation, useQueryClient } from "@tanstack/react-query";
import { renamePlan } from "../../../lib/plan-rename";
import { planQueryOptions } from "./get-plan";
import { plansQueryKey } from "./get-saved-plans";

export { checkPlanName } from "../../../lib/plan-rename";

export function useRenamePlan() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: renamePlan,
    onSuccess: (plan) => {
      queryClient.setQueryData(planQueryOptions(plan.id).queryKey, plan);
      return queryClient.invalidateQueries({ queryKey: plansQueryKey, predicate: (query) => query.queryKey[1] === "list" });
    },
  });
}

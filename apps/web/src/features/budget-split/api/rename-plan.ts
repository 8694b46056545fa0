import { useMutation, useQueryClient } from "@tanstack/react-query";
import { renamePlan } from "../../../lib/plan-rename";
import { onPlanChanged } from "./get-plan";

export { checkPlanName } from "../../../lib/plan-rename";

export function useRenamePlan() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: renamePlan, onSuccess: (plan) => onPlanChanged(queryClient, plan) });
}

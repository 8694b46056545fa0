import { planSchema, scenarioPlanInput, type Plan, type ScenarioPlanInput } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { plansQueryKey } from "./get-saved-plans";

export { scenarioPlanInput as createScenarioPlanInput };

/** POST /api/plans/scenarios: saves a named scenario; the server recomputes its numbers on the run's draws. */
export function createScenarioPlan(input: ScenarioPlanInput): Promise<Plan> {
  return api.post("/api/plans/scenarios", planSchema, scenarioPlanInput.parse(input));
}

export function useCreateScenarioPlan() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createScenarioPlan, onSuccess: () => queryClient.invalidateQueries({ queryKey: plansQueryKey }) });
}

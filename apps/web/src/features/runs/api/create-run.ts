import { runSchema, startRunInput, type Run, type StartRunInput } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { runsQueryOptions } from "./get-runs";

export { startRunInput as createRunInput };

/** Queues a fit of stored model settings. */
export function createRun(input: StartRunInput): Promise<Run> {
  return api.post("/api/runs", runSchema, startRunInput.parse(input));
}

export function useCreateRun() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createRun,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: runsQueryOptions().queryKey }),
  });
}

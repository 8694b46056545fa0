import { runSchema, type Run } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import { runsQueryOptions } from "./get-runs";

export const restartRunInput = z.object({ runId: z.string().min(1) });
export type RestartRunInput = z.infer<typeof restartRunInput>;

/** Queues a new run with the same settings as an interrupted one; answers with the new run. */
export function restartRun({ runId }: RestartRunInput): Promise<Run> {
  return api.post(`/api/runs/${encodeURIComponent(runId)}/restart`, runSchema);
}

export function useRestartRun() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: RestartRunInput) => restartRun(restartRunInput.parse(input)),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: runsQueryOptions().queryKey }),
  });
}

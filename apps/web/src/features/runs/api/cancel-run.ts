import { runSchema, type Run } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import { runsQueryOptions } from "./get-runs";

export const cancelRunInput = z.object({ runId: z.string().min(1) });
export type CancelRunInput = z.infer<typeof cancelRunInput>;

/** Stops a waiting or running fit; its draws so far are discarded. */
export function cancelRun({ runId }: CancelRunInput): Promise<Run> {
  return api.post(`/api/runs/${encodeURIComponent(runId)}/cancel`, runSchema);
}

export function useCancelRun() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CancelRunInput) => cancelRun(cancelRunInput.parse(input)),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: runsQueryOptions().queryKey }),
  });
}

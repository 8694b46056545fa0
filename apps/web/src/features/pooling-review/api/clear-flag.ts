import { clearFlagInput, flagSchema, type ClearFlagInput, type Flag } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { dashboardsQueryKey } from "../../../lib/dashboard-query";
import { flagsQueryOptions } from "./get-flags";

export { clearFlagInput };

/** Clears an active flag; it stays in the history. */
export function clearFlag(flagId: string, input: ClearFlagInput = {}): Promise<Flag> {
  return api.post(`/api/flags/${encodeURIComponent(flagId)}/clear`, flagSchema, clearFlagInput.parse(input));
}

export function useClearFlag() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ flagId, note }: { flagId: string; note?: string }) => clearFlag(flagId, note ? { note } : {}),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: flagsQueryOptions().queryKey }),
        queryClient.invalidateQueries({ queryKey: dashboardsQueryKey }),
      ]),
  });
}

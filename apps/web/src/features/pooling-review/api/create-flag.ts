import { createFlagInput, flagSchema, type CreateFlagInput, type Flag } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { dashboardsQueryKey } from "../../../lib/dashboard-query";
import { flagsQueryOptions } from "./get-flags";

export { createFlagInput };

/** Flags one cell × channel; a new flag replaces the cell × channel's active one. */
export function createFlag(input: CreateFlagInput): Promise<Flag> {
  return api.post("/api/flags", flagSchema, createFlagInput.parse(input));
}

export function useCreateFlag() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createFlag,
    // Flags show on every dashboard.
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: flagsQueryOptions().queryKey }),
        queryClient.invalidateQueries({ queryKey: dashboardsQueryKey }),
      ]),
  });
}

import { runSchema, type Run } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { isActive, runsQueryOptions } from "./get-runs";

export function getRun(runId: string): Promise<Run> {
  return api.get(`/api/runs/${encodeURIComponent(runId)}`, runSchema);
}

export const runQueryOptions = (runId: string) =>
  queryOptions({ queryKey: [...runsQueryOptions().queryKey, runId] as const, queryFn: () => getRun(runId) });

/**
 * One run. While it is active and no live stream is connected, it is polled: the
 * fallback when server-sent events do not get through.
 */
export function useRun(runId: string, { poll, placeholder }: { poll: boolean; placeholder?: Run }) {
  return useQuery({
    ...runQueryOptions(runId),
    placeholderData: placeholder,
    refetchInterval: (query) => (poll && query.state.data && isActive(query.state.data) ? 2_000 : false),
  });
}

import { runSchema, type Run } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";

const runListSchema = z.array(runSchema);

export const isActive = (run: Pick<Run, "status">) => run.status === "queued" || run.status === "running";

/** Every fit run, newest first. */
export function getRuns(): Promise<Run[]> {
  return api.get("/api/runs", runListSchema);
}

export const runsQueryOptions = () => queryOptions({ queryKey: ["runs"] as const, queryFn: getRuns });

/** The list, refreshed every few seconds while a run is waiting or running. */
export function useRuns() {
  return useQuery({
    ...runsQueryOptions(),
    refetchInterval: (query) => (query.state.data?.some(isActive) ? 5_000 : false),
  });
}

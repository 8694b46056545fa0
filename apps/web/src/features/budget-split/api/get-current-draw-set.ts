import { decodeDrawSet, drawSetWireSchema, type DecodedDrawSet } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";

/**
 * GET /api/runs/current/draw-set: the current fit's planning draws for every cell the
 * viewer may see (a market manager gets only their markets), decoded for the worker.
 */
export async function getCurrentDrawSet(): Promise<DecodedDrawSet> {
  return decodeDrawSet(await api.get("/api/runs/current/draw-set", drawSetWireSchema));
}

export const currentDrawSetQueryOptions = () =>
  queryOptions({
    // Under the runs key, so publishing a run (which refreshes runs) refreshes this too.
    queryKey: ["runs", "current", "draw-set"] as const,
    queryFn: getCurrentDrawSet,
    staleTime: 5 * 60_000,
  });

export function useCurrentDrawSet() {
  return useQuery(currentDrawSetQueryOptions());
}

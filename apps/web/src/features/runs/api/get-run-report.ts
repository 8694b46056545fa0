import { runReportSchema, type RunReport } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { runQueryOptions } from "./get-run";

/** Diagnostics, trace and rank plots, posterior predictive check and holdout accuracy of a finished run. */
export function getRunReport(runId: string): Promise<RunReport> {
  return api.get(`/api/runs/${encodeURIComponent(runId)}/report`, runReportSchema);
}

export const runReportQueryOptions = (runId: string) =>
  queryOptions({ queryKey: [...runQueryOptions(runId).queryKey, "report"] as const, queryFn: () => getRunReport(runId), staleTime: 5 * 60_000 });

export function useRunReport(runId: string, { enabled }: { enabled: boolean }) {
  return useQuery({ ...runReportQueryOptions(runId), enabled });
}

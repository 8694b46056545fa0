import { poolingReviewSchema, type PoolingReview } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { dashboardsQueryKey, orNoPublishedRun, searchOf } from "../../../lib/dashboard-query";

/** Unpooled, pooled and group estimates of every cell × channel of a run (default: the current one). */
export function getPoolingReview(runId: string | null): Promise<PoolingReview | null> {
  return orNoPublishedRun(api.get(`/api/dashboards/pooling-review${searchOf({ run: runId })}`, poolingReviewSchema));
}

export const poolingReviewQueryOptions = (runId: string | null) =>
  queryOptions({ queryKey: [...dashboardsQueryKey, "pooling-review", runId ?? "current"] as const, queryFn: () => getPoolingReview(runId) });

export function usePoolingReview(runId: string | null) {
  return useQuery(poolingReviewQueryOptions(runId));
}

export type PoolingReviewTable = "estimates" | "pooling-factors" | "outliers";
export const poolingReviewCsvHref = (table: PoolingReviewTable, runId: string | null) =>
  `/api/dashboards/pooling-review/export.csv${searchOf({ table, run: runId })}`;

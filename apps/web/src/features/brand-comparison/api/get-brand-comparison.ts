import { brandComparisonSchema, type BrandComparison } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { dashboardsQueryKey, orNoPublishedRun, searchOf } from "../../../lib/dashboard-query";

/** Channels × brands of the current published run, for one market or all in scope; null before any run is published. */
export function getBrandComparison(marketId: string | null): Promise<BrandComparison | null> {
  return orNoPublishedRun(api.get(`/api/dashboards/brand-comparison${searchOf({ market: marketId })}`, brandComparisonSchema));
}

export const brandComparisonQueryOptions = (marketId: string | null) =>
  queryOptions({ queryKey: [...dashboardsQueryKey, "brand-comparison", marketId ?? "all"] as const, queryFn: () => getBrandComparison(marketId) });

export function useBrandComparison(marketId: string | null) {
  return useQuery(brandComparisonQueryOptions(marketId));
}

export const brandComparisonCsvHref = (marketId: string | null) => `/api/dashboards/brand-comparison/export.csv${searchOf({ market: marketId })}`;

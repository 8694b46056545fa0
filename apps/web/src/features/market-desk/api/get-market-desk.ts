import { marketDeskSchema, type MarketDesk } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { dashboardsQueryKey, orNoPublishedRun, searchOf } from "../../../lib/dashboard-query";

/** One market (or every market in scope) from the current published run; null before any run is published. */
export function getMarketDesk(marketId: string | null): Promise<MarketDesk | null> {
  return orNoPublishedRun(api.get(`/api/dashboards/market-desk${searchOf({ market: marketId })}`, marketDeskSchema));
}

export const marketDeskQueryOptions = (marketId: string | null) =>
  queryOptions({ queryKey: [...dashboardsQueryKey, "market-desk", marketId ?? "all"] as const, queryFn: () => getMarketDesk(marketId) });

export function useMarketDesk(marketId: string | null) {
  return useQuery(marketDeskQueryOptions(marketId));
}

export type MarketDeskTable = "estimates" | "changes" | "plans";
export const marketDeskCsvHref = (table: MarketDeskTable, marketId: string | null) =>
  `/api/dashboards/market-desk/export.csv${searchOf({ table, market: marketId })}`;

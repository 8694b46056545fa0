import { portfolioMapSchema, type PortfolioMap } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { dashboardsQueryKey, orNoPublishedRun, searchOf } from "../../../lib/dashboard-query";

/** The channel shown: a channel code, or null for all channels combined. */
export type PortfolioMapChannel = string | null;

/** Brands × markets of the current published run for one channel (or all combined); null before any run is published. */
export function getPortfolioMap(channel: PortfolioMapChannel): Promise<PortfolioMap | null> {
  return orNoPublishedRun(api.get(`/api/dashboards/portfolio-map${searchOf({ channel: channel ?? "all" })}`, portfolioMapSchema));
}

export const portfolioMapQueryOptions = (channel: PortfolioMapChannel) =>
  queryOptions({ queryKey: [...dashboardsQueryKey, "portfolio-map", channel ?? "all"] as const, queryFn: () => getPortfolioMap(channel) });

export function usePortfolioMap(channel: PortfolioMapChannel) {
  return useQuery(portfolioMapQueryOptions(channel));
}

/** The server's CSV of the grid (market scope enforced there). */
export const portfolioMapCsvHref = (channel: PortfolioMapChannel) =>
  `/api/dashboards/portfolio-map/export.csv${searchOf({ channel: channel ?? "all" })}`;

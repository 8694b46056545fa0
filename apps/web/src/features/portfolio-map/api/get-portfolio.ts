import { portfolioSchema, type Portfolio } from "@tributary/contracts";
import { queryOptions, useQuery, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";

/** Brands, markets, channels and each cell's data length. Market managers get only their markets. */
export function getPortfolio(): Promise<Portfolio> {
  return api.get("/api/portfolio", portfolioSchema);
}

export const portfolioQueryOptions = () => queryOptions({ queryKey: ["portfolio"] as const, queryFn: getPortfolio });

export function usePortfolio() {
  return useQuery(portfolioQueryOptions());
}

/** For screens whose loader has already fetched the portfolio. */
export function usePortfolioData(): Portfolio {
  return useSuspenseQuery(portfolioQueryOptions()).data;
}

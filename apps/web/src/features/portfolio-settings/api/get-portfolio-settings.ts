import { portfolioSettingsSchema, type PortfolioSettings } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";

/** GET /api/portfolio-settings (admins): company, currency, every brand's customer value, the channels in display order. */
export function getPortfolioSettings(): Promise<PortfolioSettings> {
  return api.get("/api/portfolio-settings", portfolioSettingsSchema);
}

export const portfolioSettingsQueryOptions = () => queryOptions({ queryKey: ["portfolio-settings"] as const, queryFn: getPortfolioSettings });

export function usePortfolioSettings() {
  return useQuery(portfolioSettingsQueryOptions());
}

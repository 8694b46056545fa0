import type { PortfolioSettings } from "@tributary/contracts";
import type { QueryClient } from "@tanstack/react-query";
import { portfolioSettingsQueryOptions } from "./get-portfolio-settings";

/**
 * After a change: the answer is the new settings; and since names, values and the
 * currency show on every screen (dashboards, planning, the audit log), everything the
 * app has cached is marked stale and fetched again when next shown.
 */
export async function settingsSaved(queryClient: QueryClient, settings: PortfolioSettings): Promise<void> {
  queryClient.setQueryData(portfolioSettingsQueryOptions().queryKey, settings);
  await queryClient.invalidateQueries({ predicate: (query) => query.queryKey[0] !== portfolioSettingsQueryOptions().queryKey[0] });
}

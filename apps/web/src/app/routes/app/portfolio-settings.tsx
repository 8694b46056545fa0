import type { QueryClient } from "@tanstack/react-query";
import { portfolioSettingsQueryOptions } from "../../../features/portfolio-settings/api/get-portfolio-settings";
import { PortfolioSettings } from "../../../features/portfolio-settings/components/portfolio-settings";

// Fetched ahead, never thrown: the screen shows its own loading and error states.
export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.prefetchQuery(portfolioSettingsQueryOptions());
  return null;
};

export default function PortfolioSettingsRoute() {
  return <PortfolioSettings />;
}

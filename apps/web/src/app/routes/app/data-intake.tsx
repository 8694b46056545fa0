import { useQueryClient, type QueryClient } from "@tanstack/react-query";
import { datasetsQueryOptions } from "../../../features/data-intake/api/get-datasets";
import { DataIntake } from "../../../features/data-intake/components/data-intake";
import { portfolioQueryOptions, usePortfolioData } from "../../../features/portfolio-map/api/get-portfolio";

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(portfolioQueryOptions());
  // The list may fail on its own; the screen shows that in place.
  void queryClient.prefetchQuery(datasetsQueryOptions());
  return null;
};

export default function DataIntakeRoute() {
  const portfolio = usePortfolioData();
  const queryClient = useQueryClient();
  // A new version changes every cell's data length on the portfolio screens.
  return <DataIntake currency={portfolio.currency} onSaved={() => void queryClient.invalidateQueries({ queryKey: portfolioQueryOptions().queryKey })} />;
}

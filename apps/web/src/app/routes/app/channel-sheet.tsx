import type { QueryClient } from "@tanstack/react-query";
import { NoPublishedRun } from "../../../features/dashboard-status/components/no-published-run";
import { ChannelSheet } from "../../../features/channel-sheet/components/channel-sheet";
import { portfolioQueryOptions, usePortfolioData } from "../../../features/portfolio-map/api/get-portfolio";

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(portfolioQueryOptions());
  return null;
};

export default function ChannelSheetRoute() {
  const portfolio = usePortfolioData();
  return <ChannelSheet portfolio={portfolio} noPublishedRun={<NoPublishedRun screenLabel="Channel sheet" />} />;
}

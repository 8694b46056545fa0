import type { QueryClient } from "@tanstack/react-query";
import { paths } from "../../../config/paths";
import { useSignedInUser } from "../../../features/auth/api/get-current-user";
import { NoPublishedRun } from "../../../features/dashboard-status/components/no-published-run";
import { MarketDesk } from "../../../features/market-desk/components/market-desk";
import { portfolioQueryOptions, usePortfolioData } from "../../../features/portfolio-map/api/get-portfolio";
import { ReportDownloads } from "../../../features/reports/components/report-downloads";

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(portfolioQueryOptions());
  return null;
};

export default function MarketDeskRoute() {
  const user = useSignedInUser();
  const portfolio = usePortfolioData();
  return (
    <MarketDesk
      portfolio={portfolio}
      userName={user.name}
      scopedToMarkets={user.role === "market_manager"}
      channelSheetHref={paths.app.channelSheet.getHref}
      noPublishedRun={<NoPublishedRun screenLabel="Market desk" />}
      reports={<ReportDownloads brands={portfolio.brands} markets={portfolio.markets} title="Reports of the current fit" />}
    />
  );
}

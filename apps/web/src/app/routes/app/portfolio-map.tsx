import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunctionArgs } from "react-router-dom";
import { paths } from "../../../config/paths";
import { useSignedInUser } from "../../../features/auth/api/get-current-user";
import { NoPublishedRun } from "../../../features/dashboard-status/components/no-published-run";
import { portfolioQueryOptions, usePortfolioData } from "../../../features/portfolio-map/api/get-portfolio";
import { portfolioMapQueryOptions } from "../../../features/portfolio-map/api/get-portfolio-map";
import { PortfolioMap } from "../../../features/portfolio-map/components/portfolio-map";

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const channel = new URL(request.url).searchParams.get("channel");
    await Promise.all([
      queryClient.ensureQueryData(portfolioQueryOptions()),
      queryClient.prefetchQuery(portfolioMapQueryOptions(channel && channel !== "all" ? channel : null)),
    ]);
    return null;
  };

export default function PortfolioMapRoute() {
  const user = useSignedInUser();
  const portfolio = usePortfolioData();
  return (
    <PortfolioMap
      portfolio={portfolio}
      scopedToMarkets={user.role === "market_manager"}
      channelSheetHref={paths.app.channelSheet.getHref}
      noPublishedRun={<NoPublishedRun screenLabel="Portfolio map" />}
    />
  );
}

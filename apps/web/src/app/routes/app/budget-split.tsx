import type { QueryClient } from "@tanstack/react-query";
import { useMemo } from "react";
import { useSignedInUser } from "../../../features/auth/api/get-current-user";
import { currentDrawSetQueryOptions } from "../../../features/budget-split/api/get-current-draw-set";
import { BudgetSplit } from "../../../features/budget-split/components/budget-split";
import { portfolioQueryOptions, usePortfolioData } from "../../../features/portfolio-map/api/get-portfolio";
import { ReportDownloads } from "../../../features/reports/components/report-downloads";
import { channelNameLookup } from "../../../lib/channel-names";

export const clientLoader = (queryClient: QueryClient) => async () => {
  // The draws start loading with the route; the screen shows its own loading and error states.
  void queryClient.prefetchQuery(currentDrawSetQueryOptions());
  await queryClient.ensureQueryData(portfolioQueryOptions());
  return null;
};

export default function BudgetSplitRoute() {
  const user = useSignedInUser();
  const portfolio = usePortfolioData();
  const channelName = useMemo(() => channelNameLookup(portfolio.channels), [portfolio.channels]);
  return <BudgetSplit user={user} portfolio={portfolio} channelName={channelName} reports={<ReportDownloads brands={portfolio.brands} markets={portfolio.markets} />} />;
}

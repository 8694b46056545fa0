import type { QueryClient } from "@tanstack/react-query";
import { useMemo } from "react";
import { useSignedInUser } from "../../../features/auth/api/get-current-user";
import { portfolioQueryOptions, usePortfolioData } from "../../../features/portfolio-map/api/get-portfolio";
import { currentDrawSetQueryOptions } from "../../../features/spend-planner/api/get-current-draw-set";
import { SpendPlanner } from "../../../features/spend-planner/components/spend-planner";
import { channelNameLookup } from "../../../lib/channel-names";

export const clientLoader = (queryClient: QueryClient) => async () => {
  // The draws start loading with the route; the screen shows its own loading and error states.
  void queryClient.prefetchQuery(currentDrawSetQueryOptions());
  await queryClient.ensureQueryData(portfolioQueryOptions());
  return null;
};

export default function SpendPlannerRoute() {
  const user = useSignedInUser();
  const portfolio = usePortfolioData();
  const channelName = useMemo(() => channelNameLookup(portfolio.channels), [portfolio.channels]);
  return <SpendPlanner user={user} channelName={channelName} />;
}

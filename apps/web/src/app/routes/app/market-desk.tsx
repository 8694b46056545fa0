import type { QueryClient } from "@tanstack/react-query";
import { useSignedInUser } from "../../../features/auth/api/get-current-user";
import { MarketDesk } from "../../../features/market-desk/components/market-desk";
import { portfolioQueryOptions, usePortfolioData } from "../../../features/portfolio-map/api/get-portfolio";

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(portfolioQueryOptions());
  return null;
};

export default function MarketDeskRoute() {
  const user = useSignedInUser();
  const portfolio = usePortfolioData();
  return <MarketDesk portfolio={portfolio} userName={user.name} scopedToMarkets={user.role === "market_manager"} />;
}

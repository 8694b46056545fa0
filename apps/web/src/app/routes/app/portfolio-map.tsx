import type { QueryClient } from "@tanstack/react-query";
import { useSignedInUser } from "../../../features/auth/api/get-current-user";
import { portfolioQueryOptions, usePortfolioData } from "../../../features/portfolio-map/api/get-portfolio";
import { PortfolioMap } from "../../../features/portfolio-map/components/portfolio-map";

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(portfolioQueryOptions());
  return null;
};

export default function PortfolioMapRoute() {
  const user = useSignedInUser();
  const portfolio = usePortfolioData();
  return <PortfolioMap portfolio={portfolio} scopedToMarkets={user.role === "market_manager"} />;
}

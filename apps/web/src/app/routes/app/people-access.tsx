import type { QueryClient } from "@tanstack/react-query";
import { useSignedInUser } from "../../../features/auth/api/get-current-user";
import { PeopleAccess } from "../../../features/people-access/components/people-access";
import { portfolioQueryOptions, usePortfolioData } from "../../../features/portfolio-map/api/get-portfolio";

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(portfolioQueryOptions());
  return null;
};

export default function PeopleAccessRoute() {
  const user = useSignedInUser();
  const portfolio = usePortfolioData();
  return <PeopleAccess user={user} markets={portfolio.markets} />;
}

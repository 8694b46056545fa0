import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunctionArgs } from "react-router-dom";
import { paths } from "../../../config/paths";
import { useSignedInUser } from "../../../features/auth/api/get-current-user";
import { brandComparisonQueryOptions } from "../../../features/brand-comparison/api/get-brand-comparison";
import { BrandComparison } from "../../../features/brand-comparison/components/brand-comparison";
import { NoPublishedRun } from "../../../features/dashboard-status/components/no-published-run";

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const market = new URL(request.url).searchParams.get("market");
    await queryClient.prefetchQuery(brandComparisonQueryOptions(market && market !== "all" ? market : null));
    return null;
  };

export default function BrandComparisonRoute() {
  const user = useSignedInUser();
  return (
    <BrandComparison
      scopedToMarkets={user.role === "market_manager"}
      channelSheetHref={paths.app.channelSheet.getHref}
      noPublishedRun={<NoPublishedRun screenLabel="Brand comparison" />}
    />
  );
}

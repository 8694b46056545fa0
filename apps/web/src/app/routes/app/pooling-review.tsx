import { useQuery, type QueryClient } from "@tanstack/react-query";
import type { LoaderFunctionArgs } from "react-router-dom";
import { paths } from "../../../config/paths";
import { NoPublishedRun } from "../../../features/dashboard-status/components/no-published-run";
import { poolingReviewQueryOptions } from "../../../features/pooling-review/api/get-pooling-review";
import { PoolingReview } from "../../../features/pooling-review/components/pooling-review";
import { runsQueryOptions } from "../../../features/runs/api/get-runs";

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await queryClient.prefetchQuery(poolingReviewQueryOptions(new URL(request.url).searchParams.get("run")));
    return null;
  };

export default function PoolingReviewRoute() {
  // Any finished run can be reviewed, not only the current one.
  const runs = useQuery(runsQueryOptions());
  const finished = (runs.data ?? []).filter((run) => run.status === "succeeded");
  return (
    <PoolingReview
      runs={finished}
      channelSheetHref={paths.app.channelSheet.getHref}
      noPublishedRun={<NoPublishedRun screenLabel="Pooling review" />}
    />
  );
}

import type { QueryClient } from "@tanstack/react-query";
import type { ModelSettingsRecord } from "@tributary/contracts";
import { useNavigate } from "react-router-dom";
import { ErrorState } from "../../../components/ui/error-state";
import { LoadingState } from "../../../components/ui/loading-state";
import { paths } from "../../../config/paths";
import { datasetsQueryOptions, useDatasets } from "../../../features/data-intake/api/get-datasets";
import { ModelSetup, ModelSetupHeader } from "../../../features/model-setup/components/model-setup";
import { portfolioQueryOptions, usePortfolioData } from "../../../features/portfolio-map/api/get-portfolio";
import { useCreateRun } from "../../../features/runs/api/create-run";

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(portfolioQueryOptions());
  void queryClient.prefetchQuery(datasetsQueryOptions());
  return null;
};

export default function ModelSetupRoute() {
  const portfolio = usePortfolioData();
  const datasets = useDatasets();
  const createRun = useCreateRun();
  const navigate = useNavigate();

  async function startFit(record: ModelSettingsRecord) {
    const run = await createRun.mutateAsync({ modelSettingsId: record.id });
    navigate(paths.detail.run.getHref(run.id));
  }

  if (datasets.isPending)
    return (
      <>
        <ModelSetupHeader />
        <LoadingState label="Loading dataset versions…" />
      </>
    );
  if (datasets.isError)
    return (
      <>
        <ModelSetupHeader />
        <ErrorState title="The dataset versions could not be loaded" message={datasets.error.message} onRetry={() => void datasets.refetch()} />
      </>
    );
  return <ModelSetup datasets={datasets.data} currency={portfolio.currency} onStartFit={startFit} />;
}

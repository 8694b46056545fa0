import { useQuery } from "@tanstack/react-query";
import { useParams } from "react-router-dom";
import { paths } from "../../../config/paths";
import { useDataset } from "../../../features/data-intake/api/get-dataset";
import { runQueryOptions } from "../../../features/runs/api/get-run";
import { RunDetail } from "../../../features/runs/components/run-detail";

export default function RunRoute() {
  const runId = useParams().runId ?? "";
  // The run's dataset names the outcome, for the report's axes.
  const run = useQuery(runQueryOptions(runId));
  const dataset = useDataset(run.data?.datasetVersionId ?? null);
  return (
    <RunDetail
      key={runId}
      runId={runId}
      runsHref={paths.app.runs.getHref()}
      runHref={paths.detail.run.getHref}
      outcomeName={dataset.data?.outcomeColumn}
    />
  );
}

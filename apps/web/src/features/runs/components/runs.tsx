import type { Run } from "@tributary/contracts";
import { Link } from "react-router-dom";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { TrustMark, trustStateOf } from "../../../components/trust-mark/trust-mark";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorState } from "../../../components/ui/error-state";
import { LoadingState } from "../../../components/ui/loading-state";
import { PageHeader } from "../../../components/ui/page-header";
import { formatDateTime, formatDuration } from "../../../lib/format";
import { isActive, useRuns } from "../api/get-runs";
import { ActiveRun } from "./active-run";
import { runDurationSeconds } from "./run-facts";
import { RunStatusBadge } from "./run-status";

type RunsProps = {
  runHref: (runId: string) => string;
  modelSetupHref: string;
};

function columns(runHref: (runId: string) => string): DataTableColumn<Run>[] {
  return [
    {
      id: "createdAt",
      header: "Started",
      value: (run) => run.createdAt,
      cell: (run) => (
        <Link to={runHref(run.id)} className="font-medium text-stream-700 underline-offset-2 hover:underline">
          {formatDateTime(run.createdAt)}
        </Link>
      ),
    },
    { id: "status", header: "Status", value: (run) => run.status, cell: (run) => <RunStatusBadge status={run.status} /> },
    { id: "dataset", header: "Dataset version", value: (run) => run.datasetVersionNumber, align: "end" },
    { id: "by", header: "By", value: (run) => run.createdBy?.name ?? null },
    {
      id: "duration",
      header: "Duration",
      value: (run) => runDurationSeconds(run),
      cell: (run) => {
        const seconds = runDurationSeconds(run);
        return seconds === null ? <span className="text-ink-500">–</span> : formatDuration(seconds);
      },
      align: "end",
    },
    { id: "draws", header: "Chains × draws", value: (run) => `${run.settings.chains} × ${run.settings.draws}`, sortable: false },
    {
      id: "trust",
      header: "Trust",
      value: (run) => (run.trust.trustworthy === null ? null : run.trust.trustworthy ? "trustworthy" : "not trustworthy"),
      cell: (run) => (run.status === "succeeded" ? <TrustMark state={trustStateOf(run.trust.trustworthy)} publishReason={run.publication?.reason} /> : <span className="text-ink-500">–</span>),
    },
    {
      id: "published",
      header: "Published",
      value: (run) => (run.current ? "current" : run.publication ? "earlier" : null),
      cell: (run) =>
        run.current ? (
          <span className="rounded-sm bg-stream-100 px-1.5 text-caption font-semibold text-stream-800">current fit</span>
        ) : run.publication ? (
          <span className="text-caption text-ink-700">{formatDateTime(run.publication.at)}</span>
        ) : (
          <span className="text-ink-500">–</span>
        ),
    },
  ];
}

export function Runs({ runHref, modelSetupHref }: RunsProps) {
  const runs = useRuns();
  return (
    <>
      <PageHeader
        title="Runs"
        description="Fits of the portfolio model: follow them while they run, and check them before anyone relies on them."
        actions={
          <Link to={modelSetupHref} className="inline-flex rounded-md bg-stream-700 px-3.5 py-2 text-small font-medium text-white hover:bg-stream-800">
            Set up a new fit
          </Link>
        }
      />
      {runs.isPending ? (
        <LoadingState label="Loading runs…" />
      ) : runs.isError ? (
        <ErrorState title="The runs could not be loaded" message={runs.error.message} onRetry={() => void runs.refetch()} />
      ) : runs.data.length === 0 ? (
        <EmptyState title="No runs yet" action={<Link to={modelSetupHref} className="font-semibold text-stream-700 underline">Go to Model setup</Link>}>
          Choose the priors and the model's shape in Model setup, check what the priors imply, then start a fit. It will show up here with live progress.
        </EmptyState>
      ) : (
        <div className="space-y-6">
          {runs.data.filter(isActive).map((run) => (
            <ActiveRun key={run.id} run={run} href={runHref(run.id)} />
          ))}
          <DataTable caption="All runs" rows={runs.data} columns={columns(runHref)} rowKey={(run) => run.id} csvFileName="runs.csv" initialSort={{ id: "createdAt", desc: true }} />
        </div>
      )}
    </>
  );
}

import type { Run } from "@tributary/contracts";
import { Link, useNavigate } from "react-router-dom";
import { TrustMark, trustStateOf } from "../../../components/trust-mark/trust-mark";
import { Button } from "../../../components/ui/button";
import { ErrorState } from "../../../components/ui/error-state";
import { LoadingState } from "../../../components/ui/loading-state";
import { PageHeader } from "../../../components/ui/page-header";
import { ApiError } from "../../../lib/api-client";
import { formatDateTime, formatDuration } from "../../../lib/format";
import { useRun } from "../api/get-run";
import { useRunReport } from "../api/get-run-report";
import { isActive } from "../api/get-runs";
import { useRestartRun } from "../api/restart-run";
import { ActiveRunProgress } from "./active-run";
import { runDurationSeconds, runTitle } from "./run-facts";
import { RunReport } from "./run-report";
import { RunStatusBadge } from "./run-status";

type RunDetailProps = {
  runId: string;
  runsHref: string;
  runHref: (runId: string) => string;
  /** The dataset's outcome column (e.g. new_customers), for chart axes. */
  outcomeName?: string;
};

function Settings({ run }: { run: Run }) {
  const s = run.settings;
  const items: [string, string][] = [
    ["Dataset version", String(run.datasetVersionNumber)],
    ["Chains × (warm-up + draws)", `${s.chains} × (${s.warmup} + ${s.draws})`],
    ["Seed", String(run.seed)],
    ["Carry-over length", `${s.maxLag} weeks`],
    ["Saturation", s.saturation],
    ["Likelihood", s.likelihood],
    ["Seasonality order", String(s.seasonalityOrder)],
    ["Pooling", s.pooling],
    ["Holdout weeks", String(s.holdoutWeeks)],
    ["Unpooled comparison", s.unpooledComparison ? "yes" : "no"],
    ["Channel ranges set", s.cacRanges.length > 0 ? s.cacRanges.map((r) => `${r.channel} ${r.lo}–${r.hi}`).join(", ") : "defaults"],
  ];
  return (
    <details className="rounded-lg border border-line bg-surface px-5 py-3 shadow-card">
      <summary className="cursor-pointer text-small font-semibold text-ink-900">Settings of this run</summary>
      <dl className="mt-3 grid gap-x-6 gap-y-2 text-small md:grid-cols-3">
        {items.map(([label, value]) => (
          <div key={label}>
            <dt className="text-ink-600">{label}</dt>
            <dd className="text-ink-900">{value}</dd>
          </div>
        ))}
      </dl>
    </details>
  );
}

function Stopped({ run, runHref }: { run: Run; runHref: (runId: string) => string }) {
  const restart = useRestartRun();
  const navigate = useNavigate();
  const canRestart = (run.status === "interrupted" || run.status === "failed") && !run.restartedByRunId;
  return (
    <section aria-label="Why the run stopped" className={`rounded-lg border px-5 py-4 ${run.status === "failed" ? "border-alert-700/30 bg-alert-100" : "border-silt-500/40 bg-caution-100"}`}>
      <h2 className="text-body font-semibold text-ink-900">
        {run.status === "failed" ? "This run failed" : run.status === "interrupted" ? "This run was interrupted" : "This run was cancelled"}
      </h2>
      <p className="mt-1 text-small text-ink-800">
        {run.failureReason ?? (run.status === "cancelled" ? "Someone stopped it before it finished; nothing was kept." : "No reason was recorded.")}
      </p>
      {run.restartedByRunId ? (
        <p className="mt-2 text-small">
          <Link to={runHref(run.restartedByRunId)} className="font-medium text-stream-700 underline">
            See the run that restarted it
          </Link>
        </p>
      ) : null}
      {canRestart ? (
        <div className="mt-3 flex flex-wrap items-center gap-3">
          <Button onClick={() => restart.mutate({ runId: run.id }, { onSuccess: (next) => navigate(runHref(next.id)) })} disabled={restart.isPending}>
            {restart.isPending ? "Restarting…" : "Restart with the same settings"}
          </Button>
          {restart.isError ? (
            <p role="alert" className="text-small text-alert-700">
              {restart.error.message}
            </p>
          ) : null}
        </div>
      ) : null}
    </section>
  );
}

function Report({ run, outcomeLabel }: { run: Run; outcomeLabel: string }) {
  const report = useRunReport(run.id, { enabled: run.status === "succeeded" });
  if (report.isPending) return <LoadingState label="Loading the run report…" />;
  if (report.isError) return <ErrorState title="The run report could not be loaded" message={report.error.message} onRetry={() => void report.refetch()} />;
  return <RunReport report={report.data} outcomeLabel={outcomeLabel} />;
}

/** One run: its progress while it runs, why it stopped, or its report once it has finished. */
export function RunDetail({ runId, runsHref, runHref, outcomeName }: RunDetailProps) {
  const query = useRun(runId, { poll: false });
  if (query.isPending) return <LoadingState label="Loading the run…" />;
  if (query.isError) {
    const missing = query.error instanceof ApiError && query.error.status === 404;
    return (
      <>
        <PageHeader eyebrow="Runs" title={missing ? "No such run" : "Run"} />
        <ErrorState title={missing ? "This run does not exist" : "The run could not be loaded"} message={query.error.message} onRetry={missing ? undefined : () => void query.refetch()}>
          <Link to={runsHref} className="mt-2 inline-block text-small font-medium text-stream-700 underline">
            Back to all runs
          </Link>
        </ErrorState>
      </>
    );
  }
  const run = query.data;
  const seconds = runDurationSeconds(run);
  const outcomeLabel = (outcomeName ?? "outcome").replace(/_/g, " ");
  return (
    <>
      <PageHeader
        eyebrow="Runs"
        title={runTitle(run)}
        description={
          <span className="flex flex-wrap items-center gap-3 text-small">
            <RunStatusBadge status={run.status} />
            {run.status === "succeeded" ? <TrustMark state={trustStateOf(run.trust.trustworthy)} publishReason={run.publication?.reason} /> : null}
            {run.current ? <span className="rounded-sm bg-stream-100 px-1.5 text-caption font-semibold text-stream-800">current fit</span> : null}
            <span className="text-ink-700">
              {run.createdBy ? `Started by ${run.createdBy.name} on` : "Started"} {formatDateTime(run.createdAt)}
              {seconds !== null ? ` · ${isActive(run) ? "running for" : "took"} ${formatDuration(seconds)}` : ""}
            </span>
          </span>
        }
        actions={
          <Link to={runsHref} className="text-small font-medium text-stream-700 underline-offset-2 hover:underline">
            All runs
          </Link>
        }
      />
      <div className="space-y-6">
        {run.restartedFromRunId ? (
          <p className="text-small text-ink-700">
            Restart of{" "}
            <Link to={runHref(run.restartedFromRunId)} className="font-medium text-stream-700 underline">
              an earlier run
            </Link>{" "}
            with the same settings.
          </p>
        ) : null}
        {isActive(run) ? (
          <section aria-label="Live progress" className="rounded-lg border border-stream-600/30 bg-surface p-5 shadow-card">
            <ActiveRunProgress run={run} />
          </section>
        ) : null}
        {run.status === "failed" || run.status === "interrupted" || run.status === "cancelled" ? <Stopped run={run} runHref={runHref} /> : null}
        <Settings run={run} />
        {run.status === "succeeded" ? <Report run={run} outcomeLabel={outcomeLabel} /> : null}
      </div>
    </>
  );
}

import type { Run } from "@tributary/contracts";
import { Link } from "react-router-dom";
import { Button } from "../../../components/ui/button";
import { useCancelRun } from "../api/cancel-run";
import { useRun } from "../api/get-run";
import { useRunEvents } from "../api/get-run-events";
import { isActive } from "../api/get-runs";
import { runTitle } from "./run-facts";
import { RunProgress } from "./run-progress";
import { RunStatusBadge } from "./run-status";

/** Live progress of a waiting or running fit, with a way to stop it. */
export function ActiveRunProgress({ run: initial }: { run: Run }) {
  const stream = useRunEvents(initial.id, { enabled: isActive(initial) });
  const query = useRun(initial.id, { poll: stream === "unavailable" || stream === "connecting", placeholder: initial });
  const run = query.data ?? initial;
  const cancel = useCancelRun();
  return (
    <div className="space-y-4">
      {run.progress ? (
        <RunProgress progress={run.progress} stream={stream === "live" ? "live" : "polling"} />
      ) : (
        <p className="text-small text-ink-700">{run.status === "queued" ? "Waiting for a free slot to start." : "Starting…"}</p>
      )}
      {isActive(run) ? (
        <div className="flex flex-wrap items-center gap-3">
          <Button variant="secondary" disabled={cancel.isPending} onClick={() => cancel.mutate({ runId: run.id })}>
            {cancel.isPending ? "Cancelling…" : "Cancel this run"}
          </Button>
          {cancel.isError ? (
            <p role="alert" className="text-small text-alert-700">
              {cancel.error.message}
            </p>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}

export function ActiveRun({ run, href }: { run: Run; href: string }) {
  return (
    <section aria-label={`Active run: ${runTitle(run)}`} className="rounded-lg border border-stream-600/30 bg-surface p-5 shadow-card">
      <div className="mb-4 flex flex-wrap items-center justify-between gap-3">
        <h2 className="flex flex-wrap items-center gap-3 text-body font-semibold text-ink-900">
          <Link to={href} className="text-stream-700 underline-offset-2 hover:underline">
            {runTitle(run)}
          </Link>
          <RunStatusBadge status={run.status} />
        </h2>
        <p className="text-small text-ink-700">
          {run.settings.chains} chains × ({run.settings.warmup} warm-up + {run.settings.draws} draws){run.settings.unpooledComparison ? ", with the unpooled comparison" : ""}
        </p>
      </div>
      <ActiveRunProgress run={run} />
    </section>
  );
}

import { runStatusLabels, type RunStatus } from "@tributary/contracts";

const tones: Record<RunStatus, string> = {
  queued: "bg-ink-100 text-ink-800",
  running: "bg-stream-100 text-stream-800",
  succeeded: "bg-ok-100 text-ok-700",
  failed: "bg-alert-100 text-alert-700",
  cancelled: "bg-ink-100 text-ink-700",
  interrupted: "bg-caution-100 text-caution-700",
};

export function RunStatusBadge({ status }: { status: RunStatus }) {
  return (
    <span className={`inline-flex items-center gap-1.5 rounded-sm px-2 py-0.5 text-caption font-semibold ${tones[status]}`} data-status={status}>
      {status === "running" ? <span className="h-2 w-2 animate-pulse rounded-full bg-stream-600" aria-hidden="true" /> : null}
      {runStatusLabels[status]}
    </span>
  );
}

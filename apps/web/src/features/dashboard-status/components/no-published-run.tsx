import { useQueryClient } from "@tanstack/react-query";
import { useEffect } from "react";
import { EmptyState } from "../../../components/ui/empty-state";
import { dashboardsQueryKey } from "../../../lib/dashboard-query";
import { formatDuration } from "../../../lib/format";
import { useDashboardStatus } from "../api/get-dashboard-status";

/**
 * What a dashboard shows before any run is published: why, and how far the first fit has
 * come. Shows nothing once a run is published (the dashboard then loads again).
 */
export function NoPublishedRun({ screenLabel }: { screenLabel: string }) {
  const status = useDashboardStatus();
  const queryClient = useQueryClient();
  const published = status.data?.current ?? null;
  // Once the first fit is published, the dashboards load again by themselves.
  useEffect(() => {
    if (published) void queryClient.invalidateQueries({ queryKey: dashboardsQueryKey });
  }, [published, queryClient]);

  if (published) return null;
  const firstFit = status.data?.firstFit ?? null;
  return (
    <EmptyState title="No published fit yet">
      <p>
        The {screenLabel} shows the numbers of the current published fit. An analyst publishes a finished run from
        Runs; until then there is nothing to show here.
      </p>
      {firstFit ? (
        <div className="mx-auto mt-4 max-w-md text-left" role="status">
          <p className="text-small font-medium text-ink-900">{firstFit.message}</p>
          <div
            className="mt-2 h-2 rounded-full bg-ink-100"
            role="progressbar"
            aria-label="First fit"
            aria-valuemin={0}
            aria-valuemax={100}
            aria-valuenow={Math.round(firstFit.fraction * 100)}
          >
            <div className="h-2 rounded-full bg-stream-600" style={{ width: `${Math.round(firstFit.fraction * 100)}%` }} />
          </div>
          {firstFit.etaSeconds !== null ? (
            <p className="mt-1 text-caption text-ink-600">About {formatDuration(firstFit.etaSeconds)} to go; this screen fills in when it is published.</p>
          ) : null}
        </div>
      ) : null}
    </EmptyState>
  );
}

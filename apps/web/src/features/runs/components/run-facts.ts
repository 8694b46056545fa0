import type { Run } from "@tributary/contracts";
import { formatDateTime } from "../../../lib/format";

/** How a run is named on screen: when it was started and on which data. */
export function runTitle(run: Pick<Run, "createdAt" | "datasetVersionNumber">): string {
  return `Fit of dataset version ${run.datasetVersionNumber}, ${formatDateTime(run.createdAt)}`;
}

/** Seconds the run has taken (so far, while it runs), or null before it starts. */
export function runDurationSeconds(run: Pick<Run, "startedAt" | "finishedAt" | "progress">, now = Date.now()): number | null {
  if (!run.startedAt) return null;
  const start = Date.parse(run.startedAt);
  if (run.finishedAt) return (Date.parse(run.finishedAt) - start) / 1000;
  if (run.progress) return run.progress.elapsedSeconds;
  return (now - start) / 1000;
}

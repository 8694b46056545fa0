import { runEventSchema, type Run, type RunEvent } from "@tributary/contracts";
import { useQueryClient } from "@tanstack/react-query";
import { useEffect, useState } from "react";
import { runQueryOptions } from "./get-run";
import { runsQueryOptions } from "./get-runs";

/** GET /api/runs/:runId/events: server-sent events with the run and its per-chain progress. */
export function runEventsUrl(runId: string): string {
  return `/api/runs/${encodeURIComponent(runId)}/events`;
}

/** Reads one event's data; a malformed event is dropped rather than breaking the page. */
export function parseRunEvent(data: string): RunEvent | null {
  try {
    const parsed = runEventSchema.safeParse(JSON.parse(data));
    return parsed.success ? parsed.data : null;
  } catch {
    return null;
  }
}

export type RunStream = "connecting" | "live" | "unavailable" | "ended";

/**
 * Follows a run's live events into the query cache (the run, then its progress, then its
 * end). Reports "unavailable" when the stream cannot be held, so the caller polls instead.
 */
export function useRunEvents(runId: string, { enabled }: { enabled: boolean }): RunStream {
  const queryClient = useQueryClient();
  const [stream, setStream] = useState<RunStream>(enabled ? "connecting" : "ended");

  useEffect(() => {
    if (!enabled) {
      setStream("ended");
      return;
    }
    if (typeof EventSource === "undefined") {
      setStream("unavailable");
      return;
    }
    setStream("connecting");
    const source = new EventSource(runEventsUrl(runId), { withCredentials: true });
    const key = runQueryOptions(runId).queryKey;
    let failures = 0;
    const handle = (message: MessageEvent<string>) => {
      const event = parseRunEvent(message.data);
      if (!event) return;
      failures = 0;
      setStream("live");
      if (event.type === "progress") {
        queryClient.setQueryData<Run>(key, (run) => (run ? { ...run, status: run.status === "queued" && event.progress.stage !== "queued" ? "running" : run.status, progress: event.progress } : run));
        return;
      }
      queryClient.setQueryData<Run>(key, event.run);
      if (event.type === "end") {
        source.close();
        setStream("ended");
        void queryClient.invalidateQueries({ queryKey: runsQueryOptions().queryKey });
      }
    };
    source.addEventListener("run", handle);
    source.addEventListener("progress", handle);
    source.addEventListener("end", handle);
    source.onmessage = handle;
    source.onerror = () => {
      failures += 1;
      // EventSource retries by itself; after a few failures in a row, poll instead.
      if (source.readyState === EventSource.CLOSED || failures >= 3) {
        source.close();
        setStream("unavailable");
      }
    };
    return () => source.close();
  }, [enabled, queryClient, runId]);

  return stream;
}

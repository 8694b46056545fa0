import type { DrawSet } from "@tributary/stats";
import { useEffect, useRef, useState } from "react";
import type { PlannerRequest, PlannerResponse } from "./planner-api";
import { createPlannerRunner, type PlannerRunner } from "./planner-runner";

export type PlannerResult = Extract<PlannerResponse, { ok: true }>;

export type PlannerState = {
  status: "idle" | "running" | "done" | "failed";
  result: PlannerResult | null;
  message: string | null;
  /** True while the shown result belongs to an older request. */
  stale: boolean;
};

type Options = {
  /** Wait this long after the last change before computing again. */
  delayMs?: number;
  /** Injected in tests; the app uses the Web Worker. */
  runner?: PlannerRunner;
};

/**
 * Forecasts the current plan and the scenarios in a worker whenever the request changes,
 * after a short pause; answers to older requests are dropped. The draw set is sent to
 * the worker once per key. Pass a null request while the inputs are not valid: the last
 * result stays, marked stale.
 */
export function usePlanner(drawSet: { key: string; set: DrawSet } | null, request: PlannerRequest | null, { delayMs = 200, runner }: Options = {}): PlannerState {
  const [state, setState] = useState<PlannerState>({ status: "idle", result: null, message: null, stale: false });
  const runnerRef = useRef<PlannerRunner | null>(runner ?? null);
  const loaded = useRef<{ key: string; done: Promise<unknown> } | null>(null);
  const latest = useRef(0);
  const requestKey = request ? JSON.stringify(request) : null;

  useEffect(() => {
    return () => {
      if (!runner) runnerRef.current?.dispose();
      runnerRef.current = null;
      loaded.current = null;
    };
  }, [runner]);

  useEffect(() => {
    if (!drawSet || requestKey === null || !request) {
      setState((previous) => ({ ...previous, status: previous.status === "running" ? "idle" : previous.status, stale: previous.result !== null }));
      return;
    }
    const ticket = ++latest.current;
    setState((previous) => ({ ...previous, status: "running", stale: previous.result !== null }));
    const timer = setTimeout(() => {
      if (!runnerRef.current) runnerRef.current = runner ?? createPlannerRunner();
      const active = runnerRef.current;
      if (loaded.current?.key !== drawSet.key) loaded.current = { key: drawSet.key, done: active.load(drawSet.key, drawSet.set) };
      loaded.current.done
        .then(() => active.forecast(drawSet.key, request))
        .then((response) => {
          if (ticket !== latest.current) return;
          setState((previous) =>
            response.ok
              ? { status: "done", result: response, message: null, stale: false }
              : { status: "failed", result: previous.result, message: response.message, stale: previous.result !== null },
          );
        })
        .catch((error: unknown) => {
          if (ticket !== latest.current) return;
          loaded.current = null;
          const message = error instanceof Error ? error.message : "The forecast stopped unexpectedly.";
          setState((previous) => ({ ...previous, status: "failed", message, stale: previous.result !== null }));
        });
    }, delayMs);
    return () => clearTimeout(timer);
    // `requestKey` stands for the request, a new object on every render.
  }, [drawSet, requestKey, delayMs]);

  return state;
}

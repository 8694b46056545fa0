import type { PortfolioData, PriorCheckModelOptions, PriorCheckResult, PriorCheckSettings } from "@tributary/stats";
import { useEffect, useRef, useState } from "react";
import { createPriorCheckRunner, type PriorCheckRunner } from "./prior-check-runner";

export type PriorCheckState = {
  status: "idle" | "running" | "done" | "failed";
  result: PriorCheckResult | null;
  message: string | null;
  /** Time the last check took inside the worker, in ms. */
  elapsedMs: number | null;
  /** True while the shown result belongs to older settings. */
  stale: boolean;
};

type Options = {
  /** Wait this long after the last change before checking again. */
  delayMs?: number;
  /** Injected in tests; the app uses the Web Worker. */
  runner?: PriorCheckRunner;
};

/**
 * Re-runs the prior check (in a worker) whenever the data or the settings change, after a
 * short pause; answers to older settings are dropped. Pass null options while the form
 * is invalid: the last result stays, marked stale.
 */
export function usePriorCheck(
  data: PortfolioData | null,
  options: PriorCheckModelOptions | null,
  settings: PriorCheckSettings,
  { delayMs = 250, runner }: Options = {},
): PriorCheckState {
  const [state, setState] = useState<PriorCheckState>({ status: "idle", result: null, message: null, elapsedMs: null, stale: false });
  const runnerRef = useRef<PriorCheckRunner | null>(runner ?? null);
  const latest = useRef(0);
  const key = options ? JSON.stringify([options, settings]) : null;

  useEffect(() => {
    return () => {
      if (!runner) runnerRef.current?.dispose();
      runnerRef.current = null;
    };
  }, [runner]);

  useEffect(() => {
    if (!data || key === null || !options) {
      setState((previous) => ({ ...previous, stale: previous.result !== null }));
      return;
    }
    const request = { data, options, settings };
    const ticket = ++latest.current;
    setState((previous) => ({ ...previous, status: "running", stale: previous.result !== null }));
    const timer = setTimeout(() => {
      if (!runnerRef.current) runnerRef.current = runner ?? createPriorCheckRunner();
      runnerRef.current
        .run(request)
        .then((response) => {
          if (ticket !== latest.current) return;
          setState((previous) =>
            response.ok
              ? { status: "done", result: response.result, message: null, elapsedMs: response.elapsedMs, stale: false }
              : { status: "failed", result: previous.result, message: response.message, elapsedMs: response.elapsedMs, stale: previous.result !== null },
          );
        })
        .catch((error: unknown) => {
          if (ticket !== latest.current) return;
          const message = error instanceof Error ? error.message : "The prior check stopped unexpectedly.";
          setState((previous) => ({ ...previous, status: "failed", message, stale: previous.result !== null }));
        });
    }, delayMs);
    return () => clearTimeout(timer);
    // `key` stands for options and settings, which are new objects on every render.
  }, [data, key, delayMs]);

  return state;
}

import { wrap, type Remote } from "comlink";
import type { PriorCheckApi, PriorCheckRequest, PriorCheckResponse } from "./prior-check-api";

/** Something that answers prior-check requests: the worker, or (where there is no Worker) the same code inline. */
export type PriorCheckRunner = {
  run: (request: PriorCheckRequest) => Promise<PriorCheckResponse>;
  dispose: () => void;
};

/** A runner on a module Web Worker; falls back to running inline where workers are not available. */
export function createPriorCheckRunner(): PriorCheckRunner {
  if (typeof Worker === "undefined") return inlinePriorCheckRunner();
  const worker = new Worker(new URL("./prior-check.worker.ts", import.meta.url), { type: "module" });
  const remote: Remote<PriorCheckApi> = wrap<PriorCheckApi>(worker);
  return {
    run: (request) => remote.run(request),
    dispose: () => worker.terminate(),
  };
}

/** Runs the check on the calling thread; the stats code is loaded only when first needed. */
export function inlinePriorCheckRunner(): PriorCheckRunner {
  return {
    run: async (request) => (await import("./prior-check-api")).priorCheckApi.run(request),
    dispose: () => undefined,
  };
}

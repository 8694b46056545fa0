import { wrap, type Remote } from "comlink";
import { priorCheckApi, type PriorCheckApi, type PriorCheckRequest, type PriorCheckResponse } from "./prior-check-api";

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

export function inlinePriorCheckRunner(): PriorCheckRunner {
  return { run: async (request) => priorCheckApi.run(request), dispose: () => undefined };
}

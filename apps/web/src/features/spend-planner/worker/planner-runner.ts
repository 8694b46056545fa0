import type { DrawSet } from "@tributary/stats";
import { wrap, type Remote } from "comlink";
import type { PlannerApi, PlannerRequest, PlannerResponse } from "./planner-api";

/** Something that answers planner requests: the worker, or (where there is no Worker) the same code inline. */
export type PlannerRunner = {
  load: (key: string, set: DrawSet) => Promise<unknown>;
  forecast: (key: string, request: PlannerRequest) => Promise<PlannerResponse>;
  dispose: () => void;
};

/** A runner on a module Web Worker; falls back to running inline where workers are not available. */
export function createPlannerRunner(): PlannerRunner {
  if (typeof Worker === "undefined") return inlinePlannerRunner();
  const worker = new Worker(new URL("./planner.worker.ts", import.meta.url), { type: "module" });
  const remote: Remote<PlannerApi> = wrap<PlannerApi>(worker);
  return {
    load: (key, set) => remote.load(key, set),
    forecast: (key, request) => remote.forecast(key, request),
    dispose: () => worker.terminate(),
  };
}

/** Runs on the calling thread; the stats code is loaded only when first needed. */
export function inlinePlannerRunner(): PlannerRunner {
  let api: PlannerApi | null = null;
  const get = async () => (api ??= (await import("./planner-api")).createPlannerApi());
  return {
    load: async (key, set) => (await get()).load(key, set),
    forecast: async (key, request) => (await get()).forecast(key, request),
    dispose: () => undefined,
  };
}

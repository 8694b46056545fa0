import type { BudgetSplitInput, DrawSet } from "@tributary/stats";
import { wrap, type Remote } from "comlink";
import type { SplitApi, SplitResponse } from "./split-api";

/** Something that answers split requests: the worker, or (where there is no Worker) the same code inline. */
export type SplitRunner = {
  load: (key: string, set: DrawSet) => Promise<unknown>;
  split: (key: string, input: BudgetSplitInput) => Promise<SplitResponse>;
  dispose: () => void;
};

/** A runner on a module Web Worker; falls back to running inline where workers are not available. */
export function createSplitRunner(): SplitRunner {
  if (typeof Worker === "undefined") return inlineSplitRunner();
  const worker = new Worker(new URL("./split.worker.ts", import.meta.url), { type: "module" });
  const remote: Remote<SplitApi> = wrap<SplitApi>(worker);
  return {
    load: (key, set) => remote.load(key, set),
    split: (key, input) => remote.split(key, input),
    dispose: () => worker.terminate(),
  };
}

/** Runs on the calling thread; the stats code is loaded only when first needed. */
export function inlineSplitRunner(): SplitRunner {
  let api: SplitApi | null = null;
  const get = async () => (api ??= (await import("./split-api")).createSplitApi());
  return {
    load: async (key, set) => (await get()).load(key, set),
    split: async (key, input) => (await get()).split(key, input),
    dispose: () => undefined,
  };
}

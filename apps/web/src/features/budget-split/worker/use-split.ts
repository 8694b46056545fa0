import type { BudgetSplitInput, DrawSet } from "@tributary/stats";
import { useMutation } from "@tanstack/react-query";
import { useEffect, useRef } from "react";
import type { SplitResponse } from "./split-api";
import { createSplitRunner, type SplitRunner } from "./split-runner";

export type SplitSuccess = Extract<SplitResponse, { ok: true }>;

export type SplitRequest = { key: string; set: DrawSet; input: BudgetSplitInput };

/**
 * Splits the budget in a worker (created on first use, ended with the screen). The draw
 * set goes to the worker once per key; a refused input fails the mutation with the
 * stats package's message.
 */
export function useSplitWorker(runner?: SplitRunner) {
  const runnerRef = useRef<SplitRunner | null>(runner ?? null);
  const loaded = useRef<{ key: string; done: Promise<unknown> } | null>(null);
  useEffect(() => {
    return () => {
      if (!runner) runnerRef.current?.dispose();
      runnerRef.current = null;
      loaded.current = null;
    };
  }, [runner]);
  return useMutation({
    mutationFn: async ({ key, set, input }: SplitRequest): Promise<SplitSuccess> => {
      if (!runnerRef.current) runnerRef.current = runner ?? createSplitRunner();
      const active = runnerRef.current;
      if (loaded.current?.key !== key) loaded.current = { key, done: active.load(key, set) };
      try {
        await loaded.current.done;
      } catch (error) {
        loaded.current = null;
        throw error;
      }
      const response = await active.split(key, input);
      if (!response.ok) throw new Error(response.message);
      return response;
    },
  });
}

// What the budget-split worker exposes through comlink. Kept apart from the worker entry
// so it can be called and tested directly, without a Worker.
import { budgetSplit, type BudgetSplitInput, type BudgetSplitResult, type DrawSet } from "@tributary/stats";
import type { OutcomeDistribution } from "@tributary/stats";

/** An outcome distribution without its per-draw values (the histogram and summary are what is shown). */
export type OutcomeSummary = Omit<OutcomeDistribution, "draws">;

export type SplitResult = Omit<BudgetSplitResult, "outcome"> & {
  outcome: { allocation: OutcomeSummary; current: OutcomeSummary };
};

export type SplitResponse = { ok: true; result: SplitResult; drawCount: number; elapsedMs: number } | { ok: false; message: string; elapsedMs: number };

const now = () => (typeof performance !== "undefined" ? performance.now() : Date.now());

function withoutDraws({ draws: _draws, ...rest }: OutcomeDistribution): OutcomeSummary {
  return rest;
}

/** The budget split over one run's draw set: load it once, split as often as the inputs change. */
export function createSplitApi() {
  const sets = new Map<string, DrawSet>();
  return {
    /** Keeps one draw set under a key (e.g. run id and cells), replacing any other. */
    load(key: string, set: DrawSet): { cells: number; channels: string[]; drawCount: number } {
      sets.clear();
      sets.set(key, set);
      return { cells: set.cells.length, channels: [...set.channels], drawCount: set.drawCount };
    },
    /** Splits the budget; a problem with the inputs comes back as a message, never as a thrown error. */
    split(key: string, input: BudgetSplitInput): SplitResponse {
      const start = now();
      const set = sets.get(key);
      if (!set) return { ok: false, message: "The draw set of the current fit is not loaded yet.", elapsedMs: now() - start };
      try {
        const { outcome, ...rest } = budgetSplit(set, input);
        return {
          ok: true,
          result: { ...rest, outcome: { allocation: withoutDraws(outcome.allocation), current: withoutDraws(outcome.current) } },
          drawCount: set.drawCount,
          elapsedMs: now() - start,
        };
      } catch (error) {
        return { ok: false, message: error instanceof Error ? error.message : String(error), elapsedMs: now() - start };
      }
    },
  };
}

export type SplitApi = ReturnType<typeof createSplitApi>;

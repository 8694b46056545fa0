// What the spend-planner worker exposes through comlink. Kept apart from the worker entry
// so it can be called and tested directly, without a Worker.
import {
  applyScenario,
  comparePlans,
  currentPlan,
  forecastPlan,
  planIndex,
  type CellRef,
  type CostPerExtraCustomer,
  type DrawSet,
  type DrawSummary,
  type PlanForecast,
  type ScenarioOperation,
  type SpendPlan,
} from "@tributary/stats";

/** A change to the current plan's weekly spend of one line (cell × channel), every plan week. */
export type CurrentPlanEdit = { brand: string; market: string; channel: string; weekly: number };

export type PlannerScenario = { id: string; name: string; operations: ScenarioOperation[] };

export type PlannerRequest = {
  cells: CellRef[];
  horizon: number;
  recentWeeks: number;
  /** Edits to the current plan; the edited plan is what scenarios start from and are compared with. */
  currentEdits: CurrentPlanEdit[];
  scenarios: PlannerScenario[];
  /** Seed of the predictive noise, shared by every plan so that their differences are free of it. */
  seed?: number;
};

export type PlanLine = { brand: string; market: string; channel: string; weekly: number[]; total: number };

export type PlanWeekSummary = { planWeek: number; spend: number; outcome: DrawSummary };

export type CellForecastSummary = {
  brand: string;
  market: string;
  /** ISO Monday of the cell's first plan week. */
  firstWeek: string;
  weeks: (PlanWeekSummary & { week: string })[];
  total: DrawSummary;
  totalSpend: number;
};

/** A plan and its forecast, without the per-draw arrays (small enough to post back). */
export type PlanSummary = {
  lines: PlanLine[];
  cells: CellForecastSummary[];
  selection: { weeks: PlanWeekSummary[]; total: DrawSummary; totalSpend: number };
  note: string;
};

export type DifferenceSummary = {
  extraCustomers: DrawSummary;
  extraSpend: number;
  costPerExtraCustomer: CostPerExtraCustomer;
};

export type ScenarioResult =
  | {
      id: string;
      name: string;
      ok: true;
      plan: PlanSummary;
      selection: DifferenceSummary;
      cells: (DifferenceSummary & { brand: string; market: string })[];
    }
  | { id: string; name: string; ok: false; message: string };

export type PlannerResponse =
  | {
      ok: true;
      /** The current plan with edits; `recentAverages` are its lines' weekly spend before the edits, in line order. */
      current: PlanSummary & { weeksAveraged: number[]; recentAverages: number[] };
      scenarios: ScenarioResult[];
      drawCount: number;
      elapsedMs: number;
    }
  | { ok: false; message: string; elapsedMs: number };

const now = () => (typeof performance !== "undefined" ? performance.now() : Date.now());

function linesOf(plan: SpendPlan): PlanLine[] {
  const lines: PlanLine[] = [];
  plan.cells.forEach((cell, i) => {
    plan.channels.forEach((channel, c) => {
      const weekly = Array.from({ length: plan.horizon }, (_, h) => plan.spend[planIndex(plan, i, c, h)]!);
      lines.push({ brand: cell.brand, market: cell.market, channel, weekly, total: weekly.reduce((a, b) => a + b, 0) });
    });
  });
  return lines;
}

function summarise(plan: SpendPlan, forecast: PlanForecast): PlanSummary {
  return {
    lines: linesOf(plan),
    cells: forecast.cells.map((cell, i) => ({
      brand: cell.brand,
      market: cell.market,
      firstWeek: plan.cells[i]!.firstWeek,
      weeks: cell.weeks.map(({ planWeek, week, spend, outcome }) => ({ planWeek, week, spend, outcome })),
      total: cell.total,
      totalSpend: cell.totalSpend,
    })),
    selection: { weeks: forecast.selection.weeks.map((w) => ({ ...w })), total: forecast.selection.total, totalSpend: forecast.selection.totalSpend },
    note: forecast.note,
  };
}

const messageOf = (error: unknown) => (error instanceof Error ? error.message : String(error));

/** The current plan with the user's edits, as "set" operations on single lines. */
function editedCurrentPlan(set: DrawSet, request: PlannerRequest) {
  const base = currentPlan(set, { cells: request.cells, horizon: request.horizon, recentWeeks: request.recentWeeks });
  const edits: ScenarioOperation[] = request.currentEdits.map((edit) => ({
    kind: "set",
    target: { cells: [{ brand: edit.brand, market: edit.market }], channels: [edit.channel] },
    weekly: edit.weekly,
  }));
  try {
    const recentAverages = linesOf(base).map((line) => line.weekly[0] ?? 0);
    return { plan: edits.length === 0 ? base : applyScenario(base, edits), weeksAveraged: [...base.weeksAveraged], recentAverages };
  } catch (error) {
    throw new Error(`The current plan cannot take that edit: ${messageOf(error).replace(/^operation \d+ \(set\)(: )?/, "")}`);
  }
}

/**
 * The planner's computations over one run's draw set: load it once, then forecast the
 * current plan and compare scenarios with it as often as the user changes them.
 */
export function createPlannerApi() {
  const sets = new Map<string, DrawSet>();
  return {
    /** Keeps a draw set under a key (e.g. run id and cells); a later load under the same key replaces it. */
    load(key: string, set: DrawSet): { cells: number; channels: string[]; drawCount: number } {
      sets.clear();
      sets.set(key, set);
      return { cells: set.cells.length, channels: [...set.channels], drawCount: set.drawCount };
    },
    /**
     * The current plan (with edits) and each scenario against it. A problem with the
     * request comes back as a message; a problem with one scenario is reported on that
     * scenario alone.
     */
    forecast(key: string, request: PlannerRequest): PlannerResponse {
      const start = now();
      const set = sets.get(key);
      if (!set) return { ok: false, message: "The draw set of the current fit is not loaded yet.", elapsedMs: now() - start };
      try {
        const seed = request.seed ?? 1;
        const { plan: reference, weeksAveraged, recentAverages } = editedCurrentPlan(set, request);
        const referenceForecast = forecastPlan(set, reference, { seed });
        const scenarios = request.scenarios.map((scenario): ScenarioResult => {
          try {
            if (scenario.operations.length === 0) throw new RangeError("add at least one change to the current plan");
            const plan = applyScenario(reference, scenario.operations);
            const comparison = comparePlans(set, reference, plan, { seed });
            const difference = (d: { extraCustomers: DrawSummary; extraSpend: number; costPerExtraCustomer: CostPerExtraCustomer }): DifferenceSummary => ({
              extraCustomers: d.extraCustomers,
              extraSpend: d.extraSpend,
              costPerExtraCustomer: d.costPerExtraCustomer,
            });
            return {
              id: scenario.id,
              name: scenario.name,
              ok: true,
              plan: summarise(plan, comparison.scenario),
              selection: difference(comparison.selection),
              cells: comparison.cells.map((cell) => ({ brand: cell.brand, market: cell.market, ...difference(cell) })),
            };
          } catch (error) {
            return { id: scenario.id, name: scenario.name, ok: false, message: messageOf(error) };
          }
        });
        return {
          ok: true,
          current: { ...summarise(reference, referenceForecast), weeksAveraged, recentAverages },
          scenarios,
          drawCount: set.drawCount,
          elapsedMs: now() - start,
        };
      } catch (error) {
        return { ok: false, message: messageOf(error), elapsedMs: now() - start };
      }
    },
  };
}

export type PlannerApi = ReturnType<typeof createPlannerApi>;

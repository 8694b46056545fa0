import type { DrawSet } from "../decisions/draw-set";
import {
  checkHorizon,
  cellLabel,
  DEFAULT_PLAN_HORIZON,
  DEFAULT_RECENT_WEEKS,
  planCellsOf,
  resolveCells,
  type CellRef,
  type PlanCell,
} from "./plan-cells";

/**
 * A weekly spend plan for chosen cells over the weeks after their data: spend per cell ×
 * channel × plan week at (i·C + c)·horizon + h, for plan cell i, channel c of the run's
 * channel list, plan week h (0 = the week after the cell's last data week).
 */
export interface SpendPlan {
  readonly horizon: number;
  readonly channels: readonly string[];
  readonly cells: readonly PlanCell[];
  readonly spend: Float64Array;
}

/** The current plan: also says how many recent weeks each cell's average was taken over. */
export interface CurrentPlan extends SpendPlan {
  /** Per plan cell: weeks averaged (the requested window, or all the cell's weeks when it is shorter). */
  readonly weeksAveraged: readonly number[];
}

export interface CurrentPlanOptions {
  /** Cells to plan (default: every cell of the run). */
  readonly cells?: readonly CellRef[];
  /** Weeks to plan (default 13). */
  readonly horizon?: number;
  /** Recent data weeks averaged for the current weekly spend (default 13). */
  readonly recentWeeks?: number;
}

/** Position of plan cell i, channel c, plan week h in `plan.spend`. */
export function planIndex(plan: Pick<SpendPlan, "channels" | "horizon">, i: number, c: number, h: number): number {
  return (i * plan.channels.length + c) * plan.horizon + h;
}

/**
 * The "current plan": each cell × channel keeps spending its average weekly spend of the
 * last `recentWeeks` data weeks (all data weeks, holdout included), every plan week.
 */
export function currentPlan(set: DrawSet, options: CurrentPlanOptions = {}): CurrentPlan {
  const horizon = options.horizon ?? DEFAULT_PLAN_HORIZON;
  const recent = options.recentWeeks ?? DEFAULT_RECENT_WEEKS;
  checkHorizon(horizon);
  if (!Number.isInteger(recent) || recent < 1) throw new RangeError(`the current plan averages a whole number of recent weeks (1 or more), got ${recent}`);
  const indices = resolveCells(set, options.cells);
  const C = set.channels.length;
  const spend = new Float64Array(indices.length * C * horizon);
  const weeksAveraged = indices.map((g, i) => {
    const cell = set.cells[g]!;
    const T = cell.weeks;
    const n = Math.min(recent, T);
    for (let c = 0; c < C; c++) {
      const series = cell.spend[c]!;
      let sum = 0;
      for (let t = T - n; t < T; t++) sum += series[t]!;
      spend.fill(sum / n, (i * C + c) * horizon, (i * C + c + 1) * horizon);
    }
    return n;
  });
  return { horizon, channels: [...set.channels], cells: planCellsOf(set, indices), spend, weeksAveraged };
}

/** A plan from plain numbers (e.g. a saved plan), checked against the run. `spend` is laid out as in SpendPlan. */
export function spendPlanFrom(set: DrawSet, input: { readonly cells: readonly CellRef[]; readonly horizon: number; readonly spend: ArrayLike<number> }): SpendPlan {
  checkHorizon(input.horizon);
  const indices = resolveCells(set, input.cells);
  const plan: SpendPlan = { horizon: input.horizon, channels: [...set.channels], cells: planCellsOf(set, indices), spend: Float64Array.from(input.spend) };
  validateSpendPlan(set, plan);
  return plan;
}

/** Checks a plan against the run it will be forecast with, or throws a clear error. */
export function validateSpendPlan(set: DrawSet, plan: SpendPlan): void {
  checkHorizon(plan.horizon);
  const C = set.channels.length;
  if (plan.channels.length !== C || plan.channels.some((ch, c) => ch !== set.channels[c])) {
    throw new RangeError(`the plan's channels (${plan.channels.join(", ")}) are not the run's channels (${set.channels.join(", ")})`);
  }
  if (plan.cells.length === 0) throw new RangeError("the plan has no cells");
  const seen = new Set<number>();
  for (const cell of plan.cells) {
    const run = set.cells[cell.cellIndex];
    if (!Number.isInteger(cell.cellIndex) || run === undefined || run.brand !== cell.brand || run.market !== cell.market) {
      throw new RangeError(`the plan's cell ${cellLabel(cell)} is not cell ${cell.cellIndex} of this run`);
    }
    if (seen.has(cell.cellIndex)) throw new RangeError(`the plan has cell ${cellLabel(cell)} twice`);
    seen.add(cell.cellIndex);
  }
  const expected = plan.cells.length * C * plan.horizon;
  if (plan.spend.length !== expected) {
    throw new RangeError(`the plan needs ${expected} weekly spend values (${plan.cells.length} cells × ${C} channels × ${plan.horizon} weeks), got ${plan.spend.length}`);
  }
  for (let i = 0; i < plan.cells.length; i++) {
    for (let c = 0; c < C; c++) {
      for (let h = 0; h < plan.horizon; h++) {
        const x = plan.spend[planIndex(plan, i, c, h)]!;
        if (!(Number.isFinite(x) && x >= 0)) {
          throw new RangeError(`planned spend must be a number ≥ 0; ${cellLabel(plan.cells[i]!)}, ${plan.channels[c]}, plan week ${h + 1} is ${x}`);
        }
      }
    }
  }
}

/** Total planned spend per plan cell (summed over channels and weeks). */
export function planSpendByCell(plan: SpendPlan): Float64Array {
  const out = new Float64Array(plan.cells.length);
  const block = plan.channels.length * plan.horizon;
  for (let i = 0; i < plan.cells.length; i++) {
    let sum = 0;
    for (let k = i * block; k < (i + 1) * block; k++) sum += plan.spend[k]!;
    out[i] = sum;
  }
  return out;
}

import { mondayOfAbsoluteWeek } from "../model/absolute-week";
import type { RandomSource } from "../rng/random-source";
import { checkCellChannel, type DrawSet } from "./draw-set";
import { summariseDraws, type DrawSummary } from "./draw-summary";
import { predictCell, weekColumn } from "./predictive";

export interface ForecastWeek {
  /** ISO Monday of the week. */
  readonly week: string;
  /** Predicted outcome with posterior predictive noise (50 % and 90 % intervals in the summary). */
  readonly outcome: DrawSummary;
  readonly baseline: DrawSummary;
  /** Per channel, in the run's channel order. */
  readonly contribution: readonly DrawSummary[];
}

export interface SpendPlanForecast {
  readonly brand: string;
  readonly market: string;
  readonly weeks: readonly ForecastWeek[];
  /** Total outcome over the plan's weeks. */
  readonly total: DrawSummary;
  readonly note: string;
}

/**
 * Forecast of a cell for a weekly spend plan starting the week after its last data week:
 * the baseline continued with its trend and seasonality (controls at their mean), plus
 * each channel's contribution under the plan, carrying over spend from recent weeks, plus
 * posterior predictive noise. `plan[c][h]` is the spend on channel c in plan week h.
 */
export function forecastSpendPlan(set: DrawSet, g: number, plan: readonly (readonly number[])[], rng: RandomSource): SpendPlanForecast {
  checkCellChannel(set, g, 0);
  const C = set.channels.length;
  if (plan.length !== C) throw new RangeError(`the plan needs one spend row per channel (${C}), got ${plan.length}`);
  const horizon = plan[0]!.length;
  if (horizon < 1) throw new RangeError("the plan needs at least one week");
  plan.forEach((row, c) => {
    if (row.length !== horizon) throw new RangeError(`every channel's plan must have ${horizon} weeks; ${set.channels[c]} has ${row.length}`);
    for (const x of row) if (!(Number.isFinite(x) && x >= 0)) throw new RangeError(`planned spend on ${set.channels[c]} must be ≥ 0, got ${x}`);
  });
  const cell = set.cells[g]!;
  const T = cell.weeks;
  const spend = cell.spend.map((history, c) => {
    const s = new Float64Array(T + horizon);
    s.set(history);
    for (let h = 0; h < horizon; h++) s[T + h] = plan[c]![h]!;
    return s;
  });
  const p = predictCell(set, g, spend, T, horizon, rng);
  const D = set.drawCount;
  const weeks: ForecastWeek[] = [];
  const total = new Float64Array(D);
  for (let h = 0; h < horizon; h++) {
    const outcome = weekColumn(p.replicated, D, horizon, h);
    for (let d = 0; d < D; d++) total[d] = total[d]! + outcome[d]!;
    weeks.push({
      week: mondayOfAbsoluteWeek(cell.firstAbsoluteWeek + T + h),
      outcome: summariseDraws(outcome),
      baseline: summariseDraws(weekColumn(p.baseline, D, horizon, h)),
      contribution: p.contribution.map((m) => summariseDraws(weekColumn(m, D, horizon, h))),
    });
  }
  return {
    brand: cell.brand,
    market: cell.market,
    weeks,
    total: summariseDraws(total),
    note: "Model-based forecast; confirm the effect of a budget change with a controlled experiment (a lift test) before relying on it.",
  };
}

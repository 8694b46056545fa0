// CSV exports of a plan's tables (allocation, week-by-week forecast), written with
// papaparse. Text cells that a spreadsheet would run as a formula (starting with = + - @
// tab or carriage return) are prefixed with a quote; numbers are written as numbers.
import Papa from "papaparse";
import { modelCaution } from "@tributary/contracts";
import { planIndex, type DrawSet } from "@tributary/stats";
import { forecastOf, scenarioPlans, splitSpendPlan } from "./plan-computations";
import type { PlanBody } from "./plan-records";

type Cell = string | number | null;

/** A table as CSV, formula-like text neutralised, the model caution as the last line. */
export function toCsv(fields: readonly string[], rows: readonly (readonly Cell[])[]): string {
  const table = Papa.unparse({ fields: [...fields], data: rows.map((row) => [...row]) }, { escapeFormulae: true, newline: "\r\n" });
  const caution = Papa.unparse([["Note", modelCaution]], { escapeFormulae: true, newline: "\r\n" });
  return `${table}\r\n\r\n${caution}\r\n`;
}

const round = (x: number, digits = 2) => Math.round(x * 10 ** digits) / 10 ** digits;

/**
 * Allocation per cell × channel over the horizon. `set` holds the plan's cells in the plan's
 * order. Like brand and market, the channel is written by its display name: the file is read, not re-imported.
 */
export function allocationCsv(kind: "scenario" | "budget_split", body: PlanBody, set: DrawSet, channelName: (code: string) => string): string {
  if (kind === "budget_split") {
    const split = body.budgetSplit!;
    return toCsv(
      ["brand", "market", "channel", "allocation", "weekly_allocation", "current", "lower_bound", "upper_bound", "marginal_cac", "expected_customers", "beyond_observed_spend"],
      split.result.lines.map((line) => [
        line.brand,
        line.market,
        channelName(line.channel),
        round(line.allocation),
        round(line.weeklyAllocation),
        round(line.current),
        round(line.lower),
        line.upper === null ? null : round(line.upper),
        line.marginalCac === null ? null : round(line.marginalCac),
        round(line.expectedCustomers),
        line.beyondObservedSpend ? "yes" : "no",
      ]),
    );
  }
  const scenario = body.scenario!;
  const { reference, scenario: plan } = scenarioPlans(set, scenario);
  const rows: Cell[][] = [];
  plan.cells.forEach((cell, i) => {
    plan.channels.forEach((channel, c) => {
      let now = 0;
      let then = 0;
      for (let h = 0; h < plan.horizon; h++) {
        now += reference.spend[planIndex(reference, i, c, h)]!;
        then += plan.spend[planIndex(plan, i, c, h)]!;
      }
      rows.push([cell.brand, cell.market, channelName(channel), round(now), round(then), round(then - now)]);
    });
  });
  return toCsv(["brand", "market", "channel", "current_plan_spend", "scenario_spend", "change"], rows);
}

/** Week-by-week forecast of the plan (the scenario, or the split's allocation as constant weekly spend). */
export function forecastCsv(kind: "scenario" | "budget_split", body: PlanBody, set: DrawSet): string {
  const plan = kind === "scenario" ? scenarioPlans(set, body.scenario!).scenario : splitSpendPlan(set, body.cellIds, body.budgetSplit!.result);
  const seed = kind === "scenario" ? body.scenario!.seed : 1;
  const forecast = forecastOf(set, plan, seed);
  const rows: Cell[][] = forecast.cells.flatMap((cell) =>
    cell.weeks.map((week) => [
      cell.brand,
      cell.market,
      week.week,
      week.planWeek + 1,
      round(week.spend),
      round(week.outcome.mean),
      round(week.outcome.q05),
      round(week.outcome.q50),
      round(week.outcome.q95),
      round(week.media.q50),
    ]),
  );
  return toCsv(["brand", "market", "week", "plan_week", "spend", "outcome_mean", "outcome_q05", "outcome_q50", "outcome_q95", "media_contribution_q50"], rows);
}

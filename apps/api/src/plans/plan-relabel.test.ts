// Relabelling a saved plan's brand and market names: every place a body names them, each
// name mapped once (so two names can swap), numbers untouched, and null when nothing changes.
import { describe, expect, it } from "vitest";
import type { PlanBody } from "./plan-records";
import { relabelPlanBody } from "./plan-relabel";

const summary = { mean: 1, sd: 0, q05: 1, q25: 1, q50: 1, q75: 1, q95: 1 };
const line = (brand: string, market: string, channel: string) => ({
  cellId: `${brand}|${market}`,
  brand,
  market,
  channel,
  allocation: 10,
  weeklyAllocation: 1,
  current: 9,
  lower: 0,
  upper: null,
  activeBound: null,
  marginalCac: 12,
  expectedCustomers: 3,
  beyondObservedSpend: false,
});

function scenarioBody(): PlanBody {
  return {
    version: 1,
    note: "Larkholm first",
    cellIds: ["c1", "c2"],
    submitted: null,
    scenario: {
      horizon: 4,
      recentWeeks: 4,
      seed: 1,
      operations: [
        { kind: "scale", target: { brands: ["Larkholm", "Ombrey"], channels: ["search"] }, factor: 1.1 },
        { kind: "add", target: { markets: ["Dunmere"], cells: [{ brand: "Ombrey", market: "Dunmere" }] }, amountPerWeek: 5 },
        { kind: "zero" },
      ],
      headline: {
        horizon: 4,
        currentSpend: 1,
        scenarioSpend: 2,
        extraSpend: 1,
        currentOutcome: summary,
        scenarioOutcome: summary,
        extraCustomers: summary,
        costPerExtraCustomer: { kind: "undefined", text: "", interval: null },
        cells: [
          { cellId: "c1", brand: "Larkholm", market: "Dunmere", currentSpend: 1, scenarioSpend: 2, currentOutcome: summary, scenarioOutcome: summary, extraCustomers: summary },
          { cellId: "c2", brand: "Ombrey", market: "Pellan", currentSpend: 1, scenarioSpend: 2, currentOutcome: summary, scenarioOutcome: summary, extraCustomers: summary },
        ],
        drawCount: 10,
        computedAt: "2025-03-03T00:00:00.000Z",
      },
    },
  };
}

function splitBody(): PlanBody {
  return {
    version: 1,
    note: null,
    cellIds: ["c1", "c2"],
    submitted: null,
    budgetSplit: {
      totalBudget: 20,
      horizon: 4,
      recentWeeks: 4,
      bounds: [{ target: { brands: ["Larkholm"] }, lower: 5 }, { upper: 15 }],
      objective: { kind: "profit", customerValue: { Larkholm: 80, Ombrey: 60 } },
      risk: { kind: "expected" },
      result: {
        objective: "profit",
        horizon: 4,
        totalBudget: 20,
        allocatedTotal: 20,
        currentTotal: 18,
        budgetBinding: true,
        exact: true,
        method: "greedy",
        lines: [line("Larkholm", "Dunmere", "search"), line("Ombrey", "Pellan", "search")],
        outcome: { allocation: { mean: 1, sd: 0, q05: 1, q50: 1, q95: 1, histogram: { edges: [0, 1], counts: [1] } }, current: { mean: 1, sd: 0, q05: 1, q50: 1, q95: 1, histogram: { edges: [0, 1], counts: [1] } } },
        customers: { allocation: summary, current: summary, difference: summary },
        profit: null,
        riskCriterion: null,
        notes: ["Larkholm in Dunmere is at its lower bound"],
        drawCount: 10,
        computedAt: "2025-03-03T00:00:00.000Z",
      },
    },
  };
}

describe("relabelPlanBody", () => {
  it("renames brands in a scenario's targets and headline, and swaps two names in one change", () => {
    const body = scenarioBody();
    const swapped = relabelPlanBody(body, { brands: new Map([["Larkholm", "Ombrey"], ["Ombrey", "Larkholm"]]), markets: new Map() })!;
    expect(swapped.scenario!.operations[0]).toEqual({ kind: "scale", target: { brands: ["Ombrey", "Larkholm"], channels: ["search"] }, factor: 1.1 });
    expect(swapped.scenario!.operations[1]).toEqual({ kind: "add", target: { markets: ["Dunmere"], cells: [{ brand: "Larkholm", market: "Dunmere" }] }, amountPerWeek: 5 });
    expect(swapped.scenario!.operations[2]).toEqual({ kind: "zero" });
    expect(swapped.scenario!.headline.cells.map((c) => c.brand)).toEqual(["Ombrey", "Larkholm"]);
    // Only names: the numbers, the note and the original body are as they were.
    expect(swapped.scenario!.headline.extraSpend).toBe(1);
    expect(swapped.note).toBe("Larkholm first");
    expect(body).toEqual(scenarioBody());
  });

  it("renames a market in targets, cells and result lines", () => {
    const renamed = relabelPlanBody(scenarioBody(), { brands: new Map(), markets: new Map([["Dunmere", "Dunmere Bay"]]) })!;
    expect(renamed.scenario!.operations[1]!.target).toEqual({ markets: ["Dunmere Bay"], cells: [{ brand: "Ombrey", market: "Dunmere Bay" }] });
    expect(renamed.scenario!.headline.cells.map((c) => c.market)).toEqual(["Dunmere Bay", "Pellan"]);
    const split = relabelPlanBody(splitBody(), { brands: new Map(), markets: new Map([["Pellan", "Pellan North"]]) })!;
    expect(split.budgetSplit!.result.lines.map((l) => l.market)).toEqual(["Dunmere", "Pellan North"]);
  });

  it("renames a brand in a split's bounds, profit objective and result lines; the stored notes stay as written", () => {
    const renamed = relabelPlanBody(splitBody(), { brands: new Map([["Larkholm", "Larkholm Home"]]), markets: new Map() })!;
    const split = renamed.budgetSplit!;
    expect(split.bounds).toEqual([{ target: { brands: ["Larkholm Home"] }, lower: 5 }, { upper: 15 }]);
    expect(split.objective).toEqual({ kind: "profit", customerValue: { "Larkholm Home": 80, Ombrey: 60 } });
    expect(split.result.lines.map((l) => [l.brand, l.allocation])).toEqual([
      ["Larkholm Home", 10],
      ["Ombrey", 10],
    ]);
    expect(split.result.notes).toEqual(["Larkholm in Dunmere is at its lower bound"]);
  });

  it("is null when the plan names none of the renamed brands or markets", () => {
    expect(relabelPlanBody(splitBody(), { brands: new Map([["Quessant", "Quessant Two"]]), markets: new Map([["Ardlow", "Ardlow Two"]]) })).toBeNull();
    expect(relabelPlanBody(scenarioBody(), { brands: new Map([["Larkholm", "Larkholm"]]), markets: new Map() })).toBeNull();
  });
});

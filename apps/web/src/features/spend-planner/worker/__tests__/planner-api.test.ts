import { applyScenario, comparePlans, currentPlan, forecastPlan, type ScenarioOperation } from "@tributary/stats";
import { expose, wrap } from "comlink";
import { afterEach, describe, expect, it } from "vitest";
import { fixtureDrawSet } from "../../../../testing/draw-set-fixtures";
import { createPlannerApi, type PlannerApi, type PlannerRequest } from "../planner-api";

const ardeval = [
  { brand: "Fennick", market: "Ardeval" },
  { brand: "Hollowby", market: "Ardeval" },
];

const moreSearch: ScenarioOperation[] = [{ kind: "scale", target: { channels: ["search"] }, factor: 1.5 }];

const request = (overrides: Partial<PlannerRequest> = {}): PlannerRequest => ({
  cells: ardeval,
  horizon: 8,
  recentWeeks: 6,
  currentEdits: [],
  scenarios: [{ id: "s1", name: "More search", operations: moreSearch }],
  seed: 3,
  ...overrides,
});

function loaded() {
  const api = createPlannerApi();
  api.load("run-1", fixtureDrawSet());
  return api;
}

const ports: MessagePort[] = [];
afterEach(() => {
  for (const port of ports.splice(0)) port.close();
});

describe("spend-planner worker API", () => {
  it("forecasts the current plan exactly as the stats package does", () => {
    const response = loaded().forecast("run-1", request());
    expect(response.ok).toBe(true);
    if (!response.ok) return;
    const set = fixtureDrawSet();
    const plan = currentPlan(set, { cells: ardeval, horizon: 8, recentWeeks: 6 });
    const expected = forecastPlan(set, plan, { seed: 3 });
    expect(response.current.selection.total).toEqual(expected.selection.total);
    expect(response.current.selection.totalSpend).toBeCloseTo(expected.selection.totalSpend, 6);
    expect(response.current.cells.map((cell) => cell.total)).toEqual(expected.cells.map((cell) => cell.total));
    expect(response.current.cells[0]!.weeks).toHaveLength(8);
    expect(response.current.weeksAveraged).toEqual([6, 6]);
    // Four lines (2 cells × 2 channels), each the recent average, every week.
    expect(response.current.lines).toHaveLength(4);
    const searchFennick = response.current.lines.find((line) => line.brand === "Fennick" && line.channel === "search")!;
    expect(new Set(searchFennick.weekly).size).toBe(1);
    expect(searchFennick.total).toBeCloseTo(8 * searchFennick.weekly[0]!, 6);
    expect(response.drawCount).toBe(60);
  });

  it("compares a scenario with the current plan on the same draws, as comparePlans does", () => {
    const response = loaded().forecast("run-1", request());
    if (!response.ok) throw new Error(response.message);
    const set = fixtureDrawSet();
    const reference = currentPlan(set, { cells: ardeval, horizon: 8, recentWeeks: 6 });
    const comparison = comparePlans(set, reference, applyScenario(reference, moreSearch), { seed: 3 });
    const scenario = response.scenarios[0]!;
    expect(scenario.ok).toBe(true);
    if (!scenario.ok) return;
    expect(scenario.selection.extraCustomers).toEqual(comparison.selection.extraCustomers);
    expect(scenario.selection.extraSpend).toBeCloseTo(comparison.selection.extraSpend, 6);
    expect(scenario.selection.costPerExtraCustomer).toEqual(comparison.selection.costPerExtraCustomer);
    expect(scenario.cells.map((cell) => cell.brand)).toEqual(["Fennick", "Hollowby"]);
    // 50 % more search spend costs more and brings more customers in every draw of this set.
    expect(scenario.selection.extraSpend).toBeGreaterThan(0);
    expect(scenario.selection.costPerExtraCustomer.kind).toBe("cost");
  });

  it("starts scenarios from the edited current plan and compares them with it", () => {
    const edit = { brand: "Hollowby", market: "Ardeval", channel: "radio", weekly: 0 };
    const response = loaded().forecast("run-1", request({ currentEdits: [edit] }));
    if (!response.ok) throw new Error(response.message);
    const radio = response.current.lines.find((line) => line.brand === "Hollowby" && line.channel === "radio")!;
    expect(radio.weekly).toEqual(Array(8).fill(0));
    // The line's recent average is still reported beside the edit.
    const at = response.current.lines.indexOf(radio);
    expect(response.current.recentAverages[at]).toBeGreaterThan(0);
    const scenario = response.scenarios[0]!;
    if (!scenario.ok) throw new Error(scenario.message);
    expect(scenario.plan.lines.find((line) => line.brand === "Hollowby" && line.channel === "radio")!.total).toBe(0);
  });

  it("says in words when the cost per extra customer is not defined", () => {
    // A change that changes nothing: 0 extra customers in every draw, so no ratio exists.
    const response = loaded().forecast(
      "run-1",
      request({ scenarios: [{ id: "same", name: "Nothing added", operations: [{ kind: "add", target: { channels: ["radio"], weeks: { from: 0, to: 0 } }, amountPerWeek: 0 }] }] }),
    );
    if (!response.ok) throw new Error(response.message);
    const scenario = response.scenarios[0]!;
    if (!scenario.ok) throw new Error(scenario.message);
    expect(scenario.selection.extraSpend).toBe(0);
    expect(scenario.selection.costPerExtraCustomer.kind).toBe("undefined");
    expect(scenario.selection.costPerExtraCustomer.text).toMatch(/includes 0/);
  });

  it("reports a bad scenario on that scenario alone, and keeps the others", () => {
    const response = loaded().forecast(
      "run-1",
      request({
        scenarios: [
          { id: "bad", name: "Cut too deep", operations: [{ kind: "add", target: { channels: ["radio"] }, amountPerWeek: -1e9 }] },
          { id: "empty", name: "Nothing yet", operations: [] },
          { id: "good", name: "More search", operations: moreSearch },
        ],
      }),
    );
    if (!response.ok) throw new Error(response.message);
    const [bad, empty, good] = response.scenarios;
    expect(bad).toMatchObject({ ok: false, message: expect.stringMatching(/spend cannot be negative/) });
    expect(empty).toMatchObject({ ok: false, message: "add at least one change to the current plan" });
    expect(good?.ok).toBe(true);
  });

  it("turns a bad request into a message instead of throwing", () => {
    const api = loaded();
    expect(api.forecast("run-1", request({ horizon: 400 }))).toMatchObject({ ok: false, message: expect.stringMatching(/from 1 to 156, got 400/) });
    expect(api.forecast("run-1", request({ cells: [{ brand: "Fennick", market: "Nowhere" }] }))).toMatchObject({ ok: false, message: "no cell Fennick × Nowhere in this run" });
    expect(api.forecast("run-1", request({ currentEdits: [{ brand: "Fennick", market: "Ardeval", channel: "search", weekly: -5 }] }))).toMatchObject({
      ok: false,
      message: expect.stringMatching(/^The current plan cannot take that edit: the weekly spend must be a number ≥ 0, got -5/),
    });
    expect(api.forecast("another-run", request())).toMatchObject({ ok: false, message: "The draw set of the current fit is not loaded yet." });
  });

  it("works across a message port through comlink, as it does in the worker", async () => {
    const { port1, port2 } = new MessageChannel();
    ports.push(port1, port2);
    expose(createPlannerApi(), port1);
    const remote = wrap<PlannerApi>(port2);
    // The typed arrays of the draw set survive the structured clone.
    expect(await remote.load("run-1", fixtureDrawSet())).toEqual({ cells: 3, channels: ["search", "radio"], drawCount: 60 });
    const response = await remote.forecast("run-1", request());
    if (!response.ok) throw new Error(response.message);
    const direct = loaded().forecast("run-1", request());
    if (!direct.ok) throw new Error(direct.message);
    expect(response.current.selection.total).toEqual(direct.current.selection.total);
    expect(response.scenarios).toEqual(direct.scenarios);
  });
});

import { budgetSplit, type BudgetSplitInput } from "@tributary/stats";
import { expose, wrap } from "comlink";
import { afterEach, describe, expect, it } from "vitest";
import { fixtureDrawSet } from "../../../../testing/draw-set-fixtures";
import { createSplitApi, type SplitApi } from "../split-api";

const input: BudgetSplitInput = { totalBudget: 60_000, horizon: 8, recentWeeks: 6, bounds: [{ target: { channels: ["radio"] }, lower: 2_000 }] };

function loaded() {
  const api = createSplitApi();
  api.load("run-1", fixtureDrawSet());
  return api;
}

const ports: MessagePort[] = [];
afterEach(() => {
  for (const port of ports.splice(0)) port.close();
});

describe("budget-split worker API", () => {
  it("answers with the stats package's split, without the per-draw outcome values", () => {
    const response = loaded().split("run-1", input);
    if (!response.ok) throw new Error(response.message);
    const { outcome, ...expected } = budgetSplit(fixtureDrawSet(), input);
    const { outcome: got, ...rest } = response.result;
    expect(rest).toEqual(expected);
    expect(got.allocation.histogram).toEqual(outcome.allocation.histogram);
    expect(got.current.q50).toBe(outcome.current.q50);
    expect("draws" in got.allocation).toBe(false);
    // The whole budget is spent on customers, and every line not at a bound earns the same at the margin.
    expect(response.result.allocatedTotal).toBeCloseTo(60_000, 3);
    expect(response.result.equalMarginalSpread).toBeLessThan(1e-6);
    expect(response.drawCount).toBe(60);
  });

  it("turns bad inputs into a message instead of throwing", () => {
    const api = loaded();
    expect(api.split("run-1", { ...input, totalBudget: -1 })).toMatchObject({ ok: false, message: "the total budget must be a positive number, got -1" });
    expect(api.split("run-1", { ...input, bounds: [{ target: { channels: ["search"] }, lower: 50_000 }] })).toMatchObject({
      ok: false,
      message: expect.stringMatching(/lower bounds add up to 150000, more than the total budget 60000/),
    });
    expect(api.split("run-1", { ...input, objective: { kind: "profit", customerValue: { Fennick: 80 } } })).toMatchObject({
      ok: false,
      message: "profit needs a positive value of a new customer for brand Hollowby, got undefined",
    });
    expect(api.split("other", input)).toMatchObject({ ok: false, message: "The draw set of the current fit is not loaded yet." });
  });

  it("works across a message port through comlink, as it does in the worker", async () => {
    const { port1, port2 } = new MessageChannel();
    ports.push(port1, port2);
    expose(createSplitApi(), port1);
    const remote = wrap<SplitApi>(port2);
    await remote.load("run-1", fixtureDrawSet());
    const risk: BudgetSplitInput = { ...input, risk: { kind: "lower-quantile", quantile: 0.1 } };
    const response = await remote.split("run-1", risk);
    const direct = loaded().split("run-1", risk);
    expect(response).toEqual({ ...direct, elapsedMs: response.elapsedMs });
  });
});

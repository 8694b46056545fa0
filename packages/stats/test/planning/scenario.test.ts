import { describe, expect, it } from "vitest";
import { applyScenario } from "../../src/planning/scenario";
import { currentPlan, planIndex, spendPlanFrom, validateSpendPlan, type SpendPlan } from "../../src/planning/spend-plan";
import { twoCellDrawSet } from "./small-draw-sets";

const { set, spendAN, spendBS } = twoCellDrawSet();

/** Spend of the plan at cell i, channel c, week h, read plainly. */
function at(plan: SpendPlan, i: number, c: number, h: number): number {
  return plan.spend[(i * plan.channels.length + c) * plan.horizon + h]!;
}

describe("current plan", () => {
  it("keeps the average weekly spend of the last 13 data weeks per cell × channel", () => {
    const plan = currentPlan(set);
    expect(plan.horizon).toBe(13);
    expect(plan.channels).toEqual(["Search", "Video"]);
    expect(plan.cells.map((c) => `${c.brand}/${c.market}`)).toEqual(["Alder/Northland", "Birchwood/Southmere"]);
    // Alder × Northland, Search: weeks 7..19 of 1000 + 50t → mean 1000 + 50·13 = 1650.
    const search = spendAN[0]!.slice(7).reduce((a, b) => a + b, 0) / 13;
    expect(search).toBe(1650);
    const video = spendAN[1]!.slice(7).reduce((a, b) => a + b, 0) / 13; // weeks 8, 12, 16 are off
    for (let h = 0; h < 13; h++) {
      expect(at(plan, 0, 0, h)).toBeCloseTo(search, 10);
      expect(at(plan, 0, 1, h)).toBeCloseTo(video, 10);
      expect(at(plan, 1, 1, h)).toBe(0);
    }
    // Birchwood × Southmere has only 10 weeks: all of them are averaged.
    expect(plan.weeksAveraged).toEqual([13, 10]);
    expect(at(plan, 1, 0, 5)).toBeCloseTo(spendBS[0]!.reduce((a, b) => a + b, 0) / 10, 10);
  });

  it("starts each cell's plan the week after its last data week", () => {
    const plan = currentPlan(set);
    expect(plan.cells[0]!.firstWeek).toBe("2024-05-20"); // 2024-01-01 + 20 weeks
    expect(plan.cells[1]!.firstWeek).toBe("2024-05-13"); // 2024-03-04 + 10 weeks
  });

  it("takes a chosen set of cells, a horizon and a window", () => {
    const plan = currentPlan(set, { cells: [{ brand: "Birchwood", market: "Southmere" }], horizon: 4, recentWeeks: 2 });
    expect(plan.cells.length).toBe(1);
    expect(plan.spend.length).toBe(1 * 2 * 4);
    expect(at(plan, 0, 0, 3)).toBeCloseTo((480 + 490) / 2, 10);
  });

  it("rejects a wrong horizon, window or cell with a clear message", () => {
    expect(() => currentPlan(set, { horizon: 0 })).toThrow(/horizon must be a whole number of weeks from 1/);
    expect(() => currentPlan(set, { horizon: 2.5 })).toThrow(/horizon/);
    expect(() => currentPlan(set, { horizon: 1000 })).toThrow(/horizon/);
    expect(() => currentPlan(set, { recentWeeks: 0 })).toThrow(/recent weeks/);
    expect(() => currentPlan(set, { cells: [{ brand: "Alder", market: "Atlantis" }] })).toThrow(/no cell Alder × Atlantis/);
    expect(() => currentPlan(set, { cells: [] })).toThrow(/at least one cell/);
    expect(() => currentPlan(set, { cells: [{ brand: "Alder", market: "Northland" }, { brand: "Alder", market: "Northland" }] })).toThrow(/twice/);
  });
});

describe("scenario operations", () => {
  const base = currentPlan(set, { horizon: 6 });
  const copy = Float64Array.from(base.spend);

  it("multiplies a channel by a factor everywhere", () => {
    const plan = applyScenario(base, [{ kind: "scale", target: { channels: ["Search"] }, factor: 1.2 }]);
    for (let i = 0; i < 2; i++) {
      for (let h = 0; h < 6; h++) {
        expect(at(plan, i, 0, h)).toBeCloseTo(1.2 * at(base, i, 0, h), 10);
        expect(at(plan, i, 1, h)).toBe(at(base, i, 1, h));
      }
    }
  });

  it("adds an amount per week to each targeted line of a market", () => {
    const plan = applyScenario(base, [{ kind: "add", target: { markets: ["Southmere"] }, amountPerWeek: 250 }]);
    for (let h = 0; h < 6; h++) {
      expect(at(plan, 1, 0, h)).toBeCloseTo(at(base, 1, 0, h) + 250, 10);
      expect(at(plan, 1, 1, h)).toBe(250);
      expect(at(plan, 0, 0, h)).toBe(at(base, 0, 0, h));
    }
  });

  it("sets a line to zero and sets a weekly vector, limited to chosen weeks", () => {
    const plan = applyScenario(base, [
      { kind: "zero", target: { cells: [{ brand: "Alder", market: "Northland" }], channels: ["Video"] } },
      { kind: "set", target: { cells: [{ brand: "Alder", market: "Northland" }], channels: ["Search"], weeks: { from: 2, to: 4 } }, weekly: [10, 20, 30] },
    ]);
    expect(Array.from({ length: 6 }, (_, h) => at(plan, 0, 1, h))).toEqual([0, 0, 0, 0, 0, 0]);
    expect(Array.from({ length: 6 }, (_, h) => at(plan, 0, 0, h))).toEqual([1650, 1650, 10, 20, 30, 1650]);
    expect(at(plan, 1, 1, 0)).toBe(0);
    expect(at(plan, 1, 0, 0)).toBe(at(base, 1, 0, 0));
  });

  it("applies operations in order and leaves the input plan unchanged", () => {
    const a = applyScenario(base, [
      { kind: "set", target: { channels: ["Video"] }, weekly: 100 },
      { kind: "scale", target: { channels: ["Video"] }, factor: 3 },
    ]);
    const b = applyScenario(base, [
      { kind: "scale", target: { channels: ["Video"] }, factor: 3 },
      { kind: "set", target: { channels: ["Video"] }, weekly: 100 },
    ]);
    expect(at(a, 0, 1, 0)).toBe(300);
    expect(at(b, 0, 1, 0)).toBe(100);
    expect(Array.from(base.spend)).toEqual(Array.from(copy));
    expect(planIndex(base, 1, 1, 5)).toBe(base.spend.length - 1);
  });

  it("rejects negative results, unknown names, a wrong vector length and bad numbers", () => {
    expect(() => applyScenario(base, [{ kind: "add", target: { channels: ["Search"] }, amountPerWeek: -1000 }])).toThrow(
      /Birchwood × Southmere, Search, plan week 1 equal -5(\d|\.)*; spend cannot be negative/,
    );
    expect(() => applyScenario(base, [{ kind: "scale", target: { channels: ["Radio"] }, factor: 2 }])).toThrow(/channel "Radio" is not among the planned channels/);
    expect(() => applyScenario(base, [{ kind: "zero", target: { markets: ["Atlantis"] } }])).toThrow(/market "Atlantis" is not among the planned markets/);
    expect(() => applyScenario(base, [{ kind: "zero", target: { cells: [{ brand: "Alder", market: "Southmere" }] } }])).toThrow(/cell Alder × Southmere is not among the planned cells/);
    expect(() => applyScenario(base, [{ kind: "zero", target: { brands: ["Alder"], markets: ["Southmere"] } }])).toThrow(/matches no line/);
    expect(() => applyScenario(base, [{ kind: "zero", target: { channels: [] } }])).toThrow(/list of channels is empty/);
    expect(() => applyScenario(base, [{ kind: "set", target: { channels: ["Video"] }, weekly: [1, 2, 3] }])).toThrow(/one weekly spend per targeted week \(6\), got 3/);
    expect(() => applyScenario(base, [{ kind: "set", weekly: -4 }])).toThrow(/≥ 0/);
    expect(() => applyScenario(base, [{ kind: "scale", factor: -1 }])).toThrow(/factor must be a number ≥ 0/);
    expect(() => applyScenario(base, [{ kind: "scale", factor: Number.NaN }])).toThrow(/factor/);
    expect(() => applyScenario(base, [{ kind: "add", amountPerWeek: Infinity }])).toThrow(/amount per week/);
    expect(() => applyScenario(base, [{ kind: "zero", target: { weeks: { from: 3, to: 6 } } }])).toThrow(/plan weeks must run within 0..5/);
    // a later failing operation changes nothing
    expect(() => applyScenario(base, [{ kind: "zero" }, { kind: "scale", factor: -2 }])).toThrow(/operation 2/);
    expect(Array.from(base.spend)).toEqual(Array.from(copy));
  });
});

describe("plans from plain numbers", () => {
  it("builds and checks a plan against the run", () => {
    const cells = [{ brand: "Alder", market: "Northland" }];
    const plan = spendPlanFrom(set, { cells, horizon: 2, spend: [1, 2, 3, 4] });
    expect(at(plan, 0, 1, 1)).toBe(4);
    expect(() => spendPlanFrom(set, { cells, horizon: 2, spend: [1, 2, 3] })).toThrow(/needs 4 weekly spend values/);
    expect(() => spendPlanFrom(set, { cells, horizon: 2, spend: [1, 2, -3, 4] })).toThrow(/Alder × Northland, Video, plan week 1 is -3/);
    expect(() => validateSpendPlan(set, { ...plan, channels: ["Video", "Search"] })).toThrow(/not the run's channels/);
    expect(() => validateSpendPlan(set, { ...plan, cells: [{ ...plan.cells[0]!, cellIndex: 1 }] })).toThrow(/not cell 1 of this run/);
  });
});

import { decodeDrawSet } from "@tributary/contracts";
import { describe, expect, it } from "vitest";
import { fixtureDrawSet, fixtureDrawSetWire } from "../../../../testing/draw-set-fixtures";
import { createSplitApi } from "../../worker/split-api";
import { marginalCheck, splitViewOfResult, splitViewOfSaved } from "../split-view";

const drawSet = decodeDrawSet(fixtureDrawSetWire());

function split(input: Parameters<ReturnType<typeof createSplitApi>["split"]>[1]) {
  const api = createSplitApi();
  api.load("run-7", fixtureDrawSet());
  const response = api.split("run-7", input);
  if (!response.ok) throw new Error(response.message);
  return response.result;
}

describe("the split as shown", () => {
  it("finds the stats package's multiplier and spread from the lines alone", () => {
    const result = split({ totalBudget: 50_000, horizon: 8, recentWeeks: 6, bounds: [{ target: { channels: ["radio"] }, upper: 200 }] });
    const view = splitViewOfResult(result, drawSet);
    const check = marginalCheck(view.lines);
    expect(result.linesAtBounds.length).toBeGreaterThan(0);
    expect(check.freeLines).toBe(result.lines.length - result.linesAtBounds.length);
    expect(check.multiplier!).toBeCloseTo(result.multiplier, 10);
    expect(check.spread).toBeCloseTo(result.equalMarginalSpread, 12);
    expect(check.equal).toBe(true);
    // Lines carry the workspace ids of their cells.
    expect(new Set(view.lines.map((line) => line.cellId))).toEqual(new Set(["c1", "c3", "c2"]));
  });

  it("reads the same check back from a saved split (marginal cost per customer and customer values)", () => {
    const objective = { kind: "profit" as const, customerValue: { Fennick: 150, Hollowby: 90 } };
    const result = split({ totalBudget: 50_000, horizon: 8, recentWeeks: 6, objective });
    const live = splitViewOfResult(result, drawSet);
    const saved = splitViewOfSaved(
      {
        ...result,
        lines: live.lines.map(({ key: _key, weightedReturn: _w, ...line }) => ({ ...line, weeklyAllocation: line.allocation / 8 })),
        outcome: { allocation: { ...result.outcome.allocation, histogram: { edges: [...result.outcome.allocation.histogram.edges], counts: [...result.outcome.allocation.histogram.counts] } }, current: { ...result.outcome.current, histogram: { edges: [...result.outcome.current.histogram.edges], counts: [...result.outcome.current.histogram.counts] } } },
        notes: [...result.notes],
        drawCount: 60,
        computedAt: "2025-01-07T10:00:00.000Z",
      },
      objective,
      { kind: "expected" },
    );
    saved.lines.forEach((line, l) => expect(line.weightedReturn).toBeCloseTo(live.lines[l]!.weightedReturn, 10));
    expect(marginalCheck(saved.lines).multiplier!).toBeCloseTo(marginalCheck(live.lines).multiplier!, 10);
  });

  it("does not call a risk-averse split equal at the margin when it is not", () => {
    const result = split({ totalBudget: 50_000, horizon: 8, recentWeeks: 6, risk: { kind: "mean-minus-sd", penalty: 3 } });
    const check = marginalCheck(splitViewOfResult(result, drawSet).lines);
    expect(check.spread).toBeCloseTo(result.equalMarginalSpread, 12);
    // Trading expected customers for less spread moves lines off the equal-return point.
    expect(check.spread).toBeGreaterThan(1e-3);
    expect(check.equal).toBe(false);
  });

  it("handles no free line and a single free line", () => {
    expect(marginalCheck([{ activeBound: "upper", weightedReturn: 0.02 }])).toEqual({ freeLines: 0, multiplier: null, spread: 0, equal: true });
    expect(marginalCheck([{ activeBound: null, weightedReturn: 0.02 }, { activeBound: "lower", weightedReturn: 0.5 }])).toEqual({ freeLines: 1, multiplier: 0.02, spread: 0, equal: true });
    expect(marginalCheck([{ activeBound: null, weightedReturn: 0.02 }, { activeBound: null, weightedReturn: 0.03 }])).toMatchObject({ freeLines: 2, multiplier: 0.025, equal: false });
  });
});

import { decodeDrawSet } from "@tributary/contracts";
import { budgetSplit } from "@tributary/stats";
import { describe, expect, it } from "vitest";
import { fixtureDrawSet, fixtureDrawSetWire } from "../../../../testing/draw-set-fixtures";
import { checkSplitForm, currentSpendOver, recentWeeklySpend, type SplitFormState } from "../split-form";

const drawSet = decodeDrawSet(fixtureDrawSetWire());
const values = { Fennick: 120, Hollowby: null };

const form = (overrides: Partial<SplitFormState> = {}): SplitFormState => ({
  cellIds: ["c1", "c3"],
  totalBudget: "40 000",
  horizon: "8",
  recentWeeks: "6",
  channelBounds: {},
  cellBounds: {},
  objective: "customers",
  risk: "expected",
  quantilePercent: "10",
  penalty: "1",
  ...overrides,
});

const errorsOf = (state: SplitFormState) => {
  const check = checkSplitForm(state, drawSet.cells, drawSet.channels, values);
  return check.ok ? {} : check.errors;
};

describe("the budget split form", () => {
  it("builds the inputs: cells by name and by id, bounds per channel and per cell, objective and risk", () => {
    const check = checkSplitForm(
      form({
        channelBounds: { radio: { lower: "1000", upper: "" }, search: { lower: "", upper: "" } },
        cellBounds: { c3: { lower: "", upper: "9000" } },
        risk: "lower-quantile",
        quantilePercent: "10",
      }),
      drawSet.cells,
      drawSet.channels,
      values,
    );
    expect(check).toEqual({
      ok: true,
      inputs: {
        cells: [
          { brand: "Fennick", market: "Ardeval" },
          { brand: "Hollowby", market: "Ardeval" },
        ],
        cellIds: ["c1", "c3"],
        totalBudget: 40000,
        horizon: 8,
        recentWeeks: 6,
        bounds: [
          { target: { channels: ["radio"] }, lower: 1000 },
          { target: { cells: [{ brand: "Hollowby", market: "Ardeval" }] }, upper: 9000 },
        ],
        objective: { kind: "customers" },
        risk: { kind: "lower-quantile", quantile: 0.1 },
      },
    });
  });

  it("takes the customer values of the chosen brands only, for profit", () => {
    const check = checkSplitForm(form({ cellIds: ["c1", "c2"], objective: "profit", risk: "mean-minus-sd", penalty: "0.5" }), drawSet.cells, drawSet.channels, values);
    expect(check.ok && check.inputs.objective).toEqual({ kind: "profit", customerValue: { Fennick: 120 } });
    expect(check.ok && check.inputs.risk).toEqual({ kind: "mean-minus-sd", penalty: 0.5 });
  });

  it("names every field that is wrong, in words", () => {
    expect(errorsOf(form({ cellIds: [], totalBudget: "0", horizon: "200", recentWeeks: "x" }))).toEqual({
      cells: "Choose at least one cell (brand × market)",
      totalBudget: "Enter a total budget above 0",
      horizon: "Enter a whole number of weeks from 1 to 156",
      recentWeeks: "Enter a whole number of weeks from 1 to 156",
    });
    expect(errorsOf(form({ channelBounds: { radio: { lower: "-1", upper: "" }, search: { lower: "500", upper: "100" } } }))).toEqual({
      "channel:radio.lower": "Enter a lower bound of 0 or more, or leave it empty",
      "channel:search.upper": "The upper bound is below the lower bound",
    });
    expect(errorsOf(form({ objective: "profit" }))).toEqual({ objective: "Profit needs the value of a new customer for Hollowby; an admin sets it in the portfolio settings" });
    expect(errorsOf(form({ risk: "lower-quantile", quantilePercent: "60" }))).toEqual({ quantilePercent: "Enter a quantile above 0 and below 50 (per cent)" });
    expect(errorsOf(form({ risk: "mean-minus-sd", penalty: "-2" }))).toEqual({ penalty: "Enter a penalty of 0 or more" });
  });

  it("works out the current spend as the stats package's split does", () => {
    const set = fixtureDrawSet();
    const split = budgetSplit(set, { totalBudget: 10_000, horizon: 8, recentWeeks: 6 });
    for (const line of split.lines) {
      expect(recentWeeklySpend(drawSet.cells[line.cellIndex]!, line.channelIndex, 6) * 8).toBeCloseTo(line.current, 9);
    }
    expect(currentSpendOver(drawSet.cells, 2, 8, 6)).toBeCloseTo(split.currentTotal, 6);
    // A window longer than the cell's data averages all of its weeks.
    const short = drawSet.cells[2]!;
    expect(recentWeeklySpend(short, 0, 500)).toBeCloseTo(short.spend[0]!.reduce((a, b) => a + b, 0) / short.weeks, 9);
  });
});

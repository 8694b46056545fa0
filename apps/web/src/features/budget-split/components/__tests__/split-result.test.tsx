import { decodeDrawSet } from "@tributary/contracts";
import { render, screen, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { fixtureDrawSet, fixtureDrawSetWire } from "../../../../testing/draw-set-fixtures";
import { channelCodeAsName, channelNameLookup } from "../../../../lib/channel-names";
import "../../../../testing/test-utils";
import { splitViewOfResult } from "../../split/split-view";
import { createSplitApi } from "../../worker/split-api";
import { SplitResult } from "../split-result";

const drawSet = decodeDrawSet(fixtureDrawSetWire());

function viewOf(input: Parameters<ReturnType<typeof createSplitApi>["split"]>[1]) {
  const api = createSplitApi();
  api.load("run-7", fixtureDrawSet());
  const response = api.split("run-7", input);
  if (!response.ok) throw new Error(response.message);
  return { result: response.result, view: splitViewOfResult(response.result, drawSet) };
}

describe("SplitResult", () => {
  it("shows the multiplier and the spread, and says the lines not at a bound are equal at the margin", () => {
    const { result, view } = viewOf({ totalBudget: 50_000, horizon: 8, recentWeeks: 6, bounds: [{ target: { channels: ["radio"] }, upper: 200 }] });
    render(<SplitResult view={view} currency="EUR" channelName={channelCodeAsName} />);
    const check = screen.getByRole("region", { name: "Check: equal return at the margin" });
    expect(check.getAttribute("data-marginal-equal")).toBe("true");
    // Customers per 1,000 EUR at the margin: the stats package's multiplier × 1000, to 4 significant digits.
    const perThousand = Number((result.multiplier * 1000).toPrecision(4)).toLocaleString("en-GB", { maximumFractionDigits: 10 });
    expect(within(check).getByText(`${perThousand} per 1,000 EUR`)).toBeTruthy();
    expect(within(check).getByText(/^✓ Equal/)).toBeTruthy();
    expect(within(check).getByText(`(largest − smallest) / mean, over ${result.lines.length - result.linesAtBounds.length} lines`)).toBeTruthy();
    // Every radio line sits at its upper bound, and is listed as such.
    const hit = screen.getByRole("region", { name: "Lines at a bound" });
    expect(within(hit).getAllByRole("listitem")).toHaveLength(result.linesAtBounds.length);
    expect(within(hit).getAllByText(/^radio in .*at its upper bound/).length).toBe(3);
    // The caution stands beside the result.
    expect(screen.getByRole("complementary", { name: "Caution about estimates" }).textContent).toMatch(/lift test/);
    const table = screen.getByRole("table", { name: "Allocation per line" });
    expect(within(table).getAllByRole("row")).toHaveLength(1 + result.lines.length);
    expect(screen.getByRole("figure", { name: /How the new customers could turn out/ })).toBeTruthy();
    expect(screen.getByRole("figure", { name: /The split against the current spend, by channel/ })).toBeTruthy();
  });

  it("explains why a risk-averse split is not equal at the margin", () => {
    const { view } = viewOf({ totalBudget: 50_000, horizon: 8, recentWeeks: 6, risk: { kind: "mean-minus-sd", penalty: 3 } });
    render(<SplitResult view={view} currency="EUR" channelName={channelCodeAsName} />);
    const check = screen.getByRole("region", { name: "Check: equal return at the margin" });
    expect(check.getAttribute("data-marginal-equal")).toBe("false");
    expect(within(check).getByText("Not equal")).toBeTruthy();
    expect(within(check).getByText(/a risk attitude gives up some expected return/)).toBeTruthy();
    expect(screen.getByText(/^Risk criterion \(mean − 3 × standard deviation/)).toBeTruthy();
  });

  it("reads the multiplier as value per unit spent for profit: 1 at the margin when the budget is not all worth spending", () => {
    const { result, view } = viewOf({ totalBudget: 5_000_000, horizon: 8, recentWeeks: 6, objective: { kind: "profit", customerValue: { Fennick: 150, Hollowby: 90 } } });
    render(<SplitResult view={view} currency="EUR" channelName={channelCodeAsName} />);
    const check = screen.getByRole("region", { name: "Check: equal return at the margin" });
    expect(within(check).getByText(/EUR per EUR$/)).toBeTruthy();
    expect(within(check).getByText(/1 = break-even/)).toBeTruthy();
    expect(result.budgetBinding).toBe(false);
    expect(within(check).getByText("1 EUR per EUR")).toBeTruthy();
  });

  it("shows channels by their display names in the chips, the table and the chart's data, and falls back to the code", () => {
    const { view } = viewOf({ totalBudget: 50_000, horizon: 8, recentWeeks: 6, bounds: [{ target: { channels: ["radio"] }, upper: 200 }] });
    // "search" has no name in this portfolio: it reads as its code.
    render(<SplitResult view={view} currency="EUR" channelName={channelNameLookup([{ code: "radio", name: "Local radio" }])} />);
    const hit = screen.getByRole("region", { name: "Lines at a bound" });
    expect(within(hit).getAllByText(/^Local radio in .*at its upper bound/)).toHaveLength(3);
    expect(within(hit).queryByText(/^radio in/)).toBeNull();
    const table = screen.getByRole("table", { name: "Allocation per line" });
    const cells = within(table).getAllByRole("cell").map((cell) => cell.textContent);
    expect(cells.filter((text) => text === "Local radio")).toHaveLength(3);
    expect(cells.filter((text) => text === "search")).toHaveLength(3);
    expect(cells).not.toContain("radio");
    // The chart's data table, by channel: one row per channel under its name.
    const chartData = screen.getByRole("table", { name: /by channel, current and split/ });
    const rowHeads = within(chartData)
      .getAllByRole("row")
      .slice(1)
      .map((row) => row.firstElementChild?.textContent);
    expect(rowHeads.sort()).toEqual(["Local radio", "search"]);
  });
});

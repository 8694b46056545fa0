import { screen, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { testBrandComparison } from "../../../../testing/dashboard-fixtures";
import { jsonResponse, renderApp, signedInRoutes, testUsers } from "../../../../testing/test-utils";
import { comparisonLines, lineLabel } from "../comparison-rows";

describe("brand comparison rows", () => {
  it("groups each brand's cells under its own effect, in the order chosen", () => {
    const data = testBrandComparison();
    // Brands by their own effect (Hollowby 40 before Fennick 70), cells by median within a brand.
    expect(comparisonLines(data, "search", "cheapest").map(lineLabel)).toEqual([
      "Hollowby (whole brand)",
      "Hollowby · Ardeval",
      "Fennick (whole brand)",
      "Fennick · Ardeval",
      "Fennick · Briskmoor",
    ]);
    expect(comparisonLines(data, "search", "dearest").map(lineLabel)).toEqual([
      "Fennick (whole brand)",
      "Fennick · Briskmoor",
      "Fennick · Ardeval",
      "Hollowby (whole brand)",
      "Hollowby · Ardeval",
    ]);
    expect(comparisonLines(data, "search", "name").map(lineLabel)).toEqual([
      "Fennick (whole brand)",
      "Fennick · Ardeval",
      "Fennick · Briskmoor",
      "Hollowby (whole brand)",
      "Hollowby · Ardeval",
    ]);
  });

  it("carries the flags and outlier marks of each cell, and leaves out a brand line the viewer may not see", () => {
    const lines = comparisonLines(testBrandComparison(), "radio", "cheapest");
    expect(lines.map(lineLabel)).toEqual(["Fennick · Ardeval"]);
    const briskmoor = comparisonLines(testBrandComparison(), "search", "cheapest").find((line) => line.market === "Briskmoor");
    expect(briskmoor?.outlier).toBe(true);
    expect(briskmoor?.flags.map((flag) => flag.kind)).toEqual(["needs_lift_test"]);
  });
});

describe("brand comparison screen", () => {
  it("draws one chart per channel with its reference band, and lists every row in a table with the server's export", async () => {
    renderApp("/brand-comparison", { ...signedInRoutes(testUsers.portfolio_lead), "GET /api/dashboards/brand-comparison": () => jsonResponse(200, testBrandComparison()) });
    expect(await screen.findByRole("region", { name: "Search: brands compared" }, { timeout: 5000 })).toBeTruthy();
    expect(screen.getByRole("region", { name: "Radio: brands compared" })).toBeTruthy();
    expect(screen.getByRole("figure", { name: "Search" }).textContent).toMatch(/portfolio-wide effect of Search \(€60, 90 %: €33\.3–€108\)/);
    const table = screen.getByRole("table", { name: "Channels × brands" });
    expect(within(table).getAllByRole("row")).toHaveLength(1 + 6);
    expect(within(table).getByRole("link", { name: "Briskmoor" }).getAttribute("href")).toBe("/channel-sheet?cell=c2&channel=search");
    expect(screen.getByRole("link", { name: "Export CSV" }).getAttribute("href")).toBe("/api/dashboards/brand-comparison/export.csv");
  });
});

import { screen, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { testMarketDesk } from "../../../../testing/dashboard-fixtures";
import { jsonResponse, renderApp, signedInRoutes, testUsers } from "../../../../testing/test-utils";

describe("market desk", () => {
  it("shows a market manager their market's channels with costs, chance of profit and flags, and says honestly what is not there yet", async () => {
    renderApp("/market-desk", { ...signedInRoutes(testUsers.market_manager), "GET /api/dashboards/market-desk": () => jsonResponse(200, testMarketDesk()) });
    const card = await screen.findByRole("table", { name: /Fennick in Briskmoor/ }, { timeout: 5000 });
    const search = within(card).getByRole("row", { name: /Search/ });
    expect(search.textContent).toContain("€90");
    expect(search.textContent).toContain("(€64.3–€126)");
    expect(search.textContent).toContain("62 %");
    expect(within(search).getByRole("img", { name: "Flagged: needs a lift test" })).toBeTruthy();
    expect(within(card).getByRole("row", { name: /Radio/ }).textContent).toContain("No spend on Radio");
    expect(within(search).getByRole("link", { name: "Search" }).getAttribute("href")).toBe("/channel-sheet?cell=c2&channel=search");
    expect(screen.getByRole("heading", { name: "This is the first published fit" })).toBeTruthy();
    expect(screen.getByRole("heading", { name: "No saved spend plans yet" })).toBeTruthy();
    expect(screen.getByRole("complementary", { name: "Caution about estimates" })).toBeTruthy();
    expect(document.body.textContent).not.toMatch(/Ardeval|Celowen/);
  });

  it("lists what changed since the previous fit, marking changes beyond the uncertainty", async () => {
    const desk = testMarketDesk();
    const changed = {
      ...desk,
      previousRun: { ...desk.run, id: "run-older", datasetVersionNumber: 2, current: false },
      changes: [
        { cellId: "c2", brand: "Fennick", market: "Briskmoor", channel: "search", channelName: "Search", status: "compared" as const, before: { q05: 40, q50: 50, q95: 60 }, after: { q05: 70, q50: 90, q95: 120 }, medianChange: 0.8, intervalsOverlap: false },
      ],
    };
    renderApp("/market-desk", { ...signedInRoutes(testUsers.market_manager), "GET /api/dashboards/market-desk": () => jsonResponse(200, changed) });
    const table = await screen.findByRole("table", { name: "Changes since the previous fit" }, { timeout: 5000 });
    const row = within(table).getByRole("row", { name: /Fennick/ });
    expect(row.textContent).toContain("€50 (€40–€60)");
    expect(row.textContent).toContain("+80 % dearer");
    expect(row.textContent).toContain("yes");
  });
});

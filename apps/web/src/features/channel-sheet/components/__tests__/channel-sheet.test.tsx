import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { testChannelSheet } from "../../../../testing/dashboard-fixtures";
import { jsonResponse, renderApp, signedInRoutes, testUsers } from "../../../../testing/test-utils";

describe("channel sheet", () => {
  it("opens the cell × channel in the address with its pooled and unpooled estimates, charts, flags and downloads", async () => {
    const { router } = renderApp("/channel-sheet?cell=c2&channel=search", {
      ...signedInRoutes(testUsers.analyst),
      "GET /api/dashboards/channel-sheet/c2/search": () => jsonResponse(200, testChannelSheet()),
    });
    const facts = await screen.findByRole("region", { name: "Headline numbers" }, { timeout: 5000 });
    expect(within(facts).getByText("Low-spend cost per new customer (pooled)").parentElement?.textContent).toContain("€90");
    expect(within(facts).getByText("This cell alone (no pooling)").parentElement?.textContent).toContain("€150");
    expect(screen.getByText(/Candidate outlier\./)).toBeTruthy();
    for (const title of ["What a new customer costs: the posterior", "Pooled beside unpooled", "Response curve", "Carry-over", "Weekly contribution of Search against the baseline", "Chance of profit by customer value"]) {
      expect(screen.getByRole("figure", { name: title })).toBeTruthy();
    }
    const flags = screen.getByRole("region", { name: "Flags on this estimate" });
    expect(within(flags).getAllByRole("listitem")).toHaveLength(2);
    expect(within(flags).getByText(/cleared by Ada Quern/)).toBeTruthy();
    expect(screen.getByRole("link", { name: "Response curve" }).getAttribute("href")).toBe("/api/dashboards/channel-sheet/c2/search/export.csv?table=response-curve");
    expect(screen.getAllByRole("complementary", { name: "Caution about estimates" }).length).toBeGreaterThan(0);

    // Choosing another market keeps the brand and channel.
    expect((screen.getByRole("combobox", { name: "Brand" }) as HTMLSelectElement).value).toBe("b-fen");
    fireEvent.change(screen.getByRole("combobox", { name: "Market" }), { target: { value: "m-ard" } });
    await waitFor(() => expect(router.state.location.search).toBe("?cell=c1&channel=search"));
    // Six charts drawn in a simulated DOM are slow on a busy machine.
  }, 20_000);

  it("explains a cell × channel the run has no estimate for", async () => {
    renderApp("/channel-sheet?cell=c4&channel=radio", {
      ...signedInRoutes(testUsers.analyst),
      "GET /api/dashboards/channel-sheet/c4/radio": () => jsonResponse(404, { error: { code: "not_found", message: "Hollowby in Celowen is not in the current run" } }),
      "GET /api/dashboards/status": () => jsonResponse(200, { current: { runId: "r", fittedAt: null, publishedAt: "2025-02-03T11:00:00.000Z", trustworthy: true }, firstFit: null }),
    });
    expect(await screen.findByRole("heading", { name: "No estimate for this cell and channel" }, { timeout: 5000 })).toBeTruthy();
    expect(screen.getByText("Hollowby in Celowen is not in the current run")).toBeTruthy();
    await waitFor(() => expect(screen.queryByRole("heading", { name: "No published fit yet" })).toBeNull());
  });
});

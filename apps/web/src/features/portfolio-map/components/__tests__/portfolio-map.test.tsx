import { render, screen, within } from "@testing-library/react";
import { MemoryRouter } from "react-router-dom";
import { describe, expect, it } from "vitest";
import { paths } from "../../../../config/paths";
import { testPortfolioMap } from "../../../../testing/dashboard-fixtures";
import { jsonResponse, renderApp, signedInRoutes, testPortfolio, testUsers } from "../../../../testing/test-utils";
import { EstimateGrid } from "../estimate-grid";
import { PortfolioGrid } from "../portfolio-grid";

function renderGrid() {
  return render(
    <MemoryRouter>
      <EstimateGrid map={testPortfolioMap()} cellHref={(cell) => paths.app.channelSheet.getHref({ cellId: cell.cellId, channel: "search" })} />
    </MemoryRouter>,
  );
}

describe("estimate grid", () => {
  it("shows each cell's median and 90 % interval, chance of profit, weeks and shrinkage, and links to its Channel sheet", () => {
    renderGrid();
    const grid = screen.getByRole("table", { name: /Brands × markets/ });
    const [ardeval, briskmoor, celowen] = within(within(grid).getByRole("row", { name: /Fennick/ })).getAllByRole("cell");
    // Median 48.26 with a 90 % interval of 48.26/1.4 to 48.26 × 1.4.
    expect(ardeval!.querySelector('[data-value="median"]')?.textContent).toBe("€48.3");
    expect(ardeval!.querySelector('[data-value="interval"]')?.textContent).toBe("€34.5–€67.6");
    expect(ardeval!.querySelector('[data-value="chance"]')?.textContent).toBe("73 %");
    expect(ardeval!.textContent).toContain("104 weeks");
    expect(within(ardeval!).getByRole("img", { name: /moved the estimate 12 % of the way/ })).toBeTruthy();
    expect(within(ardeval!).getByRole("link").getAttribute("href")).toBe("/channel-sheet?cell=c1&channel=search");
    // A 0.4 % chance is not shown as zero.
    expect(briskmoor!.querySelector('[data-value="chance"]')?.textContent).toBe("< 1 %");
    expect(briskmoor!.querySelector('[data-value="median"]')?.textContent).toBe("€1,230");
    expect(within(briskmoor!).getByRole("img", { name: "Flagged: needs a lift test" })).toBeTruthy();
    expect(within(briskmoor!).getByText("outlier?")).toBeTruthy();
    expect(celowen!.getAttribute("aria-label")).toBe("Fennick in Celowen: no data");
  });

  it("shows a cell without spend on the channel as empty, never as a zero cost", () => {
    renderGrid();
    const hollowby = within(screen.getByRole("table", { name: /Brands × markets/ })).getByRole("row", { name: /Hollowby/ });
    const [ardeval] = within(hollowby).getAllByRole("cell");
    expect(ardeval!.textContent).toContain("No spend on Search");
    expect(ardeval!.className).toContain("hatch-empty");
    expect(ardeval!.textContent).not.toMatch(/€0|0 %/);
  });
});

describe("portfolio map screen", () => {
  const routes = (user = testUsers.admin, marketIds?: string[]) => ({
    ...signedInRoutes(user),
    "GET /api/dashboards/portfolio-map": () => jsonResponse(200, testPortfolioMap(marketIds)),
  });

  it("says which run the numbers come from, with its trust mark and publish reason, and shows the caution", async () => {
    renderApp("/portfolio-map", routes());
    const stamp = await screen.findByRole("region", { name: "Published run" }, { timeout: 5000 });
    expect(stamp.textContent).toMatch(/run run-7f3a \(dataset version 3\)/);
    expect(within(stamp).getByText("Not trustworthy")).toBeTruthy();
    expect(within(stamp).getByText("“Lift tests run last spring agree with these estimates.”")).toBeTruthy();
    expect(screen.getByRole("complementary", { name: "Caution about estimates" }).textContent).toMatch(/lift test/);
    expect(screen.getByRole("combobox", { name: "Channel" })).toBeTruthy();
    const table = screen.getByRole("table", { name: "Cells: Search" });
    expect(within(table).getAllByRole("row")).toHaveLength(4);
    expect(screen.getByRole("link", { name: "Export CSV" }).getAttribute("href")).toBe("/api/dashboards/portfolio-map/export.csv?channel=search");
  });

  it("asks the server for the channel in the address", async () => {
    const { calls } = renderApp("/portfolio-map?channel=radio", routes());
    await screen.findByRole("region", { name: "Published run" }, { timeout: 5000 });
    expect(calls.some((call) => call.path === "/api/dashboards/portfolio-map")).toBe(true);
    const fetchMock = globalThis.fetch as unknown as { mock: { calls: [RequestInfo | URL][] } };
    expect(fetchMock.mock.calls.map(([url]) => String(url))).toContain("/api/dashboards/portfolio-map?channel=radio");
  });

  it("shows a market manager only the markets the server sent", async () => {
    renderApp("/portfolio-map", routes(testUsers.market_manager, ["m-bri"]));
    const grid = await screen.findByRole("table", { name: /Brands × markets/ }, { timeout: 5000 });
    expect(within(grid).getAllByRole("columnheader").map((header) => header.textContent)).toEqual(["Brand", "Briskmoor"]);
    expect(document.body.textContent).not.toMatch(/Celowen|Ardeval/);
  });

  it("before any run is published, says so and still shows the data each cell holds", async () => {
    renderApp("/portfolio-map", {
      ...signedInRoutes(testUsers.admin),
      "GET /api/dashboards/status": () =>
        jsonResponse(200, { current: null, firstFit: { runId: "r1", status: "running", fraction: 0.42, etaSeconds: 95, message: "The first fit is running — 42 % done" } }),
    });
    expect(await screen.findByRole("heading", { name: "No published fit yet" }, { timeout: 5000 })).toBeTruthy();
    expect(await screen.findByText("The first fit is running — 42 % done")).toBeTruthy();
    expect(screen.getByRole("progressbar", { name: "First fit" }).getAttribute("aria-valuenow")).toBe("42");
    expect(screen.getByRole("table", { name: /Brands × markets/ }).textContent).toContain("104 weeks");
  });
});

describe("data grid before a fit", () => {
  it("marks cells without data as empty, not zero", () => {
    render(<PortfolioGrid portfolio={testPortfolio()} />);
    const fennick = within(screen.getByRole("table", { name: /Brands × markets/ })).getByRole("row", { name: /Fennick/ });
    const cells = within(fennick).getAllByRole("cell");
    expect(cells[2]?.getAttribute("aria-label")).toBe("Fennick in Celowen: no data");
    expect(screen.queryByText(/^0 weeks/)).toBeNull();
  });
});

import { render, screen, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { testPortfolio } from "../../../../testing/test-utils";
import { PortfolioGrid } from "../portfolio-grid";
import { PortfolioMap } from "../portfolio-map";

describe("portfolio grid", () => {
  it("shows each cell's weeks and first–last week, and marks cells without data as empty, not zero", () => {
    render(<PortfolioGrid portfolio={testPortfolio()} />);
    const grid = screen.getByRole("table", { name: /Brands × markets/ });
    const fennick = within(grid).getByRole("row", { name: /Fennick/ });
    const cells = within(fennick).getAllByRole("cell");
    expect(cells.map((cell) => cell.textContent)).toEqual([
      "104 weeks2 Jan 2023 – 23 Dec 2024",
      "20 weeks5 Aug 2024 – 16 Dec 2024",
      "No data",
    ]);
    expect(cells[2]?.getAttribute("aria-label")).toBe("Fennick in Celowen: no data");
    expect(within(grid).queryByText(/^0 weeks/)).toBeNull();
  });

  it("states a brand's customer value, or that it is not set", () => {
    render(<PortfolioGrid portfolio={testPortfolio()} />);
    expect(screen.getByText("€120 per customer")).toBeTruthy();
    expect(screen.getByText("Customer value not set")).toBeTruthy();
  });
});

describe("portfolio map", () => {
  it("lists the channels and every cell in an exportable table", () => {
    render(<PortfolioMap portfolio={testPortfolio()} scopedToMarkets={false} />);
    const channels = screen.getByRole("region", { name: "Channels" });
    expect(within(channels).getAllByRole("listitem").map((item) => item.textContent)).toEqual(["Search", "Radio"]);
    const table = screen.getByRole("table", { name: "Cells" });
    expect(within(table).getAllByRole("row")).toHaveLength(5);
    expect(screen.getByRole("button", { name: "Export CSV" })).toBeTruthy();
  });

  it("says when no data has been uploaded yet", () => {
    const empty = { ...testPortfolio(), cells: [], datasetVersionId: null };
    render(<PortfolioMap portfolio={empty} scopedToMarkets={false} />);
    expect(screen.getByRole("heading", { name: "No data uploaded yet" })).toBeTruthy();
    expect(screen.getAllByText("No data")).toHaveLength(6);
  });
});

import { fireEvent, render, screen, within } from "@testing-library/react";
import { describe, expect, it, vi } from "vitest";
import "../../../testing/test-utils";
import { DataTable, type DataTableColumn } from "../data-table";
import { toCsv } from "../to-csv";

type Row = { id: string; brand: string; market: string; weeks: number | null };

const rows: Row[] = [
  { id: "1", brand: "Fennick", market: "Ardeval", weeks: 104 },
  { id: "2", brand: "Hollowby", market: "Briskmoor", weeks: null },
  { id: "3", brand: "Alderby", market: "Celowen", weeks: 20 },
  { id: "4", brand: "Marrow, \"Old\"", market: "Ardeval", weeks: 52 },
];

const columns: DataTableColumn<Row>[] = [
  { id: "brand", header: "Brand", value: (row) => row.brand },
  { id: "market", header: "Market", value: (row) => row.market },
  { id: "weeks", header: "Weeks", value: (row) => row.weeks, align: "end" },
];

function renderTable() {
  render(<DataTable caption="Cells" rows={rows} columns={columns} rowKey={(row) => row.id} csvFileName="cells.csv" />);
}

function columnValues(index: number): string[] {
  const table = screen.getByRole("table", { name: "Cells" });
  return within(table)
    .getAllByRole("row")
    .slice(1)
    .map((row) => within(row).getAllByRole("cell")[index]?.textContent ?? "");
}

/** Captures the text of the file the table hands to the browser. */
function captureDownload() {
  const blobs: Blob[] = [];
  const fileNames: string[] = [];
  vi.stubGlobal("URL", Object.assign(Object.create(URL), URL, {
    createObjectURL: (blob: Blob) => {
      blobs.push(blob);
      return "blob:test";
    },
    revokeObjectURL: () => undefined,
  }));
  const click = vi.spyOn(HTMLAnchorElement.prototype, "click").mockImplementation(function (this: HTMLAnchorElement) {
    fileNames.push(this.download);
  });
  return {
    fileNames,
    text: async () => (await (blobs[0] as Blob).text()).replace(/^\ufeff/, ""),
    restore: () => click.mockRestore(),
  };
}

describe("data table", () => {
  it("sorts by a column on click, both ways, keeping empty values last", () => {
    renderTable();
    const weeksButton = screen.getByRole("button", { name: "Weeks" });
    fireEvent.click(weeksButton);
    expect(columnValues(2)).toEqual(["20", "52", "104", "–"]);
    expect(screen.getByRole("columnheader", { name: "Weeks" }).getAttribute("aria-sort")).toBe("ascending");
    fireEvent.click(weeksButton);
    expect(columnValues(2)).toEqual(["104", "52", "20", "–"]);
    expect(screen.getByRole("columnheader", { name: "Weeks" }).getAttribute("aria-sort")).toBe("descending");

    fireEvent.click(screen.getByRole("button", { name: "Brand" }));
    expect(columnValues(0)).toEqual(["Alderby", "Fennick", "Hollowby", 'Marrow, "Old"']);
    expect(screen.getByRole("columnheader", { name: "Weeks" }).getAttribute("aria-sort")).toBeNull();
  });

  it("filters rows by any column's text and says how many are shown", () => {
    renderTable();
    fireEvent.change(screen.getByLabelText("Filter rows"), { target: { value: "ardeval" } });
    expect(columnValues(0)).toEqual(["Fennick", 'Marrow, "Old"']);
    expect(screen.getByText("Showing 2 of 4 rows")).toBeTruthy();
    fireEvent.change(screen.getByLabelText("Filter rows"), { target: { value: "nowhere" } });
    expect(screen.getByText("No rows match the filter.")).toBeTruthy();
    expect((screen.getByRole("button", { name: "Export CSV" }) as HTMLButtonElement).disabled).toBe(true);
  });

  it("exports the rows as shown (filtered and sorted) to CSV", async () => {
    const download = captureDownload();
    try {
      renderTable();
      fireEvent.change(screen.getByLabelText("Filter rows"), { target: { value: "ardeval" } });
      fireEvent.click(screen.getByRole("button", { name: "Weeks" }));
      fireEvent.click(screen.getByRole("button", { name: "Export CSV" }));
      expect(download.fileNames).toEqual(["cells.csv"]);
      expect(await download.text()).toBe('Brand,Market,Weeks\r\n"Marrow, ""Old""",Ardeval,52\r\nFennick,Ardeval,104');
    } finally {
      download.restore();
    }
  });
});

describe("data table pages and export-only columns", () => {
  it("shows a page at a time, keeps sorting across pages, and exports every row", async () => {
    const download = captureDownload();
    try {
      render(<DataTable caption="Cells" rows={rows} columns={columns} rowKey={(row) => row.id} csvFileName="cells.csv" pageSize={3} initialSort={{ id: "brand" }} />);
      expect(columnValues(0)).toEqual(["Alderby", "Fennick", "Hollowby"]);
      expect(screen.getByText("4 rows · page 1 of 2")).toBeTruthy();
      const pages = screen.getByRole("navigation", { name: "Pages of Cells" });
      expect((within(pages).getByRole("button", { name: "Previous page" }) as HTMLButtonElement).disabled).toBe(true);
      fireEvent.click(within(pages).getByRole("button", { name: "Next page" }));
      expect(columnValues(0)).toEqual(['Marrow, "Old"']);
      fireEvent.click(screen.getByRole("button", { name: "Export CSV" }));
      expect((await download.text()).split("\r\n")).toHaveLength(5);
      // Filtering starts again at the first page.
      fireEvent.change(screen.getByLabelText("Filter rows"), { target: { value: "e" } });
      expect(columnValues(0)).toEqual(["Alderby", "Fennick", 'Marrow, "Old"']);
    } finally {
      download.restore();
    }
  });

  it("leaves an export-only column off the screen but puts it in the CSV", async () => {
    const download = captureDownload();
    try {
      const withCode: DataTableColumn<Row>[] = [...columns, { id: "code", header: "Code", value: (row) => `cell-${row.id}`, csvOnly: true }];
      render(<DataTable caption="Cells" rows={rows.slice(0, 1)} columns={withCode} rowKey={(row) => row.id} csvFileName="cells.csv" />);
      expect(screen.queryByRole("columnheader", { name: "Code" })).toBeNull();
      expect(screen.getAllByRole("cell")).toHaveLength(3);
      fireEvent.click(screen.getByRole("button", { name: "Export CSV" }));
      expect(await download.text()).toBe("Brand,Market,Weeks,Code\r\nFennick,Ardeval,104,cell-1");
    } finally {
      download.restore();
    }
  });
});

describe("toCsv", () => {
  it("quotes separators and quotes, leaves empty values empty, and defuses spreadsheet formulas", () => {
    const csv = toCsv(["name", "value"], [
      ["plain", 1.5],
      ['with "quote", and comma', null],
      ["=SUM(A1:A2)", -3],
    ]);
    expect(csv).toBe('name,value\r\nplain,1.5\r\n"with ""quote"", and comma",\r\n"\'=SUM(A1:A2)",-3');
  });
});

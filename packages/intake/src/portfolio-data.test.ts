import type { ColumnMapping } from "@tributary/contracts";
import { describe, expect, it } from "vitest";
import { parseCsvText } from "./csv-text";
import { readFixture } from "./fixtures/load-fixture";
import { TABLE_HEADER, TABLE_MAPPING, tableRows } from "./fixtures/tidy-table";
import { toPortfolioData } from "./portfolio-data";
import { readTidyCsv } from "./tidy-csv";

const smallMapping: ColumnMapping = {
  week: "week",
  brand: "brand",
  market: "market",
  outcome: "new_customers",
  channels: [
    { column: "spend_tv", channel: "tv" },
    { column: "spend_search", channel: "search" },
    { column: "spend_social", channel: "social" },
  ],
  controls: ["control_price_index"],
  ignored: ["notes"],
};

describe("toPortfolioData", () => {
  it("builds the model's data from the valid fixture: cells sorted by brand then market, weeks consecutive", () => {
    const csv = parseCsvText(readFixture("valid-small.csv"));
    if (!csv.ok) throw new Error("fixture unreadable");
    const result = toPortfolioData(csv.header, csv.rows, smallMapping, { rowNumbers: csv.rowNumbers });
    if (!result.ok) throw new Error(result.report.errors.map((e) => e.message).join(" | "));
    const { data } = result;
    expect(data.channels).toEqual(["tv", "search", "social"]);
    expect(data.controls).toEqual(["control_price_index"]);
    expect(data.cells.map((c) => [c.brand, c.market, c.firstWeek, c.outcome.length])).toEqual([
      ["Fernhollow", "Varnland", "2024-01-01", 12],
      ["Fernhollow", "Ølmark", "2024-01-15", 10],
      ["Quillon", "Varnland", "2024-01-01", 12],
    ]);
    const [fv, fo, qv] = data.cells;
    // Values read from the fixture's rows 14, 15, 25, 26, 27 and 13.
    expect(fv?.outcome[0]).toBe(409);
    expect(fv?.outcome[1]).toBe(423);
    expect(fv?.spend[0]?.[11]).toBe(0);
    expect(fv?.spend[1]?.[11]).toBe(935);
    expect(fo?.outcome.subarray(0, 3)).toEqual(Float64Array.from([139, 153, 144]));
    expect(fo?.spend[2]?.[1]).toBe(144);
    expect(fo?.controls[0]?.[2]).toBe(1.14);
    expect(qv?.outcome[11]).toBe(315);
    for (const cell of data.cells) {
      expect(cell.outcome).toBeInstanceOf(Float64Array);
      expect(cell.spend).toHaveLength(3);
      expect(cell.controls).toHaveLength(1);
      for (const series of [...cell.spend, ...cell.controls]) expect(series).toHaveLength(cell.outcome.length);
    }
  });

  it("gives the same data whatever the row order", () => {
    const rows = tableRows([
      { brand: "Quillon", market: "Varnland", firstWeek: "2024-01-01", weeks: 30 },
      { brand: "Fernhollow", market: "Seloria", firstWeek: "2024-03-04", weeks: 20 },
      { brand: "Fernhollow", market: "Kettmoor", firstWeek: "2023-11-06", weeks: 40 },
    ]);
    const ordered = toPortfolioData([...TABLE_HEADER], rows, TABLE_MAPPING);
    const shuffled = toPortfolioData([...TABLE_HEADER], [...rows].sort((a, b) => (a[4]! < b[4]! ? -1 : 1)), TABLE_MAPPING);
    if (!ordered.ok || !shuffled.ok) throw new Error("expected data");
    expect(shuffled.data).toEqual(ordered.data);
    expect(ordered.data.cells.map((c) => `${c.brand} × ${c.market} ${c.firstWeek}`)).toEqual([
      "Fernhollow × Kettmoor 2023-11-06",
      "Fernhollow × Seloria 2024-03-04",
      "Quillon × Varnland 2024-01-01",
    ]);
  });

  it("returns no data while there are errors, and data when there are only warnings", () => {
    const rows = tableRows([{ brand: "Quillon", market: "Varnland", firstWeek: "2024-01-01", weeks: 12 }]);
    const warned = toPortfolioData([...TABLE_HEADER], rows, TABLE_MAPPING);
    expect(warned.ok).toBe(true);
    expect(warned.report.warningCount).toBe(1);
    rows[3]![5] = "-20";
    const failed = toPortfolioData([...TABLE_HEADER], rows, TABLE_MAPPING);
    expect(failed.ok).toBe(false);
    expect("data" in failed).toBe(false);
    expect(failed.report.errors[0]?.code).toBe("negative_spend");
  });
});

describe("readTidyCsv", () => {
  it("reads, guesses the mapping and builds the data in one step (the fit command's path)", () => {
    const result = readTidyCsv(readFixture("valid-small.csv"));
    if (!result.ok) throw new Error(result.report.errors.map((e) => e.message).join(" | "));
    expect(result.mapping).toEqual(smallMapping);
    expect(result.data.cells).toHaveLength(3);
    expect(result.report.warnings[0]).toMatchObject({ code: "column_ignored", message: 'Not used: "notes".' });
  });

  it("gives the same data as the step-by-step path with the given mapping", () => {
    const text = readFixture("valid-small.csv");
    const oneStep = readTidyCsv(text, { mapping: smallMapping });
    const csv = parseCsvText(text);
    if (!csv.ok || !oneStep.ok) throw new Error("expected data");
    const stepwise = toPortfolioData(csv.header, csv.rows, smallMapping, { rowNumbers: csv.rowNumbers });
    if (!stepwise.ok) throw new Error("expected data");
    expect(oneStep.data).toEqual(stepwise.data);
  });

  it("stops at the file when it cannot be read", () => {
    const result = readTidyCsv(readFixture("not-a-csv.pdf"));
    expect(result.ok).toBe(false);
    expect(result.header).toBeNull();
    expect(result.report.errors[0]?.code).toBe("not_csv");
  });

  it("asks for the roles it cannot guess", () => {
    const result = readTidyCsv("week,brand,market,visits,orders_value,spend_tv\n2024-01-01,Quillon,Varnland,1,2,3\n");
    expect(result.ok).toBe(false);
    expect(result.report.errors).toEqual([
      {
        severity: "error",
        code: "mapping_incomplete",
        row: null,
        column: null,
        message: 'Several columns could be the outcome ("visits" and "orders_value"); choose one, or name it "outcome".',
      },
    ]);
    expect(result.mapping).toMatchObject({ outcome: null, week: "week" });
  });

  it("uses the file's own row numbers, blank rows counted", () => {
    const lines = ["week,brand,market,outcome,spend_tv", ""];
    for (const row of tableRows([{ brand: "Quillon", market: "Varnland", firstWeek: "2024-01-01", weeks: 10 }])) lines.push(row.slice(0, 5).join(","));
    lines[8] = lines[8]!.replace(/,\d+$/, ",-5");
    const result = readTidyCsv(lines.join("\n"));
    expect(result.ok).toBe(false);
    // Header row 1, blank row 2, so the seventh data row is row 9.
    expect(result.report.errors.map((e) => [e.code, e.row])).toEqual([["negative_spend", 9]]);
  });
});

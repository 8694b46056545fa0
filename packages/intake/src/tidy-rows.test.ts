import type { ColumnMapping, IntakeIssue, ValidationReport } from "@tributary/contracts";
import { describe, expect, it } from "vitest";
import { parseCsvText } from "./csv-text";
import { readFixture } from "./fixtures/load-fixture";
import { TABLE_HEADER, TABLE_MAPPING, tableRows, type TableCell } from "./fixtures/tidy-table";
import { validateTidyRows } from "./tidy-rows";

/** Validates a fixture file with the standard mapping (TABLE_MAPPING fits every base-derived fixture). */
function validateFixture(name: string, mapping: ColumnMapping = TABLE_MAPPING): ValidationReport {
  const csv = parseCsvText(readFixture(name));
  if (!csv.ok) throw new Error(csv.report.errors.map((e) => e.message).join(" | "));
  return validateTidyRows(csv.header, csv.rows, mapping, { rowNumbers: csv.rowNumbers });
}

function validateCells(cells: readonly TableCell[], edit?: (rows: string[][]) => void): ValidationReport {
  const rows = tableRows(cells);
  edit?.(rows);
  return validateTidyRows([...TABLE_HEADER], rows, TABLE_MAPPING);
}

const brief = (issues: readonly IntakeIssue[]) => issues.map((i) => [i.code, i.row, i.column]);
const codes = (issues: readonly IntakeIssue[]) => issues.map((i) => i.code);

const cell = (brand: string, market: string, weeks: number, extra: Partial<TableCell> = {}): TableCell => ({
  brand,
  market,
  firstWeek: "2024-01-01",
  weeks,
  ...extra,
});

describe("validateTidyRows on the fixtures", () => {
  it("passes the valid fixtures", () => {
    const report = validateFixture("base-two-cells.csv");
    expect(report.ok).toBe(true);
    expect(report.errors).toEqual([]);
    expect(codes(report.warnings)).toEqual(["cell_short", "cell_short"]);
    expect(report.warnings[0]?.message).toBe("Fernhollow × Varnland has 10 weeks of data (fewer than 26); its estimates will lean heavily on the portfolio.");
  });

  it("names every non-numeric value with its row, column and a hint", () => {
    const report = validateFixture("bad-types.csv");
    expect(brief(report.errors)).toEqual([
      ["not_a_number", 3, "new_customers"],
      ["not_a_number", 4, "spend_tv"],
      ["formula", 5, "spend_search"],
      ["not_finite", 6, "new_customers"],
      ["not_finite", 7, "spend_tv"],
      ["not_finite", 8, "spend_search"],
      ["not_a_number", 9, "new_customers"],
      ["value_missing", 10, "spend_tv"],
      ["formula", 11, "spend_search"],
    ]);
    const messages = report.errors.map((e) => e.message);
    expect(messages[0]).toBe('Row 3: "new_customers" holds "abc", which is not a number; expected a number such as 1250 or 1250.75.');
    expect(messages[1]).toBe('Row 4: "spend_tv" holds "$1,200", which is not a number; remove the currency symbol.');
    expect(messages[2]).toBe('Row 5: "spend_search" holds "=SUM(E2:E4)", which looks like a spreadsheet formula, not a number. Paste the values instead.');
    expect(messages[5]).toBe('Row 8: "spend_search" holds "1e400", which is not a finite number.');
    expect(messages[6]).toMatch(/^Row 9: .*without thousands separators/);
    expect(messages[7]).toBe('Row 10: "spend_tv" is empty. Enter 0 for a week without spend.');
    expect(report.ok).toBe(false);
  });

  it("rejects negative spend and a negative outcome", () => {
    const report = validateFixture("bad-negative.csv");
    expect(brief(report.errors)).toEqual([
      ["negative_spend", 5, "spend_tv"],
      ["negative_outcome", 14, "new_customers"],
    ]);
    expect(report.errors[0]?.message).toBe('Row 5: spend in "spend_tv" is -150; spend cannot be negative.');
  });

  it("finds a repeated week even when the brand is spelled differently, and warns about the spelling", () => {
    const report = validateFixture("bad-duplicates.csv");
    expect(brief(report.errors)).toEqual([["duplicate_row", 22, "week"]]);
    expect(report.errors[0]?.message).toBe("Row 22 repeats week 2024-01-15 for fernhollow × Varnland (first given in row 4).");
    const variants = report.warnings.filter((w) => w.code === "name_variants");
    expect(variants).toHaveLength(1);
    expect(variants[0]?.row).toBe(22);
    expect(variants[0]?.message).toBe(
      'The brand is written 2 ways: "Fernhollow" (10 rows, first in row 2) and "fernhollow" (1 row, first in row 22). They are read as one brand, "Fernhollow".',
    );
  });

  it("names the cell and the missing Mondays of each gap", () => {
    const report = validateFixture("bad-gaps.csv");
    expect(brief(report.errors)).toEqual([
      ["week_gap", 5, "week"],
      ["week_gap", 12, "week"],
    ]);
    expect(report.errors[0]?.message).toBe(
      "Fernhollow × Varnland has no rows for 2 weeks between its first and last week: 2024-01-22 to 2024-01-29 (2 weeks). Every week from a cell's first to its last needs a row (enter 0 for weeks without spend).",
    );
    expect(report.errors[1]?.message).toMatch(/^Quillon × Varnland has no rows for 1 week between its first and last week: 2024-01-15\./);
  });

  it("rejects a date that is not a Monday, naming the row and the Monday of its week", () => {
    const report = validateFixture("bad-not-monday.csv");
    expect(report.errors).toEqual([
      {
        severity: "error",
        code: "date_not_monday",
        row: 6,
        column: "week",
        message: "Row 6: the week 2024-02-01 is a Thursday; weeks are named by their Monday (the Monday of that week is 2024-01-29).",
      },
    ]);
  });

  it("says once, first, when every date is on the same other weekday", () => {
    const report = validateFixture("bad-sunday-weeks.csv");
    expect(report.errors[0]).toMatchObject({ code: "date_not_monday", row: null });
    expect(report.errors[0]?.message).toBe('Every date in "week" is a Sunday. Tributary names each week by its Monday: shift the dates to the Monday that starts each week.');
    expect(report.errorCount).toBe(21);
    expect(report.errors).toHaveLength(20);
  });

  it("explains invalid dates", () => {
    const report = validateFixture("bad-dates.csv");
    expect(brief(report.errors)).toEqual([
      ["date_invalid", 3, "week"],
      ["date_invalid", 4, "week"],
      ["date_invalid", 5, "week"],
      ["value_missing", 6, "week"],
      ["week_gap", 7, "week"],
      ["cell_too_short", null, null],
    ]);
    expect(report.errors[0]?.message).toBe('Row 3: the week "2024-02-30" is not a real calendar date (or lies outside 1900–2100).');
    expect(report.errors[1]?.message).toMatch(/ambiguous/);
    expect(report.errors[2]?.message).toMatch(/has a time in it/);
    expect(report.errors[4]?.message).toBe(
      "Fernhollow × Varnland has no rows for 4 weeks between its first and last week: 2024-01-08 to 2024-01-29 (4 weeks). Every week from a cell's first to its last needs a row (enter 0 for weeks without spend) (4 rows could not be placed in a cell because of the week, brand or market errors above; fixing them may settle this).",
    );
  });

  it("rejects overlong names and numbers, keeping the messages short", () => {
    const report = validateFixture("bad-long-cells.csv");
    expect(brief(report.errors)).toEqual([
      ["name_invalid", 3, "brand"],
      ["not_finite", 4, "spend_tv"],
      ["name_invalid", 5, "market"],
      ["week_gap", 4, "week"],
    ]);
    expect(report.errors[0]?.message).toMatch(/is longer than 100 characters/);
    expect(report.errors[1]?.message).toContain("(5000 characters)");
    for (const e of report.errors) expect(e.message.length).toBeLessThan(400);
  });

  it("rejects numbers beyond a sane magnitude", () => {
    const report = validateFixture("bad-huge-numbers.csv");
    expect(brief(report.errors)).toEqual([
      ["number_too_large", 3, "spend_tv"],
      ["number_too_large", 4, "new_customers"],
      ["number_too_large", 5, "spend_search"],
    ]);
    expect(report.errors[0]?.message).toBe('Row 3: "spend_tv" is 2,000,000,000,000, beyond the largest accepted magnitude (1,000,000,000,000); check for a typo.');
  });

  it("rejects a cell too short to fit", () => {
    const report = validateFixture("bad-short-cell.csv");
    expect(report.errors).toEqual([
      { severity: "error", code: "cell_too_short", row: null, column: null, message: "Quillon × Varnland has only 5 weeks of data; at least 8 are needed to fit a cell." },
    ]);
  });

  it("reads Unicode names, composed or not, and merges differing case with a warning", () => {
    const report = validateFixture("unicode-names.csv");
    expect(report.errors).toEqual([]);
    expect(report.summary?.cells.map((c) => `${c.brand} × ${c.market}`)).toEqual(["Zoë Lumen × Östervik", "Zoë Lumen × Ølmark", "東灯 × Ølmark"]);
    expect(report.summary?.brands).toEqual(["Zoë Lumen", "東灯"]);
    const variants = report.warnings.filter((w) => w.code === "name_variants");
    expect(variants.map((w) => w.message)).toEqual([
      'The market is written 2 ways: "Östervik" (8 rows, first in row 2) and "ÖSTERVIK" (1 row, first in row 6). They are read as one market, "Östervik".',
    ]);
  });
});

describe("validateTidyRows checks", () => {
  it("sorts rows given in any order into cells and summarises them", () => {
    const rows = tableRows([cell("Quillon", "Varnland", 30), cell("Fernhollow", "Varnland", 28, { firstWeek: "2024-01-15" })]);
    rows.reverse();
    const report = validateTidyRows([...TABLE_HEADER], rows, TABLE_MAPPING);
    expect(report.errors).toEqual([]);
    expect(report.warnings).toEqual([]);
    expect(report.summary).toMatchObject({
      rows: 58,
      brands: ["Fernhollow", "Quillon"],
      markets: ["Varnland"],
      channels: ["tv", "search"],
      controls: [],
      firstWeek: "2024-01-01",
      lastWeek: "2024-07-22",
    });
    expect(report.summary?.cells).toEqual([
      { brand: "Fernhollow", market: "Varnland", firstWeek: "2024-01-15", lastWeek: "2024-07-22", weeks: 28, rows: 28 },
      { brand: "Quillon", market: "Varnland", firstWeek: "2024-01-01", lastWeek: "2024-07-22", weeks: 30, rows: 30 },
    ]);
    const expectedOutcome = rows.reduce((sum, row) => sum + Number(row[3]), 0);
    const expectedTv = rows.reduce((sum, row) => sum + Number(row[4]), 0);
    expect(report.summary?.totals.outcome).toBe(expectedOutcome);
    expect(report.summary?.totals.spend[0]).toEqual({ channel: "tv", total: expectedTv });
  });

  it("draws the line for cell length at 8 (error) and 26 (warning) weeks", () => {
    const lengths = (weeks: number) => validateCells([cell("Quillon", "Varnland", weeks)]);
    expect(codes(lengths(7).errors)).toEqual(["cell_too_short"]);
    expect(codes(lengths(8).errors)).toEqual([]);
    expect(codes(lengths(8).warnings)).toEqual(["cell_short"]);
    expect(codes(lengths(25).warnings)).toEqual(["cell_short"]);
    expect(codes(lengths(26).warnings)).toEqual([]);
  });

  it("warns when the first or last week of a cell looks partial", () => {
    const report = validateCells([cell("Quillon", "Varnland", 30, { outcome: (t) => (t === 0 ? 40 : t === 29 ? 120 : 300 + (t % 5)) })]);
    expect(report.errors).toEqual([]);
    expect(brief(report.warnings)).toEqual([
      ["partial_week", 2, "new_customers"],
      ["partial_week", 31, "new_customers"],
    ]);
    expect(report.warnings[0]?.message).toBe(
      "Row 2: the first week of Quillon × Varnland (2024-01-01) has an outcome of 40, under 50 % of the cell's median week (302). It may be a partial week; leave it out if so.",
    );
  });

  it("flags outcome spikes by robust z-score, both up and down", () => {
    const report = validateCells([cell("Quillon", "Varnland", 30, { outcome: (t) => (t === 10 ? 5000 : t === 20 ? 20 : 300 + ((t * 7) % 11)) })]);
    expect(brief(report.warnings)).toEqual([
      ["spike", 12, "new_customers"],
      ["spike", 22, "new_customers"],
    ]);
    expect(report.warnings[0]?.message).toMatch(/^Row 12: the outcome of Quillon × Varnland in week 2024-03-11 is 5,000, far from its typical week \(median 305, robust z-score [\d,.]+\)\. Check it is not a typo\.$/);
  });

  it("does not call ordinary variation or flighted spend a spike", () => {
    const report = validateCells([
      cell("Quillon", "Varnland", 52, {
        outcome: (t) => 300 + 80 * Math.sin(t / 4),
        tv: (t) => (t % 4 === 0 ? 0 : t % 8 < 4 ? 1000 : 3000),
        search: (t) => (t < 20 ? 0 : 500 + (t % 3) * 50),
      }),
    ]);
    expect(report.warnings).toEqual([]);
  });

  it("flags a spend spike, judged among the weeks with spend, even when spend is otherwise constant", () => {
    const report = validateCells([
      cell("Quillon", "Varnland", 30, { tv: (t) => (t % 2 === 0 ? 0 : t === 15 ? 50_000 : 1800 + (t % 7) * 20), search: (t) => (t === 5 ? 1500 : 1000) }),
    ]);
    expect(brief(report.warnings)).toEqual([
      ["spike", 17, "spend_tv"],
      ["spike", 7, "spend_search"],
    ]);
    expect(report.warnings[0]?.message).toMatch(/^Row 17: spend on tv for Quillon × Varnland in week 2024-04-15 is 50,000, far above its typical week with spend/);
  });

  it("warns about channels without spend, in one cell or everywhere", () => {
    const oneCell = validateCells([cell("Quillon", "Varnland", 30), cell("Fernhollow", "Varnland", 30, { search: () => 0 })]);
    expect(oneCell.warnings).toEqual([
      {
        severity: "warning",
        code: "channel_no_spend",
        row: null,
        column: "spend_search",
        message: "Fernhollow × Varnland has no spend on search in any week; the model will take the channel as absent there.",
      },
    ]);
    const everywhere = validateCells([cell("Quillon", "Varnland", 30, { tv: () => 0 }), cell("Fernhollow", "Varnland", 30, { tv: () => 0 })]);
    expect(everywhere.warnings.map((w) => w.message)).toEqual(["No cell has any spend on tv; the model cannot learn its effect. Consider leaving the column out."]);
  });

  it("warns when a cell's outcome is zero every week", () => {
    const report = validateCells([cell("Quillon", "Varnland", 30, { outcome: () => 0 })]);
    expect(codes(report.warnings)).toEqual(["outcome_all_zero"]);
  });

  it("trims names silently, merges differing case with a warning, and picks the most used spelling", () => {
    const report = validateCells([cell("Quillon", "Varnland", 30)], (rows) => {
      rows[0]![1] = "  Quillon ";
      rows[3]![1] = "QUILLON";
      rows[4]![2] = "varnland";
    });
    expect(report.errors).toEqual([]);
    expect(report.summary?.cells.map((c) => [c.brand, c.market, c.weeks])).toEqual([["Quillon", "Varnland", 30]]);
    expect(brief(report.warnings)).toEqual([
      ["name_variants", 5, "brand"],
      ["name_variants", 6, "market"],
    ]);
  });

  it("rejects empty names and names a spreadsheet would run as a formula", () => {
    const report = validateCells([cell("Quillon", "Varnland", 30)], (rows) => {
      rows[0]![1] = "";
      rows[1]![1] = '=HYPERLINK("http://example.invalid","x")';
      rows[2]![2] = "@Varnland";
      rows[3]![2] = "-Varnland";
      rows[4]![1] = "Quil\u0085lon";
    });
    expect(brief(report.errors).slice(0, 5)).toEqual([
      ["value_missing", 2, "brand"],
      ["name_invalid", 3, "brand"],
      ["name_invalid", 4, "market"],
      ["name_invalid", 5, "market"],
      ["name_invalid", 6, "brand"],
    ]);
    expect(report.errors[1]?.message).toBe(`Row 3: the brand "=HYPERLINK(\\"http://example.invalid\\",\\"x\\")" starts with "=", which spreadsheets read as a formula.`.replace(/\\"/g, '"'));
  });

  it("accepts negative controls but not missing or formula controls", () => {
    const header = [...TABLE_HEADER, "control_temperature"];
    const mapping: ColumnMapping = { ...TABLE_MAPPING, controls: ["control_temperature"] };
    const rows = tableRows([cell("Quillon", "Varnland", 30)]).map((row, t) => [...row, String(-5 + t * 0.5)]);
    expect(validateTidyRows(header, rows, mapping).errors).toEqual([]);
    rows[2]![6] = "";
    rows[3]![6] = "-A1";
    expect(brief(validateTidyRows(header, rows, mapping).errors)).toEqual([
      ["value_missing", 4, "control_temperature"],
      ["formula", 5, "control_temperature"],
    ]);
  });

  it("uses the spreadsheet row numbers it is given", () => {
    const rows = tableRows([cell("Quillon", "Varnland", 30)]);
    rows[2]![4] = "-1";
    const rowNumbers = rows.map((_, i) => i + 10);
    const report = validateTidyRows([...TABLE_HEADER], rows, TABLE_MAPPING, { rowNumbers });
    expect(report.errors[0]?.row).toBe(12);
    expect(report.errors[0]?.message).toMatch(/^Row 12:/);
  });

  it("rejects rows whose length differs from the header", () => {
    const rows = tableRows([cell("Quillon", "Varnland", 30)]);
    rows[4] = rows[4]!.slice(0, 3);
    const report = validateTidyRows([...TABLE_HEADER], rows, TABLE_MAPPING);
    expect(brief(report.errors)).toEqual([
      ["column_count", 6, null],
      ["week_gap", 7, "week"],
    ]);
    // A row too short to read is not counted as unplaced: it is not read at all.
    expect(report.errors[1]?.message).not.toMatch(/could not be placed/);
  });

  it("reports an invalid mapping instead of validating rows", () => {
    const report = validateTidyRows([...TABLE_HEADER], tableRows([cell("Quillon", "Varnland", 30)]), { ...TABLE_MAPPING, outcome: "visits" });
    expect(codes(report.errors)).toEqual(["column_unknown"]);
    expect(report.summary).toBeNull();
  });

  it("caps the listed issues of one kind while counting them all", () => {
    const cells = ["Varnland", "Seloria", "Kettmoor", "Pellardy", "Ostravel", "Miravon"].flatMap((market) =>
      ["Fernhollow", "Quillon", "Brightwick"].map((brand) => cell(brand, market, 156, { tv: () => -1 })),
    );
    const report = validateCells(cells);
    expect(report.errorCount).toBe(2808);
    expect(report.errors).toHaveLength(20);
    expect(report.counts).toContainEqual({ severity: "error", code: "negative_spend", count: 2808, shown: 20 });
    const fewer = validateTidyRows([...TABLE_HEADER], tableRows(cells), TABLE_MAPPING, { maxIssuesPerKind: 3 });
    expect(fewer.warnings.length).toBeLessThanOrEqual(3 * fewer.counts.filter((c) => c.severity === "warning").length);
  });
});

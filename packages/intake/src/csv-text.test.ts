import { describe, expect, it } from "vitest";
import { parseCsvText, utf8ByteLength, type CsvTextResult } from "./csv-text";
import { readFixture } from "./fixtures/load-fixture";

function rejected(result: CsvTextResult) {
  if (result.ok) throw new Error("expected the text to be rejected");
  return result.report;
}

function accepted(result: CsvTextResult) {
  if (!result.ok) throw new Error(`expected the text to be read: ${result.report.errors.map((e) => e.message).join(" | ")}`);
  return result;
}

describe("parseCsvText", () => {
  it("reads the valid fixture: header, rows, quoted commas and doubled quotes, CRLF", () => {
    const csv = accepted(parseCsvText(readFixture("valid-small.csv")));
    expect(csv.header).toEqual(["week", "brand", "market", "new_customers", "spend_tv", "spend_search", "spend_social", "control_price_index", "notes"]);
    expect(csv.rows).toHaveLength(34);
    expect(csv.rowNumbers[0]).toBe(2);
    expect(csv.rowNumbers[33]).toBe(35);
    expect(csv.rows[3]?.[8]).toBe("promo, spring");
    expect(csv.rows[20]?.[8]).toBe('said "hold"');
    expect(csv.rows.every((row) => row.length === 9)).toBe(true);
    expect(csv.rows.some((row) => row.some((cell) => cell.includes("\r")))).toBe(false);
  });

  it("drops a byte-order mark and accepts LF, CRLF, CR and mixed line endings alike", () => {
    const expected = { header: ["a", "b"], rows: [["1", "2"], ["3", "4"]], rowNumbers: [2, 3] };
    for (const text of ["\ufeffa,b\n1,2\n3,4\n", "a,b\r\n1,2\r\n3,4\r\n", "a,b\r1,2\r3,4", "a,b\r\n1,2\n3,4\r"]) {
      const csv = accepted(parseCsvText(text));
      expect({ header: csv.header, rows: csv.rows, rowNumbers: csv.rowNumbers }).toEqual(expected);
    }
  });

  it("keeps line breaks and commas inside quoted values", () => {
    const csv = accepted(parseCsvText('name,note\n"Quillon, Ltd","line one\r\nline two"\nx,y\n'));
    expect(csv.rows).toEqual([
      ["Quillon, Ltd", "line one\nline two"],
      ["x", "y"],
    ]);
    // The quoted value spans two lines but is one spreadsheet row.
    expect(csv.rowNumbers).toEqual([2, 3]);
  });

  it("skips blank rows but keeps counting them, as a spreadsheet shows them", () => {
    const csv = accepted(parseCsvText("a,b\n1,2\n\n , \n3,4\n,\n"));
    expect(csv.rows).toEqual([
      ["1", "2"],
      ["3", "4"],
    ]);
    expect(csv.rowNumbers).toEqual([2, 5]);
  });

  it("drops trailing unnamed columns that are empty (a spreadsheet export habit)", () => {
    const csv = accepted(parseCsvText("a,b,,\n1,2,,\n3,4\n"));
    expect(csv.header).toEqual(["a", "b"]);
    expect(csv.rows).toEqual([
      ["1", "2"],
      ["3", "4"],
    ]);
  });

  it.each(["", "   \n\n", "\ufeff", "\ufeff\r\n"])("calls %j an empty file", (text) => {
    const report = rejected(parseCsvText(text));
    expect(report.errors.map((e) => e.code)).toEqual(["file_empty"]);
    expect(report.errors[0]?.message).toBe("The file is empty.");
  });

  it("rejects a header without data rows", () => {
    const report = rejected(parseCsvText("week,brand,market\n\n"));
    expect(report.errors[0]?.code).toBe("no_data_rows");
  });

  it.each([
    ["not-a-csv.pdf", /PDF document/],
    ["not-a-csv.xlsx", /zip archive.*xlsx/],
  ])("recognises %s as not a CSV", (name, message) => {
    const report = rejected(parseCsvText(readFixture(name)));
    expect(report.errors[0]?.code).toBe("not_csv");
    expect(report.errors[0]?.message).toMatch(message);
  });

  it("recognises other binary and non-CSV text", () => {
    const cases: [string, string, RegExp][] = [
      ["\u00d0\u00cf\u0011\u00e0\u00a1\u00b1", "not_csv", /old Excel/],
      ["\ufffd\ufffd\u0011\ufffd\ufffd", "not_csv", /old Excel/],
      ["\u001f\ufffd\b\u0000", "not_csv", /gzip/],
      ["<!DOCTYPE html><html></html>", "not_csv", /web page/],
      ['[{"week":"2024-01-01"}]', "not_csv", /JSON/],
      ["week,brand\n2024-01-01,Qu\u0000illon\n", "not_csv", /NUL bytes/],
      ["week,brand\n2024-01-01,Quill\ufffdn\n", "not_utf8", /Line 2 .*UTF-8/],
      ["week,brand\n2024-01-01,Quillon\n2024-01-08,Qui\u0007llon\n", "control_characters", /Line 3/],
    ];
    for (const [text, code, message] of cases) {
      const report = rejected(parseCsvText(text));
      expect(report.errors[0]?.code, text).toBe(code);
      expect(report.errors[0]?.message).toMatch(message);
    }
  });

  it("names the rows whose column count differs from the header", () => {
    const report = rejected(parseCsvText(readFixture("bad-column-count.csv")));
    expect(report.errors.map((e) => [e.code, e.row])).toEqual([
      ["column_count", 5],
      ["column_count", 9],
    ]);
    expect(report.errors[0]?.message).toBe("Row 5 has 7 values but the header has 6 columns.");
    expect(report.errors[1]?.message).toBe("Row 9 has 5 values but the header has 6 columns.");
  });

  it("names the row with malformed quoting", () => {
    const report = rejected(parseCsvText(readFixture("bad-quotes.csv")));
    expect(report.errors[0]?.code).toBe("malformed_quotes");
    expect(report.errors[0]?.row).toBe(4);
    expect(report.errors[0]?.message).toMatch(/^Row 4 has a quoted value with text after its closing quote/);

    const open = rejected(parseCsvText('a,b\n1,2\n3,"4\n5,6\n'));
    expect(open.errors[0]).toMatchObject({ code: "malformed_quotes", row: 3 });
    expect(open.errors[0]?.message).toMatch(/never closed/);
  });

  it("explains semicolon- and tab-separated files", () => {
    expect(rejected(parseCsvText("week;brand\n2024-01-01;Quillon\n")).errors[0]?.message).toMatch(/semicolons/);
    expect(rejected(parseCsvText("week\tbrand\n2024-01-01\tQuillon\n")).errors[0]?.message).toMatch(/tabs/);
  });

  it("rejects unnamed, overlong and repeated column names (case does not count)", () => {
    const report = rejected(parseCsvText(`week,,Brand,brand,${"c".repeat(201)}\n1,2,3,4,5\n`));
    expect(report.errors.map((e) => e.code)).toEqual(["header_invalid", "header_invalid", "header_invalid"]);
    expect(report.errors[0]?.message).toBe("Column 2 has no name in the header row. Give every column a name.");
    expect(report.errors[1]?.message).toBe('The column name "brand" appears twice (columns 3 and 4); column names must differ (case does not count).');
    expect(report.errors[2]?.message).toMatch(/Column 5 has a name longer than 200/);
  });

  it("enforces the size and column limits", () => {
    const text = "a,b\n1,2\n";
    expect(parseCsvText(text, { maxBytes: 8 }).ok).toBe(true);
    const big = rejected(parseCsvText(text, { maxBytes: 7 }));
    expect(big.errors[0]).toMatchObject({ code: "file_too_large", message: "The file is 8 bytes; the largest accepted is 7 bytes." });
    // "é" is two bytes in UTF-8: the limit counts bytes, not characters.
    expect(rejected(parseCsvText("a,b\né,2\n", { maxBytes: 8 })).errors[0]?.code).toBe("file_too_large");
    const wide = rejected(parseCsvText("a,b,c\n1,2,3\n", { maxColumns: 2 }));
    expect(wide.errors[0]?.code).toBe("too_many_columns");
  });

  it("counts UTF-8 bytes like an encoder does", () => {
    const encoder = new TextEncoder();
    for (const text of ["", "abc", "Zoë", "東灯", "😀 emoji", "Ølmark, \u0301", "\ud800 lone surrogate"]) {
      expect(utf8ByteLength(text), text).toBe(encoder.encode(text).length);
    }
  });

  it("lists at most 20 errors of a kind but counts them all", () => {
    const lines = ["a,b"];
    for (let i = 0; i < 1000; i++) lines.push("1,2,3");
    const report = rejected(parseCsvText(lines.join("\n")));
    expect(report.errors).toHaveLength(20);
    expect(report.errorCount).toBe(1000);
    expect(report.counts).toEqual([{ severity: "error", code: "column_count", count: 1000, shown: 20 }]);
    expect(report.errors[19]?.row).toBe(21);
  });

  it("reads very long values (they are judged later, by the row checks)", () => {
    const csv = accepted(parseCsvText(readFixture("bad-long-cells.csv")));
    expect(csv.rows[3]?.[2]).toHaveLength(10_000);
  });
});

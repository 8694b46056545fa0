import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { tableParam, toCsv, type CsvValue } from "./csv-export";

describe("toCsv", () => {
  it("quotes text a spreadsheet would run as a formula, whatever follows, and leaves numbers and other text alone", () => {
    const risky = ["=1+2", "+3", "-4 weeks", "@SUM(A1)", "\tcmd", "\rcmd", "=A1\nmore"];
    const safe = ["a=b", "Kestrova", "", "x\n=A1"];
    const rows: CsvValue[][] = [...risky, ...safe, -5, 0.25, true, null].map((v) => [v]);
    const csv = toCsv({ fields: ["value"], rows });
    const cells = Papa.parse<string[]>(csv, { newline: "\r\n" }).data.slice(1).map((row) => row[0]);
    expect(cells.slice(0, risky.length)).toEqual(risky.map((v) => `'${v}`));
    expect(cells.slice(risky.length, risky.length + safe.length)).toEqual(safe);
    expect(cells.slice(-4)).toEqual(["-5", "0.25", "true", ""]);
  });

  it("reads the table parameter, defaulting to the first table, refusing unknown ones", () => {
    const tables = ["estimates", "changes"] as const;
    expect(tableParam(undefined, tables)).toBe("estimates");
    expect(tableParam("changes", tables)).toBe("changes");
    expect(() => tableParam("other", tables)).toThrow(/Unknown table "other"; choose estimates, changes/);
    expect(() => tableParam(["changes"], tables)).toThrow(/Unknown table/);
  });
});

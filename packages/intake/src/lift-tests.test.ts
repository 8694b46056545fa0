import { liftTestInputSchema } from "@tributary/contracts";
import type { PortfolioData } from "@tributary/stats";
import { describe, expect, it } from "vitest";
import { readFixture } from "./fixtures/load-fixture";
import { parseLiftTestsCsv, validateLiftTest } from "./lift-tests";
import { readTidyCsv } from "./tidy-csv";

function fixtureData(): PortfolioData {
  const result = readTidyCsv(readFixture("valid-small.csv"));
  if (!result.ok) throw new Error("fixture unreadable");
  return result.data;
}
const data = fixtureData();

const goodTest = {
  brand: "Fernhollow",
  market: "Varnland",
  channel: "tv",
  firstWeek: "2024-02-05",
  lastWeek: "2024-02-26",
  spend: 9600,
  incrementalOutcome: 31.5,
  standardError: 8.2,
};

function errorsOf(input: unknown) {
  const result = validateLiftTest(input, data);
  if (result.ok) throw new Error("expected the lift test to be rejected");
  return result.report.errors;
}

describe("validateLiftTest", () => {
  it("accepts a test inside the cell's data and spells names as the data do", () => {
    const result = validateLiftTest({ ...goodTest, brand: " fernhollow ", market: "VARNLAND", channel: "TV", note: " geo split " }, data);
    if (!result.ok) throw new Error(result.report.errors.map((e) => e.message).join(" | "));
    expect(result.test).toEqual({ ...goodTest, note: "geo split" });
    expect(result.report.warnings).toEqual([]);
    expect(liftTestInputSchema.safeParse(result.test).success).toBe(true);
  });

  it("accepts the cell's first and last weeks as the window edges, and a negative measured lift", () => {
    const result = validateLiftTest({ ...goodTest, market: "Ølmark", firstWeek: "2024-01-15", lastWeek: "2024-03-18", incrementalOutcome: -4 }, data);
    expect(result.ok).toBe(true);
  });

  it("rejects a cell or channel the data do not have, listing what they do have", () => {
    const errors = errorsOf({ ...goodTest, brand: "Brightwick", channel: "radio" });
    expect(errors.map((e) => [e.code, e.column])).toEqual([
      ["channel_unknown", "channel"],
      ["cell_unknown", "brand"],
    ]);
    expect(errors[0]?.message).toBe('The dataset has no channel "radio"; its channels are "tv", "search" and "social".');
    expect(errors[1]?.message).toBe(
      "The dataset has no cell Brightwick × Varnland (it has Fernhollow × Varnland, Fernhollow × Ølmark, Quillon × Varnland).",
    );
  });

  it("rejects a window outside the cell's data", () => {
    const errors = errorsOf({ ...goodTest, market: "Ølmark", firstWeek: "2024-01-08" });
    expect(errors).toEqual([
      {
        severity: "error",
        code: "window_outside_data",
        row: null,
        column: "firstWeek",
        message: "The test weeks 2024-01-08 to 2024-02-26 are not all inside the weeks Fernhollow × Ølmark has data for (2024-01-15 to 2024-03-18).",
      },
    ]);
    expect(errorsOf({ ...goodTest, lastWeek: "2024-03-25" })[0]).toMatchObject({ code: "window_outside_data", column: "lastWeek" });
  });

  it("rejects a first week after the last, and weeks that are not Mondays", () => {
    expect(errorsOf({ ...goodTest, firstWeek: "2024-03-04" })[0]).toMatchObject({
      code: "window_order",
      message: "The first week (2024-03-04) is after the last week (2024-02-26).",
    });
    expect(errorsOf({ ...goodTest, lastWeek: "2024-02-28" })[0]).toMatchObject({
      code: "date_not_monday",
      column: "lastWeek",
      message: "The last week 2024-02-28 is a Wednesday; weeks are named by their Monday (the Monday of that week is 2024-02-26).",
    });
    expect(errorsOf({ ...goodTest, firstWeek: "5 Feb 2024" })[0]?.code).toBe("date_invalid");
  });

  it("rejects negative spend, a standard error that is not positive, and numbers that are not finite", () => {
    expect(errorsOf({ ...goodTest, spend: -1 }).map((e) => e.code)).toEqual(["negative_spend"]);
    expect(errorsOf({ ...goodTest, standardError: 0 })[0]).toMatchObject({
      code: "standard_error_invalid",
      message: "The standard error is 0; it must be greater than 0.",
    });
    expect(errorsOf({ ...goodTest, standardError: -3 })[0]?.code).toBe("standard_error_invalid");
    expect(errorsOf({ ...goodTest, incrementalOutcome: Number.NaN })[0]?.code).toBe("not_finite");
    expect(errorsOf({ ...goodTest, spend: Number.POSITIVE_INFINITY })[0]?.code).toBe("not_finite");
    expect(errorsOf({ ...goodTest, spend: 5e12 })[0]?.code).toBe("number_too_large");
    expect(errorsOf({ ...goodTest, spend: "lots" })[0]?.code).toBe("not_a_number");
    expect(errorsOf({ ...goodTest, spend: true })[0]?.code).toBe("not_a_number");
  });

  it("names every missing field", () => {
    const errors = errorsOf({});
    expect(errors.map((e) => e.column)).toEqual(["brand", "market", "channel", "firstWeek", "lastWeek", "spend", "incrementalOutcome", "standardError"]);
    expect(errors[0]?.message).toBe("The brand is missing.");
    for (const input of [null, "test", 7, [goodTest]]) expect(errorsOf(input)[0]?.code).toBe("mapping_invalid");
  });

  it("warns when the data show no spend on the channel during the test", () => {
    // Fernhollow × Varnland has no TV spend in the week of 2024-02-19 (fixture row 21).
    const result = validateLiftTest({ ...goodTest, firstWeek: "2024-02-19", lastWeek: "2024-02-19" }, data);
    expect(result.ok).toBe(true);
    expect(result.report.warnings.map((w) => w.code)).toEqual(["lift_no_spend_in_data"]);
  });
});

describe("parseLiftTestsCsv", () => {
  const header = "brand,market,channel,first_week,last_week,spend,incremental_outcome,standard_error,note";

  it("reads valid tests, accepting other column spellings and ignoring unknown columns with a warning", () => {
    const text = [
      "Brand,Market,Channel,Start Week,End Week,Test Spend,Lift,SE,Owner",
      "Fernhollow,Varnland,tv,2024-02-05,2024-02-26,9600,31.5,8.2,Ana",
      'Quillon,Varnland,Search,2024-01-08,2024-01-29,"2400",12,3.5,Ben',
    ].join("\r\n");
    const result = parseLiftTestsCsv(text, data);
    if (!result.ok) throw new Error(result.report.errors.map((e) => e.message).join(" | "));
    expect(result.tests).toEqual([
      goodTest,
      { brand: "Quillon", market: "Varnland", channel: "search", firstWeek: "2024-01-08", lastWeek: "2024-01-29", spend: 2400, incrementalOutcome: 12, standardError: 3.5 },
    ]);
    expect(result.report.warnings).toEqual([{ severity: "warning", code: "column_ignored", row: 1, column: null, message: 'Not used: "Owner".' }]);
  });

  it("names the row and column of each problem and returns no tests", () => {
    const text = [
      header,
      "Fernhollow,Varnland,tv,2024-02-05,2024-02-26,9600,31.5,8.2,",
      "Fernhollow,Varnland,tv,2024-02-05,2024-02-26,9600,31.5,8.2,copy",
      "Fernhollow,Varnland,tv,2024-02-05,2024-02-26,-5,=A1,0,",
      "Fernhollow,Atlantis,tv,2024-02-05,2024-02-26,9600,31.5,8.2,",
    ].join("\n");
    const result = parseLiftTestsCsv(text, data);
    expect(result.ok).toBe(false);
    expect(result.report.errors.map((e) => [e.code, e.row, e.column])).toEqual([
      ["duplicate_row", 3, null],
      ["formula", 4, "incremental_outcome"],
      ["negative_spend", 4, "spend"],
      ["standard_error_invalid", 4, "standard_error"],
      ["cell_unknown", 5, "brand"],
    ]);
    expect(result.report.errors[1]?.message).toBe('Row 4: the incremental outcome "=A1" looks like a spreadsheet formula, not a number.');
    expect(result.report.errors[0]?.message).toBe("Row 3 repeats the lift test of row 2 (same cell, channel and weeks).");
  });

  it("says which columns are missing", () => {
    const result = parseLiftTestsCsv("brand,market,channel,spend\nFernhollow,Varnland,tv,1\n", data);
    expect(result.ok).toBe(false);
    expect(result.report.errors[0]?.message).toBe(
      'The lift-tests file has no column for "first_week", "last_week", "incremental_outcome" and "standard_error". Its columns must be "brand", "market", "channel", "first_week", "last_week", "spend", "incremental_outcome" and "standard_error", and optionally "note".',
    );
  });

  it("passes file problems through", () => {
    const result = parseLiftTestsCsv("", data);
    expect(result.ok).toBe(false);
    expect(result.report.errors[0]?.code).toBe("file_empty");
  });
});

import {
  dayNumberToIsoDate,
  isoDateToDayNumber,
  liftTestInputSchema,
  validationReportSchema,
  weekDateSchema,
  weekdayOfDayNumber,
} from "@tributary/contracts";
import { describe, expect, it } from "vitest";
import { reportOf } from "./issue-list";

// The shared intake shapes in @tributary/contracts, tested here beside their main user.

describe("week dates", () => {
  it("counts days from 1970-01-01 and knows the Gregorian leap years", () => {
    expect(isoDateToDayNumber("1970-01-01")).toBe(0);
    expect(isoDateToDayNumber("1970-01-05")).toBe(4);
    expect(isoDateToDayNumber("2000-02-29")).not.toBeNull();
    expect(isoDateToDayNumber("2024-02-29")).not.toBeNull();
    expect(isoDateToDayNumber("1900-02-29")).toBeNull();
    expect(isoDateToDayNumber("2023-02-29")).toBeNull();
    expect(isoDateToDayNumber("2024-13-01")).toBeNull();
    expect(isoDateToDayNumber("2024-1-01")).toBeNull();
    expect(isoDateToDayNumber("1899-12-25")).toBeNull();
    expect(isoDateToDayNumber(" 2024-01-01")).toBeNull();
  });

  it("names weekdays from Monday = 0, before and after 1970", () => {
    // 1970-01-05 and 2024-01-01 were Mondays; 1969-12-29 too (a week before 1970-01-05).
    for (const monday of ["1970-01-05", "2024-01-01", "1969-12-29", "1900-01-01"]) {
      expect(weekdayOfDayNumber(isoDateToDayNumber(monday) as number), monday).toBe(0);
    }
    expect(weekdayOfDayNumber(isoDateToDayNumber("2024-02-01") as number)).toBe(3);
    expect(weekdayOfDayNumber(isoDateToDayNumber("1970-01-04") as number)).toBe(6);
  });

  it("turns day numbers back into the same dates", () => {
    for (const date of ["1900-01-01", "1969-12-31", "1970-01-01", "2024-02-29", "2100-12-31"]) {
      expect(dayNumberToIsoDate(isoDateToDayNumber(date) as number)).toBe(date);
    }
  });

  it("accepts only Mondays as week dates, with plain messages", () => {
    expect(weekDateSchema.safeParse("2024-01-01").success).toBe(true);
    expect(weekDateSchema.safeParse("2024-01-02").error?.issues[0]?.message).toBe("Weeks are named by their Monday; this date is not a Monday");
    expect(weekDateSchema.safeParse("01/01/2024").error?.issues[0]?.message).toBe("Enter a date as YYYY-MM-DD, e.g. 2024-01-01");
  });
});

describe("liftTestInputSchema", () => {
  const test = {
    brand: "Quillon",
    market: "Varnland",
    channel: "tv",
    firstWeek: "2024-01-01",
    lastWeek: "2024-01-29",
    spend: 5000,
    incrementalOutcome: 20,
    standardError: 6,
  };

  it("accepts a complete test", () => {
    expect(liftTestInputSchema.safeParse(test).success).toBe(true);
  });

  it.each([
    [{ spend: -1 }, "Spend cannot be negative"],
    [{ standardError: 0 }, "The standard error must be greater than 0"],
    [{ spend: Number.NaN }, "Enter the spend as a number"],
    [{ incrementalOutcome: Number.POSITIVE_INFINITY }, "Enter the incremental outcome as a number"],
    [{ firstWeek: "2024-02-05" }, "The first week must not be after the last week"],
    [{ brand: "  " }, "Enter the brand"],
  ])("rejects %j: %s", (change, message) => {
    const result = liftTestInputSchema.safeParse({ ...test, ...change });
    expect(result.success).toBe(false);
    expect(result.error?.issues.map((i) => i.message)).toContain(message);
  });
});

describe("validationReportSchema", () => {
  it("describes the reports the intake returns", () => {
    const report = reportOf([{ severity: "error", code: "file_empty", row: null, column: null, message: "The file is empty." }]);
    expect(validationReportSchema.parse(report)).toEqual(report);
  });
});

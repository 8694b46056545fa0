import { describe, expect, it } from "vitest";
import { formatWeek, formatWeekRange, formatWeeks } from "../format";

describe("week formatting", () => {
  it("formats ISO week dates without depending on the time zone", () => {
    expect(formatWeek("2024-12-30")).toBe("30 Dec 2024");
    expect(formatWeek("2023-01-02")).toBe("2 Jan 2023");
    expect(formatWeekRange("2023-01-02", "2023-09-25")).toBe("2 Jan 2023 – 25 Sep 2023");
    expect(formatWeekRange(null, "2023-09-25")).toBeNull();
  });

  it("keeps text it cannot read as a date", () => {
    expect(formatWeek("week 3")).toBe("week 3");
  });

  it("counts weeks in words", () => {
    expect(formatWeeks(1)).toBe("1 week");
    expect(formatWeeks(26)).toBe("26 weeks");
  });
});

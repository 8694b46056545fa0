import { describe, expect, it } from "vitest";
import { formatCac, formatCacInterval, formatChance, formatWeek, formatWeekRange, formatWeeks } from "../format";

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

describe("cost and chance formatting", () => {
  it("writes costs per customer with three significant digits in the currency", () => {
    expect(formatCac(48.26, "EUR")).toBe("€48.3");
    expect(formatCac(1234, "EUR")).toBe("€1,230");
    expect(formatCac(0.5, "EUR")).toBe("€0.5");
    expect(formatCac(Infinity, "EUR")).toBe("∞");
    expect(formatCac(null, "EUR")).toBe("–");
    expect(formatCacInterval(48.26, 34.5, 67.6, "EUR")).toBe("€48.3 (€34.5–€67.6)");
  });

  it("never claims a certainty from a finite number of draws", () => {
    expect(formatChance(0.734)).toBe("73 %");
    expect(formatChance(1)).toBe("> 99 %");
    expect(formatChance(0.996)).toBe("> 99 %");
    expect(formatChance(0)).toBe("< 1 %");
    expect(formatChance(0.004)).toBe("< 1 %");
    expect(formatChance(null)).toBe("–");
  });
});

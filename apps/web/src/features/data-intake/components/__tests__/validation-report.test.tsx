import { render, screen, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { testReport } from "../../../../testing/intake-fixtures";
import "../../../../testing/test-utils";
import { ValidationReport } from "../validation-report";

describe("validation report", () => {
  it("says how many errors block saving and groups them by kind, with row and column", () => {
    render(<ValidationReport report={testReport} />);
    expect(screen.getByRole("status").textContent).toMatch(/7 errors to fix before saving/);
    const errors = screen.getByRole("region", { name: "Errors" });
    expect(within(errors).getByRole("heading", { level: 3 }).textContent).toBe("Errors (these block saving): 7");
    const negative = within(errors).getByRole("region", { name: /Negative spend/ });
    expect(within(negative).getByText("6 errors")).toBeTruthy();
    expect(within(negative).getAllByRole("listitem").map((item) => item.textContent)).toEqual([
      "Row 14, column spend_radio:Spend cannot be negative (−300).",
      "Row 15, column spend_radio:Spend cannot be negative (−120).",
    ]);
    expect(within(negative).getByText(/Showing the first 2 of 6/)).toBeTruthy();
    const duplicates = within(errors).getByRole("region", { name: /Duplicate weeks/ });
    expect(within(duplicates).getByRole("listitem").textContent).toBe("Row 40:Week 2024-03-04 of Fennick in Ardeval appears twice (rows 39 and 40).");
  });

  it("lists warnings apart, as not blocking", () => {
    render(<ValidationReport report={testReport} />);
    const warnings = screen.getByRole("region", { name: "Warnings" });
    expect(within(warnings).getByRole("heading", { level: 3 }).textContent).toMatch(/do not block saving\): 1/);
    expect(within(warnings).getByText(/6 times the cell's typical week/)).toBeTruthy();
  });

  it("says the data can be saved when there are no errors, and shows what the rows hold", () => {
    render(<ValidationReport report={{ ...testReport, ok: true, errors: [], errorCount: 0, counts: testReport.counts.filter((c) => c.severity === "warning") }} />);
    expect(screen.getByRole("status").textContent).toMatch(/No errors: this data can be saved/);
    expect(screen.queryByRole("region", { name: "Errors" })).toBeNull();
    expect(screen.getByText("search, radio")).toBeTruthy();
    expect(screen.getByText("1 Jan 2024 – 22 Dec 2025")).toBeTruthy();
  });
});

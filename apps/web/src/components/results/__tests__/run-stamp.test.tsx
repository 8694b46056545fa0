import { render, screen } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { publishedRun } from "../../../testing/dashboard-fixtures";
import { testRun } from "../../../testing/run-fixtures";
import "../../../testing/test-utils";
import { RunStamp } from "../run-stamp";

describe("run stamp", () => {
  it("names the published run, when it was fitted and published and by whom, with its trust mark and publish reason", () => {
    render(<RunStamp run={publishedRun} />);
    const stamp = screen.getByRole("region", { name: "Published run" });
    expect(stamp.textContent).toContain("the current published fit, run run-7f3a (dataset version 3).");
    expect(stamp.textContent).toMatch(/Fitted \d+ Feb 2025, \d\d:\d\d · published \d+ Feb 2025, \d\d:\d\d by Nell Ostrand/);
    expect(screen.getByText("Not trustworthy")).toBeTruthy();
    expect(screen.getByText("“Lift tests run last spring agree with these estimates.”")).toBeTruthy();
    expect(screen.getByText("Why it is not trustworthy")).toBeTruthy();
  });

  it("says so when the run is not the current one, and shows no reasons for a sound run", () => {
    render(<RunStamp run={testRun({ id: "run-00aa11bb22", current: false })} lead="You are reviewing" />);
    expect(screen.getByRole("region", { name: "Published run" }).textContent).toContain("You are reviewing a run that is not the current published fit, run run-00aa");
    expect(screen.getByText("Trustworthy")).toBeTruthy();
    expect(screen.queryByText("Why it is not trustworthy")).toBeNull();
  });
});

import { render, screen, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { testProgress } from "../../../../testing/run-fixtures";
import "../../../../testing/test-utils";
import { RunProgress } from "../run-progress";

describe("run progress", () => {
  it("shows the stage, the share done, time so far and time left", () => {
    render(<RunProgress progress={testProgress} stream="live" />);
    expect(screen.getByText("Fitting the pooled model")).toBeTruthy();
    expect(screen.getByText("35 % done · 1 min 2 s so far · about 2 min 5 s left")).toBeTruthy();
    expect(screen.getByRole("progressbar", { name: "Whole fit" }).getAttribute("aria-valuenow")).toBe("35");
    expect(screen.getByText("Live updates.")).toBeTruthy();
  });

  it("lists each chain in order with its phase, iterations, divergences and time left", () => {
    render(<RunProgress progress={testProgress} stream="polling" />);
    const table = screen.getByRole("table", { name: "Progress of each chain" });
    const rows = within(table).getAllByRole("row").slice(1);
    expect(rows.map((row) => within(row).getByRole("rowheader").textContent)).toEqual(["Pooled model, chain 1", "Pooled model, chain 2"]);
    const first = within(rows[0]!).getAllByRole("cell").map((cell) => cell.textContent);
    expect(first).toEqual(["Sampling", "150 / 200", "2", "20 s"]);
    expect(within(rows[0]!).getByRole("progressbar", { name: "Pooled model, chain 1" }).getAttribute("aria-valuenow")).toBe("75");
    expect(within(rows[1]!).getAllByRole("cell").map((cell) => cell.textContent)).toEqual(["Warm-up", "40 / 200", "0", "1 min 35 s"]);
    expect(screen.getByText("Updating every few seconds.")).toBeTruthy();
  });

  it("says which cell the comparison fit is on, a second try, and a place in the queue", () => {
    render(
      <RunProgress
        stream="live"
        progress={{
          ...testProgress,
          stage: "unpooled",
          queuePosition: null,
          etaSeconds: null,
          chains: [{ model: "unpooled", chain: 0, iteration: 900, total: 2800, phase: "sampling", divergences: 0, attempt: 2, cell: 2, cellCount: 14, etaSeconds: null }],
        }}
      />,
    );
    expect(screen.getByText("Fitting every cell on its own (comparison)")).toBeTruthy();
    expect(screen.getByRole("rowheader").textContent).toBe("Each cell alone, chain 1cell 3 of 14");
    expect(screen.getByText("second try, higher target acceptance")).toBeTruthy();
    expect(screen.getByText(/35 % done · 1 min 2 s so far$/)).toBeTruthy();
  });

  it("shows a waiting run's place in the queue", () => {
    render(<RunProgress stream="polling" progress={{ ...testProgress, stage: "queued", queuePosition: 2, chains: [], fraction: 0, etaSeconds: null }} />);
    expect(screen.getByText("Waiting for a free slot · number 2 in the queue")).toBeTruthy();
    expect(screen.queryByRole("table")).toBeNull();
  });
});

import type { Run } from "@tributary/contracts";
import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { describe, expect, it, vi } from "vitest";
import { testDatasetDetail } from "../../../../testing/dataset-fixtures";
import { testProgress, testReport, testRun, untrustworthyTrust } from "../../../../testing/run-fixtures";
import { jsonResponse, renderApp, signedInRoutes, testUsers, type FetchHandler } from "../../../../testing/test-utils";

function routes(extra: Record<string, FetchHandler>): Record<string, FetchHandler> {
  return { ...signedInRoutes(testUsers.analyst), "GET /api/datasets/dv-1": () => jsonResponse(200, testDatasetDetail), ...extra };
}

const published = testRun({
  id: "run-0",
  trust: untrustworthyTrust,
  publication: { at: "2025-02-01T09:00:00.000Z", by: { id: "u-n", name: "Nell Ostrand" }, reason: "Lift tests in Ardeval agree with these estimates." },
  current: true,
  createdAt: "2025-02-01T08:00:00.000Z",
});
const running = testRun({ id: "run-2", status: "running", finishedAt: null, progress: testProgress, trust: { trustworthy: null, reasons: [], warnings: [] }, createdAt: "2025-02-04T08:00:00.000Z" });

/** A stand-in EventSource the test drives by hand. */
class FakeEventSource {
  static last: FakeEventSource | null = null;
  static readonly CLOSED = 2;
  readyState = 1;
  onmessage: ((event: MessageEvent<string>) => void) | null = null;
  onerror: (() => void) | null = null;
  private listeners = new Map<string, ((event: MessageEvent<string>) => void)[]>();
  constructor(readonly url: string) {
    FakeEventSource.last = this;
  }
  addEventListener(type: string, listener: (event: MessageEvent<string>) => void) {
    this.listeners.set(type, [...(this.listeners.get(type) ?? []), listener]);
  }
  close() {
    this.readyState = 2;
  }
  emit(type: string, data: unknown) {
    for (const listener of this.listeners.get(type) ?? []) listener(new MessageEvent(type, { data: JSON.stringify(data) }));
  }
}

describe("Runs screen", () => {
  it("lists runs with status, dataset, duration and trust mark, and the reason an untrustworthy run was published", async () => {
    vi.stubGlobal("EventSource", undefined);
    renderApp("/runs", routes({ "GET /api/runs": () => jsonResponse(200, [published, running]), "GET /api/runs/run-2": () => jsonResponse(200, running) }));
    const table = await screen.findByRole("table", { name: "All runs" });
    const rows = within(table).getAllByRole("row").slice(1);
    expect(rows).toHaveLength(2);
    const old = rows[1]!;
    expect(within(old).getByText("Finished")).toBeTruthy();
    expect(within(old).getByText("Not trustworthy")).toBeTruthy();
    expect(within(old).getByText("“Lift tests in Ardeval agree with these estimates.”")).toBeTruthy();
    expect(within(old).getByText("current fit")).toBeTruthy();
    expect(within(old).getByText("4 min 30 s")).toBeTruthy();
    expect(within(rows[0]!).getByText("Running")).toBeTruthy();
    // The running fit's live panel falls back to polling where there is no EventSource.
    const active = screen.getByRole("region", { name: /Active run/ });
    expect(within(active).getByText("Fitting the pooled model")).toBeTruthy();
    expect(within(active).getByText("Updating every few seconds.")).toBeTruthy();
    expect(within(active).getByRole("button", { name: "Cancel this run" })).toBeTruthy();
  });

  it("follows a running fit's server-sent events until it ends", async () => {
    vi.stubGlobal("EventSource", FakeEventSource);
    let stored: Run = running;
    const finished = testRun({ id: "run-2", trust: untrustworthyTrust });
    renderApp("/runs/run-2", routes({ "GET /api/runs/run-2": () => jsonResponse(200, stored), "GET /api/runs/run-2/report": () => jsonResponse(200, testReport(finished)) }));
    await screen.findByText("Fitting the pooled model");
    const source = FakeEventSource.last!;
    expect(source.url).toBe("/api/runs/run-2/events");
    source.emit("progress", { type: "progress", progress: { ...testProgress, stage: "unpooled", fraction: 0.8, chains: [] } });
    expect(await screen.findByText("Fitting every cell on its own (comparison)")).toBeTruthy();
    expect(screen.getByText("Live updates.")).toBeTruthy();
    stored = finished;
    source.emit("end", { type: "end", run: finished });
    expect(await screen.findByRole("heading", { name: "Can these numbers be trusted?" })).toBeTruthy();
    expect(source.readyState).toBe(2);
  });

  it("cancels a running fit", async () => {
    vi.stubGlobal("EventSource", undefined);
    const { calls } = renderApp("/runs/run-2", routes({
      "GET /api/runs/run-2": () => jsonResponse(200, running),
      "POST /api/runs/run-2/cancel": () => jsonResponse(200, { ...running, status: "cancelled", progress: null }),
    }));
    fireEvent.click(await screen.findByRole("button", { name: "Cancel this run" }));
    await waitFor(() => expect(calls.some((call) => call.method === "POST" && call.path === "/api/runs/run-2/cancel")).toBe(true));
  });

  it("gives an interrupted run's reason and restarts it with the same settings", async () => {
    const interrupted = testRun({ id: "run-3", status: "interrupted", finishedAt: null, failureReason: "The server stopped while this run was going; its draws were lost.", trust: { trustworthy: null, reasons: [], warnings: [] } });
    const restarted = testRun({ id: "run-4", status: "queued", startedAt: null, finishedAt: null, restartedFromRunId: "run-3", trust: { trustworthy: null, reasons: [], warnings: [] } });
    vi.stubGlobal("EventSource", undefined);
    const { router, calls } = renderApp("/runs/run-3", routes({
      "GET /api/runs/run-3": () => jsonResponse(200, interrupted),
      "POST /api/runs/run-3/restart": () => jsonResponse(201, restarted),
      "GET /api/runs/run-4": () => jsonResponse(200, restarted),
    }));
    const stopped = await screen.findByRole("region", { name: "Why the run stopped" });
    expect(within(stopped).getByText("This run was interrupted")).toBeTruthy();
    expect(within(stopped).getByText("The server stopped while this run was going; its draws were lost.")).toBeTruthy();
    fireEvent.click(within(stopped).getByRole("button", { name: "Restart with the same settings" }));
    await waitFor(() => expect(router.state.location.pathname).toBe("/runs/run-4"));
    expect(calls.filter((call) => call.path === "/api/runs/run-3/restart")).toHaveLength(1);
    expect(await screen.findByText("Waiting for a free slot to start.")).toBeTruthy();
  });

  it("says plainly when a run does not exist", async () => {
    renderApp("/runs/nope", routes({}));
    expect(await screen.findByRole("heading", { name: "This run does not exist" })).toBeTruthy();
  });
});

describe("run report", () => {
  function renderReport(run: Run, extra: Record<string, FetchHandler> = {}) {
    return renderApp(`/runs/${run.id}`, routes({ [`GET /api/runs/${run.id}`]: () => jsonResponse(200, run), [`GET /api/runs/${run.id}/report`]: () => jsonResponse(200, testReport(run)), ...extra }));
  }

  it("gives the trust mark with its reasons and the checks behind it", async () => {
    renderReport(testRun({ trust: untrustworthyTrust }));
    const trust = await screen.findByRole("region", { name: "Can these numbers be trusted?" });
    expect(within(trust).getByText("Not trustworthy")).toBeTruthy();
    expect(within(trust).getByText(/R-hat is above 1.01 for 3 parameters/)).toBeTruthy();
    expect(within(trust).getByText(/E-BFMI of chain 2 is 0.21/)).toBeTruthy();
    const pooled = within(trust).getByRole("table", { name: "Pooled model" });
    expect(within(within(pooled).getByRole("row", { name: /Largest R-hat/ })).getAllByRole("cell").map((c) => c.textContent)).toEqual(["1.042", "at most 1.01", "fails"]);
    expect(within(within(pooled).getByRole("row", { name: /Lowest E-BFMI/ })).getAllByRole("cell")[0]?.textContent).toBe("0.21");
  });

  it("lists every parameter in a sortable table with the rule breakers flagged in words", async () => {
    renderReport(testRun({ trust: untrustworthyTrust }));
    const table = await screen.findByRole("table", { name: "Diagnostics per parameter" });
    const rows = within(table).getAllByRole("row").slice(1);
    // Worst R-hat first; a parameter without an R-hat (a constant) goes last.
    expect(rows.map((row) => within(row).getAllByRole("cell")[0]?.textContent)).toEqual([
      "Portfolio effect, searchmu[search]",
      "Carry-over, searchalpha[search]",
      "Noise, Fennick in Ardevalsigma[0]",
    ]);
    expect(within(rows[0]!).getByText("(above 1.01)")).toBeTruthy();
    expect(within(rows[0]!).getByText("(below 400)")).toBeTruthy();
    expect(within(rows[0]!).getAllByRole("cell")[4]?.textContent).toBe("−4.6 to −3.6");
    expect(within(rows[2]!).getAllByRole("cell")[5]?.textContent).toBe("–");
    expect(screen.getAllByRole("button", { name: "Export CSV" }).length).toBeGreaterThan(0);
  });

  it("shows trace and rank plots, the predictive check and holdout accuracy with text alternatives", async () => {
    renderReport(testRun());
    const traces = await screen.findByRole("article", { name: "Trace and rank plot of Portfolio effect, search" });
    expect(within(traces).getByText(/Shown because: highest R-hat/)).toBeTruthy();
    expect(within(traces).getByRole("table", { name: "Rank counts of Portfolio effect, search per chain and bin" })).toBeTruthy();
    expect(screen.getByRole("figure", { name: /Fennick in Ardeval: observed against replicated new customers/ })).toBeTruthy();
    expect(screen.getByText(/87.5 % of the fitted weeks lie inside the 90 % band/)).toBeTruthy();
    const holdout = screen.getByRole("table", { name: "Holdout accuracy per cell" });
    expect(within(holdout).getAllByRole("row")[1]?.textContent).toBe("Fennick in Ardeval12.54.2 %75 %");
  });

  it("asks for a written reason before publishing an untrustworthy run, then sends it", async () => {
    const run = testRun({ trust: untrustworthyTrust });
    const { calls } = renderReport(run, {
      "POST /api/runs/run-1/publish": ({ body }) =>
        jsonResponse(200, { ...run, current: true, publication: { at: "2025-02-03T11:00:00.000Z", by: { id: "u-n", name: "Nell Ostrand" }, reason: (body as { reason: string }).reason } }),
    });
    fireEvent.click(await screen.findByRole("button", { name: "Publish anyway" }));
    expect(await screen.findByText(/This run is not trustworthy: say in at least 20 characters why/)).toBeTruthy();
    expect(calls.some((call) => call.method === "POST")).toBe(false);
    fireEvent.change(screen.getByLabelText(/Why publish a run that is not trustworthy/), { target: { value: "Lift tests in Ardeval agree with these estimates." } });
    fireEvent.click(screen.getByRole("button", { name: "Publish anyway" }));
    await waitFor(() => expect(calls.find((call) => call.path === "/api/runs/run-1/publish")?.body).toEqual({ reason: "Lift tests in Ardeval agree with these estimates." }));
  });

  it("publishes a trustworthy run without asking for a reason", async () => {
    const { calls } = renderReport(testRun(), { "POST /api/runs/run-1/publish": () => jsonResponse(200, testRun({ current: true })) });
    fireEvent.click(await screen.findByRole("button", { name: "Publish as current fit" }));
    await waitFor(() => expect(calls.find((call) => call.path === "/api/runs/run-1/publish")?.body).toEqual({}));
    expect(screen.queryByLabelText(/Why publish/)).toBeNull();
  });
});

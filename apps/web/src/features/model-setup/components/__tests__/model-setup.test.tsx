import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import type { ModelSettingsRecord } from "@tributary/contracts";
import { describe, expect, it, vi } from "vitest";
import { testDatasetDetail, testDatasetSeries, testDatasetVersion } from "../../../../testing/dataset-fixtures";
import { jsonResponse, renderWithProviders, stubFetch, type FetchHandler } from "../../../../testing/test-utils";
import { inlinePriorCheckRunner } from "../../worker/prior-check-runner";
import { ModelSetup } from "../model-setup";

function datasetRoutes(extra: Record<string, FetchHandler> = {}) {
  let seriesCalls = 0;
  const routes: Record<string, FetchHandler> = {
    "GET /api/datasets/dv-1": () => jsonResponse(200, testDatasetDetail),
    // The stub ignores the query string, so the series route answers by the last requested cell.
    "GET /api/datasets/dv-1/series": () => jsonResponse(200, testDatasetSeries(seriesCalls++ % 2 === 0 ? "c1" : "c2")),
    ...extra,
  };
  return routes;
}

function renderSetup(extra: Record<string, FetchHandler> = {}, onStartFit = vi.fn(async (_record: ModelSettingsRecord) => undefined)) {
  const api = stubFetch(datasetRoutes(extra));
  renderWithProviders(<ModelSetup datasets={[testDatasetVersion]} currency="EUR" onStartFit={onStartFit} priorCheckRunner={inlinePriorCheckRunner()} />);
  return { ...api, onStartFit };
}

const lowField = (channel: string) => screen.getByRole("spinbutton", { name: `Lowest plausible cost per customer, ${channel}` }) as HTMLInputElement;
const highField = (channel: string) => screen.getByRole("spinbutton", { name: `Highest plausible cost per customer, ${channel}` }) as HTMLInputElement;

describe("model setup", () => {
  it("starts from the model's defaults, one range per channel of the dataset, with help for every setting", async () => {
    renderSetup();
    expect(await screen.findByRole("spinbutton", { name: "Lowest plausible cost per customer, search" })).toBeTruthy();
    expect(lowField("radio").value).toBe("5");
    expect(highField("radio").value).toBe("2000");
    expect((screen.getByLabelText("Carry-over length (weeks)") as HTMLInputElement).value).toBe("8");
    expect((screen.getByLabelText("Chains") as HTMLInputElement).value).toBe("4");
    expect((screen.getByLabelText("Pooling structure") as HTMLSelectElement).value).toBe("crossed");
    expect(screen.getByLabelText("Carry-over length (weeks)").getAttribute("aria-describedby")).toBe("setting-maxLag-help");
    expect(screen.getByText(/How many weeks an ad can keep bringing customers/)).toBeTruthy();
  });

  it("runs the prior check and shows, per channel, the range the priors then allow", async () => {
    renderSetup();
    const status = await screen.findByText(/Computed from 200 draws of the priors in \d+ ms/, undefined, { timeout: 5000 });
    expect(status).toBeTruthy();
    const ranges = screen.getByRole("table", { name: "Plausible cost per new customer at low spend, per channel" });
    const search = within(ranges).getByRole("row", { name: /^search/ });
    // The default range 5–2000 widened a little by the pooling spread.
    expect(within(search).getAllByRole("cell").at(-1)?.textContent).toMatch(/^€\d+ – €[\d,]+ · median €\d+$/);
    expect(screen.getByRole("table", { name: "Weekly outcome the priors allow, per cell" })).toBeTruthy();
  });

  it("explains a range whose top is below its bottom, pauses the prior check and does not submit", async () => {
    const { calls, onStartFit } = renderSetup();
    await screen.findByRole("spinbutton", { name: "Lowest plausible cost per customer, search" });
    fireEvent.change(lowField("search"), { target: { value: "400" } });
    fireEvent.change(highField("search"), { target: { value: "20" } });
    expect(await screen.findByText("The highest plausible cost per customer must be above the lowest")).toBeTruthy();
    expect(highField("search").getAttribute("aria-invalid")).toBe("true");
    expect(screen.getByText("Paused: fix the highlighted settings to update the prior check.")).toBeTruthy();
    fireEvent.click(screen.getByRole("button", { name: "Start fit" }));
    await waitFor(() => expect(screen.getByRole("button", { name: "Start fit" })).toBeTruthy());
    expect(calls.filter((call) => call.method === "POST")).toHaveLength(0);
    expect(onStartFit).not.toHaveBeenCalled();
  });

  it("names a whole-number setting outside its bounds", async () => {
    renderSetup();
    fireEvent.change(await screen.findByLabelText("Chains"), { target: { value: "0" } });
    fireEvent.change(screen.getByLabelText("Warm-up iterations per chain"), { target: { value: "12.5" } });
    fireEvent.change(screen.getByLabelText("Seed (optional)"), { target: { value: "-3" } });
    expect(await screen.findByText("The number of chains must be at least 1")).toBeTruthy();
    expect(screen.getByText("The number of warm-up iterations must be a whole number")).toBeTruthy();
    expect(screen.getByText("The seed must be at least 0")).toBeTruthy();
  });

  it("saves the settings and hands the stored record on to start the fit", async () => {
    const record = { id: "ms-1", datasetVersionId: "dv-1", datasetVersionNumber: 3, createdAt: "2025-02-03T10:00:00.000Z", createdBy: null };
    const { calls, onStartFit } = renderSetup({
      "POST /api/model-settings": ({ body }) => jsonResponse(201, { ...record, settings: body }),
    });
    await screen.findByRole("spinbutton", { name: "Lowest plausible cost per customer, search" });
    fireEvent.change(lowField("search"), { target: { value: "20" } });
    fireEvent.change(highField("search"), { target: { value: "400" } });
    fireEvent.change(screen.getByLabelText("Chains"), { target: { value: "2" } });
    fireEvent.change(screen.getByLabelText("Warm-up iterations per chain"), { target: { value: "100" } });
    fireEvent.change(screen.getByLabelText("Draws per chain"), { target: { value: "100" } });
    fireEvent.change(screen.getByLabelText("Seed (optional)"), { target: { value: "7" } });
    fireEvent.click(screen.getByRole("button", { name: "Start fit" }));
    await waitFor(() => expect(onStartFit).toHaveBeenCalledTimes(1));
    const sent = calls.find((call) => call.method === "POST" && call.path === "/api/model-settings")?.body;
    expect(sent).toEqual({
      datasetVersionId: "dv-1",
      cacRanges: [
        { channel: "search", lo: 20, hi: 400 },
        { channel: "radio", lo: 5, hi: 2000 },
      ],
      maxLag: 8,
      saturation: "exponential",
      likelihood: "normal",
      seasonalityOrder: 2,
      pooling: "crossed",
      holdoutWeeks: 0,
      chains: 2,
      warmup: 100,
      draws: 100,
      seed: 7,
      unpooledComparison: true,
    });
    expect(onStartFit.mock.calls[0]?.[0]).toMatchObject({ id: "ms-1" });
  });

  it("puts the server's field messages next to the fields", async () => {
    renderSetup({
      "POST /api/model-settings": () =>
        jsonResponse(400, {
          error: { code: "invalid_input", message: "Check the highlighted settings.", issues: [{ path: "holdoutWeeks", message: "The holdout leaves Hollowby in Ardeval fewer than 8 weeks to fit" }] },
        }),
    });
    await screen.findByRole("spinbutton", { name: "Lowest plausible cost per customer, search" });
    fireEvent.click(screen.getByRole("button", { name: "Start fit" }));
    expect(await screen.findByText("The holdout leaves Hollowby in Ardeval fewer than 8 weeks to fit")).toBeTruthy();
    expect(screen.getByRole("alert").textContent).toBe("Check the highlighted settings.");
  });

  it("says there is nothing to fit before any dataset version exists", () => {
    stubFetch({});
    renderWithProviders(<ModelSetup datasets={[]} currency="EUR" onStartFit={vi.fn()} />);
    expect(screen.getByRole("heading", { name: "No data to fit yet" })).toBeTruthy();
  });
});

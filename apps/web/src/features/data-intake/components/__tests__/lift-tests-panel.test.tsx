import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { testDatasetDetail, testDatasetVersion } from "../../../../testing/dataset-fixtures";
import { jsonResponse, renderWithProviders, stubFetch, type FetchHandler } from "../../../../testing/test-utils";
import { LiftTestsPanel } from "../lift-tests-panel";

const record = {
  id: "lt-1",
  datasetVersionId: "dv-1",
  cellId: "c1",
  marketId: "m-ard",
  brand: "Fennick",
  market: "Ardeval",
  channel: "radio",
  firstWeek: "2024-02-05",
  lastWeek: "2024-02-26",
  spend: 12_000,
  incrementalOutcome: 95,
  standardError: 30,
  createdAt: "2025-02-03T10:00:00.000Z",
  createdBy: { id: "u-n", name: "Nell Ostrand" },
};
const emptyReport = { ok: true, errors: [], warnings: [], errorCount: 0, warningCount: 0, counts: [], summary: null };

function renderPanel(routes: Record<string, FetchHandler>) {
  const api = stubFetch({ "GET /api/datasets/dv-1": () => jsonResponse(200, testDatasetDetail), ...routes });
  renderWithProviders(<LiftTestsPanel versions={[testDatasetVersion]} currency="EUR" />);
  return api;
}

function fill(label: string | RegExp, value: string) {
  fireEvent.change(screen.getByLabelText(label), { target: { value } });
}

describe("lift tests panel", () => {
  it("lists the version's lift tests and deletes one after a confirmation", async () => {
    let stored = [record];
    const { calls } = renderPanel({
      "GET /api/datasets/dv-1/lift-tests": () => jsonResponse(200, stored),
      "DELETE /api/datasets/dv-1/lift-tests/lt-1": () => {
        stored = [];
        return new Response(null, { status: 204 });
      },
    });
    const table = await screen.findByRole("table", { name: "Recorded lift tests" });
    const row = within(table).getAllByRole("row")[1]!;
    expect(within(row).getAllByRole("cell").map((cell) => cell.textContent).slice(0, 8)).toEqual(["Fennick", "Ardeval", "radio", "5 Feb 2024", "26 Feb 2024", "€12,000", "95", "30"]);
    fireEvent.click(within(row).getByRole("button", { name: /Delete the lift test of radio in Fennick Ardeval/ }));
    fireEvent.click(within(row).getByRole("button", { name: "Yes, delete" }));
    expect(await within(table).findByText("No lift tests recorded for this dataset version yet.")).toBeTruthy();
    expect(calls.filter((call) => call.method === "DELETE")).toHaveLength(1);
  });

  it("checks an entered test with the shared schema: Mondays, order, a positive standard error", async () => {
    const { calls } = renderPanel({ "GET /api/datasets/dv-1/lift-tests": () => jsonResponse(200, []) });
    await screen.findByRole("form", { name: "Add a lift test" });
    fill("Market", "Ardeval");
    fill("First week (a Monday)", "2024-03-06");
    fill("Last week (a Monday)", "2024-02-05");
    fill(/Spend during the test/, "-5");
    fill("Its standard error", "0");
    fireEvent.click(screen.getByRole("button", { name: "Add lift test" }));
    expect(await screen.findByText("Weeks are named by their Monday; this date is not a Monday")).toBeTruthy();
    expect(screen.getByText("Spend cannot be negative")).toBeTruthy();
    expect(screen.getByText("Enter the incremental outcome as a number")).toBeTruthy();
    expect(screen.getByText("The standard error must be greater than 0")).toBeTruthy();
    expect(calls.some((call) => call.method === "POST")).toBe(false);
    // The order of the weeks is checked once every field is valid on its own.
    fill("First week (a Monday)", "2024-03-04");
    fill(/Spend during the test/, "100");
    fill("Measured extra outcome", "5");
    fill("Its standard error", "2");
    fireEvent.click(screen.getByRole("button", { name: "Add lift test" }));
    expect(await screen.findByText("The first week must not be after the last week")).toBeTruthy();
  });

  it("sends a valid test, then shows it in the list", async () => {
    let stored: (typeof record)[] = [];
    const { calls } = renderPanel({
      "GET /api/datasets/dv-1/lift-tests": () => jsonResponse(200, stored),
      "POST /api/datasets/dv-1/lift-tests": () => {
        stored = [record];
        return jsonResponse(201, { created: [record], report: emptyReport });
      },
    });
    await screen.findByRole("form", { name: "Add a lift test" });
    fill("Brand", "Fennick");
    fill("Market", "Ardeval");
    fill("Channel", "radio");
    fill("First week (a Monday)", "2024-02-05");
    fill("Last week (a Monday)", "2024-02-26");
    fill(/Spend during the test/, "12000");
    fill("Measured extra outcome", "95");
    fill("Its standard error", "30");
    fireEvent.click(screen.getByRole("button", { name: "Add lift test" }));
    await waitFor(() => expect(calls.find((call) => call.method === "POST")?.body).toEqual({
      brand: "Fennick",
      market: "Ardeval",
      channel: "radio",
      firstWeek: "2024-02-05",
      lastWeek: "2024-02-26",
      spend: 12000,
      incrementalOutcome: 95,
      standardError: 30,
    }));
    expect(await screen.findByText("26 Feb 2024")).toBeTruthy();
  });

  it("refuses a file that is not a CSV before sending it, and says why the server refused one", async () => {
    const { calls } = renderPanel({
      "GET /api/datasets/dv-1/lift-tests": () => jsonResponse(200, []),
      "POST /api/datasets/dv-1/lift-tests": () =>
        jsonResponse(400, { error: { code: "invalid_input", message: "The lift tests were not saved", issues: [{ path: "row 3", message: "Row 3: the channel print is not in the data" }] } }),
    });
    const input = await screen.findByLabelText("CSV file of lift tests");
    fireEvent.change(input, { target: { files: [new File(["%PDF"], "tests.pdf", { type: "application/pdf" })] } });
    expect((await screen.findByRole("alert")).textContent).toBe("Choose a .csv file");
    expect(calls.some((call) => call.method === "POST")).toBe(false);
    fireEvent.change(input, { target: { files: [new File(["brand,market\n"], "tests.csv", { type: "text/csv" })] } });
    expect(await screen.findByText("The lift tests were not saved Row 3: the channel print is not in the data")).toBeTruthy();
  });
});

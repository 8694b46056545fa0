import type { PlanSummary, ScenarioPlan } from "@tributary/contracts";
import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { fixtureDrawSetWire } from "../../../../testing/draw-set-fixtures";
import { channelNameLookup } from "../../../../lib/channel-names";
import { jsonResponse, renderWithProviders, stubFetch, testUsers } from "../../../../testing/test-utils";
import { inlinePlannerRunner } from "../../worker/planner-runner";
import { SpendPlanner } from "../spend-planner";

const wait = { timeout: 5000 };
// The fixture's channels are "search" and "radio"; people read these names.
const channelName = channelNameLookup([
  { code: "search", name: "Paid search" },
  { code: "radio", name: "Local radio" },
]);

function savedPlan(): PlanSummary {
  return {
    id: "p-1",
    kind: "scenario",
    name: "Quiet radio",
    status: "draft",
    runId: "run-7",
    runIsCurrent: true,
    markets: [{ id: "m-bri", name: "Briskmoor" }],
    cellCount: 1,
    horizon: 13,
    spend: 9100,
    extraCustomers: { mean: -3, sd: 1, q05: -5, q25: -4, q50: -3, q75: -2, q95: -1 },
    createdBy: { id: "u-m", name: "Mika Dorne" },
    createdAt: "2025-01-07T10:00:00.000Z",
    updatedAt: "2025-01-07T10:00:00.000Z",
    decidedAt: null,
  };
}

/** The saved plan as the server answers a write: its numbers computed when it was saved. */
function fullPlan(summary: PlanSummary): ScenarioPlan {
  const summaryOf = (q50: number) => ({ mean: q50, sd: 1, q05: q50 - 2, q25: q50 - 1, q50, q75: q50 + 1, q95: q50 + 2 });
  return {
    kind: "scenario",
    id: summary.id,
    name: summary.name,
    note: null,
    status: summary.status,
    runId: summary.runId,
    runIsCurrent: summary.runIsCurrent,
    markets: summary.markets,
    cells: [{ cellId: "c2", brandId: "b-fen", marketId: "m-bri", brand: "Fennick", market: "Briskmoor" }],
    createdBy: summary.createdBy,
    createdAt: summary.createdAt,
    updatedAt: "2025-01-09T10:00:00.000Z",
    submitted: null,
    decision: null,
    can: { edit: true, rename: true, delete: true, submit: false, withdraw: false, decide: false },
    caution: "Estimates are model-based.",
    scenario: {
      horizon: 13,
      recentWeeks: 13,
      seed: 1,
      operations: [{ kind: "zero", target: { channels: ["radio"] } }],
      headline: {
        horizon: 13,
        currentSpend: 10_000,
        scenarioSpend: 9100,
        extraSpend: -900,
        currentOutcome: summaryOf(40),
        scenarioOutcome: summaryOf(37),
        extraCustomers: summaryOf(-3),
        costPerExtraCustomer: { kind: "saving-per-customer-lost", text: "€300 saved per customer lost", interval: null },
        cells: [],
        drawCount: 60,
        computedAt: summary.createdAt,
      },
    },
  };
}

describe("SpendPlanner", () => {
  it("forecasts the current plan and a scenario in the browser, and compares them", async () => {
    stubFetch({
      "GET /api/runs/current/draw-set": () => jsonResponse(200, fixtureDrawSetWire()),
      "GET /api/plans": () => jsonResponse(200, []),
    });
    renderWithProviders(<SpendPlanner user={testUsers.analyst} channelName={channelName} runner={inlinePlannerRunner()} />);
    const current = await screen.findByRole("table", { name: "Current plan per line" }, wait);
    // Three cells × two channels.
    expect(within(current).getAllByRole("row")).toHaveLength(7);
    const comparison = await screen.findByRole("table", { name: "Scenarios against the current plan" }, wait);
    const scenarioRow = within(comparison).getByRole("row", { name: /Scenario A/ });
    // 20 % more search: more spend, a cost per extra customer in money, never a silly number.
    expect(scenarioRow.textContent).toMatch(/€[\d,]+ per extra customer/);
    expect(screen.getByRole("figure", { name: "New customers per week: current plan and scenarios" })).toBeTruthy();
    expect(screen.getAllByRole("complementary", { name: "Caution about estimates" }).length).toBeGreaterThanOrEqual(2);
  });

  it("shows channels by their display names while the codes stay the values", async () => {
    stubFetch({ "GET /api/runs/current/draw-set": () => jsonResponse(200, fixtureDrawSetWire()), "GET /api/plans": () => jsonResponse(200, []) });
    renderWithProviders(<SpendPlanner user={testUsers.analyst} channelName={channelName} runner={inlinePlannerRunner()} />);
    const current = await screen.findByRole("table", { name: "Current plan per line" }, wait);
    const cells = within(current).getAllByRole("cell").map((cell) => cell.textContent);
    expect(cells.filter((text) => text === "Paid search")).toHaveLength(3);
    expect(cells.filter((text) => text === "Local radio")).toHaveLength(3);
    expect(cells).not.toContain("search");
    expect(cells).not.toContain("radio");
    const channel = screen.getByRole("combobox", { name: "Channel of change 1 of Scenario A" }) as HTMLSelectElement;
    expect(channel.value).toBe("search");
    expect([...channel.options].map((option) => [option.value, option.textContent])).toEqual([
      ["", "Every channel"],
      ["search", "Paid search"],
      ["radio", "Local radio"],
    ]);
  });

  it("updates the forecast when a line of the current plan is edited, and saves a scenario with the edit first", async () => {
    const { calls } = stubFetch({
      "GET /api/runs/current/draw-set": () => jsonResponse(200, fixtureDrawSetWire()),
      "GET /api/plans": () => jsonResponse(200, []),
      "POST /api/plans/scenarios": ({ body }) => jsonResponse(400, { error: { code: "invalid_input", message: "Some of what you entered is not valid.", issues: [{ path: "name", message: `A plan named “${(body as { name: string }).name}” exists` }] } }),
    });
    renderWithProviders(<SpendPlanner user={testUsers.analyst} channelName={channelName} runner={inlinePlannerRunner()} />);
    await screen.findByRole("table", { name: "Scenarios against the current plan" }, wait);
    const spendCell = () => within(screen.getByRole("table", { name: "Scenarios against the current plan" })).getByRole("row", { name: /^Current plan/ }).textContent;
    const before = spendCell();
    fireEvent.change(screen.getByRole("textbox", { name: "Planned weekly spend, Local radio in Hollowby Ardeval" }), { target: { value: "0" } });
    await waitFor(() => expect(spendCell()).not.toBe(before), wait);
    expect(screen.getByRole("button", { name: "Back to the recent average, Local radio in Hollowby Ardeval" })).toBeTruthy();

    const form = screen.getByRole("form", { name: "Save Scenario A" });
    fireEvent.change(within(form).getByLabelText("Save as"), { target: { value: "Radio off in Ardeval" } });
    fireEvent.click(within(form).getByRole("button", { name: "Save scenario" }));
    await within(form).findByText("A plan named “Radio off in Ardeval” exists", {}, wait);
    const post = calls.find((call) => call.method === "POST");
    expect(post?.body).toEqual({
      name: "Radio off in Ardeval",
      runId: "run-7",
      cellIds: ["c1", "c3", "c2"],
      horizon: 13,
      recentWeeks: 13,
      seed: 1,
      operations: [
        { kind: "set", target: { cells: [{ brand: "Hollowby", market: "Ardeval" }], channels: ["radio"] }, weekly: 0 },
        { kind: "scale", factor: 1.2, target: { channels: ["search"] } },
      ],
    });
  });

  it("holds the forecast back while an edit is not a number, and says why", async () => {
    stubFetch({ "GET /api/runs/current/draw-set": () => jsonResponse(200, fixtureDrawSetWire()), "GET /api/plans": () => jsonResponse(200, []) });
    renderWithProviders(<SpendPlanner user={testUsers.analyst} channelName={channelName} runner={inlinePlannerRunner()} />);
    await screen.findByRole("table", { name: "Scenarios against the current plan" }, wait);
    fireEvent.change(screen.getByRole("textbox", { name: "Planned weekly spend, Paid search in Fennick Ardeval" }), { target: { value: "-40" } });
    expect(screen.getByText("Every planned weekly spend must be a number of 0 or more.")).toBeTruthy();
    fireEvent.change(screen.getByLabelText("Weeks to plan"), { target: { value: "0" } });
    expect(screen.getByText("Weeks to plan must be a whole number from 1 to 156")).toBeTruthy();
  });

  it("plans a market manager's own market only, and lists the scenarios saved for it", async () => {
    stubFetch({
      "GET /api/runs/current/draw-set": () => jsonResponse(200, fixtureDrawSetWire(undefined, ["c2"])),
      "GET /api/plans": () => jsonResponse(200, [savedPlan()]),
    });
    renderWithProviders(<SpendPlanner user={testUsers.market_manager} channelName={channelName} runner={inlinePlannerRunner()} />);
    expect(await screen.findByText("You see and plan your own markets only.")).toBeTruthy();
    const current = await screen.findByRole("table", { name: "Current plan per line" }, wait);
    expect(within(current).getAllByRole("row")).toHaveLength(3);
    expect(within(current).queryByText(/Ardeval/)).toBeNull();
    const saved = await screen.findByRole("table", { name: "Saved scenarios" });
    expect(within(saved).getByRole("row", { name: /Quiet radio/ }).textContent).toMatch(/Briskmoor/);
    expect(within(saved).getByRole("button", { name: "Delete Quiet radio" })).toBeTruthy();
  });

  it("says plainly when there is no published fit to plan with", async () => {
    stubFetch({ "GET /api/runs/current/draw-set": () => jsonResponse(404, { error: { code: "not_found", message: "No run has been published yet." } }) });
    renderWithProviders(<SpendPlanner user={testUsers.portfolio_lead} channelName={channelName} runner={inlinePlannerRunner()} />);
    expect(await screen.findByRole("heading", { name: "No published fit yet" })).toBeTruthy();
    expect(screen.getByRole("complementary", { name: "Caution about estimates" }).textContent).toMatch(/lift test/);
  });

  it("renames a saved scenario in place: the name is checked as the server checks it, a refusal is shown, the list follows", async () => {
    let plan = savedPlan();
    let refuse = true;
    const { calls } = stubFetch({
      "GET /api/runs/current/draw-set": () => jsonResponse(200, fixtureDrawSetWire(undefined, ["c2"])),
      "GET /api/plans": () => jsonResponse(200, [plan]),
      "PATCH /api/plans/p-1": ({ body }) => {
        if (refuse) {
          refuse = false;
          return jsonResponse(409, { error: { code: "conflict", message: "The plan changed meanwhile; reload it" } });
        }
        plan = { ...plan, name: (body as { name: string }).name, updatedAt: "2025-01-09T10:00:00.000Z" };
        return jsonResponse(200, fullPlan(plan));
      },
    });
    renderWithProviders(<SpendPlanner user={testUsers.market_manager} channelName={channelName} runner={inlinePlannerRunner()} />);
    const saved = await screen.findByRole("table", { name: "Saved scenarios" }, wait);
    fireEvent.click(within(saved).getByRole("button", { name: "Rename Quiet radio" }));
    const form = screen.getByRole("form", { name: "New name for “Quiet radio”" });
    const field = within(form).getByRole("textbox", { name: "New name for “Quiet radio”" }) as HTMLInputElement;
    expect(field.value).toBe("Quiet radio");
    expect(document.activeElement).toBe(field);

    // A blank name and one over the limit are refused here, with the server's words, and nothing is sent.
    fireEvent.change(field, { target: { value: "   " } });
    fireEvent.click(within(form).getByRole("button", { name: "Save name" }));
    expect(within(form).getByRole("alert").textContent).toBe("Give the plan a name");
    expect(field.getAttribute("aria-invalid")).toBe("true");
    fireEvent.change(field, { target: { value: "x".repeat(121) } });
    fireEvent.click(within(form).getByRole("button", { name: "Save name" }));
    expect(within(form).getByRole("alert").textContent).toBe("Keep the name to 120 characters or fewer");
    expect(calls.filter((call) => call.method === "PATCH")).toHaveLength(0);

    // The server's refusal stays with the name that was sent.
    fireEvent.change(field, { target: { value: "  Radio off in Briskmoor " } });
    fireEvent.click(within(form).getByRole("button", { name: "Save name" }));
    expect((await within(form).findByRole("alert", {}, wait)).textContent).toBe("The plan changed meanwhile; reload it");
    expect(within(saved).getByRole("row", { name: /Quiet radio/ })).toBeTruthy();

    fireEvent.click(within(form).getByRole("button", { name: "Save name" }));
    await screen.findByText("Renamed “Quiet radio” to “Radio off in Briskmoor”.", {}, wait);
    const patches = calls.filter((call) => call.method === "PATCH");
    expect(patches.map((call) => call.body)).toEqual([{ name: "Radio off in Briskmoor" }, { name: "Radio off in Briskmoor" }]);
    await within(saved).findByRole("button", { name: "Rename Radio off in Briskmoor" }, wait);
    expect(screen.queryByRole("form", { name: /New name for/ })).toBeNull();
  });

  it("offers renaming only to the author and admins, and Escape keeps the name", async () => {
    stubFetch({
      "GET /api/runs/current/draw-set": () => jsonResponse(200, fixtureDrawSetWire()),
      "GET /api/plans": () => jsonResponse(200, [savedPlan()]),
    });
    const first = renderWithProviders(<SpendPlanner user={testUsers.analyst} channelName={channelName} runner={inlinePlannerRunner()} />);
    const asAnalyst = await screen.findByRole("table", { name: "Saved scenarios" }, wait);
    expect(within(asAnalyst).getByRole("button", { name: "Open Quiet radio" })).toBeTruthy();
    expect(within(asAnalyst).queryByRole("button", { name: "Rename Quiet radio" })).toBeNull();
    first.unmount();

    const { calls } = stubFetch({
      "GET /api/runs/current/draw-set": () => jsonResponse(200, fixtureDrawSetWire()),
      "GET /api/plans": () => jsonResponse(200, [savedPlan()]),
    });
    renderWithProviders(<SpendPlanner user={testUsers.admin} channelName={channelName} runner={inlinePlannerRunner()} />);
    const asAdmin = await screen.findByRole("table", { name: "Saved scenarios" }, wait);
    fireEvent.click(within(asAdmin).getByRole("button", { name: "Rename Quiet radio" }));
    const field = screen.getByRole("textbox", { name: "New name for “Quiet radio”" });
    fireEvent.change(field, { target: { value: "Something else" } });
    fireEvent.keyDown(field, { key: "Escape" });
    expect(screen.queryByRole("form", { name: "New name for “Quiet radio”" })).toBeNull();
    expect(within(asAdmin).getByRole("row", { name: /Quiet radio/ })).toBeTruthy();
    expect(calls.filter((call) => call.method === "PATCH")).toHaveLength(0);
  });
});

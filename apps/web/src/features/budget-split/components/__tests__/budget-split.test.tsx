import type { BudgetSplitPlan, BudgetSplitPlanInput, BudgetSplitResultView, PlanSummary } from "@tributary/contracts";
import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { fixtureCellIds, fixtureDrawSet, fixtureDrawSetWire } from "../../../../testing/draw-set-fixtures";
import { channelNameLookup } from "../../../../lib/channel-names";
import { jsonResponse, renderWithProviders, stubFetch, testPortfolio, testUsers } from "../../../../testing/test-utils";
import { createSplitApi } from "../../worker/split-api";
import { inlineSplitRunner } from "../../worker/split-runner";
import { BudgetSplit } from "../budget-split";

const wait = { timeout: 5000 };
// The fixture's channels are "search" and "radio"; people read these names.
const channelName = channelNameLookup([
  { code: "search", name: "Paid search" },
  { code: "radio", name: "Local radio" },
]);

/** A saved split of cells c1 and c3: 30,000 over 13 weeks for the most customers, expected outcome. */
function splitInput(name: string): BudgetSplitPlanInput {
  return { name, runId: "run-7", cellIds: ["c1", "c3"], totalBudget: 30000, horizon: 13, recentWeeks: 13, bounds: [], objective: { kind: "customers" }, risk: { kind: "expected" }, allocation: [] };
}

/** What the server answers to a saved split: the same computation on the same draws, in the API's shape. */
function savedPlan(body: BudgetSplitPlanInput, status: BudgetSplitPlan["status"], can: Partial<BudgetSplitPlan["can"]>): BudgetSplitPlan {
  const api = createSplitApi();
  api.load("run-7", fixtureDrawSet());
  const names = { c1: ["Fennick", "Ardeval"], c3: ["Hollowby", "Ardeval"], c2: ["Fennick", "Briskmoor"] } as Record<string, [string, string]>;
  const response = api.split("run-7", {
    cells: body.cellIds.map((id) => ({ brand: names[id]![0], market: names[id]![1] })),
    totalBudget: body.totalBudget,
    horizon: body.horizon,
    recentWeeks: body.recentWeeks,
    bounds: body.bounds,
    objective: body.objective,
    risk: body.risk,
  });
  if (!response.ok) throw new Error(response.message);
  const r = response.result;
  const histogram = (o: typeof r.outcome.allocation) => ({ ...o, histogram: { edges: Array.from(o.histogram.edges), counts: Array.from(o.histogram.counts) } });
  const result: BudgetSplitResultView = {
    objective: r.objective,
    horizon: r.horizon,
    totalBudget: r.totalBudget,
    allocatedTotal: r.allocatedTotal,
    currentTotal: r.currentTotal,
    budgetBinding: r.budgetBinding,
    exact: r.exact,
    method: r.method,
    lines: r.lines.map((line) => ({
      cellId: fixtureCellIds[line.cellIndex]!,
      brand: line.brand,
      market: line.market,
      channel: line.channel,
      allocation: line.allocation,
      weeklyAllocation: line.weeklyAllocation,
      current: line.current,
      lower: line.lower,
      upper: Number.isFinite(line.upper) ? line.upper : null,
      activeBound: line.activeBound,
      marginalCac: Number.isFinite(line.marginalCac) ? line.marginalCac : null,
      expectedCustomers: line.expectedCustomers,
      beyondObservedSpend: line.beyondObservedSpend,
    })),
    outcome: { allocation: histogram(r.outcome.allocation), current: histogram(r.outcome.current) },
    customers: r.customers,
    profit: r.profit,
    riskCriterion: r.riskCriterion,
    notes: [...r.notes],
    drawCount: 60,
    computedAt: "2025-01-08T09:00:00.000Z",
  };
  return {
    kind: "budget_split",
    id: "plan-9",
    name: body.name,
    note: body.note ?? null,
    status,
    runId: "run-7",
    runIsCurrent: true,
    markets: [{ id: "m-ard", name: "Ardeval" }],
    cells: body.cellIds.map((id) => ({ cellId: id, brandId: "b", marketId: "m-ard", brand: names[id]![0], market: names[id]![1] })),
    createdBy: { id: "u-l", name: "Lior Pask" },
    createdAt: "2025-01-08T09:00:00.000Z",
    updatedAt: "2025-01-08T09:00:00.000Z",
    submitted: status === "draft" ? null : { by: { id: "u-l", name: "Lior Pask" }, at: "2025-01-08T09:05:00.000Z" },
    decision: null,
    can: { edit: true, rename: true, delete: true, submit: false, withdraw: false, decide: false, ...can },
    caution: "Estimates are model-based.",
    budgetSplit: { totalBudget: body.totalBudget, horizon: body.horizon, recentWeeks: body.recentWeeks ?? 13, bounds: body.bounds ?? [], objective: body.objective, risk: body.risk ?? { kind: "expected" }, result },
  };
}

describe("BudgetSplit", () => {
  it("splits the budget in the browser, saves it with the allocation computed and submits it for approval", async () => {
    let saved: BudgetSplitPlan | null = null;
    const { calls } = stubFetch({
      "GET /api/runs/current/draw-set": () => jsonResponse(200, fixtureDrawSetWire()),
      "GET /api/plans": () => jsonResponse(200, []),
      "POST /api/plans/budget-splits": ({ body }) => {
        saved = savedPlan(body as BudgetSplitPlanInput, "draft", { submit: true });
        return jsonResponse(201, saved);
      },
      "GET /api/plans/plan-9": () => jsonResponse(200, saved),
      "POST /api/plans/plan-9/submit": () => {
        saved = savedPlan(calls.find((c) => c.method === "POST")!.body as BudgetSplitPlanInput, "submitted", { withdraw: true });
        return jsonResponse(200, saved);
      },
    });
    renderWithProviders(<BudgetSplit user={testUsers.analyst} portfolio={testPortfolio()} channelName={channelName} runner={inlineSplitRunner()} />);
    const form = await screen.findByRole("form", { name: "Budget split inputs" }, wait);
    fireEvent.change(within(form).getByLabelText("Total budget (EUR)"), { target: { value: "45000" } });
    fireEvent.change(within(form).getByRole("textbox", { name: "Lower bound, Local radio" }), { target: { value: "3000" } });
    fireEvent.click(within(form).getByRole("button", { name: "Split the budget" }));

    const result = await screen.findByRole("region", { name: "The split" }, wait);
    expect(within(result).getByRole("region", { name: "Check: equal return at the margin" }).getAttribute("data-marginal-equal")).toBe("true");
    expect(within(result).getAllByText(/^Local radio in .*at its lower bound \(€3,000\)/)).toHaveLength(3);

    const save = screen.getByRole("form", { name: "Save the split as a plan" });
    fireEvent.click(within(save).getByRole("button", { name: "Save plan" }));
    expect(await within(save).findByText("Give the plan a name")).toBeTruthy();
    fireEvent.change(within(save).getByLabelText("Plan name"), { target: { value: "Q3 split, radio kept up" } });
    fireEvent.click(within(save).getByRole("button", { name: "Save plan" }));

    const panel = await screen.findByRole("region", { name: "Plan Q3 split, radio kept up" }, wait);
    const post = calls.find((call) => call.method === "POST" && call.path === "/api/plans/budget-splits")!.body as BudgetSplitPlanInput;
    expect(post).toMatchObject({ name: "Q3 split, radio kept up", runId: "run-7", cellIds: ["c1", "c3", "c2"], totalBudget: 45000, horizon: 13, recentWeeks: 13, objective: { kind: "customers" }, risk: { kind: "expected" } });
    expect(post.bounds).toEqual([{ target: { channels: ["radio"] }, lower: 3000 }]);
    // One allocation line per cell × channel, adding up to the budget.
    expect(post.allocation).toHaveLength(6);
    expect(post.allocation.reduce((a, line) => a + line.amount, 0)).toBeCloseTo(45000, 3);
    expect(within(panel).getByText("Draft")).toBeTruthy();

    fireEvent.click(within(panel).getByRole("button", { name: "Submit for approval" }));
    await within(panel).findByText("Waiting for approval", {}, wait);
    expect(within(panel).getByText("Waiting for a portfolio lead to approve or reject it.")).toBeTruthy();
    expect(within(panel).queryByRole("form", { name: "Decide on this plan" })).toBeNull();
    expect(within(panel).getByRole("button", { name: "Withdraw" })).toBeTruthy();
  }, 30_000);

  it("lets a portfolio lead approve a submitted split, and asks for a comment to reject it", async () => {
    const body = splitInput("Q3 split from the analyst");
    let plan: BudgetSplitPlan = { ...savedPlan(body, "submitted", { decide: true, rename: false, delete: false, edit: false }), createdBy: { id: "u-n", name: "Nell Ostrand" } };
    const summary: PlanSummary = {
      id: plan.id,
      kind: "budget_split",
      name: plan.name,
      status: "submitted",
      runId: "run-7",
      runIsCurrent: true,
      markets: plan.markets,
      cellCount: 2,
      horizon: 13,
      spend: 30000,
      extraCustomers: plan.budgetSplit.result.customers.difference,
      createdBy: plan.createdBy,
      createdAt: plan.createdAt,
      updatedAt: plan.updatedAt,
      decidedAt: null,
    };
    const { calls } = stubFetch({
      "GET /api/runs/current/draw-set": () => jsonResponse(200, fixtureDrawSetWire()),
      "GET /api/plans": () => jsonResponse(200, [summary]),
      "GET /api/plans/plan-9": () => jsonResponse(200, plan),
      "POST /api/plans/plan-9/decision": () => {
        plan = { ...plan, status: "approved", can: { ...plan.can, decide: false }, decision: { by: { id: "u-l", name: "Lior Pask" }, at: "2025-01-08T10:00:00.000Z", comment: "Go ahead" } };
        return jsonResponse(200, plan);
      },
    });
    renderWithProviders(<BudgetSplit user={testUsers.portfolio_lead} portfolio={testPortfolio()} channelName={channelName} runner={inlineSplitRunner()} />);
    const list = await screen.findByRole("table", { name: "Saved budget splits" }, wait);
    expect(within(list).getByRole("row", { name: /Q3 split from the analyst/ }).textContent).toMatch(/Waiting for approval/);
    fireEvent.click(within(list).getByRole("button", { name: "Open Q3 split from the analyst" }));
    const panel = await screen.findByRole("region", { name: "Plan Q3 split from the analyst" }, wait);
    // Only the author or an admin renames it.
    expect(within(panel).queryByRole("button", { name: "Rename" })).toBeNull();
    const decision = within(panel).getByRole("form", { name: "Decide on this plan" });
    fireEvent.click(within(decision).getByRole("button", { name: "Reject" }));
    expect(within(decision).getByRole("alert").textContent).toBe("Say why the plan is rejected (at least 5 characters)");
    expect(calls.filter((call) => call.path.endsWith("/decision"))).toHaveLength(0);
    fireEvent.change(within(decision).getByLabelText("Comment (required to reject)"), { target: { value: "Go ahead" } });
    fireEvent.click(within(decision).getByRole("button", { name: "Approve" }));
    await within(panel).findByText(/^Approved .* by Lior Pask: “Go ahead”/, {}, wait);
    expect(calls.find((call) => call.path.endsWith("/decision"))?.body).toEqual({ decision: "approve", comment: "Go ahead" });
    // The saved result shows with its caution.
    expect(within(panel).getByRole("complementary", { name: "Caution about estimates" })).toBeTruthy();
  }, 30_000);

  it("lets the author rename an approved split: the name changes, the approval and numbers stay", async () => {
    const body = splitInput("Q3 split");
    let plan: BudgetSplitPlan = {
      ...savedPlan(body, "approved", { edit: false, delete: false }),
      createdBy: { id: "u-n", name: "Nell Ostrand" },
      decision: { by: { id: "u-l", name: "Lior Pask" }, at: "2025-01-08T10:00:00.000Z", comment: "Go ahead" },
    };
    const summary = (): PlanSummary => ({
      id: plan.id,
      kind: "budget_split",
      name: plan.name,
      status: plan.status,
      runId: "run-7",
      runIsCurrent: true,
      markets: plan.markets,
      cellCount: 2,
      horizon: 13,
      spend: 30000,
      extraCustomers: plan.budgetSplit.result.customers.difference,
      createdBy: plan.createdBy,
      createdAt: plan.createdAt,
      updatedAt: plan.updatedAt,
      decidedAt: "2025-01-08T10:00:00.000Z",
    });
    const { calls } = stubFetch({
      "GET /api/runs/current/draw-set": () => jsonResponse(200, fixtureDrawSetWire()),
      "GET /api/plans": () => jsonResponse(200, [summary()]),
      "GET /api/plans/plan-9": () => jsonResponse(200, plan),
      "PATCH /api/plans/plan-9": ({ body: change }) => {
        plan = { ...plan, name: (change as { name: string }).name };
        return jsonResponse(200, plan);
      },
    });
    renderWithProviders(<BudgetSplit user={testUsers.analyst} portfolio={testPortfolio()} channelName={channelName} runner={inlineSplitRunner()} />);
    const list = await screen.findByRole("table", { name: "Saved budget splits" }, wait);
    fireEvent.click(within(list).getByRole("button", { name: "Open Q3 split" }));
    const panel = await screen.findByRole("region", { name: "Plan Q3 split" }, wait);
    fireEvent.click(within(panel).getByRole("button", { name: "Rename" }));
    const form = within(panel).getByRole("form", { name: "New name for “Q3 split”" });
    const field = within(form).getByRole("textbox", { name: "New name for “Q3 split”" });
    fireEvent.change(field, { target: { value: "" } });
    fireEvent.click(within(form).getByRole("button", { name: "Save name" }));
    expect(within(form).getByRole("alert").textContent).toBe("Give the plan a name");
    expect(calls.filter((call) => call.method === "PATCH")).toHaveLength(0);
    fireEvent.change(field, { target: { value: "Q3 split (approved) " } });
    fireEvent.click(within(form).getByRole("button", { name: "Save name" }));
    const renamed = await screen.findByRole("region", { name: "Plan Q3 split (approved)" }, wait);
    expect(calls.find((call) => call.method === "PATCH")?.body).toEqual({ name: "Q3 split (approved)" });
    expect(within(renamed).getByText(/^Approved .* by Lior Pask: “Go ahead”/)).toBeTruthy();
    expect(within(renamed).queryByRole("form", { name: /New name for/ })).toBeNull();
    // The list follows.
    await within(list).findByRole("button", { name: "Open Q3 split (approved)" }, wait);
  }, 30_000);

  it("shows the inputs that are wrong and does not split", async () => {
    stubFetch({ "GET /api/runs/current/draw-set": () => jsonResponse(200, fixtureDrawSetWire()), "GET /api/plans": () => jsonResponse(200, []) });
    const portfolio = testPortfolio();
    renderWithProviders(
      <BudgetSplit user={testUsers.analyst} portfolio={{ ...portfolio, brands: portfolio.brands.map((b) => ({ ...b, customerValue: b.name === "Hollowby" ? null : b.customerValue })) }} channelName={channelName} runner={inlineSplitRunner()} />,
    );
    const form = await screen.findByRole("form", { name: "Budget split inputs" }, wait);
    fireEvent.change(within(form).getByLabelText("Total budget (EUR)"), { target: { value: "-3" } });
    fireEvent.click(within(form).getByLabelText(/Most expected profit/));
    fireEvent.click(within(form).getByRole("button", { name: "Split the budget" }));
    expect(within(form).getByText("Enter a total budget above 0")).toBeTruthy();
    expect(within(form).getByText(/Profit needs the value of a new customer for Hollowby/)).toBeTruthy();
    expect(within(form).getByRole("alert").textContent).toMatch(/need fixing/);
    await waitFor(() => expect(screen.queryByRole("region", { name: "The split" })).toBeNull());
  });

  it("passes on the split's own objection in words", async () => {
    stubFetch({ "GET /api/runs/current/draw-set": () => jsonResponse(200, fixtureDrawSetWire()), "GET /api/plans": () => jsonResponse(200, []) });
    renderWithProviders(<BudgetSplit user={testUsers.analyst} portfolio={testPortfolio()} channelName={channelName} runner={inlineSplitRunner()} />);
    const form = await screen.findByRole("form", { name: "Budget split inputs" }, wait);
    fireEvent.change(within(form).getByLabelText("Total budget (EUR)"), { target: { value: "1000" } });
    fireEvent.change(within(form).getByRole("textbox", { name: "Lower bound, Paid search" }), { target: { value: "5000" } });
    fireEvent.click(within(form).getByRole("button", { name: "Split the budget" }));
    const error = await screen.findByRole("alert", {}, wait);
    expect(error.textContent).toMatch(/the lower bounds add up to 15000, more than the total budget 1000/);
  });
});

// Planning through the API on a small published fit: the draw set scoped to the viewer's
// markets, saved scenarios and budget splits visible by market scope, the server's check
// of a budget split's allocation, the approval workflow with its e-mails and audit
// entries, and the CSV exports.
import Papa from "papaparse";
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  decodeDrawSet,
  drawSetWireSchema,
  modelCaution,
  planBounds,
  planSchema,
  planSummarySchema,
  type BudgetSplitPlanInput,
  type DecodedDrawSet,
  type Plan,
} from "@tributary/contracts";
import { budgetSplit, comparePlans, currentPlan, applyScenario, type DrawSet } from "@tributary/stats";
import { auditLog, cells, markets, outbox, plans } from "../db/schema";
import { demoUsers } from "../demo/users";
import { loadRunDrawSet } from "../runs/run-results";
import { closeDatabase } from "../db/client";
import { fittedDatabase } from "../testing/fitted-snapshot";
import { demoTestApp, signedInAgent, type TestApp } from "../testing/test-app";
import { toCsv } from "../plans/plan-csv";

type Agent = Awaited<ReturnType<typeof signedInAgent>>;

let t: TestApp;
let runId: string;
let analyst: Agent, lead: Agent, admin: Agent, veltria: Agent, south: Agent;
/** Cell ids by "Brand × Market". */
const cellId = new Map<string, string>();

beforeAll(async () => {
  const fitted = await fittedDatabase();
  t = await demoTestApp({}, fitted.db);
  runId = fitted.publishedRunId;
  [analyst, lead, admin, veltria, south] = await Promise.all([
    signedInAgent(t.app, demoUsers.analyst),
    signedInAgent(t.app, demoUsers.portfolioLead),
    signedInAgent(t.app, demoUsers.admin),
    signedInAgent(t.app, demoUsers.veltriaManager),
    signedInAgent(t.app, demoUsers.southManager),
  ]);
  const wire = drawSetWireSchema.parse((await lead.get("/api/runs/current/draw-set").expect(200)).body);
  for (const cell of wire.cells) cellId.set(`${cell.brand} × ${cell.market}`, cell.cellId);
});
afterAll(async () => {
  await t.close();
  await closeDatabase(t.db);
});

const kv = () => cellId.get("Kestrova × Veltria")!;
const ks = () => cellId.get("Kestrova × Solvera")!;
const pv = () => cellId.get("Plumrise × Veltria")!;

async function drawSetAs(agent: Agent, query = ""): Promise<DecodedDrawSet> {
  return decodeDrawSet(drawSetWireSchema.parse((await agent.get(`/api/runs/current/draw-set${query}`).expect(200)).body));
}

describe("the draw set route", () => {
  it("gives a market manager only their markets' cells, with the same draws as the run's", async () => {
    const full = await loadRunDrawSet(t.db, runId);
    const mine = await drawSetAs(veltria);
    expect(mine.cells.map((c) => `${c.brand} × ${c.market}`).sort()).toEqual(["Kestrova × Veltria", "Plumrise × Veltria"]);
    expect(mine.cells.every((c) => c.market === "Veltria")).toBe(true);
    // Same numbers as the run's own draw set, laid out over the two cells.
    const G = full.cells.length;
    const C = full.channels.length;
    mine.cells.forEach((cell, i) => {
      const g = full.cells.findIndex((c) => c.brand === cell.brand && c.market === cell.market);
      expect(Array.from(cell.outcome)).toEqual(Array.from(full.cells[g]!.outcome));
      expect(Array.from(cell.spend[1]!)).toEqual(Array.from(full.cells[g]!.spend[1]!));
      for (const d of [0, 57, full.drawCount - 1]) {
        for (let c = 0; c < C; c++) expect(mine.beta[(d * 2 + i) * C + c]).toBe(full.beta[(d * G + g) * C + c]);
        expect(mine.sigma[d * 2 + i]).toBe(full.sigma[d * G + g]);
        expect(mine.nu[d * 2 + i]).toBe(full.nu[d * G + g]);
      }
    });
    // The decoded set is the stats package's DrawSet and plans like it.
    const set: DrawSet = mine;
    const reference = currentPlan(set, { horizon: 4 });
    expect(comparePlans(set, reference, applyScenario(reference, [{ kind: "scale", factor: 1.5 }])).selection.extraSpend).toBeGreaterThan(0);
  });

  it("refuses another market's cell as if it did not exist, and gives the others every cell", async () => {
    const refused = await veltria.get(`/api/runs/current/draw-set?cells=${ks()}`).expect(404);
    const unknown = await veltria.get("/api/runs/current/draw-set?cells=no-such-cell").expect(404);
    expect(refused.body.error.message.replace(ks(), "X")).toBe(unknown.body.error.message.replace("no-such-cell", "X"));
    await veltria.get(`/api/runs/current/draw-set?cells=${kv()},${ks()}`).expect(404);
    expect((await drawSetAs(veltria, `?cells=${pv()}`)).cells.map((c) => c.brand)).toEqual(["Plumrise"]);
    // The south manager's markets have no cell in this fit.
    expect((await drawSetAs(south)).cells).toHaveLength(0);
    expect((await drawSetAs(lead)).cells).toHaveLength(3);
    await veltria.get("/api/runs/current/draw-set?cells=").expect(400);
  });
});

const scenarioInput = (cellIds: string[], name = "Social up a fifth") => ({
  name,
  runId,
  cellIds,
  horizon: 8,
  recentWeeks: 6,
  operations: [{ kind: "scale", target: { channels: ["social"] }, factor: 1.2 }],
});

describe("scenarios", () => {
  let mine: Plan;
  let mixed: Plan;
  beforeAll(async () => {
    mine = planSchema.parse((await veltria.post("/api/plans/scenarios").send(scenarioInput([kv(), pv()])).expect(201)).body);
    mixed = planSchema.parse((await analyst.post("/api/plans/scenarios").send(scenarioInput([kv(), ks()], "Both markets")).expect(201)).body);
  });

  it("stores the inputs and the headline the server computed on the same draws", async () => {
    expect(mine.kind).toBe("scenario");
    if (mine.kind !== "scenario") return;
    expect(mine.status).toBe("draft");
    expect(mine.runIsCurrent).toBe(true);
    expect(mine.markets.map((m) => m.name)).toEqual(["Veltria"]);
    expect(mine.caution).toBe(modelCaution);
    // The same comparison computed here on the manager's own draw set: the extra customers (noise cancels) agree.
    const set = await drawSetAs(veltria, `?cells=${kv()},${pv()}`);
    const reference = currentPlan(set, { horizon: 8, recentWeeks: 6 });
    const cmp = comparePlans(set, reference, applyScenario(reference, [{ kind: "scale", target: { channels: ["social"] }, factor: 1.2 }]), { seed: 1 });
    const h = mine.scenario.headline;
    expect(h.extraSpend).toBeCloseTo(cmp.selection.extraSpend, 6);
    expect(h.extraCustomers.q50).toBeCloseTo(cmp.selection.extraCustomers.q50, 6);
    expect(h.scenarioOutcome.q50).toBeCloseTo(cmp.scenario.selection.total.q50, 6);
    expect(h.extraSpend).toBeGreaterThan(0);
    expect(h.cells.map((c) => c.cellId)).toEqual([kv(), pv()]);
  });

  it("is visible only to people who see all its markets", async () => {
    const ids = (list: unknown) => planSummarySchema.array().parse(list).map((p) => p.id);
    expect(ids((await veltria.get("/api/plans").expect(200)).body)).toContain(mine.id);
    expect(ids((await veltria.get("/api/plans").expect(200)).body)).not.toContain(mixed.id);
    expect(ids((await lead.get("/api/plans").expect(200)).body)).toEqual(expect.arrayContaining([mine.id, mixed.id]));
    expect(ids((await south.get("/api/plans").expect(200)).body)).toEqual([]);
    await veltria.get(`/api/plans/${mixed.id}`).expect(404);
    await veltria.get(`/api/plans/${mixed.id}/allocation.csv`).expect(404);
    await veltria.delete(`/api/plans/${mixed.id}`).expect(404);
    await south.get(`/api/plans/${mine.id}`).expect(404);
    await lead.get(`/api/plans/${mine.id}`).expect(200);
  });

  it("cannot be saved by a market manager with another market's cell; nothing is stored", async () => {
    const before = (await t.db.select().from(plans)).length;
    const refused = await veltria.post("/api/plans/scenarios").send(scenarioInput([kv(), ks()])).expect(403);
    expect(refused.body.error.message).toContain("your own markets");
    await veltria.put(`/api/plans/${mine.id}`).send(scenarioInput([ks()])).expect(403);
    expect((await t.db.select().from(plans)).length).toBe(before);
  });

  it("refuses bad input with a clear message", async () => {
    const bad = await veltria.post("/api/plans/scenarios").send({ ...scenarioInput([kv()]), operations: [{ kind: "scale", target: { channels: ["radio"] }, factor: 2 }] }).expect(400);
    expect(bad.body.error.message).toContain('channel "radio"');
    const negative = await veltria.post("/api/plans/scenarios").send({ ...scenarioInput([kv()]), operations: [{ kind: "add", amountPerWeek: -1e9 }] }).expect(400);
    expect(negative.body.error.message).toContain("cannot be negative");
    await veltria.post("/api/plans/scenarios").send({ ...scenarioInput([kv()]), horizon: 0 }).expect(400);
    const stale = await veltria.post("/api/plans/scenarios").send({ ...scenarioInput([kv()]), runId: "older-run" }).expect(409);
    expect(stale.body.error.message).toContain("newer fit");
  });

  it("is changed and renamed by its author, not by others", async () => {
    const changed = planSchema.parse((await veltria.put(`/api/plans/${mine.id}`).send({ ...scenarioInput([kv()]), name: "Kestrova only" }).expect(200)).body);
    expect(changed.name).toBe("Kestrova only");
    expect(changed.cells.map((c) => c.cellId)).toEqual([kv()]);
    await analyst.put(`/api/plans/${mine.id}`).send(scenarioInput([kv()])).expect(403);
    await analyst.patch(`/api/plans/${mine.id}`).send({ name: "Mine now" }).expect(403);
    const renamed = planSchema.parse((await veltria.patch(`/api/plans/${mine.id}`).send({ note: "For the Q3 review" }).expect(200)).body);
    expect(renamed.note).toBe("For the Q3 review");
    // Scenarios do not go through approval.
    await veltria.post(`/api/plans/${mine.id}/submit`).expect(403);
  });

  it("exports its tables as CSV with the caution", async () => {
    const allocation = await veltria.get(`/api/plans/${mine.id}/allocation.csv`).expect(200);
    expect(allocation.headers["content-type"]).toMatch(/^text\/csv/);
    const rows = Papa.parse<string[]>(allocation.text.replace(/^\uFEFF/, "").trim()).data;
    expect(rows[0]).toEqual(["brand", "market", "channel", "current_plan_spend", "scenario_spend", "change"]);
    // The channel by its display name, as people read it.
    expect(rows.some((r) => r[2] === "social")).toBe(false);
    const social = rows.find((r) => r[2] === "Social")!;
    expect(Number(social[4])).toBeCloseTo(Number(social[3]) * 1.2, 0);
    expect(rows.at(-1)).toEqual(["Note", modelCaution]);
    const forecast = Papa.parse<string[]>((await veltria.get(`/api/plans/${mine.id}/forecast.csv`).expect(200)).text.replace(/^\uFEFF/, "").trim()).data;
    expect(forecast[0]![0]).toBe("brand");
    expect(forecast.filter((r) => r[0] === "Kestrova" && r[1] === "Veltria")).toHaveLength(8);
  });
});

/** The split as the browser computes it, on the lead's full draw set. */
async function splitInput(agent: Agent, name: string, cellIds = [kv(), pv()]): Promise<BudgetSplitPlanInput> {
  const set = await drawSetAs(agent);
  const refs = cellIds.map((id) => set.cells.find((c) => c.cellId === id)!);
  const inputs = { totalBudget: 250_000, horizon: 8, recentWeeks: 8, bounds: [{ target: { channels: ["search"] }, lower: 40_000 }], objective: { kind: "customers" as const } };
  const result = budgetSplit(set, { ...inputs, cells: refs.map((c) => ({ brand: c.brand, market: c.market })) });
  return {
    name,
    runId,
    cellIds,
    ...inputs,
    allocation: result.lines.map((line) => ({ cellId: refs.find((c) => c.brand === line.brand && c.market === line.market)!.cellId, channel: line.channel, amount: line.allocation })),
  };
}

describe("renaming a saved plan", () => {
  let plan: Plan;
  beforeAll(async () => {
    plan = planSchema.parse((await veltria.post("/api/plans/scenarios").send(scenarioInput([kv(), pv()], "Veltria search push")).expect(201)).body);
  });
  const stored = async () => (await t.db.select().from(plans).where(eq(plans.id, plan.id)))[0]!;
  const entries = async () => (await t.db.select().from(auditLog).where(eq(auditLog.target, `plan:${plan.id}`))).filter((a) => a.action !== "plan_created");

  it("renames by the author (name tidied at the ends), keeps the numbers, and writes one audit entry with old and new", async () => {
    expect(plan.can.rename).toBe(true);
    const before = await stored();
    const renamed = planSchema.parse((await veltria.patch(`/api/plans/${plan.id}`).send({ name: "  Veltria search, Q3  " }).expect(200)).body);
    expect(renamed.name).toBe("Veltria search, Q3");
    expect(renamed.note).toBeNull();
    expect(renamed.status).toBe("draft");
    const after = await stored();
    expect(after.body).toEqual(before.body);
    expect(after.runId).toBe(before.runId);
    expect(after.updatedAt.getTime()).toBeGreaterThanOrEqual(before.updatedAt.getTime());
    const audit = await entries();
    expect(audit).toHaveLength(1);
    expect(audit[0]).toMatchObject({ action: "plan_renamed", details: { kind: "scenario", from: "Veltria search push", to: "Veltria search, Q3" } });
    expect(audit[0]!.userId).toBe(renamed.createdBy!.id);
    // The list shows the new name.
    const list = planSummarySchema.array().parse((await veltria.get("/api/plans?kind=scenario").expect(200)).body);
    expect(list.find((p) => p.id === plan.id)!.name).toBe("Veltria search, Q3");
  });

  it("writes nothing for a rename to the same name, and a separate entry for a note", async () => {
    const count = (await entries()).length;
    const before = await stored();
    const same = planSchema.parse((await veltria.patch(`/api/plans/${plan.id}`).send({ name: " Veltria search, Q3 " }).expect(200)).body);
    expect(same.name).toBe("Veltria search, Q3");
    expect((await stored()).updatedAt).toEqual(before.updatedAt);
    expect((await entries()).length).toBe(count);
    planSchema.parse((await veltria.patch(`/api/plans/${plan.id}`).send({ note: "For the autumn review" }).expect(200)).body);
    const audit = await entries();
    expect(audit.map((a) => a.action).slice(count)).toEqual(["plan_note_changed"]);
    // An empty note clears it.
    expect(planSchema.parse((await veltria.patch(`/api/plans/${plan.id}`).send({ note: "" }).expect(200)).body).note).toBeNull();
  });

  it("refuses a blank name, one over the limit and an empty request with clear messages; nothing changes", async () => {
    const before = await stored();
    const count = (await entries()).length;
    const blank = await veltria.patch(`/api/plans/${plan.id}`).send({ name: "   " }).expect(400);
    expect(blank.body.error.issues).toEqual([expect.objectContaining({ path: "name", message: "Give the plan a name" })]);
    const long = await veltria.patch(`/api/plans/${plan.id}`).send({ name: "x".repeat(planBounds.name.max + 1) }).expect(400);
    expect(long.body.error.issues).toEqual([expect.objectContaining({ path: "name", message: `Keep the name to ${planBounds.name.max} characters or fewer` })]);
    await veltria.patch(`/api/plans/${plan.id}`).send({ name: "x".repeat(planBounds.name.max) }).expect(200);
    await veltria.patch(`/api/plans/${plan.id}`).send({ name: before.name }).expect(200);
    const wrongType = await veltria.patch(`/api/plans/${plan.id}`).send({ name: 42 }).expect(400);
    expect(wrongType.body.error.issues[0].message).toBe("Give the plan a name");
    const empty = await veltria.patch(`/api/plans/${plan.id}`).send({}).expect(400);
    expect(empty.body.error.issues[0].message).toBe("Send a new name or note");
    expect((await stored()).name).toBe(before.name);
    // The 120-character name and the rename back: two entries, the refusals none.
    expect((await entries()).length).toBe(count + 2);
  });

  it("is for the author and admins only: others of every role are refused and nothing changes", async () => {
    const before = await stored();
    const count = (await entries()).length;
    for (const other of [analyst, lead]) {
      const refused = await other.patch(`/api/plans/${plan.id}`).send({ name: "Not theirs" }).expect(403);
      expect(refused.body.error.message).toBe("Only the plan's author or an admin can rename it or change its note");
      expect(planSchema.parse((await other.get(`/api/plans/${plan.id}`).expect(200)).body).can.rename).toBe(false);
    }
    // A manager of other markets does not see the plan at all.
    await south.patch(`/api/plans/${plan.id}`).send({ name: "Not theirs" }).expect(404);
    expect((await stored()).name).toBe(before.name);
    expect((await entries()).length).toBe(count);
    // An admin may rename anyone's plan; the entry names the admin.
    expect(planSchema.parse((await admin.get(`/api/plans/${plan.id}`).expect(200)).body).can.rename).toBe(true);
    expect(planSchema.parse((await admin.patch(`/api/plans/${plan.id}`).send({ name: "Veltria search (admin)" }).expect(200)).body).name).toBe("Veltria search (admin)");
    const last = (await entries()).at(-1)!;
    expect(last).toMatchObject({ action: "plan_renamed", details: { from: before.name, to: "Veltria search (admin)" } });
    expect(last.userId).not.toBe(before.createdBy);
    await admin.patch(`/api/plans/no-such-plan`).send({ name: "Anything" }).expect(404);
  });
});

describe("CSV of any text", () => {
  it("neutralises what a spreadsheet would run as a formula", () => {
    const csv = toCsv(["name", "value"], [["=HYPERLINK(\"x\")", 1], ["+cmd", -2], ["-1+1", 3], ["@SUM(A1)", 4], ["\tx", 5], ["\rx", 6], ["plain", 7]]);
    const rows = Papa.parse<string[]>(csv.trim()).data;
    expect(rows.slice(1, 8).map((r) => r[0])).toEqual(["'=HYPERLINK(\"x\")", "'+cmd", "'-1+1", "'@SUM(A1)", "'\tx", "'\rx", "plain"]);
    // Numbers stay numbers, negative ones too.
    expect(rows[2]![1]).toBe("-2");
  });
});

describe("budget splits", () => {
  it("stores a split whose allocation the server computes the same way", async () => {
    const input = await splitInput(lead, "Veltria Q3");
    const plan = planSchema.parse((await analyst.post("/api/plans/budget-splits").send(input).expect(201)).body);
    if (plan.kind !== "budget_split") throw new Error("not a split");
    const result = plan.budgetSplit.result;
    expect(result.lines).toHaveLength(4);
    expect(result.allocatedTotal).toBeCloseTo(250_000, 3);
    for (const line of result.lines.filter((l) => l.channel === "search")) expect(line.allocation).toBeGreaterThanOrEqual(40_000 - 1e-6);
    expect(result.outcome.allocation.histogram.counts.reduce((a, b) => a + b, 0)).toBe(result.drawCount);
    expect(result.notes.some((n) => n.includes("lift test"))).toBe(true);
    // A market manager sees the Veltria split but cannot create one.
    await veltria.get(`/api/plans/${plan.id}`).expect(200);
    const refused = await veltria.post("/api/plans/budget-splits").send(input).expect(403);
    expect(refused.body.error.message).toBe("Market managers cannot do this");
  });

  it("refuses a tampered allocation, one over the total and one under a bound; nothing is stored", async () => {
    const input = await splitInput(lead, "Tampered");
    const count = async () => (await t.db.select().from(plans).where(eq(plans.kind, "budget_split"))).length;
    const before = await count();
    // Same total, 5 % of the budget moved from one line to another.
    const moved = structuredClone(input);
    moved.allocation[0]!.amount += 12_500;
    moved.allocation[1]!.amount -= 12_500;
    const differs = await analyst.post("/api/plans/budget-splits").send(moved).expect(400);
    expect(differs.body.error.message).toContain("differs from the split the server computed");
    expect(differs.body.error.issues.length).toBe(2);
    const over = structuredClone(input);
    over.allocation[0]!.amount += 50_000;
    expect((await analyst.post("/api/plans/budget-splits").send(over).expect(400)).body.error.message).toContain("breaks the total budget or a bound");
    const underBound = structuredClone(input);
    const search = underBound.allocation.findIndex((l) => l.channel === "search");
    const other = underBound.allocation.findIndex((l) => l.channel === "social");
    underBound.allocation[other]!.amount += underBound.allocation[search]!.amount - 1000;
    underBound.allocation[search]!.amount = 1000;
    const bound = await analyst.post("/api/plans/budget-splits").send(underBound).expect(400);
    expect(bound.body.error.issues.some((i: { message: string }) => i.message.includes("below its lower bound"))).toBe(true);
    const missing = structuredClone(input);
    missing.allocation.pop();
    await analyst.post("/api/plans/budget-splits").send(missing).expect(400);
    const impossible = await analyst.post("/api/plans/budget-splits").send({ ...input, bounds: [{ lower: 100_000 }] }).expect(400);
    expect(impossible.body.error.message).toContain("lower bounds add up to");
    expect(await count()).toBe(before);
  });

  describe("approval", () => {
    let split: Plan;
    beforeAll(async () => {
      split = planSchema.parse((await analyst.post("/api/plans/budget-splits").send(await splitInput(lead, "For approval")).expect(201)).body);
    });

    it("goes draft → submitted → approved, by the right people only, with e-mails and audit entries", async () => {
      expect(split.can).toMatchObject({ submit: true, decide: false });
      await lead.post(`/api/plans/${split.id}/decision`).send({ decision: "approve" }).expect(409);
      await lead.post(`/api/plans/${split.id}/submit`).expect(403);
      await veltria.post(`/api/plans/${split.id}/submit`).expect(403);
      const submitted = planSchema.parse((await analyst.post(`/api/plans/${split.id}/submit`).expect(200)).body);
      expect(submitted.status).toBe("submitted");
      expect(submitted.submitted?.by?.name).toBe(demoUsers.analyst.name);
      await analyst.post(`/api/plans/${split.id}/submit`).expect(409);
      await analyst.put(`/api/plans/${split.id}`).send(await splitInput(lead, "Changed")).expect(409);

      const toLead = await t.db.select().from(outbox).where(and(eq(outbox.kind, "plan_submitted"), eq(outbox.to, demoUsers.portfolioLead.email)));
      expect(toLead).toHaveLength(1);
      expect(toLead[0]!.subject).toContain("For approval");
      expect(toLead[0]!.text).toContain(`/budget-split?plan=${split.id}`);

      await analyst.post(`/api/plans/${split.id}/decision`).send({ decision: "approve" }).expect(403);
      await veltria.post(`/api/plans/${split.id}/decision`).send({ decision: "approve" }).expect(403);
      const noReason = await lead.post(`/api/plans/${split.id}/decision`).send({ decision: "reject" }).expect(400);
      expect(noReason.body.error.issues[0].message).toContain("Say why");
      const approved = planSchema.parse((await lead.post(`/api/plans/${split.id}/decision`).send({ decision: "approve", comment: "Go ahead; plan a lift test on social." }).expect(200)).body);
      expect(approved.status).toBe("approved");
      expect(approved.decision).toMatchObject({ by: { name: demoUsers.portfolioLead.name }, comment: "Go ahead; plan a lift test on social." });
      await admin.post(`/api/plans/${split.id}/decision`).send({ decision: "reject", comment: "Too late" }).expect(409);
      await analyst.delete(`/api/plans/${split.id}`).expect(409);

      const mail = await t.db.select().from(outbox).where(and(eq(outbox.kind, "plan_approved"), eq(outbox.to, demoUsers.analyst.email)));
      expect(mail).toHaveLength(1);
      expect(mail[0]!.text).toContain("Go ahead; plan a lift test on social.");
      const audit = await t.db.select().from(auditLog).where(eq(auditLog.target, `plan:${split.id}`));
      expect(audit.map((a) => a.action)).toEqual(["plan_created", "plan_submitted", "plan_approved"]);
    });

    it("is renamed by its author after approval, since a name changes no number; the approval stays", async () => {
      // The lead decided on it, but only the author or an admin renames it.
      await lead.patch(`/api/plans/${split.id}`).send({ name: "Lead's name" }).expect(403);
      await veltria.patch(`/api/plans/${split.id}`).send({ name: "Manager's name" }).expect(403);
      const renamed = planSchema.parse((await analyst.patch(`/api/plans/${split.id}`).send({ name: "For approval (approved)" }).expect(200)).body);
      expect(renamed).toMatchObject({ name: "For approval (approved)", status: "approved", decision: { by: { name: demoUsers.portfolioLead.name } } });
      const audit = await t.db.select().from(auditLog).where(eq(auditLog.target, `plan:${split.id}`));
      expect(audit.map((a) => a.action)).toEqual(["plan_created", "plan_submitted", "plan_approved", "plan_renamed"]);
      expect(audit.at(-1)!.details).toEqual({ kind: "budget_split", from: "For approval", to: "For approval (approved)" });
    });

    it("lets a rejected split be changed (back to draft) and withdrawn after a new submission; nobody decides on their own split", async () => {
      const own = planSchema.parse((await lead.post("/api/plans/budget-splits").send(await splitInput(lead, "Lead's own")).expect(201)).body);
      await lead.post(`/api/plans/${own.id}/submit`).expect(200);
      const self = await lead.post(`/api/plans/${own.id}/decision`).send({ decision: "approve" }).expect(403);
      expect(self.body.error.message).toContain("your own plan");
      const rejected = planSchema.parse((await admin.post(`/api/plans/${own.id}/decision`).send({ decision: "reject", comment: "Keep TV at its floor" }).expect(200)).body);
      expect(rejected.status).toBe("rejected");
      expect((await t.db.select().from(outbox).where(and(eq(outbox.kind, "plan_rejected"), eq(outbox.to, demoUsers.portfolioLead.email)))).length).toBe(1);
      const redrafted = planSchema.parse((await lead.put(`/api/plans/${own.id}`).send(await splitInput(lead, "Lead's own, again")).expect(200)).body);
      expect(redrafted.status).toBe("draft");
      expect(redrafted.decision).toBeNull();
      await lead.post(`/api/plans/${own.id}/submit`).expect(200);
      expect(planSchema.parse((await lead.post(`/api/plans/${own.id}/withdraw`).expect(200)).body).status).toBe("draft");
      await lead.delete(`/api/plans/${own.id}`).expect(204);
      await lead.get(`/api/plans/${own.id}`).expect(404);
      const audit = await t.db.select().from(auditLog).where(eq(auditLog.target, `plan:${own.id}`));
      expect(audit.map((a) => a.action)).toEqual(["plan_created", "plan_submitted", "plan_rejected", "plan_updated", "plan_submitted", "plan_withdrawn", "plan_deleted"]);
    });

    it("exports the allocation and the forecast of a split", async () => {
      const rows = Papa.parse<string[]>((await veltria.get(`/api/plans/${split.id}/allocation.csv`).expect(200)).text.replace(/^\uFEFF/, "").trim()).data;
      expect(rows[0]!.slice(0, 4)).toEqual(["brand", "market", "channel", "allocation"]);
      const lines = rows.slice(1).filter((r) => r.length > 2);
      expect(lines.reduce((sum, r) => sum + Number(r[3]), 0)).toBeCloseTo(250_000, 0);
      const forecast = Papa.parse<string[]>((await veltria.get(`/api/plans/${split.id}/forecast.csv`).expect(200)).text.replace(/^\uFEFF/, "").trim()).data;
      expect(forecast.filter((r) => r[1] === "Veltria")).toHaveLength(16);
    });
  });
});

describe("market scope of stored plans", () => {
  it("records the plan's markets from its cells", async () => {
    const rows = await t.db.select({ name: plans.name, marketIds: plans.marketIds }).from(plans);
    const [solvera] = await t.db.select().from(markets).where(eq(markets.code, "solvera"));
    const [ks] = await t.db.select().from(cells).where(eq(cells.marketId, solvera!.id));
    expect(ks).toBeDefined();
    expect(rows.find((r) => r.name === "Both markets")!.marketIds).toContain(solvera!.id);
  });
});

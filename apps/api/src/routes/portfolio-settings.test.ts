// Portfolio settings through the API on a fitted snapshot (the tiny dataset's published
// fit: Kestrova × Veltria, Kestrova × Solvera, Plumrise × Veltria; search and social):
// each write with its audit entry, bad input refused naming the field with nothing
// changed, every other role refused, and the dashboards answering with the new names,
// values and currency at once (their cached numbers are per run; names and values are
// reread after any write). A renamed brand or market shows under its new name wherever
// brands and markets are named: lists, dashboards, run results and report, the planning
// draws and saved plans (whose targets name it), while data files still find it by code.
import { asc, count, desc, eq, inArray } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import Papa from "papaparse";
import {
  apiErrorSchema,
  brandComparisonSchema,
  channelSheetSchema,
  decodeDrawSet,
  drawSetWireSchema,
  marketDeskSchema,
  planSchema,
  planSummarySchema,
  portfolioMapSchema,
  portfolioSettingsActions,
  portfolioSettingsSchema,
  runReportSchema,
  runResultsSchema,
  type BudgetSplitPlanInput,
  type PortfolioSettings,
} from "@tributary/contracts";
import { budgetSplit } from "@tributary/stats";
import { auditLog, brands, channels, markets, plans, workspaceSettings } from "../db/schema";
import { computeRunEstimates } from "../dashboards/run-estimates";
import { planEntities } from "../datasets/portfolio-entities";
import { anonymous, currentRun, fittedWorld, type Agent, type World } from "../testing/fitted-world";

let w: World;
let admin: Agent;

beforeAll(async () => {
  w = await fittedWorld();
  admin = w.agents.admin;
});
afterAll(() => w.close());

async function settings(): Promise<PortfolioSettings> {
  return portfolioSettingsSchema.parse((await admin.get("/api/portfolio-settings").expect(200)).body);
}

/** Everything a settings write may touch, to show that a refused one changed nothing. */
async function state() {
  const [settingsRow] = await w.db.select().from(workspaceSettings);
  return {
    settings: settingsRow,
    brands: await w.db.select().from(brands).orderBy(asc(brands.code)),
    markets: await w.db.select().from(markets).orderBy(asc(markets.code)),
    channels: await w.db.select().from(channels).orderBy(asc(channels.code)),
    plans: await w.db.select({ id: plans.id, body: plans.body, updatedAt: plans.updatedAt }).from(plans).orderBy(asc(plans.id)),
    audit: (await w.db.select({ n: count() }).from(auditLog))[0]!.n,
  };
}

async function latestAudit(action: string) {
  const [entry] = await w.db.select().from(auditLog).where(eq(auditLog.action, action)).orderBy(desc(auditLog.id)).limit(1);
  return entry;
}

async function channelBody(change: (list: { id: string; code: string; name: string }[]) => { id: string; name: string }[] = (list) => list) {
  const list = (await settings()).channels.map(({ id, code, name }) => ({ id, code, name }));
  return { channels: change(list).map(({ id, name }) => ({ id, name })) };
}

describe("reading the portfolio settings", () => {
  it("gives the admin the company, currency, every brand with its customer value and the channels in display order", async () => {
    const s = await settings();
    expect(s.company).toBe("Quillfern Household Group");
    expect(s.currency).toBe("EUR");
    expect(s.brands.map((b) => [b.name, b.customerValue])).toEqual([
      ["Kestrova", 140],
      ["Plumrise", 95],
      ["Sundrift", 180],
    ]);
    expect(s.markets.map((m) => [m.code, m.name])).toContainEqual(["veltria", "Veltria"]);
    expect(s.markets.map((m) => m.name)).toEqual([...s.markets.map((m) => m.name)].sort());
    expect(s.channels.map((c) => c.position)).toEqual([...s.channels.map((c) => c.position)].sort((a, b) => a - b));
    expect(s.channels.map((c) => c.code)).toContain("search");
  });
});

describe("changing the company name and currency", () => {
  it("renames the company (tidied), in one audit entry naming who, old and new", async () => {
    const answer = await admin.patch("/api/portfolio-settings/company").send({ companyName: "  Quillfern   Household Group Ltd " }).expect(200);
    expect(portfolioSettingsSchema.parse(answer.body).company).toBe("Quillfern Household Group Ltd");
    const entry = await latestAudit(portfolioSettingsActions.companyName);
    expect(entry?.userId).toBe(w.userId.admin);
    expect(entry?.details).toEqual({ from: "Quillfern Household Group", to: "Quillfern Household Group Ltd" });
    expect((await w.agents.analyst.get("/api/portfolio").expect(200)).body.company).toBe("Quillfern Household Group Ltd");
    await admin.patch("/api/portfolio-settings/company").send({ companyName: "Quillfern Household Group" }).expect(200);
  });

  it("relabels every money figure with a new currency without converting any number", async () => {
    const before = portfolioMapSchema.parse((await w.agents.portfolioLead.get("/api/dashboards/portfolio-map").expect(200)).body);
    const answer = await admin.patch("/api/portfolio-settings/company").send({ currency: "sek" }).expect(200);
    expect(portfolioSettingsSchema.parse(answer.body).currency).toBe("SEK");
    const after = portfolioMapSchema.parse((await w.agents.portfolioLead.get("/api/dashboards/portfolio-map").expect(200)).body);
    expect(after.currency).toBe("SEK");
    expect(after.cells.map((c) => c.cac)).toEqual(before.cells.map((c) => c.cac));
    expect(after.cells.map((c) => c.customerValue)).toEqual(before.cells.map((c) => c.customerValue));
    const entry = await latestAudit(portfolioSettingsActions.currency);
    expect(entry?.details).toMatchObject({ from: "EUR", to: "SEK" });
    await admin.patch("/api/portfolio-settings/company").send({ currency: "EUR" }).expect(200);
    expect((await settings()).currency).toBe("EUR");
  });

  it("writes nothing when nothing changes", async () => {
    const before = await state();
    await admin.patch("/api/portfolio-settings/company").send({ companyName: "Quillfern Household Group", currency: "EUR" }).expect(200);
    expect(await state()).toEqual(before);
  });
});

describe("customer values", () => {
  /** The share of the run's stored average-CAC draws (search) of a cell below a value, counted here directly. */
  async function shareOfDrawsBelow(cellId: string, value: number): Promise<number> {
    const estimates = await computeRunEstimates(w.db, w.publishedRunId);
    const draws = estimates.cells.find((c) => c.cellId === cellId)!.channels.find((ch) => ch.channel === "search")!.average!.draws;
    return Array.from(draws).filter((x) => x < value).length / draws.length;
  }

  it("changes a brand's value; the Portfolio map's chance of profit follows at once (cached numbers are per run, values are reread)", async () => {
    const kestrova = w.brandId.get("Kestrova")!;
    const cell = w.cellId.get("Kestrova × Veltria")!;
    const map = async () => portfolioMapSchema.parse((await w.agents.portfolioLead.get("/api/dashboards/portfolio-map").query({ channel: "search" }).expect(200)).body);
    const chanceOf = async () => (await map()).cells.find((c) => c.cellId === cell)!;
    const before = await chanceOf();
    expect(before).toMatchObject({ customerValue: 140, probabilityProfitable: await shareOfDrawsBelow(cell, 140) });

    // The median draw as the value: about half the draws below it.
    const estimates = await computeRunEstimates(w.db, w.publishedRunId);
    const median = estimates.cells.find((c) => c.cellId === cell)!.channels.find((ch) => ch.channel === "search")!.average!.interval.q50;
    for (const value of [median, 1e-6, 1e9]) {
      await admin.put("/api/portfolio-settings/customer-values").send({ brands: [{ id: kestrova, customerValue: value }] }).expect(200);
      const after = await chanceOf();
      expect(after.customerValue).toBe(value);
      expect(after.probabilityProfitable).toBe(await shareOfDrawsBelow(cell, value));
      const sheet = channelSheetSchema.parse((await w.agents.veltriaManager.get(`/api/dashboards/channel-sheet/${cell}/search`).expect(200)).body);
      expect(sheet.profit).toMatchObject({ customerValue: value, probabilityAtCustomerValue: after.probabilityProfitable });
    }
    expect(await shareOfDrawsBelow(cell, median)).toBeGreaterThan(0.3);
    expect(await shareOfDrawsBelow(cell, median)).toBeLessThan(0.7);
    expect(await shareOfDrawsBelow(cell, 1e-6)).toBe(0);

    // Cleared: not known, so no chance of profit is shown (null), never a made-up one.
    await admin.put("/api/portfolio-settings/customer-values").send({ brands: [{ id: kestrova, customerValue: null }] }).expect(200);
    const cleared = await map();
    expect(cleared.cells.filter((c) => c.brandId === kestrova).map((c) => [c.customerValue, c.probabilityProfitable])).toEqual([
      [null, null],
      [null, null],
    ]);
    // Plumrise kept its value.
    expect(cleared.cells.find((c) => c.cellId === w.cellId.get("Plumrise × Veltria"))?.customerValue).toBe(95);
    expect((await w.agents.analyst.get("/api/portfolio").expect(200)).body.brands.find((b: { id: string }) => b.id === kestrova).customerValue).toBeNull();

    const entries = await w.db.select().from(auditLog).where(eq(auditLog.action, portfolioSettingsActions.customerValue)).orderBy(asc(auditLog.id));
    expect(entries.slice(-4).map((e) => [e.userId, e.target, e.details])).toEqual([
      [w.userId.admin, `brand:${kestrova}`, { brand: "Kestrova", from: 140, to: median }],
      [w.userId.admin, `brand:${kestrova}`, { brand: "Kestrova", from: median, to: 1e-6 }],
      [w.userId.admin, `brand:${kestrova}`, { brand: "Kestrova", from: 1e-6, to: 1e9 }],
      [w.userId.admin, `brand:${kestrova}`, { brand: "Kestrova", from: 1e9, to: null }],
    ]);

    await admin.put("/api/portfolio-settings/customer-values").send({ brands: [{ id: kestrova, customerValue: 140 }] }).expect(200);
    expect((await chanceOf()).probabilityProfitable).toBe(before.probabilityProfitable);
  });

  it("sets several brands in one change, one audit entry each", async () => {
    const ids = [w.brandId.get("Plumrise")!, w.brandId.get("Sundrift")!];
    const auditBefore = (await w.db.select({ n: count() }).from(auditLog))[0]!.n;
    const answer = portfolioSettingsSchema.parse(
      (await admin.put("/api/portfolio-settings/customer-values").send({ brands: [{ id: ids[0], customerValue: 99.5 }, { id: ids[1], customerValue: 180 }] }).expect(200)).body,
    );
    expect(answer.brands.map((b) => b.customerValue)).toEqual([140, 99.5, 180]);
    // Sundrift's value did not change: only Plumrise's entry is written.
    expect((await w.db.select({ n: count() }).from(auditLog))[0]!.n).toBe(auditBefore + 1);
    await admin.put("/api/portfolio-settings/customer-values").send({ brands: [{ id: ids[0], customerValue: 95 }] }).expect(200);
  });
});

describe("channel names and order", () => {
  it("renames and reorders the channels; the Channel sheet, the Portfolio map and the channel list follow", async () => {
    const original = await channelBody();
    const body = await channelBody((list) => [...list].reverse().map((c) => (c.code === "social" ? { ...c, name: " Social   media " } : c)));
    const answer = portfolioSettingsSchema.parse((await admin.put("/api/portfolio-settings/channels").send(body).expect(200)).body);
    expect(answer.channels.map((c) => c.id)).toEqual(body.channels.map((c) => c.id));
    expect(answer.channels.map((c) => c.position)).toEqual(body.channels.map((_, k) => k));
    expect(answer.channels.find((c) => c.code === "social")?.name).toBe("Social media");

    const cell = w.cellId.get("Kestrova × Veltria")!;
    const sheet = channelSheetSchema.parse((await w.agents.veltriaManager.get(`/api/dashboards/channel-sheet/${cell}/social`).expect(200)).body);
    expect(sheet.channel.name).toBe("Social media");
    const map = portfolioMapSchema.parse((await w.agents.portfolioLead.get("/api/dashboards/portfolio-map").expect(200)).body);
    expect(map.channels.map((c) => c.code)).toEqual(["social", "search"]);
    expect((await w.agents.analyst.get("/api/channels").expect(200)).body.map((c: { name: string }) => c.name).slice(0, 2)).toEqual(
      answer.channels.slice(0, 2).map((c) => c.name),
    );

    const renamed = await latestAudit(portfolioSettingsActions.channelName);
    expect(renamed?.details).toMatchObject({ channel: "social", from: "Social", to: "Social media" });
    const order = await latestAudit(portfolioSettingsActions.channelOrder);
    expect(order?.details).toEqual({ from: original.channels.map((c) => answerCode(answer, c.id)), to: body.channels.map((c) => answerCode(answer, c.id)) });

    await admin.put("/api/portfolio-settings/channels").send(original).expect(200);
    expect((await settings()).channels.map(({ id, name }) => ({ id, name }))).toEqual(original.channels);
  });

  it("lets two channels swap names in one change", async () => {
    const original = await channelBody();
    const [a, b] = original.channels;
    const swapped = { channels: [{ id: a!.id, name: b!.name }, { id: b!.id, name: a!.name }, ...original.channels.slice(2)] };
    await admin.put("/api/portfolio-settings/channels").send(swapped).expect(200);
    expect((await settings()).channels.slice(0, 2).map((c) => c.name)).toEqual([b!.name, a!.name]);
    await admin.put("/api/portfolio-settings/channels").send(original).expect(200);
  });
});

describe("brand and market names", () => {
  const csvRows = (text: string) => Papa.parse<string[]>(text.replace(/^\uFEFF/, "").trim()).data;

  /** A budget split naming Kestrova in a bound and in a profit objective, as the browser computes it. */
  async function kestrovaSplit(): Promise<BudgetSplitPlanInput> {
    const wire = drawSetWireSchema.parse((await w.agents.portfolioLead.get("/api/runs/current/draw-set").expect(200)).body);
    const set = decodeDrawSet(wire);
    const cellIds = [w.cellId.get("Kestrova × Veltria")!, w.cellId.get("Plumrise × Veltria")!];
    const refs = cellIds.map((id) => set.cells.find((c) => c.cellId === id)!);
    const inputs = {
      totalBudget: 150_000,
      horizon: 8,
      recentWeeks: 8,
      bounds: [{ target: { brands: ["Kestrova"] }, lower: 20_000 }],
      objective: { kind: "profit" as const, customerValue: { Kestrova: 140, Plumrise: 95 } },
    };
    const result = budgetSplit(set, { ...inputs, cells: refs.map((c) => ({ brand: c.brand, market: c.market })) });
    return {
      name: "Kestrova floor",
      runId: wire.runId,
      cellIds,
      ...inputs,
      allocation: result.lines.map((line) => ({ cellId: refs.find((c) => c.brand === line.brand)!.cellId, channel: line.channel, amount: line.allocation })),
    };
  }

  it("renames a brand everywhere it is shown, relabels saved plans that name it, and keeps its code for data files", async () => {
    const kestrova = w.brandId.get("Kestrova")!;
    const kv = w.cellId.get("Kestrova × Veltria")!;
    const analyst = w.agents.analyst;
    const scenario = planSchema.parse(
      (
        await analyst
          .post("/api/plans/scenarios")
          .send({
            name: "Kestrova search push",
            runId: await currentRun(w),
            cellIds: [kv, w.cellId.get("Plumrise × Veltria")!],
            horizon: 8,
            recentWeeks: 6,
            operations: [
              { kind: "scale", target: { brands: ["Kestrova"], channels: ["search"] }, factor: 1.3 },
              { kind: "add", target: { cells: [{ brand: "Plumrise", market: "Veltria" }] }, amountPerWeek: 200 },
            ],
          })
          .expect(201)
      ).body,
    );
    const split = planSchema.parse((await analyst.post("/api/plans/budget-splits").send(await kestrovaSplit()).expect(201)).body);
    const storedBefore = await w.db.select().from(plans).where(inArray(plans.id, [scenario.id, split.id])).orderBy(asc(plans.id));

    const answer = portfolioSettingsSchema.parse(
      (await admin.put("/api/portfolio-settings/brand-names").send({ brands: [{ id: kestrova, name: "  Kestrova   Home " }] }).expect(200)).body,
    );
    expect(answer.brands.find((b) => b.id === kestrova)).toMatchObject({ code: "kestrova", name: "Kestrova Home", customerValue: 140 });
    const entry = await latestAudit(portfolioSettingsActions.brandName);
    expect(entry).toMatchObject({ userId: w.userId.admin, target: `brand:${kestrova}`, details: { brand: "kestrova", from: "Kestrova", to: "Kestrova Home" } });

    // Lists and dashboards.
    expect((await analyst.get("/api/brands").expect(200)).body.find((b: { id: string }) => b.id === kestrova).name).toBe("Kestrova Home");
    expect((await analyst.get("/api/portfolio").expect(200)).body.brands.find((b: { id: string }) => b.id === kestrova).name).toBe("Kestrova Home");
    const map = portfolioMapSchema.parse((await w.agents.portfolioLead.get("/api/dashboards/portfolio-map").expect(200)).body);
    expect(map.cells.find((c) => c.cellId === kv)?.brand).toBe("Kestrova Home");
    const comparison = brandComparisonSchema.parse((await w.agents.veltriaManager.get("/api/dashboards/brand-comparison").expect(200)).body);
    expect(comparison.brands.map((b) => b.name)).toContain("Kestrova Home");
    expect(comparison.brands.map((b) => b.name)).not.toContain("Kestrova");
    // The run's stored results and report, named as the brand is called now.
    const results = runResultsSchema.parse((await w.agents.veltriaManager.get("/api/runs/current").expect(200)).body);
    expect(results.cells.filter((c) => c.brandId === kestrova).map((c) => c.brand)).toEqual(["Kestrova Home", "Kestrova Home"]);
    const report = runReportSchema.parse((await analyst.get(`/api/runs/${await currentRun(w)}/report`).expect(200)).body);
    expect(report.predictiveCheck.filter((c) => c.brand.startsWith("Kestrova")).map((c) => c.brand)).toEqual(["Kestrova Home", "Kestrova Home"]);
    const labels = [...report.parameters.map((p) => p.label), ...report.traces.map((t) => t.label)];
    expect(labels.some((label) => label.includes("Kestrova Home × Veltria"))).toBe(true);
    expect(labels.some((label) => label.includes("Kestrova ×"))).toBe(false);
    // The planning draws (kept in memory since before the rename) carry the new name.
    const wire = drawSetWireSchema.parse((await w.agents.veltriaManager.get("/api/runs/current/draw-set").expect(200)).body);
    expect(wire.cells.find((c) => c.cellId === kv)?.brand).toBe("Kestrova Home");

    // Saved plans: their targets and results renamed, no number changed; they still export and can be saved again.
    const storedAfter = await w.db.select().from(plans).where(inArray(plans.id, [scenario.id, split.id])).orderBy(asc(plans.id));
    const expected = JSON.parse(JSON.stringify(storedBefore.map((p) => p.body)).replaceAll('"Kestrova"', '"Kestrova Home"'));
    expect(storedAfter.map((p) => p.body)).toEqual(expected);
    expect(storedAfter.map((p) => [p.name, p.updatedAt])).toEqual(storedBefore.map((p) => [p.name, p.updatedAt]));
    const reread = planSchema.parse((await analyst.get(`/api/plans/${scenario.id}`).expect(200)).body);
    if (reread.kind !== "scenario") throw new Error("not a scenario");
    expect(reread.scenario.operations[0]?.target?.brands).toEqual(["Kestrova Home"]);
    expect(reread.cells.find((c) => c.cellId === kv)?.brand).toBe("Kestrova Home");
    const allocation = csvRows((await analyst.get(`/api/plans/${scenario.id}/allocation.csv`).expect(200)).text);
    expect(allocation.filter((r) => r[0] === "Kestrova Home")).toHaveLength(2);
    const splitCsv = csvRows((await analyst.get(`/api/plans/${split.id}/allocation.csv`).expect(200)).text);
    expect(splitCsv.filter((r) => r[0] === "Kestrova Home").length).toBeGreaterThan(0);
    expect(splitCsv.some((r) => r[0] === "Kestrova")).toBe(false);
    await analyst.get(`/api/plans/${split.id}/forecast.csv`).expect(200);
    const storedSplit = storedAfter.find((p) => p.id === split.id)!.body as { budgetSplit: { bounds: unknown; objective: unknown } };
    expect(storedSplit.budgetSplit.bounds).toEqual([{ target: { brands: ["Kestrova Home"] }, lower: 20_000 }]);
    expect(storedSplit.budgetSplit.objective).toEqual({ kind: "profit", customerValue: { "Kestrova Home": 140, Plumrise: 95 } });
    await analyst.put(`/api/plans/${scenario.id}`).send({ name: reread.name, runId: reread.runId, cellIds: reread.cells.map((c) => c.cellId), horizon: 8, recentWeeks: 6, operations: reread.scenario.operations }).expect(200);

    // Data files still find the brand by its code (its old name) or by its new name; nothing new would be created.
    for (const spelling of ["Kestrova", "kestrova  home"]) {
      const entities = await planEntities(w.db, { cells: [{ brand: spelling, market: "Veltria" }], channels: [], brandColumn: "brand", marketColumn: "market" });
      expect(entities.brands.get(spelling)?.id, spelling).toBe(kestrova);
      expect(entities.newEntities).toMatchObject({ brands: [], cells: [] });
    }

    // And back: every plan is as it was.
    await admin.put("/api/portfolio-settings/brand-names").send({ brands: [{ id: kestrova, name: "Kestrova" }] }).expect(200);
    const restored = await w.db.select().from(plans).where(eq(plans.id, split.id));
    expect(restored[0]!.body).toEqual(storedBefore.find((p) => p.id === split.id)!.body);
    expect((await latestAudit(portfolioSettingsActions.brandName))?.details).toEqual({ brand: "kestrova", from: "Kestrova Home", to: "Kestrova" });
    await analyst.delete(`/api/plans/${scenario.id}`).expect(204);
    await analyst.delete(`/api/plans/${split.id}`).expect(204);
  });

  it("renames a market: a market manager's lists, dashboards and saved plans follow", async () => {
    const veltria = w.marketId.get("Veltria")!;
    const manager = w.agents.veltriaManager;
    const plan = planSchema.parse(
      (
        await manager
          .post("/api/plans/scenarios")
          .send({
            name: "Veltria social",
            runId: await currentRun(w),
            cellIds: [w.cellId.get("Kestrova × Veltria")!],
            horizon: 8,
            recentWeeks: 6,
            operations: [{ kind: "scale", target: { markets: ["Veltria"], channels: ["social"] }, factor: 1.2 }],
          })
          .expect(201)
      ).body,
    );
    const answer = portfolioSettingsSchema.parse((await admin.put("/api/portfolio-settings/market-names").send({ markets: [{ id: veltria, name: "Veltria Coast" }] }).expect(200)).body);
    expect(answer.markets.find((m) => m.id === veltria)).toEqual({ id: veltria, code: "veltria", name: "Veltria Coast" });
    expect((await latestAudit(portfolioSettingsActions.marketName))?.details).toEqual({ market: "veltria", from: "Veltria", to: "Veltria Coast" });

    expect((await manager.get("/api/markets").expect(200)).body.map((m: { name: string }) => m.name)).toEqual(["Veltria Coast"]);
    const desk = marketDeskSchema.parse((await manager.get("/api/dashboards/market-desk").query({ market: veltria }).expect(200)).body);
    expect(JSON.stringify(desk)).toContain("Veltria Coast");
    expect(JSON.stringify(desk)).not.toMatch(/"Veltria"/);
    const summaries = planSummarySchema.array().parse((await manager.get("/api/plans").expect(200)).body);
    expect(summaries.find((p) => p.id === plan.id)?.markets.map((m) => m.name)).toEqual(["Veltria Coast"]);
    const reread = planSchema.parse((await manager.get(`/api/plans/${plan.id}`).expect(200)).body);
    if (reread.kind !== "scenario") throw new Error("not a scenario");
    expect(reread.scenario.operations[0]?.target?.markets).toEqual(["Veltria Coast"]);
    expect(reread.scenario.headline.cells.map((c) => c.market)).toEqual(["Veltria Coast"]);
    await manager.get(`/api/plans/${plan.id}/forecast.csv`).expect(200);
    const wire = drawSetWireSchema.parse((await manager.get("/api/runs/current/draw-set").expect(200)).body);
    expect(wire.cells.map((c) => c.market)).toEqual(["Veltria Coast", "Veltria Coast"]);

    await admin.put("/api/portfolio-settings/market-names").send({ markets: [{ id: veltria, name: "Veltria" }] }).expect(200);
    expect((await manager.get("/api/markets").expect(200)).body.map((m: { name: string }) => m.name)).toEqual(["Veltria"]);
    await manager.delete(`/api/plans/${plan.id}`).expect(204);
  });

  it("writes nothing when no name changes (tidied, the same name is no change)", async () => {
    const before = await state();
    await admin.put("/api/portfolio-settings/brand-names").send({ brands: [{ id: w.brandId.get("Plumrise"), name: " Plumrise " }] }).expect(200);
    await admin.put("/api/portfolio-settings/market-names").send({ markets: [{ id: w.marketId.get("Solvera"), name: "Solvera" }] }).expect(200);
    expect(await state()).toEqual(before);
  });

  it("lets a brand take a name another brand gives up in the same change", async () => {
    const [plumrise, sundrift] = [w.brandId.get("Plumrise")!, w.brandId.get("Sundrift")!];
    await admin.put("/api/portfolio-settings/brand-names").send({ brands: [{ id: plumrise, name: "Plumrise Classic" }] }).expect(200);
    await admin.put("/api/portfolio-settings/brand-names").send({ brands: [{ id: plumrise, name: "Sundrift Classic" }, { id: sundrift, name: "Plumrise Classic" }] }).expect(200);
    const names = (await settings()).brands.map((b) => [b.code, b.name]);
    expect(names).toEqual(expect.arrayContaining([["plumrise", "Sundrift Classic"], ["sundrift", "Plumrise Classic"]]));
    await admin.put("/api/portfolio-settings/brand-names").send({ brands: [{ id: plumrise, name: "Plumrise" }, { id: sundrift, name: "Sundrift" }] }).expect(200);
  });
});

function answerCode(s: PortfolioSettings, id: string): string {
  return s.channels.find((c) => c.id === id)!.code;
}

describe("bad input: a 400 naming the field, and nothing changed", () => {
  const cases: [string, string, "patch" | "put", () => Promise<unknown> | unknown, string][] = [
    ["an empty company name", "/api/portfolio-settings/company", "patch", () => ({ companyName: "   " }), "companyName"],
    ["a company name of 121 characters", "/api/portfolio-settings/company", "patch", () => ({ companyName: "Q".repeat(121) }), "companyName"],
    ["a company name a spreadsheet would run", "/api/portfolio-settings/company", "patch", () => ({ companyName: "=HYPERLINK(\"x\")" }), "companyName"],
    ["a company name that reads backwards", "/api/portfolio-settings/company", "patch", () => ({ companyName: "Quill\u202Efern" }), "companyName"],
    ["a made-up currency", "/api/portfolio-settings/company", "patch", () => ({ currency: "QQQ" }), "currency"],
    ["a currency that is not three letters", "/api/portfolio-settings/company", "patch", () => ({ currency: "EURO" }), "currency"],
    ["a currency as a number", "/api/portfolio-settings/company", "patch", () => ({ currency: 978 }), "currency"],
    ["a good name with a bad currency (nothing of it applied)", "/api/portfolio-settings/company", "patch", () => ({ companyName: "New name", currency: "XYZ1" }), "currency"],
    ["nothing to change", "/api/portfolio-settings/company", "patch", () => ({}), "body"],
    ["a customer value of 0", "/api/portfolio-settings/customer-values", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: 0 }] }), "brands.0.customerValue"],
    ["a negative customer value", "/api/portfolio-settings/customer-values", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: -12 }] }), "brands.0.customerValue"],
    ["a customer value as text", "/api/portfolio-settings/customer-values", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: "140" }] }), "brands.0.customerValue"],
    ["a customer value of 10^12", "/api/portfolio-settings/customer-values", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: 1e12 }] }), "brands.0.customerValue"],
    [
      "one good value and one bad (neither applied)",
      "/api/portfolio-settings/customer-values",
      "put",
      () => ({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: 150 }, { id: w.brandId.get("Plumrise"), customerValue: -1 }] }),
      "brands.1.customerValue",
    ],
    ["an unknown brand", "/api/portfolio-settings/customer-values", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: 150 }, { id: "no-such-brand", customerValue: 10 }] }), "brands.1.id"],
    ["a brand listed twice", "/api/portfolio-settings/customer-values", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: 150 }, { id: w.brandId.get("Kestrova"), customerValue: 10 }] }), "brands.1.id"],
    ["no brands", "/api/portfolio-settings/customer-values", "put", () => ({ brands: [] }), "brands"],
    ["an empty channel name", "/api/portfolio-settings/channels", "put", () => channelBody((l) => l.map((c, k) => (k === 1 ? { ...c, name: " " } : c))), "channels.1.name"],
    ["a channel name of 61 characters", "/api/portfolio-settings/channels", "put", () => channelBody((l) => l.map((c, k) => (k === 0 ? { ...c, name: "x".repeat(61) } : c))), "channels.0.name"],
    ["a channel name with a line break", "/api/portfolio-settings/channels", "put", () => channelBody((l) => l.map((c, k) => (k === 0 ? { ...c, name: "Search\u0007engine" } : c))), "channels.0.name"],
    [
      "two channels with one name (case and spacing aside)",
      "/api/portfolio-settings/channels",
      "put",
      () => channelBody((l) => l.map((c, k) => (k === 1 ? { ...c, name: ` ${l[0]!.name.toUpperCase()} ` } : c))),
      "channels.1.name",
    ],
    ["a channel left out", "/api/portfolio-settings/channels", "put", () => channelBody((l) => l.slice(1)), "channels"],
    ["an unknown channel", "/api/portfolio-settings/channels", "put", () => channelBody((l) => [...l, { id: "no-such-channel", code: "x", name: "Billboards" }]), "channels.5.id"],
    ["a channel listed twice", "/api/portfolio-settings/channels", "put", () => channelBody((l) => [...l, l[0]!]), "channels.5.id"],
    ["an empty brand name", "/api/portfolio-settings/brand-names", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), name: " \u200B " }] }), "brands.0.name"],
    ["a brand name of 101 characters", "/api/portfolio-settings/brand-names", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), name: "K".repeat(101) }] }), "brands.0.name"],
    ["a brand name a spreadsheet would run", "/api/portfolio-settings/brand-names", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), name: "=cmd" }] }), "brands.0.name"],
    ["a brand name another brand has (case and spacing aside)", "/api/portfolio-settings/brand-names", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), name: " PLUMRISE " }] }), "brands.0.name"],
    [
      "two brands given one name",
      "/api/portfolio-settings/brand-names",
      "put",
      () => ({ brands: [{ id: w.brandId.get("Kestrova"), name: "Larkholm" }, { id: w.brandId.get("Plumrise"), name: "larkholm" }] }),
      "brands.1.name",
    ],
    [
      "two brands swapping names that spell each other's codes (data files would change brand)",
      "/api/portfolio-settings/brand-names",
      "put",
      () => ({ brands: [{ id: w.brandId.get("Kestrova"), name: "Plumrise" }, { id: w.brandId.get("Plumrise"), name: "Kestrova" }] }),
      "brands.0.name",
    ],
    ["a brand name spelling another brand's code", "/api/portfolio-settings/brand-names", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), name: "Sündrift" }] }), "brands.0.name"],
    ["an unknown brand", "/api/portfolio-settings/brand-names", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), name: "Kestrova Home" }, { id: "no-such-brand", name: "Other" }] }), "brands.1.id"],
    ["a brand renamed twice in one change", "/api/portfolio-settings/brand-names", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), name: "A" }, { id: w.brandId.get("Kestrova"), name: "B" }] }), "brands.1.id"],
    ["no brands", "/api/portfolio-settings/brand-names", "put", () => ({ brands: [] }), "brands"],
    ["a brand name as a number", "/api/portfolio-settings/brand-names", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), name: 7 }] }), "brands.0.name"],
    ["an empty market name", "/api/portfolio-settings/market-names", "put", () => ({ markets: [{ id: w.marketId.get("Veltria"), name: "" }] }), "markets.0.name"],
    ["a market name another market has", "/api/portfolio-settings/market-names", "put", () => ({ markets: [{ id: w.marketId.get("Veltria"), name: "solvera" }] }), "markets.0.name"],
    ["a market name that reads backwards", "/api/portfolio-settings/market-names", "put", () => ({ markets: [{ id: w.marketId.get("Veltria"), name: "Vel\u202Etria" }] }), "markets.0.name"],
    ["an unknown market", "/api/portfolio-settings/market-names", "put", () => ({ markets: [{ id: "no-such-market", name: "Nowhere" }] }), "markets.0.id"],
  ];
  for (const [label, path, method, body, field] of cases) {
    it(label, async () => {
      const before = await state();
      const answer = await admin[method](path).send((await body()) as object);
      expect(answer.status, JSON.stringify(answer.body)).toBe(400);
      const error = apiErrorSchema.parse(answer.body).error;
      expect(error.code).toBe("invalid_input");
      expect(error.issues?.map((i) => i.path)).toContain(field);
      expect(error.message.length).toBeGreaterThan(5);
      expect(await state()).toEqual(before);
    });
  }

  it("Infinity sent as 1e999 is refused like any other non-number", async () => {
    const before = await state();
    const raw = `{"brands":[{"id":"${w.brandId.get("Kestrova")}","customerValue":1e999}]}`;
    const answer = await admin.put("/api/portfolio-settings/customer-values").set("Content-Type", "application/json").send(raw);
    expect(answer.status).toBe(400);
    expect(apiErrorSchema.parse(answer.body).error.issues?.[0]?.path).toBe("brands.0.customerValue");
    expect(await state()).toEqual(before);
  });
});

describe("only admins", () => {
  it("refuses every other role (403) and a visitor without a session (401), changing nothing", async () => {
    const before = await state();
    const writes = async (agent: Agent | ReturnType<typeof anonymous>) => [
      await agent.get("/api/portfolio-settings"),
      await agent.patch("/api/portfolio-settings/company").send({ companyName: "Taken over" }),
      await agent.put("/api/portfolio-settings/customer-values").send({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: 1 }] }),
      await agent.put("/api/portfolio-settings/channels").send(await channelBody((l) => l.map((c) => ({ ...c, name: `${c.name} 2` })))),
      await agent.put("/api/portfolio-settings/brand-names").send({ brands: [{ id: w.brandId.get("Kestrova"), name: "Taken over" }] }),
      await agent.put("/api/portfolio-settings/market-names").send({ markets: [{ id: w.marketId.get("Veltria"), name: "Taken over" }] }),
    ];
    for (const who of ["portfolioLead", "analyst", "veltriaManager", "southManager"] as const) {
      expect((await writes(w.agents[who])).map((r) => r.status), who).toEqual([403, 403, 403, 403, 403, 403]);
    }
    expect((await writes(anonymous(w))).map((r) => r.status)).toEqual([401, 401, 401, 401, 401, 401]);
    expect(await state()).toEqual(before);
    const brandRows = await w.db.select({ v: brands.customerValue }).from(brands).where(inArray(brands.code, ["kestrova"]));
    expect(brandRows[0]?.v).toBe(140);
  });
});

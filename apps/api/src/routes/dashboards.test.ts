// The dashboards through the API on a fitted snapshot (the tiny dataset: Kestrova ×
// Veltria, Kestrova × Solvera, Plumrise × Veltria; search and social; two quick fits, the
// first published): shapes, market scope in every route and export, numbers against the
// stored draws, flags across runs, what changed since the previous run, and formula
// neutralising in exports.
import Papa from "papaparse";
import { and, asc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  brandComparisonSchema,
  channelSheetSchema,
  dashboardStatusSchema,
  flagSchema,
  marketDeskSchema,
  modelCaution,
  poolingReviewSchema,
  portfolioMapSchema,
} from "@tributary/contracts";
import { quantileSorted } from "@tributary/stats";
import { auditLog, brands, cells, flags, markets, plans, runDraws, runResults, users } from "../db/schema";
import { demoMarkets } from "../demo/demo-design";
import { demoUsers } from "../demo/users";
import { FITTED_PUBLISH_REASON, fittedDatabase } from "../testing/fitted-snapshot";
import { demoTestApp, signedInAgent, type TestApp } from "../testing/test-app";

type Agent = Awaited<ReturnType<typeof signedInAgent>>;

let t: TestApp;
let publishedRunId: string;
let secondRunId: string;
let analyst: Agent;
let lead: Agent;
let veltria: Agent;
let south: Agent;
const marketId = new Map<string, string>();
const cellOf = new Map<string, string>();

beforeAll(async () => {
  const fitted = await fittedDatabase();
  publishedRunId = fitted.publishedRunId;
  secondRunId = fitted.secondRunId;
  t = await demoTestApp({}, fitted.db);
  [analyst, lead, veltria, south] = await Promise.all([
    signedInAgent(t.app, demoUsers.analyst),
    signedInAgent(t.app, demoUsers.portfolioLead),
    signedInAgent(t.app, demoUsers.veltriaManager),
    signedInAgent(t.app, demoUsers.southManager),
  ]);
  for (const row of await t.db.select().from(markets)) marketId.set(row.name, row.id);
  const rows = await t.db
    .select({ id: cells.id, brand: brands.name, market: markets.name })
    .from(cells)
    .innerJoin(brands, eq(brands.id, cells.brandId))
    .innerJoin(markets, eq(markets.id, cells.marketId));
  for (const row of rows) cellOf.set(`${row.brand} × ${row.market}`, row.id);
}, 600_000);
afterAll(async () => {
  await t.close();
  await t.db.$client.close();
});

const cell = (name: string) => cellOf.get(name)!;

/** The pooled draws of a run, read straight from run_draws (all chains, one after another). */
async function storedColumn(runId: string, name: string): Promise<Float64Array> {
  const rows = await t.db.select().from(runDraws).where(and(eq(runDraws.runId, runId), eq(runDraws.kind, "pooled"))).orderBy(asc(runDraws.chain));
  const values: number[] = [];
  for (const row of rows) {
    const bytes = Uint8Array.from(row.draws);
    const view = new DataView(bytes.buffer);
    const j = row.parameterNames.indexOf(name);
    expect(j).toBeGreaterThanOrEqual(0);
    for (let d = 0; d < row.drawCount; d++) values.push(view.getFloat64((d * row.parameterNames.length + j) * 8, true));
  }
  return Float64Array.from(values);
}

/** The fit's index of a workspace cell. */
async function fitIndex(runId: string, cellId: string): Promise<number> {
  const [row] = await t.db.select().from(runResults).where(and(eq(runResults.runId, runId), eq(runResults.kind, "fit")));
  return (row!.summaries as { cellIds: string[] }).cellIds.indexOf(cellId);
}

const median = (values: Float64Array) => quantileSorted(Float64Array.from(values).sort(), 0.5);
const q = (values: Float64Array, p: number) => quantileSorted(Float64Array.from(values).sort(), p);

describe("shapes and the run they come from", () => {
  it("every dashboard names the current run, its trust mark and publish reason, and carries the caution", async () => {
    const map = portfolioMapSchema.parse((await analyst.get("/api/dashboards/portfolio-map").expect(200)).body);
    expect(map.run.id).toBe(publishedRunId);
    expect(map.run.finishedAt).not.toBeNull();
    expect(map.run.trust.trustworthy).toBe(false);
    expect(map.run.trust.reasons.length).toBeGreaterThan(0);
    expect(map.run.publication?.reason).toBe(FITTED_PUBLISH_REASON);
    expect(map.caution).toBe(modelCaution);
    expect(map.currency).toBe("EUR");
    for (const path of ["brand-comparison", "market-desk", "pooling-review"]) {
      const body = (await analyst.get(`/api/dashboards/${path}`).expect(200)).body;
      expect(body.run.id).toBe(publishedRunId);
      expect(body.run.publication.reason).toBe(FITTED_PUBLISH_REASON);
      expect(body.caution).toBe(modelCaution);
      expect(Array.isArray(body.flags)).toBe(true);
    }
    brandComparisonSchema.parse((await analyst.get("/api/dashboards/brand-comparison").expect(200)).body);
    marketDeskSchema.parse((await analyst.get("/api/dashboards/market-desk").expect(200)).body);
    poolingReviewSchema.parse((await analyst.get("/api/dashboards/pooling-review").expect(200)).body);
    const sheet = channelSheetSchema.parse((await analyst.get(`/api/dashboards/channel-sheet/${cell("Kestrova × Veltria")}/search`).expect(200)).body);
    expect(sheet.run.id).toBe(publishedRunId);
    const status = dashboardStatusSchema.parse((await veltria.get("/api/dashboards/status").expect(200)).body);
    expect(status).toMatchObject({ current: { runId: publishedRunId, trustworthy: false }, firstFit: null });
  });

  it("a market manager sees the trust mark without the reasons that name other cells, and the publish reason", async () => {
    const map = portfolioMapSchema.parse((await veltria.get("/api/dashboards/portfolio-map").expect(200)).body);
    expect(map.run.trust.trustworthy).toBe(false);
    expect(map.run.trust.reasons).toHaveLength(1);
    expect(map.run.trust.reasons[0]).toMatch(/did not pass every convergence check/);
    expect(map.run.publication?.reason).toBe(FITTED_PUBLISH_REASON);
  });

  it("the portfolio map has one entry per cell with data; a grid position without data has none", async () => {
    const map = portfolioMapSchema.parse((await lead.get("/api/dashboards/portfolio-map?channel=search").expect(200)).body);
    expect(map.cells.map((c) => `${c.brand} × ${c.market}`)).toEqual(["Kestrova × Solvera", "Kestrova × Veltria", "Plumrise × Veltria"]);
    expect(map.cells.find((c) => c.brand === "Plumrise" && c.market === "Solvera")).toBeUndefined();
    expect(map.channel).toBe("search");
    expect(map.headline.kind).toBe("low_spend");
    expect(map.profitBasis).toMatchObject({ kind: "average_recent", weeks: 13 });
    for (const c of map.cells) {
      expect(c.weeks).toBe(40);
      expect(c.cac!.q05).toBeLessThan(c.cac!.q50);
      expect(c.cac!.q50).toBeLessThan(c.cac!.q95);
      expect(c.probabilityProfitable).toBeGreaterThanOrEqual(0);
      expect(c.pooling.shrinkageMark).not.toBeUndefined();
    }
    const all = portfolioMapSchema.parse((await lead.get("/api/dashboards/portfolio-map?channel=all").expect(200)).body);
    expect(all.channel).toBeNull();
    expect(all.headline.label).toMatch(/total spend ÷ total media contribution over the last 13/);
    expect(all.cells.every((c) => c.cacLowSpend === null && c.cacAverage !== null)).toBe(true);
  });

  it("refuses an unknown channel with the channels it has", async () => {
    const response = await analyst.get("/api/dashboards/portfolio-map?channel=radio").expect(400);
    expect(response.body.error.message).toMatch(/Unknown channel "radio".*search, social/);
    await analyst.get("/api/dashboards/market-desk/export.csv?table=nonsense").expect(400);
  });
});

describe("numbers against the stored draws", () => {
  it("the map's median low-spend CAC is the median of 1/β over the run's draws", async () => {
    const map = portfolioMapSchema.parse((await analyst.get("/api/dashboards/portfolio-map?channel=social").expect(200)).body);
    for (const entry of map.cells) {
      const g = await fitIndex(publishedRunId, entry.cellId);
      const cac = (await storedColumn(publishedRunId, `beta[${g},social]`)).map((b) => 1 / b);
      expect(entry.cac!.q50).toBeCloseTo(median(cac), 9);
      expect(entry.cac!.q05).toBeCloseTo(q(cac, 0.05), 9);
      expect(entry.cac!.q95).toBeCloseTo(q(cac, 0.95), 9);
    }
  });

  it("the portfolio channel effect is exp(−μ) and the group estimate exp(−group log β) over the draws", async () => {
    const comparison = brandComparisonSchema.parse((await analyst.get("/api/dashboards/brand-comparison").expect(200)).body);
    const search = comparison.channels.find((c) => c.channel === "search")!;
    expect(search.portfolioEffect.q50).toBeCloseTo(median((await storedColumn(publishedRunId, "mu[search]")).map((m) => Math.exp(-m))), 9);
    const review = poolingReviewSchema.parse((await analyst.get("/api/dashboards/pooling-review").expect(200)).body);
    const row = review.rows.find((r) => r.brand === "Plumrise" && r.channel === "social")!;
    const g = await fitIndex(publishedRunId, row.cellId);
    expect(row.group!.q50).toBeCloseTo(median((await storedColumn(publishedRunId, `logBetaGroup[${g},social]`)).map((v) => Math.exp(-v))), 9);
    expect(row.pooled.q50).toBeCloseTo(median((await storedColumn(publishedRunId, `beta[${g},social]`)).map((b) => 1 / b)), 9);
  });

  it("the pooling review's unpooled estimates and shrinkage are the fit's stored ones, largest shrinkage first", async () => {
    const review = poolingReviewSchema.parse((await analyst.get("/api/dashboards/pooling-review").expect(200)).body);
    const results = (await analyst.get(`/api/runs/${publishedRunId}/results`).expect(200)).body as {
      cells: { cellId: string; channel: string; cac0Unpooled: { q50: number }; shrinkage: number | null }[];
    };
    expect(review.rows).toHaveLength(6);
    for (const row of review.rows) {
      const stored = results.cells.find((c) => c.cellId === row.cellId && c.channel === row.channel)!;
      expect(row.unpooled!.q50).toBe(stored.cac0Unpooled.q50);
      expect(row.pooling.shrinkage).toBe(stored.shrinkage);
    }
    const shrinkages = review.rows.map((r) => r.pooling.shrinkage!);
    expect(shrinkages).toEqual([...shrinkages].sort((a, b) => b - a));
    expect(review.poolingFactors.length).toBeGreaterThan(0);
  });

  it("the chance of profit is the share of the channel sheet's per-draw average CAC below the customer value", async () => {
    const map = portfolioMapSchema.parse((await analyst.get("/api/dashboards/portfolio-map?channel=search").expect(200)).body);
    for (const entry of map.cells) {
      const sheet = channelSheetSchema.parse((await analyst.get(`/api/dashboards/channel-sheet/${entry.cellId}/search`).expect(200)).body);
      // 2 chains × 100 draws are kept: fewer than the 500 sent, so the vector holds every draw.
      expect(sheet.profit.draws).toHaveLength(200);
      const draws = sheet.profit.draws.map((v) => (v === null ? Infinity : v));
      const value = entry.customerValue!;
      expect(entry.probabilityProfitable).toBe(draws.filter((v) => v < value).length / draws.length);
      expect(sheet.profit.probabilityAtCustomerValue).toBe(entry.probabilityProfitable);
      // A value between the draws makes the share fall strictly between 0 and 1.
      const sorted = [...draws].sort((a, b) => a - b);
      const mid = (sorted[99]! + sorted[100]!) / 2;
      expect(draws.filter((v) => v < mid).length / draws.length).toBe(0.5);
      expect(entry.cacAverage!.q50).toBeCloseTo(quantileSorted(Float64Array.from(draws).sort(), 0.5), 9);
    }
  });

  it("the channel sheet's histograms count every draw, its curve passes the current spend, its carry-over weights sum to one", async () => {
    const sheet = channelSheetSchema.parse((await analyst.get(`/api/dashboards/channel-sheet/${cell("Plumrise × Veltria")}/social`).expect(200)).body);
    for (const posterior of [sheet.lowSpendCac, sheet.marginalCac, sheet.averageCac!]) {
      const h = posterior.histogram;
      expect(h.counts.reduce((a, b) => a + b, 0) + h.below + h.above).toBe(200);
      expect(h.edges).toHaveLength(h.counts.length + 1);
    }
    expect(sheet.marginalCac.summary.q50).toBeGreaterThan(sheet.lowSpendCac.summary.q50);
    const current = sheet.responseCurve.points.find((p) => p.weeklySpend === sheet.currentWeeklySpend);
    expect(current).toBeDefined();
    expect(current!.marginalCac.q50).toBeCloseTo(sheet.marginalCac.summary.q50, 9);
    expect(sheet.responseCurve.points[0]!.response.q50).toBe(0);
    const medians = sheet.carryOver.lags.map((l) => l.q50);
    expect(medians).toEqual([...medians].sort((a, b) => b - a));
    expect(sheet.carryOver.lags).toHaveLength(8);
    expect(sheet.contribution.weeks).toHaveLength(40);
    expect(sheet.contribution.baseline.q50.every((v) => Number.isFinite(v))).toBe(true);
    expect(sheet.estimates.unpooled).not.toBeNull();
    expect(sheet.estimates.group).not.toBeNull();
    // The current spend is the mean weekly spend of the last 13 fitted weeks.
    const lastWeeks = sheet.contribution.spend.slice(-13);
    expect(sheet.currentWeeklySpend).toBeCloseTo(lastWeeks.reduce((a, b) => a + b, 0) / 13, 9);
  });
});

const otherMarketsThanVeltria = demoMarkets.filter((m) => m.name !== "Veltria").map((m) => m.name);

describe("market scope in every route and export", () => {
  let solveraFlag: string;
  beforeAll(async () => {
    const response = await analyst
      .post("/api/flags")
      .send({ cellId: cell("Kestrova × Solvera"), channel: "search", kind: "data_problem", note: "Solvera's search spend doubled in one week" })
      .expect(201);
    solveraFlag = response.body.id;
  });

  function expectNoOtherMarket(text: string, forbidden: string[]) {
    for (const name of forbidden) expect(text, `mentions ${name}`).not.toContain(name);
    for (const name of forbidden) {
      const id = marketId.get(name);
      if (id) expect(text, `holds the id of ${name}`).not.toContain(id);
    }
    expect(text).not.toContain(cell("Kestrova × Solvera"));
    expect(text).not.toContain(solveraFlag);
  }

  const jsonRoutes = (own: string) => [
    "/api/dashboards/status",
    "/api/dashboards/portfolio-map",
    "/api/dashboards/portfolio-map?channel=search",
    "/api/dashboards/portfolio-map?channel=social",
    "/api/dashboards/brand-comparison",
    "/api/dashboards/market-desk",
    "/api/flags",
    "/api/flags?status=all",
    `/api/dashboards/channel-sheet/${own}/search`,
    `/api/dashboards/channel-sheet/${own}/social`,
  ];
  const csvRoutes = (own: string) => [
    "/api/dashboards/portfolio-map/export.csv",
    "/api/dashboards/portfolio-map/export.csv?channel=search",
    "/api/dashboards/brand-comparison/export.csv",
    "/api/dashboards/market-desk/export.csv",
    "/api/dashboards/market-desk/export.csv?table=changes",
    "/api/dashboards/market-desk/export.csv?table=plans",
    "/api/flags/export.csv",
    ...["response-curve", "carry-over", "contribution", "profit-draws"].map((table) => `/api/dashboards/channel-sheet/${own}/search/export.csv?table=${table}`),
  ];

  it("the Veltria manager gets Veltria's cells only, in JSON and CSV", async () => {
    const own = cell("Kestrova × Veltria");
    for (const path of jsonRoutes(own)) {
      const response = await veltria.get(path).expect(200);
      expectNoOtherMarket(JSON.stringify(response.body), otherMarketsThanVeltria);
    }
    for (const path of csvRoutes(own)) {
      const response = await veltria.get(path).expect(200);
      expect(response.headers["content-type"]).toMatch(/^text\/csv/);
      expect(response.headers["content-disposition"]).toMatch(/^attachment; filename=".+\.csv"$/);
      expectNoOtherMarket(response.text, otherMarketsThanVeltria);
    }
    const map = portfolioMapSchema.parse((await veltria.get("/api/dashboards/portfolio-map?channel=search").expect(200)).body);
    expect(map.cells.map((c) => c.market)).toEqual(["Veltria", "Veltria"]);
    expect(map.markets.map((m) => m.name)).toEqual(["Veltria"]);
    const comparison = brandComparisonSchema.parse((await veltria.get("/api/dashboards/brand-comparison").expect(200)).body);
    expect(comparison.rows.every((r) => r.brandEffect === null && r.cells.every((c) => c.market === "Veltria"))).toBe(true);
    const desk = marketDeskSchema.parse((await veltria.get("/api/dashboards/market-desk").expect(200)).body);
    expect(desk.cells.map((c) => c.market)).toEqual(["Veltria", "Veltria"]);
  });

  it("the same routes do show other markets to the portfolio lead (the check above can fail)", async () => {
    const own = cell("Kestrova × Veltria");
    const map = await lead.get("/api/dashboards/portfolio-map/export.csv").expect(200);
    expect(map.text).toContain("Solvera");
    const flagsCsv = await lead.get("/api/flags/export.csv").expect(200);
    expect(flagsCsv.text).toContain("Solvera");
    const comparison = brandComparisonSchema.parse((await lead.get("/api/dashboards/brand-comparison").expect(200)).body);
    expect(comparison.rows.some((r) => r.brandEffect !== null)).toBe(true);
    expect(JSON.stringify((await lead.get(`/api/dashboards/channel-sheet/${own}/search`).expect(200)).body)).toContain("Veltria");
  });

  it("a manager of other markets gets none of these cells", async () => {
    const theirs = ["Veltria", "Solvera"];
    for (const path of jsonRoutes(cell("Kestrova × Veltria")).slice(0, 8)) {
      expectNoOtherMarket(JSON.stringify((await south.get(path).expect(200)).body), theirs);
    }
    for (const path of csvRoutes("x").slice(0, 7)) expectNoOtherMarket((await south.get(path).expect(200)).text, theirs);
    const map = portfolioMapSchema.parse((await south.get("/api/dashboards/portfolio-map").expect(200)).body);
    expect(map.cells).toEqual([]);
  });

  it("refuses another market's channel sheet as not found, another market by query, and the pooling review", async () => {
    const solvera = cell("Kestrova × Solvera");
    const outOfScope = await veltria.get(`/api/dashboards/channel-sheet/${solvera}/search`).expect(404);
    const missing = await veltria.get("/api/dashboards/channel-sheet/no-such-cell/search").expect(404);
    expect(outOfScope.body.error.message).toBe(missing.body.error.message);
    await veltria.get(`/api/dashboards/channel-sheet/${solvera}/search/export.csv`).expect(404);
    await veltria.get(`/api/dashboards/market-desk?market=${marketId.get("Solvera")}`).expect(403);
    await veltria.get(`/api/dashboards/portfolio-map/export.csv?market=${marketId.get("Solvera")}`).expect(403);
    await veltria.get(`/api/flags?market=${marketId.get("Solvera")}`).expect(403);
    await veltria.get("/api/dashboards/pooling-review").expect(403);
    await veltria.get("/api/dashboards/pooling-review/export.csv").expect(403);
    await lead.get("/api/dashboards/pooling-review").expect(403);
    await veltria.post("/api/flags").send({ cellId: cell("Kestrova × Veltria"), channel: "search", kind: "data_problem", note: "not mine to flag" }).expect(403);
    await veltria.post(`/api/flags/${solveraFlag}/clear`).send({}).expect(403);
  });

  it("an analyst may narrow a dashboard to some markets", async () => {
    const map = portfolioMapSchema.parse((await analyst.get(`/api/dashboards/portfolio-map?market=${marketId.get("Solvera")}`).expect(200)).body);
    expect(map.cells.map((c) => c.market)).toEqual(["Solvera"]);
    expect(map.flags.map((f) => f.id)).toEqual([solveraFlag]);
  });
});

describe("flags", () => {
  let flagId: string;
  const plumriseVeltria = () => cell("Plumrise × Veltria");

  it("an analyst flags a cell × channel; the flag shows on every screen with who and when", async () => {
    const before = Date.now();
    const response = await analyst
      .post("/api/flags")
      .send({ cellId: plumriseVeltria(), channel: "social", kind: "needs_lift_test", note: "Pooling pulled social far; plan a lift test", runId: publishedRunId })
      .expect(201);
    const flag = flagSchema.parse(response.body);
    flagId = flag.id;
    expect(flag).toMatchObject({ brand: "Plumrise", market: "Veltria", channel: "social", channelName: "Social", kind: "needs_lift_test", active: true, runId: publishedRunId, createdBy: { name: "Tobiah Renquist" } });
    expect(Date.parse(flag.createdAt)).toBeGreaterThanOrEqual(before - 1000);

    const map = portfolioMapSchema.parse((await veltria.get("/api/dashboards/portfolio-map?channel=social").expect(200)).body);
    expect(map.flags.map((f) => f.id)).toContain(flagId);
    expect(map.cells.find((c) => c.cellId === plumriseVeltria())!.flagIds).toEqual([flagId]);
    expect(map.cells.find((c) => c.cellId === cell("Kestrova × Veltria"))!.flagIds).toEqual([]);
    const searchMap = portfolioMapSchema.parse((await veltria.get("/api/dashboards/portfolio-map?channel=search").expect(200)).body);
    expect(searchMap.cells.find((c) => c.cellId === plumriseVeltria())!.flagIds).toEqual([]);
    const combined = portfolioMapSchema.parse((await veltria.get("/api/dashboards/portfolio-map").expect(200)).body);
    expect(combined.cells.find((c) => c.cellId === plumriseVeltria())!.flagIds).toEqual([flagId]);
    for (const path of ["brand-comparison", "market-desk", "pooling-review"]) {
      const agent = path === "pooling-review" ? analyst : veltria;
      const body = (await agent.get(`/api/dashboards/${path}`).expect(200)).body;
      expect(body.flags.map((f: { id: string }) => f.id)).toContain(flagId);
      expect(JSON.stringify(body)).toContain(`"flagIds":["${flagId}"]`);
    }
    const sheet = channelSheetSchema.parse((await veltria.get(`/api/dashboards/channel-sheet/${plumriseVeltria()}/social`).expect(200)).body);
    expect(sheet.flags.map((f) => f.id)).toEqual([flagId]);
    expect(sheet.flagHistory.map((f) => f.id)).toEqual([flagId]);
    const [audit] = await t.db.select().from(auditLog).where(and(eq(auditLog.action, "flag_raised"), eq(auditLog.target, `flag:${flagId}`)));
    expect(audit!.details).toMatchObject({ kind: "needs_lift_test", channel: "social", cellId: plumriseVeltria() });
  });

  it("refuses bad flags with clear messages and writes nothing", async () => {
    const count = async () => (await t.db.select().from(flags)).length;
    const audits = async () => (await t.db.select().from(auditLog)).length;
    const [flagsBefore, auditsBefore] = [await count(), await audits()];
    const good = { cellId: plumriseVeltria(), channel: "social", kind: "real_difference", note: "Social truly works better here" };
    const cases: [Record<string, unknown>, RegExp, string][] = [
      [{ ...good, kind: "looks_odd" }, /data_problem, real_difference, needs_lift_test/, "kind"],
      [{ ...good, note: "  " }, /at least 3 characters/, "note"],
      [{ ...good, note: undefined }, /note/, "note"],
      [{ ...good, note: "x".repeat(2001) }, /under 2000 characters/, "note"],
      [{ ...good, cellId: "no-such-cell" }, /no such cell/, "cellId"],
      [{ ...good, channel: "radio" }, /no channel "radio"/, "channel"],
      [{ ...good, runId: "no-such-run" }, /no such run/, "runId"],
      [{ ...good, cellId: undefined }, /Choose the cell/, "cellId"],
    ];
    for (const [body, message, path] of cases) {
      const response = await analyst.post("/api/flags").send(body).expect(400);
      expect(response.body.error.code).toBe("invalid_input");
      expect(response.body.error.message).toMatch(message);
      expect(response.body.error.issues.map((i: { path: string }) => i.path)).toContain(path);
    }
    await lead.post("/api/flags").send(good).expect(403);
    await analyst.post("/api/flags/no-such-flag/clear").send({}).expect(404);
    await analyst.post(`/api/flags/${flagId}/clear`).send({ note: "x".repeat(2001) }).expect(400);
    expect(await count()).toBe(flagsBefore);
    expect(await audits()).toBe(auditsBefore);
  });

  it("survives a new published run", async () => {
    const published = await analyst.post(`/api/runs/${secondRunId}/publish`).send({ reason: "Second quick test fit, published to see what changed." }).expect(200);
    expect(published.body.current).toBe(true);
    const map = portfolioMapSchema.parse((await veltria.get("/api/dashboards/portfolio-map?channel=social").expect(200)).body);
    expect(map.run.id).toBe(secondRunId);
    expect(map.cells.find((c) => c.cellId === plumriseVeltria())!.flagIds).toEqual([flagId]);
    const sheet = channelSheetSchema.parse((await veltria.get(`/api/dashboards/channel-sheet/${plumriseVeltria()}/social`).expect(200)).body);
    expect(sheet.run.id).toBe(secondRunId);
    expect(sheet.flags.map((f) => f.id)).toEqual([flagId]);
    // The flag still names the run under review when it was raised.
    expect(sheet.flags[0]!.runId).toBe(publishedRunId);
  });

  it("the pooling review reads any finished run by id, the current one by default", async () => {
    const current = poolingReviewSchema.parse((await analyst.get("/api/dashboards/pooling-review").expect(200)).body);
    expect(current.run.id).toBe(secondRunId);
    const older = poolingReviewSchema.parse((await analyst.get(`/api/dashboards/pooling-review?run=${publishedRunId}`).expect(200)).body);
    expect(older.run).toMatchObject({ id: publishedRunId, current: false });
    expect(older.rows.map((r) => r.pooled.q50)).not.toEqual(current.rows.map((r) => r.pooled.q50));
    // Flags belong to cells, so an older run's review shows today's flags too.
    expect(older.flags.map((f) => f.id)).toContain(flagId);
    await analyst.get("/api/dashboards/pooling-review?run=no-such-run").expect(404);
  });

  it("a new flag on the same cell × channel replaces the active one; clearing keeps the history", async () => {
    const second = flagSchema.parse(
      (await analyst.post("/api/flags").send({ cellId: plumriseVeltria(), channel: "social", kind: "real_difference", note: "The lift test agreed: social is cheaper here" }).expect(201)).body,
    );
    const active = (await veltria.get(`/api/flags?status=active&cell=${plumriseVeltria()}`).expect(200)).body as { id: string }[];
    expect(active.map((f) => f.id)).toEqual([second.id]);
    const cleared = flagSchema.parse((await analyst.post(`/api/flags/${second.id}/clear`).send({ note: "Resolved after the lift test" }).expect(200)).body);
    expect(cleared).toMatchObject({ active: false, clearedBy: { name: "Tobiah Renquist" } });
    expect(cleared.clearedAt).not.toBeNull();
    await analyst.post(`/api/flags/${second.id}/clear`).send({}).expect(409);

    const history = (await veltria.get(`/api/flags?status=all&cell=${plumriseVeltria()}&channel=social`).expect(200)).body as { id: string; active: boolean }[];
    expect(history.map((f) => [f.id, f.active])).toEqual([
      [second.id, false],
      [flagId, false],
    ]);
    const map = portfolioMapSchema.parse((await veltria.get("/api/dashboards/portfolio-map?channel=social").expect(200)).body);
    expect(map.cells.find((c) => c.cellId === plumriseVeltria())!.flagIds).toEqual([]);
    const sheet = channelSheetSchema.parse((await veltria.get(`/api/dashboards/channel-sheet/${plumriseVeltria()}/social`).expect(200)).body);
    expect(sheet.flags).toEqual([]);
    expect(sheet.flagHistory.map((f) => f.id)).toEqual([second.id, flagId]);
    const clearedAudit = await t.db.select().from(auditLog).where(eq(auditLog.action, "flag_cleared"));
    expect(clearedAudit.map((a) => a.target)).toEqual(expect.arrayContaining([`flag:${flagId}`, `flag:${second.id}`]));
    expect(clearedAudit.find((a) => a.target === `flag:${second.id}`)!.details).toMatchObject({ note: "Resolved after the lift test" });
    expect(clearedAudit.find((a) => a.target === `flag:${flagId}`)!.details).toMatchObject({ supersededBy: second.id });
    const flagsCsv = Papa.parse<string[]>((await analyst.get("/api/flags/export.csv?status=cleared").expect(200)).text.trim()).data;
    expect(flagsCsv[0]).toEqual(["brand", "market", "channel", "kind", "note", "flagged_by", "flagged_at", "active", "cleared_by", "cleared_at", "run_id"]);
    expect(flagsCsv.slice(1).map((row) => row[4])).toEqual(["The lift test agreed: social is cheaper here", "Pooling pulled social far; plan a lift test"]);
  });
});

describe("what changed since the previous published run", () => {
  it("compares each cell × channel's median and 90 % interval between the two runs", async () => {
    const desk = marketDeskSchema.parse((await analyst.get("/api/dashboards/market-desk").expect(200)).body);
    expect(desk.run.id).toBe(secondRunId);
    expect(desk.previousRun?.id).toBe(publishedRunId);
    expect(desk.changes).toHaveLength(6);
    for (const change of desk.changes) {
      expect(change.status).toBe("compared");
      const g1 = await fitIndex(publishedRunId, change.cellId);
      const g2 = await fitIndex(secondRunId, change.cellId);
      const before = (await storedColumn(publishedRunId, `beta[${g1},${change.channel}]`)).map((b) => 1 / b);
      const after = (await storedColumn(secondRunId, `beta[${g2},${change.channel}]`)).map((b) => 1 / b);
      expect(change.before!.q50).toBeCloseTo(median(before), 9);
      expect(change.after!.q50).toBeCloseTo(median(after), 9);
      expect(change.medianChange).toBeCloseTo(median(after) / median(before) - 1, 9);
      const overlap = q(after, 0.05) <= q(before, 0.95) && q(before, 0.05) <= q(after, 0.95);
      expect(change.intervalsOverlap).toBe(overlap);
    }
    const sizes = desk.changes.map((c) => Math.abs(Math.log1p(c.medianChange!)));
    expect(sizes).toEqual([...sizes].sort((a, b) => b - a));
    const csv = Papa.parse<string[]>((await analyst.get("/api/dashboards/market-desk/export.csv?table=changes").expect(200)).text.trim()).data;
    expect(csv).toHaveLength(7);
    expect(csv[1]![csv[0]!.indexOf("previous_run_id")]).toBe(publishedRunId);
  });

  it("the desk lists only the plans whose markets are all the viewer's", async () => {
    const [manager] = await t.db.select({ id: users.id }).from(users).where(eq(users.email, demoUsers.veltriaManager.email));
    await t.db.insert(plans).values([
      { kind: "scenario", name: "Veltria autumn push", runId: secondRunId, marketIds: [marketId.get("Veltria")!], body: {}, createdBy: manager!.id },
      { kind: "budget_split", name: "Two-market split", runId: secondRunId, marketIds: [marketId.get("Veltria")!, marketId.get("Solvera")!], body: {}, createdBy: manager!.id },
    ]);
    const desk = marketDeskSchema.parse((await veltria.get("/api/dashboards/market-desk").expect(200)).body);
    expect(desk.plans.map((p) => [p.name, p.markets, p.mine])).toEqual([["Veltria autumn push", ["Veltria"], true]]);
    const leadDesk = marketDeskSchema.parse((await lead.get("/api/dashboards/market-desk").expect(200)).body);
    expect(leadDesk.plans.map((p) => p.name).sort()).toEqual(["Two-market split", "Veltria autumn push"]);
    expect(leadDesk.plans.every((p) => !p.mine)).toBe(true);
  });
});

describe("exports neutralise spreadsheet formulas", () => {
  it("prefixes text starting with = + - @ with a quote, even over several lines (tab and carriage return: csv-export.test.ts)", async () => {
    const notes = ['=HYPERLINK("http://example.invalid","open")\nsecond line', "+1+2 budget", "-3 weeks of data", "@SUM(A1)"];
    for (const [k, note] of notes.entries()) {
      const channel = k % 2 === 0 ? "search" : "social";
      const target = [cell("Kestrova × Veltria"), cell("Plumrise × Veltria"), cell("Kestrova × Solvera")][k % 3]!;
      await analyst.post("/api/flags").send({ cellId: target, channel, kind: "data_problem", note: `${note}` }).expect(201);
    }
    const text = (await analyst.get("/api/flags/export.csv?status=all").expect(200)).text;
    const rows = Papa.parse<string[]>(text.trim()).data;
    const written = rows.slice(1).map((row) => row[4]!);
    expect(written).toEqual(expect.arrayContaining(["'+1+2 budget", "'-3 weeks of data", "'@SUM(A1)", '\'=HYPERLINK("http://example.invalid","open")\nsecond line']));
    expect(written.every((note) => !/^[=+\-@\t\r]/.test(note))).toBe(true);

    await t.db.update(brands).set({ name: "=Plumrise" }).where(eq(brands.code, "plumrise"));
    const map = Papa.parse<string[]>((await analyst.get("/api/dashboards/portfolio-map/export.csv?channel=search").expect(200)).text.trim()).data;
    expect(map.slice(1).map((row) => row[0])).toContain("'=Plumrise");
    // Numbers stay numbers, negative ones included.
    const header = map[0]!;
    const median = Number(map[1]![header.indexOf("cac_median")]);
    expect(median).toBeGreaterThan(0);
    for (const path of ["/api/dashboards/brand-comparison/export.csv", "/api/dashboards/market-desk/export.csv", "/api/dashboards/pooling-review/export.csv"]) {
      const csv = (await analyst.get(path).expect(200)).text;
      expect(csv).toContain("'=Plumrise");
      expect(csv).not.toMatch(/(^|,|\r\n)=Plumrise/);
    }
    const sheetCsv = (await analyst.get(`/api/dashboards/channel-sheet/${cell("Plumrise × Veltria")}/social/export.csv?table=carry-over`).expect(200)).text;
    // Channels by their display name (the URL takes the code).
    expect(sheetCsv.split("\r\n")[1]).toMatch(/^"'=Plumrise",Veltria,Social,0,/);
    await t.db.update(brands).set({ name: "Plumrise" }).where(eq(brands.code, "plumrise"));
  });
});

describe("before any run is published", () => {
  it("dashboards answer 404 with a plain message and the status says there is no current run", async () => {
    const fresh = await demoTestApp();
    try {
      const agent = await signedInAgent(fresh.app, demoUsers.veltriaManager);
      for (const path of ["portfolio-map", "brand-comparison", "market-desk", "portfolio-map/export.csv"]) {
        const response = await agent.get(`/api/dashboards/${path}`).expect(404);
        expect(response.body.error.message).toMatch(/No fit has been published yet/);
      }
      expect((await agent.get("/api/dashboards/status").expect(200)).body).toEqual({ current: null, firstFit: null });
      await agent.get("/api/dashboards/status").expect(200);
    } finally {
      await fresh.close();
    }
  });

  it("signed-out callers get 401", async () => {
    const { default: request } = await import("supertest");
    await request(t.app).get("/api/dashboards/portfolio-map").expect(401);
    await request(t.app).get("/api/flags/export.csv").expect(401);
  });
});

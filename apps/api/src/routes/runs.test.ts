// Fit runs through the API: a small fit to completion with live progress, the report,
// publishing (with a reason when untrustworthy), market-scoped results, cancelling and
// queueing. Interrupted runs after a server stop are in runs-recovery.test.ts.
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  modelCaution,
  runEventSchema,
  runReportSchema,
  runResultsSchema,
  runSchema,
  type Run,
  type RunEvent,
} from "@tributary/contracts";
import { createRandomSource, posteriorPredictiveBands } from "@tributary/stats";
import { auditLog, brands, markets, runDraws, runResults } from "../db/schema";
import { demoUsers } from "../demo/users";
import { loadRunDrawSet } from "../runs/run-results";
import { quickFit, saveTinyDataset, slowFit } from "../testing/fit-fixtures";
import { demoTestApp, signedInAgent, type TestApp } from "../testing/test-app";

type Agent = Awaited<ReturnType<typeof signedInAgent>>;

let t: TestApp;
let versionId: string;
let analyst: Agent;
beforeAll(async () => {
  t = await demoTestApp();
  versionId = await saveTinyDataset(t.db);
  analyst = await signedInAgent(t.app, demoUsers.analyst);
});
afterAll(() => t.close());

async function settingsId(agent: Agent, change: Record<string, unknown>): Promise<string> {
  const response = await agent.post("/api/model-settings").send({ datasetVersionId: versionId, ...change }).expect(201);
  return response.body.id as string;
}

async function startRun(agent: Agent, change: Record<string, unknown>): Promise<Run> {
  const response = await agent.post("/api/runs").send({ modelSettingsId: await settingsId(agent, change) }).expect(201);
  return runSchema.parse(response.body);
}

/** Reads a run's event stream until the server ends it. */
async function eventsOf(agent: Agent, runId: string): Promise<RunEvent[]> {
  const response = await agent
    .get(`/api/runs/${runId}/events`)
    .buffer(true)
    .parse((res, callback) => {
      let text = "";
      res.setEncoding("utf8");
      res.on("data", (chunk: string) => (text += chunk));
      res.on("end", () => callback(null, text));
    })
    .expect(200);
  expect(response.headers["content-type"]).toMatch(/^text\/event-stream/);
  const blocks = String(response.body).split("\n\n").filter((block) => block.startsWith("event:"));
  return blocks.map((block) => {
    const data = block.split("\n").find((line) => line.startsWith("data: "))!.slice(6);
    return runEventSchema.parse(JSON.parse(data));
  });
}

async function waitFor(agent: Agent, runId: string, done: (run: Run) => boolean): Promise<Run> {
  for (let i = 0; i < 600; i++) {
    const run = runSchema.parse((await agent.get(`/api/runs/${runId}`).expect(200)).body);
    if (done(run)) return run;
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  throw new Error(`run ${runId} did not get there in time`);
}

describe("a small fit", () => {
  let run: Run;
  let events: RunEvent[];
  beforeAll(async () => {
    run = await startRun(analyst, { ...quickFit, holdoutWeeks: 4 });
    events = await eventsOf(analyst, run.id);
  });

  it("streams progress per chain and ends with the stored run", async () => {
    expect(["queued", "running"]).toContain(run.status);
    expect(events[0]!.type).toBe("run");
    const progress = events.flatMap((e) => (e.type === "progress" ? [e.progress] : []));
    expect(progress.length).toBeGreaterThan(3);
    const pooled = progress.filter((p) => p.stage === "pooled");
    expect(pooled.length).toBeGreaterThan(0);
    expect(pooled.at(-1)!.chains.map((c) => c.chain)).toEqual([0, 1]);
    expect(progress.some((p) => p.stage === "unpooled")).toBe(true);
    expect(progress.some((p) => p.chains.some((c) => c.etaSeconds !== null))).toBe(true);
    const fractions = progress.map((p) => p.fraction);
    expect(Math.max(...fractions)).toBeGreaterThan(0.5);
    const end = events.at(-1)!;
    expect(end.type).toBe("end");
    const finished = (end as Extract<RunEvent, { type: "end" }>).run;
    expect(finished.status).toBe("succeeded");
    expect(finished.finishedAt).not.toBeNull();
    expect(finished.progress?.fraction).toBe(1);
  });

  it("is marked untrustworthy with its reasons, as 200 draws cannot reach a bulk ESS of 400", async () => {
    const stored = runSchema.parse((await analyst.get(`/api/runs/${run.id}`).expect(200)).body);
    expect(stored.status).toBe("succeeded");
    expect(stored.seed).toBe(quickFit.seed);
    expect(stored.trust.trustworthy).toBe(false);
    expect(stored.trust.reasons.some((r) => r.includes("Bulk ESS is below 400"))).toBe(true);
    const list = runSchema.array().parse((await analyst.get("/api/runs?status=succeeded").expect(200)).body);
    expect(list.map((r) => r.id)).toContain(run.id);
  });

  it("has a report: every parameter's diagnostics, traces of the worst, predictive check per cell, holdout accuracy", async () => {
    const report = runReportSchema.parse((await analyst.get(`/api/runs/${run.id}/report`).expect(200)).body);
    expect(report.parameters.length).toBeGreaterThan(50);
    const beta = report.parameters.find((p) => p.name === "beta[0,search]")!;
    expect(beta.label).toBe("beta · Kestrova × Solvera · search");
    expect(beta.rhat).toBeGreaterThan(0.9);
    expect(beta.essTail).toBeGreaterThan(0);
    expect(report.traces).toHaveLength(6);
    for (const trace of report.traces) {
      expect(trace.chains.map((c) => c.values.length)).toEqual([100, 100]);
      expect(trace.rankCounts.map((c) => c.counts.reduce((a, b) => a + b, 0))).toEqual([100, 100]);
    }
    expect(report.traces[0]!.rhat).toBe(Math.max(...report.parameters.map((p) => p.rhat ?? 0)));
    expect(report.predictiveCheck.map((c) => `${c.brand} × ${c.market}`)).toEqual(["Kestrova × Solvera", "Kestrova × Veltria", "Plumrise × Veltria"]);
    for (const cell of report.predictiveCheck) {
      expect(cell.weeks).toHaveLength(40);
      expect(cell.holdoutFrom).toBe(cell.weeks[36]);
      for (let w = 0; w < 40; w++) expect(cell.q05[w]!).toBeLessThanOrEqual(cell.q95[w]!);
      expect(cell.coverage90).toBeGreaterThan(0.5);
    }
    expect(report.holdout?.weeks).toBe(4);
    expect(report.holdout?.cells).toHaveLength(3);
    expect(report.holdout!.crps).toBeGreaterThan(0);
    expect(report.diagnostics.pooled.attempts).toBeGreaterThanOrEqual(1);
  });

  it("stores a thinned draw set that rebuilds the report's predictive check exactly", async () => {
    const rows = await t.db.select().from(runDraws).where(eq(runDraws.runId, run.id));
    expect(rows.map((r) => [r.kind, r.chain, r.drawCount])).toEqual([
      ["pooled", 0, 100],
      ["pooled", 1, 100],
    ]);
    const set = await loadRunDrawSet(t.db, run.id);
    expect(set.drawCount).toBe(200);
    expect(set.channels).toEqual(["search", "social"]);
    const report = runReportSchema.parse((await analyst.get(`/api/runs/${run.id}/report`).expect(200)).body);
    const again = posteriorPredictiveBands(set, createRandomSource(quickFit.seed ^ 0x5bd1e995));
    expect(Array.from(again[1]!.q50)).toEqual(report.predictiveCheck[1]!.q50);

    // Renaming a brand changes the order cells are read in; the draw set still follows the fit's order.
    await t.db.update(brands).set({ name: "Zeta Kestrova" }).where(eq(brands.code, "kestrova"));
    try {
      const renamed = await loadRunDrawSet(t.db, run.id);
      expect(renamed.cells.map((c) => c.market)).toEqual(set.cells.map((c) => c.market));
      expect(Array.from(renamed.cells[0]!.outcome)).toEqual(Array.from(set.cells[0]!.outcome));
    } finally {
      await t.db.update(brands).set({ name: "Kestrova" }).where(eq(brands.code, "kestrova"));
    }
    const stored = await t.db.select().from(runResults).where(eq(runResults.runId, run.id));
    expect(stored.map((r) => r.kind).sort()).toEqual(["fit", "report"]);
    // The draws live in run_draws only, not in the JSON summaries.
    const fit = stored.find((r) => r.kind === "fit")!.summaries as Record<string, unknown>;
    expect(fit).not.toHaveProperty("drawSet");
    expect(fit.cellIds).toHaveLength(3);
  });

  it("is refused to market managers and portfolio leads on every run route", async () => {
    for (const user of [demoUsers.veltriaManager, demoUsers.portfolioLead]) {
      const agent = await signedInAgent(t.app, user);
      for (const path of [`/api/runs/${run.id}`, `/api/runs/${run.id}/report`, `/api/runs/${run.id}/events`, `/api/runs/${run.id}/results`, "/api/runs"]) {
        await agent.get(path).expect(403);
      }
      await agent.post(`/api/runs/${run.id}/publish`).send({ reason: "x".repeat(40) }).expect(403);
    }
  });

  it("publishes only with a written reason, which is returned with the numbers; market managers get their cells only", async () => {
    const manager = await signedInAgent(t.app, demoUsers.veltriaManager);
    const noneYet = await manager.get("/api/runs/current");
    if (noneYet.status === 200) expect(noneYet.body.run.id).not.toBe(run.id);

    const refused = await analyst.post(`/api/runs/${run.id}/publish`).send({}).expect(400);
    expect(refused.body.error.message).toContain("did not pass the convergence checks");
    await analyst.post(`/api/runs/${run.id}/publish`).send({ reason: "too short" }).expect(400);
    const reason = "Quick look for the weekly review; the full fit follows tomorrow.";
    const published = runSchema.parse((await analyst.post(`/api/runs/${run.id}/publish`).send({ reason }).expect(200)).body);
    expect(published.current).toBe(true);
    expect(published.publication).toMatchObject({ reason, by: { name: demoUsers.analyst.name } });
    await analyst.post(`/api/runs/${run.id}/publish`).send({ reason }).expect(409);
    const audit = await t.db.select().from(auditLog).where(and(eq(auditLog.action, "run_published"), eq(auditLog.target, `run:${run.id}`)));
    expect(audit).toHaveLength(1);

    const all = runResultsSchema.parse((await analyst.get("/api/runs/current").expect(200)).body);
    expect(all.run.id).toBe(run.id);
    expect(all.run.publication?.reason).toBe(reason);
    expect(all.caution).toBe(modelCaution);
    expect(all.cells).toHaveLength(6);
    expect(all.channels.map((c) => c.channel)).toEqual(["search", "social"]);
    // With the no-pooling comparison: pooling factors per level and channel, shrinkage per cell.
    expect(all.poolingFactors.length).toBeGreaterThan(0);
    expect(all.cells.every((c) => c.cac0Unpooled !== null)).toBe(true);

    const [veltria] = await t.db.select().from(markets).where(eq(markets.code, "veltria"));
    const mine = runResultsSchema.parse((await manager.get("/api/runs/current").expect(200)).body);
    expect(mine.cells).toHaveLength(4);
    expect(mine.cells.every((c) => c.marketId === veltria!.id)).toBe(true);
    expect(JSON.stringify(mine)).not.toContain("Solvera");
    expect(mine.run.publication?.reason).toBe(reason);
    expect(mine.run.trust.trustworthy).toBe(false);
    expect(mine.run.trust.reasons).toHaveLength(1);
    const south = runResultsSchema.parse((await (await signedInAgent(t.app, demoUsers.southManager)).get("/api/runs/current").expect(200)).body);
    expect(south.cells).toEqual([]);
  });

  it("has nothing to cancel or restart once finished", async () => {
    await analyst.post(`/api/runs/${run.id}/cancel`).expect(409);
    const restart = await analyst.post(`/api/runs/${run.id}/restart`).expect(409);
    expect(restart.body.error.message).toContain("start a new run");
  });
});

describe("cancelling and queueing", () => {
  it("cancels a running fit promptly; it stores no results and its stream ends at once", async () => {
    const run = await startRun(analyst, slowFit);
    await waitFor(analyst, run.id, (r) => r.status === "running" && (r.progress?.chains.some((c) => c.iteration > 0) ?? false));
    const cancelled = runSchema.parse((await analyst.post(`/api/runs/${run.id}/cancel`).expect(200)).body);
    expect(cancelled.status).toBe("cancelled");
    expect(cancelled.failureReason).toContain("cancelled");
    expect(await t.db.select().from(runResults).where(eq(runResults.runId, run.id))).toEqual([]);
    expect(await t.db.select().from(runDraws).where(eq(runDraws.runId, run.id))).toEqual([]);
    const events = await eventsOf(analyst, run.id);
    expect(events.map((e) => e.type)).toEqual(["run", "end"]);
    await analyst.get(`/api/runs/${run.id}/report`).expect(409);
    await analyst.post(`/api/runs/${run.id}/cancel`).expect(409);
  });

  it("runs one fit at a time: the next waits in the queue and can be cancelled there", async () => {
    const first = await startRun(analyst, slowFit);
    const second = await startRun(analyst, slowFit);
    const waiting = runSchema.parse((await analyst.get(`/api/runs/${second.id}`).expect(200)).body);
    expect(waiting.status).toBe("queued");
    expect(waiting.progress).toMatchObject({ stage: "queued", queuePosition: 1 });
    const cancelled = runSchema.parse((await analyst.post(`/api/runs/${second.id}/cancel`).expect(200)).body);
    expect(cancelled.status).toBe("cancelled");
    expect(cancelled.startedAt).toBeNull();
    await analyst.post(`/api/runs/${first.id}/cancel`).expect(200);
  });

  it("restarts a cancelled run once, with the same settings and seed, linked both ways", async () => {
    const run = await startRun(analyst, slowFit);
    await analyst.post(`/api/runs/${run.id}/cancel`).expect(200);
    const again = runSchema.parse((await analyst.post(`/api/runs/${run.id}/restart`).expect(201)).body);
    expect(again).toMatchObject({ restartedFromRunId: run.id, modelSettingsId: run.modelSettingsId, seed: run.seed });
    const old = runSchema.parse((await analyst.get(`/api/runs/${run.id}`).expect(200)).body);
    expect(old.restartedByRunId).toBe(again.id);
    await analyst.post(`/api/runs/${run.id}/restart`).expect(409);
    await analyst.post(`/api/runs/${again.id}/cancel`).expect(200);
  });

  it("refuses to start without valid model settings", async () => {
    await analyst.post("/api/runs").send({}).expect(400);
    await analyst.post("/api/runs").send({ modelSettingsId: "nope" }).expect(404);
    await (await signedInAgent(t.app, demoUsers.veltriaManager)).post("/api/runs").send({ modelSettingsId: "nope" }).expect(403);
  });
});

// The demo's first fit: queued as the analyst with the default settings (quick here, on
// the tiny dataset so the test takes seconds), reported by /api/dashboards/status while
// it runs, published automatically with the written reason when it ends; resumed at a
// later start when the server stopped before publishing it.
import { and, eq, isNotNull } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { dashboardStatusSchema, runSchema } from "@tributary/contracts";
import { appDeps, createApp, shutdownApp } from "../app";
import { auditLog, modelSettings, outbox, runs } from "../db/schema";
import { notifyRunPublished } from "../mail/run-published";
import type { FitJobInput, FitJobOutput, FitJobProgress } from "../jobs/fit-job";
import { markInterruptedRuns } from "../runs/run-service";
import { saveTinyDataset } from "../testing/fit-fixtures";
import { fittedDatabase } from "../testing/fitted-snapshot";
import { ManualJobRunner } from "../testing/manual-job-runner";
import { demoTestApp, signedInAgent, type TestApp } from "../testing/test-app";
import { DEMO_FIT_ACTION, demoAutoPublishReason, demoFitModeFromEnv, queueDemoFit, quickDemoFitSettings, resumeDemoFit } from "./demo-fit";
import { demoUsers } from "./users";

const opened: TestApp[] = [];
afterAll(async () => {
  for (const t of opened) await t.close();
});

describe("DEMO_FIT", () => {
  it("is full by default, off or quick when asked, and refused otherwise", () => {
    expect(demoFitModeFromEnv({})).toBe("full");
    expect(demoFitModeFromEnv({ DEMO_FIT: "" })).toBe("full");
    expect(demoFitModeFromEnv({ DEMO_FIT: "quick" })).toBe("quick");
    expect(demoFitModeFromEnv({ DEMO_FIT: "off" })).toBe("off");
    expect(() => demoFitModeFromEnv({ DEMO_FIT: "fast" })).toThrow('DEMO_FIT must be off, quick or full, got "fast"');
    expect(quickDemoFitSettings).toEqual({ chains: 2, warmup: 150, draws: 150 });
  });
});

describe("the first fit", () => {
  it("is queued as the analyst, shown as in progress, published automatically with the reason, and e-mailed like any publish", async () => {
    const t = await demoTestApp();
    opened.push(t);
    const versionId = await saveTinyDataset(t.db);
    const app = appDeps(t.app);
    const deps = { ...app, onPublished: (runId: string) => notifyRunPublished(t.db, app.mailer, runId, "http://tributary.test") };
    const manager = await signedInAgent(t.app, demoUsers.veltriaManager);

    expect(await queueDemoFit(deps, "off", { datasetVersionId: versionId })).toBeNull();
    const queued = (await queueDemoFit(deps, "quick", { datasetVersionId: versionId }))!;
    const [settings] = await t.db.select({ settings: modelSettings.settings }).from(modelSettings).innerJoin(runs, eq(runs.modelSettingsId, modelSettings.id)).where(eq(runs.id, queued.runId));
    expect(settings!.settings).toMatchObject({ chains: 2, warmup: 150, draws: 150, maxLag: 8, pooling: "crossed", unpooledComparison: true });

    const during = dashboardStatusSchema.parse((await manager.get("/api/dashboards/status").expect(200)).body);
    expect(during.current).toBeNull();
    expect(during.firstFit?.runId).toBe(queued.runId);
    expect(during.firstFit?.message).toMatch(/^The first fit is (waiting to start|running — \d+ % done)$/);
    const waiting = await manager.get("/api/dashboards/portfolio-map").expect(404);
    expect(waiting.body.error.message).toMatch(/No fit has been published yet/);

    expect(await queued.published).toBe(true);
    const analyst = await signedInAgent(t.app, demoUsers.analyst);
    const run = runSchema.parse((await analyst.get(`/api/runs/${queued.runId}`).expect(200)).body);
    expect(run.current).toBe(true);
    expect(run.createdBy?.name).toBe(demoUsers.analyst.name);
    expect(run.publication?.by?.name).toBe(demoUsers.analyst.name);
    // 2 chains × 150 draws cannot reach the effective sample size the trust rule asks for.
    expect(run.trust.trustworthy).toBe(false);
    expect(run.publication?.reason).toBe(demoAutoPublishReason);
    expect(demoAutoPublishReason).toMatch(/automatically at the first start/);
    expect(demoAutoPublishReason).toMatch(/do not use it for decisions/);

    const after = dashboardStatusSchema.parse((await manager.get("/api/dashboards/status").expect(200)).body);
    expect(after).toMatchObject({ current: { runId: queued.runId, trustworthy: false }, firstFit: null });
    const map = (await manager.get("/api/dashboards/portfolio-map").expect(200)).body;
    expect(map.run.publication.reason).toBe(demoAutoPublishReason);
    const [audit] = await t.db.select().from(auditLog).where(and(eq(auditLog.action, "run_published"), eq(auditLog.target, `run:${queued.runId}`)));
    expect(audit!.details).toMatchObject({ automatic: true, demoFit: true, reason: demoAutoPublishReason });
    // The market managers are told, as after a publish from the Runs screen.
    const mail = await t.db.select({ to: outbox.to, kind: outbox.kind, text: outbox.text }).from(outbox);
    const toManager = mail.filter((message) => message.to === demoUsers.veltriaManager.email);
    expect(toManager.length).toBe(1);
    expect(toManager[0]!.text).toContain("http://tributary.test");
  });

  it("is restarted at the next start when the server stopped while it ran", async () => {
    const t = await demoTestApp();
    opened.push(t);
    const versionId = await saveTinyDataset(t.db);
    const first = new ManualJobRunner<FitJobInput, FitJobProgress, FitJobOutput>();
    const before = createApp({ db: t.db, config: { logLevel: "silent" }, jobRunner: first });
    const queued = (await queueDemoFit(appDeps(before), "quick", { datasetVersionId: versionId }))!;
    await shutdownApp(before);
    expect(await markInterruptedRuns(t.db)).toBe(1);

    const manager = await signedInAgent(t.app, demoUsers.southManager);
    const stopped = dashboardStatusSchema.parse((await manager.get("/api/dashboards/status").expect(200)).body);
    expect(stopped.firstFit).toMatchObject({ runId: queued.runId, status: "interrupted" });

    const second = new ManualJobRunner<FitJobInput, FitJobProgress, FitJobOutput>();
    const after = createApp({ db: t.db, config: { logLevel: "silent" }, jobRunner: second });
    try {
      const resumed = await resumeDemoFit(appDeps(after), "quick");
      expect(resumed.action).toBe("restarted");
      expect(second.enqueued.map((job) => job.id)).toEqual([resumed.runId]);
      const [restarted] = await t.db.select().from(runs).where(eq(runs.id, resumed.runId!));
      expect(restarted!.restartedFromRunId).toBe(queued.runId);
      const marks = await t.db.select({ target: auditLog.target }).from(auditLog).where(eq(auditLog.action, DEMO_FIT_ACTION));
      expect(marks.map((m) => m.target)).toEqual([`run:${queued.runId}`, `run:${resumed.runId}`]);
      const status = dashboardStatusSchema.parse((await manager.get("/api/dashboards/status").expect(200)).body);
      expect(status.firstFit).toMatchObject({ runId: resumed.runId, status: "queued", message: "The first fit is waiting to start" });
      second.finish(resumed.runId!, { state: "failed", reason: "The fit failed: test" });
      expect(await resumed.published).toBe(false);
      const failed = dashboardStatusSchema.parse((await manager.get("/api/dashboards/status").expect(200)).body);
      // The reason may name any cell: market managers get a sentence that names none.
      expect(failed.firstFit?.message).toBe("The first fit failed; an analyst can fit the data again on the Runs screen");
      const analyst = await signedInAgent(t.app, demoUsers.analyst);
      const forAnalyst = dashboardStatusSchema.parse((await analyst.get("/api/dashboards/status").expect(200)).body);
      expect(forAnalyst.firstFit?.message).toBe("The first fit failed: The fit failed: test");
      expect(await resumeDemoFit(appDeps(after), "quick")).toMatchObject({ action: "none" });
    } finally {
      await shutdownApp(after);
    }
  });

  it("is published at the next start when it finished before the server stopped, unless someone published a run", async () => {
    const fitted = await fittedDatabase();
    const t = await demoTestApp({}, fitted.db);
    opened.push({ ...t, close: async () => (await t.close(), await fitted.db.$client.close()) });
    // The fitted snapshot's second run plays the demo fit; nothing is published yet.
    await t.db.update(runs).set({ publishedAt: null, publishedBy: null, publishReason: null }).where(isNotNull(runs.publishedAt));
    await t.db.insert(auditLog).values({ action: DEMO_FIT_ACTION, target: `run:${fitted.secondRunId}`, details: { mode: "quick" } });
    const deps = appDeps(t.app);
    expect(await resumeDemoFit(deps, "off")).toMatchObject({ action: "none" });
    expect(await resumeDemoFit(deps, "quick")).toMatchObject({ action: "published", runId: fitted.secondRunId });
    const [run] = await t.db.select().from(runs).where(eq(runs.id, fitted.secondRunId));
    expect(run!.publishReason).toBe(demoAutoPublishReason);
    expect(await resumeDemoFit(deps, "quick")).toMatchObject({ action: "none" });
  });
});

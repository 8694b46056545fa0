// A fit running when the server stops: at the next start over the same data directory it
// is marked interrupted with a readable reason, nothing else is lost, and one call
// restarts it with the same settings and seed.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { runSchema, type Run } from "@tributary/contracts";
import { closeDatabase, createDatabase } from "../db/client";
import { datasetVersions, modelSettings } from "../db/schema";
import { demoUsers } from "../demo/users";
import { snapshotDatabase } from "../testing/database-snapshot";
import { quickFit, saveTinyDataset, slowFit } from "../testing/fit-fixtures";
import { demoTestApp, signedInAgent, type TestApp } from "../testing/test-app";

const dir = mkdtempSync(join(tmpdir(), "tributary-recovery-"));
const dataDir = join(dir, "data");
const open: TestApp[] = [];
afterAll(async () => {
  for (const t of open.splice(0)) await t.close().catch(() => {});
  rmSync(dir, { recursive: true, force: true });
});

async function waitFor(agent: Awaited<ReturnType<typeof signedInAgent>>, runId: string, done: (run: Run) => boolean): Promise<Run> {
  for (let i = 0; i < 600; i++) {
    const run = runSchema.parse((await agent.get(`/api/runs/${runId}`).expect(200)).body);
    if (done(run)) return run;
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  throw new Error("the run did not get there in time");
}

describe("a server stop during a fit", () => {
  it("leaves the run interrupted at the next start, restartable with one call", async () => {
    // First life of the server: a dataset, settings, a running fit and a queued one.
    const firstDb = await snapshotDatabase("demo", { dataDir });
    const first = await demoTestApp({}, firstDb);
    const versionId = await saveTinyDataset(firstDb);
    const agent = await signedInAgent(first.app, demoUsers.analyst);
    const slow = await agent.post("/api/model-settings").send({ datasetVersionId: versionId, ...slowFit }).expect(201);
    const quick = await agent.post("/api/model-settings").send({ datasetVersionId: versionId, ...quickFit }).expect(201);
    const running = runSchema.parse((await agent.post("/api/runs").send({ modelSettingsId: slow.body.id }).expect(201)).body);
    const queued = runSchema.parse((await agent.post("/api/runs").send({ modelSettingsId: quick.body.id }).expect(201)).body);
    await waitFor(agent, running.id, (r) => r.status === "running");
    expect(runSchema.parse((await agent.get(`/api/runs/${queued.id}`).expect(200)).body).status).toBe("queued");

    // The server stops: its jobs end without a word, the database closes.
    await first.close();
    await closeDatabase(firstDb);

    // Second life over the same data directory.
    const secondDb = await createDatabase({ dataDir });
    const second = await demoTestApp({}, secondDb);
    open.push({ ...second, close: async () => (await second.close(), await closeDatabase(secondDb)) });
    const again = await signedInAgent(second.app, demoUsers.analyst);
    for (const id of [running.id, queued.id]) {
      const run = runSchema.parse((await again.get(`/api/runs/${id}`).expect(200)).body);
      expect(run.status).toBe("interrupted");
      expect(run.failureReason).toContain("The server stopped while this run was queued or running");
      expect(run.finishedAt).not.toBeNull();
    }
    // Nothing else was lost: the dataset version and the settings are still there.
    expect(await secondDb.select().from(datasetVersions).where(eq(datasetVersions.id, versionId))).toHaveLength(1);
    expect(await secondDb.select().from(modelSettings).where(eq(modelSettings.id, slow.body.id))).toHaveLength(1);

    const restarted = runSchema.parse((await again.post(`/api/runs/${running.id}/restart`).expect(201)).body);
    expect(restarted).toMatchObject({ restartedFromRunId: running.id, modelSettingsId: running.modelSettingsId, seed: running.seed });
    expect(runSchema.parse((await again.get(`/api/runs/${running.id}`).expect(200)).body).restartedByRunId).toBe(restarted.id);
    await again.post(`/api/runs/${running.id}/restart`).expect(409);
    await waitFor(again, restarted.id, (r) => r.status === "running");
    await again.post(`/api/runs/${restarted.id}/cancel`).expect(200);

    // The queued one, restarted, runs to the end in the new server.
    const quickAgain = runSchema.parse((await again.post(`/api/runs/${queued.id}/restart`).expect(201)).body);
    expect(quickAgain.restartedFromRunId).toBe(queued.id);
    const done = await waitFor(again, quickAgain.id, (r) => r.status !== "queued" && r.status !== "running");
    expect(done.status).toBe("succeeded");
    await again.get(`/api/runs/${quickAgain.id}/report`).expect(200);
  });
});

// What the API does with a fit job's states, with a job runner driven by hand: the run
// is queued, starts, relays progress, and a failure is stored with its readable reason.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runSchema } from "@tributary/contracts";
import { appDeps, createApp, shutdownApp } from "../app";
import { demoUsers } from "../demo/users";
import type { FitJobInput, FitJobOutput, FitJobProgress } from "../jobs/fit-job";
import { quickFit, saveTinyDataset } from "../testing/fit-fixtures";
import { ManualJobRunner } from "../testing/manual-job-runner";
import { demoTestApp, signedInAgent, type TestApp } from "../testing/test-app";
import type { RunServiceEvent } from "./run-service";

let t: TestApp;
let runner: ManualJobRunner<FitJobInput, FitJobProgress, FitJobOutput>;
let app: ReturnType<typeof createApp>;
let versionId: string;
beforeAll(async () => {
  t = await demoTestApp();
  versionId = await saveTinyDataset(t.db);
  runner = new ManualJobRunner();
  app = createApp({ db: t.db, config: { logLevel: "silent" }, jobRunner: runner });
});
afterAll(async () => {
  await shutdownApp(app);
  await t.close();
});

const progress = (fraction: number): FitJobProgress => ({
  stage: "pooled",
  chains: [{ model: "pooled", chain: 0, iteration: 40, total: 200, phase: "warmup", divergences: 0, attempt: 1, cell: null, cellCount: null, etaSeconds: 3 }],
  fraction,
  elapsedSeconds: 1,
  etaSeconds: 9,
});

async function waitForStatus(agent: Awaited<ReturnType<typeof signedInAgent>>, runId: string, status: string) {
  for (let i = 0; i < 100; i++) {
    const run = runSchema.parse((await agent.get(`/api/runs/${runId}`).expect(200)).body);
    if (run.status === status) return run;
    await new Promise((resolve) => setTimeout(resolve, 20));
  }
  throw new Error(`run never became ${status}`);
}

describe("RunService with a job runner driven by hand", () => {
  it("queues the job with the fit's input, marks the run running, relays progress and stores a failure's reason", async () => {
    const agent = await signedInAgent(app, demoUsers.analyst);
    const settings = await agent.post("/api/model-settings").send({ datasetVersionId: versionId, ...quickFit, holdoutWeeks: 2 }).expect(201);
    const run = runSchema.parse((await agent.post("/api/runs").send({ modelSettingsId: settings.body.id }).expect(201)).body);
    expect(run.status).toBe("queued");
    expect(run.progress).toMatchObject({ stage: "queued", queuePosition: 1 });

    const job = runner.enqueued.find((j) => j.id === run.id)!;
    expect(job.input.options).toMatchObject({ chains: 2, warmup: 100, draws: 100, seed: quickFit.seed, unpooled: true, model: { holdoutWeeks: 2, maxLag: 8 } });
    expect(job.input.data.cells).toHaveLength(3);
    expect(job.input.cellIds).toHaveLength(3);

    const events: RunServiceEvent[] = [];
    appDeps(app).runs.subscribe(run.id, (e) => events.push(e));

    runner.report(run.id, progress(0.25));
    const running = await waitForStatus(agent, run.id, "running");
    expect(running.startedAt).not.toBeNull();
    expect(running.progress).toMatchObject({ stage: "pooled", fraction: 0.25, etaSeconds: 9 });
    expect(events.some((e) => e.type === "progress" && e.progress.fraction === 0.25)).toBe(true);

    runner.finish(run.id, { state: "failed", reason: "The fit failed: the chains ran out of memory" });
    const failed = await waitForStatus(agent, run.id, "failed");
    expect(failed.failureReason).toBe("The fit failed: the chains ran out of memory");
    expect(failed.finishedAt).not.toBeNull();
    expect(events.at(-1)).toMatchObject({ type: "run", finished: true, run: { status: "failed" } });
    await agent.get(`/api/runs/${run.id}/report`).expect(409);
    const restarted = await agent.post(`/api/runs/${run.id}/restart`).expect(201);
    expect(restarted.body.restartedFromRunId).toBe(run.id);
  });
});

// A published fit for tests of the screens that use the current run: the tiny dataset
// (Kestrova × Veltria, Kestrova × Solvera, Plumrise × Veltria; search and social) fitted
// quickly and published by the demo analyst.
import { runSchema, type Run } from "@tributary/contracts";
import { demoUsers } from "../demo/users";
import { quickFit, saveTinyDataset } from "./fit-fixtures";
import { signedInAgent, type TestApp } from "./test-app";

export const TINY_PUBLISH_REASON = "Quick fit for the tests; the convergence checks need more draws than this.";

/** Saves the tiny dataset, fits it and publishes the run; returns the published run. */
export async function publishTinyRun(t: TestApp, fit: Record<string, unknown> = quickFit): Promise<Run> {
  const versionId = await saveTinyDataset(t.db);
  const analyst = await signedInAgent(t.app, demoUsers.analyst);
  const settings = await analyst.post("/api/model-settings").send({ datasetVersionId: versionId, ...fit }).expect(201);
  const started = runSchema.parse((await analyst.post("/api/runs").send({ modelSettingsId: settings.body.id }).expect(201)).body);
  for (let i = 0; i < 1200; i++) {
    const run = runSchema.parse((await analyst.get(`/api/runs/${started.id}`).expect(200)).body);
    if (run.status === "succeeded") {
      const published = await analyst.post(`/api/runs/${run.id}/publish`).send({ reason: TINY_PUBLISH_REASON }).expect(200);
      return runSchema.parse(published.body);
    }
    if (run.status !== "queued" && run.status !== "running") throw new Error(`the test fit ended ${run.status}: ${run.failureReason}`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  throw new Error("the test fit did not finish in time");
}

// Model settings: the shared schema's checks through the API, and the checks against the
// dataset (channels exist, the holdout leaves enough weeks in every cell).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { apiErrorSchema, modelSettingsRecordSchema } from "@tributary/contracts";
import { datasetVersions } from "../db/schema";
import { demoUsers } from "../demo/users";
import { tableCounts } from "../testing/intake-fixtures";
import { demoTestApp, signedInAgent, type TestApp } from "../testing/test-app";

let t: TestApp;
let versionId: string;
beforeAll(async () => {
  t = await demoTestApp();
  versionId = (await t.db.select({ id: datasetVersions.id }).from(datasetVersions))[0]!.id;
});
afterAll(() => t.close());

describe("POST /api/model-settings", () => {
  it("stores the settings with every default filled in, readable by id and in the list", async () => {
    const agent = await signedInAgent(t.app, demoUsers.analyst);
    const created = modelSettingsRecordSchema.parse(
      (await agent.post("/api/model-settings").send({ datasetVersionId: versionId, cacRanges: [{ channel: "social", lo: 20, hi: 400 }], holdoutWeeks: 8 }).expect(201)).body,
    );
    expect(created.settings).toMatchObject({ maxLag: 8, chains: 4, warmup: 1000, draws: 1000, holdoutWeeks: 8, pooling: "crossed", unpooledComparison: true });
    expect(created.datasetVersionNumber).toBe(1);
    expect(created.createdBy?.name).toBe(demoUsers.analyst.name);
    const one = modelSettingsRecordSchema.parse((await agent.get(`/api/model-settings/${created.id}`).expect(200)).body);
    expect(one).toEqual(created);
    const list = modelSettingsRecordSchema.array().parse((await agent.get(`/api/model-settings?dataset=${versionId}`).expect(200)).body);
    expect(list.map((r) => r.id)).toContain(created.id);
  });

  it.each([
    [{ maxLag: 30 }, "maxLag", "at most 16"],
    [{ chains: 0 }, "chains", "at least 1"],
    [{ cacRanges: [{ channel: "tv", lo: 100, hi: 20 }] }, "cacRanges.0.hi", "above the lowest"],
    [{ likelihood: "cauchy" }, "likelihood", ""],
  ])("refuses %j by the shared schema, naming the field", async (change, path, words) => {
    const agent = await signedInAgent(t.app, demoUsers.analyst);
    const before = await tableCounts(t.db);
    const response = await agent.post("/api/model-settings").send({ datasetVersionId: versionId, ...change }).expect(400);
    const issue = apiErrorSchema.parse(response.body).error.issues!.find((i) => i.path === path);
    expect(issue?.message).toContain(words);
    expect(await tableCounts(t.db)).toEqual(before);
  });

  it("refuses a channel the dataset does not have", async () => {
    const agent = await signedInAgent(t.app, demoUsers.analyst);
    const response = await agent.post("/api/model-settings").send({ datasetVersionId: versionId, cacRanges: [{ channel: "billboards", lo: 10, hi: 100 }] }).expect(400);
    expect(response.body.error.issues[0]).toEqual({
      path: "cacRanges.0.channel",
      message: 'Dataset version 1 has no channel "billboards"; its channels are search, social, online_video, tv, audio',
    });
  });

  it("refuses a holdout that leaves a cell fewer than 8 weeks, naming the cells and the most that fits", async () => {
    const agent = await signedInAgent(t.app, demoUsers.analyst);
    const response = await agent.post("/api/model-settings").send({ datasetVersionId: versionId, holdoutWeeks: 20 }).expect(400);
    const message: string = response.body.error.issues[0].message;
    expect(response.body.error.issues[0].path).toBe("holdoutWeeks");
    expect(message).toContain("Kestrova × Lunesse (26 weeks)");
    expect(message).toContain("Sundrift × Lunesse (26 weeks)");
    expect(message).toContain("at most 18 holdout weeks fit this dataset");
    await agent.post("/api/model-settings").send({ datasetVersionId: versionId, holdoutWeeks: 18 }).expect(201);
  });

  it("refuses an unknown dataset version", async () => {
    const agent = await signedInAgent(t.app, demoUsers.analyst);
    const response = await agent.post("/api/model-settings").send({ datasetVersionId: "nope" }).expect(400);
    expect(response.body.error.issues[0]).toMatchObject({ path: "datasetVersionId", message: "No such dataset version" });
  });

  it("is for analysts and admins only", async () => {
    await (await signedInAgent(t.app, demoUsers.admin)).post("/api/model-settings").send({ datasetVersionId: versionId }).expect(201);
    for (const user of [demoUsers.portfolioLead, demoUsers.veltriaManager]) {
      const agent = await signedInAgent(t.app, user);
      await agent.post("/api/model-settings").send({ datasetVersionId: versionId }).expect(403);
      await agent.get("/api/model-settings").expect(403);
    }
    await (await signedInAgent(t.app, demoUsers.analyst)).get("/api/model-settings/nope").expect(404);
  });
});

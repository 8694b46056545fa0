// Lift tests of a dataset version: entered as JSON or uploaded as CSV, checked against
// the data, stored all or nothing; reads are limited to the user's markets.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { apiErrorSchema, liftTestRecordSchema, liftTestsCreatedSchema } from "@tributary/contracts";
import { datasetVersions } from "../db/schema";
import { demoUsers } from "../demo/users";
import { firstWeekFor } from "../demo/demo-design";
import { tableCounts } from "../testing/intake-fixtures";
import { demoTestApp, signedInAgent, type TestApp } from "../testing/test-app";

let t: TestApp;
let versionId: string;
beforeAll(async () => {
  t = await demoTestApp();
  versionId = (await t.db.select({ id: datasetVersions.id }).from(datasetVersions))[0]!.id;
});
afterAll(() => t.close());

const path = () => `/api/datasets/${versionId}/lift-tests`;
const test = (change: Record<string, unknown> = {}) => ({
  brand: "Kestrova",
  market: "Veltria",
  channel: "social",
  firstWeek: "2025-03-03",
  lastWeek: "2025-03-24",
  spend: 60000,
  incrementalOutcome: 700,
  standardError: 150,
  ...change,
});

describe("entering lift tests as JSON", () => {
  it("stores a valid test and lists it", async () => {
    const agent = await signedInAgent(t.app, demoUsers.analyst);
    const created = liftTestsCreatedSchema.parse((await agent.post(path()).send(test({ note: "Spring geo test" })).expect(201)).body);
    expect(created.created).toHaveLength(1);
    expect(created.created[0]).toMatchObject({ brand: "Kestrova", market: "Veltria", channel: "social", incrementalOutcome: 700, note: "Spring geo test" });
    const list = liftTestRecordSchema.array().parse((await agent.get(path()).expect(200)).body);
    expect(list.map((l) => l.id)).toContain(created.created[0]!.id);
  });

  it.each([
    ["a cell that does not exist", test({ market: "Lunesse", brand: "Plumrise" }), "has no cell Plumrise × Lunesse"],
    ["a channel that does not exist", test({ channel: "billboards" }), 'has no channel "billboards"'],
    ["weeks outside the cell's data", test({ brand: "Sundrift", market: "Lunesse", firstWeek: "2024-01-01", lastWeek: "2024-01-29" }), "are not all inside the weeks"],
    ["a standard error of 0", test({ standardError: 0 }), "must be greater than 0"],
    ["a first week after the last", test({ firstWeek: "2025-03-24", lastWeek: "2025-03-03" }), "is after the last week"],
    ["a week that is not a Monday", test({ firstWeek: "2025-03-05" }), "is a Wednesday"],
  ])("refuses %s with a clear message and stores nothing", async (_what, body, words) => {
    const agent = await signedInAgent(t.app, demoUsers.analyst);
    const before = await tableCounts(t.db);
    const response = await agent.post(path()).send(body).expect(400);
    const error = apiErrorSchema.parse(response.body).error;
    expect(error.message).toContain("The lift tests were not saved");
    expect(error.message).toContain(words);
    expect(error.issues!.length).toBeGreaterThan(0);
    expect(await tableCounts(t.db)).toEqual(before);
  });

  it("stores a batch all or nothing, numbering the bad test", async () => {
    const agent = await signedInAgent(t.app, demoUsers.admin);
    const before = await tableCounts(t.db);
    const response = await agent.post(path()).send({ tests: [test({ channel: "search" }), test({ channel: "tv", standardError: -1 })] }).expect(400);
    expect(response.body.error.message).toContain("Lift test 2: The standard error is -1");
    expect(await tableCounts(t.db)).toEqual(before);
    const ok = await agent.post(path()).send({ tests: [test({ channel: "search" }), test({ channel: "tv" })] }).expect(201);
    expect(ok.body.created).toHaveLength(2);
  });

  it("refuses a test already stored for the version", async () => {
    const agent = await signedInAgent(t.app, demoUsers.analyst);
    const body = test({ channel: "audio", firstWeek: "2024-05-06", lastWeek: "2024-05-27" });
    await agent.post(path()).send(body).expect(201);
    const again = await agent.post(path()).send(body).expect(400);
    expect(again.body.error.message).toContain("is already stored for this dataset version");
  });
});

describe("uploading lift tests as CSV", () => {
  const header = "brand,market,channel,first_week,last_week,spend,incremental_outcome,standard_error,note";
  const csv = (...rows: string[]) => Buffer.from([header, ...rows].join("\n") + "\n");

  it("stores every row of a good file", async () => {
    const agent = await signedInAgent(t.app, demoUsers.analyst);
    const lunesseStart = firstWeekFor(26);
    const response = await agent
      .post(path())
      .attach("file", csv("Plumrise,Solvera,online_video,2025-06-02,2025-06-30,40000,900,200,holdout regions", `Sundrift,Lunesse,search,${lunesseStart},${lunesseStart},5000,80,30,`), "lift.csv")
      .expect(201);
    const created = liftTestsCreatedSchema.parse(response.body);
    expect(created.created.map((c) => `${c.brand}/${c.market}/${c.channel}`).sort()).toEqual(["Plumrise/Solvera/online_video", "Sundrift/Lunesse/search"]);
  });

  it("refuses the whole file when a row is bad, naming the row", async () => {
    const agent = await signedInAgent(t.app, demoUsers.analyst);
    const before = await tableCounts(t.db);
    const response = await agent
      .post(path())
      .attach("file", csv("Plumrise,Veltria,social,2025-06-02,2025-06-30,40000,900,200,", "Plumrise,Veltria,social,2025-07-07,2025-07-28,40000,900,abc,"), "lift.csv")
      .expect(400);
    expect(response.body.error.message).toContain("Row 3");
    expect(response.body.error.issues[0].path).toBe("row 3, standard_error");
    expect(await tableCounts(t.db)).toEqual(before);
  });
});

describe("access", () => {
  it("market managers read only their markets' lift tests and cannot add any", async () => {
    const analyst = await signedInAgent(t.app, demoUsers.analyst);
    await analyst.post(path()).send(test({ brand: "Sundrift", market: "Marendi", channel: "tv", firstWeek: "2025-01-06", lastWeek: "2025-01-27" })).expect(201);
    const manager = await signedInAgent(t.app, demoUsers.southManager);
    const list = liftTestRecordSchema.array().parse((await manager.get(path()).expect(200)).body);
    expect(list.length).toBeGreaterThan(0);
    expect(list.map((l) => l.market)).toContain("Marendi");
    for (const l of list) expect(["Marendi", "Lunesse"]).toContain(l.market);
    await manager.post(path()).send(test()).expect(403);
    const all = liftTestRecordSchema.array().parse((await analyst.get(path()).expect(200)).body);
    expect(all.length).toBeGreaterThan(list.length);
  });

  it("deletes a test once; an unknown version or test is 404", async () => {
    const agent = await signedInAgent(t.app, demoUsers.analyst);
    const created = await agent.post(path()).send(test({ channel: "online_video", firstWeek: "2024-09-02", lastWeek: "2024-09-30" })).expect(201);
    const id = created.body.created[0].id;
    await agent.delete(`${path()}/${id}`).expect(204);
    await agent.delete(`${path()}/${id}`).expect(404);
    await agent.get("/api/datasets/no-such-version/lift-tests").expect(404);
    await (await signedInAgent(t.app, demoUsers.veltriaManager)).delete(`${path()}/${id}`).expect(403);
  });
});

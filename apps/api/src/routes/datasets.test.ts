// Dataset versions as each role sees them: market managers get their markets' cells
// only, and neither the report nor the totals, which span every market.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { datasetSeriesSchema, datasetVersionDetailSchema, datasetVersionSchema } from "@tributary/contracts";
import { cells, datasetVersions, markets } from "../db/schema";
import { demoUsers } from "../demo/users";
import { demoTestApp, signedInAgent, type TestApp } from "../testing/test-app";

let t: TestApp;
let versionId: string;
const marketId = new Map<string, string>();
beforeAll(async () => {
  t = await demoTestApp();
  versionId = (await t.db.select({ id: datasetVersions.id }).from(datasetVersions))[0]!.id;
  for (const row of await t.db.select().from(markets)) marketId.set(row.code, row.id);
});
afterAll(() => t.close());

describe("GET /api/datasets/:datasetId", () => {
  it("gives analysts every cell, the report and the summary", async () => {
    const agent = await signedInAgent(t.app, demoUsers.analyst);
    const detail = datasetVersionDetailSchema.parse((await agent.get(`/api/datasets/${versionId}`).expect(200)).body);
    expect(detail.cells).toHaveLength(14);
    expect(detail.report?.ok).toBe(true);
    expect(detail.summary?.cells).toHaveLength(14);
    expect(detail.channels).toEqual(["search", "social", "online_video", "tv", "audio"]);
  });

  it("gives a market manager only their cells, without report or totals", async () => {
    const agent = await signedInAgent(t.app, demoUsers.southManager);
    const detail = datasetVersionDetailSchema.parse((await agent.get(`/api/datasets/${versionId}`).expect(200)).body);
    const own = new Set(["marendi", "lunesse"].map((code) => marketId.get(code)));
    expect(detail.cells.length).toBeGreaterThan(0);
    for (const cell of detail.cells) expect(own.has(cell.marketId)).toBe(true);
    expect(detail.report).toBeNull();
    expect(detail.summary).toBeNull();
    expect(detail.rows).toBe(detail.cells.reduce((n, c) => n + c.weeks, 0));
    expect(JSON.stringify(detail)).not.toMatch(/Veltria|Solvera|Kessland|Tallowmere/);
    const list = datasetVersionSchema.array().parse((await agent.get("/api/datasets").expect(200)).body);
    expect(list[0]!.cellCount).toBe(detail.cells.length);
  });

  it("answers an unknown version with 404", async () => {
    await (await signedInAgent(t.app, demoUsers.analyst)).get("/api/datasets/no-such-version").expect(404);
  });
});

describe("GET /api/datasets/:datasetId/series", () => {
  it("gives a cell's weekly series to those who see its market, and 404 to others", async () => {
    const [veltriaCell] = await t.db.select().from(cells).where(eq(cells.marketId, marketId.get("veltria")!));
    const own = await signedInAgent(t.app, demoUsers.veltriaManager);
    const series = datasetSeriesSchema.parse((await own.get(`/api/datasets/${versionId}/series?cell=${veltriaCell!.id}`).expect(200)).body);
    expect(series.weeks).toHaveLength(series.cell.weeks);
    expect(series.spend).toHaveLength(5);
    expect(series.spend.every((s) => s.length === series.weeks.length)).toBe(true);
    const other = await signedInAgent(t.app, demoUsers.southManager);
    const refused = await other.get(`/api/datasets/${versionId}/series?cell=${veltriaCell!.id}`).expect(404);
    expect(JSON.stringify(refused.body)).not.toContain("Veltria");
    const missing = await own.get(`/api/datasets/${versionId}/series`).expect(400);
    expect(missing.body.error.message).toContain("?cell=");
  });
});

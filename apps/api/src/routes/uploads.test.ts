// Data intake through the API: a good file becomes an immutable dataset version; every
// kind of bad file gets a clear error and writes nothing.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  apiErrorSchema,
  datasetSeriesSchema,
  datasetVersionDetailSchema,
  datasetVersionSchema,
  uploadCreatedSchema,
  uploadValidationSchema,
  type ColumnMapping,
} from "@tributary/contracts";
import { analyseTidyRows, parseCsvText, readTidyCsv } from "@tributary/intake";
import { exampleCsv } from "../datasets/example-csv";
import { saveDatasetVersion } from "../datasets/save-dataset-version";
import { auditLog, brands, datasetRows, datasetVersions } from "../db/schema";
import { demoUsers } from "../demo/users";
import { exampleLines, exampleWith, tableCounts } from "../testing/intake-fixtures";
import { demoTestApp, signedInAgent, type TestApp } from "../testing/test-app";

let t: TestApp;
beforeAll(async () => {
  t = await demoTestApp();
});
afterAll(() => t.close());

const exampleMapping: ColumnMapping = {
  week: "week",
  brand: "brand",
  market: "market",
  outcome: "new_customers",
  channels: [
    { column: "spend_search", channel: "search" },
    { column: "spend_social", channel: "social" },
    { column: "spend_tv", channel: "tv" },
  ],
  controls: [],
  ignored: [],
};

async function analyst() {
  return signedInAgent(t.app, demoUsers.analyst);
}

function upload(agent: Awaited<ReturnType<typeof analyst>>, text: string | Buffer, name = "weekly.csv") {
  return agent.post("/api/uploads").attach("file", Buffer.isBuffer(text) ? text : Buffer.from(text, "utf8"), name);
}

describe("the example file", () => {
  it("downloads as CSV and passes the intake's validation", async () => {
    const agent = await signedInAgent(t.app, demoUsers.veltriaManager);
    const response = await agent.get("/api/datasets/example.csv").expect(200);
    expect(response.headers["content-type"]).toMatch(/^text\/csv/);
    expect(response.headers["content-disposition"]).toContain("attachment");
    const read = readTidyCsv(response.text);
    expect(read.ok).toBe(true);
    expect(read.report.errorCount).toBe(0);
    expect(read.ok && read.data.cells.map((c) => `${c.brand} × ${c.market}`)).toEqual([
      "Larkspine × Ambrel",
      "Larkspine × Vessoria",
      "Tovenhall × Vessoria",
    ]);
  });
});

describe("a good file", () => {
  it("is read, mapped from a guess, validated and saved as a new dataset version in one go", async () => {
    const agent = await analyst();
    const before = await tableCounts(t.db);

    const created = uploadCreatedSchema.parse((await upload(agent, exampleCsv(), "example.csv").expect(201)).body);
    expect(created.header).toEqual(["week", "brand", "market", "new_customers", "spend_search", "spend_social", "spend_tv"]);
    expect(created.rowCount).toBe(248);
    expect(created.previewRows).toHaveLength(20);
    expect(created.guess).toMatchObject({ week: "week", brand: "brand", market: "market", outcome: "new_customers", channels: exampleMapping.channels });
    // An upload is only parsed and kept in memory; the audit log records it.
    const afterUpload = await tableCounts(t.db);
    expect(afterUpload).toEqual({ ...before, auditLog: before.auditLog! + 1 });

    const validation = uploadValidationSchema.parse((await agent.post(`/api/uploads/${created.uploadId}/validate`).send({ mapping: created.guess }).expect(200)).body);
    expect(validation.canSave).toBe(true);
    expect(validation.report.errorCount).toBe(0);
    expect(validation.report.warnings.map((w) => w.code)).toEqual(["channel_no_spend"]);
    expect(validation.newEntities).toEqual({
      brands: ["Larkspine", "Tovenhall"],
      markets: ["Ambrel", "Vessoria"],
      channels: [],
      cells: [
        { brand: "Larkspine", market: "Ambrel" },
        { brand: "Larkspine", market: "Vessoria" },
        { brand: "Tovenhall", market: "Vessoria" },
      ],
    });
    expect(validation.series.map((s) => s.weeks.length)).toEqual([104, 104, 40]);
    expect(validation.series[2]!.spend).toHaveLength(3);

    const saved = datasetVersionDetailSchema.parse(
      (await agent.post(`/api/uploads/${created.uploadId}/save`).send({ mapping: exampleMapping, note: "Example portfolio" }).expect(201)).body,
    );
    expect(saved).toMatchObject({ fileName: "example.csv", note: "Example portfolio", rows: 248, cellCount: 3, latest: true, warningCount: 1 });
    expect(saved.cells.map((c) => [c.brand, c.market, c.weeks])).toEqual([
      ["Larkspine", "Ambrel", 104],
      ["Larkspine", "Vessoria", 104],
      ["Tovenhall", "Vessoria", 40],
    ]);
    const after = await tableCounts(t.db);
    expect(after).toMatchObject({ brands: before.brands! + 2, markets: before.markets! + 2, channels: before.channels! + 0, cells: before.cells! + 3 });
    expect(after.datasetVersions).toBe(before.datasetVersions! + 1);
    expect(after.datasetRows).toBe(before.datasetRows! + 248);
    const actions = (await t.db.select({ action: auditLog.action }).from(auditLog)).map((a) => a.action);
    expect(actions).toContain("data_uploaded");
    expect(actions).toContain("dataset_saved");

    // The upload is gone once saved; the version is listed as the latest, and its series can be read.
    await agent.post(`/api/uploads/${created.uploadId}/validate`).send({ mapping: exampleMapping }).expect(404);
    const list = datasetVersionSchema.array().parse((await agent.get("/api/datasets").expect(200)).body);
    expect(list[0]).toMatchObject({ id: saved.id, latest: true });
    expect(list.filter((v) => v.latest)).toHaveLength(1);
    const cell = saved.cells[2]!;
    const series = datasetSeriesSchema.parse((await agent.get(`/api/datasets/${saved.id}/series?cell=${cell.cellId}`).expect(200)).body);
    expect(series.weeks).toHaveLength(40);
    expect(series.channels).toEqual(["search", "social", "tv"]);
    const source = readTidyCsv(exampleCsv());
    expect(source.ok && Array.from(source.data.cells[2]!.outcome)).toEqual(series.outcome);

    // Immutable: the database refuses to change the saved rows.
    await expect(t.db.update(datasetRows).set({ outcome: 1 }).where(eq(datasetRows.datasetVersionId, saved.id))).rejects.toThrow();
  });

  it("reuses brands, markets and channels that exist, matching names regardless of case", async () => {
    const agent = await analyst();
    const first = await upload(agent, exampleCsv()).expect(201);
    await agent.post(`/api/uploads/${first.body.uploadId}/save`).send({ mapping: exampleMapping }).expect(201);
    const before = await tableCounts(t.db);

    const text = exampleLines((lines) => lines.map((line, i) => (i === 0 ? line : line.replace("Larkspine", "LARKSPINE").replace("Vessoria", " vessoria "))));
    const created = uploadCreatedSchema.parse((await upload(agent, text).expect(201)).body);
    const validation = uploadValidationSchema.parse((await agent.post(`/api/uploads/${created.uploadId}/validate`).send({ mapping: exampleMapping }).expect(200)).body);
    expect(validation.newEntities).toEqual({ brands: [], markets: [], channels: [], cells: [] });
    const saved = datasetVersionDetailSchema.parse((await agent.post(`/api/uploads/${created.uploadId}/save`).send({ mapping: exampleMapping }).expect(201)).body);
    expect(saved.cells.map((c) => `${c.brand} × ${c.market}`)).toEqual(["Larkspine × Ambrel", "Larkspine × Vessoria", "Tovenhall × Vessoria"]);
    const after = await tableCounts(t.db);
    expect([after.brands, after.markets, after.channels, after.cells]).toEqual([before.brands, before.markets, before.channels, before.cells]);
  });
});

describe("control columns", () => {
  it("are guessed from their prefix, saved with every row and given back in a cell's series", async () => {
    const agent = await analyst();
    const text = exampleLines((lines) => lines.map((line, i) => `${line},${i === 0 ? "control_price_index" : (1 + (i % 7) / 100).toFixed(2)}`));
    const created = uploadCreatedSchema.parse((await upload(agent, text).expect(201)).body);
    expect(created.guess.controls).toEqual(["control_price_index"]);
    const { notes: _notes, ...guess } = created.guess;
    const saved = datasetVersionDetailSchema.parse((await agent.post(`/api/uploads/${created.uploadId}/save`).send({ mapping: guess }).expect(201)).body);
    expect(saved.controls).toEqual(["control_price_index"]);
    const series = datasetSeriesSchema.parse((await agent.get(`/api/datasets/${saved.id}/series?cell=${saved.cells[0]!.cellId}`).expect(200)).body);
    expect(series.controls).toEqual(["control_price_index"]);
    const firstLine = exampleCsv().split("\n").findIndex((line) => line.includes(",Larkspine,Ambrel,"));
    expect(saved.cells[0]).toMatchObject({ brand: "Larkspine", market: "Ambrel" });
    expect(series.controlValues[0]!.slice(0, 3)).toEqual([0, 1, 2].map((k) => Number((1 + ((firstLine + k) % 7) / 100).toFixed(2))));
  });
});

describe("bad files", () => {
  /** Uploads, validates and tries to save; returns the three answers and checks nothing was written but the upload's audit entry. */
  async function tryFile(text: string) {
    const agent = await analyst();
    const before = await tableCounts(t.db);
    const created = await upload(agent, text);
    let validation = null;
    let save = null;
    if (created.status === 201) {
      validation = await agent.post(`/api/uploads/${created.body.uploadId}/validate`).send({ mapping: exampleMapping });
      save = await agent.post(`/api/uploads/${created.body.uploadId}/save`).send({ mapping: exampleMapping });
    }
    const after = await tableCounts(t.db);
    expect(after).toEqual({ ...before, auditLog: before.auditLog! + (created.status === 201 ? 1 : 0) });
    return { created, validation, save };
  }

  it("a malformed CSV is refused at upload, naming the row", async () => {
    const { created } = await tryFile(exampleLines((lines) => [...lines.slice(0, 5), '2023-08-14,"Larkspine,Vessoria,1500,1,2,3', ...lines.slice(6)]));
    expect(created.status).toBe(400);
    const error = apiErrorSchema.parse(created.body).error;
    expect(error.message).toMatch(/cannot be read as a CSV file: Row 6 opens a quoted value that is never closed/);
    expect(error.issues?.[0]).toMatchObject({ path: "row 6" });
  });

  it("a file that is not a CSV is refused at upload", async () => {
    const pdf = Buffer.concat([Buffer.from("%PDF-1.7\n"), Buffer.from([0, 1, 2, 3, 255, 254])]);
    const { created } = await tryFile(pdf.toString("latin1"));
    expect(created.status).toBe(400);
    expect(created.body.error.message).toContain("not a CSV file");

    const agent = await analyst();
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]);
    const response = await upload(agent, png, "chart.png").expect(400);
    expect(response.body.error.message).toContain("not a CSV file");
  });

  it("wrong types are reported with row and column, and block saving", async () => {
    const { created, validation, save } = await tryFile(exampleWith(7, "spend_social", "n/a"));
    expect(created.status).toBe(201);
    const report = uploadValidationSchema.parse(validation!.body).report;
    expect(report.ok).toBe(false);
    expect(report.errors[0]).toMatchObject({ code: "not_a_number", row: 7, column: "spend_social" });
    expect(report.errors[0]!.message).toContain('Row 7: "spend_social" holds "n/a", which is not a number');
    expect(save!.status).toBe(400);
    expect(save!.body.error.message).toContain("cannot be saved until its errors are fixed");
    expect(save!.body.error.issues[0]).toMatchObject({ path: "row 7, spend_social" });
  });

  it("negative spend is an error naming row and column", async () => {
    const { validation, save } = await tryFile(exampleWith(12, "spend_tv", "-250"));
    expect(validation!.body.report.errors[0]).toMatchObject({ code: "negative_spend", row: 12, column: "spend_tv" });
    expect(save!.status).toBe(400);
  });

  it("a duplicate row is an error naming both rows", async () => {
    const { validation, save } = await tryFile(exampleLines((lines) => [...lines, lines[3]!]));
    const error = validation!.body.report.errors[0];
    expect(error).toMatchObject({ code: "duplicate_row", row: 250 });
    expect(error.message).toContain("first given in row 4");
    expect(save!.status).toBe(400);
  });

  it("a week that is not a Monday is an error", async () => {
    const { validation, save } = await tryFile(exampleWith(9, "week", "2023-08-30"));
    expect(validation!.body.report.errors.map((e: { code: string }) => e.code)).toContain("date_not_monday");
    expect(save!.status).toBe(400);
  });

  it("a file over the size limit gets 413 with the limit in words", async () => {
    const small = await demoTestApp({ uploadMaxBytes: 4096 }, t.db);
    try {
      const agent = await signedInAgent(small.app, demoUsers.analyst);
      const before = await tableCounts(t.db);
      const response = await agent.post("/api/uploads").attach("file", Buffer.from(exampleCsv()), "big.csv").expect(413);
      expect(apiErrorSchema.parse(response.body).error).toMatchObject({ code: "too_large" });
      expect(response.body.error.message).toContain("larger than 4 KB, the largest upload accepted");
      expect(await tableCounts(t.db)).toEqual(before);
    } finally {
      await small.close();
    }
  });

  it("an upload without a file, or in another field, gets a clear message", async () => {
    const agent = await analyst();
    expect((await agent.post("/api/uploads").send({ file: "week,brand" }).expect(400)).body.error.message).toContain('Choose a CSV file to upload');
    expect((await agent.post("/api/uploads").attach("data", Buffer.from(exampleCsv()), "x.csv").expect(400)).body.error.message).toContain('form field "file"');
  });

  it("a mapping that names unknown columns is reported, not saved", async () => {
    const agent = await analyst();
    const created = await upload(agent, exampleCsv()).expect(201);
    const bad = { ...exampleMapping, outcome: "orders" };
    const validation = uploadValidationSchema.parse((await agent.post(`/api/uploads/${created.body.uploadId}/validate`).send({ mapping: bad }).expect(200)).body);
    expect(validation.canSave).toBe(false);
    expect(validation.report.errors[0]).toMatchObject({ code: "column_unknown", column: "orders" });
    const incomplete = await agent.post(`/api/uploads/${created.body.uploadId}/validate`).send({ mapping: { week: "week" } }).expect(200);
    expect(incomplete.body.report.errors.map((e: { code: string }) => e.code)).toContain("mapping_incomplete");
    await agent.post(`/api/uploads/${created.body.uploadId}/save`).send({ mapping: bad }).expect(400);
  });

  it("two spellings that would become one brand code are refused before saving", async () => {
    const text = exampleLines((lines) => lines.map((line) => line.replace("Tovenhall", "Sun-Drift").replace(",Larkspine,Ambrel", ",Sun Drift,Ambrel")));
    const { validation, save } = await tryFile(text);
    expect(validation!.body.canSave).toBe(false);
    expect(validation!.body.report.errors[0].message).toContain('would both be stored as brand "sun_drift"');
    expect(save!.status).toBe(400);
  });
});

describe("who may upload", () => {
  it.each([demoUsers.veltriaManager, demoUsers.portfolioLead])("a $role is refused with 403 and nothing is kept", async (user) => {
    const agent = await signedInAgent(t.app, user);
    const before = await tableCounts(t.db);
    const response = await agent.post("/api/uploads").attach("file", Buffer.from(exampleCsv()), "x.csv").expect(403);
    expect(response.body.error.code).toBe("forbidden");
    expect(await tableCounts(t.db)).toEqual(before);
  });

  it("an admin may upload; another user's upload looks like one that does not exist", async () => {
    const admin = await signedInAgent(t.app, demoUsers.admin);
    const created = await upload(admin, exampleCsv()).expect(201);
    const other = await analyst();
    const response = await other.post(`/api/uploads/${created.body.uploadId}/validate`).send({ mapping: exampleMapping }).expect(404);
    expect(response.body.error.message).toContain("upload the file again");
  });
});

describe("saving", () => {
  it("saves nothing when any step inside the transaction fails", async () => {
    const user = (await t.db.query.users.findFirst({ where: (u, { eq: equals }) => equals(u.email, demoUsers.analyst.email) }))!;
    const text = exampleLines((lines) => lines.map((line) => line.replace("Tovenhall", "Quennick")));
    const csv = parseCsvText(text);
    if (!csv.ok) throw new Error("fixture should parse");
    const analysis = analyseTidyRows(csv.header, csv.rows, exampleMapping, { rowNumbers: csv.rowNumbers });
    const before = await tableCounts(t.db);
    await expect(
      saveDatasetVersion(t.db, { fileName: "x.csv", note: null, userId: user.id, analysis }, {
        afterEntities: async (tx) => {
          // The new brand exists inside the transaction …
          expect((await tx.select().from(brands).where(eq(brands.name, "Quennick"))).length).toBe(1);
          throw new Error("disk full");
        },
      }),
    ).rejects.toThrow("disk full");
    // … and nowhere after it.
    expect(await t.db.select().from(brands).where(eq(brands.name, "Quennick"))).toEqual([]);
    expect(await tableCounts(t.db)).toEqual(before);
  });

  it("numbers versions one after another", async () => {
    const numbers = (await t.db.select({ n: datasetVersions.number }).from(datasetVersions)).map((r) => r.n).sort((a, b) => a - b);
    expect(numbers).toEqual(numbers.map((_, i) => i + 1));
  });
});

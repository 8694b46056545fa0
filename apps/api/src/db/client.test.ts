import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, createDatabase, type Database } from "./client";
import * as schema from "./schema";

const expectedTables = [
  "audit_log", "brands", "cells", "channels", "dataset_rows", "dataset_versions", "flags", "invitations",
  "lift_tests", "markets", "model_settings", "outbox", "plans", "run_draws", "run_results", "runs",
  "sessions", "user_markets", "users", "workspace_settings",
];

async function tableNames(db: Database): Promise<string[]> {
  const result = await db.execute<{ table_name: string }>(
    sql`select table_name from information_schema.tables where table_schema = 'public' order by table_name`,
  );
  return result.rows.map((row) => row.table_name);
}

let db: Database;
beforeAll(async () => {
  db = await createDatabase();
});
afterAll(() => closeDatabase(db));

describe("createDatabase", () => {
  const dirs: string[] = [];
  afterAll(() => dirs.forEach((dir) => rmSync(dir, { recursive: true, force: true })));

  it("applies every migration to an empty in-memory database", async () => {
    expect(await tableNames(db)).toEqual(expectedTables);
    const [journal] = (await db.execute<{ n: number }>(sql`select count(*)::int as n from drizzle.__drizzle_migrations`)).rows;
    expect(journal!.n).toBe(3);
  });

  it("keeps data in a directory and re-opens it without re-applying migrations", async () => {
    const dir = mkdtempSync(join(tmpdir(), "tributary-db-"));
    dirs.push(dir);
    const first = await createDatabase({ dataDir: join(dir, "data") });
    await first.insert(schema.markets).values({ code: "veltria", name: "Veltria" });
    await closeDatabase(first);

    const second = await createDatabase({ dataDir: join(dir, "data") });
    const rows = await second.select().from(schema.markets);
    expect(rows.map((row) => row.code)).toEqual(["veltria"]);
    await closeDatabase(second);
  });

  it("refuses to change a dataset version or its rows once written", async () => {
    const [brand] = await db.insert(schema.brands).values({ code: "b1", name: "B1" }).returning();
    const [market] = await db.insert(schema.markets).values({ code: "m1", name: "M1" }).returning();
    const [cell] = await db.insert(schema.cells).values({ brandId: brand!.id, marketId: market!.id }).returning();
    const [version] = await db
      .insert(schema.datasetVersions)
      .values({ number: 1, fileName: "f.csv", outcomeColumn: "y", channelCodes: ["search"], controlNames: [], columnMapping: {}, validationReport: {} })
      .returning();
    await db.insert(schema.datasetRows).values({ datasetVersionId: version!.id, cellId: cell!.id, week: "2025-01-06", outcome: 10, spend: [5], controls: [] });

    await expect(db.update(schema.datasetVersions).set({ fileName: "other.csv" }).where(eq(schema.datasetVersions.id, version!.id))).rejects.toThrow();
    await expect(db.update(schema.datasetRows).set({ outcome: 11 })).rejects.toThrow();
    const [row] = await db.select().from(schema.datasetRows);
    expect(row).toMatchObject({ outcome: 10, spend: [5], week: "2025-01-06" });
  });

  it("rejects a second row for the same version, cell and week, and values outside the allowed lists", async () => {
    const [brand] = await db.insert(schema.brands).values({ code: "b2", name: "B2" }).returning();
    const [market] = await db.insert(schema.markets).values({ code: "m2", name: "M2" }).returning();
    const [cell] = await db.insert(schema.cells).values({ brandId: brand!.id, marketId: market!.id }).returning();
    const [version] = await db
      .insert(schema.datasetVersions)
      .values({ number: 2, fileName: "f.csv", outcomeColumn: "y", channelCodes: [], controlNames: [], columnMapping: {}, validationReport: {} })
      .returning();
    const row = { datasetVersionId: version!.id, cellId: cell!.id, week: "2025-01-06", outcome: 1, spend: [], controls: [] };
    await db.insert(schema.datasetRows).values(row);
    await expect(db.insert(schema.datasetRows).values(row)).rejects.toThrow();
    await expect(
      db.execute(sql`insert into users (id, email, name, role) values ('u1', 'x@y.example', 'X', 'superuser')`),
    ).rejects.toThrow();
    await expect(db.insert(schema.workspaceSettings).values({ id: 2, companyName: "C", currency: "EUR" })).rejects.toThrow();
  });
});

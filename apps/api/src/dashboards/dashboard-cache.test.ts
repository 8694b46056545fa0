// The dashboards' cache: the database snapshot is reused until something is written, and
// a run's numbers are computed once however many requests ask at the same time.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, type Database } from "../db/client";
import { brands } from "../db/schema";
import { fittedDatabase } from "../testing/fitted-snapshot";
import { DashboardCache } from "./dashboard-cache";

let db: Database;
let runId: string;
beforeAll(async () => {
  const fitted = await fittedDatabase();
  db = fitted.db;
  runId = fitted.publishedRunId;
}, 600_000);
afterAll(() => closeDatabase(db));

describe("DashboardCache", () => {
  it("rereads names, values and flags only after a write", async () => {
    const cache = new DashboardCache(db);
    const first = await cache.snapshot();
    expect(await cache.snapshot()).toBe(first);
    expect(first.published.current).toBe(runId);
    await db.update(brands).set({ customerValue: 150 }).where(eq(brands.code, "kestrova"));
    const second = await cache.snapshot();
    expect(second).not.toBe(first);
    expect(second.entities.brands.find((b) => b.code === "kestrova")!.customerValue).toBe(150);
    expect(await cache.snapshot()).toBe(second);
  });

  it("computes a run's numbers once for requests that arrive together, and a failed computation again", async () => {
    const cache = new DashboardCache(db);
    const [a, b] = await Promise.all([cache.estimates(runId), cache.estimates(runId)]);
    expect(a).toBe(b);
    expect(a.cells).toHaveLength(3);
    expect(await cache.sheet(runId, 0, 1)).toBe(await cache.sheet(runId, 0, 1));
    await expect(cache.estimates("no-such-run")).rejects.toThrow(/No such run/);
    await expect(cache.estimates("no-such-run")).rejects.toThrow(/No such run/);
  });
});

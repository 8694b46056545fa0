// The data generation moves on every statement that may write (and on every transaction),
// never on a plain read, and tells a read that overlapped a write apart from one that did not;
// a read kept by readThroughGeneration is reused only until the next write.
import { eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { closeDatabase, createDatabase, type Database } from "./client";
import { DataGeneration, dataGenerationOf, isReadOnlyStatement, readThroughGeneration } from "./data-generation";
import { markets } from "./schema";

let db: Database;
let generation: DataGeneration;
beforeAll(async () => {
  db = await createDatabase();
  generation = dataGenerationOf(db)!;
});
afterAll(() => closeDatabase(db));

describe("isReadOnlyStatement", () => {
  it("takes a single SELECT for a read", () => {
    expect(isReadOnlyStatement('select "id" from "markets" order by "markets"."id" asc')).toBe(true);
    expect(isReadOnlyStatement("  (SELECT 1)")).toBe(true);
    expect(isReadOnlyStatement('select "updated_at", "deleted_by" from "x"')).toBe(true);
  });

  it("takes everything else for a write", () => {
    for (const text of [
      'insert into "markets" ("id") values ($1)',
      'update "users" set "role" = $1',
      'delete from "sessions" where "id" = $1',
      "with gone as (delete from sessions returning id) select * from gone",
      "select * from sessions for update",
      "select * into copy_of_sessions from sessions",
      "select nextval('s')",
      "select set_config('a', 'b', false)",
      "select 1; delete from sessions",
      "BEGIN",
      "truncate sessions",
      "create table t (a int)",
    ]) {
      expect(isReadOnlyStatement(text), text).toBe(false);
    }
  });
});

describe("the generation of a database", () => {
  it("exists for a database of createDatabase, not for a transaction", async () => {
    expect(generation).toBeInstanceOf(DataGeneration);
    await db.transaction(async (tx) => {
      expect(dataGenerationOf(tx)).toBeUndefined();
    });
  });

  it("stays put on reads and moves on every write, through Drizzle and through the client", async () => {
    const start = generation.current;
    await db.select().from(markets);
    await db.execute(sql`select count(*) from markets`);
    await db.$client.query("select 1");
    expect(generation.current).toBe(start);

    await db.insert(markets).values({ code: "brellin", name: "Brellin" });
    const afterInsert = generation.current;
    expect(afterInsert).toBeGreaterThan(start);
    await db.update(markets).set({ name: "Brellin North" }).where(eq(markets.code, "brellin"));
    expect(generation.current).toBeGreaterThan(afterInsert);
    const afterUpdate = generation.current;
    await db.$client.exec("select 1");
    expect(generation.current).toBeGreaterThan(afterUpdate);
    const afterExec = generation.current;
    await db.$client.sql`delete from markets where code = ${"brellin"}`;
    expect(generation.current).toBeGreaterThan(afterExec);
  });

  it("moves when a transaction ends, committed or rolled back, and when a write fails", async () => {
    const start = generation.current;
    await db.transaction(async (tx) => {
      await tx.select().from(markets);
    });
    const afterCommit = generation.current;
    expect(afterCommit).toBeGreaterThan(start);
    await expect(
      db.transaction(async (tx) => {
        await tx.insert(markets).values({ code: "corvane", name: "Corvane" });
        throw new Error("changed my mind");
      }),
    ).rejects.toThrow("changed my mind");
    const afterRollback = generation.current;
    expect(afterRollback).toBeGreaterThan(afterCommit);
    expect(await db.select().from(markets).where(eq(markets.code, "corvane"))).toHaveLength(0);
    await expect(db.insert(markets).values({ code: null as unknown as string, name: "No code" })).rejects.toThrow();
    expect(generation.current).toBeGreaterThan(afterRollback);
  });

  it("says a read is valid at its generation only if no write started or ended while it ran", async () => {
    const quiet = await generation.readAt(() => db.select().from(markets));
    expect(quiet.generation).toBe(generation.current);

    const overlapped = await generation.readAt(async () => {
      const rows = await db.select().from(markets);
      await db.insert(markets).values({ code: "dunmere", name: "Dunmere" });
      return rows;
    });
    expect(overlapped.generation).toBeNull();
    await db.delete(markets).where(eq(markets.code, "dunmere"));
  });
});

describe("readThroughGeneration", () => {
  const codes = () => db.select({ code: markets.code }).from(markets).orderBy(markets.code);

  it("reuses a read until the next write, and keys reads apart", async () => {
    const first = await readThroughGeneration(db, "test: market codes", codes);
    const spy = vi.spyOn(db.$client, "query");
    try {
      expect(await readThroughGeneration(db, "test: market codes", codes)).toBe(first);
      expect(spy).not.toHaveBeenCalled();
      const other = await readThroughGeneration(db, "test: market codes, again", codes);
      expect(other).not.toBe(first);
      expect(other).toEqual(first);
      expect(spy).toHaveBeenCalledTimes(1);
    } finally {
      spy.mockRestore();
    }
    await db.insert(markets).values({ code: "esterhold", name: "Esterhold" });
    try {
      const after = await readThroughGeneration(db, "test: market codes", codes);
      expect(after.map((m) => m.code)).toContain("esterhold");
    } finally {
      await db.delete(markets).where(eq(markets.code, "esterhold"));
    }
    expect((await readThroughGeneration(db, "test: market codes", codes)).map((m) => m.code)).not.toContain("esterhold");
  });

  it("reads afresh inside a transaction, which sees its own writes", async () => {
    await readThroughGeneration(db, "test: market codes", codes);
    await db.transaction(async (tx) => {
      await tx.insert(markets).values({ code: "fennick", name: "Fennick" });
      const inside = await readThroughGeneration(tx, "test: market codes", () => tx.select({ code: markets.code }).from(markets).orderBy(markets.code));
      expect(inside.map((m) => m.code)).toContain("fennick");
      tx.rollback();
    }).catch(() => undefined);
    expect((await readThroughGeneration(db, "test: market codes", codes)).map((m) => m.code)).not.toContain("fennick");
  });

  it("does not keep a read that a write overlapped, and hands out frozen values", async () => {
    let reads = 0;
    const overlapped = async () => {
      reads++;
      const rows = await codes();
      await db.update(markets).set({ name: "Veltria" }).where(eq(markets.code, "no-such-market"));
      return rows;
    };
    await readThroughGeneration(db, "test: overlapped", overlapped);
    await readThroughGeneration(db, "test: overlapped", overlapped);
    expect(reads).toBe(2);
    const kept = await readThroughGeneration(db, "test: market codes", codes);
    expect(Object.isFrozen(kept)).toBe(true);
    expect(() => (kept as { code: string }[]).push({ code: "x" })).toThrow(TypeError);
  });
});

// The cache of checked sessions (session-cache.ts) saves the database round trips of a
// repeated request, and never answers with what a write or the clock has made stale: a
// signed-out session, a disabled user, a changed role, changed markets, a new market, an
// expired session (also when nothing at all was written), and lucia's renewal still happens.
import { and, eq } from "drizzle-orm";
import type { Express } from "express";
import request from "supertest";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { marketSchema, type CurrentUser } from "@tributary/contracts";
import { defaultConfig } from "../config";
import type { Database } from "../db/client";
import { dataGenerationOf } from "../db/data-generation";
import { markets, sessions, userMarkets, users } from "../db/schema";
import { demoUsers, type DemoUser } from "../demo/users";
import { demoTestApp, sessionSetCookie, signInCookie, type TestApp } from "../testing/test-app";

const DAY_MS = 86_400_000;
let t: TestApp;
let app: Express;
let db: Database;
beforeAll(async () => {
  t = await demoTestApp();
  app = t.app;
  db = t.db;
});
afterAll(() => t.close());
afterEach(() => {
  vi.useRealTimers();
});

const me = (cookie: string) => request(app).get("/api/auth/me").set("Cookie", cookie);
const marketCodes = async (cookie: string) => {
  const response = await request(app).get("/api/markets").set("Cookie", cookie).expect(200);
  return marketSchema.array().parse(response.body).map((m) => m.code).sort();
};
const userIdOf = async (user: DemoUser) => (await db.select({ id: users.id }).from(users).where(eq(users.email, user.email)))[0]!.id;
const marketIdOf = async (code: string) => (await db.select({ id: markets.id }).from(markets).where(eq(markets.code, code)))[0]!.id;
const sessionExpiry = async (sessionId: string) => (await db.select().from(sessions).where(eq(sessions.id, sessionId)))[0]?.expiresAt ?? null;

/** Signs in and asks twice, so the second answer came from the cache. */
async function cachedSession(user: DemoUser) {
  const signedIn = await signInCookie(app, user);
  await me(signedIn.cookie).expect(200);
  await me(signedIn.cookie).expect(200);
  return signedIn;
}

/** The statements sent to the database while `run` runs. */
async function statementsDuring(run: () => Promise<unknown>): Promise<string[]> {
  const seen: string[] = [];
  const spy = vi.spyOn(db.$client, "query");
  try {
    await run();
    for (const call of spy.mock.calls) seen.push(String(call[0]));
  } finally {
    spy.mockRestore();
  }
  return seen;
}

describe("the session cache", () => {
  it("answers a repeated request without reading the session, the user or the markets", async () => {
    const { cookie } = await cachedSession(demoUsers.veltriaManager);
    const statements = await statementsDuring(() => me(cookie).expect(200));
    expect(statements.filter((s) => /"sessions"|"users"|"user_markets"/.test(s))).toEqual([]);
    const all = await cachedSession(demoUsers.analyst);
    await marketCodes(all.cookie);
    const listing = await statementsDuring(() => marketCodes(all.cookie));
    // Only the route's own query of the markets it lists: the scope check reads nothing.
    expect(listing.filter((s) => /"sessions"|"users"|"user_markets"|"markets"/.test(s))).toHaveLength(1);
  });

  it("never serves a signed-out session, nor any session after signing out everywhere", async () => {
    const one = await cachedSession(demoUsers.analyst);
    const other = await cachedSession(demoUsers.analyst);
    await request(app).post("/api/auth/sign-out").set("Cookie", one.cookie).set("X-CSRF-Token", one.csrfToken).expect(204);
    await me(one.cookie).expect(401);
    await me(other.cookie).expect(200);
    await request(app).post("/api/auth/sign-out-all").set("Cookie", other.cookie).set("X-CSRF-Token", other.csrfToken).expect(204);
    await me(other.cookie).expect(401);
  });

  it("never serves a session deleted, or a user disabled, straight in the database", async () => {
    const deleted = await cachedSession(demoUsers.portfolioLead);
    await db.delete(sessions).where(eq(sessions.id, deleted.sessionId));
    await me(deleted.cookie).expect(401);

    const { cookie, sessionId } = await cachedSession(demoUsers.southManager);
    const userId = await userIdOf(demoUsers.southManager);
    await db.update(users).set({ disabled: true }).where(eq(users.id, userId));
    try {
      await me(cookie).expect(401);
      // The disabled user's sessions are ended, as without the cache.
      expect(await sessionExpiry(sessionId)).toBeNull();
    } finally {
      await db.update(users).set({ disabled: false }).where(eq(users.id, userId));
    }
  });

  it("sees a role changed in the database on the next request, in what it allows too", async () => {
    const { cookie } = await cachedSession(demoUsers.analyst);
    await request(app).get("/api/people").set("Cookie", cookie).expect(403);
    const userId = await userIdOf(demoUsers.analyst);
    await db.update(users).set({ role: "admin" }).where(eq(users.id, userId));
    try {
      expect(((await me(cookie).expect(200)).body as CurrentUser).role).toBe("admin");
      await request(app).get("/api/people").set("Cookie", cookie).expect(200);
    } finally {
      await db.update(users).set({ role: "analyst" }).where(eq(users.id, userId));
    }
    await request(app).get("/api/people").set("Cookie", cookie).expect(403);
  });

  it("sees a market manager's markets changed in the database, and a new market for everyone else", async () => {
    const manager = await cachedSession(demoUsers.veltriaManager);
    const userId = await userIdOf(demoUsers.veltriaManager);
    const veltria = await marketIdOf("veltria");
    const marendi = await marketIdOf("marendi");
    expect(await marketCodes(manager.cookie)).toEqual(["veltria"]);
    await request(app).get(`/api/markets/${veltria}`).set("Cookie", manager.cookie).expect(200);
    await request(app).get(`/api/markets/${marendi}`).set("Cookie", manager.cookie).expect(403);

    await db.transaction(async (tx) => {
      await tx.delete(userMarkets).where(and(eq(userMarkets.userId, userId), eq(userMarkets.marketId, veltria)));
      await tx.insert(userMarkets).values({ userId, marketId: marendi });
    });
    try {
      expect(((await me(manager.cookie).expect(200)).body as CurrentUser).marketIds).toEqual([marendi]);
      expect(await marketCodes(manager.cookie)).toEqual(["marendi"]);
      await request(app).get(`/api/markets/${veltria}`).set("Cookie", manager.cookie).expect(403);
      await request(app).get(`/api/markets/${marendi}`).set("Cookie", manager.cookie).expect(200);
    } finally {
      await db.transaction(async (tx) => {
        await tx.delete(userMarkets).where(eq(userMarkets.userId, userId));
        await tx.insert(userMarkets).values({ userId, marketId: veltria });
      });
    }
    expect(await marketCodes(manager.cookie)).toEqual(["veltria"]);

    const lead = await cachedSession(demoUsers.portfolioLead);
    const before = await marketCodes(lead.cookie);
    await db.insert(markets).values({ code: "ostrava-vale", name: "Ostrava Vale" });
    try {
      expect(await marketCodes(lead.cookie)).toEqual([...before, "ostrava-vale"].sort());
    } finally {
      await db.delete(markets).where(eq(markets.code, "ostrava-vale"));
    }
    expect(await marketCodes(lead.cookie)).toEqual(before);
  });

  it("sees markets changed through People & access", async () => {
    const manager = await cachedSession(demoUsers.southManager);
    const admin = await signInCookie(app, demoUsers.admin);
    const userId = await userIdOf(demoUsers.southManager);
    const veltria = await marketIdOf("veltria");
    const original = ((await me(manager.cookie).expect(200)).body as CurrentUser).marketIds;
    const change = (marketIds: readonly string[]) =>
      request(app).patch(`/api/people/${userId}`).set("Cookie", admin.cookie).set("X-CSRF-Token", admin.csrfToken).send({ marketIds }).expect(200);
    await change([veltria]);
    try {
      const after = await me(manager.cookie);
      // Whether or not the change ends the session, the old markets are never served.
      if (after.status === 200) expect((after.body as CurrentUser).marketIds).toEqual([veltria]);
      else expect(after.status).toBe(401);
    } finally {
      await change(original);
    }
  });

  it("refuses a session whose expiry was moved into the past in the database", async () => {
    const { cookie, sessionId } = await cachedSession(demoUsers.analyst);
    await db.update(sessions).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(sessions.id, sessionId));
    await me(cookie).expect(401);
    expect(await sessionExpiry(sessionId)).toBeNull();
  });

  it("refuses an expired session when nothing at all was written since it was cached", async () => {
    const { cookie, sessionId } = await cachedSession(demoUsers.analyst);
    const expiresAt = (await sessionExpiry(sessionId))!.getTime();
    const generation = dataGenerationOf(db)!;
    const quiet = generation.current;
    // Only the clock is faked, so the server and the database run as usual.
    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(expiresAt + 1000);
    expect(generation.current).toBe(quiet);
    await me(cookie).expect(401);
    vi.useRealTimers();
    await me(cookie).expect(401);
  });

  it("still lets lucia renew a session in the second half of its life, with nothing written before", async () => {
    const { cookie, sessionId } = await cachedSession(demoUsers.analyst);
    const expiresAt = (await sessionExpiry(sessionId))!.getTime();
    const generation = dataGenerationOf(db)!;
    const quiet = generation.current;
    vi.useFakeTimers({ toFake: ["Date"] });
    // Just past half of the session's life, nothing written in between: the cache must not answer.
    const now = expiresAt - (defaultConfig.sessionIdleDays * DAY_MS) / 2 + 60_000;
    vi.setSystemTime(now);
    expect(generation.current).toBe(quiet);
    const response = await me(cookie).expect(200);
    expect(sessionSetCookie(response)).toBeDefined();
    expect((await sessionExpiry(sessionId))!.getTime()).toBeGreaterThan(expiresAt);
    // A moment before the half, the cached answer still stands (no new cookie).
    vi.useRealTimers();
    const again = await me(cookie).expect(200);
    expect(sessionSetCookie(again)).toBeUndefined();
  });
});

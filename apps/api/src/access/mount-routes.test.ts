// The authorization layer on its own, with a small route table of every market rule.
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { cells, markets as marketTable } from "../db/schema";
import { demoUsers } from "../demo/users";
import { routeTable } from "../routes";
import { createApp } from "../app";
import { demoTestApp, signedInAgent, type TestApp } from "../testing/test-app";
import { inScope } from "./market-scope";
import { mountRoutes } from "./mount-routes";
import { anyone, defineRoute, markets, signedIn, type AppDeps, type Route } from "./route-table";

const probeRoutes: Route[] = [
  ...routeTable,
  defineRoute({ method: "get", path: "/api/probe/public", access: anyone, handler: ({ user }) => ({ user: user?.email ?? null }) }),
  defineRoute({
    method: "get",
    path: "/api/probe/analysts-only",
    access: signedIn(markets.unscoped, ["analyst", "admin"]),
    handler: () => ({ ok: true }),
  }),
  defineRoute({
    method: "get",
    path: "/api/probe/by-query",
    access: signedIn(markets.fromQuery("market")),
    handler: ({ scope }) => ({ marketIds: [...scope.marketIds].sort() }),
  }),
  defineRoute({
    method: "get",
    path: "/api/probe/cells/:cellId",
    access: signedIn(
      markets.resolvedBy(async (req, db) => {
        const [cell] = await db.select({ marketId: cells.marketId }).from(cells).where(eq(cells.id, String(req.params.cellId)));
        return cell ? [cell.marketId] : null;
      }),
    ),
    handler: ({ req }) => ({ cellId: req.params.cellId }),
  }),
  defineRoute({
    method: "get",
    path: "/api/probe/filtered-cells",
    access: signedIn(markets.filtered),
    handler: ({ db, scope }) => db.select({ marketId: cells.marketId }).from(cells).where(inScope(cells.marketId, scope)),
  }),
  defineRoute({
    method: "post",
    path: "/api/probe/created",
    access: signedIn(markets.unscoped),
    handler: ({ res }) => {
      res.status(201);
      return { created: true };
    },
  }),
];

let t: TestApp;
let app: ReturnType<typeof createApp>;
const marketId = new Map<string, string>();
beforeAll(async () => {
  t = await demoTestApp();
  app = createApp({ db: t.db, config: { logLevel: "silent" }, routes: probeRoutes });
  for (const row of await t.db.select().from(marketTable)) marketId.set(row.code, row.id);
});
afterAll(() => t.close());

describe("role checks", () => {
  it("let listed roles through and refuse others with 403", async () => {
    await (await signedInAgent(app, demoUsers.analyst)).get("/api/probe/analysts-only").expect(200);
    const refused = await (await signedInAgent(app, demoUsers.portfolioLead)).get("/api/probe/analysts-only").expect(403);
    expect(refused.body.error).toMatchObject({ code: "forbidden", message: "Portfolio leads cannot do this" });
  });

  it("leave public routes open, with the user when there is one", async () => {
    expect((await request(app).get("/api/probe/public").expect(200)).body).toEqual({ user: null });
    const agent = await signedInAgent(app, demoUsers.admin);
    expect((await agent.get("/api/probe/public").expect(200)).body).toEqual({ user: demoUsers.admin.email });
  });

  it("let a handler choose its status", async () => {
    await (await signedInAgent(app, demoUsers.admin)).post("/api/probe/created").expect(201, { created: true });
  });
});

describe("market rules", () => {
  it("query: absent means all of the user's markets; naming another market is refused", async () => {
    const agent = await signedInAgent(app, demoUsers.southManager);
    const own = demoUsers.southManager.markets.map((code) => marketId.get(code)!).sort();
    expect((await agent.get("/api/probe/by-query").expect(200)).body.marketIds).toEqual(own);
    expect((await agent.get(`/api/probe/by-query?market=${marketId.get("lunesse")}`).expect(200)).body.marketIds).toEqual([marketId.get("lunesse")]);
    await agent.get(`/api/probe/by-query?market=${marketId.get("lunesse")},${marketId.get("veltria")}`).expect(403);
    await agent.get(`/api/probe/by-query?market=${marketId.get("lunesse")}&market=${marketId.get("solvera")}`).expect(403);
  });

  it("resolve: a resource in another market looks like one that does not exist", async () => {
    const [veltriaCell] = await t.db.select().from(cells).where(eq(cells.marketId, marketId.get("veltria")!));
    const manager = await signedInAgent(app, demoUsers.southManager);
    const outOfScope = await manager.get(`/api/probe/cells/${veltriaCell!.id}`).expect(404);
    const missing = await manager.get("/api/probe/cells/no-such-cell").expect(404);
    expect(outOfScope.body.error.message).toBe(missing.body.error.message);
    await (await signedInAgent(app, demoUsers.veltriaManager)).get(`/api/probe/cells/${veltriaCell!.id}`).expect(200);
  });

  it("filter: the scope helper restricts a query to the user's markets", async () => {
    const manager = await signedInAgent(app, demoUsers.southManager);
    const rows: { marketId: string }[] = (await manager.get("/api/probe/filtered-cells").expect(200)).body;
    const own = new Set(demoUsers.southManager.markets.map((code) => marketId.get(code)!));
    expect(rows.length).toBeGreaterThan(0);
    expect(rows.every((row) => own.has(row.marketId))).toBe(true);
    const lead = await signedInAgent(app, demoUsers.portfolioLead);
    expect((await lead.get("/api/probe/filtered-cells").expect(200)).body).toHaveLength(14);
  });
});

describe("mounting", () => {
  const deps = {} as AppDeps;
  it("refuses a :marketId path that does not declare the param rule", () => {
    const route = defineRoute({ method: "get", path: "/api/markets/:marketId/plans", access: signedIn(markets.filtered), handler: () => [] });
    expect(() => mountRoutes([route], deps)).toThrow(/markets.fromParam\("marketId"\)/);
  });

  it("refuses a param rule whose name is not in the path", () => {
    const route = defineRoute({ method: "get", path: "/api/things", access: signedIn(markets.fromParam("marketId")), handler: () => [] });
    expect(() => mountRoutes([route], deps)).toThrow(/lacks/);
  });

  it("refuses the same route twice", () => {
    const route = defineRoute({ method: "get", path: "/api/x", access: anyone, handler: () => [] });
    expect(() => mountRoutes([route, route], deps)).toThrow(/twice/);
  });
});

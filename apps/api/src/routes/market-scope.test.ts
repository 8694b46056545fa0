// A market manager never receives another market's data: not in lists, not by id.
import { eq } from "drizzle-orm";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { apiErrorSchema, brandSchema, marketDetailSchema, marketSchema, portfolioSchema } from "@tributary/contracts";
import { markets } from "../db/schema";
import { demoMarkets } from "../demo/demo-design";
import { demoUsers } from "../demo/users";
import { demoTestApp, signedInAgent, type TestApp } from "../testing/test-app";
import { routeTable } from ".";

let t: TestApp;
const marketIdByCode = new Map<string, string>();
beforeAll(async () => {
  t = await demoTestApp();
  for (const row of await t.db.select().from(markets)) marketIdByCode.set(row.code, row.id);
});
afterAll(() => t.close());

const idsOf = (codes: readonly string[]) => codes.map((code) => marketIdByCode.get(code)!).sort();

describe("market managers", () => {
  it("see only their markets, and only those markets' cells, in the portfolio", async () => {
    const agent = await signedInAgent(t.app, demoUsers.southManager);
    const portfolio = portfolioSchema.parse((await agent.get("/api/portfolio").expect(200)).body);
    const own = idsOf(demoUsers.southManager.markets);
    expect(portfolio.markets.map((m) => m.id).sort()).toEqual(own);
    expect(portfolio.cells.length).toBeGreaterThan(0);
    for (const cell of portfolio.cells) expect(own).toContain(cell.marketId);
    // Only brands present in their markets.
    const brandIds = new Set(portfolio.cells.map((cell) => cell.brandId));
    expect(portfolio.brands.map((b) => b.id).sort()).toEqual([...brandIds].sort());
  });

  it("see only their markets in /api/markets and only their brands in /api/brands", async () => {
    const agent = await signedInAgent(t.app, demoUsers.veltriaManager);
    const list = marketSchema.array().parse((await agent.get("/api/markets").expect(200)).body);
    expect(list.map((m) => m.code)).toEqual(["veltria"]);
    const brands = brandSchema.array().parse((await agent.get("/api/brands").expect(200)).body);
    expect(brands.length).toBe(3); // every demo brand sells in Veltria
  });

  it("get their own market by id", async () => {
    const agent = await signedInAgent(t.app, demoUsers.veltriaManager);
    const detail = marketDetailSchema.parse((await agent.get(`/api/markets/${marketIdByCode.get("veltria")}`).expect(200)).body);
    expect(detail.market.code).toBe("veltria");
    expect(detail.cells.every((cell) => cell.marketId === detail.market.id)).toBe(true);
  });

  it("are refused another market by id, with no data in the answer", async () => {
    const agent = await signedInAgent(t.app, demoUsers.veltriaManager);
    for (const code of ["solvera", "marendi", "lunesse"]) {
      const response = await agent.get(`/api/markets/${marketIdByCode.get(code)}`).expect(403);
      const body = apiErrorSchema.parse(response.body);
      expect(body.error.code).toBe("forbidden");
      expect(JSON.stringify(response.body)).not.toMatch(new RegExp(code, "i"));
      expect(Object.keys(response.body)).toEqual(["error"]);
    }
  });

  it("are refused a market that does not exist the same way (its existence is not revealed)", async () => {
    const agent = await signedInAgent(t.app, demoUsers.veltriaManager);
    await agent.get("/api/markets/no-such-market").expect(403);
  });
});

describe("roles that see every market", () => {
  it.each([demoUsers.admin, demoUsers.portfolioLead, demoUsers.analyst])("$role sees the whole portfolio", async (user) => {
    const agent = await signedInAgent(t.app, user);
    const portfolio = portfolioSchema.parse((await agent.get("/api/portfolio").expect(200)).body);
    expect(portfolio.markets).toHaveLength(demoMarkets.length);
    expect(portfolio.cells).toHaveLength(14);
    const detail = await agent.get(`/api/markets/${marketIdByCode.get("solvera")}`).expect(200);
    expect(detail.body.market.code).toBe("solvera");
  });

  it("get 404 for a market that does not exist", async () => {
    const agent = await signedInAgent(t.app, demoUsers.analyst);
    const response = await agent.get("/api/markets/no-such-market").expect(404);
    expect(apiErrorSchema.parse(response.body).error.code).toBe("not_found");
  });
});

describe("the route table", () => {
  it("answers every signed-in route with 401 and no data when nobody is signed in", async () => {
    const signedInRoutes = routeTable.filter((route) => route.access.kind === "signed_in");
    expect(signedInRoutes.length).toBeGreaterThan(0);
    for (const route of signedInRoutes) {
      const path = route.path.replace(/:(\w+)/g, (_m, name: string) => (name === "marketId" ? marketIdByCode.get("veltria")! : "x"));
      const response = await request(t.app)[route.method](path).send({});
      expect(response.status, `${route.method} ${route.path}`).toBe(401);
      expect(Object.keys(response.body)).toEqual(["error"]);
    }
  });

  it("lists a market added later only for the roles that see every market", async () => {
    await t.db.insert(markets).values({ code: "quorreth", name: "Quorreth" });
    const manager = await signedInAgent(t.app, demoUsers.veltriaManager);
    const lead = await signedInAgent(t.app, demoUsers.portfolioLead);
    expect((await manager.get("/api/markets").expect(200)).body.map((m: { code: string }) => m.code)).not.toContain("quorreth");
    expect((await lead.get("/api/markets").expect(200)).body.map((m: { code: string }) => m.code)).toContain("quorreth");
    await t.db.delete(markets).where(eq(markets.code, "quorreth"));
  });
});

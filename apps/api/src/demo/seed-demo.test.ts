import { readFileSync } from "node:fs";
import { asc, count, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, type Database } from "../db/client";
import { snapshotDatabase } from "../testing/database-snapshot";
import * as schema from "../db/schema";
import { demoChannelTruths, demoDesign, demoRealDifference } from "./demo-design";
import { demoTruthDocument } from "./demo-truth";
import { demoRows, seedDemo } from "./seed-demo";
import { simulateDemo } from "./simulate-demo";
import { demoUserList } from "./users";

/** The seeded content with generated ids replaced by codes, so two seeds can be compared. */
async function contentOf(db: Database) {
  const brands = await db.select().from(schema.brands).orderBy(asc(schema.brands.code));
  const markets = await db.select().from(schema.markets).orderBy(asc(schema.markets.code));
  const code = new Map([...brands, ...markets].map((row) => [row.id, row.code]));
  const cells = await db.select().from(schema.cells);
  const cellName = new Map(cells.map((cell) => [cell.id, `${code.get(cell.brandId)}|${code.get(cell.marketId)}`]));
  const rows = await db.select().from(schema.datasetRows);
  const users = await db.select().from(schema.users).orderBy(asc(schema.users.email));
  const scopes = await db.select().from(schema.userMarkets);
  const userEmail = new Map(users.map((user) => [user.id, user.email]));
  return {
    settings: (await db.select().from(schema.workspaceSettings)).map(({ updatedAt: _u, ...rest }) => rest),
    brands: brands.map(({ id: _i, createdAt: _c, ...rest }) => rest),
    markets: markets.map(({ id: _i, createdAt: _c, ...rest }) => rest),
    channels: (await db.select().from(schema.channels).orderBy(asc(schema.channels.position))).map(({ id: _i, createdAt: _c, ...rest }) => rest),
    cells: [...cellName.values()].sort(),
    versions: (await db.select().from(schema.datasetVersions)).map(({ id: _i, createdAt: _c, createdBy: _b, ...rest }) => rest),
    rows: rows
      .map((row) => ({ cell: cellName.get(row.cellId), week: row.week, outcome: row.outcome, spend: row.spend }))
      .sort((a, b) => `${a.cell}${a.week}`.localeCompare(`${b.cell}${b.week}`)),
    users: users.map((user) => ({ email: user.email, role: user.role, name: user.name })),
    scopes: scopes.map((s) => `${userEmail.get(s.userId)}→${code.get(s.marketId)}`).sort(),
  };
}

let first: Database;
let second: Database;
beforeAll(async () => {
  [first, second] = await Promise.all([snapshotDatabase("migrated"), snapshotDatabase("migrated")]);
  expect(await seedDemo(first)).toEqual({ seeded: true });
  expect(await seedDemo(second)).toEqual({ seeded: true });
});
afterAll(async () => {
  await closeDatabase(first);
  await closeDatabase(second);
});

describe("seedDemo", () => {
  it("is deterministic: two empty databases get the same content", async () => {
    const [a, b] = await Promise.all([contentOf(first), contentOf(second)]);
    expect(a.rows.length).toBeGreaterThan(1000);
    expect(b).toEqual(a);
  });

  it("writes nothing into a database that already holds data", async () => {
    const before = await contentOf(first);
    expect(await seedDemo(first)).toEqual({ seeded: false, reason: "the database already holds data" });
    expect(await contentOf(first)).toEqual(before);
  });

  it("creates the portfolio described: 3 brands, 6 markets, 5 channels, 14 of 18 cells", async () => {
    const content = await contentOf(first);
    expect(content.settings).toEqual([{ id: 1, companyName: "Quillfern Household Group", currency: "EUR" }]);
    expect(content.brands).toHaveLength(3);
    expect(content.brands.every((brand) => brand.customerValue !== null && brand.customerValue > 0)).toBe(true);
    expect(content.markets).toHaveLength(6);
    expect(content.channels.map((c) => c.code)).toEqual(["search", "social", "online_video", "tv", "audio"]);
    expect(content.cells).toHaveLength(14);
    expect(content.versions).toHaveLength(1);
    expect(content.versions[0]).toMatchObject({ number: 1, channelCodes: ["search", "social", "online_video", "tv", "audio"], controlNames: [] });
  });

  it("has up to 156 weeks per cell, consecutive Mondays, and a recent launch with only 26 weeks", async () => {
    const { rows } = await contentOf(first);
    const weeksByCell = new Map<string, string[]>();
    for (const row of rows) weeksByCell.set(row.cell!, [...(weeksByCell.get(row.cell!) ?? []), row.week]);
    const lengths = [...weeksByCell.values()].map((weeks) => weeks.length);
    expect(Math.max(...lengths)).toBe(156);
    expect(weeksByCell.get("kestrova|lunesse")).toHaveLength(26);
    expect(weeksByCell.get("sundrift|lunesse")).toHaveLength(26);
    for (const weeks of weeksByCell.values()) {
      weeks.forEach((week, k) => {
        expect(new Date(`${week}T00:00:00Z`).getUTCDay()).toBe(1);
        if (k > 0) expect(Date.parse(week) - Date.parse(weeks[k - 1]!)).toBe(7 * 86_400_000);
      });
      expect(weeks[weeks.length - 1]).toBe("2025-09-29");
    }
    expect(rows.every((row) => row.outcome > 0 && Number.isInteger(row.outcome))).toBe(true);
    expect(rows.every((row) => row.spend.length === 5 && row.spend.every((s) => s >= 0))).toBe(true);
  });

  it("creates one demo user per role, the market managers scoped to one and two markets", async () => {
    const content = await contentOf(first);
    expect(content.users.map((u) => u.role).sort()).toEqual(["admin", "analyst", "market_manager", "market_manager", "portfolio_lead"]);
    expect(content.scopes).toEqual([
      "south.manager@quillfern.example→lunesse",
      "south.manager@quillfern.example→marendi",
      "veltria.manager@quillfern.example→veltria",
    ]);
    const [hashes] = await first.select({ n: count() }).from(schema.users).where(eq(schema.users.disabled, false));
    expect(hashes!.n).toBe(demoUserList.length);
  });
});

describe("the demo's truth", () => {
  it("matches the committed demo-truth.json", () => {
    const committed: unknown = JSON.parse(readFileSync(new URL("./demo-truth.json", import.meta.url), "utf8"));
    expect(JSON.parse(JSON.stringify(demoTruthDocument()))).toEqual(committed);
  });

  it("holds the seeded rows: the data in the database is what simulateDemo generates", async () => {
    const { rows } = await contentOf(first);
    const expected = demoRows(simulateDemo()).map((row) => ({ cell: `${row.brand}|${row.market}`, week: row.week, outcome: row.outcome, spend: row.spend }));
    expected.sort((a, b) => `${a.cell}${a.week}`.localeCompare(`${b.cell}${b.week}`));
    expect(rows).toEqual(expected);
  });

  it("has one cell whose channel effect really differs from its group, and only that one", () => {
    const { truth } = simulateDemo();
    const c = demoDesign.channels.indexOf(demoRealDifference.channel);
    const channel = demoChannelTruths[c]!;
    // Deviation of each cell's log β from the channel's portfolio mean μ, in units of the
    // largest pooled scale: a pooled cell stays within a few units, the chosen one does not.
    const scale = Math.hypot(channel.tauBrand, channel.tauMarket, channel.tauCell);
    const deviations = truth.cells.map((cell) => ({
      key: `${cell.brand}|${cell.market}`,
      z: (Math.log(cell.beta[c]!) - channel.mu) / scale,
    }));
    const chosen = deviations.find((d) => d.key === `${demoRealDifference.brand}|${demoRealDifference.market}`)!;
    expect(chosen.z).toBeGreaterThan(3);
    for (const other of deviations.filter((d) => d !== chosen)) expect(Math.abs(other.z)).toBeLessThan(3);
  });

  it("differs from the plain pooled draw only in the chosen cell and channel", () => {
    const { truth } = simulateDemo();
    const g = demoDesign.cells.findIndex((cell) => cell.brand === demoRealDifference.brand && cell.market === demoRealDifference.market);
    const c = demoDesign.channels.indexOf(demoRealDifference.channel);
    const cac = truth.cells[g]!.cac0[c]!;
    const peers = truth.cells.filter((_, k) => k !== g).map((cell) => cell.cac0[c]!);
    // Its low-spend cost per customer is well below every peer's.
    expect(cac).toBeLessThan(Math.min(...peers) * 0.6);
  });
});

// Writes the demo workspace into an EMPTY database, all in one transaction: settings,
// brands, markets, channels, cells, demo users, and dataset version 1 with its rows.
import { count } from "drizzle-orm";
import { absoluteWeekOf, mondayOfAbsoluteWeek, type SimulatedPortfolio } from "@tributary/stats";
import { hashPassword } from "../auth/password";
import type { Database } from "../db/client";
import {
  auditLog,
  brands,
  cells,
  channels,
  datasetRows,
  datasetVersions,
  markets,
  userMarkets,
  users,
  workspaceSettings,
} from "../db/schema";
import { demoBrands, demoChannels, demoMarkets, demoWorkspace } from "./demo-design";
import { simulateDemo } from "./simulate-demo";
import { demoUserList } from "./users";

export const demoFileName = "quillfern-weekly.csv";
export const demoOutcomeColumn = "new_customers";

export interface SeedResult {
  readonly seeded: boolean;
  /** Why nothing was written, when `seeded` is false. */
  readonly reason?: string;
}

export interface DemoRow {
  readonly brand: string;
  readonly market: string;
  readonly week: string;
  /** Whole new customers. */
  readonly outcome: number;
  readonly spend: number[];
}

/** The simulated series as dataset rows; outcomes rounded to whole customers. */
export function demoRows(portfolio: SimulatedPortfolio): DemoRow[] {
  const rows: DemoRow[] = [];
  for (const cell of portfolio.data.cells) {
    const first = absoluteWeekOf(cell.firstWeek);
    for (let t = 0; t < cell.outcome.length; t++) {
      rows.push({
        brand: cell.brand,
        market: cell.market,
        week: mondayOfAbsoluteWeek(first + t),
        outcome: Math.round(cell.outcome[t]!),
        spend: cell.spend.map((series) => series[t]!),
      });
    }
  }
  return rows;
}

/** The column mapping the demo CSV would be uploaded with (columns `spend_<channel>`). */
function demoColumnMapping() {
  return {
    week: "week",
    brand: "brand",
    market: "market",
    outcome: demoOutcomeColumn,
    channels: demoChannels.map((channel) => ({ column: `spend_${channel.code}`, channel: channel.code })),
    controls: [],
    ignored: [],
  };
}

/** A clean validation report with the dataset's summary (the demo data has no issues by construction). */
function demoValidationReport(rows: readonly DemoRow[]) {
  const byCell = new Map<string, { brand: string; market: string; weeks: string[] }>();
  for (const row of rows) {
    const key = `${row.brand}|${row.market}`;
    const entry = byCell.get(key) ?? { brand: row.brand, market: row.market, weeks: [] };
    entry.weeks.push(row.week);
    byCell.set(key, entry);
  }
  const weeks = rows.map((row) => row.week).sort();
  return {
    ok: true,
    errors: [],
    warnings: [],
    errorCount: 0,
    warningCount: 0,
    counts: [],
    summary: {
      rows: rows.length,
      cells: [...byCell.values()].map((cell) => ({
        brand: cell.brand,
        market: cell.market,
        firstWeek: cell.weeks[0] ?? null,
        lastWeek: cell.weeks[cell.weeks.length - 1] ?? null,
        weeks: cell.weeks.length,
        rows: cell.weeks.length,
      })),
      brands: demoBrands.map((brand) => brand.code),
      markets: demoMarkets.map((market) => market.code),
      channels: demoChannels.map((channel) => channel.code),
      controls: [],
      firstWeek: weeks[0] ?? null,
      lastWeek: weeks[weeks.length - 1] ?? null,
      totals: {
        outcome: rows.reduce((sum, row) => sum + row.outcome, 0),
        spend: demoChannels.map((channel, c) => ({
          channel: channel.code,
          total: rows.reduce((sum, row) => sum + (row.spend[c] ?? 0), 0),
        })),
      },
    },
  };
}

const ROW_BATCH = 500;

export async function seedDemo(db: Database): Promise<SeedResult> {
  const portfolio = simulateDemo();
  const rows = demoRows(portfolio);
  const passwordHashes = await Promise.all(demoUserList.map((user) => hashPassword(user.password)));

  return db.transaction(async (tx) => {
    const occupied = await Promise.all(
      [users, workspaceSettings, brands, markets, channels, datasetVersions].map(async (table) => {
        const [row] = await tx.select({ n: count() }).from(table);
        return (row?.n ?? 0) > 0;
      }),
    );
    if (occupied.some(Boolean)) return { seeded: false, reason: "the database already holds data" };

    await tx.insert(workspaceSettings).values({ id: 1, ...demoWorkspace });
    const brandRows = await tx.insert(brands).values([...demoBrands]).returning();
    const marketRows = await tx.insert(markets).values([...demoMarkets]).returning();
    await tx.insert(channels).values(demoChannels.map((channel, position) => ({ ...channel, position })));
    const brandId = new Map(brandRows.map((row) => [row.code, row.id]));
    const marketId = new Map(marketRows.map((row) => [row.code, row.id]));
    const idOf = (map: Map<string, string>, code: string) => {
      const id = map.get(code);
      if (!id) throw new Error(`demo seed: unknown code ${code}`);
      return id;
    };

    const cellRows = await tx
      .insert(cells)
      .values(portfolio.data.cells.map((cell) => ({ brandId: idOf(brandId, cell.brand), marketId: idOf(marketId, cell.market) })))
      .returning();
    const cellId = new Map(
      portfolio.data.cells.map((cell, g) => [`${cell.brand}|${cell.market}`, cellRows[g]!.id] as const),
    );

    const userRows = await tx
      .insert(users)
      .values(demoUserList.map((user, k) => ({ email: user.email, name: user.name, role: user.role, passwordHash: passwordHashes[k]! })))
      .returning();
    const scopes = demoUserList.flatMap((user, k) =>
      user.markets.map((market) => ({ userId: userRows[k]!.id, marketId: idOf(marketId, market) })),
    );
    if (scopes.length > 0) await tx.insert(userMarkets).values(scopes);
    const analyst = userRows.find((user) => user.role === "analyst");

    const [version] = await tx
      .insert(datasetVersions)
      .values({
        number: 1,
        fileName: demoFileName,
        outcomeColumn: demoOutcomeColumn,
        channelCodes: demoChannels.map((channel) => channel.code),
        controlNames: [],
        columnMapping: demoColumnMapping(),
        validationReport: demoValidationReport(rows),
        createdBy: analyst?.id ?? null,
      })
      .returning();
    for (let start = 0; start < rows.length; start += ROW_BATCH) {
      await tx.insert(datasetRows).values(
        rows.slice(start, start + ROW_BATCH).map((row) => ({
          datasetVersionId: version!.id,
          cellId: idOf(cellId, `${row.brand}|${row.market}`),
          week: row.week,
          outcome: row.outcome,
          spend: row.spend,
          controls: [],
        })),
      );
    }
    await tx.insert(auditLog).values({
      action: "demo_seeded",
      target: `dataset_version:${version!.id}`,
      details: { rows: rows.length, cells: cellRows.length, users: userRows.length },
    });
    return { seeded: true };
  });
}

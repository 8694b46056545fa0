// Market scope: which markets a user may see, and the filter every scoped query uses.
import { asc, inArray, sql, type SQL } from "drizzle-orm";
import type { AnyPgColumn } from "drizzle-orm/pg-core";
import type { CurrentUser } from "@tributary/contracts";
import type { Queryable } from "../db/client";
import { readThroughGeneration } from "../db/data-generation";
import { markets } from "../db/schema";
import type { MarketScope } from "./route-table";

/** Market managers see their assigned markets; every other role sees all markets. */
export function seesAllMarkets(user: CurrentUser): boolean {
  return user.role !== "market_manager";
}

async function readAllMarketIds(db: Queryable): Promise<readonly string[]> {
  const rows = await db.select({ id: markets.id }).from(markets).orderBy(asc(markets.id));
  return rows.map((row) => row.id);
}

/**
 * The markets a user may see. On the database itself (not inside a transaction, which may
 * hold its own writes) the list of all markets is reused until the next write anywhere.
 */
export async function allowedMarkets(db: Queryable, user: CurrentUser): Promise<MarketScope> {
  if (!seesAllMarkets(user)) return { marketIds: [...user.marketIds], allMarkets: false };
  const marketIds = await readThroughGeneration(db, "market-scope: every market", () => readAllMarketIds(db));
  return { marketIds: [...marketIds], allMarkets: true };
}

/** The WHERE condition restricting a market-id column to the request's scope (false when empty). */
export function inScope(column: AnyPgColumn, scope: MarketScope): SQL {
  return scope.marketIds.length > 0 ? inArray(column, [...scope.marketIds]) : sql`false`;
}

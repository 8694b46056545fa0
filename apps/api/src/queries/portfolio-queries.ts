// Reads shared by the portfolio and market routes. Every market-bound read takes the
// request's MarketScope and filters with `inScope`.
import { and, asc, count, desc, eq, inArray, max, min, sql } from "drizzle-orm";
import type { Brand, Cell, Channel, Market } from "@tributary/contracts";
import { inScope } from "../access/market-scope";
import type { MarketScope } from "../access/route-table";
import type { Queryable } from "../db/client";
import { brands, cells, channels, datasetRows, datasetVersions, markets } from "../db/schema";

export async function latestDatasetVersionId(db: Queryable): Promise<string | null> {
  const [row] = await db
    .select({ id: datasetVersions.id })
    .from(datasetVersions)
    .orderBy(desc(datasetVersions.number))
    .limit(1);
  return row?.id ?? null;
}

export async function scopedMarkets(db: Queryable, scope: MarketScope): Promise<Market[]> {
  return db
    .select({ id: markets.id, code: markets.code, name: markets.name })
    .from(markets)
    .where(inScope(markets.id, scope))
    .orderBy(asc(markets.name));
}

/** Cells in scope with how many weeks the dataset version holds for each (0 when none). */
export async function scopedCells(db: Queryable, scope: MarketScope, datasetVersionId: string | null): Promise<Cell[]> {
  const weeksJoin = and(
    eq(datasetRows.cellId, cells.id),
    datasetVersionId ? eq(datasetRows.datasetVersionId, datasetVersionId) : sql`false`,
  );
  const rows = await db
    .select({
      id: cells.id,
      brandId: cells.brandId,
      marketId: cells.marketId,
      weeks: count(datasetRows.week),
      firstWeek: min(datasetRows.week),
      lastWeek: max(datasetRows.week),
      brandName: brands.name,
      marketName: markets.name,
    })
    .from(cells)
    .innerJoin(brands, eq(brands.id, cells.brandId))
    .innerJoin(markets, eq(markets.id, cells.marketId))
    .leftJoin(datasetRows, weeksJoin)
    .where(inScope(cells.marketId, scope))
    .groupBy(cells.id, brands.name, markets.name)
    .orderBy(asc(brands.name), asc(markets.name));
  return rows.map(({ brandName: _b, marketName: _m, ...cell }) => cell);
}

/** All brands for roles that see every market; otherwise only brands with a cell in scope. */
export async function scopedBrands(db: Queryable, scope: MarketScope): Promise<Brand[]> {
  const columns = { id: brands.id, code: brands.code, name: brands.name, customerValue: brands.customerValue };
  if (scope.allMarkets) return db.select(columns).from(brands).orderBy(asc(brands.name));
  const inScopeBrandIds = db
    .selectDistinct({ id: cells.brandId })
    .from(cells)
    .where(inScope(cells.marketId, scope));
  return db.select(columns).from(brands).where(inArray(brands.id, inScopeBrandIds)).orderBy(asc(brands.name));
}

export async function allChannels(db: Queryable): Promise<Channel[]> {
  return db
    .select({ id: channels.id, code: channels.code, name: channels.name })
    .from(channels)
    .orderBy(asc(channels.position));
}

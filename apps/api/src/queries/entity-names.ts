// Brand and market display names by id. Codes are the keys in data files and links;
// names are what people read, and an admin may change them (Portfolio settings), so
// stored results that carry the names of their time are relabelled from here on reading.
import type { Queryable } from "../db/client";
import { readThroughGeneration } from "../db/data-generation";
import { brands, markets } from "../db/schema";

export interface EntityNames {
  readonly brands: ReadonlyMap<string, string>;
  readonly markets: ReadonlyMap<string, string>;
}

/** The current names of every brand and market, by id (reused until the next write). */
export async function entityNames(db: Queryable): Promise<EntityNames> {
  const [brandRows, marketRows] = await readThroughGeneration(db, "entity names: brands and markets", () =>
    Promise.all([db.select({ id: brands.id, name: brands.name }).from(brands), db.select({ id: markets.id, name: markets.name }).from(markets)]),
  );
  return { brands: new Map(brandRows.map((row) => [row.id, row.name] as const)), markets: new Map(marketRows.map((row) => [row.id, row.name] as const)) };
}

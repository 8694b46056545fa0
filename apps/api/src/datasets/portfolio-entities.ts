// Which brands, markets, channels and cells of the workspace an upload's names refer to,
// and which would be new. A name matches an existing entity by its name (case and
// spacing aside) or by its code; new entities get a code made from the name.
import { asc, max } from "drizzle-orm";
import { sanitiseChannelName, type IntakeIssue, type NewEntities } from "@tributary/contracts";
import { nameKey } from "@tributary/intake";
import type { Queryable } from "../db/client";
import { brands, cells, channels, markets } from "../db/schema";

interface NamedEntity {
  readonly id: string;
  readonly code: string;
  readonly name: string;
}

/** What one name of the data resolves to: an existing entity, or a new one to create. */
export interface PlannedEntity {
  readonly id: string | null;
  readonly code: string;
  readonly name: string;
}

export interface EntityPlan {
  /** By brand name as the data spell it. */
  readonly brands: ReadonlyMap<string, PlannedEntity>;
  readonly markets: ReadonlyMap<string, PlannedEntity>;
  /** By channel code. */
  readonly channels: ReadonlyMap<string, PlannedEntity>;
  /** Existing cell ids by "brandCode|marketCode". */
  readonly cellIds: ReadonlyMap<string, string>;
  readonly newEntities: NewEntities;
  /** Names that would collapse into one entity: errors that block saving. */
  readonly problems: readonly IntakeIssue[];
}

/** A code for a new entity: the name in [a-z0-9_]. */
export function codeFromName(name: string): string {
  return sanitiseChannelName(name);
}

/** "online_video" → "Online video". */
export function channelNameFromCode(code: string): string {
  const words = code.replace(/_+/g, " ").trim();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

export const cellKey = (brandCode: string, marketCode: string) => `${brandCode}|${marketCode}`;

function planNames(
  names: readonly string[],
  existing: readonly NamedEntity[],
  what: "brand" | "market",
  column: string | null,
  problems: IntakeIssue[],
): Map<string, PlannedEntity> {
  const byName = new Map(existing.map((e) => [nameKey(e.name), e] as const));
  const byCode = new Map(existing.map((e) => [e.code, e] as const));
  const planned = new Map<string, PlannedEntity>();
  const claimedBy = new Map<string, string>();
  const newCodes = new Set<string>();
  for (const name of names) {
    const found = byName.get(nameKey(name)) ?? byCode.get(codeFromName(name)) ?? byCode.get(name.trim().toLowerCase());
    let entity: PlannedEntity;
    if (found) entity = { id: found.id, code: found.code, name: found.name };
    else {
      const code = codeFromName(name);
      if (code === "") {
        problems.push({
          severity: "error",
          code: "name_invalid",
          row: null,
          column,
          message: `The ${what} "${name}" has no letters a–z or digits to make a code from; spell it with Latin letters or digits.`,
        });
        continue;
      }
      entity = { id: null, code, name };
      newCodes.add(code);
    }
    const other = claimedBy.get(entity.code);
    if (other !== undefined) {
      problems.push({
        severity: "error",
        code: "name_variants",
        row: null,
        column,
        message: `The ${what}s "${other}" and "${name}" would both be stored as ${what} "${entity.code}"; write them the same way if they are one ${what}, or rename one.`,
      });
      continue;
    }
    claimedBy.set(entity.code, name);
    planned.set(name, entity);
  }
  return planned;
}

/**
 * Resolves the brand, market and channel names of an upload against the workspace.
 * `column` names are only used in messages.
 */
export async function planEntities(
  db: Queryable,
  input: {
    readonly cells: readonly { readonly brand: string; readonly market: string }[];
    readonly channels: readonly string[];
    readonly brandColumn: string | null;
    readonly marketColumn: string | null;
  },
): Promise<EntityPlan> {
  const [brandRows, marketRows, channelRows, cellRows] = await Promise.all([
    db.select({ id: brands.id, code: brands.code, name: brands.name }).from(brands).orderBy(asc(brands.code)),
    db.select({ id: markets.id, code: markets.code, name: markets.name }).from(markets).orderBy(asc(markets.code)),
    db.select({ id: channels.id, code: channels.code, name: channels.name }).from(channels).orderBy(asc(channels.position)),
    db.select({ id: cells.id, brandId: cells.brandId, marketId: cells.marketId }).from(cells),
  ]);
  const problems: IntakeIssue[] = [];
  const brandNames = [...new Set(input.cells.map((c) => c.brand))];
  const marketNames = [...new Set(input.cells.map((c) => c.market))];
  const brandPlan = planNames(brandNames, brandRows, "brand", input.brandColumn, problems);
  const marketPlan = planNames(marketNames, marketRows, "market", input.marketColumn, problems);

  const channelByCode = new Map(channelRows.map((c) => [c.code, c] as const));
  const channelPlan = new Map<string, PlannedEntity>();
  for (const code of input.channels) {
    const found = channelByCode.get(code);
    channelPlan.set(code, found ? { id: found.id, code, name: found.name } : { id: null, code, name: channelNameFromCode(code) });
  }

  const brandCodeById = new Map(brandRows.map((b) => [b.id, b.code] as const));
  const marketCodeById = new Map(marketRows.map((m) => [m.id, m.code] as const));
  const cellIds = new Map<string, string>();
  for (const cell of cellRows) cellIds.set(cellKey(brandCodeById.get(cell.brandId) ?? "", marketCodeById.get(cell.marketId) ?? ""), cell.id);

  const newCells: { brand: string; market: string }[] = [];
  for (const cell of input.cells) {
    const brand = brandPlan.get(cell.brand);
    const market = marketPlan.get(cell.market);
    if (brand && market && !cellIds.has(cellKey(brand.code, market.code))) newCells.push({ brand: brand.name, market: market.name });
  }
  const fresh = (plan: Map<string, PlannedEntity>) => [...plan.values()].filter((e) => e.id === null).map((e) => e.name);
  return {
    brands: brandPlan,
    markets: marketPlan,
    channels: channelPlan,
    cellIds,
    problems,
    newEntities: { brands: fresh(brandPlan), markets: fresh(marketPlan), channels: fresh(channelPlan), cells: newCells },
  };
}

export interface CreatedEntities {
  /** Channel ids in the order asked for. */
  readonly channelIds: readonly string[];
  /** The cell id of a brand and market as the data name them. */
  cellId(brandName: string, marketName: string): string;
}

/**
 * Creates the planned new brands, markets, channels and the data's cells that do not
 * exist yet (call inside the saving transaction), and returns every id.
 */
export async function createPlannedEntities(
  tx: Queryable,
  plan: EntityPlan,
  dataCells: readonly { readonly brand: string; readonly market: string }[],
  channelOrder: readonly string[],
): Promise<CreatedEntities> {
  const ensure = async (table: typeof brands | typeof markets, planned: ReadonlyMap<string, PlannedEntity>) => {
    const ids = new Map<string, string>();
    const missing = [...planned.values()].filter((e) => e.id === null);
    const created = missing.length > 0 ? await tx.insert(table).values(missing.map((e) => ({ code: e.code, name: e.name }))).returning() : [];
    const createdByCode = new Map(created.map((row) => [row.code, row.id] as const));
    for (const [dataName, e] of planned) ids.set(dataName, e.id ?? createdByCode.get(e.code)!);
    return ids;
  };
  const brandIds = await ensure(brands, plan.brands);
  const marketIds = await ensure(markets, plan.markets);

  const missingChannels = channelOrder.map((code) => plan.channels.get(code)!).filter((c) => c.id === null);
  const createdChannelIds = new Map<string, string>();
  if (missingChannels.length > 0) {
    const [top] = await tx.select({ position: max(channels.position) }).from(channels);
    const start = (top?.position ?? -1) + 1;
    const created = await tx
      .insert(channels)
      .values(missingChannels.map((c, k) => ({ code: c.code, name: c.name, position: start + k })))
      .returning();
    for (const row of created) createdChannelIds.set(row.code, row.id);
  }
  const channelIds = channelOrder.map((code) => plan.channels.get(code)!.id ?? createdChannelIds.get(code)!);

  const key = (brandName: string, marketName: string) => cellKey(plan.brands.get(brandName)!.code, plan.markets.get(marketName)!.code);
  const cellIds = new Map(plan.cellIds);
  const newCells = dataCells.filter((c) => !cellIds.has(key(c.brand, c.market)));
  if (newCells.length > 0) {
    const created = await tx
      .insert(cells)
      .values(newCells.map((c) => ({ brandId: brandIds.get(c.brand)!, marketId: marketIds.get(c.market)! })))
      .returning();
    newCells.forEach((c, k) => cellIds.set(key(c.brand, c.market), created[k]!.id));
  }
  return {
    channelIds,
    cellId: (brandName, marketName) => {
      const id = cellIds.get(key(brandName, marketName));
      if (!id) throw new Error(`no cell for ${brandName} × ${marketName}`);
      return id;
    },
  };
}

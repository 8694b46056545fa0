// Analysts' flags on cell × channel estimates. A flag belongs to the cell and channel,
// not to a run, so it shows on every run's screens until it is cleared; clearing keeps
// the row (the history). At most one flag per cell × channel is active: a new flag
// clears the one before it. Every change is written to the audit log.
import { and, desc, eq, inArray, isNotNull, isNull, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import type { ClearFlagInput, CreateFlagInput, Flag, FlagKind } from "@tributary/contracts";
import { inScope } from "../access/market-scope";
import type { MarketScope } from "../access/route-table";
import type { Database, Queryable } from "../db/client";
import { readThroughGeneration } from "../db/data-generation";
import { auditLog, brands, cells, channels, flags, markets, runs, users } from "../db/schema";
import { Conflict, Invalid, NotFound } from "../http/errors";

const clearers = alias(users, "clearers");

export interface FlagFilter {
  readonly status?: "active" | "cleared" | "all";
  readonly cellIds?: readonly string[];
  readonly channel?: string;
  readonly ids?: readonly string[];
}

/** Flags on cells in the scope's markets, newest first. */
export async function listFlags(db: Queryable, scope: MarketScope, filter: FlagFilter = {}): Promise<Flag[]> {
  const status = filter.status ?? "active";
  const conditions: (SQL | undefined)[] = [
    inScope(cells.marketId, scope),
    status === "active" ? isNull(flags.clearedAt) : status === "cleared" ? isNotNull(flags.clearedAt) : undefined,
    filter.cellIds ? (filter.cellIds.length > 0 ? inArray(flags.cellId, [...filter.cellIds]) : inArray(flags.cellId, ["\u0000"])) : undefined,
    filter.channel ? eq(channels.code, filter.channel) : undefined,
    filter.ids ? inArray(flags.id, [...filter.ids]) : undefined,
  ];
  // Reused until the next write (db/data-generation.ts); the key names everything the query depends on.
  const key = `flag list\u0000${JSON.stringify([scope.marketIds, status, filter.cellIds ?? null, filter.channel ?? null, filter.ids ?? null])}`;
  const rows = await readThroughGeneration(db, key, () =>
    db
      .select({
        id: flags.id,
        cellId: flags.cellId,
        brandId: cells.brandId,
        marketId: cells.marketId,
        brand: brands.name,
        market: markets.name,
        channel: channels.code,
        channelName: channels.name,
        kind: flags.kind,
        note: flags.note,
        runId: flags.runId,
        createdAt: flags.createdAt,
        createdById: flags.createdBy,
        createdByName: users.name,
        clearedAt: flags.clearedAt,
        clearedById: flags.clearedBy,
        clearedByName: clearers.name,
      })
      .from(flags)
      .innerJoin(cells, eq(cells.id, flags.cellId))
      .innerJoin(brands, eq(brands.id, cells.brandId))
      .innerJoin(markets, eq(markets.id, cells.marketId))
      .innerJoin(channels, eq(channels.id, flags.channelId))
      .leftJoin(users, eq(users.id, flags.createdBy))
      .leftJoin(clearers, eq(clearers.id, flags.clearedBy))
      .where(and(...conditions))
      .orderBy(desc(flags.createdAt), desc(flags.id)),
  );
  return rows.map((row) => ({
    id: row.id,
    cellId: row.cellId,
    brandId: row.brandId,
    marketId: row.marketId,
    brand: row.brand,
    market: row.market,
    channel: row.channel,
    channelName: row.channelName,
    kind: row.kind as FlagKind,
    note: row.note,
    runId: row.runId,
    createdAt: row.createdAt.toISOString(),
    createdBy: row.createdById && row.createdByName ? { id: row.createdById, name: row.createdByName } : null,
    active: row.clearedAt === null,
    clearedAt: row.clearedAt?.toISOString() ?? null,
    clearedBy: row.clearedById && row.clearedByName ? { id: row.clearedById, name: row.clearedByName } : null,
  }));
}

async function flagById(db: Queryable, flagId: string): Promise<Flag> {
  const rows = await db
    .select({ marketId: cells.marketId })
    .from(flags)
    .innerJoin(cells, eq(cells.id, flags.cellId))
    .where(eq(flags.id, flagId));
  if (rows.length === 0) throw new NotFound("No such flag");
  const [flag] = await listFlags(db, { marketIds: [rows[0]!.marketId], allMarkets: false }, { status: "all", ids: [flagId] });
  return flag!;
}

/** The market of a flag's cell (for the route table's market rule), or null when there is no such flag. */
export async function flagMarkets(db: Queryable, flagId: string): Promise<string[] | null> {
  const [row] = await db.select({ marketId: cells.marketId }).from(flags).innerJoin(cells, eq(cells.id, flags.cellId)).where(eq(flags.id, flagId));
  return row ? [row.marketId] : null;
}

/** Raises a flag on a cell × channel (clearing an active one there first); checks every reference and writes nothing on error. */
export async function raiseFlag(db: Database, input: CreateFlagInput, userId: string): Promise<Flag> {
  const [cell] = await db.select({ id: cells.id }).from(cells).where(eq(cells.id, input.cellId));
  const [channel] = await db.select({ id: channels.id }).from(channels).where(eq(channels.code, input.channel));
  const issues = [
    ...(cell ? [] : [{ path: "cellId", message: "There is no such cell (brand × market)" }]),
    ...(channel ? [] : [{ path: "channel", message: `There is no channel "${input.channel}"` }]),
  ];
  if (input.runId) {
    const [run] = await db.select({ id: runs.id }).from(runs).where(eq(runs.id, input.runId));
    if (!run) issues.push({ path: "runId", message: "There is no such run" });
  }
  if (issues.length > 0) throw new Invalid(issues.length === 1 ? issues[0]!.message : "The flag refers to things that do not exist", issues);

  const flagId = await db.transaction(async (tx) => {
    const now = new Date();
    const superseded = await tx
      .update(flags)
      .set({ clearedAt: now, clearedBy: userId })
      .where(and(eq(flags.cellId, cell!.id), eq(flags.channelId, channel!.id), isNull(flags.clearedAt)))
      .returning({ id: flags.id });
    const [row] = await tx
      .insert(flags)
      .values({ cellId: cell!.id, channelId: channel!.id, runId: input.runId ?? null, kind: input.kind, note: input.note, createdBy: userId, createdAt: now })
      .returning({ id: flags.id });
    for (const old of superseded) {
      await tx.insert(auditLog).values({ userId, action: "flag_cleared", target: `flag:${old.id}`, details: { cellId: cell!.id, channel: input.channel, supersededBy: row!.id } });
    }
    await tx.insert(auditLog).values({
      userId,
      action: "flag_raised",
      target: `flag:${row!.id}`,
      details: { cellId: cell!.id, channel: input.channel, kind: input.kind, note: input.note, runId: input.runId ?? null, supersedes: superseded.map((s) => s.id) },
    });
    return row!.id;
  });
  return flagById(db, flagId);
}

/** Clears an active flag (the row stays, with who cleared it and when). */
export async function clearFlag(db: Database, flagId: string, input: ClearFlagInput, userId: string): Promise<Flag> {
  await db.transaction(async (tx) => {
    const [flag] = await tx.select({ id: flags.id, clearedAt: flags.clearedAt, cellId: flags.cellId }).from(flags).where(eq(flags.id, flagId)).for("update");
    if (!flag) throw new NotFound("No such flag");
    if (flag.clearedAt !== null) throw new Conflict("This flag has already been cleared");
    await tx.update(flags).set({ clearedAt: new Date(), clearedBy: userId }).where(eq(flags.id, flagId));
    await tx.insert(auditLog).values({ userId, action: "flag_cleared", target: `flag:${flagId}`, details: { cellId: flag.cellId, note: input.note && input.note.length > 0 ? input.note : null } });
  });
  return flagById(db, flagId);
}

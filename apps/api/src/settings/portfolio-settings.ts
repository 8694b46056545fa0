// Portfolio settings as admins change them: company name, reporting currency, customer
// value per brand, brand and market names, channel names and order. Each change is one
// transaction with an audit entry per changed value (who, what, old → new); a request that
// changes nothing writes nothing. The dashboards need no separate invalidation: their names
// and values come from DashboardCache.snapshot(), which is reread after any committed write.
// Stored results that carry brand and market names (runs, planning draws) are relabelled
// on reading; saved plans, whose targets name brands and markets, are relabelled here.
import { asc, eq } from "drizzle-orm";
import {
  nameKey,
  portfolioSettingsActions as actions,
  type CurrentUser,
  type PortfolioSettings,
} from "@tributary/contracts";
import { codeFromName } from "../datasets/portfolio-entities";
import type { Database, Queryable } from "../db/client";
import { auditLog, brands, channels, markets, plans, workspaceSettings } from "../db/schema";
import { Invalid, NotFound } from "../http/errors";
import { bodyOf } from "../plans/plan-records";
import { relabelPlanBody } from "../plans/plan-relabel";

export async function portfolioSettings(db: Queryable): Promise<PortfolioSettings> {
  const [settings] = await db.select().from(workspaceSettings).limit(1);
  if (!settings) throw new NotFound("The workspace has no settings yet");
  const [brandRows, marketRows, channelRows] = await Promise.all([
    db.select({ id: brands.id, code: brands.code, name: brands.name, customerValue: brands.customerValue }).from(brands).orderBy(asc(brands.name), asc(brands.code)),
    db.select({ id: markets.id, code: markets.code, name: markets.name }).from(markets).orderBy(asc(markets.name), asc(markets.code)),
    db.select({ id: channels.id, code: channels.code, name: channels.name, position: channels.position }).from(channels).orderBy(asc(channels.position), asc(channels.code)),
  ]);
  return {
    company: settings.companyName,
    currency: settings.currency,
    brands: brandRows,
    markets: marketRows,
    channels: channelRows,
    updatedAt: settings.updatedAt.toISOString(),
  };
}

/** Company name and/or reporting currency (a new currency relabels figures; nothing is converted). */
export async function updateCompanySettings(db: Database, actor: CurrentUser, input: { companyName?: string; currency?: string }): Promise<PortfolioSettings> {
  await db.transaction(async (tx) => {
    const [settings] = await tx.select().from(workspaceSettings).limit(1);
    if (!settings) throw new NotFound("The workspace has no settings yet");
    const companyName = input.companyName ?? settings.companyName;
    const currency = input.currency ?? settings.currency;
    if (companyName === settings.companyName && currency === settings.currency) return;
    await tx.update(workspaceSettings).set({ companyName, currency, updatedAt: new Date() }).where(eq(workspaceSettings.id, settings.id));
    if (companyName !== settings.companyName) {
      await tx.insert(auditLog).values({ userId: actor.id, action: actions.companyName, target: "workspace", details: { from: settings.companyName, to: companyName } });
    }
    if (currency !== settings.currency) {
      await tx.insert(auditLog).values({
        userId: actor.id,
        action: actions.currency,
        target: "workspace",
        details: { from: settings.currency, to: currency, note: "figures relabelled, not converted" },
      });
    }
  });
  return portfolioSettings(db);
}

/** The value of a new customer for each brand listed (null: not known); unlisted brands keep theirs. */
export async function updateCustomerValues(db: Database, actor: CurrentUser, input: { brands: { id: string; customerValue: number | null }[] }): Promise<PortfolioSettings> {
  await db.transaction(async (tx) => {
    const rows = await tx.select({ id: brands.id, name: brands.name, customerValue: brands.customerValue }).from(brands);
    const byId = new Map(rows.map((row) => [row.id, row] as const));
    const unknown = input.brands.flatMap((brand, i) => (byId.has(brand.id) ? [] : [{ path: `brands.${i}.id`, message: "No such brand in this workspace" }]));
    if (unknown.length > 0) throw new Invalid(unknown.length === 1 ? "No such brand in this workspace" : `${unknown.length} brands do not exist in this workspace`, unknown);
    let changed = false;
    for (const brand of input.brands) {
      const old = byId.get(brand.id)!;
      if (old.customerValue === brand.customerValue) continue;
      changed = true;
      await tx.update(brands).set({ customerValue: brand.customerValue }).where(eq(brands.id, brand.id));
      await tx.insert(auditLog).values({
        userId: actor.id,
        action: actions.customerValue,
        target: `brand:${brand.id}`,
        details: { brand: old.name, from: old.customerValue, to: brand.customerValue },
      });
    }
    if (changed) await tx.update(workspaceSettings).set({ updatedAt: new Date() });
  });
  return portfolioSettings(db);
}

/** Every channel once, in the new display order, with its display name (codes never change). */
export async function updateChannelSettings(db: Database, actor: CurrentUser, input: { channels: { id: string; name: string }[] }): Promise<PortfolioSettings> {
  await db.transaction(async (tx) => {
    const rows = await tx.select({ id: channels.id, code: channels.code, name: channels.name, position: channels.position }).from(channels).orderBy(asc(channels.position), asc(channels.code));
    const byId = new Map(rows.map((row) => [row.id, row] as const));
    const unknown = input.channels.flatMap((channel, i) => (byId.has(channel.id) ? [] : [{ path: `channels.${i}.id`, message: "No such channel in this workspace" }]));
    if (unknown.length > 0) throw new Invalid(unknown.length === 1 ? "No such channel in this workspace" : `${unknown.length} channels do not exist in this workspace`, unknown);
    const listed = new Set(input.channels.map((channel) => channel.id));
    const missing = rows.filter((row) => !listed.has(row.id));
    if (missing.length > 0) {
      throw new Invalid(`List every channel once, in the new order; missing: ${missing.map((row) => row.name).join(", ")}`, [
        { path: "channels", message: `Missing: ${missing.map((row) => row.name).join(", ")}` },
      ]);
    }
    let changed = false;
    for (const [position, channel] of input.channels.entries()) {
      const old = byId.get(channel.id)!;
      if (old.name === channel.name && old.position === position) continue;
      changed = true;
      await tx.update(channels).set({ name: channel.name, position }).where(eq(channels.id, channel.id));
      if (old.name !== channel.name) {
        await tx.insert(auditLog).values({ userId: actor.id, action: actions.channelName, target: `channel:${channel.id}`, details: { channel: old.code, from: old.name, to: channel.name } });
      }
    }
    const before = rows.map((row) => row.code);
    const after = input.channels.map((channel) => byId.get(channel.id)!.code);
    if (before.join("\u0000") !== after.join("\u0000")) {
      await tx.insert(auditLog).values({ userId: actor.id, action: actions.channelOrder, target: "channels", details: { from: before, to: after } });
    }
    if (changed) await tx.update(workspaceSettings).set({ updatedAt: new Date() });
  });
  return portfolioSettings(db);
}

type EntityKind = "brand" | "market";
const entityTables = { brand: brands, market: markets } as const;

/**
 * New display names for the brands (or markets) listed; the others keep theirs and codes
 * never change. Refused, with nothing changed: an unknown id, a name another one has after
 * the change (case, spacing and joiners aside), and a name that data files would read as
 * another one's code (an upload finds a brand by name, else by the code made from the name).
 */
async function renameEntities(db: Database, actor: CurrentUser, kind: EntityKind, input: readonly { id: string; name: string }[]): Promise<void> {
  const table = entityTables[kind];
  const listKey = `${kind}s`;
  await db.transaction(async (tx) => {
    const rows = await tx.select({ id: table.id, code: table.code, name: table.name }).from(table).orderBy(asc(table.code)).for("update");
    const byId = new Map(rows.map((row) => [row.id, row] as const));
    const unknown = input.flatMap((entry, i) => (byId.has(entry.id) ? [] : [{ path: `${listKey}.${i}.id`, message: `No such ${kind} in this workspace` }]));
    if (unknown.length > 0) throw new Invalid(unknown.length === 1 ? `No such ${kind} in this workspace` : `${unknown.length} ${kind}s do not exist in this workspace`, unknown);

    const after = new Map(rows.map((row) => [row.id, row.name] as const));
    for (const entry of input) after.set(entry.id, entry.name);
    const holders = new Map<string, string[]>();
    for (const [id, name] of after) holders.set(nameKey(name), [...(holders.get(nameKey(name)) ?? []), id]);
    const byCode = new Map(rows.map((row) => [row.code, row] as const));
    const issues: { path: string; message: string }[] = [];
    input.forEach((entry, i) => {
      const old = byId.get(entry.id)!;
      if (old.name === entry.name) return;
      const other = holders.get(nameKey(entry.name))!.find((id) => id !== entry.id);
      if (other !== undefined) {
        issues.push({ path: `${listKey}.${i}.name`, message: `Another ${kind} is already called "${after.get(other)}"` });
        return;
      }
      const clash = byCode.get(codeFromName(entry.name));
      if (clash && clash.id !== entry.id) {
        issues.push({
          path: `${listKey}.${i}.name`,
          message: `Data files would read "${entry.name}" as the ${kind} with code "${clash.code}" (now "${after.get(clash.id)}"); choose a name that does not spell another ${kind}'s code`,
        });
      }
    });
    if (issues.length > 0) throw new Invalid(issues.length === 1 ? issues[0]!.message : `${issues.length} names cannot be used`, issues);

    const renames = new Map<string, string>();
    for (const entry of input) {
      const old = byId.get(entry.id)!;
      if (old.name === entry.name) continue;
      renames.set(old.name, entry.name);
      await tx.update(table).set({ name: entry.name }).where(eq(table.id, entry.id));
      await tx.insert(auditLog).values({
        userId: actor.id,
        action: kind === "brand" ? actions.brandName : actions.marketName,
        target: `${kind}:${entry.id}`,
        details: { [kind]: old.code, from: old.name, to: entry.name },
      });
    }
    if (renames.size === 0) return;
    // Saved plans name brands and markets in their targets and results: relabel them, numbers untouched.
    const changes = { brands: kind === "brand" ? renames : new Map<string, string>(), markets: kind === "market" ? renames : new Map<string, string>() };
    for (const plan of await tx.select().from(plans).for("update")) {
      const body = relabelPlanBody(bodyOf(plan), changes);
      if (body) await tx.update(plans).set({ body }).where(eq(plans.id, plan.id));
    }
    await tx.update(workspaceSettings).set({ updatedAt: new Date() });
  });
}

/** New display names for the brands listed (codes never change). */
export async function updateBrandNames(db: Database, actor: CurrentUser, input: { brands: { id: string; name: string }[] }): Promise<PortfolioSettings> {
  await renameEntities(db, actor, "brand", input.brands);
  return portfolioSettings(db);
}

/** New display names for the markets listed (codes never change). */
export async function updateMarketNames(db: Database, actor: CurrentUser, input: { markets: { id: string; name: string }[] }): Promise<PortfolioSettings> {
  await renameEntities(db, actor, "market", input.markets);
  return portfolioSettings(db);
}

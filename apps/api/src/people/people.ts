// Users as admins manage them: role, market scope, disabled. A change of role (or
// disabling) ends the user's sessions, so their next request signs them out and the new
// role applies from the next sign-in. Every change is written to the audit log.
import { and, asc, eq, inArray, max, ne, sql } from "drizzle-orm";
import type { CurrentUser, Person, PersonUpdateInput, Role } from "@tributary/contracts";
import type { Auth } from "../auth/lucia";
import type { Database, Queryable } from "../db/client";
import { auditLog, markets, userMarkets, users } from "../db/schema";
import { Conflict, Forbidden, Invalid, NotFound } from "../http/errors";

/** Checks a market list against a role: managers need at least one existing market, other roles none. */
export async function checkMarketsForRole(db: Queryable, role: Role, marketIds: readonly string[], path = "marketIds"): Promise<string[]> {
  if (role !== "market_manager") {
    if (marketIds.length > 0) throw new Invalid("Only market managers are limited to markets; other roles see every market", [{ path, message: "Leave the markets empty for this role" }]);
    return [];
  }
  if (marketIds.length === 0) throw new Invalid("A market manager needs at least one market", [{ path, message: "Choose at least one market" }]);
  const found = await db.select({ id: markets.id }).from(markets).where(inArray(markets.id, [...marketIds]));
  const known = new Set(found.map((row) => row.id));
  const unknown = marketIds.filter((id) => !known.has(id));
  if (unknown.length > 0) throw new Invalid(`No such market: ${unknown.join(", ")}`, [{ path, message: "Choose markets of this workspace" }]);
  return [...marketIds].sort();
}

export async function listPeople(db: Queryable): Promise<Person[]> {
  const rows = await db
    .select({ id: users.id, email: users.email, name: users.name, role: users.role, disabled: users.disabled, createdAt: users.createdAt })
    .from(users)
    .orderBy(asc(users.name), asc(users.email));
  const scoped = await db
    .select({ userId: userMarkets.userId, id: markets.id, name: markets.name })
    .from(userMarkets)
    .innerJoin(markets, eq(markets.id, userMarkets.marketId))
    .orderBy(asc(markets.name));
  const signIns = await db
    .select({ userId: auditLog.userId, at: max(auditLog.at) })
    .from(auditLog)
    .where(eq(auditLog.action, "sign_in"))
    .groupBy(auditLog.userId);
  const lastSignIn = new Map(signIns.map((row) => [row.userId, row.at] as const));
  return rows.map((row) => ({
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    markets: row.role === "market_manager" ? scoped.filter((m) => m.userId === row.id).map((m) => ({ id: m.id, name: m.name })) : [],
    disabled: row.disabled,
    createdAt: row.createdAt.toISOString(),
    lastSignInAt: lastSignIn.get(row.id)?.toISOString() ?? null,
  }));
}

export async function personById(db: Queryable, userId: string): Promise<Person> {
  const person = (await listPeople(db)).find((p) => p.id === userId);
  if (!person) throw new NotFound("No such user");
  return person;
}

async function enabledAdminsOtherThan(db: Queryable, userId: string): Promise<number> {
  const [row] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(users)
    .where(and(eq(users.role, "admin"), eq(users.disabled, false), ne(users.id, userId)));
  return row?.n ?? 0;
}

export async function updatePerson(db: Database, auth: Auth, actor: CurrentUser, userId: string, change: PersonUpdateInput): Promise<Person> {
  const [target] = await db.select().from(users).where(eq(users.id, userId));
  if (!target) throw new NotFound("No such user");
  const role = change.role ?? target.role;
  const roleChanged = role !== target.role;
  const disabledChanged = change.disabled !== undefined && change.disabled !== target.disabled;
  if (target.id === actor.id && roleChanged) throw new Forbidden("You cannot change your own role; ask another admin");
  if (target.id === actor.id && change.disabled === true) throw new Forbidden("You cannot disable your own account");
  const losesAdmin = target.role === "admin" && !target.disabled && (roleChanged || change.disabled === true);
  if (losesAdmin && (await enabledAdminsOtherThan(db, target.id)) === 0) throw new Conflict("This is the only enabled admin; make someone else an admin first");

  const current = (await db.select({ marketId: userMarkets.marketId }).from(userMarkets).where(eq(userMarkets.userId, userId))).map((r) => r.marketId).sort();
  const wanted = change.marketIds ?? (role === "market_manager" ? current : []);
  const marketIds = await checkMarketsForRole(db, role, wanted);
  const marketsChanged = marketIds.join(",") !== current.join(",");

  await db.transaction(async (tx) => {
    if (roleChanged || disabledChanged) {
      await tx.update(users).set({ role, disabled: change.disabled ?? target.disabled }).where(eq(users.id, userId));
    }
    if (marketsChanged) {
      await tx.delete(userMarkets).where(eq(userMarkets.userId, userId));
      if (marketIds.length > 0) await tx.insert(userMarkets).values(marketIds.map((marketId) => ({ userId, marketId })));
    }
    const target_ = `user:${userId}`;
    if (roleChanged) await tx.insert(auditLog).values({ userId: actor.id, action: "role_changed", target: target_, details: { from: target.role, to: role } });
    if (marketsChanged) await tx.insert(auditLog).values({ userId: actor.id, action: "markets_changed", target: target_, details: { from: current, to: marketIds } });
    if (disabledChanged) await tx.insert(auditLog).values({ userId: actor.id, action: change.disabled ? "user_disabled" : "user_enabled", target: target_ });
  });
  // Session rotation: the old sessions carry the old role; the user signs in again.
  if (roleChanged || change.disabled === true) await auth.invalidateUserSessions(userId);
  return personById(db, userId);
}

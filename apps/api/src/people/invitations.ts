// Invitations: an admin invites an e-mail address with a role (and markets); the person
// opens a one-time link, chooses a name and a password, and has an account. The token
// is 32 random bytes sent only in the e-mail; the database keeps its SHA-256. A link
// works once, for 72 hours; resending makes a new link and kills the old one.
import { createHash, randomBytes } from "node:crypto";
import { and, asc, desc, eq, gt, inArray, isNotNull, isNull, lte, type SQL } from "drizzle-orm";
import {
  INVITATION_VALID_HOURS,
  passwordProblems,
  type AcceptInvitationInput,
  type CurrentUser,
  type Invitation,
  type InvitationInput,
  type InvitationLookup,
  type InvitationStatus,
} from "@tributary/contracts";
import { hashPassword } from "../auth/password";
import type { Database, Queryable } from "../db/client";
import { auditLog, invitations, markets, userMarkets, users, workspaceSettings } from "../db/schema";
import { Conflict, Invalid, NotFound } from "../http/errors";
import type { Mailer } from "../mail/mailer";
import { invitationMessage } from "../mail/messages";
import { checkMarketsForRole } from "./people";

export function hashToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

function newToken(): string {
  return randomBytes(32).toString("base64url");
}

const validFor = () => new Date(Date.now() + INVITATION_VALID_HOURS * 3600_000);

type InvitationRow = typeof invitations.$inferSelect;

export function statusOf(row: Pick<InvitationRow, "acceptedAt" | "revokedAt" | "expiresAt">, now = new Date()): InvitationStatus {
  if (row.acceptedAt) return "accepted";
  if (row.revokedAt) return "revoked";
  return row.expiresAt.getTime() <= now.getTime() ? "expired" : "pending";
}

function statusCondition(status: InvitationStatus, now: Date): SQL | undefined {
  switch (status) {
    case "accepted":
      return isNotNull(invitations.acceptedAt);
    case "revoked":
      return and(isNull(invitations.acceptedAt), isNotNull(invitations.revokedAt));
    case "pending":
      return and(isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, now));
    case "expired":
      return and(isNull(invitations.acceptedAt), isNull(invitations.revokedAt), lte(invitations.expiresAt, now));
  }
}

export async function listInvitations(db: Queryable, status?: InvitationStatus): Promise<Invitation[]> {
  const now = new Date();
  const rows = await db
    .select()
    .from(invitations)
    .where(status ? statusCondition(status, now) : undefined)
    .orderBy(desc(invitations.createdAt), asc(invitations.id));
  const chosen = rows;
  const userIds = [...new Set(chosen.flatMap((row) => [row.invitedBy, row.acceptedUserId]).filter((id): id is string => id !== null))];
  const people = userIds.length > 0 ? await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, userIds)) : [];
  const names = new Map(people.map((p) => [p.id, p.name] as const));
  const marketIds = [...new Set(chosen.flatMap((row) => row.marketIds))];
  const marketRows = marketIds.length > 0 ? await db.select({ id: markets.id, name: markets.name }).from(markets).where(inArray(markets.id, marketIds)) : [];
  const marketNames = new Map(marketRows.map((m) => [m.id, m.name] as const));
  const ref = (id: string | null) => (id && names.has(id) ? { id, name: names.get(id)! } : null);
  return chosen.map((row) => ({
    id: row.id,
    email: row.email,
    role: row.role,
    markets: row.marketIds.map((id) => ({ id, name: marketNames.get(id) ?? id })),
    status: statusOf(row, now),
    invitedBy: ref(row.invitedBy),
    createdAt: row.createdAt.toISOString(),
    expiresAt: row.expiresAt.toISOString(),
    acceptedAt: row.acceptedAt?.toISOString() ?? null,
    acceptedUser: ref(row.acceptedUserId),
    revokedAt: row.revokedAt?.toISOString() ?? null,
  }));
}

async function invitationById(db: Queryable, id: string): Promise<Invitation> {
  const found = (await listInvitations(db)).find((inv) => inv.id === id);
  if (!found) throw new NotFound("No such invitation");
  return found;
}

async function companyName(db: Queryable): Promise<string> {
  const [settings] = await db.select({ company: workspaceSettings.companyName }).from(workspaceSettings).limit(1);
  return settings?.company ?? "your company";
}

export interface InvitationMail {
  readonly mailer: Mailer;
  /** The app's address; the link is `${baseUrl}/invite/<token>`. */
  readonly baseUrl: string;
}

async function sendInvitation(db: Queryable, mail: InvitationMail, row: InvitationRow, token: string, invitedBy: string): Promise<void> {
  const names = row.marketIds.length > 0 ? await db.select({ name: markets.name }).from(markets).where(inArray(markets.id, row.marketIds)) : [];
  await mail.mailer.send(
    invitationMessage({
      to: row.email,
      company: await companyName(db),
      role: row.role,
      marketNames: names.map((m) => m.name).sort(),
      invitedBy,
      acceptUrl: `${mail.baseUrl}/invite/${token}`,
    }),
  );
}

export async function createInvitation(db: Database, actor: CurrentUser, input: InvitationInput & { marketIds: string[] }, mail: InvitationMail): Promise<Invitation> {
  const marketIds = await checkMarketsForRole(db, input.role, input.marketIds);
  const email = input.email;
  const [existing] = await db.select({ id: users.id }).from(users).where(eq(users.email, email));
  if (existing) throw new Conflict(`${email} already has an account`);
  const now = new Date();
  const waiting = (await db.select().from(invitations).where(eq(invitations.email, email))).filter((row) => statusOf(row, now) === "pending");
  if (waiting.length > 0) throw new Conflict(`${email} already has a waiting invitation; resend it instead`);
  const token = newToken();
  const row = await db.transaction(async (tx) => {
    const [created] = await tx
      .insert(invitations)
      .values({ email, tokenHash: hashToken(token), role: input.role, marketIds, invitedBy: actor.id, expiresAt: validFor() })
      .returning();
    await tx.insert(auditLog).values({ userId: actor.id, action: "invitation_sent", target: `invitation:${created!.id}`, details: { email, role: input.role, marketIds } });
    return created!;
  });
  await sendInvitation(db, mail, row, token, actor.name);
  return invitationById(db, row.id);
}

/** A new link (and 72 hours) for a waiting or expired invitation; the old link stops working. */
export async function resendInvitation(db: Database, actor: CurrentUser, id: string, mail: InvitationMail): Promise<Invitation> {
  const [row] = await db.select().from(invitations).where(eq(invitations.id, id));
  if (!row) throw new NotFound("No such invitation");
  const status = statusOf(row);
  if (status === "accepted" || status === "revoked") throw new Conflict(`This invitation was ${status}; send a new one instead`);
  const token = newToken();
  const updated = await db.transaction(async (tx) => {
    const [done] = await tx
      .update(invitations)
      .set({ tokenHash: hashToken(token), expiresAt: validFor() })
      .where(and(eq(invitations.id, id), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
      .returning();
    if (!done) throw new Conflict("The invitation changed meanwhile; reload the list");
    await tx.insert(auditLog).values({ userId: actor.id, action: "invitation_resent", target: `invitation:${id}`, details: { email: row.email } });
    return done;
  });
  await sendInvitation(db, mail, updated, token, actor.name);
  return invitationById(db, id);
}

export async function revokeInvitation(db: Database, actor: CurrentUser, id: string): Promise<Invitation> {
  const [row] = await db.select().from(invitations).where(eq(invitations.id, id));
  if (!row) throw new NotFound("No such invitation");
  const status = statusOf(row);
  if (status === "accepted") throw new Conflict("This invitation was accepted; disable the user instead");
  if (status === "revoked") throw new Conflict("This invitation is already revoked");
  await db.transaction(async (tx) => {
    await tx.update(invitations).set({ revokedAt: new Date() }).where(and(eq(invitations.id, id), isNull(invitations.acceptedAt)));
    await tx.insert(auditLog).values({ userId: actor.id, action: "invitation_revoked", target: `invitation:${id}`, details: { email: row.email } });
  });
  return invitationById(db, id);
}

const unusableLink = "This invitation link does not work: it may have been used already or withdrawn. Ask an admin for a new invitation";

/** The invitation of a token, if it can still be accepted. */
async function usableInvitation(db: Queryable, token: string): Promise<InvitationRow> {
  if (token.length < 20 || token.length > 200) throw new NotFound(unusableLink);
  const [row] = await db.select().from(invitations).where(eq(invitations.tokenHash, hashToken(token)));
  if (!row) throw new NotFound(unusableLink);
  const status = statusOf(row);
  if (status === "expired") throw new Conflict(`This invitation link expired on ${row.expiresAt.toISOString().slice(0, 16).replace("T", " ")} UTC. Ask an admin to send a new one`);
  if (status !== "pending") throw new NotFound(unusableLink);
  return row;
}

export async function lookUpInvitation(db: Queryable, token: string): Promise<InvitationLookup> {
  const row = await usableInvitation(db, token);
  return { email: row.email, role: row.role, expiresAt: row.expiresAt.toISOString(), company: await companyName(db) };
}

/** Creates the account of a usable invitation, once; returns the new user's id. */
export async function acceptInvitation(db: Database, token: string, input: AcceptInvitationInput): Promise<string> {
  const row = await usableInvitation(db, token);
  const problems = passwordProblems(input.password, row.email);
  if (problems.length > 0) throw new Invalid(problems.join(". "), problems.map((message) => ({ path: "password", message })));
  const passwordHash = await hashPassword(input.password);
  return db.transaction(async (tx) => {
    const [existing] = await tx.select({ id: users.id }).from(users).where(eq(users.email, row.email));
    if (existing) throw new Conflict(`${row.email} already has an account; sign in instead`);
    const [user] = await tx.insert(users).values({ email: row.email, name: input.name, role: row.role, passwordHash }).returning({ id: users.id });
    // Single use: only the first acceptance finds the invitation still open.
    const [claimed] = await tx
      .update(invitations)
      .set({ acceptedAt: new Date(), acceptedUserId: user!.id })
      .where(and(eq(invitations.id, row.id), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date())))
      .returning({ id: invitations.id });
    if (!claimed) throw new NotFound(unusableLink);
    const marketIds = row.role === "market_manager" ? row.marketIds : [];
    // Markets deleted since the invitation are left out.
    const still = marketIds.length > 0 ? await tx.select({ id: markets.id }).from(markets).where(inArray(markets.id, marketIds)) : [];
    if (still.length > 0) await tx.insert(userMarkets).values(still.map((m) => ({ userId: user!.id, marketId: m.id })));
    await tx.insert(auditLog).values({ userId: user!.id, action: "invitation_accepted", target: `invitation:${row.id}`, details: { email: row.email, role: row.role } });
    return user!.id;
  });
}

// The audit log as admins read it: newest first, paged, filtered by action and user.
import { and, asc, count, desc, eq } from "drizzle-orm";
import type { AuditLogPage } from "@tributary/contracts";
import type { Queryable } from "../db/client";
import { auditLog, users } from "../db/schema";

export async function auditLogPage(db: Queryable, query: { action?: string; userId?: string; page: number; pageSize: number }): Promise<AuditLogPage> {
  const where = and(query.action ? eq(auditLog.action, query.action) : undefined, query.userId ? eq(auditLog.userId, query.userId) : undefined);
  const [rows, [total], actions] = await Promise.all([
    db
      .select({ id: auditLog.id, at: auditLog.at, userId: auditLog.userId, userName: users.name, action: auditLog.action, target: auditLog.target, details: auditLog.details })
      .from(auditLog)
      .leftJoin(users, eq(users.id, auditLog.userId))
      .where(where)
      .orderBy(desc(auditLog.id))
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize),
    db.select({ n: count() }).from(auditLog).where(where),
    db.selectDistinct({ action: auditLog.action }).from(auditLog).orderBy(asc(auditLog.action)),
  ]);
  return {
    entries: rows.map((row) => ({
      id: row.id,
      at: row.at.toISOString(),
      user: row.userId && row.userName !== null ? { id: row.userId, name: row.userName } : null,
      action: row.action,
      target: row.target,
      details: row.details ?? null,
    })),
    total: total?.n ?? 0,
    page: query.page,
    pageSize: query.pageSize,
    actions: actions.map((a) => a.action),
  };
}

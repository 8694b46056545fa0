// The outbox as the Outbox screen reads it (admins): newest first, paged.
import { and, count, desc, eq, ilike, type SQL } from "drizzle-orm";
import type { OutboxMessage, OutboxPage } from "@tributary/contracts";
import type { Queryable } from "../db/client";
import { outbox, users } from "../db/schema";
import { NotFound } from "../http/errors";

const likePattern = (text: string) => `%${text.replace(/[\\%_]/g, (ch) => `\\${ch}`)}%`;

const columns = {
  id: outbox.id,
  to: outbox.to,
  toUserId: outbox.toUserId,
  toUserName: users.name,
  subject: outbox.subject,
  kind: outbox.kind,
  createdAt: outbox.createdAt,
};

type Row = { id: string; to: string; toUserId: string | null; toUserName: string | null; subject: string; kind: string; createdAt: Date };

const summaryOf = (row: Row) => ({
  id: row.id,
  to: row.to,
  toUser: row.toUserId && row.toUserName !== null ? { id: row.toUserId, name: row.toUserName } : null,
  subject: row.subject,
  kind: row.kind,
  createdAt: row.createdAt.toISOString(),
});

export async function outboxPage(db: Queryable, query: { kind?: string; to?: string; page: number; pageSize: number }): Promise<OutboxPage> {
  const where: SQL | undefined = and(query.kind ? eq(outbox.kind, query.kind) : undefined, query.to ? ilike(outbox.to, likePattern(query.to)) : undefined);
  const [rows, [total]] = await Promise.all([
    db
      .select(columns)
      .from(outbox)
      .leftJoin(users, eq(users.id, outbox.toUserId))
      .where(where)
      .orderBy(desc(outbox.createdAt), desc(outbox.id))
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize),
    db.select({ n: count() }).from(outbox).where(where),
  ]);
  return { messages: rows.map(summaryOf), total: total?.n ?? 0, page: query.page, pageSize: query.pageSize };
}

export async function outboxMessage(db: Queryable, id: string): Promise<OutboxMessage> {
  const [row] = await db
    .select({ ...columns, text: outbox.text, html: outbox.html })
    .from(outbox)
    .leftJoin(users, eq(users.id, outbox.toUserId))
    .where(eq(outbox.id, id));
  if (!row) throw new NotFound("No such message");
  return { ...summaryOf(row), text: row.text, html: row.html };
}

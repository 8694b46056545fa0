// Checks that a database's files are sound: every table readable (at every start),
// and, for backups and the crash tests, every index and table page verified with
// Postgres's amcheck. Also the per-table row counts and fingerprints a backup's
// manifest records and a restore compares.
import type { PGlite, Transaction } from "@electric-sql/pglite";

type Client = Pick<PGlite, "query" | "transaction">;
type Reader = Pick<PGlite | Transaction, "query">;

/** The migration journal lives outside the public schema. */
const MIGRATIONS_TABLE = "drizzle.__drizzle_migrations";

export class DatabaseDamaged extends Error {
  constructor(
    message: string,
    readonly problems: readonly string[],
  ) {
    super(message);
    this.name = "DatabaseDamaged";
  }
}

const quoted = (name: string) =>
  name
    .split(".")
    .map((part) => `"${part.replaceAll('"', '""')}"`)
    .join(".");

/** Every table of the workspace: the public schema's, then the migration journal (when there). */
export async function workspaceTables(db: Reader): Promise<string[]> {
  const { rows } = await db.query<{ name: string }>(
    `select case when table_schema = 'public' then table_name else table_schema || '.' || table_name end as name
       from information_schema.tables
      where table_type = 'BASE TABLE' and (table_schema = 'public' or (table_schema = 'drizzle' and table_name = '__drizzle_migrations'))
      order by table_schema = 'public' desc, table_name`,
  );
  return rows.map((row) => row.name);
}

export { MIGRATIONS_TABLE };

/** Rows per table; throws DatabaseDamaged naming every table that cannot be read. */
export async function tableRowCounts(db: Reader): Promise<Record<string, number>> {
  const counts: Record<string, number> = {};
  const problems: string[] = [];
  for (const table of await workspaceTables(db)) {
    try {
      const { rows } = await db.query<{ n: number }>(`select count(*)::int as n from ${quoted(table)}`);
      counts[table] = rows[0]!.n;
    } catch (error) {
      problems.push(`${table}: ${error instanceof Error ? error.message : String(error)}`);
    }
  }
  if (problems.length > 0) throw new DatabaseDamaged(`The database cannot be read: ${problems.join("; ")}`, problems);
  return counts;
}

export interface TableFingerprint {
  readonly rows: number;
  /** md5 over the md5 of every row's text, in sorted order: equal content gives an equal fingerprint. */
  readonly md5: string;
}

/** Row count and a content fingerprint of every table. */
export async function tableFingerprints(db: Reader): Promise<Record<string, TableFingerprint>> {
  const result: Record<string, TableFingerprint> = {};
  for (const table of await workspaceTables(db)) {
    const { rows } = await db.query<{ n: number; md5: string }>(
      `select count(*)::int as n, md5(coalesce(string_agg(h, '' order by h), '')) as md5
         from (select md5(t::text) as h from ${quoted(table)} t) rows`,
    );
    result[table] = { rows: rows[0]!.n, md5: rows[0]!.md5 };
  }
  return result;
}

export interface DeepCheckReport {
  readonly tables: number;
  readonly indexes: number;
  readonly rows: Record<string, number>;
}

/**
 * Reads every table and verifies every B-tree index (with its heap: every row is
 * indexed) and every table page with amcheck. The client must have been opened with
 * `integrityChecks` (db/client.ts). Leaves nothing behind: the extension is created
 * in a transaction that is rolled back.
 */
export async function deepCheck(db: Client): Promise<DeepCheckReport> {
  const rows = await tableRowCounts(db);
  const problems: string[] = [];
  let indexes = 0;
  let tables = 0;
  try {
    await db.transaction(async (tx) => {
      await tx.query("create extension if not exists amcheck");
      const heap = await tx.query<{ relname: string; blkno: number | null; msg: string }>(
        `select c.relname, v.blkno, v.msg
           from pg_class c join pg_namespace n on n.oid = c.relnamespace, verify_heapam(c.oid) v
          where c.relkind = 'r' and n.nspname in ('public', 'drizzle')`,
      );
      for (const row of heap.rows) problems.push(`table ${row.relname}, page ${row.blkno}: ${row.msg}`);
      const counted = await tx.query<{ n: number }>(
        `select count(*)::int as n from pg_class c join pg_namespace n on n.oid = c.relnamespace where c.relkind = 'r' and n.nspname in ('public', 'drizzle')`,
      );
      tables = counted.rows[0]!.n;
      const list = await tx.query<{ oid: number; relname: string }>(
        `select c.oid, c.relname
           from pg_index i join pg_class c on c.oid = i.indexrelid join pg_am a on a.oid = c.relam join pg_namespace n on n.oid = c.relnamespace
          where a.amname = 'btree' and n.nspname in ('public', 'drizzle') and i.indisvalid
          order by c.relname`,
      );
      for (const index of list.rows) {
        try {
          await tx.query("select bt_index_check($1::regclass, true)", [index.oid]);
          indexes++;
        } catch (error) {
          problems.push(`index ${index.relname}: ${error instanceof Error ? error.message : String(error)}`);
          // One failed check aborts the transaction; nothing more can be asked of it.
          break;
        }
      }
      await tx.rollback();
    });
  } catch (error) {
    if (problems.length === 0) throw error;
  }
  if (problems.length > 0) throw new DatabaseDamaged(`The database is damaged: ${problems.join("; ")}`, problems);
  return { tables, indexes, rows };
}

/** What the server prints when its database cannot be opened or read. */
export function unopenableMessage(dataDir: string, error: unknown): string {
  const cause = error instanceof Error ? error.message : String(error);
  return [
    `Tributary did not start: the database in ${dataDir} cannot be opened or read (${cause}).`,
    "Its files may be damaged (a disk problem, a power cut, or files changed by hand). Nothing was changed.",
    `To go back to your latest backup, stop every Tributary process and run \`DATA_DIR=${dataDir} pnpm restore <backup file> --force\`: the damaged directory is kept beside it, renamed (see apps/api/README.md, "Backup and restore").`,
  ].join("\n");
}

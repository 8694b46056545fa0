// Builds the database: PGlite (embedded Postgres) behind Drizzle, migrated on start.
import { mkdirSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { PGlite } from "@electric-sql/pglite";
import { drizzle, type PgliteDatabase } from "drizzle-orm/pglite";
import { migrate } from "drizzle-orm/pglite/migrator";
import * as schema from "./schema";

export type Database = PgliteDatabase<typeof schema> & { $client: PGlite };
/** A database handle or an open transaction on it; queries work the same on both. */
export type Queryable = Pick<Database, "select" | "selectDistinct" | "insert" | "update" | "delete" | "execute">;

export const migrationsFolder = fileURLToPath(new URL("../../drizzle", import.meta.url));

export interface DatabaseOptions {
  /** Directory for the data files; in-memory when omitted (tests). */
  dataDir?: string;
  /** A data directory dumped with `dumpDataDir` to start from (tests clone a migrated, seeded database). */
  snapshot?: Blob;
}

export async function createDatabase(options: DatabaseOptions = {}): Promise<Database> {
  if (options.dataDir) mkdirSync(options.dataDir, { recursive: true });
  const client = new PGlite({ dataDir: options.dataDir, loadDataDir: options.snapshot });
  const db = drizzle({ client, schema });
  await migrate(db, { migrationsFolder });
  return db;
}

export async function closeDatabase(db: Database): Promise<void> {
  await db.$client.close();
}

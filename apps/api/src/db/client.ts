// Builds the database: PGlite (embedded Postgres) behind Drizzle, migrated on start.
import { fsyncSync, mkdirSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { PGlite, type PGliteOptions } from "@electric-sql/pglite";
import { amcheck } from "@electric-sql/pglite/contrib/amcheck";
import { NodeFS } from "@electric-sql/pglite/nodefs";
import { drizzle, type PgliteDatabase } from "drizzle-orm/pglite";
import { migrate } from "drizzle-orm/pglite/migrator";
import { registerDataGeneration, trackWrites } from "./data-generation";
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
  /** Called with every SQL statement before it runs (the server's test hook, see backup/test-hold.ts). */
  onQuery?: (sql: string) => void;
  /** Loads the amcheck extension so indexes and tables can be verified (backup/integrity.ts). */
  integrityChecks?: boolean;
  /** With a data directory: fsync reaches the disk (default true). The restore loads without and syncs once at the end. */
  durable?: boolean;
}

interface NodeFsModule {
  NODEFS?: { stream_ops?: { fsync?: (stream: { nfd?: number }) => number } };
}

/**
 * PGlite's on-disk file system with a working fsync. Out of the box PGlite starts
 * Postgres with fsync off and its file layer ignores fsync, so a commit reaches the
 * kernel (it survives the process being killed) but not the disk (a power cut may lose
 * it or tear the files). This layer makes fsync reach the disk; `durableStartParams`
 * turn Postgres's fsync back on.
 */
class DurableNodeFS extends NodeFS {
  override async init(...args: Parameters<NodeFS["init"]>): ReturnType<NodeFS["init"]> {
    const result = await super.init(...args);
    const opts = result.emscriptenOpts as { preRun?: ((mod: NodeFsModule) => void)[] };
    opts.preRun = [
      ...(opts.preRun ?? []),
      (mod) => {
        const ops = mod.NODEFS?.stream_ops;
        if (!ops) throw new Error("PGlite's file layer has changed (no NODEFS stream operations): update db/client.ts");
        ops.fsync = (stream) => {
          if (stream.nfd !== undefined) fsyncSync(stream.nfd);
          return 0;
        };
      },
    ];
    return result;
  }
}

/** PGlite's defaults with fsync on; WAL flushed with fsync (its fdatasync does nothing). */
export const durableStartParams = [...PGlite.defaultStartParams.filter((param) => param !== "-F"), "-c", "wal_sync_method=fsync"];

/** Opens PGlite on a data directory (durable writes) or in memory, without migrating. */
export async function openClient(options: Pick<DatabaseOptions, "dataDir" | "snapshot" | "integrityChecks" | "durable"> = {}): Promise<PGlite> {
  const pgOptions: PGliteOptions = { loadDataDir: options.snapshot };
  if (options.integrityChecks) pgOptions.extensions = { amcheck };
  if (options.dataDir) {
    mkdirSync(options.dataDir, { recursive: true });
    if (options.durable === false) {
      pgOptions.dataDir = options.dataDir;
    } else {
      pgOptions.fs = new DurableNodeFS(options.dataDir);
      pgOptions.startParams = durableStartParams;
    }
  }
  const client = new PGlite(pgOptions);
  await client.waitReady;
  return client;
}

export async function createDatabase(options: DatabaseOptions = {}): Promise<Database> {
  const client = await openClient(options);
  // Every write moves the data generation, so caches can check for changes without a query (data-generation.ts).
  const generation = trackWrites(client);
  const onQuery = options.onQuery;
  const db = drizzle({ client, schema, logger: onQuery ? { logQuery: (query) => onQuery(query) } : false });
  registerDataGeneration(db, generation);
  await migrate(db, { migrationsFolder });
  return db;
}

export async function closeDatabase(db: Database): Promise<void> {
  await db.$client.close();
}

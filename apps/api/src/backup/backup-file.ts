// Backups of a whole workspace in one file, and their restore.
//
// A backup is the database's data directory as PGlite dumps it (a gzipped tar: every
// table, sequence and the migration journal, byte for byte), behind a one-line manifest:
//
//   TRIBUTARY-BACKUP 1\n
//   {"format":"tributary-backup",…}\n        ← the manifest, one line of JSON
//   <the gzipped tar of the data directory>   ← payload.bytes bytes, sha256 payload.sha256
//
// Decided: a physical dump rather than a table-by-table export, because it restores
// exactly (sequences, the migration journal, column types) and a backup made before a
// migration is brought up to date by the next server start like any older database.
// The manifest's table fingerprints let the restore prove the copy equals the source.
// The cost: the files are Postgres's own format, so a future database engine of another
// major version cannot read them (the restore then says so).
import { createHash } from "node:crypto";
import { closeSync, existsSync, fsyncSync, mkdirSync, openSync, readdirSync, readFileSync, renameSync, rmSync, statSync, unlinkSync, writeSync } from "node:fs";
import { createRequire } from "node:module";
import { basename, dirname, join, resolve } from "node:path";
import { readMigrationFiles } from "drizzle-orm/migrator";
import { z } from "zod";
import type { PGlite } from "@electric-sql/pglite";
import { apiVersion } from "../config";
import { migrationsFolder, openClient } from "../db/client";
import { acquireDataDirLock, LOCK_FILE_NAME, type DataDirLock } from "./data-dir-lock";
import { deepCheck, MIGRATIONS_TABLE, tableFingerprints, type TableFingerprint } from "./integrity";

export const BACKUP_MAGIC = "TRIBUTARY-BACKUP";
export const BACKUP_FORMAT_VERSION = 1;
/** The name backups get by default: tributary-<date>-<time>.tributary-backup */
export const BACKUP_EXTENSION = ".tributary-backup";

/** A refusal with a message for the person at the keyboard; nothing was changed. */
export class BackupRefused extends Error {
  constructor(message: string) {
    super(message);
    this.name = "BackupRefused";
  }
}

const fingerprintSchema = z.object({ rows: z.number().int().nonnegative(), md5: z.string().regex(/^[0-9a-f]{32}$/) });

export const backupManifestSchema = z.object({
  format: z.literal("tributary-backup"),
  formatVersion: z.number().int().positive(),
  createdAt: z.string(),
  appVersion: z.string(),
  /** The data directory it was made from (for the person reading it; not used to restore). */
  source: z.string(),
  database: z.object({
    engine: z.literal("pglite"),
    pgliteVersion: z.string(),
    postgresVersion: z.string(),
  }),
  /** The schema migrations applied to the database, oldest first (drizzle's hashes of the SQL files). */
  migrations: z.object({ level: z.number().int().nonnegative(), hashes: z.array(z.string()) }),
  /** Rows and content fingerprint per table (schema-qualified outside "public"). */
  tables: z.record(z.string(), fingerprintSchema),
  payload: z.object({ kind: z.literal("pgdata.tar.gz"), bytes: z.number().int().positive(), sha256: z.string().regex(/^[0-9a-f]{64}$/) }),
});
export type BackupManifest = z.infer<typeof backupManifestSchema>;

function pgliteVersion(): string {
  const entry = createRequire(import.meta.url).resolve("@electric-sql/pglite");
  const pkg = JSON.parse(readFileSync(join(dirname(entry), "..", "package.json"), "utf8")) as { version?: string };
  return pkg.version ?? "unknown";
}

const sha256 = (bytes: Uint8Array) => createHash("sha256").update(bytes).digest("hex");

/** The code's migrations, oldest first. */
function knownMigrationHashes(): string[] {
  return readMigrationFiles({ migrationsFolder }).map((migration) => migration.hash);
}

async function appliedMigrationHashes(client: PGlite): Promise<string[]> {
  try {
    const { rows } = await client.query<{ hash: string }>(`select hash from ${MIGRATIONS_TABLE} order by id`);
    return rows.map((row) => row.hash);
  } catch {
    return [];
  }
}

function isDatabaseDir(dir: string): boolean {
  return existsSync(join(dir, "PG_VERSION"));
}

function isEmptyDir(dir: string): boolean {
  return !existsSync(dir) || readdirSync(dir).length === 0;
}

/** Writes `bytes` to `file` so that the file is either absent or whole: a temporary file, fsync, rename, fsync of the folder. */
function writeFileAtomically(file: string, parts: readonly Uint8Array[]): void {
  const partial = join(dirname(file), `.${basename(file)}.${process.pid}.partial`);
  const fd = openSync(partial, "w", 0o600);
  try {
    for (const part of parts) {
      let offset = 0;
      while (offset < part.byteLength) offset += writeSync(fd, part, offset, part.byteLength - offset);
    }
    fsyncSync(fd);
  } catch (error) {
    closeSync(fd);
    rmSync(partial, { force: true });
    throw error;
  }
  closeSync(fd);
  renameSync(partial, file);
  syncPath(dirname(file));
}

/** fsync of every file and folder under `dir`, so what was written there survives a power cut. */
function syncTree(dir: string): void {
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const path = join(dir, entry.name);
    if (entry.isDirectory()) syncTree(path);
    else if (entry.isFile()) syncPath(path);
  }
  syncPath(dir);
}

function syncPath(path: string): void {
  const fd = openSync(path, "r");
  try {
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
}

function lockOrRefuse(dataDir: string, purpose: string): DataDirLock {
  try {
    return acquireDataDirLock(dataDir, purpose);
  } catch (error) {
    throw new BackupRefused(error instanceof Error ? error.message : String(error));
  }
}

export interface BackupResult {
  readonly file: string;
  readonly manifest: BackupManifest;
}

/**
 * Backs up the database in `dataDir` to `file`. The server must not be running on it
 * (the lock file says so). The database is verified first (every table, index and page):
 * a damaged one is not backed up.
 */
export async function createBackup(dataDir: string, file: string, options: { force?: boolean } = {}): Promise<BackupResult> {
  const source = resolve(dataDir);
  const target = resolve(file);
  if (!isDatabaseDir(source)) throw new BackupRefused(`There is no Tributary database in ${source} (set DATA_DIR to the server's data directory).`);
  if (existsSync(target) && !options.force) throw new BackupRefused(`${target} already exists; choose another file name, or add --force to replace it.`);
  if (!existsSync(dirname(target))) throw new BackupRefused(`The folder ${dirname(target)} does not exist.`);
  const lock = lockOrRefuse(source, "backup");
  try {
    const client = await openClient({ dataDir: source, integrityChecks: true });
    let manifest: BackupManifest;
    let payload: Uint8Array;
    try {
      const hashes = await appliedMigrationHashes(client);
      if (hashes.length === 0) throw new BackupRefused(`The database in ${source} is not a Tributary database (it has no migration journal).`);
      try {
        await deepCheck(client);
      } catch (error) {
        throw new BackupRefused(`${error instanceof Error ? error.message : String(error)}. A backup would carry the damage; restore an earlier backup instead.`);
      }
      const tables = await tableFingerprints(client);
      const { rows } = await client.query<{ server_version: string }>("show server_version");
      // Everything written so far goes into the table files, so the copy needs no log replay.
      await client.query("checkpoint");
      payload = new Uint8Array(await (await client.dumpDataDir("gzip")).arrayBuffer());
      manifest = {
        format: "tributary-backup",
        formatVersion: BACKUP_FORMAT_VERSION,
        createdAt: new Date().toISOString(),
        appVersion: apiVersion(),
        source,
        database: { engine: "pglite", pgliteVersion: pgliteVersion(), postgresVersion: rows[0]!.server_version },
        migrations: { level: hashes.length, hashes },
        tables,
        payload: { kind: "pgdata.tar.gz", bytes: payload.byteLength, sha256: sha256(payload) },
      };
    } finally {
      await client.close();
    }
    const header = new TextEncoder().encode(`${BACKUP_MAGIC} ${BACKUP_FORMAT_VERSION}\n${JSON.stringify(manifest)}\n`);
    writeFileAtomically(target, [header, payload]);
    return { file: target, manifest };
  } finally {
    lock.release();
  }
}

export interface ReadBackup {
  readonly manifest: BackupManifest;
  readonly payload: Uint8Array<ArrayBuffer>;
}

/** Reads and checks a backup file: its kind, its manifest, the payload's length and checksum. */
export function readBackupFile(file: string): ReadBackup {
  const path = resolve(file);
  if (!existsSync(path)) throw new BackupRefused(`${path} does not exist.`);
  if (!statSync(path).isFile()) throw new BackupRefused(`${path} is not a file.`);
  const bytes = readFileSync(path);
  const firstLineEnd = bytes.indexOf(0x0a);
  const firstLine = bytes.subarray(0, firstLineEnd < 0 ? Math.min(bytes.length, 64) : firstLineEnd).toString("latin1");
  if (!firstLine.startsWith(`${BACKUP_MAGIC} `)) throw new BackupRefused(`${path} is not a Tributary backup (it does not start with "${BACKUP_MAGIC}").`);
  const version = Number(firstLine.slice(BACKUP_MAGIC.length + 1));
  if (!Number.isInteger(version) || version < 1) throw new BackupRefused(`${path} is damaged: its first line is "${firstLine.slice(0, 40)}".`);
  if (version > BACKUP_FORMAT_VERSION) throw new BackupRefused(`${path} was made by a newer Tributary (backup format ${version}; this one reads format ${BACKUP_FORMAT_VERSION}). Restore it with that version or a later one.`);
  const manifestEnd = bytes.indexOf(0x0a, firstLineEnd + 1);
  if (manifestEnd < 0) throw new BackupRefused(`${path} is damaged: its manifest is cut short.`);
  let manifest: BackupManifest;
  try {
    manifest = backupManifestSchema.parse(JSON.parse(bytes.subarray(firstLineEnd + 1, manifestEnd).toString("utf8")));
  } catch {
    throw new BackupRefused(`${path} is damaged: its manifest cannot be read.`);
  }
  const payload = new Uint8Array(bytes.buffer as ArrayBuffer, bytes.byteOffset + manifestEnd + 1, bytes.length - manifestEnd - 1);
  if (payload.byteLength !== manifest.payload.bytes) {
    throw new BackupRefused(
      `${path} is damaged: it holds ${payload.byteLength} bytes of data where its manifest says ${manifest.payload.bytes}${payload.byteLength < manifest.payload.bytes ? " (the file was cut short)" : ""}.`,
    );
  }
  if (sha256(payload) !== manifest.payload.sha256) throw new BackupRefused(`${path} is damaged: its data do not match the checksum in its manifest.`);
  return { manifest, payload };
}

/** Refuses a backup whose schema history this version of Tributary does not continue. */
export function checkMigrationLevel(manifest: BackupManifest, known: readonly string[] = knownMigrationHashes()): { pending: number } {
  const { hashes, level } = manifest.migrations;
  if (hashes.length !== level) throw new BackupRefused(`The backup is damaged: its manifest lists ${hashes.length} migrations but says ${level}.`);
  if (level > known.length) {
    throw new BackupRefused(
      `The backup was made by a newer Tributary (${manifest.appVersion}; database migration level ${level}, this version knows ${known.length}). Restore it with that version or a later one.`,
    );
  }
  const differs = hashes.findIndex((hash, i) => hash !== known[i]);
  if (differs >= 0) throw new BackupRefused(`The backup's database history differs from this Tributary's at migration ${differs + 1}: it was not made by this product (or by a modified copy).`);
  return { pending: known.length - level };
}

export interface RestoreResult {
  readonly dataDir: string;
  readonly manifest: BackupManifest;
  /** Migrations the next server start applies (the backup was made by an older version). */
  readonly pendingMigrations: number;
  /** Where the database that was in DATA_DIR was moved (with --force), or null. */
  readonly previousMovedTo: string | null;
  /** True for --check: everything verified, nothing written. */
  readonly checkOnly: boolean;
}

function differingTables(expected: Record<string, TableFingerprint>, actual: Record<string, TableFingerprint>): string[] {
  const names = new Set([...Object.keys(expected), ...Object.keys(actual)]);
  return [...names].filter((name) => expected[name]?.rows !== actual[name]?.rows || expected[name]?.md5 !== actual[name]?.md5).sort();
}

/**
 * Loads the payload into `dir` (which must not hold a database) and proves it equals the
 * manifest. The dump holds the lock file of the process that made the backup: it is
 * replaced by `lock` (the restore's own, when restoring straight into a locked directory)
 * or removed.
 */
async function loadAndVerify(dir: string, backup: ReadBackup, lock: DataDirLock | null = null, options: { sync: boolean } = { sync: true }): Promise<void> {
  let client: PGlite;
  try {
    // Loaded without fsync (Postgres would fsync every file of the loaded dump at start); synced once below.
    client = await openClient({ dataDir: dir, snapshot: new Blob([backup.payload]), integrityChecks: true, durable: false });
  } catch (error) {
    const made = `PGlite ${backup.manifest.database.pgliteVersion}, Postgres ${backup.manifest.database.postgresVersion}`;
    throw new BackupRefused(
      `The backup's database cannot be opened by this Tributary (it was made with ${made}; this one has PGlite ${pgliteVersion()}): ${error instanceof Error ? error.message : String(error)}`,
    );
  }
  if (lock) lock.refresh();
  else rmSync(join(dir, LOCK_FILE_NAME), { force: true });
  try {
    await deepCheck(client);
    const differing = differingTables(backup.manifest.tables, await tableFingerprints(client));
    if (differing.length > 0) throw new BackupRefused(`The restored copy differs from what the backup recorded in ${differing.join(", ")}; the backup is damaged.`);
  } finally {
    // A clean shutdown: everything in the table files, nothing left to replay.
    await client.close();
  }
  if (options.sync) syncTree(dir);
}

/**
 * Restores a backup into `dataDir`. Refuses a damaged or foreign file, a backup of a
 * newer schema, a data directory in use, and one that holds anything unless `force`
 * (then the old directory is kept beside it, renamed). `check` verifies everything in
 * a temporary directory and writes nothing.
 */
export async function restoreBackup(file: string, dataDir: string, options: { force?: boolean; check?: boolean } = {}): Promise<RestoreResult> {
  const target = resolve(dataDir);
  const backup = readBackupFile(file);
  const { pending } = checkMigrationLevel(backup.manifest);
  const stamp = new Date().toISOString().replace(/[:.]/g, "-");
  const staging = `${target}.restoring-${process.pid}`;

  if (options.check) {
    rmSync(staging, { recursive: true, force: true });
    try {
      await loadAndVerify(staging, backup, null, { sync: false });
    } finally {
      rmSync(staging, { recursive: true, force: true });
    }
    return { dataDir: target, manifest: backup.manifest, pendingMigrations: pending, previousMovedTo: null, checkOnly: true };
  }

  const exists = existsSync(target);
  if (exists && !statSync(target).isDirectory()) throw new BackupRefused(`${target} is not a directory.`);
  // The lock is taken in the target itself, so a server that starts meanwhile is refused.
  const lock = exists ? lockOrRefuse(target, "restore") : null;
  try {
    const others = exists ? readdirSync(target).filter((name) => name !== LOCK_FILE_NAME) : [];
    if (others.length > 0 && !options.force) {
      throw new BackupRefused(
        `${target} is not empty${isDatabaseDir(target) ? " (it holds a database)" : ""}. Restore into an empty or new directory, or add --force to replace it (the current one is kept beside it, renamed).`,
      );
    }
    if (others.length === 0 && exists) {
      // An empty directory (perhaps a mount point): the backup goes straight into it, and is removed again on failure.
      try {
        await loadAndVerify(target, backup, lock);
      } catch (error) {
        for (const name of readdirSync(target)) if (name !== LOCK_FILE_NAME) rmSync(join(target, name), { recursive: true, force: true });
        // The dump may have brought its own lock file: ours again, so releasing it leaves the directory empty.
        lock?.refresh();
        throw error;
      }
      return { dataDir: target, manifest: backup.manifest, pendingMigrations: pending, previousMovedTo: null, checkOnly: false };
    }

    mkdirSync(dirname(target), { recursive: true });
    rmSync(staging, { recursive: true, force: true });
    try {
      await loadAndVerify(staging, backup);
    } catch (error) {
      rmSync(staging, { recursive: true, force: true });
      throw error;
    }
    let previousMovedTo: string | null = null;
    if (exists) {
      previousMovedTo = `${target}.replaced-${stamp}`;
      try {
        renameSync(target, previousMovedTo);
      } catch (error) {
        rmSync(staging, { recursive: true, force: true });
        throw new BackupRefused(
          `${target} cannot be moved aside (${(error as NodeJS.ErrnoException).code ?? String(error)}; is it a mount point?). Empty it yourself, then restore again. Nothing was changed.`,
        );
      }
      // The lock went with the old directory; it is removed there.
      lock?.release();
      try {
        unlinkSync(join(previousMovedTo, LOCK_FILE_NAME));
      } catch {
        // Already gone.
      }
    }
    renameSync(staging, target);
    syncPath(dirname(target));
    return { dataDir: target, manifest: backup.manifest, pendingMigrations: pending, previousMovedTo, checkOnly: false };
  } finally {
    lock?.release();
  }
}

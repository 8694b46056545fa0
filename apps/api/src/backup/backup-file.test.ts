// Backup and restore of a whole workspace: a fitted workspace with plans, flags, a lift
// test and an invitation is backed up from its data directory and restored into a new
// one, where every table's rows must equal the source's; damaged, foreign and newer
// files, a busy or non-empty data directory are refused without changing anything.
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { hostname, tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { readMigrationFiles } from "drizzle-orm/migrator";
import { migrationsFolder, openClient } from "../db/client";
import { fittedWorld, insertLiftTest, newFlag, newInvitation, scenarioInput } from "../testing/fitted-world";
import { repoRoot } from "../config";
import { BACKUP_MAGIC, BackupRefused, checkMigrationLevel, createBackup, readBackupFile, restoreBackup, type BackupManifest } from "./backup-file";
import { LOCK_FILE_NAME } from "./data-dir-lock";
import { workspaceTables } from "./integrity";

const root = mkdtempSync(join(tmpdir(), "tributary-backup-"));
const source = join(root, "source");
const backupFile = join(root, "workspace.tributary-backup");
let manifest: BackupManifest;

/** Every table's rows as text, sorted, and every sequence's position: the whole content of a data directory. */
async function contentOf(dataDir: string): Promise<Record<string, string[]>> {
  const client = await openClient({ dataDir });
  try {
    const content: Record<string, string[]> = {};
    for (const table of await workspaceTables(client)) {
      const quoted = table.split(".").map((part) => `"${part}"`).join(".");
      content[table] = (await client.query<{ row: string }>(`select t::text as row from ${quoted} t order by 1`)).rows.map((r) => r.row);
    }
    const sequences = await client.query<{ name: string; last: string | null }>(`select schemaname || '.' || sequencename as name, last_value::text as last from pg_sequences order by 1`);
    content["(sequences)"] = sequences.rows.map((s) => `${s.name}=${s.last}`);
    return content;
  } finally {
    await client.close();
  }
}

beforeAll(async () => {
  // A workspace with something of every kind, written to a data directory on disk.
  const world = await fittedWorld();
  try {
    const kv = world.cellId.get("Kestrova × Veltria")!;
    await world.agents.analyst.post("/api/plans/scenarios").send(await scenarioInput(world, [kv])).expect(201);
    await newFlag(world);
    await insertLiftTest(world);
    await newInvitation(world);
    const dump = await world.db.$client.dumpDataDir("gzip");
    const client = await openClient({ dataDir: source, snapshot: dump, durable: false });
    await client.close();
  } finally {
    await world.close();
  }
  manifest = (await createBackup(source, backupFile)).manifest;
}, 120_000);

afterAll(() => rmSync(root, { recursive: true, force: true }));

describe("a backup", () => {
  it("is one file: a first line naming the format, the manifest, then the data", () => {
    const bytes = readFileSync(backupFile);
    const [first, second] = bytes.subarray(0, 200_000).toString("latin1").split("\n");
    expect(first).toBe(`${BACKUP_MAGIC} 1`);
    expect(JSON.parse(second!)).toEqual(manifest);
    expect(bytes.length).toBe(first!.length + second!.length + 2 + manifest.payload.bytes);
    // Written whole or not at all: no temporary file is left beside it.
    expect(readdirSync(root).filter((name) => name.includes("partial"))).toEqual([]);
  });

  it("records the migration level, the versions and every table's rows", () => {
    const known = readMigrationFiles({ migrationsFolder }).map((m) => m.hash);
    expect(manifest.migrations).toEqual({ level: known.length, hashes: known });
    expect(manifest.database.engine).toBe("pglite");
    expect(manifest.database.postgresVersion).toMatch(/^\d+\.\d+/);
    expect(Object.keys(manifest.tables)).toContain("drizzle.__drizzle_migrations");
    expect(Object.keys(manifest.tables)).toEqual(expect.arrayContaining(["users", "dataset_rows", "runs", "run_draws", "plans", "flags", "lift_tests", "invitations", "audit_log", "outbox"]));
    for (const table of ["runs", "run_draws", "run_results", "plans", "flags", "lift_tests", "invitations", "dataset_rows"]) {
      expect(manifest.tables[table]!.rows, table).toBeGreaterThan(0);
    }
  });

  it("refuses to overwrite a file unless forced, and a directory without a database", async () => {
    await expect(createBackup(source, backupFile)).rejects.toThrow(/already exists; choose another file name, or add --force/);
    await expect(createBackup(join(root, "nowhere"), join(root, "other.tributary-backup"))).rejects.toThrow(/There is no Tributary database in/);
  });
});

describe("restoring a backup", () => {
  // An existing, empty directory (a mount point, say): the backup goes straight into it.
  const restored = join(root, "restored");

  it("gives back every table's rows and every sequence exactly", async () => {
    mkdirSync(restored);
    const result = await restoreBackup(backupFile, restored);
    expect(result).toMatchObject({ dataDir: restored, pendingMigrations: 0, previousMovedTo: null, checkOnly: false });
    expect(existsSync(join(restored, LOCK_FILE_NAME))).toBe(false);
    const [before, after] = [await contentOf(source), await contentOf(restored)];
    expect(Object.keys(after)).toEqual(Object.keys(before));
    for (const table of Object.keys(before)) expect(after[table], table).toEqual(before[table]);
    expect(before.runs!.length).toBeGreaterThan(1);
  });

  it("refuses a data directory that holds something, unless forced; forced, it keeps the old one beside it", async () => {
    writeFileSync(join(restored, "note.txt"), "mine");
    await expect(restoreBackup(backupFile, restored)).rejects.toThrow(/is not empty \(it holds a database\)\. .*add --force/);
    expect(readFileSync(join(restored, "note.txt"), "utf8")).toBe("mine");

    const forced = await restoreBackup(backupFile, restored, { force: true });
    expect(forced.previousMovedTo).toMatch(/restored\.replaced-/);
    expect(readFileSync(join(forced.previousMovedTo!, "note.txt"), "utf8")).toBe("mine");
    expect(existsSync(join(restored, "note.txt"))).toBe(false);
    expect(existsSync(join(restored, "PG_VERSION"))).toBe(true);
    expect(existsSync(join(forced.previousMovedTo!, LOCK_FILE_NAME))).toBe(false);
    expect(readdirSync(root).filter((name) => name.includes("restoring"))).toEqual([]);
  });

  it("with check, verifies the file and writes nothing", async () => {
    const target = join(root, "checked");
    const result = await restoreBackup(backupFile, target, { check: true });
    expect(result.checkOnly).toBe(true);
    expect(existsSync(target)).toBe(false);
    expect(readdirSync(root).filter((name) => name.includes("restoring"))).toEqual([]);
  });

  it("refuses a damaged, cut or foreign file, and writes nothing", async () => {
    const bytes = readFileSync(backupFile);
    const flipped = Buffer.from(bytes);
    flipped[bytes.length - 1000] = flipped[bytes.length - 1000]! ^ 0xff;
    const cases: [string, Uint8Array, RegExp][] = [
      ["flipped", flipped, /is damaged: its data do not match the checksum in its manifest/],
      ["cut", bytes.subarray(0, bytes.length - 5000), /is damaged: it holds \d+ bytes of data where its manifest says \d+ \(the file was cut short\)/],
      ["foreign", Buffer.from("week,brand,market\n2025-01-06,A,B\n"), /is not a Tributary backup \(it does not start with "TRIBUTARY-BACKUP"\)/],
      ["bad-manifest", Buffer.concat([Buffer.from(`${BACKUP_MAGIC} 1\n{"format":"tributary-backup"}\n`), bytes.subarray(100)]), /is damaged: its manifest cannot be read/],
      ["newer-format", Buffer.from(`${BACKUP_MAGIC} 9\n{}\n`), /was made by a newer Tributary \(backup format 9/],
    ];
    for (const [name, content, message] of cases) {
      const file = join(root, `${name}.tributary-backup`);
      writeFileSync(file, content);
      const target = join(root, `from-${name}`);
      await expect(restoreBackup(file, target), name).rejects.toThrow(message);
      expect(existsSync(target), name).toBe(false);
    }
    await expect(restoreBackup(join(root, "missing.tributary-backup"), join(root, "from-missing"))).rejects.toThrow(/missing\.tributary-backup does not exist\./);
  });

  it("refuses a backup of a newer or different schema history; an older one is brought up to date at the next start", () => {
    const known = manifest.migrations.hashes;
    const withLevel = (hashes: string[]): BackupManifest => ({ ...manifest, migrations: { level: hashes.length, hashes } });
    expect(() => checkMigrationLevel(withLevel([...known, "f".repeat(64)]), known)).toThrow(/made by a newer Tributary .*migration level 4, this version knows 3/);
    expect(() => checkMigrationLevel(withLevel(["0".repeat(64), ...known.slice(1)]), known)).toThrow(/history differs from this Tributary's at migration 1/);
    expect(checkMigrationLevel(withLevel(known.slice(0, 2)), known)).toEqual({ pending: 1 });
    expect(() => checkMigrationLevel({ ...manifest, migrations: { level: 5, hashes: known } }, known)).toThrow(BackupRefused);
  });

  it("checks the restored copy against the manifest's fingerprints", async () => {
    // A well-formed file whose manifest claims other content than its data hold.
    const { payload } = readBackupFile(backupFile);
    const tables = { ...manifest.tables, plans: { ...manifest.tables.plans!, rows: manifest.tables.plans!.rows + 1 } };
    const lie = { ...manifest, tables };
    const file = join(root, "lie.tributary-backup");
    writeFileSync(file, Buffer.concat([Buffer.from(`${BACKUP_MAGIC} 1\n${JSON.stringify(lie)}\n`), payload]));
    await expect(restoreBackup(file, join(root, "from-lie"))).rejects.toThrow(/The restored copy differs from what the backup recorded in plans/);
    expect(existsSync(join(root, "from-lie"))).toBe(false);
  });
});

describe("the backup and restore commands", () => {
  let holder: ChildProcess | null = null;
  afterAll(() => {
    holder?.kill("SIGKILL");
  });
  const run = (script: string, args: string[], dataDir: string) =>
    spawnSync(process.execPath, ["--import", "tsx", join(repoRoot, "apps/api/src/backup", script), ...args], {
      cwd: repoRoot,
      env: { ...process.env, DATA_DIR: dataDir, INIT_CWD: root },
      encoding: "utf8",
      timeout: 120_000,
    });

  it("back up and restore from the command line, with paths relative to where pnpm was run", () => {
    const made = run("backup-cli.ts", ["cli.tributary-backup"], source);
    expect(made.stderr).toBe("");
    expect(made.status).toBe(0);
    expect(made.stdout).toMatch(/^Backed up .* to .*cli\.tributary-backup \([\d.]+ MB\)\n {2}made .*\n {2}database: PGlite .*migration level \d+\n {2}\d+ tables, [\d,]+ rows: users \d+/);
    const restored = run("restore-cli.ts", ["cli.tributary-backup"], join(root, "cli-restored"));
    expect(restored.status).toBe(0);
    expect(restored.stdout).toMatch(/^Restored .*cli\.tributary-backup into .*cli-restored\n/);
    const refused = run("restore-cli.ts", ["missing.tributary-backup"], join(root, "cli-other"));
    expect(refused.status).toBe(1);
    expect(refused.stderr).toMatch(/^Nothing was restored: .*missing\.tributary-backup does not exist\./);
    const usage = run("restore-cli.ts", [], join(root, "cli-restored"));
    expect(usage.status).toBe(2);
    expect(usage.stderr).toMatch(/Give the backup file to restore\.\n\nUsage: pnpm restore <file>/);
  }, 120_000);

  it("refuse while another process (a running server) holds the data directory", async () => {
    holder = spawn("sleep", ["120"], { stdio: "ignore" });
    const lock = { pid: holder.pid, host: hostname(), purpose: "server", startedAt: new Date().toISOString(), bootId: null, processStart: null };
    writeFileSync(join(source, LOCK_FILE_NAME), JSON.stringify(lock));
    try {
      await expect(createBackup(source, join(root, "while-running.tributary-backup"))).rejects.toThrow(
        new RegExp(`A Tributary server \\(process ${holder.pid}, since .*\\) is using the data directory .*source\\. Stop it first`),
      );
      expect(existsSync(join(root, "while-running.tributary-backup"))).toBe(false);
      const target = join(root, "cli-restored");
      writeFileSync(join(target, LOCK_FILE_NAME), JSON.stringify(lock));
      await expect(restoreBackup(backupFile, target, { force: true })).rejects.toThrow(/A Tributary server .* is using the data directory/);
      expect(existsSync(join(target, "PG_VERSION"))).toBe(true);
    } finally {
      rmSync(join(source, LOCK_FILE_NAME), { force: true });
    }
  });
});

// Test databases cloned from a snapshot: creating and migrating a PGlite database takes
// seconds, loading a dumped one well under one. The snapshot is built once per source
// state (migrations, demo seed, the stats code that simulates the demo data) and cached
// in the system's temp directory, so every test file and worker reuses it.
import { createHash } from "node:crypto";
import { existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { repoRoot } from "../config";
import { closeDatabase, createDatabase, type Database } from "../db/client";
import { seedDemo } from "../demo/seed-demo";

export type SnapshotKind = "migrated" | "demo";

/** Everything the snapshot's content depends on (the demo data come from the stats package's simulation). */
const sourceRoots = [
  "apps/api/drizzle",
  "apps/api/src/demo",
  "apps/api/src/auth/password.ts",
  "packages/stats/src/simulate",
  "packages/stats/src/rng",
  "packages/stats/src/model/absolute-week.ts",
  "packages/stats/src/model/adstock.ts",
  "packages/stats/src/model/saturation.ts",
  "packages/stats/src/model/baseline.ts",
];

function filesUnder(path: string): string[] {
  if (!existsSync(path)) return [];
  if (statSync(path).isFile()) return [path];
  return readdirSync(path)
    .sort()
    .flatMap((name) => filesUnder(join(path, name)));
}

let sourceHash: string | null = null;
function hashOfSources(): string {
  if (sourceHash !== null) return sourceHash;
  const hash = createHash("sha256");
  for (const root of sourceRoots) {
    for (const file of filesUnder(join(repoRoot, root))) {
      if (file.endsWith(".test.ts")) continue;
      hash.update(file.slice(repoRoot.length));
      hash.update(readFileSync(file));
    }
  }
  sourceHash = hash.digest("hex").slice(0, 16);
  return sourceHash;
}

const inMemory = new Map<SnapshotKind, Promise<Blob>>();

async function buildSnapshot(kind: SnapshotKind): Promise<Blob> {
  const db = await createDatabase();
  try {
    if (kind === "demo") {
      const seed = await seedDemo(db);
      if (!seed.seeded) throw new Error(`demo seed failed: ${seed.reason}`);
    }
    return await db.$client.dumpDataDir("gzip");
  } finally {
    await closeDatabase(db);
  }
}

async function loadOrBuild(kind: SnapshotKind): Promise<Blob> {
  const dir = join(tmpdir(), "tributary-test-databases");
  const file = join(dir, `${kind}-${hashOfSources()}.tar.gz`);
  if (existsSync(file)) return new Blob([readFileSync(file)]);
  const blob = await buildSnapshot(kind);
  mkdirSync(dir, { recursive: true });
  // Write then rename, so a file another worker is writing is never read half-done.
  const partial = `${file}.${process.pid}.${Math.random().toString(36).slice(2)}.partial`;
  writeFileSync(partial, Buffer.from(await blob.arrayBuffer()));
  renameSync(partial, file);
  // Snapshots of older sources are never read again.
  for (const name of readdirSync(dir)) {
    if (name.startsWith(`${kind}-`) && name.endsWith(".tar.gz") && join(dir, name) !== file) rmSync(join(dir, name), { force: true });
  }
  return blob;
}

/**
 * A fresh database: "migrated" (empty tables) or "demo" (the demo workspace seeded),
 * in memory, or in `dataDir` (an empty directory) when given. Each call gives an
 * independent copy.
 */
export async function snapshotDatabase(kind: SnapshotKind, options: { dataDir?: string } = {}): Promise<Database> {
  let snapshot = inMemory.get(kind);
  if (!snapshot) {
    snapshot = loadOrBuild(kind);
    inMemory.set(kind, snapshot);
  }
  return createDatabase({ snapshot: await snapshot, dataDir: options.dataDir });
}

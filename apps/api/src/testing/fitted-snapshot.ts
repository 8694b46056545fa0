// A test database with fitted runs, cloned from a snapshot like the demo one: the demo
// workspace, the tiny dataset (Kestrova × Veltria, Kestrova × Solvera, Plumrise × Veltria;
// search and social), and two quick fits of it with different seeds — the first
// published, the second finished but not published (tests publish it to see what a new
// run changes). Fitting takes seconds, so the snapshot is built once per state of the
// code it depends on and cached in the system's temp directory.
import { createHash } from "node:crypto";
import { existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { asc, eq, isNotNull } from "drizzle-orm";
import { modelSettingsSchema } from "@tributary/contracts";
import { appDeps, createApp, shutdownApp } from "../app";
import { repoRoot } from "../config";
import { closeDatabase, createDatabase, type Database } from "../db/client";
import { modelSettings, runs, users } from "../db/schema";
import { demoUsers } from "../demo/users";
import { publishRun } from "../runs/publish-run";
import { snapshotDatabase } from "./database-snapshot";
import { quickFit, saveTinyDataset } from "./fit-fixtures";

export const FITTED_PUBLISH_REASON = "Quick fit for the tests; the convergence checks need more draws than this.";

/** What the fitted snapshot's results depend on. */
const sourceRoots = [
  "apps/api/drizzle",
  "apps/api/src/demo",
  "apps/api/src/jobs",
  "apps/api/src/runs",
  "apps/api/src/datasets",
  "apps/api/src/auth/password.ts",
  "apps/api/src/testing/fit-fixtures.ts",
  "apps/api/src/testing/fitted-snapshot.ts",
  "packages/stats/src",
  "packages/intake/src",
];

function filesUnder(path: string): string[] {
  if (!existsSync(path)) return [];
  if (statSync(path).isFile()) return [path];
  return readdirSync(path)
    .sort()
    .flatMap((name) => filesUnder(join(path, name)));
}

function hashOfSources(): string {
  const hash = createHash("sha256");
  for (const root of sourceRoots) {
    for (const file of filesUnder(join(repoRoot, root))) {
      if (file.endsWith(".test.ts")) continue;
      hash.update(file.slice(repoRoot.length));
      hash.update(readFileSync(file));
    }
  }
  return hash.digest("hex").slice(0, 16);
}

async function waitForSuccess(db: Database, runId: string): Promise<void> {
  for (let i = 0; i < 3000; i++) {
    const [row] = await db.select({ status: runs.status, reason: runs.failureReason }).from(runs).where(eq(runs.id, runId));
    if (row?.status === "succeeded") return;
    if (row && row.status !== "queued" && row.status !== "running") throw new Error(`the test fit ended ${row.status}: ${row.reason}`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  throw new Error("the test fit did not finish in time");
}

async function build(): Promise<Blob> {
  const db = await snapshotDatabase("demo");
  const app = createApp({ db, config: { logLevel: "silent" } });
  try {
    const deps = appDeps(app);
    const versionId = await saveTinyDataset(db);
    const [analyst] = await db.select({ id: users.id }).from(users).where(eq(users.email, demoUsers.analyst.email));
    const runIds: string[] = [];
    for (const seed of [quickFit.seed, quickFit.seed + 1]) {
      const settings = modelSettingsSchema.parse({ datasetVersionId: versionId, ...quickFit, seed });
      const [row] = await db.insert(modelSettings).values({ datasetVersionId: versionId, settings, createdBy: analyst!.id }).returning({ id: modelSettings.id });
      const runId = await deps.runs.start({ modelSettingsId: row!.id, userId: analyst!.id });
      await waitForSuccess(db, runId);
      runIds.push(runId);
    }
    await publishRun(db, runIds[0]!, analyst!.id, FITTED_PUBLISH_REASON);
    await shutdownApp(app);
    return await db.$client.dumpDataDir("gzip");
  } finally {
    await closeDatabase(db);
  }
}

let cached: Promise<Blob> | null = null;

async function loadOrBuild(): Promise<Blob> {
  const dir = join(tmpdir(), "tributary-test-databases");
  const file = join(dir, `fitted-${hashOfSources()}.tar.gz`);
  if (existsSync(file)) return new Blob([readFileSync(file)]);
  const blob = await build();
  mkdirSync(dir, { recursive: true });
  const partial = `${file}.${process.pid}.${Date.now()}.partial`;
  writeFileSync(partial, Buffer.from(await blob.arrayBuffer()));
  renameSync(partial, file);
  for (const name of readdirSync(dir)) {
    if (name.startsWith("fitted-") && name.endsWith(".tar.gz") && join(dir, name) !== file) rmSync(join(dir, name), { force: true });
  }
  return blob;
}

export interface FittedDatabase {
  readonly db: Database;
  /** The published run (seed quickFit.seed). */
  readonly publishedRunId: string;
  /** A finished run of the same data and settings with the next seed, not published. */
  readonly secondRunId: string;
}

/** A fresh in-memory copy of the fitted snapshot. */
export async function fittedDatabase(): Promise<FittedDatabase> {
  cached ??= loadOrBuild();
  const db = await createDatabase({ snapshot: await cached });
  const rows = await db.select({ id: runs.id, publishedAt: runs.publishedAt }).from(runs).where(isNotNull(runs.finishedAt)).orderBy(asc(runs.createdAt));
  const published = rows.find((r) => r.publishedAt !== null);
  const second = rows.find((r) => r.publishedAt === null);
  if (!published || !second) throw new Error("the fitted snapshot lacks its runs");
  return { db, publishedRunId: published.id, secondRunId: second.id };
}

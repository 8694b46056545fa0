// Crash safety of the real server: it is started as a child process on a temporary data
// directory and killed with SIGKILL (no shutdown code runs) at chosen moments — right
// after a dataset save has committed, in the middle of a dataset save's transaction
// (held there by the TRIBUTARY_TEST_HOLD hook, see test-hold.ts), and while a fit is
// sampling. After each kill the database must open, every table and index must verify,
// a dataset version must be whole or absent, and the fit must be marked interrupted and
// restart to completion.
import { existsSync, mkdtempSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { PGlite } from "@electric-sql/pglite";
import { afterAll, describe, expect, it } from "vitest";
import { z } from "zod";
import { datasetVersionDetailSchema, datasetVersionSchema, runSchema, uploadCreatedSchema, uploadValidationSchema, type Run } from "@tributary/contracts";
import { openClient } from "../db/client";
import { demoUsers } from "../demo/users";
import { quickFit, tinyCsv } from "../testing/fit-fixtures";
import { acquireDataDirLock, LOCK_FILE_NAME } from "./data-dir-lock";
import { deepCheck } from "./integrity";
import { ApiClient, pollUntil, spawnServer, type ServerProcess } from "./server-process";
import { TEST_HOLD_LINE, TEST_HOLD_VARIABLE } from "./test-hold";

const BIG_FILE = "crash-big.csv";
const TINY_FILE = "crash-tiny.csv";
/** Brands and markets that only the big file names: none may exist after its save was killed. */
const bigBrands = 12;
const bigMarkets = 10;
const bigWeeks = 156;

/** An invented portfolio of 120 cells × 156 weeks (18,720 rows, about 1 MB): its save writes 38 batches of rows. */
function bigCsv(): { text: string; rows: number } {
  let state = 20_240_611;
  // A small linear congruential generator: the file is the same on every run.
  const next = () => (state = (Math.imul(state, 1_103_515_245) + 12_345) >>> 0) / 2 ** 32;
  const lines = ["week,brand,market,new_customers,spend_search,spend_social,spend_tv"];
  const firstMonday = Date.UTC(2022, 0, 3);
  for (let b = 1; b <= bigBrands; b++) {
    for (let m = 1; m <= bigMarkets; m++) {
      for (let w = 0; w < bigWeeks; w++) {
        const week = new Date(firstMonday + w * 7 * 86_400_000).toISOString().slice(0, 10);
        const spend = [next() * 5000, next() * 3000, next() * 9000].map((x) => x.toFixed(2));
        lines.push(`${week},Crashtest brand ${b},Crashtest market ${m},${Math.round(200 + next() * 300)},${spend.join(",")}`);
      }
    }
  }
  return { text: `${lines.join("\n")}\n`, rows: lines.length - 1 };
}

async function upload(client: ApiClient, fileName: string, text: string) {
  const form = new FormData();
  form.append("file", new Blob([text], { type: "text/csv" }), fileName);
  const created = uploadCreatedSchema.parse(await client.json("POST", "/api/uploads", form, 201));
  const validation = uploadValidationSchema.parse(await client.json("POST", `/api/uploads/${created.uploadId}/validate`, { mapping: created.guess }));
  expect(validation.report.ok, JSON.stringify(validation.report.errors.slice(0, 3))).toBe(true);
  return { uploadId: created.uploadId, mapping: validation.mapping, rowCount: created.rowCount };
}

/** Opens the data directory in this process (as a restarted server would) and checks it through and through. */
async function verifyDataDir(dataDir: string, check: (client: PGlite) => Promise<void>): Promise<void> {
  const lock = acquireDataDirLock(dataDir, "crash test");
  try {
    const client = await openClient({ dataDir, integrityChecks: true });
    try {
      const report = await deepCheck(client);
      expect(report.indexes).toBeGreaterThan(20);
      expect(report.rows.users).toBeGreaterThan(0);
      // Every dataset version holds exactly the rows its validation report declared.
      const versions = await client.query<{ file_name: string; declared: number; stored: number }>(
        `select v.file_name, (v.validation_report->'summary'->>'rows')::int as declared,
                (select count(*)::int from dataset_rows r where r.dataset_version_id = v.id) as stored
           from dataset_versions v order by v.number`,
      );
      expect(versions.rows.length).toBeGreaterThan(0);
      for (const version of versions.rows) expect(version.stored, version.file_name).toBe(version.declared);
      await check(client);
    } finally {
      await client.close();
    }
  } finally {
    lock.release();
  }
}

const dataDir = mkdtempSync(join(tmpdir(), "tributary-crash-"));
const started: ServerProcess[] = [];
function start(env: Record<string, string> = {}): ServerProcess {
  const server = spawnServer({ dataDir, env: { FIT_CHAIN_THREADS: "1", ...env } });
  started.push(server);
  return server;
}

afterAll(async () => {
  for (const server of started) await server.kill();
  rmSync(dataDir, { recursive: true, force: true });
}, 60_000);

describe("the server killed with SIGKILL", () => {
  let tinyVersionId = "";
  let running: ServerProcess | null = null;
  let runningBase = "";

  it("keeps a committed dataset version whole and leaves no trace of a save killed mid-transaction", async () => {
    // First start: the demo workspace; a small dataset saved, then the server killed at once.
    const first = start();
    let analyst = await ApiClient.signIn(await first.ready, demoUsers.analyst);
    const tiny = await upload(analyst, TINY_FILE, tinyCsv());
    const saved = datasetVersionDetailSchema.parse(await analyst.json("POST", `/api/uploads/${tiny.uploadId}/save`, { mapping: tiny.mapping }, 201));
    tinyVersionId = saved.id;
    expect(await first.kill()).toBe("SIGKILL");

    // Second start, held before the 3rd batch of rows of the next save: the big file's save is then mid-transaction.
    const second = start({ [TEST_HOLD_VARIABLE]: 'insert into "dataset_rows"#3' });
    analyst = await ApiClient.signIn(await second.ready, demoUsers.analyst);
    const big = bigCsv();
    const bigUpload = await upload(analyst, BIG_FILE, big.text);
    expect(bigUpload.rowCount).toBe(big.rows);
    const save = analyst.request("POST", `/api/uploads/${bigUpload.uploadId}/save`, { mapping: bigUpload.mapping }).then(
      (response) => response.status,
      () => "no answer" as const,
    );
    await second.waitForOutput(new RegExp(TEST_HOLD_LINE), 120_000);
    expect(await second.kill()).toBe("SIGKILL");
    expect(await save).toBe("no answer");

    // The files as the kill left them: they open (Postgres replays its log), verify, and hold the first save whole and nothing of the second.
    await verifyDataDir(dataDir, async (client) => {
      const files = await client.query<{ file_name: string; stored: number }>(
        `select v.file_name, (select count(*)::int from dataset_rows r where r.dataset_version_id = v.id) as stored from dataset_versions v where v.file_name in ($1, $2)`,
        [TINY_FILE, BIG_FILE],
      );
      expect(files.rows).toEqual([{ file_name: TINY_FILE, stored: tiny.rowCount }]);
      const leftovers = await client.query<{ n: number }>(`select (select count(*) from brands where name like 'Crashtest%') + (select count(*) from markets where name like 'Crashtest%') as n`);
      expect(Number(leftovers.rows[0]!.n)).toBe(0);
      const audit = await client.query<{ action: string }>(`select action from audit_log where details->>'fileName' = $1 order by id`, [BIG_FILE]);
      // The upload itself was recorded before the save began; the save was not.
      expect(audit.rows.map((row) => row.action)).toEqual(["data_uploaded"]);
    });

    // The server starts again on the same directory (the dead process's lock is taken over) and lists the first save only.
    running = start();
    runningBase = await running.ready;
    analyst = await ApiClient.signIn(runningBase, demoUsers.analyst);
    const list = z.array(datasetVersionSchema).parse(await analyst.json("GET", "/api/datasets"));
    expect(list.map((version) => version.fileName)).toContain(TINY_FILE);
    expect(list.map((version) => version.fileName)).not.toContain(BIG_FILE);
    // While it runs, a second server on the same directory is refused with a clear message.
    const intruder = start();
    expect(await intruder.exited).toBe(1);
    expect(intruder.output()).toMatch(/A Tributary server \(process \d+, since .*\) is using the data directory/);
  }, 360_000);

  it("marks a fit killed while sampling as interrupted, with a reason, and restarts it to completion", async () => {
    if (!running) throw new Error("the first test did not leave a server running");
    const analyst = await ApiClient.signIn(runningBase, demoUsers.analyst);
    // Long enough to be caught while sampling on a busy machine, short enough to finish quickly when restarted.
    const settings = await analyst.json<{ id: string }>("POST", "/api/model-settings", { datasetVersionId: tinyVersionId, ...quickFit, draws: 300 }, 201);
    const run = runSchema.parse(await analyst.json("POST", "/api/runs", { modelSettingsId: settings.id }, 201));
    const sampling = await pollUntil(
      "the fit to sample",
      async () => {
        const now = runSchema.parse(await analyst.json("GET", `/api/runs/${run.id}`));
        if (now.status !== "queued" && now.status !== "running") throw new Error(`the fit ended (${now.status}) before it could be killed`);
        return now.progress?.chains.some((chain) => chain.phase === "sampling" && chain.iteration < chain.total) ? now : undefined;
      },
      120_000,
      50,
    );
    expect(sampling.status).toBe("running");
    expect(await running.kill()).toBe("SIGKILL");

    const fourth = start();
    const client = await ApiClient.signIn(await fourth.ready, demoUsers.analyst);
    await fourth.waitForOutput(/Marked 1 fit run\(s\) as interrupted/, 10_000);
    const interrupted = runSchema.parse(await client.json("GET", `/api/runs/${run.id}`));
    expect(interrupted.status).toBe("interrupted");
    expect(interrupted.failureReason).toMatch(/^The server stopped while this run was queued or running\. Restart it/);
    expect(interrupted.finishedAt).not.toBeNull();

    const restarted = runSchema.parse(await client.json("POST", `/api/runs/${run.id}/restart`, undefined, 201));
    expect(restarted.restartedFromRunId).toBe(run.id);
    expect(restarted.seed).toBe(run.seed);
    const finished = await pollUntil<Run>(
      "the restarted fit to finish",
      async () => {
        const now = runSchema.parse(await client.json("GET", `/api/runs/${restarted.id}`));
        return now.status === "queued" || now.status === "running" ? undefined : now;
      },
      240_000,
      500,
    );
    expect(finished.status, finished.failureReason ?? "").toBe("succeeded");
    const old = runSchema.parse(await client.json("GET", `/api/runs/${run.id}`));
    expect(old.restartedByRunId).toBe(restarted.id);
    const results = await client.request("GET", `/api/runs/${restarted.id}/results`);
    expect(results.status).toBe(200);
    expect(await fourth.stop()).toBe(0);

    await verifyDataDir(dataDir, async (db) => {
      const runs = await db.query<{ id: string; status: string; results: number; draws: number }>(
        `select r.id, r.status, (select count(*)::int from run_results x where x.run_id = r.id) as results,
                (select count(*)::int from run_draws d where d.run_id = r.id) as draws
           from runs r where r.id in ($1, $2) order by r.created_at`,
        [run.id, restarted.id],
      );
      expect(runs.rows.map((row) => [row.status, row.results, row.draws > 0])).toEqual([
        ["interrupted", 0, false],
        ["succeeded", 2, true],
      ]);
    });
  }, 360_000);

  it("refuses to start on damaged files, saying what happened and how to restore a backup", async () => {
    // Postgres's control file zeroed, as a disk fault might leave it.
    const control = join(dataDir, "global", "pg_control");
    writeFileSync(control, Buffer.alloc(statSync(control).size));
    const server = start();
    expect(await server.exited).toBe(1);
    expect(server.output()).toMatch(/Tributary did not start: the database in .* cannot be opened or read \(.+\)\.\nIts files may be damaged/);
    expect(server.output()).toMatch(/pnpm restore <backup file> --force/);
    // The lock is released on the way out.
    expect(existsSync(join(dataDir, LOCK_FILE_NAME))).toBe(false);
  }, 120_000);
});

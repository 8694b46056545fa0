// Starts Tributary: opens (or creates) the database, seeds the demo into an empty one,
// serves the API and the built web app. Settings come from the environment (README).
import { existsSync, mkdirSync } from "node:fs";
import { join } from "node:path";
import { appDeps, createApp, shutdownApp } from "./app";
import { acquireDataDirLock, DataDirLocked } from "./backup/data-dir-lock";
import { dataDirFromEnv } from "./backup/data-dir";
import { tableRowCounts, unopenableMessage } from "./backup/integrity";
import { holdingObserver, testHoldFromEnv } from "./backup/test-hold";
import { publishedRunIds } from "./dashboards/dashboard-context";
import { demoFitModeFromEnv, queueDemoFit, resumeDemoFit } from "./demo/demo-fit";
import { configFromEnv, repoRoot } from "./config";
import { closeDatabase, createDatabase, type Database } from "./db/client";
import { seedDemo } from "./demo/seed-demo";
import { notifyRunPublished } from "./mail/run-published";
import { markInterruptedRuns } from "./runs/run-service";

async function main(): Promise<void> {
  const port = Number(process.env.PORT || 3000);
  if (!Number.isInteger(port) || port < 0 || port > 65_535) throw new Error(`PORT must be a port number, got "${process.env.PORT}"`);
  const dataDir = dataDirFromEnv(process.env);
  const webDist = join(repoRoot, "apps", "web", "dist");
  const webDistDir = existsSync(join(webDist, "index.html")) ? webDist : null;
  const config = configFromEnv(process.env, webDistDir);
  const demoFit = demoFitModeFromEnv(process.env);

  const hold = testHoldFromEnv(process.env);

  // One process per data directory: a second server (or a backup, a restore) would overwrite its files.
  mkdirSync(dataDir, { recursive: true });
  const lock = acquireDataDirLock(dataDir, "server");
  process.once("exit", () => lock.release());
  let db: Database;
  try {
    db = await createDatabase({ dataDir, onQuery: hold ? holdingObserver(hold) : undefined });
    // Every table is read once, so damaged files stop the start with a clear message rather than a later request.
    await tableRowCounts(db.$client);
  } catch (error) {
    throw new Error(unopenableMessage(dataDir, error));
  }
  const seed = await seedDemo(db);
  if (seed.seeded) console.log(`Created the demo workspace in ${dataDir}`);
  const interrupted = await markInterruptedRuns(db);
  if (interrupted > 0) console.log(`Marked ${interrupted} fit run(s) as interrupted (the server stopped while they were running); restart them from the Runs screen`);
  if (!webDistDir) console.warn(`The web app is not built (no ${webDist}/index.html): run \`pnpm build\`. Serving the API only.`);

  const app = createApp({ db, config });
  const deps = appDeps(app);
  // Links in e-mails sent outside a request: PUBLIC_URL, else the address the server listens at.
  let baseUrl = config.publicUrl ?? `http://localhost:${port}`;
  const demoFitDeps = {
    db,
    runs: deps.runs,
    dashboards: deps.dashboards,
    onPublished: (runId: string) => notifyRunPublished(db, deps.mailer, runId, baseUrl),
  };
  if (seed.seeded) {
    const queued = await queueDemoFit(demoFitDeps, demoFit);
    if (queued) console.log(`Fitting the demo portfolio (DEMO_FIT=${demoFit}); it is published when it finishes. Progress: GET /api/dashboards/status`);
  } else {
    const resumed = await resumeDemoFit(demoFitDeps, demoFit);
    if (resumed.action === "published") console.log("Published the demo's first fit, which finished before the server stopped");
    if (resumed.action === "restarted") console.log("Restarted the demo's first fit, which the server stopped while it ran");
  }
  // The dashboards' numbers of the current run, computed before the first request.
  const { current } = await publishedRunIds(db);
  if (current) deps.dashboards.warm(current);
  const server = app.listen(port, () => {
    const address = server.address();
    const actualPort = typeof address === "object" && address ? address.port : port;
    if (!config.publicUrl) baseUrl = `http://localhost:${actualPort}`;
    console.log(`Tributary is running at http://localhost:${actualPort}`);
  });

  const shutdown = () => {
    // Running fits are ended; the next start marks them interrupted so they can be restarted.
    server.close(() => void shutdownApp(app).then(() => closeDatabase(db)).finally(() => process.exit(0)));
    server.closeAllConnections();
    setTimeout(() => process.exit(1), 5_000).unref();
  };
  process.once("SIGINT", shutdown);
  process.once("SIGTERM", shutdown);
}

main().catch((error: unknown) => {
  console.error(error instanceof DataDirLocked ? `Tributary did not start: ${error.message}` : error instanceof Error ? error.message : error);
  process.exit(1);
});

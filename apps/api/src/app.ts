// Builds the Express app (no listen): tests drive it with supertest, server.ts serves it.
import { join } from "node:path";
import express, { type Express } from "express";
import type { Logger } from "pino";
import { mountRoutes } from "./access/mount-routes";
import type { AppDeps, Route } from "./access/route-table";
import { createAuth } from "./auth/lucia";
import { sameSiteWrites, sessionTokenOnWrites } from "./auth/csrf";
import { authenticate } from "./auth/session";
import { defaultConfig, type AppConfig } from "./config";
import type { Database } from "./db/client";
import { apiNotFound, errorHandler } from "./http/error-handler";
import { createLogger, requestLogger } from "./http/request-log";
import { refuseUnstorableText } from "./http/request-text";
import { securityHeaders } from "./http/security-headers";
import type { Mailer } from "./mail/mailer";
import { createMailer } from "./mail/smtp";
import type { FitJobInput, FitJobOutput, FitJobProgress, FitJobRunner, FitWorkerOptions } from "./jobs/fit-job";
import { LocalJobRunner } from "./jobs/local-job-runner";
import { DashboardCache } from "./dashboards/dashboard-cache";
import { routeTable } from "./routes";
import { RunService } from "./runs/run-service";
import { UploadStore } from "./uploads/upload-store";

export interface CreateAppOptions {
  readonly db: Database;
  readonly mailer?: Mailer;
  readonly config?: Partial<AppConfig>;
  readonly logger?: Logger;
  /** Replaces the route table (tests of the authorization layer). */
  readonly routes?: readonly Route[];
  /** Runs fit jobs; by default on worker threads of this process (see jobs/). */
  readonly jobRunner?: FitJobRunner;
}

const appDepsKey = Symbol.for("tributary.appDeps");

/** The services an app was built with (tests and the server reach the run service through it). */
export function appDeps(app: Express): AppDeps {
  const deps = (app.locals as Record<symbol, AppDeps | undefined>)[appDepsKey];
  if (!deps) throw new Error("this Express app was not built by createApp");
  return deps;
}

/** Ends the app's background work (fit jobs, worker threads); call before closing its database. */
export async function shutdownApp(app: Express): Promise<void> {
  await appDeps(app).runs.close();
}

/** The local job runner for fits, sized by the config. */
export function localFitRunner(config: AppConfig): FitJobRunner {
  const options: FitWorkerOptions = { chainThreads: config.fitChainThreads };
  return new LocalJobRunner<FitJobInput, FitJobProgress, FitJobOutput>({
    workerEntry: new URL("./jobs/fit-worker.ts", import.meta.url),
    concurrency: config.fitConcurrency,
    workerOptions: options,
    describeExit: (code) => `The fit stopped unexpectedly (its worker thread exited with code ${code}); it may have run out of memory`,
  });
}

export function createApp(options: CreateAppOptions): Express {
  const config: AppConfig = { ...defaultConfig, ...options.config };
  const logger = options.logger ?? createLogger(config.logLevel);
  const deps: AppDeps = {
    db: options.db,
    config,
    auth: createAuth(options.db, config),
    mailer: options.mailer ?? createMailer(options.db, config.smtp),
    uploads: new UploadStore({ ttlMs: config.uploadTtlMinutes * 60_000 }),
    runs: new RunService(options.db, options.jobRunner ?? localFitRunner(config), logger),
    dashboards: new DashboardCache(options.db, { log: logger }),
  };

  const app = express();
  (app.locals as Record<symbol, AppDeps>)[appDepsKey] = deps;
  app.set("trust proxy", config.trustProxy);
  app.disable("x-powered-by");
  // Request id, method, path and status (and the user id once signed in): no headers, cookies or bodies.
  app.use(requestLogger(logger));
  app.use(securityHeaders());

  // Writes from another site are refused before anything is read; with a session they need its token.
  app.use("/api", sameSiteWrites, express.json({ limit: "1mb" }), refuseUnstorableText, authenticate(deps.auth, deps.db), sessionTokenOnWrites);
  app.use(mountRoutes(options.routes ?? routeTable, deps));
  app.use("/api", apiNotFound);

  if (config.webDistDir) {
    const webDistDir = config.webDistDir;
    app.use(express.static(webDistDir, { index: false }));
    app.get("/{*splat}", (_req, res) => res.sendFile(join(webDistDir, "index.html")));
  }
  app.use(apiNotFound);
  app.use(errorHandler);
  return app;
}

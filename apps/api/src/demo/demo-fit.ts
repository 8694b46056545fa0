// The demo's first fit: at the first start of an empty database (after the demo seed)
// the demo dataset is fitted with the default settings (DEMO_FIT=quick: fewer
// iterations, for tests) as the analyst, and published automatically when it finishes,
// so the dashboards have numbers. A fit that fails the convergence checks is published
// with a reason saying so. Until then GET /api/dashboards/status reports its progress.
import { and, asc, desc, eq, isNotNull } from "drizzle-orm";
import type { Logger } from "pino";
import { modelSettingsSchema, type DashboardStatus } from "@tributary/contracts";
import type { DashboardCache } from "../dashboards/dashboard-cache";
import type { Database, Queryable } from "../db/client";
import { auditLog, datasetVersions, modelSettings, runs, users } from "../db/schema";
import { publishRun } from "../runs/publish-run";
import { runRecord } from "../runs/run-queries";
import type { RunService } from "../runs/run-service";
import { demoSeed } from "./demo-design";
import { demoFileName } from "./seed-demo";

export const demoFitModes = ["off", "quick", "full"] as const;
export type DemoFitMode = (typeof demoFitModes)[number];

/** DEMO_FIT from the environment (default full); a clear error for anything else. */
export function demoFitModeFromEnv(env: NodeJS.ProcessEnv): DemoFitMode {
  const raw = env.DEMO_FIT;
  if (raw === undefined || raw === "") return "full";
  if ((demoFitModes as readonly string[]).includes(raw)) return raw as DemoFitMode;
  throw new Error(`DEMO_FIT must be off, quick or full, got "${raw}"`);
}

/** DEMO_FIT=quick: a short fit for tests and end-to-end runs (its numbers are rough). */
export const quickDemoFitSettings = { chains: 2, warmup: 150, draws: 150 } as const;

/** Audit action marking a run as the demo's first fit (its target is the run). */
export const DEMO_FIT_ACTION = "demo_fit_queued";

export const demoAutoPublishReason =
  "Published automatically at the first start so that the demo has numbers to show. This fit did not pass every convergence check: do not use it for decisions (the demo portfolio is invented anyway).";

export interface DemoFitDeps {
  readonly db: Database;
  readonly runs: RunService;
  readonly dashboards?: DashboardCache;
  readonly log?: Logger;
  /** Called after the demo fit is published (the server sends the same e-mails a publish from the Runs screen does). */
  readonly onPublished?: (runId: string) => Promise<void>;
}

async function anyPublished(db: Queryable): Promise<boolean> {
  const [row] = await db.select({ id: runs.id }).from(runs).where(isNotNull(runs.publishedAt)).limit(1);
  return row !== undefined;
}

/** The user the demo fit runs and publishes as: the first analyst (else the first admin). */
async function demoFitUser(db: Queryable): Promise<string | null> {
  for (const role of ["analyst", "admin"] as const) {
    const [row] = await db.select({ id: users.id }).from(users).where(and(eq(users.role, role), eq(users.disabled, false))).orderBy(asc(users.createdAt)).limit(1);
    if (row) return row.id;
  }
  return null;
}

async function demoDatasetVersionId(db: Queryable): Promise<string | null> {
  const [row] = await db.select({ id: datasetVersions.id }).from(datasetVersions).where(eq(datasetVersions.fileName, demoFileName)).orderBy(asc(datasetVersions.number)).limit(1);
  return row?.id ?? null;
}

/** The latest run marked as the demo's first fit. */
async function latestDemoFitRunId(db: Queryable): Promise<string | null> {
  const [row] = await db.select({ target: auditLog.target }).from(auditLog).where(eq(auditLog.action, DEMO_FIT_ACTION)).orderBy(desc(auditLog.id)).limit(1);
  return row?.target?.startsWith("run:") ? row.target.slice(4) : null;
}

/** Publishes the demo fit when nobody has published a run yet (an analyst's own choice wins). */
async function autoPublish(deps: DemoFitDeps, runId: string, userId: string): Promise<boolean> {
  if (await anyPublished(deps.db)) return false;
  const run = await runRecord(deps.db, runId);
  if (run.status !== "succeeded") return false;
  await publishRun(deps.db, runId, userId, run.trust.trustworthy === true ? undefined : demoAutoPublishReason, { automatic: true, demoFit: true });
  deps.dashboards?.warm(runId);
  deps.log?.info({ runId, trustworthy: run.trust.trustworthy }, "published the demo's first fit");
  await deps.onPublished?.(runId);
  return true;
}

/**
 * Publishes the run when it finishes successfully; the promise settles once that is
 * done (true) or the run ended another way (false).
 */
export function watchDemoFit(deps: DemoFitDeps, runId: string, userId: string): Promise<boolean> {
  return new Promise<boolean>((resolve) => {
    let settled = false;
    const finish = (run: { status: string }) => {
      if (settled) return;
      settled = true;
      off();
      const outcome = run.status === "succeeded" ? autoPublish(deps, runId, userId) : Promise.resolve(false);
      outcome.then(resolve, (error: unknown) => {
        deps.log?.error({ err: error instanceof Error ? { message: error.message } : error, runId }, "publishing the demo's first fit failed");
        resolve(false);
      });
    };
    const off = deps.runs.subscribe(runId, (event) => {
      if (event.type === "run" && event.finished) finish(event.run);
    });
    // It may have finished before the subscription.
    void runRecord(deps.db, runId).then((run) => {
      if (run.status !== "queued" && run.status !== "running") finish(run);
    });
  });
}

export interface QueuedDemoFit {
  readonly runId: string;
  /** Settles when the run has ended and, if it succeeded, been published. */
  readonly published: Promise<boolean>;
}

/**
 * Queues the demo's first fit (default settings; quick: fewer iterations) as the analyst
 * and publishes it when it finishes. `datasetVersionId` defaults to the demo dataset.
 */
export async function queueDemoFit(deps: DemoFitDeps, mode: DemoFitMode, options: { datasetVersionId?: string } = {}): Promise<QueuedDemoFit | null> {
  if (mode === "off") return null;
  const userId = await demoFitUser(deps.db);
  const datasetVersionId = options.datasetVersionId ?? (await demoDatasetVersionId(deps.db));
  if (!userId || !datasetVersionId) return null;
  const settings = modelSettingsSchema.parse({ datasetVersionId, seed: demoSeed, ...(mode === "quick" ? quickDemoFitSettings : {}) });
  const settingsId = await deps.db.transaction(async (tx) => {
    const [row] = await tx.insert(modelSettings).values({ datasetVersionId, settings, createdBy: userId }).returning({ id: modelSettings.id });
    await tx.insert(auditLog).values({ userId, action: "model_settings_saved", target: `model_settings:${row!.id}`, details: { datasetVersionId, demoFit: mode } });
    return row!.id;
  });
  const runId = await deps.runs.start({ modelSettingsId: settingsId, userId });
  await deps.db.insert(auditLog).values({ userId, action: DEMO_FIT_ACTION, target: `run:${runId}`, details: { mode } });
  return { runId, published: watchDemoFit(deps, runId, userId) };
}

/**
 * At a later start: if the demo's first fit was never published and nobody has published
 * a run, publish it (it finished just before the server stopped) or restart it (the
 * server stopped while it ran). Returns what was done.
 */
export async function resumeDemoFit(deps: DemoFitDeps, mode: DemoFitMode): Promise<{ action: "none" | "published" | "restarted"; runId: string | null; published?: Promise<boolean> }> {
  if (mode === "off" || (await anyPublished(deps.db))) return { action: "none", runId: null };
  const runId = await latestDemoFitRunId(deps.db);
  const userId = await demoFitUser(deps.db);
  if (!runId || !userId) return { action: "none", runId: null };
  const run = await runRecord(deps.db, runId);
  if (run.status === "succeeded") return { action: (await autoPublish(deps, runId, userId)) ? "published" : "none", runId };
  if (run.status === "interrupted" && !run.restartedByRunId) {
    const restarted = await deps.runs.restart(runId, userId);
    await deps.db.insert(auditLog).values({ userId, action: DEMO_FIT_ACTION, target: `run:${restarted}`, details: { mode, restartedFromRunId: runId } });
    return { action: "restarted", runId: restarted, published: watchDemoFit(deps, restarted, userId) };
  }
  return { action: "none", runId };
}

/**
 * The demo's first fit as GET /api/dashboards/status reports it; null once a run is
 * published or without one. A failure reason may name any cell, so it is given only to
 * those who see every market (`seesAllMarkets`).
 */
export async function demoFitStatus(deps: DemoFitDeps, published: boolean, seesAllMarkets = true): Promise<DashboardStatus["firstFit"]> {
  if (published) return null;
  const runId = await latestDemoFitRunId(deps.db);
  if (!runId) return null;
  const run = await runRecord(deps.db, runId, deps.runs.live);
  const fraction = run.status === "succeeded" ? 1 : (run.progress?.fraction ?? 0);
  const percent = Math.floor(100 * fraction);
  const message =
    run.status === "queued"
      ? "The first fit is waiting to start"
      : run.status === "running"
        ? `The first fit is running — ${percent} % done`
        : run.status === "succeeded"
          ? "The first fit has finished and is being published"
          : run.status === "failed"
            ? seesAllMarkets
              ? `The first fit failed: ${run.failureReason ?? "no reason was given"}`
              : "The first fit failed; an analyst can fit the data again on the Runs screen"
            : run.status === "cancelled"
              ? "The first fit was cancelled; start a fit on the Runs screen"
              : "The first fit was interrupted when the server stopped; it starts again at the next start of the server";
  return { runId, status: run.status, fraction, etaSeconds: run.progress?.etaSeconds ?? null, message };
}

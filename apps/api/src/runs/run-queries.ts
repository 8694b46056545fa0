// Runs as the API sends them, read from the database with the job runner's live progress
// layered on top while a run is queued or running.
import { and, desc, eq, inArray, isNotNull, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import type { FitDiagnosticsView, ModelSettings, Run, RunProgress, RunStatus } from "@tributary/contracts";
import type { MarketScope } from "../access/route-table";
import type { Queryable } from "../db/client";
import { readThroughGeneration } from "../db/data-generation";
import { datasetVersions, modelSettings, runs, users } from "../db/schema";
import type { JobSnapshot } from "../jobs/job-runner";
import type { FitJobProgress } from "../jobs/fit-job";
import { NotFound } from "../http/errors";

const publishers = alias(users, "publishers");

/** Progress as the Runs screen shows it, from the runner's snapshot. */
export function runProgressOf(snapshot: JobSnapshot<FitJobProgress>, now = Date.now()): RunProgress {
  const updatedAt = new Date(now).toISOString();
  if (snapshot.state === "queued") {
    return { stage: "queued", queuePosition: snapshot.queuePosition, chains: [], fraction: 0, elapsedSeconds: (now - snapshot.queuedAt) / 1000, etaSeconds: null, updatedAt };
  }
  const p = snapshot.progress;
  if (!p) return { stage: "preparing", queuePosition: null, chains: [], fraction: 0, elapsedSeconds: 0, etaSeconds: null, updatedAt };
  return { stage: p.stage, queuePosition: null, chains: p.chains, fraction: p.fraction, elapsedSeconds: p.elapsedSeconds, etaSeconds: p.etaSeconds, updatedAt };
}

const runColumns = {
  id: runs.id,
  status: runs.status,
  datasetVersionId: runs.datasetVersionId,
  datasetVersionNumber: datasetVersions.number,
  modelSettingsId: runs.modelSettingsId,
  settings: modelSettings.settings,
  seed: runs.seed,
  createdAt: runs.createdAt,
  createdById: runs.createdBy,
  createdByName: users.name,
  startedAt: runs.startedAt,
  finishedAt: runs.finishedAt,
  failureReason: runs.failureReason,
  restartedFromRunId: runs.restartedFromRunId,
  restartedByRunId: sql<string | null>`(select later.id from runs as later where later.restarted_from_run_id = ${runs.id} order by later.created_at desc limit 1)`,
  progress: runs.progress,
  diagnostics: runs.diagnostics,
  trustworthy: runs.trustworthy,
  publishedAt: runs.publishedAt,
  publishedById: runs.publishedBy,
  publishedByName: publishers.name,
  publishReason: runs.publishReason,
};

type RunRow = {
  [K in keyof typeof runColumns]: unknown;
} & {
  id: string;
  status: RunStatus;
  datasetVersionId: string;
  datasetVersionNumber: number;
  modelSettingsId: string;
  seed: number;
  createdAt: Date;
  createdById: string | null;
  createdByName: string | null;
  startedAt: Date | null;
  finishedAt: Date | null;
  failureReason: string | null;
  restartedFromRunId: string | null;
  restartedByRunId: string | null;
  trustworthy: boolean | null;
  publishedAt: Date | null;
  publishedById: string | null;
  publishedByName: string | null;
  publishReason: string | null;
};

export async function currentRunId(db: Queryable): Promise<string | null> {
  const [row] = await db.select({ id: runs.id }).from(runs).where(isNotNull(runs.publishedAt)).orderBy(desc(runs.publishedAt)).limit(1);
  return row?.id ?? null;
}

function runOf(row: RunRow, current: string | null, live: JobSnapshot<FitJobProgress> | null): Run {
  const diagnostics = row.diagnostics as FitDiagnosticsView | null;
  const active = row.status === "queued" || row.status === "running";
  const progress = active && live ? runProgressOf(live) : ((row.progress as RunProgress | null) ?? null);
  return {
    id: row.id,
    status: row.status,
    datasetVersionId: row.datasetVersionId,
    datasetVersionNumber: row.datasetVersionNumber,
    modelSettingsId: row.modelSettingsId,
    settings: row.settings as ModelSettings,
    seed: row.seed,
    createdAt: row.createdAt.toISOString(),
    createdBy: row.createdById && row.createdByName ? { id: row.createdById, name: row.createdByName } : null,
    startedAt: row.startedAt?.toISOString() ?? null,
    finishedAt: row.finishedAt?.toISOString() ?? null,
    failureReason: row.failureReason,
    restartedFromRunId: row.restartedFromRunId,
    restartedByRunId: row.restartedByRunId,
    progress,
    trust: {
      trustworthy: row.trustworthy,
      reasons: diagnostics ? [...diagnostics.reasons] : [],
      warnings: diagnostics ? [...diagnostics.warnings] : [],
    },
    publication: row.publishedAt
      ? {
          at: row.publishedAt.toISOString(),
          by: row.publishedById && row.publishedByName ? { id: row.publishedById, name: row.publishedByName } : null,
          reason: row.publishReason,
        }
      : null,
    current: current === row.id,
  };
}

type LiveProgress = (runId: string) => JobSnapshot<FitJobProgress> | null;

function selectRuns(db: Queryable) {
  return db
    .select(runColumns)
    .from(runs)
    .innerJoin(datasetVersions, eq(datasetVersions.id, runs.datasetVersionId))
    .innerJoin(modelSettings, eq(modelSettings.id, runs.modelSettingsId))
    .leftJoin(users, eq(users.id, runs.createdBy))
    .leftJoin(publishers, eq(publishers.id, runs.publishedBy));
}

export async function runRecord(db: Queryable, runId: string, live: LiveProgress = () => null): Promise<Run> {
  const [row] = await selectRuns(db).where(eq(runs.id, runId));
  if (!row) throw new NotFound("No such run");
  return runOf(row as RunRow, await currentRunId(db), live(runId));
}

export async function listRunRecords(db: Queryable, live: LiveProgress, filter: { statuses?: readonly RunStatus[]; datasetVersionId?: string } = {}): Promise<Run[]> {
  // The stored part is reused until the next write (db/data-generation.ts); live progress is added on every call.
  const { rows, current } = await readThroughGeneration(db, `run list\u0000${JSON.stringify([filter.statuses ?? null, filter.datasetVersionId ?? null])}`, async () => {
    const rows = await selectRuns(db)
      .where(
        and(
          filter.statuses && filter.statuses.length > 0 ? inArray(runs.status, [...filter.statuses]) : undefined,
          filter.datasetVersionId ? eq(runs.datasetVersionId, filter.datasetVersionId) : undefined,
        ),
      )
      .orderBy(desc(runs.createdAt));
    return { rows, current: await currentRunId(db) };
  });
  return rows.map((row) => runOf(row as RunRow, current, live(row.id)));
}

/**
 * A run as shown to someone who does not see every market: the trust reasons name
 * parameters of any cell, so they are replaced by a statement that names none.
 */
export function runForScope(run: Run, scope: MarketScope): Run {
  if (scope.allMarkets) return run;
  const untrustworthy = run.trust.trustworthy === false;
  return {
    ...run,
    progress: null,
    trust: {
      trustworthy: run.trust.trustworthy,
      reasons: untrustworthy ? ["This fit did not pass every convergence check (R-hat, effective sample size, divergences); treat its numbers with extra care."] : [],
      warnings: [],
    },
  };
}

// Fit runs from start to stored result: a run row is written (queued), its job goes to
// the job runner, progress is relayed to listeners (and saved now and then), and the
// outcome is stored with the run in one transaction at the end.
import { randomInt } from "node:crypto";
import { and, eq, inArray } from "drizzle-orm";
import type { Run, RunProgress } from "@tributary/contracts";
import type { Logger } from "pino";
import type { Database } from "../db/client";
import { auditLog, runDraws, runResults, runs } from "../db/schema";
import { Conflict } from "../http/errors";
import type { JobOutcome, JobSnapshot } from "../jobs/job-runner";
import type { FitJobOutput, FitJobProgress, FitJobRunner } from "../jobs/fit-job";
import { fitOptionsOf } from "./fit-input";
import { checkSettingsAgainstData } from "./model-settings-checks";
import { modelSettingsRecord } from "./model-settings-queries";
import { runProgressOf, runRecord } from "./run-queries";

/** Posterior draws kept for planning, all chains together. */
export const KEPT_DRAWS = 1000;
/** Parameters given trace and rank plots in the report. */
export const TRACED_PARAMETERS = 6;
/** Progress is written to the database at most this often (live progress comes from memory). */
const PERSIST_PROGRESS_MS = 3000;

export type RunServiceEvent =
  | { readonly type: "progress"; readonly progress: RunProgress }
  /** The stored run changed (started, or finished: then `finished` is true). */
  | { readonly type: "run"; readonly run: Run; readonly finished: boolean };

const activeStatuses = ["queued", "running"] as const;

/** Run result kinds in run_results. */
export const resultKinds = { fit: "fit", report: "report" } as const;

export class RunService {
  private readonly listeners = new Map<string, Set<(event: RunServiceEvent) => void>>();
  /** Database writes of one run, chained so they land in order. */
  private readonly writes = new Map<string, Promise<void>>();
  private closed = false;

  constructor(
    private readonly db: Database,
    readonly jobs: FitJobRunner,
    private readonly log?: Logger,
  ) {}

  /** The runner's snapshot of a live run (null when the runner does not know it). */
  live = (runId: string): JobSnapshot<FitJobProgress> | null => this.jobs.progress(runId);

  subscribe(runId: string, listener: (event: RunServiceEvent) => void): () => void {
    let set = this.listeners.get(runId);
    if (!set) {
      set = new Set();
      this.listeners.set(runId, set);
    }
    set.add(listener);
    return () => {
      set.delete(listener);
      if (set.size === 0 && this.listeners.get(runId) === set) this.listeners.delete(runId);
    };
  }

  /** Queues a fit of the model settings; returns the new run's id. */
  async start(options: { modelSettingsId: string; userId: string; restartedFromRunId?: string; seed?: number }): Promise<string> {
    if (this.closed) throw new Conflict("The server is shutting down; start the run again in a moment");
    const record = await modelSettingsRecord(this.db, options.modelSettingsId);
    // Checked again: lift tests may have been added since the settings were saved.
    const input = await checkSettingsAgainstData(this.db, record.settings);
    const seed = options.seed ?? record.settings.seed ?? randomInt(0, 2 ** 31);

    const runId = await this.db.transaction(async (tx) => {
      const [row] = await tx
        .insert(runs)
        .values({
          datasetVersionId: record.datasetVersionId,
          modelSettingsId: record.id,
          status: "queued",
          seed,
          createdBy: options.userId,
          restartedFromRunId: options.restartedFromRunId ?? null,
        })
        .returning({ id: runs.id });
      await tx.insert(auditLog).values({
        userId: options.userId,
        action: options.restartedFromRunId ? "run_restarted" : "run_started",
        target: `run:${row!.id}`,
        details: { modelSettingsId: record.id, datasetVersionId: record.datasetVersionId, seed, restartedFromRunId: options.restartedFromRunId ?? null },
      });
      return row!.id;
    });

    try {
      this.jobs.enqueue({
        id: runId,
        input: {
          data: input.data,
          options: fitOptionsOf(record.settings, seed, input.liftTests),
          cellIds: input.cells.map((cell) => cell.cellId),
          keepDraws: KEPT_DRAWS,
          traceCount: TRACED_PARAMETERS,
        },
      });
    } catch (error) {
      await this.store(runId, { state: "failed", reason: `The fit could not be queued: ${error instanceof Error ? error.message : String(error)}` });
      return runId;
    }
    this.track(runId);
    void this.jobs.result(runId)?.then((outcome) => this.write(runId, () => this.store(runId, outcome)));
    return runId;
  }

  /** Stops a queued or running run. */
  async cancel(runId: string, userId: string): Promise<Run> {
    const run = await runRecord(this.db, runId);
    if (run.status !== "queued" && run.status !== "running") throw new Conflict(`The run has already ended (${run.status}); there is nothing to cancel`);
    await this.db.insert(auditLog).values({ userId, action: "run_cancelled", target: `run:${runId}` });
    const outcome = this.jobs.result(runId);
    if (this.jobs.cancel(runId) && outcome) {
      await outcome;
      await this.writes.get(runId);
    } else {
      // Not known to this runner (e.g. left over from another process): mark it directly.
      await this.write(runId, () => this.store(runId, { state: "cancelled" }));
    }
    return runRecord(this.db, runId, this.live);
  }

  /** A new run with the same settings and seed as an interrupted, failed or cancelled one. */
  async restart(runId: string, userId: string): Promise<string> {
    const run = await runRecord(this.db, runId);
    if (run.status !== "interrupted" && run.status !== "failed" && run.status !== "cancelled") {
      throw new Conflict(
        run.status === "succeeded" ? "The run finished; start a new run to fit again" : "The run has not ended yet; cancel it first if you want to start over",
      );
    }
    if (run.restartedByRunId) throw new Conflict("This run was already restarted; open the newer run");
    return this.start({ modelSettingsId: run.modelSettingsId, userId, restartedFromRunId: runId, seed: run.seed });
  }

  /** Stops listening and ends every job; runs left queued or running are marked interrupted at the next start. */
  async close(): Promise<void> {
    this.closed = true;
    this.listeners.clear();
    await this.jobs.close();
  }

  private emit(runId: string, event: RunServiceEvent): void {
    for (const listener of [...(this.listeners.get(runId) ?? [])]) {
      try {
        listener(event);
      } catch (error) {
        this.log?.warn({ err: error }, "run listener failed");
      }
    }
  }

  private write(runId: string, task: () => Promise<void>): Promise<void> {
    const next = (this.writes.get(runId) ?? Promise.resolve()).then(task).catch((error: unknown) => {
      if (!this.closed) this.log?.error({ err: error instanceof Error ? { message: error.message } : error, runId }, "storing a run's state failed");
    });
    this.writes.set(runId, next);
    void next.then(() => {
      if (this.writes.get(runId) === next) this.writes.delete(runId);
    });
    return next;
  }

  private async emitRun(runId: string, finished: boolean): Promise<void> {
    if (this.closed) return;
    this.emit(runId, { type: "run", run: await runRecord(this.db, runId, this.live), finished });
  }

  private track(runId: string): void {
    let startedStored = false;
    let lastPersist = 0;
    const onSnapshot = (snapshot: JobSnapshot<FitJobProgress>) => {
      if (this.closed) return;
      const progress = runProgressOf(snapshot);
      this.emit(runId, { type: "progress", progress });
      if (snapshot.state === "running" && !startedStored) {
        startedStored = true;
        const startedAt = new Date(snapshot.startedAt ?? Date.now());
        void this.write(runId, async () => {
          await this.db
            .update(runs)
            .set({ status: "running", startedAt, progress })
            .where(and(eq(runs.id, runId), eq(runs.status, "queued")));
          await this.emitRun(runId, false);
        });
      } else if (Date.now() - lastPersist >= PERSIST_PROGRESS_MS) {
        lastPersist = Date.now();
        void this.write(runId, async () => {
          await this.db
            .update(runs)
            .set({ progress })
            .where(and(eq(runs.id, runId), inArray(runs.status, [...activeStatuses])));
        });
      }
    };
    const off = this.jobs.subscribe(runId, (event) => {
      if (event.type === "progress") onSnapshot(event.snapshot);
    });
    // The job may have started while it was being queued, before anyone listened.
    const now = this.jobs.progress(runId);
    if (now && (now.state === "queued" || now.state === "running")) onSnapshot(now);
    void this.jobs.result(runId)?.finally(off);
  }

  /** Writes the outcome (results and draws for a success) with the run, in one transaction. */
  private async store(runId: string, outcome: JobOutcome<FitJobOutput>): Promise<void> {
    if (this.closed) return;
    const finishedAt = new Date();
    await this.db.transaction(async (tx) => {
      const [row] = await tx.select({ status: runs.status, progress: runs.progress }).from(runs).where(eq(runs.id, runId)).for("update");
      if (!row || (row.status !== "queued" && row.status !== "running")) return;
      const lastProgress = row.progress as RunProgress | null;
      if (outcome.state === "succeeded") {
        const { result, draws, parameters, traces, predictiveCheck, holdout } = outcome.output;
        await tx.insert(runResults).values([
          { runId, kind: resultKinds.fit, summaries: { ...result, cellIds: outcome.output.cellIds } },
          { runId, kind: resultKinds.report, summaries: { parameters, traces, predictiveCheck, holdout } },
        ]);
        if (draws.length > 0) {
          await tx.insert(runDraws).values(
            draws.map((d) => ({
              runId,
              kind: d.kind,
              chain: d.chain,
              parameterNames: [...d.names],
              drawCount: d.drawCount,
              draws: new Uint8Array(d.draws.buffer, d.draws.byteOffset, d.draws.byteLength),
            })),
          );
        }
        const progress: RunProgress = {
          stage: "storing",
          queuePosition: null,
          chains: lastProgress?.chains ?? [],
          fraction: 1,
          elapsedSeconds: result.timing.totalSeconds,
          etaSeconds: 0,
          updatedAt: finishedAt.toISOString(),
        };
        await tx
          .update(runs)
          .set({ status: "succeeded", finishedAt, diagnostics: result.diagnostics, trustworthy: result.diagnostics.trustworthy, progress, failureReason: null })
          .where(eq(runs.id, runId));
      } else if (outcome.state === "failed") {
        await tx.update(runs).set({ status: "failed", finishedAt, failureReason: outcome.reason }).where(eq(runs.id, runId));
      } else {
        await tx.update(runs).set({ status: "cancelled", finishedAt, failureReason: "The run was cancelled before it finished." }).where(eq(runs.id, runId));
      }
    });
    await this.emitRun(runId, true);
  }
}

/**
 * At start: runs that were queued or running when the server stopped are marked
 * interrupted (they can be restarted with one call). Returns how many there were.
 */
export async function markInterruptedRuns(db: Database): Promise<number> {
  const marked = await db
    .update(runs)
    .set({
      status: "interrupted",
      finishedAt: new Date(),
      failureReason: "The server stopped while this run was queued or running. Restart it to fit again with the same settings and seed.",
    })
    .where(inArray(runs.status, [...activeStatuses]))
    .returning({ id: runs.id });
  return marked.length;
}

// In-memory cache of the dashboards' per-run numbers. A finished run never changes, so
// its estimates are computed once (on first request, or ahead when it is published or
// the server starts) and kept for the few most recently used runs; concurrent requests
// share one computation. Names, customer values, flags and plans are read in one query
// and reused until the database changes: the data generation (db/data-generation.ts)
// moves with every write of this process, which owns the data directory, so the check
// costs no query. (On a handle without one, Postgres's transaction snapshot — xmin:xmax:
// in-progress ids, which moves with every transaction that writes — is read instead.)
import { sql } from "drizzle-orm";
import type { Logger } from "pino";
import type { Run } from "@tributary/contracts";
import type { Queryable } from "../db/client";
import { dataGenerationOf, type DataGeneration } from "../db/data-generation";
import { runRecord } from "../runs/run-queries";
import { computeChannelSheetData, type ChannelSheetData } from "./channel-sheet-data";
import { loadDashboardSnapshot, type DashboardSnapshot } from "./dashboard-context";
import { computeRunEstimates, type RunEstimates } from "./run-estimates";

/** A small least-recently-used map of promises; a rejected promise is dropped so the next call retries. */
class PromiseCache<T> {
  private readonly entries = new Map<string, Promise<T>>();
  constructor(private readonly capacity: number) {}

  get(key: string, make: () => Promise<T>): Promise<T> {
    const hit = this.entries.get(key);
    if (hit) {
      this.entries.delete(key);
      this.entries.set(key, hit);
      return hit;
    }
    const made = make();
    this.entries.set(key, made);
    made.catch(() => {
      if (this.entries.get(key) === made) this.entries.delete(key);
    });
    while (this.entries.size > this.capacity) this.entries.delete(this.entries.keys().next().value!);
    return made;
  }

  clear(): void {
    this.entries.clear();
  }
}

export class DashboardCache {
  private readonly estimatesByRun: PromiseCache<RunEstimates>;
  private readonly sheets: PromiseCache<ChannelSheetData>;
  /** Run records keyed by run and the current run at the time (a record changes only when publishing changes the current run). */
  private readonly records = new PromiseCache<Run>(16);

  constructor(
    private readonly db: Queryable,
    options: { runs?: number; sheets?: number; log?: Logger } = {},
  ) {
    this.estimatesByRun = new PromiseCache(options.runs ?? 4);
    this.sheets = new PromiseCache(options.sheets ?? 300);
    this.log = options.log;
    this.generation = dataGenerationOf(db);
  }

  /** Moves with every write of this process (db/data-generation.ts); undefined on a handle that is not a database of createDatabase. */
  private readonly generation: DataGeneration | undefined;

  private readonly log: Logger | undefined;

  private lastSnapshot: { key: string; value: Promise<DashboardSnapshot> } | null = null;

  /** Published runs, names, values, flags and plans as of now (reread only after a write). */
  async snapshot(): Promise<DashboardSnapshot> {
    const key = await this.changeKey();
    if (this.lastSnapshot?.key === key) return this.lastSnapshot.value;
    const value = loadDashboardSnapshot(this.db);
    const entry = { key, value };
    this.lastSnapshot = entry;
    value.catch(() => {
      if (this.lastSnapshot === entry) this.lastSnapshot = null;
    });
    return value;
  }

  /**
   * Equal keys mean the database has not changed in between: the data generation when
   * the cache sits on the database itself (no query), else Postgres's snapshot.
   */
  private async changeKey(): Promise<string> {
    if (this.generation) return `generation ${this.generation.current}`;
    const result = await this.db.execute(sql`select pg_current_snapshot()::text as key`);
    return `snapshot ${String((result as unknown as { rows: { key: string }[] }).rows[0]!.key)}`;
  }

  estimates(runId: string): Promise<RunEstimates> {
    return this.estimatesByRun.get(runId, () => computeRunEstimates(this.db, runId));
  }

  /** The Channel sheet's computed part for cell index g and channel index c of the run. */
  sheet(runId: string, g: number, c: number): Promise<ChannelSheetData> {
    return this.sheets.get(`${runId}\u0000${g}\u0000${c}`, async () => computeChannelSheetData(await this.estimates(runId), g, c));
  }

  /** A finished run's record as of the given current run. */
  runRecord(runId: string, currentRunId: string | null): Promise<Run> {
    return this.records.get(`${runId}\u0000${currentRunId ?? ""}`, () => runRecord(this.db, runId));
  }

  /** Computes a run's estimates ahead of the first request (errors are logged, not thrown). */
  warm(runId: string): void {
    this.estimates(runId).catch((error: unknown) => {
      this.log?.warn({ err: error instanceof Error ? { message: error.message } : error, runId }, "computing a run's dashboard numbers failed");
    });
  }
}

// A JobRunner driven by hand, for tests of what the API does with a job's states: no
// threads; the test decides when a job starts, reports, succeeds or fails. It also shows
// that anything implementing the interface can stand in for the local runner.
import type { Job, JobEvent, JobOutcome, JobRunner, JobSnapshot } from "../jobs/job-runner";

interface Entry<I, P, O> {
  job: Job<I>;
  snapshot: JobSnapshot<P>;
  listeners: Set<(event: JobEvent<P, O>) => void>;
  done: Promise<JobOutcome<O>>;
  settle: (outcome: JobOutcome<O>) => void;
  finished: boolean;
}

export class ManualJobRunner<I, P, O> implements JobRunner<I, P, O> {
  private readonly entries = new Map<string, Entry<I, P, O>>();
  readonly enqueued: Job<I>[] = [];

  enqueue(job: Job<I>): void {
    let settle!: (outcome: JobOutcome<O>) => void;
    const done = new Promise<JobOutcome<O>>((resolve) => (settle = resolve));
    const snapshot: JobSnapshot<P> = { jobId: job.id, state: "queued", queuePosition: 1, queuedAt: Date.now(), startedAt: null, progress: null };
    this.entries.set(job.id, { job, snapshot, listeners: new Set(), done, settle, finished: false });
    this.enqueued.push(job);
  }

  progress(jobId: string): JobSnapshot<P> | null {
    return this.entries.get(jobId)?.snapshot ?? null;
  }

  subscribe(jobId: string, listener: (event: JobEvent<P, O>) => void): () => void {
    const entry = this.entries.get(jobId);
    entry?.listeners.add(listener);
    return () => entry?.listeners.delete(listener);
  }

  cancel(jobId: string): boolean {
    const entry = this.entries.get(jobId);
    if (!entry || entry.finished) return false;
    this.finish(jobId, { state: "cancelled" });
    return true;
  }

  result(jobId: string): Promise<JobOutcome<O>> | null {
    return this.entries.get(jobId)?.done ?? null;
  }

  async close(): Promise<void> {
    for (const entry of this.entries.values()) entry.listeners.clear();
  }

  /** Starts the job (if queued) and reports progress. */
  report(jobId: string, progress: P): void {
    const entry = this.entries.get(jobId)!;
    entry.snapshot = { ...entry.snapshot, state: "running", queuePosition: null, startedAt: entry.snapshot.startedAt ?? Date.now(), progress };
    for (const listener of [...entry.listeners]) listener({ type: "progress", snapshot: entry.snapshot });
  }

  finish(jobId: string, outcome: JobOutcome<O>): void {
    const entry = this.entries.get(jobId)!;
    entry.finished = true;
    entry.snapshot = { ...entry.snapshot, state: outcome.state };
    for (const listener of [...entry.listeners]) listener({ type: "finished", outcome });
    entry.listeners.clear();
    entry.settle(outcome);
  }
}

// Runs jobs on worker threads of this process, a few at a time (the rest wait in a
// queue). Each job gets a fresh worker that ends with the job, so cancelling is
// immediate (the worker is terminated) and a crash in one job cannot touch the next.
import { Worker } from "node:worker_threads";
import type { Job, JobEvent, JobOutcome, JobRunner, JobSnapshot, JobState } from "./job-runner";

/** Messages a job's worker sends to the runner. */
export type WorkerMessage<P, O> =
  | { readonly type: "progress"; readonly progress: P }
  | { readonly type: "done"; readonly output: O }
  | { readonly type: "failed"; readonly reason: string };

/** What a job's worker receives as `workerData`. */
export interface JobWorkerData<I> {
  /** The TypeScript module the bootstrap imports (file URL). */
  readonly entry: string;
  readonly input: I;
  readonly options: unknown;
}

export interface LocalJobRunnerOptions {
  /** File URL of the worker module (TypeScript, loaded through the tsx bootstrap). */
  readonly workerEntry: URL;
  /** Jobs running at the same time (default 1). */
  readonly concurrency?: number;
  /** Passed to every worker beside the job's input (e.g. how many threads it may use). */
  readonly workerOptions?: unknown;
  /** How long a finished job's snapshot stays readable, in milliseconds (default 10 minutes). */
  readonly keepFinishedMs?: number;
  /** Readable reason when a worker dies without saying why. */
  readonly describeExit?: (exitCode: number) => string;
}

interface LiveJob<I, P, O> {
  readonly job: Job<I>;
  state: JobState;
  readonly queuedAt: number;
  startedAt: number | null;
  progress: P | null;
  worker: Worker | null;
  readonly listeners: Set<(event: JobEvent<P, O>) => void>;
  readonly done: Promise<JobOutcome<O>>;
  settle(outcome: JobOutcome<O>): void;
  finished: boolean;
}

const bootstrap = new URL("./worker-bootstrap.mjs", import.meta.url);

export class LocalJobRunner<I, P, O> implements JobRunner<I, P, O> {
  private readonly jobs = new Map<string, LiveJob<I, P, O>>();
  private readonly queue: string[] = [];
  private running = 0;
  private closed = false;
  private readonly concurrency: number;
  private readonly keepFinishedMs: number;

  constructor(private readonly options: LocalJobRunnerOptions) {
    const concurrency = options.concurrency ?? 1;
    if (!Number.isInteger(concurrency) || concurrency < 1) throw new Error(`concurrency must be a positive whole number, got ${concurrency}`);
    this.concurrency = concurrency;
    this.keepFinishedMs = options.keepFinishedMs ?? 10 * 60_000;
  }

  enqueue(job: Job<I>): void {
    if (this.closed) throw new Error("the job runner is closed");
    const existing = this.jobs.get(job.id);
    if (existing && !existing.finished) throw new Error(`job ${job.id} is already queued or running`);
    let settle!: (outcome: JobOutcome<O>) => void;
    const done = new Promise<JobOutcome<O>>((resolve) => {
      settle = resolve;
    });
    this.jobs.set(job.id, {
      job,
      state: "queued",
      queuedAt: Date.now(),
      startedAt: null,
      progress: null,
      worker: null,
      listeners: new Set(),
      done,
      settle,
      finished: false,
    });
    this.queue.push(job.id);
    this.emitQueuePositions();
    this.startWaiting();
  }

  progress(jobId: string): JobSnapshot<P> | null {
    const live = this.jobs.get(jobId);
    return live ? this.snapshotOf(live) : null;
  }

  subscribe(jobId: string, listener: (event: JobEvent<P, O>) => void): () => void {
    const live = this.jobs.get(jobId);
    if (!live) return () => {};
    live.listeners.add(listener);
    return () => live.listeners.delete(listener);
  }

  cancel(jobId: string): boolean {
    const live = this.jobs.get(jobId);
    if (!live || live.finished) return false;
    if (live.state === "queued") {
      this.queue.splice(this.queue.indexOf(jobId), 1);
      this.finish(live, { state: "cancelled" });
      this.emitQueuePositions();
      return true;
    }
    const worker = live.worker;
    live.worker = null;
    // The outcome is settled once the thread is really gone, so the next job never shares its core.
    void (worker?.terminate() ?? Promise.resolve()).finally(() => this.finish(live, { state: "cancelled" }));
    return true;
  }

  result(jobId: string): Promise<JobOutcome<O>> | null {
    return this.jobs.get(jobId)?.done ?? null;
  }

  async close(): Promise<void> {
    this.closed = true;
    this.queue.length = 0;
    const workers: Worker[] = [];
    for (const live of this.jobs.values()) {
      live.listeners.clear();
      if (live.worker) workers.push(live.worker);
      live.worker = null;
      live.finished = true;
    }
    await Promise.all(workers.map((worker) => worker.terminate()));
  }

  private snapshotOf(live: LiveJob<I, P, O>): JobSnapshot<P> {
    const position = live.state === "queued" ? this.queue.indexOf(live.job.id) + 1 : 0;
    return {
      jobId: live.job.id,
      state: live.state,
      queuePosition: position > 0 ? position : null,
      queuedAt: live.queuedAt,
      startedAt: live.startedAt,
      progress: live.progress,
    };
  }

  private emit(live: LiveJob<I, P, O>, event: JobEvent<P, O>): void {
    for (const listener of [...live.listeners]) {
      try {
        listener(event);
      } catch {
        // A failing listener must not stop the job or the other listeners.
      }
    }
  }

  private emitQueuePositions(): void {
    for (const id of this.queue) {
      const live = this.jobs.get(id);
      if (live) this.emit(live, { type: "progress", snapshot: this.snapshotOf(live) });
    }
  }

  private startWaiting(): void {
    while (!this.closed && this.running < this.concurrency && this.queue.length > 0) {
      const live = this.jobs.get(this.queue.shift()!);
      if (live) this.start(live);
    }
    this.emitQueuePositions();
  }

  private start(live: LiveJob<I, P, O>): void {
    this.running++;
    live.state = "running";
    live.startedAt = Date.now();
    const workerData: JobWorkerData<I> = { entry: this.options.workerEntry.href, input: live.job.input, options: this.options.workerOptions };
    let worker: Worker;
    try {
      worker = new Worker(bootstrap, { workerData });
    } catch (error) {
      this.finish(live, { state: "failed", reason: `The job could not start: ${error instanceof Error ? error.message : String(error)}` });
      return;
    }
    live.worker = worker;
    this.emit(live, { type: "progress", snapshot: this.snapshotOf(live) });

    const own = () => live.worker === worker;
    worker.on("message", (message: WorkerMessage<P, O>) => {
      if (!own()) return;
      if (message.type === "progress") {
        live.progress = message.progress;
        this.emit(live, { type: "progress", snapshot: this.snapshotOf(live) });
      } else if (message.type === "done") {
        live.worker = null;
        void worker.terminate().finally(() => this.finish(live, { state: "succeeded", output: message.output }));
      } else {
        live.worker = null;
        void worker.terminate().finally(() => this.finish(live, { state: "failed", reason: message.reason }));
      }
    });
    worker.on("error", (error) => {
      if (!own()) return;
      live.worker = null;
      this.finish(live, { state: "failed", reason: error instanceof Error ? error.message : String(error) });
    });
    worker.on("exit", (code) => {
      if (!own()) return;
      live.worker = null;
      const reason = this.options.describeExit?.(code) ?? `The job's worker stopped unexpectedly (exit code ${code})`;
      this.finish(live, { state: "failed", reason });
    });
  }

  private finish(live: LiveJob<I, P, O>, outcome: JobOutcome<O>): void {
    if (live.finished) return;
    const wasRunning = live.state === "running";
    live.finished = true;
    live.state = outcome.state;
    this.emit(live, { type: "finished", outcome });
    live.listeners.clear();
    live.settle(outcome);
    if (wasRunning) this.running--;
    // Forget the finished job after a while (its outcome lives in the database by then).
    setTimeout(() => {
      if (this.jobs.get(live.job.id) === live) this.jobs.delete(live.job.id);
    }, this.keepFinishedMs).unref();
    if (!this.closed) this.startWaiting();
  }
}

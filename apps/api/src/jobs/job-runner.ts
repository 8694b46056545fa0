// The job runner seen by the rest of the API. The local implementation runs jobs on
// worker threads of this process; a queue on a database server with workers on other
// machines can replace it behind the same interface, without touching routes or screens.

export type JobState = "queued" | "running" | "succeeded" | "failed" | "cancelled";

export interface Job<I> {
  /** Chosen by the caller (e.g. the run's id); unique among live jobs. */
  readonly id: string;
  readonly input: I;
}

export interface JobSnapshot<P> {
  readonly jobId: string;
  readonly state: JobState;
  /** 1 = next to start; null once running or finished. */
  readonly queuePosition: number | null;
  /** Epoch milliseconds. */
  readonly queuedAt: number;
  readonly startedAt: number | null;
  /** The job's own latest progress report, null until the first. */
  readonly progress: P | null;
}

export type JobOutcome<O> =
  | { readonly state: "succeeded"; readonly output: O }
  | { readonly state: "failed"; readonly reason: string }
  | { readonly state: "cancelled" };

export type JobEvent<P, O> =
  | { readonly type: "progress"; readonly snapshot: JobSnapshot<P> }
  | { readonly type: "finished"; readonly outcome: JobOutcome<O> };

export interface JobRunner<I, P, O> {
  /** Queues the job; it starts when a slot is free. Throws if the id is already live. */
  enqueue(job: Job<I>): void;
  /** The job's state and latest progress; null when the runner does not know it (finished long ago, or never queued here). */
  progress(jobId: string): JobSnapshot<P> | null;
  /** Progress (state changes included) and the final outcome; returns the unsubscribe function. */
  subscribe(jobId: string, listener: (event: JobEvent<P, O>) => void): () => void;
  /** Stops a queued or running job (its outcome becomes "cancelled"); false when it is not live. */
  cancel(jobId: string): boolean;
  /** Resolves with the outcome when the job ends; null when the runner does not know the job. */
  result(jobId: string): Promise<JobOutcome<O>> | null;
  /** Stops every job without an outcome (as if the machine stopped) and frees the workers. */
  close(): Promise<void>;
}

// The fit job's worker thread: fits the pooled model and the no-pooling comparison with
// fitPortfolio, reports progress, and at the end computes the report's data from the
// pooled draws before sending everything back in one message.
import { parentPort, workerData } from "node:worker_threads";
import {
  fitPortfolio,
  portfolioPooledKind,
  runChainsInThread,
  summariseRun,
  type ChainResult,
  type RunChains,
} from "@tributary/stats";
import { SamplerWorkerPool } from "@tributary/stats/node";
import type { JobWorkerData, WorkerMessage } from "./local-job-runner";
import type { FitJobInput, FitJobOutput, FitJobProgress, FitWorkerOptions } from "./fit-job";
import { FitProgressTracker } from "./fit-progress-tracker";
import { FIT_THREAD_NICENESS, lowerThreadPriority } from "./thread-priority";
import { parameterLabeller, parameterTable, parameterTrace, thinnedDraws, worstParameters } from "./run-report-data";
import { posteriorPredictiveCheck, runDrawSet } from "./predictive-check";

const PROGRESS_EVERY_MS = 250;

type Message = WorkerMessage<FitJobProgress, FitJobOutput>;

function post(message: Message, transfer: ArrayBuffer[] = []): void {
  parentPort!.postMessage(message, transfer);
}

async function runFit(input: FitJobInput, options: FitWorkerOptions): Promise<void> {
  const { data } = input;
  const chains = input.options.chains ?? 4;
  const tracker = new FitProgressTracker({
    chains,
    iterationsPerRun: (input.options.warmup ?? 1000) + (input.options.draws ?? 1000),
    unpooled: input.options.unpooled ?? true,
    cellCount: data.cells.length,
  });
  let lastPost = 0;
  const report = (force = false) => {
    const now = Date.now();
    if (!force && now - lastPost < PROGRESS_EVERY_MS) return;
    lastPost = now;
    post({ type: "progress", progress: tracker.snapshot() });
  };
  report(true);

  // Below the server's requests in the scheduler's eyes; the chain threads started below inherit it (Linux).
  lowerThreadPriority(FIT_THREAD_NICENESS);
  // Chains on their own threads when this fit may use several (the chain workers rebuild the model from its spec).
  const pool = options.chainThreads > 1 ? new SamplerWorkerPool({ maxWorkers: options.chainThreads }) : null;
  const base: RunChains = pool
    ? (spec, settings, onProgress, signal) => pool.run(spec, settings, { onProgress, signal, maxWorkers: options.chainThreads })
    : runChainsInThread;
  let pooledChains: ChainResult[] | null = null;
  const runChains: RunChains = async (spec, settings, onProgress, signal) => {
    const result = await base(spec, settings, onProgress, signal);
    if (spec.kind === portfolioPooledKind) pooledChains = result;
    return result;
  };

  try {
    const { drawSet: _allDraws, ...result } = await fitPortfolio(data, input.options, {
      runChains,
      onProgress: (progress) => {
        const stageBefore = tracker.stage;
        tracker.update(progress);
        report(tracker.stage !== stageBefore);
      },
    });
    tracker.setStage("summarising");
    report(true);

    const kept = pooledChains as ChainResult[] | null;
    if (kept === null) throw new Error("the pooled model's draws were not returned by the chain runner");
    const summary = summariseRun(kept);
    const label = parameterLabeller(data);
    const traces = worstParameters(summary.parameters, input.traceCount).map(({ name, why }) => {
      const parameter = summary.parameters.find((p) => p.name === name)!;
      return parameterTrace(kept, parameter, why, label(name));
    });
    const draws = thinnedDraws(kept, input.keepDraws).map((d) => ({ kind: "pooled" as const, ...d }));
    // From the draws kept for planning, so the check describes exactly what planning will use.
    const predictive = posteriorPredictiveCheck(runDrawSet(data, input.options, draws), input.cellIds, input.options.seed ?? 1);
    const output: FitJobOutput = {
      result,
      cellIds: input.cellIds,
      parameters: parameterTable(summary.parameters, label),
      traces,
      predictiveCheck: predictive.cells,
      holdout: predictive.holdout,
      draws,
    };
    post({ type: "done", output }, draws.map((d) => d.draws.buffer as ArrayBuffer));
  } finally {
    await pool?.close();
  }
}

const data = workerData as JobWorkerData<FitJobInput>;
runFit(data.input, data.options as FitWorkerOptions).catch((error: unknown) => {
  const message = error instanceof Error ? error.message : String(error);
  const reason = error instanceof RangeError ? `The model cannot be fitted to this data with these settings: ${message}` : `The fit failed: ${message}`;
  post({ type: "failed", reason });
});

// A job worker for the job runner's tests: follows the worker protocol and does what its
// input says (report progress, finish, fail, crash or wait to be cancelled).
import { parentPort, workerData } from "node:worker_threads";
import type { JobWorkerData, WorkerMessage } from "../local-job-runner";

export interface ScriptedInput {
  readonly steps: number;
  readonly stepMs: number;
  readonly end: "done" | "fail" | "crash" | "hang";
}

type Message = WorkerMessage<{ step: number }, { steps: number; threadTag: string }>;

const { input, options } = workerData as JobWorkerData<ScriptedInput>;
const post = (message: Message) => parentPort!.postMessage(message);

for (let step = 1; step <= input.steps; step++) {
  await new Promise((resolve) => setTimeout(resolve, input.stepMs));
  post({ type: "progress", progress: { step } });
}
if (input.end === "done") post({ type: "done", output: { steps: input.steps, threadTag: String((options as { tag?: string } | undefined)?.tag) } });
else if (input.end === "fail") post({ type: "failed", reason: "The scripted job gave up" });
else if (input.end === "crash") process.exit(3);
else setInterval(() => {}, 1000);

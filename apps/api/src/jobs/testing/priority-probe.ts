// A job worker for the thread-priority test: lowers its own priority as the fit worker
// does, starts a thread afterwards (as the fit starts its chain threads), and reports
// the nice values the kernel shows for both.
import { readFileSync } from "node:fs";
import { parentPort, Worker } from "node:worker_threads";
import type { WorkerMessage } from "../local-job-runner";
import { currentThreadId, lowerThreadPriority } from "../thread-priority";

export interface PriorityProbeOutput {
  readonly tid: number | null;
  /** What lowerThreadPriority returned. */
  readonly returned: number | null;
  /** This thread's nice value as /proc shows it. */
  readonly niceness: number;
  /** The nice value of a thread this one started afterwards, as /proc shows it. */
  readonly childNiceness: number;
}

/** A thread that posts its own nice value from /proc/thread-self/stat (field 19), as plain JavaScript. */
const childSource = `
const stat = require("node:fs").readFileSync("/proc/thread-self/stat", "utf8");
require("node:worker_threads").parentPort.postMessage(Number(stat.slice(stat.lastIndexOf(")") + 2).split(" ")[16]));
`;

function ownNiceness(): number {
  const stat = readFileSync("/proc/thread-self/stat", "utf8");
  return Number(stat.slice(stat.lastIndexOf(")") + 2).split(" ")[16]);
}

const tid = currentThreadId();
const returned = lowerThreadPriority(10);
const child = new Worker(childSource, { eval: true });
const childNiceness = await new Promise<number>((resolve, reject) => {
  child.once("message", resolve);
  child.once("error", reject);
});
await child.terminate();
const output: PriorityProbeOutput = { tid, returned, niceness: ownNiceness(), childNiceness };
const message: WorkerMessage<never, PriorityProbeOutput> = { type: "done", output };
parentPort!.postMessage(message);

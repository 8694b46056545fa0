// A fit fills every core it is given for minutes; the server's requests run on the main
// thread of the same process. On Linux the CPU priority (nice value) belongs to each
// thread and a new thread inherits its creator's, so the fit's worker lowers its own
// priority before it starts the chain threads: the fit still uses every idle core, but
// the scheduler runs the main thread first when a request arrives.
import { readlinkSync } from "node:fs";
import { getPriority, setPriority } from "node:os";

/** The nice value a fit's threads run at (0 is normal, 19 the lowest priority). */
export const FIT_THREAD_NICENESS = 10;

/** The calling thread's kernel id (Linux), or null where threads have no id of their own here. */
export function currentThreadId(): number | null {
  if (process.platform !== "linux") return null;
  try {
    // "/proc/thread-self" links to "<pid>/task/<tid>" of whichever thread reads it.
    const tid = Number(readlinkSync("/proc/thread-self").split("/").at(-1));
    return Number.isInteger(tid) && tid > 0 ? tid : null;
  } catch {
    return null;
  }
}

/**
 * Raises the calling thread's nice value to `niceness` (never lowers it) and returns the
 * value now in force. Returns null, changing nothing, where the priority of one thread
 * cannot be set apart from the whole process's (anything but Linux) or the system refuses.
 */
export function lowerThreadPriority(niceness: number): number | null {
  if (!Number.isInteger(niceness) || niceness < 0 || niceness > 19) throw new Error(`niceness must be a whole number from 0 to 19, got ${niceness}`);
  const tid = currentThreadId();
  if (tid === null) return null;
  try {
    // On Linux, setpriority with a thread id changes that thread only.
    if (getPriority(tid) < niceness) setPriority(tid, niceness);
    return getPriority(tid);
  } catch {
    return null;
  }
}

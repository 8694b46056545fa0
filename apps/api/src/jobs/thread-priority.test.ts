// The fit's threads yield to the server's requests: the worker lowers its own CPU
// priority, threads it starts afterwards inherit it, and the main thread keeps its own.
import { readFileSync } from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { LocalJobRunner } from "./local-job-runner";
import { currentThreadId, lowerThreadPriority } from "./thread-priority";
import type { PriorityProbeOutput } from "./testing/priority-probe";

function ownNiceness(): number {
  const stat = readFileSync("/proc/thread-self/stat", "utf8");
  return Number(stat.slice(stat.lastIndexOf(")") + 2).split(" ")[16]);
}

const runner = new LocalJobRunner<null, never, PriorityProbeOutput>({ workerEntry: new URL("./testing/priority-probe.ts", import.meta.url) });
afterAll(() => runner.close());

describe("lowerThreadPriority", () => {
  it("refuses a nice value outside 0…19 and changes nothing", () => {
    const before = process.platform === "linux" ? ownNiceness() : null;
    expect(() => lowerThreadPriority(20)).toThrow(/whole number from 0 to 19, got 20/);
    expect(() => lowerThreadPriority(-1)).toThrow(/got -1/);
    expect(() => lowerThreadPriority(2.5)).toThrow(/got 2.5/);
    if (before !== null) expect(ownNiceness()).toBe(before);
  });

  it.runIf(process.platform === "linux")("lowers only the calling worker thread, and threads it starts afterwards inherit it", async () => {
    const mainBefore = ownNiceness();
    runner.enqueue({ id: "probe", input: null });
    const outcome = await runner.result("probe");
    expect(outcome?.state).toBe("succeeded");
    if (outcome?.state !== "succeeded") return;
    const expected = Math.max(10, mainBefore);
    expect(outcome.output.tid).not.toBeNull();
    expect(outcome.output.tid).not.toBe(currentThreadId());
    expect(outcome.output.returned).toBe(expected);
    expect(outcome.output.niceness).toBe(expected);
    expect(outcome.output.childNiceness).toBe(expected);
    // The thread that answers requests keeps its priority.
    expect(ownNiceness()).toBe(mainBefore);
  });
});

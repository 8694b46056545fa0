// The local job runner with a scripted worker: queueing, concurrency, progress,
// cancelling (queued and running), failures and crashes with a readable reason.
import { afterEach, describe, expect, it } from "vitest";
import type { JobEvent } from "./job-runner";
import { LocalJobRunner } from "./local-job-runner";
import type { ScriptedInput } from "./testing/scripted-worker";

type Runner = LocalJobRunner<ScriptedInput, { step: number }, { steps: number; threadTag: string }>;
const runners: Runner[] = [];
function runner(concurrency = 1): Runner {
  const r: Runner = new LocalJobRunner({
    workerEntry: new URL("./testing/scripted-worker.ts", import.meta.url),
    concurrency,
    workerOptions: { tag: "from-options" },
    describeExit: (code) => `stopped with code ${code}`,
  });
  runners.push(r);
  return r;
}
afterEach(async () => {
  await Promise.all(runners.splice(0).map((r) => r.close()));
});

const job = (id: string, input: Partial<ScriptedInput> = {}) => ({ id, input: { steps: 3, stepMs: 20, end: "done" as const, ...input } });

describe("LocalJobRunner", () => {
  it("runs a job on a worker thread, relaying progress, and resolves its output", async () => {
    const r = runner();
    const events: JobEvent<{ step: number }, unknown>[] = [];
    r.enqueue(job("a"));
    r.subscribe("a", (e) => events.push(e));
    const outcome = await r.result("a");
    expect(outcome).toEqual({ state: "succeeded", output: { steps: 3, threadTag: "from-options" } });
    const steps = events.flatMap((e) => (e.type === "progress" && e.snapshot.progress ? [e.snapshot.progress.step] : []));
    expect(steps).toEqual([1, 2, 3]);
    expect(events.at(-1)).toEqual({ type: "finished", outcome });
    expect(r.progress("a")?.state).toBe("succeeded");
  });

  it("runs one job at a time by default; the others wait with their queue position", async () => {
    const r = runner(1);
    r.enqueue(job("first", { steps: 5 }));
    r.enqueue(job("second"));
    r.enqueue(job("third"));
    expect(r.progress("first")?.state).toBe("running");
    expect(r.progress("second")).toMatchObject({ state: "queued", queuePosition: 1 });
    expect(r.progress("third")).toMatchObject({ state: "queued", queuePosition: 2 });
    const finished: string[] = [];
    await Promise.all(["first", "second", "third"].map((id) => r.result(id)!.then(() => finished.push(id))));
    expect(finished).toEqual(["first", "second", "third"]);
  });

  it("runs as many at once as the concurrency allows", async () => {
    const r = runner(2);
    r.enqueue(job("x", { steps: 4 }));
    r.enqueue(job("y", { steps: 4 }));
    r.enqueue(job("z"));
    expect([r.progress("x")?.state, r.progress("y")?.state, r.progress("z")?.state]).toEqual(["running", "running", "queued"]);
    await r.result("z");
  });

  it("cancels a queued job at once and a running one by ending its thread", async () => {
    const r = runner(1);
    r.enqueue(job("long", { steps: 1, end: "hang" }));
    r.enqueue(job("waiting"));
    expect(r.cancel("waiting")).toBe(true);
    expect(await r.result("waiting")).toEqual({ state: "cancelled" });
    // Let the hanging job report once, so it is really running.
    await new Promise<void>((resolve) => r.subscribe("long", (e) => e.type === "progress" && e.snapshot.progress && resolve()));
    expect(r.cancel("long")).toBe(true);
    expect(await r.result("long")).toEqual({ state: "cancelled" });
    expect(r.cancel("long")).toBe(false);
    expect(r.cancel("never-queued")).toBe(false);
  });

  it("reports a job's own failure reason, and a crash in words", async () => {
    const r = runner(1);
    r.enqueue(job("fails", { end: "fail" }));
    r.enqueue(job("crashes", { end: "crash" }));
    r.enqueue(job("after"));
    expect(await r.result("fails")).toEqual({ state: "failed", reason: "The scripted job gave up" });
    expect(await r.result("crashes")).toEqual({ state: "failed", reason: "stopped with code 3" });
    // A crash does not stop the queue.
    expect((await r.result("after"))?.state).toBe("succeeded");
  });

  it("refuses a second live job with the same id, and new jobs once closed", async () => {
    const r = runner(1);
    r.enqueue(job("same", { steps: 2 }));
    expect(() => r.enqueue(job("same"))).toThrow(/already queued or running/);
    await r.close();
    expect(() => r.enqueue(job("later"))).toThrow(/closed/);
    expect(r.result("unknown")).toBeNull();
  });
});

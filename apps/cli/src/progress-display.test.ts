import { describe, expect, it } from "vitest";
import type { FitProgress } from "@tributary/stats";
import { formatDuration, ProgressDisplay } from "./progress-display";

function stream(isTTY: boolean) {
  const chunks: string[] = [];
  return { isTTY, chunks, write: (text: string) => chunks.push(text) };
}

const p = (over: Partial<FitProgress>): FitProgress => ({ model: "pooled", chain: 0, iteration: 1, total: 100, phase: "warmup", divergences: 0, attempt: 1, ...over });

describe("ProgressDisplay", () => {
  it("writes plain lines on a log: a header per model, then each chain at phase changes and quarters, with an ETA", () => {
    let now = 0;
    const s = stream(false);
    const display = new ProgressDisplay(s, 2, () => now);
    display.update(p({ chain: 0, iteration: 1 }));
    now = 1000;
    display.update(p({ chain: 0, iteration: 10 })); // same quarter: nothing
    display.update(p({ chain: 0, iteration: 25 }));
    display.update(p({ chain: 1, iteration: 25 }));
    now = 2000;
    display.update(p({ chain: 0, iteration: 51, phase: "sampling", divergences: 1 }));
    display.update(p({ model: "unpooled", chain: 0, iteration: 1, total: 300, cell: 0, cellCount: 3 }));
    const text = s.chunks.join("");
    expect(text).not.toMatch(/\x1b\[/);
    const lines = text.trim().split("\n");
    expect(lines).toEqual([
      "Fitting the pooled model:",
      "pooled model: chain 1/2 warm-up 1/100, 0 divergences, time left about --:--",
      "pooled model: chain 1/2 warm-up 25/100, 0 divergences, time left about 0:07",
      "pooled model: chain 2/2 warm-up 25/100, 0 divergences, time left about 0:03",
      "pooled model: chain 1/2 sampling 51/100, 1 divergence, time left about 0:03",
      "Fitting the no-pooling comparison:",
      "no-pooling comparison: chain 1/2 warm-up 1/300, cell 1/3, 0 divergences, time left about --:--",
    ]);
  });

  it("says when a model is run again at a higher target acceptance", () => {
    const s = stream(false);
    const display = new ProgressDisplay(s, 1, () => 0);
    display.update(p({ attempt: 2 }));
    expect(s.chunks[0]).toBe("Fitting the pooled model (run again at target acceptance 0.9 after divergences):\n");
  });

  it("redraws one bar per chain in place on a terminal", () => {
    let now = 0;
    const s = stream(true);
    const display = new ProgressDisplay(s, 2, () => now);
    display.update(p({ chain: 0, iteration: 50, total: 100, phase: "sampling", divergences: 2 }));
    now = 500;
    display.update(p({ chain: 1, iteration: 100, total: 100, phase: "sampling" }));
    display.finish();
    const frames = s.chunks.slice(1);
    expect(frames[0]).toContain("chain 1/2 [############------------]  50%  sampling  2 divergences");
    expect(frames[0]).not.toMatch(/^\x1b\[\d+A/);
    expect(frames[1]).toMatch(/^\x1b\[3A/); // back up over 2 chains + the time line
    expect(frames[1]).toContain("chain 2/2 [########################] 100%  sampling  0 divergences");
  });
});

describe("formatDuration", () => {
  it.each([
    [0, "0:00"],
    [59.4, "0:59"],
    [61, "1:01"],
    [3725, "1:02:05"],
    [Number.NaN, "--:--"],
  ])("%d s → %s", (seconds, text) => expect(formatDuration(seconds)).toBe(text));
});

import { describe, expect, it } from "vitest";
import type { FitProgress } from "@tributary/stats";
import { FitProgressTracker } from "./fit-progress-tracker";

function clock() {
  let seconds = 0;
  return { now: () => seconds, advance: (s: number) => (seconds += s) };
}

const progress = (change: Partial<FitProgress>): FitProgress => ({
  model: "pooled",
  chain: 0,
  iteration: 0,
  total: 200,
  phase: "warmup",
  divergences: 0,
  attempt: 1,
  ...change,
});

describe("FitProgressTracker", () => {
  it("lists every chain from the start, with no ETA before a speed is known", () => {
    const c = clock();
    const tracker = new FitProgressTracker({ chains: 2, iterationsPerRun: 200, unpooled: true, cellCount: 3 }, c.now);
    const first = tracker.snapshot();
    expect(first.stage).toBe("preparing");
    expect(first.chains.map((ch) => [ch.chain, ch.iteration, ch.total, ch.etaSeconds])).toEqual([
      [0, 0, 200, null],
      [1, 0, 200, null],
    ]);
    expect(first.etaSeconds).toBeNull();
  });

  it("gives each chain an ETA from its own speed, and the fit a share done over both models", () => {
    const c = clock();
    const tracker = new FitProgressTracker({ chains: 2, iterationsPerRun: 200, unpooled: true, cellCount: 3 }, c.now);
    tracker.update(progress({ chain: 0, iteration: 0 }));
    tracker.update(progress({ chain: 1, iteration: 0 }));
    c.advance(2);
    tracker.update(progress({ chain: 0, iteration: 100, phase: "warmup" }));
    tracker.update(progress({ chain: 1, iteration: 50 }));
    const s = tracker.snapshot();
    expect(s.stage).toBe("pooled");
    // 100 iterations in 2 s → 100 left take 2 s; 50 in 2 s → 150 left take 6 s.
    expect(s.chains.map((ch) => ch.etaSeconds)).toEqual([2, 6]);
    // Pooled half done on average (0.5 + 0.25)/2; the comparison counts as the other half.
    expect(s.fraction).toBeCloseTo(0.1875, 12);
    expect(s.etaSeconds).toBeCloseTo((2 * (1 - 0.1875)) / 0.1875, 9);

    tracker.update(progress({ model: "unpooled", chain: 0, iteration: 300, total: 600, cell: 1, cellCount: 3 }));
    const u = tracker.snapshot();
    expect(u.stage).toBe("unpooled");
    expect(u.chains[0]).toMatchObject({ model: "unpooled", iteration: 300, total: 600, cell: 1, cellCount: 3 });
    expect(u.chains[1]).toMatchObject({ model: "unpooled", iteration: 0, total: 600 });
    expect(u.fraction).toBeCloseTo(0.5 + 0.5 * 0.25, 12);

    tracker.setStage("summarising");
    expect(tracker.snapshot().fraction).toBe(1);
    expect(tracker.snapshot().etaSeconds).toBe(0);
  });

  it("restarts a chain's clock when its model runs a second time", () => {
    const c = clock();
    const tracker = new FitProgressTracker({ chains: 1, iterationsPerRun: 200, unpooled: false, cellCount: 1 }, c.now);
    tracker.update(progress({ iteration: 0 }));
    c.advance(1);
    tracker.update(progress({ iteration: 200, phase: "sampling" }));
    tracker.update(progress({ iteration: 10, attempt: 2 }));
    c.advance(1);
    tracker.update(progress({ iteration: 60, attempt: 2 }));
    const s = tracker.snapshot();
    expect(s.chains[0]).toMatchObject({ iteration: 60, attempt: 2, etaSeconds: 140 / 50 });
    expect(s.fraction).toBeCloseTo(60 / 200, 12);
  });
});

import { describe, expect, it } from "vitest";
import { warmupSchedule } from "../../src/adaptation/window-schedule";

describe("windowed warm-up schedule", () => {
  it("matches Stan's windows for 1000 warm-up iterations (75 / 25 doubling / 50)", () => {
    // Stan Reference Manual, "HMC algorithm parameters": slow windows 25, 50, 100, 200, then
    // the last one stretched to end where the 50-iteration terminal buffer starts (hand-computed).
    expect(warmupSchedule(1000).windows).toEqual([
      { start: 75, end: 99 },
      { start: 100, end: 149 },
      { start: 150, end: 249 },
      { start: 250, end: 449 },
      { start: 450, end: 949 },
    ]);
  });

  it("shrinks the buffers to 15 % / 10 % when the defaults do not fit (as Stan)", () => {
    const s = warmupSchedule(100);
    expect(s.initBuffer).toBe(15);
    expect(s.termBuffer).toBe(10);
    expect(s.windows).toEqual([{ start: 15, end: 89 }]);
  });

  it("estimates no metric below 20 warm-up iterations", () => {
    expect(warmupSchedule(19).windows).toEqual([]);
    expect(warmupSchedule(0).windows).toEqual([]);
  });

  it("tiles the slow phase without gaps for any warm-up length", () => {
    for (let w = 20; w <= 3000; w += 37) {
      const s = warmupSchedule(w);
      expect(s.windows[0]!.start).toBe(s.initBuffer);
      expect(s.windows.at(-1)!.end).toBe(w - s.termBuffer - 1);
      for (let i = 1; i < s.windows.length; i++) expect(s.windows[i]!.start).toBe(s.windows[i - 1]!.end + 1);
    }
  });

  it("rejects a negative or fractional length", () => {
    expect(() => warmupSchedule(-1)).toThrow(/non-negative integer/);
    expect(() => warmupSchedule(2.5)).toThrow(/non-negative integer/);
  });
});

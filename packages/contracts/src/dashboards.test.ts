import { describe, expect, it } from "vitest";
import { clearFlagInput, createFlagInput, shrinkageMarkOf } from "./dashboards";

describe("flag inputs", () => {
  it("accept a flag with kind and note, trimmed", () => {
    expect(createFlagInput.parse({ cellId: " c1 ", channel: "search", kind: "real_difference", note: "  lift test agrees  " })).toEqual({
      cellId: "c1",
      channel: "search",
      kind: "real_difference",
      note: "lift test agrees",
    });
  });

  it("refuse an unknown kind, a missing or too short note, with readable messages", () => {
    const kind = createFlagInput.safeParse({ cellId: "c1", channel: "search", kind: "wrong", note: "a fine note" });
    expect(kind.success).toBe(false);
    expect(kind.error!.issues[0]!.message).toMatch(/data_problem, real_difference, needs_lift_test/);
    const note = createFlagInput.safeParse({ cellId: "c1", channel: "search", kind: "data_problem", note: " x " });
    expect(note.error!.issues[0]!.message).toMatch(/at least 3 characters/);
    const missing = createFlagInput.safeParse({ cellId: "c1", channel: "search", kind: "data_problem" });
    expect(missing.error!.issues[0]!.path).toEqual(["note"]);
    expect(clearFlagInput.safeParse({ note: "x".repeat(2001) }).success).toBe(false);
  });
});

describe("shrinkage mark", () => {
  it("bands the ratio and shows values outside 0–1 as such", () => {
    expect(shrinkageMarkOf(null)).toBeNull();
    expect(shrinkageMarkOf(Number.NaN)).toBeNull();
    expect(shrinkageMarkOf(0.1)).toBe("little");
    expect(shrinkageMarkOf(0.25)).toBe("moderate");
    expect(shrinkageMarkOf(0.5)).toBe("strong");
    expect(shrinkageMarkOf(1)).toBe("strong");
    expect(shrinkageMarkOf(1.2)).toBe("outside");
    expect(shrinkageMarkOf(-0.1)).toBe("outside");
  });
});

import { describe, expect, it } from "vitest";
import { cacRangeOf, DEFAULT_CAC_RANGE, defaultModelSettings, modelSettingsBounds, modelSettingsSchema } from "./model-settings";

describe("modelSettingsSchema", () => {
  it("fills every default from a dataset version alone", () => {
    expect(defaultModelSettings("v1")).toEqual({
      datasetVersionId: "v1",
      cacRanges: [],
      maxLag: 8,
      saturation: "exponential",
      likelihood: "normal",
      seasonalityOrder: 2,
      pooling: "crossed",
      holdoutWeeks: 0,
      chains: 4,
      warmup: 1000,
      draws: 1000,
      unpooledComparison: true,
    });
  });

  it("keeps what is given and reads a channel without a range as the default range", () => {
    const settings = modelSettingsSchema.parse({
      datasetVersionId: "v1",
      cacRanges: [{ channel: "social", lo: 20, hi: 400 }],
      maxLag: 12,
      saturation: "hill",
      likelihood: "student-t",
      pooling: "cell-only",
      seed: 42,
      unpooledComparison: false,
    });
    expect(settings).toMatchObject({ maxLag: 12, saturation: "hill", likelihood: "student-t", pooling: "cell-only", seed: 42, unpooledComparison: false });
    expect(cacRangeOf(settings, "social")).toEqual({ lo: 20, hi: 400 });
    expect(cacRangeOf(settings, "tv")).toEqual(DEFAULT_CAC_RANGE);
  });

  it.each([
    [{ maxLag: 0 }, "maxLag", "at least 1"],
    [{ maxLag: 17 }, "maxLag", "at most 16"],
    [{ maxLag: 2.5 }, "maxLag", "whole number"],
    [{ seasonalityOrder: 5 }, "seasonalityOrder", "at most 4"],
    [{ holdoutWeeks: 27 }, "holdoutWeeks", "at most 26"],
    [{ chains: 9 }, "chains", "at most 8"],
    [{ warmup: 10 }, "warmup", "at least 50"],
    [{ draws: 6000 }, "draws", "at most 5000"],
    [{ seed: -1 }, "seed", "at least 0"],
    [{ saturation: "linear" }, "saturation", ""],
    [{ pooling: "everything" }, "pooling", ""],
    [{ cacRanges: [{ channel: "tv", lo: 0, hi: 10 }] }, "cacRanges.0.lo", "greater than 0"],
    [{ cacRanges: [{ channel: "tv", lo: 50, hi: 50 }] }, "cacRanges.0.hi", "above the lowest"],
    [{ cacRanges: [{ channel: "tv", lo: 5, hi: 50 }, { channel: "tv", lo: 6, hi: 60 }] }, "cacRanges", "at most one range"],
    [{ datasetVersionId: "" }, "datasetVersionId", "Choose a dataset version"],
  ])("refuses %j, naming %s", (change, path, words) => {
    const result = modelSettingsSchema.safeParse({ datasetVersionId: "v1", ...change });
    expect(result.success).toBe(false);
    const issue = result.error!.issues.find((i) => i.path.join(".") === path);
    expect(issue, JSON.stringify(result.error!.issues)).toBeDefined();
    expect(issue!.message).toContain(words);
  });

  it("accepts every bound itself", () => {
    const b = modelSettingsBounds;
    for (const edge of ["min", "max"] as const) {
      const result = modelSettingsSchema.safeParse({
        datasetVersionId: "v1",
        maxLag: b.maxLag[edge],
        seasonalityOrder: b.seasonalityOrder[edge],
        holdoutWeeks: b.holdoutWeeks[edge],
        chains: b.chains[edge],
        warmup: b.warmup[edge],
        draws: b.draws[edge],
        seed: b.seed[edge],
      });
      expect(result.success, edge).toBe(true);
    }
  });
});

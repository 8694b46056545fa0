// The fit job's worker thread on its own: options the model refuses come back as a
// failure with a reason a person can read.
import { afterAll, describe, expect, it } from "vitest";
import { readTidyCsv } from "@tributary/intake";
import { localFitRunner } from "../app";
import { defaultConfig } from "../config";
import { tinyCsv } from "../testing/fit-fixtures";

const runner = localFitRunner({ ...defaultConfig, fitChainThreads: 1 });
afterAll(() => runner.close());

describe("the fit worker", () => {
  it("fails with the model's own words when the options cannot be fitted", async () => {
    const read = readTidyCsv(tinyCsv(), { shortCellWeeks: 8 });
    if (!read.ok) throw new Error("fixture should validate");
    runner.enqueue({
      id: "bad-options",
      input: { data: read.data, options: { chains: 2, warmup: 100, draws: 100, model: { holdoutWeeks: 39 } }, cellIds: ["a", "b", "c"], keepDraws: 100, traceCount: 2 },
    });
    const outcome = await runner.result("bad-options");
    expect(outcome?.state).toBe("failed");
    expect(outcome?.state === "failed" && outcome.reason).toMatch(/^The model cannot be fitted to this data with these settings: .*holdout/i);
  });
});

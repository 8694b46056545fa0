import { mkdtemp, readFile, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { readTidyCsv } from "@tributary/intake";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startCli } from "./cli-test-helpers";
import { exampleCsv, examplePortfolioDesign } from "./example-portfolio";

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), "tributary-example-data-"));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

const runExample = (args: string[]) => startCli("apps/cli/src/example-data.ts", args).done;

describe("pnpm fit:example-data", () => {
  it("writes a tidy CSV that the intake accepts as it is, the same for the same seed", async () => {
    const out = join(dir, "example.csv");
    const run = await runExample([out, "--seed", "5"]);
    expect(run.code, run.stderr).toBe(0);
    expect(run.stderr).toContain(`Wrote ${out}`);
    const text = await readFile(out, "utf8");
    expect(text).toBe(exampleCsv(5));
    expect(text.split("\n")[0]).toBe("week,brand,market,new_customers,spend_search,spend_social,spend_video");
    const read = readTidyCsv(text);
    expect(read.ok, JSON.stringify(read.report.errors.slice(0, 3))).toBe(true);
    if (!read.ok) return;
    expect(read.report.errorCount).toBe(0);
    expect(read.data.channels).toEqual(["search", "social", "video"]);
    expect(read.data.cells).toHaveLength(examplePortfolioDesign.cells.length);
    const weeks = read.data.cells.reduce((sum, c) => sum + c.outcome.length, 0);
    expect(weeks).toBe(examplePortfolioDesign.cells.reduce((sum, c) => sum + c.weeks, 0));
  });

  it("gives different data for a different seed", () => {
    expect(exampleCsv(6)).not.toBe(exampleCsv(5));
  });

  it("rejects a bad seed or a missing file name with exit code 2", async () => {
    const bad = await runExample([join(dir, "x.csv"), "--seed", "1.5"]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/--seed must be a whole number/);
    const none = await runExample([]);
    expect(none.code).toBe(2);
    expect(none.stderr).toMatch(/Give exactly one output file/);
  });
});

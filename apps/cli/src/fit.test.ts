// The `fit` command run as a child process (`tsx apps/cli/src/fit.ts`), as a user runs it.
import { existsSync } from "node:fs";
import { mkdtemp, readdir, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runFitCli, smallPortfolio, startCli } from "./cli-test-helpers";
import { tidyCsvOf } from "./example-portfolio";

let dir: string;
let goodCsv: string;
const simulated = smallPortfolio(7);
const quick = ["--chains", "1", "--warmup", "10", "--draws", "10", "--no-unpooled"];

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), "tributary-fit-cli-"));
  goodCsv = join(dir, "portfolio.csv");
  await writeFile(goodCsv, tidyCsvOf(simulated.data));
});

afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

/** The good CSV with some edit applied to its rows (row 0 is the header, i.e. spreadsheet row 1). */
async function editedCsv(name: string, edit: (rows: string[][]) => string[][]): Promise<string> {
  const rows = Papa.parse<string[]>(tidyCsvOf(simulated.data).trim(), { header: false }).data;
  const file = join(dir, name);
  await writeFile(file, `${Papa.unparse(edit(rows.map((r) => [...r])), { newline: "\n" })}\n`);
  return file;
}

function column(rows: string[][], name: string): number {
  const i = rows[0]!.indexOf(name);
  if (i < 0) throw new Error(`no column ${name}`);
  return i;
}

describe("pnpm fit on a small generated portfolio", () => {
  let run: Awaited<ReturnType<typeof runFitCli>>;
  let out: string;
  let json: any; // the written JSON, checked key by key below

  beforeAll(async () => {
    out = join(dir, "fit.json");
    run = await runFitCli([goodCsv, "--out", out, "--chains", "2", "--warmup", "150", "--draws", "150", "--seed", "3"]);
    json = run.code === 0 ? JSON.parse(await readFile(out, "utf8")) : null;
  }, 240_000);

  it("exits 0, writes the result and tells how it went", () => {
    expect(run.stderr).toContain("Read ");
    expect(run.code, run.stderr).toBe(0);
    expect(run.stderr).toContain(`Wrote ${out}`);
    expect(run.stderr).toMatch(/Max R-hat \d\.\d{3}, min bulk ESS \d+/);
    expect(run.stderr).toContain("lift test");
  });

  it("prints plain progress lines (stderr is not a terminal) for every chain of both models", () => {
    expect(run.stderr).not.toMatch(/\x1b\[/);
    for (const chain of ["1/2", "2/2"]) {
      expect(run.stderr).toMatch(new RegExp(`pooled model: chain ${chain} sampling 300/300, \\d+ divergences?, time left about`));
      expect(run.stderr).toMatch(new RegExp(`no-pooling comparison: chain ${chain} sampling 900/900, cell 3/3`));
    }
  });

  it("writes JSON with the diagnostics, timing, channel and cell keys", () => {
    expect(json).not.toBeNull();
    expect(Object.keys(json)).toEqual(
      expect.arrayContaining(["format", "caution", "input", "settings", "diagnostics", "timing", "channels", "cells", "poolingFactors"]),
    );
    expect(Object.keys(json.diagnostics)).toEqual(
      expect.arrayContaining(["maxRhat", "minEssBulk", "minEssTail", "divergences", "gradientEvaluations", "trustworthy", "reasons", "pooled", "unpooled"]),
    );
    expect(Object.keys(json.timing)).toEqual(expect.arrayContaining(["samplingSeconds", "totalSeconds"]));
    expect(json.settings).toMatchObject({ chains: 2, warmup: 150, draws: 150, seed: 3, unpooled: true });
    expect(json.input).toMatchObject({ cells: 3, channels: ["search", "video"], outcomeColumn: "new_customers", rows: 226 });
    expect(json.channels.map((c: { channel: string }) => c.channel)).toEqual(["search", "video"]);
    for (const ch of json.channels) {
      for (const key of ["mu", "tauBrand", "tauMarket", "tauCell", "alpha", "lambda"]) {
        expect(Object.keys(ch[key]).sort()).toEqual(["essBulk", "mean", "q05", "q50", "q95", "rhat", "sd"]);
      }
    }
    expect(json.cells).toHaveLength(6);
    for (const cell of json.cells) {
      expect(Object.keys(cell)).toEqual(
        expect.arrayContaining(["brand", "market", "channel", "cac0", "cac0Unpooled", "shrinkage", "outlier", "outlierReason"]),
      );
    }
  });

  it("has sane numbers", () => {
    const d = json.diagnostics;
    expect(d.maxRhat).toBeGreaterThan(0.95);
    expect(d.maxRhat).toBeLessThan(2);
    expect(d.minEssBulk).toBeGreaterThan(1);
    expect(d.minEssTail).toBeGreaterThan(1);
    expect(Number.isInteger(d.divergences) && d.divergences >= 0).toBe(true);
    expect(d.gradientEvaluations).toBeGreaterThan(1000);
    expect(typeof d.trustworthy).toBe("boolean");
    // 2 × 150 draws cannot give a bulk ESS of 400 for every parameter: the trust rule must say so
    expect(d.trustworthy).toBe(false);
    expect(d.reasons.some((r: string) => r.includes("Bulk ESS is below 400"))).toBe(true);
    expect(json.timing.samplingSeconds).toBeGreaterThan(0);
    expect(json.timing.totalSeconds).toBeGreaterThanOrEqual(json.timing.samplingSeconds);
    for (const cell of json.cells) {
      for (const s of [cell.cac0, cell.cac0Unpooled]) {
        expect(s.q05).toBeGreaterThan(0);
        expect(s.q05).toBeLessThanOrEqual(s.q50);
        expect(s.q50).toBeLessThanOrEqual(s.q95);
      }
      // the data were generated with known CAC0: the pooled median is within a factor of 3 of it
      const g = simulated.data.cells.findIndex((c) => c.brand === cell.brand && c.market === cell.market);
      const truth = simulated.truth.cells[g]!.cac0[simulated.data.channels.indexOf(cell.channel)]!;
      expect(cell.cac0.q50 / truth).toBeGreaterThan(1 / 3);
      expect(cell.cac0.q50 / truth).toBeLessThan(3);
    }
  });

  it("leaves no temporary file behind", async () => {
    expect((await readdir(dir)).filter((f) => f.endsWith(".tmp"))).toEqual([]);
  });
});

describe.concurrent("pnpm fit on bad input exits 2, names file, row and column, and writes nothing", () => {
  const cases: [string, (rows: string[][]) => string[][], RegExp][] = [
    ["non-numeric value", (rows) => ((rows[4]![column(rows, "spend_search")] = "abc"), rows), /row 5, column "spend_search": .*"abc", which is not a number/],
    ["negative spend", (rows) => ((rows[6]![column(rows, "spend_video")] = "-10"), rows), /row 7, column "spend_video": .*-10.*cannot be negative/],
    ["missing value", (rows) => ((rows[3]![column(rows, "new_customers")] = ""), rows), /row 4, column "new_customers": .*empty/],
    ["duplicate week", (rows) => (rows.splice(5, 0, [...rows[4]!]), rows), /row 6, column "week": .*repeats week/],
    ["gap in the weeks", (rows) => (rows.splice(10, 1), rows), /row \d+, column "week": Alder × Northland has no rows for 1 week/],
    ["missing column", (rows) => rows.map((r) => r.filter((_, i) => i !== column(rows, "market"))), /No column looks like the market/],
    ["no spend columns", (rows) => rows.map((r) => r.filter((_, i) => !rows[0]![i]!.startsWith("spend_"))), /No column looks like spend/],
  ];
  it.each(cases)("%s", async (name, edit, message) => {
    const file = await editedCsv(`${name.replace(/\W+/g, "-")}.csv`, edit);
    const out = join(dir, `${name.replace(/\W+/g, "-")}.json`);
    const run = await runFitCli([file, "--out", out, ...quick]);
    expect(run.code, run.stderr).toBe(2);
    expect(run.stderr).toContain(`error: ${file}: `);
    expect(run.stderr).toMatch(message);
    expect(run.stderr).toContain("Nothing was fitted or written.");
    expect(existsSync(out)).toBe(false);
  });

  it("missing file", async () => {
    const missing = join(dir, "nowhere.csv");
    const run = await runFitCli([missing, "--out", join(dir, "x.json")]);
    expect(run.code).toBe(2);
    expect(run.stderr).toContain(`error: ${missing}: file not found.`);
  });

  it("not a CSV file", async () => {
    const file = join(dir, "report.json");
    await writeFile(file, '{"weeks": [1, 2, 3]}');
    const run = await runFitCli([file, "--out", join(dir, "x.json")]);
    expect(run.code).toBe(2);
    expect(run.stderr).toContain(`error: ${file}: This looks like a JSON document, not a CSV file.`);
  });

  it("two possible outcome columns: asks for --outcome, and --outcome picks one", async () => {
    const file = await editedCsv("two-outcomes.csv", (rows) =>
      rows.map((r, i) => {
        const copy = [...r];
        copy[column(rows, "new_customers")] = i === 0 ? "signups_a" : copy[column(rows, "new_customers")]!;
        return [...copy, i === 0 ? "signups_b" : "3"];
      }),
    );
    const ambiguous = await runFitCli([file, "--out", join(dir, "two.json"), ...quick]);
    expect(ambiguous.code).toBe(2);
    expect(ambiguous.stderr).toMatch(/Several columns could be the outcome \("signups_a" and "signups_b"\)/);
    expect(ambiguous.stderr).toContain("--outcome <column>");
    const chosen = await runFitCli([file, "--out", join(dir, "two.json"), ...quick, "--outcome", "signups_a"]);
    expect(chosen.code, chosen.stderr).toBe(0);
    const json = JSON.parse(await readFile(join(dir, "two.json"), "utf8"));
    expect(json.input.outcomeColumn).toBe("signups_a");
    const unknown = await runFitCli([file, "--out", join(dir, "two.json"), ...quick, "--outcome", "revenue"]);
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toMatch(/--outcome names column "revenue", which is not in the header/);
  });
});

describe.concurrent("pnpm fit with bad flags exits 2 and writes nothing", () => {
  it.each([
    [["--chains", "0"], /--chains must be a whole number from 1 to 64, got "0"/],
    [["--cac-range", "search=5"], /--cac-range must look like <channel>=<lo>:<hi>/],
    [["--cac-range", "radio=5:50"], /has no channel "radio" \(channels: search, video\)/],
    [["--holdout", "75"], /--holdout: .*at least 8 weeks are needed/],
    [["--likelihood", "laplace"], /--likelihood must be "normal" or "student-t"/],
    [["--warmup", "many"], /--warmup must be a whole number/],
    [["--bogus"], /Unknown option '--bogus'/],
  ])("%j", async (flags, message) => {
    const out = join(dir, `flags-${flags.join("").replace(/\W+/g, "")}.json`);
    const run = await runFitCli([goodCsv, "--out", out, ...flags]);
    expect(run.code, run.stderr).toBe(2);
    expect(run.stderr).toMatch(message);
    expect(existsSync(out)).toBe(false);
  });

  it("an output folder that does not exist", async () => {
    const run = await runFitCli([goodCsv, "--out", join(dir, "missing-folder", "fit.json")]);
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/--out .*the folder .*missing-folder does not exist/);
  });

  it("--help prints the usage and exits 0", async () => {
    const run = await runFitCli(["--help"]);
    expect(run.code).toBe(0);
    expect(run.stdout).toContain("Usage: pnpm fit <data.csv> --out <result.json>");
  });
});

describe("Ctrl-C", () => {
  it("stops the chains, exits 130 and writes no file", async () => {
    const out = join(dir, "interrupted.json");
    const cli = startCli("apps/cli/src/fit.ts", [goodCsv, "--out", out, "--chains", "2", "--warmup", "20000", "--draws", "1000"]);
    await new Promise<void>((resolve, reject) => {
      const timer = setInterval(() => {
        if (/pooled model: chain \d\/2 warm-up/.test(cli.stderrSoFar())) {
          clearInterval(timer);
          resolve();
        }
      }, 50);
      void cli.done.then((r) => {
        clearInterval(timer);
        reject(new Error(`the command ended before it was interrupted: ${r.stderr}`));
      });
    });
    cli.child.kill("SIGINT");
    const run = await cli.done;
    expect(run.code, run.stderr).toBe(130);
    expect(run.stderr).toContain(`Cancelled: the chains were stopped and nothing was written to ${out}.`);
    expect(existsSync(out)).toBe(false);
    expect((await readdir(dir)).filter((f) => f.endsWith(".tmp"))).toEqual([]);
  });
});

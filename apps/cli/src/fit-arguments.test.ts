import { describe, expect, it } from "vitest";
import { parseCacRange, parseFitArguments } from "./fit-arguments";
import { UsageError } from "./usage-error";

const base = ["data.csv", "--out", "fit.json"];

function args(extra: string[]) {
  const parsed = parseFitArguments([...base, ...extra]);
  if (parsed.help) throw new Error("unexpected help");
  return parsed.args;
}

describe("parseFitArguments", () => {
  it("fills in the defaults of the reference settings", () => {
    expect(args([])).toEqual({
      input: "data.csv",
      out: "fit.json",
      seed: 1,
      chains: 4,
      warmup: 1000,
      draws: 1000,
      cacRanges: [],
      unpooled: true,
      outcome: null,
      maxLag: 8,
      holdout: 0,
      likelihood: "normal",
      targetAcceptance: 0.8,
      maxTreeDepth: 10,
      retry: true,
    });
  });

  it("reads every flag", () => {
    const a = args([
      "--seed", "42", "--chains", "2", "--warmup", "300", "--draws", "200",
      "--cac-range", "search=20:400", "--cac-range", "Video=50:900",
      "--no-unpooled", "--outcome", "orders", "--max-lag", "6", "--holdout", "8",
      "--likelihood", "student-t", "--target-acceptance", "0.9", "--max-tree-depth", "8", "--no-retry",
    ]);
    expect(a).toMatchObject({ seed: 42, chains: 2, warmup: 300, draws: 200, unpooled: false, outcome: "orders", maxLag: 6, holdout: 8 });
    expect(a).toMatchObject({ likelihood: "student-t", targetAcceptance: 0.9, maxTreeDepth: 8, retry: false });
    expect(a.cacRanges).toEqual([
      { channel: "search", lo: 20, hi: 400 },
      { channel: "video", lo: 50, hi: 900 },
    ]);
    expect(parseFitArguments(["--help"])).toEqual({ help: true });
  });

  it.each([
    [["--chains", "0"], /--chains must be a whole number from 1 to 64, got "0"/],
    [["--chains", "two"], /--chains must be a whole number/],
    [["--chains", "2.5"], /--chains must be a whole number/],
    [["--draws", "0"], /--draws must be a whole number from 1/],
    [["--warmup", "-5"], /--warmup/],
    [["--seed", "4294967296"], /--seed must be a whole number from 0 to 4294967295/],
    [["--max-lag", "0"], /--max-lag must be a whole number from 1 to 52/],
    [["--max-lag", "53"], /--max-lag/],
    [["--holdout", "x"], /--holdout must be a whole number/],
    [["--likelihood", "cauchy"], /--likelihood must be "normal" or "student-t", got "cauchy"/],
    [["--target-acceptance", "1"], /--target-acceptance must be a number between 0 and 1/],
    [["--max-tree-depth", "16"], /--max-tree-depth must be a whole number from 1 to 15/],
    [["--cac-range", "search=5"], /--cac-range must look like <channel>=<lo>:<hi>.*got "search=5"/],
    [["--cac-range", "search"], /--cac-range must look like/],
    [["--cac-range", "=5:10"], /--cac-range must look like/],
    [["--cac-range", "search=a:10"], /two positive numbers/],
    [["--cac-range", "search=400:20"], /low end must be above 0 and below the high end/],
    [["--cac-range", "search=0:20"], /low end must be above 0/],
    [["--cac-range", "search=5:10", "--cac-range", "search=6:12"], /given twice for channel "search"/],
    [["--outcome", " "], /--outcome needs a column name/],
    [["--colour"], /Unknown option '--colour'/],
    [["--chains"], /--chains/],
    [["extra.csv"], /exactly one data file; got 2/],
  ])("rejects %j", (extra, message) => {
    expect(() => parseFitArguments([...base, ...extra])).toThrow(UsageError);
    expect(() => parseFitArguments([...base, ...extra])).toThrow(message);
  });

  it("needs the data file and --out", () => {
    expect(() => parseFitArguments(["--out", "fit.json"])).toThrow(/Give the data file/);
    expect(() => parseFitArguments(["data.csv"])).toThrow(/--out <result.json> is required/);
  });
});

describe("parseCacRange", () => {
  it("accepts decimals and exponents, and lower-cases the channel", () => {
    expect(parseCacRange("Paid_Social=2.5:1e3")).toEqual({ channel: "paid_social", lo: 2.5, hi: 1000 });
  });
});

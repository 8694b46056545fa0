import { fitPortfolio, isFitCancelled, validateFitInput, type FitOptions, type FitResult, type PortfolioData, type RunChains } from "@tributary/stats";
import { SamplerWorkerPool } from "@tributary/stats/node";
import { fitUsage, parseFitArguments, type FitArguments } from "./fit-arguments";
import { ProgressDisplay, formatDuration, type ProgressStream } from "./progress-display";
import { readPortfolioFile, type PortfolioFile } from "./read-portfolio";
import { EXIT_FAILURE, EXIT_INTERRUPTED, EXIT_OK, EXIT_USAGE, UsageError } from "./usage-error";
import { checkWritable, writeFileAtomic } from "./write-atomic";

export const CAUTION =
  "These estimates come from a statistical model fitted to observational data. Confirm them with a controlled experiment (a lift test) before moving budget.";

/** Where the command writes and how it learns of Ctrl-C; the real process by default. */
export interface CommandIo {
  readonly stdout: ProgressStream;
  readonly stderr: ProgressStream;
  /** Calls `stop` on an interrupt (Ctrl-C, or a termination request); returns an unsubscribe function. */
  readonly onInterrupt: (stop: (signal: "SIGINT" | "SIGTERM") => void) => () => void;
}

export const processIo: CommandIo = {
  stdout: process.stdout,
  stderr: process.stderr,
  onInterrupt(stop) {
    const onInt = (): void => stop("SIGINT");
    const onTerm = (): void => stop("SIGTERM");
    process.on("SIGINT", onInt);
    process.on("SIGTERM", onTerm);
    return () => {
      process.off("SIGINT", onInt);
      process.off("SIGTERM", onTerm);
    };
  },
};

function fitOptions(args: FitArguments): FitOptions {
  return {
    chains: args.chains,
    warmup: args.warmup,
    draws: args.draws,
    seed: args.seed,
    maxTreeDepth: args.maxTreeDepth,
    targetAcceptance: args.targetAcceptance,
    unpooled: args.unpooled,
    retryAtHigherAcceptance: args.retry,
    model: {
      maxLag: args.maxLag,
      likelihood: args.likelihood,
      holdoutWeeks: args.holdout,
      cacRange: Object.fromEntries(args.cacRanges.map((r) => [r.channel, [r.lo, r.hi] as const])),
    },
  };
}

/** Checks the flags that depend on the data (channels of --cac-range, the holdout) before anything runs. */
function checkAgainstData(args: FitArguments, file: PortfolioFile, options: FitOptions): void {
  const channels = file.data.channels;
  for (const range of args.cacRanges) {
    if (!channels.includes(range.channel)) {
      throw new UsageError(`--cac-range ${range.channel}=${range.lo}:${range.hi}: ${args.input} has no channel "${range.channel}" (channels: ${channels.join(", ")}).`);
    }
  }
  try {
    validateFitInput(file.data, options);
  } catch (error) {
    if (!(error instanceof RangeError)) throw error;
    const flag = /holdout/i.test(error.message) ? "--holdout: " : "";
    throw new UsageError(`${args.input}: ${flag}${error.message}`);
  }
}

type FitOutcome = { readonly kind: "done"; readonly result: FitResult } | { readonly kind: "interrupted"; readonly signal: "SIGINT" | "SIGTERM" };

/** Runs the fit with the chains in worker threads, drawing progress; an interrupt stops every chain. */
async function runFit(data: PortfolioData, options: FitOptions, io: CommandIo): Promise<FitOutcome> {
  const display = new ProgressDisplay(io.stderr, options.chains ?? 4);
  const pool = new SamplerWorkerPool();
  const controller = new AbortController();
  let interrupt: "SIGINT" | "SIGTERM" | null = null;
  const unsubscribe = io.onInterrupt((signal) => {
    interrupt ??= signal;
    controller.abort();
  });
  const runChains: RunChains = (spec, settings, onProgress, signal) => pool.run(spec, settings, { onProgress, signal });
  try {
    const result = await fitPortfolio(data, options, { runChains, signal: controller.signal, onProgress: (p) => display.update(p) });
    // an interrupt that came while the last summaries were computed still means: write nothing
    if (interrupt !== null) return { kind: "interrupted", signal: interrupt };
    return { kind: "done", result };
  } catch (error) {
    if (isFitCancelled(error) && interrupt !== null) return { kind: "interrupted", signal: interrupt };
    if (error instanceof RangeError) throw new UsageError(error.message);
    throw error;
  } finally {
    unsubscribe();
    display.finish();
    await pool.close();
  }
}

function outputDocument(args: FitArguments, file: PortfolioFile, result: FitResult): unknown {
  const data = file.data;
  // the draw set (typed arrays for planning) is for the product's store, not this summary file
  const { drawSet: _drawSet, ...summary } = result;
  return {
    format: "tributary-fit",
    version: 1,
    createdAt: new Date().toISOString(),
    caution: CAUTION,
    input: {
      file: args.input,
      rows: file.rows,
      cells: data.cells.length,
      brands: [...new Set(data.cells.map((c) => c.brand))],
      markets: [...new Set(data.cells.map((c) => c.market))],
      channels: data.channels,
      outcomeColumn: file.mapping.outcome,
      spendColumns: file.mapping.channels.map((c) => ({ channel: c.channel, column: c.column })),
    },
    ...summary,
  };
}

function describeRun(args: FitArguments, file: PortfolioFile): string {
  const data = file.data;
  return (
    `Read ${args.input}: ${data.cells.length} cell${data.cells.length === 1 ? "" : "s"}, ${data.channels.length} channel${data.channels.length === 1 ? "" : "s"} ` +
    `(${data.channels.join(", ")}), ${file.rows} weeks of data.\n` +
    `Fitting ${args.chains} chain${args.chains === 1 ? "" : "s"} × (${args.warmup} warm-up + ${args.draws} draws), seed ${args.seed}` +
    `${args.unpooled ? ", then the no-pooling comparison cell by cell" : ""}.\n`
  );
}

function describeResult(result: FitResult, out: string): string {
  const d = result.diagnostics;
  const lines = [
    `Wrote ${out} in ${formatDuration(result.timing.totalSeconds)} (sampling ${formatDuration(result.timing.samplingSeconds)}).`,
    `Max R-hat ${d.maxRhat.toFixed(3)}, min bulk ESS ${Math.round(d.minEssBulk)}, min tail ESS ${Math.round(d.minEssTail)}, ${d.divergences} divergence${d.divergences === 1 ? "" : "s"}.`,
  ];
  if (d.trustworthy) lines.push("The run meets the trust rule (R-hat ≤ 1.01, bulk ESS ≥ 400, no divergences).");
  else {
    lines.push("NOT TRUSTWORTHY — do not use these numbers for decisions yet:");
    for (const reason of d.reasons) lines.push(`  - ${reason}`);
  }
  for (const warning of d.warnings) lines.push(`note: ${warning}`);
  lines.push(CAUTION);
  return `${lines.join("\n")}\n`;
}

const MAX_WARNINGS_SHOWN = 10;

/** The `fit` command; returns the exit code (0 done, 2 bad input or flags, 130 interrupted, 1 anything else). */
export async function runFitCommand(argv: readonly string[], io: CommandIo = processIo): Promise<number> {
  let args: FitArguments;
  let file: PortfolioFile;
  let options: FitOptions;
  try {
    const parsed = parseFitArguments(argv);
    if (parsed.help) {
      io.stdout.write(fitUsage);
      return EXIT_OK;
    }
    args = parsed.args;
    await checkWritable(args.out, args.input);
    file = await readPortfolioFile(args.input, args.outcome);
    options = fitOptions(args);
    checkAgainstData(args, file, options);
  } catch (error) {
    if (error instanceof UsageError) {
      io.stderr.write(`error: ${error.message}\nNothing was fitted or written. Run "pnpm fit --help" for the options.\n`);
      return EXIT_USAGE;
    }
    throw error;
  }
  file.warnings.slice(0, MAX_WARNINGS_SHOWN).forEach((w) => io.stderr.write(`warning: ${w}\n`));
  if (file.warnings.length > MAX_WARNINGS_SHOWN) io.stderr.write(`warning: … and ${file.warnings.length - MAX_WARNINGS_SHOWN} more warnings.\n`);
  io.stderr.write(describeRun(args, file));

  let outcome: FitOutcome;
  try {
    outcome = await runFit(file.data, options, io);
  } catch (error) {
    if (error instanceof UsageError) {
      io.stderr.write(`error: ${args.input}: ${error.message}\nNothing was written.\n`);
      return EXIT_USAGE;
    }
    io.stderr.write(`error: the fit failed: ${(error as Error).message}\nNothing was written.\n`);
    return EXIT_FAILURE;
  }
  if (outcome.kind === "interrupted") {
    io.stderr.write(`\nCancelled: the chains were stopped and nothing was written to ${args.out}.\n`);
    return outcome.signal === "SIGINT" ? EXIT_INTERRUPTED : 143;
  }
  try {
    await writeFileAtomic(args.out, `${JSON.stringify(outputDocument(args, file, outcome.result), null, 2)}\n`);
  } catch (error) {
    io.stderr.write(`error: could not write ${args.out}: ${(error as Error).message}\n`);
    return EXIT_FAILURE;
  }
  io.stderr.write(describeResult(outcome.result, args.out));
  return EXIT_OK;
}

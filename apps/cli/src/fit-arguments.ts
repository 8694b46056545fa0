import { parseArgs } from "node:util";
import { UsageError } from "./usage-error";

export const fitUsage = `Usage: pnpm fit <data.csv> --out <result.json> [options]

Fits the portfolio model to a tidy weekly CSV (week, brand, market, one outcome column,
spend_<channel> columns) and writes the estimates and diagnostics as JSON.

Options:
  --out <file>                    where to write the result (required; written only when the fit finishes)
  --seed <n>                      random seed, 0–4294967295 (default 1)
  --chains <n>                    number of chains (default 4)
  --warmup <n>                    warm-up iterations per chain (default 1000)
  --draws <n>                     kept draws per chain (default 1000)
  --cac-range <channel>=<lo>:<hi> plausible low-spend cost per new customer of a channel,
                                  read as a 90 % interval (default 5:2000); repeat per channel
  --no-unpooled                   skip the no-pooling comparison (no shrinkage or outlier flags)
  --outcome <column>              the outcome column, when more than one numeric column could be it
  --max-lag <n>                   maximum adstock lag in weeks, 1–52 (default 8)
  --holdout <k>                   leave the last k weeks of every cell out of the fit (default 0)
  --likelihood normal|student-t   noise distribution (default normal)
  --target-acceptance <p>         step-size adaptation target, between 0 and 1 (default 0.8)
  --max-tree-depth <n>            most trajectory doublings per iteration, 1–15 (default 10)
  --no-retry                      do not rerun a model at target acceptance 0.9 after divergences
  --help                          show this text
`;

export interface CacRangeArgument {
  readonly channel: string;
  readonly lo: number;
  readonly hi: number;
}

export interface FitArguments {
  readonly input: string;
  readonly out: string;
  readonly seed: number;
  readonly chains: number;
  readonly warmup: number;
  readonly draws: number;
  readonly cacRanges: readonly CacRangeArgument[];
  readonly unpooled: boolean;
  readonly outcome: string | null;
  readonly maxLag: number;
  readonly holdout: number;
  readonly likelihood: "normal" | "student-t";
  readonly targetAcceptance: number;
  readonly maxTreeDepth: number;
  readonly retry: boolean;
}

export type ParsedCommand = { readonly help: true } | { readonly help: false; readonly args: FitArguments };

function integerFlag(name: string, raw: string | undefined, fallback: number, min: number, max: number): number {
  if (raw === undefined) return fallback;
  const text = raw.trim();
  const value = /^[0-9]+$/.test(text) ? Number(text) : Number.NaN;
  if (!Number.isSafeInteger(value) || value < min || value > max) {
    throw new UsageError(`--${name} must be a whole number from ${min} to ${max}, got "${raw}".`);
  }
  return value;
}

const positiveNumber = /^(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:e[+-]?[0-9]+)?$/i;

/** Parses `<channel>=<lo>:<hi>` with 0 < lo < hi. */
export function parseCacRange(raw: string): CacRangeArgument {
  const shape = `--cac-range must look like <channel>=<lo>:<hi>, e.g. search=20:400`;
  const eq = raw.indexOf("=");
  if (eq <= 0) throw new UsageError(`${shape}; got "${raw}".`);
  const channel = raw.slice(0, eq).trim().toLowerCase();
  const range = raw.slice(eq + 1);
  const parts = range.split(":");
  if (channel === "" || parts.length !== 2) throw new UsageError(`${shape}; got "${raw}".`);
  const [loText, hiText] = parts.map((p) => p.trim()) as [string, string];
  if (!positiveNumber.test(loText) || !positiveNumber.test(hiText)) throw new UsageError(`${shape} with two positive numbers; got "${raw}".`);
  const lo = Number(loText);
  const hi = Number(hiText);
  if (!(Number.isFinite(lo) && Number.isFinite(hi) && lo > 0 && hi > lo)) {
    throw new UsageError(`--cac-range ${channel}: the low end must be above 0 and below the high end; got ${loText}:${hiText}.`);
  }
  return { channel, lo, hi };
}

/** Reads the command line (without the node and script paths); throws UsageError on anything wrong. */
export function parseFitArguments(argv: readonly string[]): ParsedCommand {
  let parsed;
  try {
    parsed = parseArgs({
      args: [...argv],
      allowPositionals: true,
      strict: true,
      options: {
        out: { type: "string" },
        seed: { type: "string" },
        chains: { type: "string" },
        warmup: { type: "string" },
        draws: { type: "string" },
        "cac-range": { type: "string", multiple: true },
        "no-unpooled": { type: "boolean" },
        outcome: { type: "string" },
        "max-lag": { type: "string" },
        holdout: { type: "string" },
        likelihood: { type: "string" },
        "target-acceptance": { type: "string" },
        "max-tree-depth": { type: "string" },
        "no-retry": { type: "boolean" },
        help: { type: "boolean", short: "h" },
      },
    });
  } catch (error) {
    throw new UsageError(`${(error as Error).message.replace(/\s+To specify a positional argument.*$/s, "")} (see --help).`);
  }
  const v = parsed.values;
  if (v.help === true) return { help: true };
  if (parsed.positionals.length === 0) throw new UsageError("Give the data file: pnpm fit <data.csv> --out <result.json>.");
  if (parsed.positionals.length > 1) {
    throw new UsageError(`Give exactly one data file; got ${parsed.positionals.length}: ${parsed.positionals.map((p) => `"${p}"`).join(", ")}.`);
  }
  const input = parsed.positionals[0]!;
  if (v.out === undefined || v.out.trim() === "") throw new UsageError("--out <result.json> is required: where to write the result.");

  const likelihood = v.likelihood ?? "normal";
  if (likelihood !== "normal" && likelihood !== "student-t") throw new UsageError(`--likelihood must be "normal" or "student-t", got "${likelihood}".`);

  let targetAcceptance = 0.8;
  if (v["target-acceptance"] !== undefined) {
    const raw = v["target-acceptance"].trim();
    targetAcceptance = positiveNumber.test(raw) ? Number(raw) : Number.NaN;
    if (!(targetAcceptance > 0 && targetAcceptance < 1)) throw new UsageError(`--target-acceptance must be a number between 0 and 1, got "${v["target-acceptance"]}".`);
  }

  const cacRanges = (v["cac-range"] ?? []).map(parseCacRange);
  const seen = new Set<string>();
  for (const range of cacRanges) {
    if (seen.has(range.channel)) throw new UsageError(`--cac-range is given twice for channel "${range.channel}".`);
    seen.add(range.channel);
  }

  const outcome = v.outcome === undefined ? null : v.outcome.trim();
  if (outcome === "") throw new UsageError("--outcome needs a column name.");

  return {
    help: false,
    args: {
      input,
      out: v.out,
      seed: integerFlag("seed", v.seed, 1, 0, 0xffffffff),
      chains: integerFlag("chains", v.chains, 4, 1, 64),
      warmup: integerFlag("warmup", v.warmup, 1000, 0, 1_000_000),
      draws: integerFlag("draws", v.draws, 1000, 1, 1_000_000),
      cacRanges,
      unpooled: v["no-unpooled"] !== true,
      outcome,
      maxLag: integerFlag("max-lag", v["max-lag"], 8, 1, 52),
      holdout: integerFlag("holdout", v.holdout, 0, 0, 10_000),
      likelihood,
      targetAcceptance,
      maxTreeDepth: integerFlag("max-tree-depth", v["max-tree-depth"], 10, 1, 15),
      retry: v["no-retry"] !== true,
    },
  };
}

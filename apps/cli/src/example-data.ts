// `pnpm fit:example-data <out.csv> [--seed N]`: writes a small generated portfolio to try `pnpm fit` on.
import { parseArgs } from "node:util";
import { exampleCsv } from "./example-portfolio";
import { EXIT_OK, EXIT_USAGE, UsageError } from "./usage-error";
import { checkWritable, writeFileAtomic } from "./write-atomic";

const usage = `Usage: pnpm fit:example-data <out.csv> [--seed N]

Writes a small invented portfolio (3 brands, 3 markets, 6 cells, 3 channels, up to 104
weeks) generated from the portfolio model, as a tidy CSV that \`pnpm fit\` reads.
`;

async function main(argv: readonly string[]): Promise<number> {
  try {
    let parsed;
    try {
      parsed = parseArgs({ args: [...argv], allowPositionals: true, strict: true, options: { seed: { type: "string" }, help: { type: "boolean", short: "h" } } });
    } catch (error) {
      throw new UsageError((error as Error).message);
    }
    if (parsed.values.help === true) {
      process.stdout.write(usage);
      return EXIT_OK;
    }
    if (parsed.positionals.length !== 1) throw new UsageError("Give exactly one output file: pnpm fit:example-data <out.csv> [--seed N].");
    const out = parsed.positionals[0]!;
    const rawSeed = parsed.values.seed ?? "1";
    const seed = /^[0-9]+$/.test(rawSeed.trim()) ? Number(rawSeed.trim()) : Number.NaN;
    if (!Number.isSafeInteger(seed) || seed > 0xffffffff) throw new UsageError(`--seed must be a whole number from 0 to 4294967295, got "${rawSeed}".`);
    await checkWritable(out);
    await writeFileAtomic(out, exampleCsv(seed));
    process.stderr.write(`Wrote ${out} (invented example portfolio, seed ${seed}). Try: pnpm fit ${out} --out fit.json\n`);
    return EXIT_OK;
  } catch (error) {
    if (error instanceof UsageError) {
      process.stderr.write(`error: ${error.message}\n`);
      return EXIT_USAGE;
    }
    throw error;
  }
}

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (error: unknown) => {
    process.stderr.write(`error: ${error instanceof Error ? error.message : String(error)}\n`);
    process.exitCode = 1;
  },
);

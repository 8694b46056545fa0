// `pnpm fit <data.csv> --out <result.json>`: fits the portfolio model from the command line.
import { runFitCommand } from "./fit-command";

runFitCommand(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (error: unknown) => {
    process.stderr.write(`error: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`);
    process.exitCode = 1;
  },
);

// Helpers for the CLI tests: run a command as a child process through tsx, and small portfolios.
import { spawn, type ChildProcess } from "node:child_process";
import { fileURLToPath } from "node:url";
import { createRandomSource, simulatePortfolio, type SimulatedPortfolio, type SimulationDesign } from "@tributary/stats";

export const repoRoot = fileURLToPath(new URL("../../../", import.meta.url));
const tsx = fileURLToPath(new URL("../../../node_modules/.bin/tsx", import.meta.url));

export interface CliRun {
  readonly code: number | null;
  readonly signal: NodeJS.Signals | null;
  readonly stdout: string;
  readonly stderr: string;
}

/** Starts `tsx <script> ...args` from the repository root, stdout and stderr piped (so not a TTY). */
export function startCli(script: string, args: readonly string[]): { child: ChildProcess; done: Promise<CliRun>; stderrSoFar: () => string } {
  const child = spawn(tsx, [script, ...args], { cwd: repoRoot, stdio: ["ignore", "pipe", "pipe"], env: { ...process.env, NO_COLOR: "1" } });
  let stdout = "";
  let stderr = "";
  child.stdout!.on("data", (chunk: Buffer) => (stdout += chunk.toString("utf8")));
  child.stderr!.on("data", (chunk: Buffer) => (stderr += chunk.toString("utf8")));
  const done = new Promise<CliRun>((resolve, reject) => {
    child.on("error", reject);
    child.on("close", (code, signal) => resolve({ code, signal, stdout, stderr }));
  });
  return { child, done, stderrSoFar: () => stderr };
}

export function runFitCli(args: readonly string[]): Promise<CliRun> {
  return startCli("apps/cli/src/fit.ts", args).done;
}

/** A small invented portfolio: 3 cells (2 brands × 2 markets), 2 channels, 78 weeks. */
export const smallDesign: SimulationDesign = {
  channels: ["search", "video"],
  cells: [
    { brand: "Alder", market: "Northland", firstWeek: "2023-01-02", weeks: 78, typicalSpend: [4000, 6000], baseline: 400 },
    { brand: "Alder", market: "Southmere", firstWeek: "2023-01-02", weeks: 78, typicalSpend: [2000, 1500], baseline: 150 },
    { brand: "Birchwood", market: "Northland", firstWeek: "2023-03-06", weeks: 70, typicalSpend: [3000, 2500], baseline: 250 },
  ],
};

export function smallPortfolio(seed = 7): SimulatedPortfolio {
  return simulatePortfolio(smallDesign, createRandomSource(seed));
}

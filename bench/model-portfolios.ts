// The portfolios the model benchmarks run on (all invented): the example portfolio of
// `pnpm fit:example-data` (through its CSV and the shared intake, as `pnpm fit` reads it),
// the demo portfolio (simulated as the API seeds it, outcomes in whole customers) and the
// generated benchmark portfolio.
import { readTidyCsv } from "@tributary/intake";
import { exampleCsv } from "../apps/cli/src/example-portfolio";
import { simulateDemo } from "../apps/api/src/demo/simulate-demo";
import type { PortfolioData } from "../packages/stats/src/data/portfolio-data";
import { benchmarkPortfolio } from "./model-portfolio";

export type PortfolioName = "example" | "demo" | "benchmark";

/** The example portfolio written with data seed `seed`, read back as `pnpm fit` reads it. */
export function examplePortfolio(seed: number): PortfolioData {
  const result = readTidyCsv(exampleCsv(seed));
  if (!result.ok) throw new Error(`example portfolio ${seed} did not pass the intake: ${result.report.errors.map((e) => e.message).join("; ")}`);
  return result.data;
}

/** The demo portfolio as the API seeds it (outcomes rounded to whole customers). */
export function demoPortfolio(): PortfolioData {
  const { data } = simulateDemo();
  return { ...data, cells: data.cells.map((cell) => ({ ...cell, outcome: Float64Array.from(cell.outcome, (y) => Math.round(y)) })) };
}

export function portfolioByName(name: PortfolioName, dataSeed = 1): PortfolioData {
  if (name === "example") return examplePortfolio(dataSeed);
  if (name === "demo") return demoPortfolio();
  return benchmarkPortfolio().data;
}

export const portfolioDescriptions: Record<PortfolioName, string> = {
  example: "6 cells (3 brands × 3 markets, unbalanced) × 3 channels × 52–104 weeks, `pnpm fit:example-data --seed N`",
  demo: "14 cells (3 brands × 6 markets) × 5 channels × 26–156 weeks, one cell truly different (apps/api demo)",
  benchmark: "10 cells (4 brands × 3 markets) × 4 channels × 156 weeks (two cells of 26 weeks), bench/model-portfolio.ts",
};

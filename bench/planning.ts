// Times the planning maths (packages/stats/src/planning) on the demo portfolio's shape:
// 14 cells × 5 channels = 70 budget lines, 1,000 posterior draws. The draws are points
// of the pooled model drawn around its initial region (a stand-in for a fitted run: the
// timings depend on the shape, not on the values). Prints JSON.
// Run: pnpm bench:planning  (or pnpm tsx bench/planning.ts [--out bench/results/planning.json])
import { writeFileSync } from "node:fs";
import { cpus, loadavg } from "node:os";
import { performance } from "node:perf_hooks";
import { applyScenario, budgetSplit, buildDrawSet, buildPortfolioModel, comparePlans, createRandomSource, currentPlan, forecastPlan } from "../packages/stats/src/index";
import { simulateDemo } from "../apps/api/src/demo/simulate-demo";

const DRAWS = 1000;
const RUNS = 15;

const { data } = simulateDemo();
const model = buildPortfolioModel(data, {});
const width = model.constrainedNames.length;
const matrix = new Float64Array(DRAWS * width);
const q = new Float64Array(model.dimension);
const rng = createRandomSource(7);
for (let d = 0; d < DRAWS; d++) {
  model.initialPoint!(rng, q);
  model.constrain(q, matrix.subarray(d * width, (d + 1) * width));
}
const set = buildDrawSet(data, {}, { names: model.constrainedNames, draws: matrix });
const current = currentPlan(set);
const currentTotal = current.spend.reduce((a, b) => a + b, 0);
const brands = [...new Set(set.cells.map((c) => c.brand))];
const customerValue = Object.fromEntries(brands.map((b, i) => [b, 120 + 40 * i]));

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[sorted.length >> 1]!;
}

function time<T>(runs: number, fn: (i: number) => T): { medianMs: number; maxMs: number; last: T } {
  let last = fn(0); // warm the JIT
  const timings: number[] = [];
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    last = fn(i + 1);
    timings.push(performance.now() - start);
  }
  return { medianMs: Number(median(timings).toFixed(1)), maxMs: Number(Math.max(...timings).toFixed(1)), last };
}

const customers = time(RUNS, (i) => budgetSplit(set, { totalBudget: currentTotal * (1 + 0.01 * i) }));
const profit = time(RUNS, (i) => budgetSplit(set, { totalBudget: currentTotal * (1 + 0.01 * i), objective: { kind: "profit", customerValue } }));
const bounded = time(RUNS, (i) =>
  budgetSplit(set, {
    totalBudget: currentTotal * (1 + 0.01 * i),
    // every line of the last channel gets at least 1 %, no line of the first more than 0.5 %
    bounds: [
      { target: { channels: [set.channels[set.channels.length - 1]!] }, lower: 0.01 * currentTotal },
      { target: { channels: [set.channels[0]!] }, upper: 0.005 * currentTotal },
    ],
  }),
);
const quantile = time(3, () => budgetSplit(set, { totalBudget: currentTotal, risk: { kind: "lower-quantile", quantile: 0.1 } }));
const meanSd = time(3, () => budgetSplit(set, { totalBudget: currentTotal, risk: { kind: "mean-minus-sd", penalty: 1 } }));
const forecast = time(5, (i) => forecastPlan(set, current, { seed: i + 1 }));
const scenario = applyScenario(current, [{ kind: "scale", target: { channels: [set.channels[2]!] }, factor: 1.25 }]);
const comparison = time(5, (i) => comparePlans(set, current, scenario, { seed: i + 1 }));

const report = {
  what: "planning maths on the demo portfolio's shape (Node, one thread)",
  cells: set.cells.length,
  channels: set.channels.length,
  lines: set.cells.length * set.channels.length,
  draws: DRAWS,
  node: process.version,
  cpus: cpus().length,
  // Other work on the machine inflates the timings; the 1-minute load average at the end is kept for context.
  loadAverage1m: 0,
  budgetSplit: {
    expectedCustomers: { ...pick(customers), exact: customers.last.exact, equalMarginalSpread: customers.last.equalMarginalSpread, linesAtBounds: customers.last.linesAtBounds.length },
    expectedCustomersWithBounds: { ...pick(bounded), exact: bounded.last.exact, equalMarginalSpread: bounded.last.equalMarginalSpread, linesAtBounds: bounded.last.linesAtBounds.length },
    expectedProfit: { ...pick(profit), exact: profit.last.exact, budgetBinding: profit.last.budgetBinding, equalMarginalSpread: profit.last.equalMarginalSpread },
    lowerQuantile10: { ...pick(quantile), criterion: quantile.last.riskCriterion },
    meanMinusSd: { ...pick(meanSd), criterion: meanSd.last.riskCriterion },
  },
  forecast13Weeks: pick(forecast),
  compareScenario13Weeks: pick(comparison),
};

function pick(t: { medianMs: number; maxMs: number }): { medianMs: number; maxMs: number } {
  return { medianMs: t.medianMs, maxMs: t.maxMs };
}

report.loadAverage1m = Number(loadavg()[0]!.toFixed(2));
const json = JSON.stringify(report, null, 2);
console.log(json);
const outIndex = process.argv.indexOf("--out");
if (outIndex > 0 && process.argv[outIndex + 1]) writeFileSync(process.argv[outIndex + 1]!, json + "\n");

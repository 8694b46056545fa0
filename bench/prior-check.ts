// Times the prior predictive check (packages/stats/src/prior-check) on the demo portfolio:
// 14 cells, 5 channels, 1,716 cell-weeks, at the draw count the Model setup screen uses.
// Prints JSON. Run: pnpm tsx bench/prior-check.ts [--out bench/results/prior-check.json]
import { writeFileSync } from "node:fs";
import { cpus, loadavg } from "node:os";
import { performance } from "node:perf_hooks";
import { priorCheck } from "../packages/stats/src/index";
import { simulateDemo } from "../apps/api/src/demo/simulate-demo";

const { data } = simulateDemo();
const runs = 25;
const drawCounts = [200, 400];

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[sorted.length >> 1] as number;
}

const results = drawCounts.map((draws) => {
  const timings: number[] = [];
  priorCheck(data, {}, { draws, seed: 1 }); // warm the JIT
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    priorCheck(data, { cacRange: { search: [10 + i, 400] } }, { draws, seed: i + 1 });
    timings.push(performance.now() - start);
  }
  return { draws, runs, medianMs: Number(median(timings).toFixed(1)), maxMs: Number(Math.max(...timings).toFixed(1)) };
});

const cellWeeks = data.cells.reduce((sum, cell) => sum + cell.outcome.length, 0);
const report = {
  what: "priorCheck on the demo portfolio (Node, one thread)",
  cells: data.cells.length,
  channels: data.channels.length,
  cellWeeks,
  node: process.version,
  cores: cpus().length,
  // Other work on the machine slows every number here; the one-minute load average says how busy it was.
  loadAverageAtEnd: Number(loadavg()[0]!.toFixed(2)),
  results,
};
const json = JSON.stringify(report, null, 2);
console.log(json);
const outIndex = process.argv.indexOf("--out");
if (outIndex > 0 && process.argv[outIndex + 1]) writeFileSync(process.argv[outIndex + 1]!, json + "\n");

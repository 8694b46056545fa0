// Times a fit job as the API runs it (a worker thread per fit, chains in the fit's own
// thread or on a chain pool) on the example dataset, for each number of chain threads
// up to the cores, and reports the CPU the whole process used. Prints JSON.
// Run: pnpm tsx bench/api-fit-jobs.ts [--out bench/results/api-fit-jobs.json]
import { writeFileSync } from "node:fs";
import { availableParallelism, loadavg } from "node:os";
import { readTidyCsv } from "../packages/intake/src/index";
import { localFitRunner } from "../apps/api/src/app";
import { defaultConfig } from "../apps/api/src/config";
import { exampleCsv } from "../apps/api/src/datasets/example-csv";

const read = readTidyCsv(exampleCsv());
if (!read.ok) throw new Error("the example file does not validate");
const data = read.data;
const settings = { chains: 4, warmup: 300, draws: 300, seed: 11, unpooled: true } as const;
const cores = availableParallelism();

async function timeFit(chainThreads: number) {
  const runner = localFitRunner({ ...defaultConfig, fitConcurrency: 1, fitChainThreads: chainThreads });
  const cpuBefore = process.cpuUsage();
  const started = performance.now();
  runner.enqueue({
    id: `bench-${chainThreads}`,
    input: { data, options: settings, cellIds: data.cells.map((_, g) => `cell-${g}`), keepDraws: 1000, traceCount: 6 },
  });
  const outcome = await runner.result(`bench-${chainThreads}`)!;
  const seconds = (performance.now() - started) / 1000;
  const cpu = process.cpuUsage(cpuBefore);
  await runner.close();
  if (outcome.state !== "succeeded") throw new Error(`the fit did not succeed: ${JSON.stringify(outcome)}`);
  const timing = outcome.output.result.timing;
  return {
    chainThreads,
    wallSeconds: Number(seconds.toFixed(2)),
    samplingSeconds: Number(timing.samplingSeconds.toFixed(2)),
    pooledSeconds: Number(timing.pooledSeconds.toFixed(2)),
    unpooledSeconds: Number(timing.unpooledSeconds.toFixed(2)),
    // CPU of this process, every thread included, over the wall time: how many cores the fit kept busy.
    coresBusy: Number(((cpu.user + cpu.system) / 1e6 / seconds).toFixed(2)),
    maxRhat: outcome.output.result.diagnostics.maxRhat,
  };
}

// The machine may be shared: its load before and after is reported with the timings.
const loadBefore = loadavg()[0];
const results = [];
for (let threads = 1; threads <= cores; threads++) results.push(await timeFit(threads));
const report = {
  what: "one fit job through the API's local job runner: example dataset (3 cells, 3 channels, 248 rows), 4 chains × (300 warm-up + 300 draws), pooled + no-pooling comparison, report data",
  cores,
  node: process.version,
  loadAverage: { before: Number(loadBefore!.toFixed(2)), after: Number(loadavg()[0]!.toFixed(2)) },
  results,
};
const json = JSON.stringify(report, null, 2);
console.log(json);
const out = process.argv.indexOf("--out");
if (out >= 0 && process.argv[out + 1]) writeFileSync(process.argv[out + 1]!, `${json}\n`);

// How often the pooled portfolio model diverges, over several data sets and sampler seeds:
// for each data seed × sampler seed one fit of 4 chains × (1000 + 1000) on worker threads,
// with the divergent transitions after warm-up, gradient evaluations and step sizes of each.
// Used to choose the sampler geometry's settings (e.g. the guide's variance floor); prints JSON.
//   tsx bench/model-divergence-sweep.ts [--portfolio example|demo|benchmark]
//       [--data-seeds 1,2,4] [--seeds 1,2,3,4] [--target 0.8] [--out FILE]
import { writeFileSync } from "node:fs";
import { availableParallelism } from "node:os";
import { portfolioPooledKind } from "../packages/stats/src/model/portfolio/portfolio-model-kinds";
import { sampleChainsInWorkers } from "../packages/stats/src/parallel/node-worker-pool";
import { summariseRun } from "../packages/stats/src/diagnostics/summarise-run";
import { GUIDE_VARIANCE_FLOOR } from "../packages/stats/src/model/portfolio/cell-parametrisation";
import { portfolioByName, type PortfolioName } from "./model-portfolios";

const argv = process.argv.slice(2);
const option = (name: string, fallback: string): string => {
  const i = argv.indexOf(name);
  return i >= 0 && argv[i + 1] !== undefined ? argv[i + 1]! : fallback;
};
const portfolioName = option("--portfolio", "example") as PortfolioName;
if (!["example", "demo", "benchmark"].includes(portfolioName)) throw new Error("--portfolio must be example, demo or benchmark");
const list = (text: string): number[] => text.split(",").map((v) => {
  const n = Number(v);
  if (!Number.isInteger(n)) throw new Error(`not an integer seed: ${v}`);
  return n;
});
const dataSeeds = portfolioName === "example" ? list(option("--data-seeds", "1,2,4")) : [1];
const seeds = list(option("--seeds", "1,2,3,4"));
const targetAcceptance = Number(option("--target", "0.8"));
const outFile = argv.includes("--out") ? option("--out", "") : undefined;

const runs = [];
const started = performance.now();
for (const dataSeed of dataSeeds) {
  const portfolio = portfolioByName(portfolioName, dataSeed);
  for (const seed of seeds) {
    const t0 = performance.now();
    const chains = await sampleChainsInWorkers(
      { kind: portfolioPooledKind, data: { portfolio, options: {} } },
      { chains: 4, warmup: 1000, draws: 1000, seed, maxTreeDepth: 10, targetAcceptance },
    );
    const { diagnostics } = summariseRun(chains);
    const divergences = diagnostics.divergences;
    runs.push({
      dataSeed,
      seed,
      divergences,
      gradientEvaluations: diagnostics.gradientEvaluations,
      stepSizes: chains.map((chain) => chain.stepSize),
      maxRhat: diagnostics.maxRhat,
      minEssBulk: diagnostics.minEssBulk,
      wallSeconds: (performance.now() - t0) / 1000,
    });
    process.stderr.write(`data ${dataSeed} seed ${seed}: ${divergences} divergences\n`);
  }
}
const result = {
  benchmark: "model-divergence-sweep",
  portfolio: portfolioName,
  guideVarianceFloor: GUIDE_VARIANCE_FLOOR,
  settings: { chains: 4, warmup: 1000, draws: 1000, maxTreeDepth: 10, targetAcceptance },
  cores: availableParallelism(),
  fits: runs.length,
  fitsWithDivergences: runs.filter((r) => r.divergences > 0).length,
  divergences: runs.reduce((sum, r) => sum + r.divergences, 0),
  gradientEvaluations: runs.reduce((sum, r) => sum + r.gradientEvaluations, 0),
  wallSeconds: (performance.now() - started) / 1000,
  runs,
};
const json = JSON.stringify(result, null, 2);
console.log(json);
if (outFile) writeFileSync(outFile, `${json}\n`);

// Simulation-based calibration of the portfolio model on a small portfolio (Talts,
// Betancourt, Simpson, Vehtari & Gelman 2018, arXiv:1804.06788): draw every parameter from
// its prior, simulate outcomes from the model, fit, and rank the true value among thinned
// posterior draws. With a correct density and sampler the ranks are uniform; a chi-square
// test per parameter checks it. Prints JSON; `--out FILE` also writes it; `--sims N`.
import { writeFileSync } from "node:fs";
import { chiSquareUpperTail } from "./chi-square";
import { absoluteWeekOf } from "../packages/stats/src/model/absolute-week";
import { adstockGeometric } from "../packages/stats/src/model/adstock";
import { seasonalDesignCentred, trendCentred } from "../packages/stats/src/model/baseline";
import { channelEffectPrior, type PortfolioModelOptions } from "../packages/stats/src/model/portfolio/portfolio-options";
import { portfolioPooledKind } from "../packages/stats/src/model/portfolio/portfolio-model-kinds";
import type { PortfolioData } from "../packages/stats/src/data/portfolio-data";
import { SamplerWorkerPool } from "../packages/stats/src/parallel/node-worker-pool";
import { createRandomSource } from "../packages/stats/src/rng/create-random-source";
import type { RandomSource } from "../packages/stats/src/rng/random-source";
import { drawBeta, drawHalfNormal } from "../packages/stats/src/simulate/random-draws";
import { simulatePortfolio } from "../packages/stats/src/simulate/simulate-portfolio";

const argv = process.argv.slice(2);
const option = (name: string): string | undefined => {
  const i = argv.indexOf(name);
  return i >= 0 ? argv[i + 1] : undefined;
};
const sims = Number(option("--sims") ?? 200);
const outFile = option("--out");
const BINS = 10;
const KEPT = 99; // thinned posterior draws per fit: ranks 0..99, 10 per bin
const THIN = 10;

const channels = ["Search", "Video"];
const { data: design } = simulatePortfolio(
  {
    channels,
    cells: [
      { brand: "Alder", market: "Northland", firstWeek: "2023-01-02", weeks: 52, typicalSpend: [6000, 8000], baseline: 300 },
      { brand: "Alder", market: "Southmere", firstWeek: "2023-01-02", weeks: 52, typicalSpend: [4000, 5000], baseline: 300 },
      { brand: "Birchwood", market: "Northland", firstWeek: "2023-01-02", weeks: 52, typicalSpend: [5000, 3000], baseline: 300 },
    ],
  },
  createRandomSource(5),
);
const G = design.cells.length;
const C = channels.length;
const J = 2;
const centre = [300, 300, 300];
const scale = [60, 60, 60];
const options: PortfolioModelOptions = {
  cacRange: { Search: [20, 400], Video: [20, 400] },
  // the prior must not depend on the outcomes for calibration to hold
  baselinePriorScale: { centre, scale },
};
const brandOf = [0, 0, 1];
const marketOf = [0, 1, 0];

/** One draw of every parameter from the model's prior, and outcomes simulated from the model. */
function drawFromPrior(rng: RandomSource): { truth: Record<string, number>; data: PortfolioData } {
  const truth: Record<string, number> = {};
  const muPrior = channelEffectPrior([20, 400]);
  const chan = channels.map((ch) => {
    const v = {
      mu: muPrior.mean + muPrior.sd * rng.normal(),
      tauBrand: drawHalfNormal(rng, 0.5),
      tauMarket: drawHalfNormal(rng, 0.5),
      tauCell: drawHalfNormal(rng, 0.5),
      alpha: drawBeta(rng, 2, 2),
      lambda: Math.exp(Math.log(2) + 0.75 * rng.normal()),
    };
    for (const [k, x] of Object.entries(v)) truth[`${k}[${ch}]`] = x;
    return v;
  });
  const zB = [0, 1].map(() => channels.map(() => rng.normal()));
  const zM = [0, 1].map(() => channels.map(() => rng.normal()));
  const cells = design.cells.map((cell, g) => {
    const T = cell.outcome.length;
    const s = scale[g]!;
    const beta0 = centre[g]! + s * rng.normal();
    const beta1 = s * rng.normal();
    const gamma = [0, 1].map(() => (s / 2) * rng.normal());
    const delta = [0, 1].map(() => (s / 2) * rng.normal());
    const sigma = drawHalfNormal(rng, s);
    truth[`beta0[${g}]`] = beta0;
    truth[`beta1[${g}]`] = beta1;
    truth[`sigma[${g}]`] = sigma;
    gamma.forEach((x, j) => (truth[`gamma[${g},${j + 1}]`] = x));
    delta.forEach((x, j) => (truth[`delta[${g},${j + 1}]`] = x));
    const seasonal = seasonalDesignCentred(absoluteWeekOf(cell.firstWeek), T, J);
    const mean = new Float64Array(T);
    for (let t = 0; t < T; t++) {
      mean[t] = beta0 + beta1 * trendCentred(t, T);
      for (let j = 0; j < J; j++) mean[t] = mean[t]! + gamma[j]! * seasonal[2 * j * T + t]! + delta[j]! * seasonal[(2 * j + 1) * T + t]!;
    }
    const adstocked = new Float64Array(T);
    channels.forEach((ch, c) => {
      const ct = chan[c]!;
      const logBeta = ct.mu + ct.tauBrand * zB[brandOf[g]!]![c]! + ct.tauMarket * zM[marketOf[g]!]![c]! + ct.tauCell * rng.normal();
      const beta = Math.exp(logBeta);
      truth[`beta[${g},${ch}]`] = beta;
      const x = cell.spend[c]!;
      const positive = Array.from(x).filter((v) => v > 0);
      const theta = ct.lambda * (positive.length > 0 ? positive.reduce((a, b) => a + b, 0) / positive.length : 1);
      adstockGeometric(x, ct.alpha, 8, adstocked);
      const r = Array.from(adstocked, (a) => theta * (1 - Math.exp(-a / theta)));
      const rMean = r.reduce((a, b) => a + b, 0) / T;
      for (let t = 0; t < T; t++) mean[t] = mean[t]! + beta * (r[t]! - rMean);
    });
    const outcome = Float64Array.from(mean, (m) => m + sigma * rng.normal());
    return { ...cell, outcome };
  });
  return { truth, data: { channels, controls: [], cells } };
}


const rng = createRandomSource(20241);
const problems = Array.from({ length: sims }, () => drawFromPrior(rng));
const names = Object.keys(problems[0]!.truth);
const ranks: Record<string, number[]> = Object.fromEntries(names.map((n) => [n, []]));
const pools = [new SamplerWorkerPool({ maxWorkers: 1 }), new SamplerWorkerPool({ maxWorkers: 1 })];
let divergences = 0;
let fitsWithDivergences = 0;
const started = performance.now();
let next = 0;
async function worker(pool: SamplerWorkerPool): Promise<void> {
  while (next < problems.length) {
    const i = next++;
    const problem = problems[i]!;
    const [chain] = await pool.run(
      { kind: portfolioPooledKind, data: { portfolio: problem.data, options } },
      { chains: 1, warmup: 500, draws: KEPT * THIN, thin: THIN, seed: 1000 + i, maxTreeDepth: 10, targetAcceptance: 0.8 },
    );
    const c = chain!;
    const width = c.names.length;
    const kept = c.draws.length / width;
    const d = c.divergent.reduce((a, b) => a + b, 0);
    divergences += d;
    if (d > 0) fitsWithDivergences++;
    for (const name of names) {
      const j = c.names.indexOf(name);
      let below = 0;
      for (let k = 0; k < kept; k++) if (c.draws[k * width + j]! < problem.truth[name]!) below++;
      ranks[name]!.push(below);
    }
  }
}
await Promise.all(pools.map(worker));
await Promise.all(pools.map((p) => p.close()));
const seconds = (performance.now() - started) / 1000;

const expected = sims / BINS;
const parameters = names.map((name) => {
  const histogram = new Array<number>(BINS).fill(0);
  for (const r of ranks[name]!) histogram[Math.min(BINS - 1, Math.floor((r * BINS) / (KEPT + 1)))]! += 1;
  const chiSquare = histogram.reduce((a, h) => a + (h - expected) ** 2 / expected, 0);
  return { name, histogram, chiSquare, pValue: chiSquareUpperTail(chiSquare, BINS - 1) };
});
const minP = Math.min(...parameters.map((p) => p.pValue));
const result = {
  benchmark: "model-sbc",
  method: "Talts et al. (2018): ranks of the prior draw among 99 thinned posterior draws, 10 bins, chi-square test per parameter",
  model: "pooled portfolio model, 3 cells (2 brands × 2 markets) × 2 channels × 52 weeks, fixed baseline prior scale",
  simulations: sims,
  sampler: { chains: 1, warmup: 500, draws: KEPT * THIN, thin: THIN },
  seconds,
  divergences,
  fitsWithDivergences,
  parameters,
  smallestPValue: minP,
  // with many parameters some small p-values are expected by chance: Bonferroni at 1 %
  uniform: minP > 0.01 / parameters.length,
};
const json = JSON.stringify(result, null, 2);
console.log(json);
if (outFile) writeFileSync(outFile, `${json}\n`);

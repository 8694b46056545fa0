// Portfolio model benchmark: the benchmark portfolio (10 cells × 4 channels × up to 156
// weeks, two cells of 26 weeks), 4 chains × (1000 warm-up + 1000 draws) of Tributary's
// NUTS on worker threads; with R and rstan (bench/setup-stan.sh) also the same density in
// Stan (bench/model.stan) on the same data, side by side. Also the demo portfolio and the
// example portfolio of `pnpm fit:example-data` (Tributary only). Prints JSON; `--out FILE`
// also writes it; `--no-stan` skips Stan; `--stan-from FILE` takes the Stan run from an
// earlier result file (same data and seed; Stan's side does not depend on our code) instead
// of running it again; `--seed N`; `--density-only` only compares the log densities of the
// two implementations at a few points; `--stan-adapt-delta X` sets Stan's target acceptance
// (default 0.8); `--stan-only` runs only Stan (and the density check) and writes its side, to
// be reused with `--stan-from` while the machine is otherwise quiet.
import { readFileSync } from "node:fs";
import { execFileSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { availableParallelism, cpus, tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { absoluteWeekOf } from "../packages/stats/src/model/absolute-week";
import { summariseRun } from "../packages/stats/src/diagnostics/summarise-run";
import { mcseQuantile } from "../packages/stats/src/diagnostics/mcse";
import { buildPortfolioModel } from "../packages/stats/src/model/portfolio/build-portfolio-model";
import { portfolioPooledKind } from "../packages/stats/src/model/portfolio/portfolio-model-kinds";
import type { PortfolioModelOptions } from "../packages/stats/src/model/portfolio/portfolio-options";
import type { PortfolioData } from "../packages/stats/src/data/portfolio-data";
import { sampleChainsInWorkers } from "../packages/stats/src/parallel/node-worker-pool";
import { createRandomSource } from "../packages/stats/src/rng/create-random-source";
import type { ChainResult, SamplerSettings } from "../packages/stats/src/sampler/sampler-settings";
import { normalQuantile } from "../packages/stats/src/diagnostics/normal-quantile";
import { chiSquareUpperTail } from "./chi-square";
import { benchmarkPortfolio } from "./model-portfolio";
import { demoPortfolio, examplePortfolio, portfolioDescriptions } from "./model-portfolios";

const argv = process.argv.slice(2);
const option = (name: string): string | undefined => {
  const i = argv.indexOf(name);
  return i >= 0 ? argv[i + 1] : undefined;
};
const withStan = !argv.includes("--no-stan");
const outFile = option("--out");
const seed = Number(option("--seed") ?? 2024);
const stanFrom = option("--stan-from");
const stanAdaptDelta = Number(option("--stan-adapt-delta") ?? 0.8);
if (!(stanAdaptDelta > 0 && stanAdaptDelta < 1)) throw new Error("--stan-adapt-delta must be between 0 and 1");
const stanOnly = argv.includes("--stan-only");
const options: PortfolioModelOptions = {};
/** The named parameters of the specification; min ESS and max R-hat are taken over these on both sides. */
const NAMED = /^(mu|tauBrand|tauMarket|tauCell|alpha|lambda|cac0|beta0|beta1|sigma|gamma|delta)\[/;

const { data, truth } = benchmarkPortfolio();

function gradientTime(): number {
  const model = buildPortfolioModel(data, options);
  const rng = createRandomSource(7);
  const points = Array.from({ length: 16 }, () => {
    const q = new Float64Array(model.dimension);
    model.initialPoint(rng, q);
    return q;
  });
  const grad = new Float64Array(model.dimension);
  for (let i = 0; i < 20_000; i++) model.logDensityGradient(points[i % 16]!, grad);
  const runs: number[] = [];
  for (let rep = 0; rep < 5; rep++) {
    const start = process.cpuUsage();
    for (let i = 0; i < 10_000; i++) model.logDensityGradient(points[i % 16]!, grad);
    const used = process.cpuUsage(start);
    runs.push((used.user + used.system) / 1000 / 10_000);
  }
  return runs.sort((a, b) => a - b)[2]!;
}

function column(chains: readonly ChainResult[], name: string): Float64Array[] {
  const j = chains[0]!.names.indexOf(name);
  const width = chains[0]!.names.length;
  return chains.map((c) => {
    const n = c.draws.length / width;
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) out[i] = c.draws[i * width + j]!;
    return out;
  });
}

async function runTributary() {
  const settings: SamplerSettings = { chains: 4, warmup: 1000, draws: 1000, seed, maxTreeDepth: 10, targetAcceptance: 0.8 };
  const started = performance.now();
  const chains = await sampleChainsInWorkers({ kind: portfolioPooledKind, data: { portfolio: data, options } }, settings);
  const wallSeconds = (performance.now() - started) / 1000;
  const summary = summariseRun(chains);
  const named = summary.parameters.filter((p) => NAMED.test(p.name));
  const minEss = named.reduce((m, p) => (p.essBulk < m.essBulk ? p : m));
  const depths: Record<number, number> = {};
  for (const c of chains) for (const d of c.treeDepth) depths[d] = (depths[d] ?? 0) + 1;
  const chainSeconds = chains.map((c) => c.seconds);
  const cac0 = data.cells.flatMap((_, g) =>
    data.channels.map((ch) => {
      const name = `cac0[${g},${ch}]`;
      const p = summary.parameters.find((s) => s.name === name)!;
      const truthValue = truth.cells[g]!.cac0[data.channels.indexOf(ch)]!;
      return { name, median: p.q50, mcseMedian: mcseQuantile(column(chains, name), 0.5), q05: p.q05, q95: p.q95, truth: truthValue, covered: truthValue >= p.q05 && truthValue <= p.q95 };
    }),
  );
  return {
    wallSeconds,
    chainSeconds,
    gradientEvaluations: summary.diagnostics.gradientEvaluations,
    msPerGradientInChains: (1000 * chainSeconds.reduce((a, b) => a + b, 0)) / summary.diagnostics.gradientEvaluations,
    maxRhat: Math.max(...named.map((p) => p.rhat)),
    maxRhatAll: summary.diagnostics.maxRhat,
    minEssBulk: minEss.essBulk,
    minEssBulkParameter: minEss.name,
    minEssBulkAll: summary.diagnostics.minEssBulk,
    minEssTail: Math.min(...named.map((p) => p.essTail)),
    divergences: summary.diagnostics.divergences,
    treeDepthHits: summary.diagnostics.treeDepthHits,
    treeDepths: depths,
    stepSizes: chains.map((c) => c.stepSize),
    ebfmi: summary.diagnostics.ebfmi,
    trustworthy: summary.diagnostics.trustworthy,
    reasons: summary.diagnostics.reasons,
    essBulkPerSecond: minEss.essBulk / wallSeconds,
    cac0,
    truthCoverage90: cac0.filter((c) => c.covered).length / cac0.length,
  };
}

/** The sampler's diagnostics on another portfolio, same settings (Tributary only). */
async function runOther(portfolio: PortfolioData) {
  const settings: SamplerSettings = { chains: 4, warmup: 1000, draws: 1000, seed, maxTreeDepth: 10, targetAcceptance: 0.8 };
  const started = performance.now();
  const chains = await sampleChainsInWorkers({ kind: portfolioPooledKind, data: { portfolio, options } }, settings);
  const wallSeconds = (performance.now() - started) / 1000;
  const summary = summariseRun(chains);
  const named = summary.parameters.filter((p) => NAMED.test(p.name));
  const minEss = named.reduce((m, p) => (p.essBulk < m.essBulk ? p : m));
  return {
    wallSeconds,
    gradientEvaluations: summary.diagnostics.gradientEvaluations,
    maxRhat: Math.max(...named.map((p) => p.rhat)),
    minEssBulk: minEss.essBulk,
    minEssBulkParameter: minEss.name,
    divergences: summary.diagnostics.divergences,
    treeDepthHits: summary.diagnostics.treeDepthHits,
    stepSizes: chains.map((c) => c.stepSize),
    trustworthy: summary.diagnostics.trustworthy,
    reasons: summary.diagnostics.reasons,
  };
}

/** The data in the layout of bench/model.stan. */
function stanData(portfolio: PortfolioData) {
  const brands = [...new Set(portfolio.cells.map((c) => c.brand))];
  const markets = [...new Set(portfolio.cells.map((c) => c.market))];
  const start: number[] = [];
  const len: number[] = [];
  const y: number[] = [];
  const x: number[][] = [];
  const w: number[] = [];
  for (const cell of portfolio.cells) {
    start.push(y.length + 1);
    len.push(cell.outcome.length);
    const w0 = absoluteWeekOf(cell.firstWeek);
    cell.outcome.forEach((v, t) => {
      y.push(v);
      x.push(cell.spend.map((s) => s[t]!));
      w.push(w0 + t);
    });
  }
  return {
    G: portfolio.cells.length,
    C: portfolio.channels.length,
    B: brands.length,
    M: markets.length,
    J: 2,
    L: 8,
    N: y.length,
    start,
    len,
    brand: portfolio.cells.map((c) => brands.indexOf(c.brand) + 1),
    market: portfolio.cells.map((c) => markets.indexOf(c.market) + 1),
    y,
    x,
    w,
    cac_lo: portfolio.channels.map(() => 5),
    cac_hi: portfolio.channels.map(() => 2000),
  };
}

/**
 * Log density of our model (cell level non-centred, as written in the specification) minus
 * the log-Jacobian of our constraining map, against Stan's log_prob without its Jacobian,
 * at a few points: differences from the first point must agree.
 */
function densityCheck(dataFile: string, dir: string) {
  const model = buildPortfolioModel(data, { ...options, cellEffectGuide: "none" });
  const lay = model.layout;
  const names = model.constrainedNames;
  const rng = createRandomSource(99);
  const G = data.cells.length;
  const C = data.channels.length;
  const pick = (out: Float64Array, base: string) => names.flatMap((n, i) => (n.startsWith(`${base}[`) ? [out[i]!] : []));
  const points: Record<string, number[][]> = {};
  const ours: number[] = [];
  for (let p = 0; p < 4; p++) {
    const q = new Float64Array(model.dimension);
    model.initialPoint(rng, q);
    const out = new Float64Array(names.length);
    model.constrain(q, out);
    let jacobian = 0;
    for (const base of ["tauBrand", "tauMarket", "tauCell", "lambda", "sigma"]) for (const v of pick(out, base)) jacobian += Math.log(v);
    for (const a of pick(out, "alpha")) jacobian += Math.log(a * (1 - a));
    ours.push(model.logDensity(q) - jacobian);
    const add = (key: string, values: number[]) => (points[key] ??= []).push(values);
    for (const base of ["mu", "tauBrand", "tauMarket", "tauCell", "alpha", "lambda", "beta0", "beta1", "sigma"]) add(base, pick(out, base));
    add("zB", Array.from(q.subarray(lay.zBrand, lay.zBrand + model.constants.brands.length * C)));
    add("zM", Array.from(q.subarray(lay.zMarket, lay.zMarket + model.constants.markets.length * C)));
    add("zG", Array.from(q.subarray(lay.zCell, lay.zCell + G * C)));
    add("gamma", pick(out, "gamma"));
    add("delta", pick(out, "delta"));
  }
  const pointsFile = join(dir, "points.json");
  writeFileSync(pointsFile, JSON.stringify(points));
  const script = fileURLToPath(new URL("./model-stan-density.R", import.meta.url));
  const text = execFileSync("Rscript", [script, dataFile, pointsFile], { encoding: "utf8", env: stanEnv(), maxBuffer: 1 << 24 });
  const stan = JSON.parse(text.slice(text.indexOf("["))) as number[];
  const differences = ours.map((v, i) => ({ tributary: v - ours[0]!, stan: stan[i]! - stan[0]! }));
  return { differences, maxAbsoluteDisagreement: Math.max(...differences.map((d) => Math.abs(d.tributary - d.stan))) };
}

function stanEnv() {
  return { ...process.env, TRIBUTARY_STAN_CACHE: process.env["TRIBUTARY_STAN_CACHE"] ?? "/tmp" };
}

function stanAvailable(): string | null {
  if (!withStan) return "skipped (--no-stan)";
  try {
    execFileSync("Rscript", ["-e", "library(rstan); library(posterior); library(jsonlite)"], { stdio: "ignore" });
    return null;
  } catch {
    return "Rscript with rstan, posterior and jsonlite not found: run bench/setup-stan.sh";
  }
}

if (argv.includes("--density-only")) {
  const dir = mkdtempSync(join(tmpdir(), "tributary-model-"));
  const dataFile = join(dir, "data.json");
  writeFileSync(dataFile, JSON.stringify(stanData(data)));
  console.log(JSON.stringify(densityCheck(dataFile, dir), null, 2));
  process.exit(0);
}

interface StanRun {
  wallSeconds: number;
  minEssBulk: number;
  cac0: { name: string; median: number; mcseMedian: number }[];
  [key: string]: unknown;
}

/** The Stan run of an earlier result file, if it was made on the same data with the same settings. */
function stanFromFile(file: string): StanRun {
  const earlier = JSON.parse(readFileSync(file, "utf8")) as { portfolio?: string; settings?: { seed?: number }; stan?: unknown };
  const s = earlier.stan;
  if (typeof s !== "object" || s === null || !("cac0" in s)) throw new Error(`${file} has no Stan run to reuse`);
  const run = s as StanRun;
  if (run["seed"] !== seed || run["chains"] !== 4 || run["warmup"] !== 1000 || run["draws"] !== 1000) throw new Error(`${file}: its Stan run used other settings (seed ${String(run["seed"])}), run Stan again`);
  return run;
}

/**
 * How the cells' differences in units of combined MCSE compare with what two exact samplers
 * would give (each z about standard normal): 2·Φ(−2) ≈ 4.55 % of them beyond 2 by chance
 * alone, so about 1.8 of 40; Σz² against chi-square with one degree of freedom per cell; the
 * largest |z| against the Bonferroni bound for a 5 % family-wise level. The z's of one run
 * are correlated (the cells share μ and the τ's), so these are rough readings.
 */
function agreement(z: number[]) {
  const n = z.length;
  const sumSquares = z.reduce((a, v) => a + v * v, 0);
  return {
    expectedBeyondTwoIfEqual: n * 0.0455,
    meanZ: z.reduce((a, v) => a + v, 0) / n,
    sumSquaredZ: sumSquares,
    chiSquarePValue: chiSquareUpperTail(sumSquares, n),
    maxAbsZ: Math.max(...z.map(Math.abs)),
    bonferroniBound: normalQuantile(1 - 0.025 / n),
  };
}

/** Stan's side: a fresh run (with the density check) or the run of an earlier result file. */
function stanSide(): { run: StanRun; density: string | ReturnType<typeof densityCheck> } {
  const dir = mkdtempSync(join(tmpdir(), "tributary-model-"));
  const dataFile = join(dir, "data.json");
  writeFileSync(dataFile, JSON.stringify(stanData(data)));
  if (stanFrom !== undefined) {
    // the densities are still compared with the current code when R and rstan are here
    const density = stanAvailable() === null ? densityCheck(dataFile, dir) : `not run: R with rstan not found (the Stan run was taken from ${stanFrom})`;
    return { run: stanFromFile(stanFrom), density };
  }
  const density = densityCheck(dataFile, dir);
  const script = fileURLToPath(new URL("./model-stan.R", import.meta.url));
  const cores = String(Math.min(4, availableParallelism()));
  const text = execFileSync("Rscript", [script, dataFile, "4", "1000", "1000", String(seed), cores, String(stanAdaptDelta)], { encoding: "utf8", env: stanEnv(), maxBuffer: 1 << 26 });
  return { run: JSON.parse(text.slice(text.indexOf("{"))) as StanRun, density };
}

const stanMissing = stanFrom === undefined ? stanAvailable() : null;
if (stanOnly) {
  if (stanMissing !== null) throw new Error(`--stan-only: ${stanMissing}`);
  const side = stanSide();
  const json = JSON.stringify({ benchmark: "model (Stan side only)", seed, stan: side.run, densityCheck: side.density }, null, 2);
  console.log(json);
  if (outFile) writeFileSync(outFile, `${json}\n`);
  process.exit(0);
}

const msPerGradient = gradientTime();
const tributary = await runTributary();
const others = { demo: await runOther(demoPortfolio()), example: await runOther(examplePortfolio(1)) };
let stan: null | Record<string, unknown> = null;
let comparison: null | Record<string, unknown> = null;
let density: null | string | ReturnType<typeof densityCheck> = null;
if (stanMissing === null) {
  const side = stanSide();
  const s = side.run;
  density = side.density;
  stan = { ...s, essBulkPerSecond: s.minEssBulk / s.wallSeconds, ...(stanFrom !== undefined ? { reusedFrom: stanFrom } : {}) };
  // Stan names cac0[g,c] with 1-based indices; ours are cac0[g,channel] with 0-based cells
  const cacComparison = tributary.cac0.map((ours, i) => {
    const g = Math.floor(i / data.channels.length);
    const c = i % data.channels.length;
    const theirs = s.cac0.find((x) => x.name === `cac0[${g + 1},${c + 1}]`)!;
    const combinedMcse = Math.hypot(ours.mcseMedian, theirs.mcseMedian);
    return { name: ours.name, tributary: ours.median, stan: theirs.median, combinedMcse, withinTwoMcse: Math.abs(ours.median - theirs.median) <= 2 * combinedMcse };
  });
  const stanGradients = s["gradientEvaluations"] as number;
  const stanChainSeconds = (s["chainSeconds"] as number[]).reduce((a, b) => a + b, 0);
  comparison = {
    essBulkPerSecondRatio: tributary.essBulkPerSecond / (s.minEssBulk / s.wallSeconds),
    // free of other load on the machine: effective draws per gradient, and per second of chain time
    essBulkPerGradientRatio: tributary.minEssBulk / tributary.gradientEvaluations / (s.minEssBulk / stanGradients),
    essBulkPerChainSecondRatio: tributary.minEssBulk / tributary.chainSeconds.reduce((a, b) => a + b, 0) / (s.minEssBulk / stanChainSeconds),
    cac0: cacComparison,
    cac0WithinTwoMcse: cacComparison.filter((c) => c.withinTwoMcse).length,
    cac0Count: cacComparison.length,
    cac0Agreement: agreement(cacComparison.map((c) => (c.tributary - c.stan) / c.combinedMcse)),
  };
}

const result = {
  benchmark: "model",
  portfolio: "10 cells × 4 channels × 156 weeks (two cells of 26 weeks), generated by simulatePortfolio",
  machine: { cores: availableParallelism(), cpu: cpus()[0]?.model ?? "unknown", node: process.version },
  settings: { chains: 4, warmup: 1000, draws: 1000, seed, maxTreeDepth: 10, targetAcceptance: 0.8 },
  msPerGradient,
  tributary,
  otherPortfolios: {
    demo: { portfolio: portfolioDescriptions.demo, ...others.demo },
    example: { portfolio: `${portfolioDescriptions.example}, data seed 1`, ...others.example },
  },
  stan: stan ?? stanMissing,
  densityCheck: density,
  comparison,
  targets: {
    maxRhat: { target: 1.01, met: tributary.maxRhat <= 1.01 },
    minEssBulk: { target: 400, met: tributary.minEssBulk >= 400 },
    divergences: { target: 0, met: tributary.divergences === 0 },
    divergencesDemo: { target: 0, met: others.demo.divergences === 0 },
    divergencesExample: { target: 0, met: others.example.divergences === 0 },
    wallSeconds: { target: 60, met: tributary.wallSeconds < 60 },
    msPerGradient: { target: 0.1, met: msPerGradient <= 0.1 },
    essPerSecondVsStan: comparison ? { target: 3, met: (comparison.essBulkPerSecondRatio as number) >= 3 } : null,
    cac0WithinTwoMcse: comparison ? { met: comparison.cac0WithinTwoMcse === comparison.cac0Count } : null,
  },
};
const json = JSON.stringify(result, null, 2);
console.log(json);
if (outFile) writeFileSync(outFile, `${json}\n`);

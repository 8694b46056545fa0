// Sampler benchmark: eight schools (non-centred) and a 100-d Gaussian with scales from 0.01
// to 100, 4 chains × (1000 warm-up + 1000 draws), Tributary's NUTS on worker threads, and
// (with R and rstan installed by bench/setup-stan.sh) the same targets in Stan, side by side.
// Prints JSON; `--out FILE` also writes it there; `--no-stan` skips Stan; `--repeats N`.
import { execFileSync } from "node:child_process";
import { writeFileSync } from "node:fs";
import { availableParallelism, cpus } from "node:os";
import { fileURLToPath } from "node:url";
import { summariseRun } from "../packages/stats/src/diagnostics/summarise-run";
import { logSpacedScales } from "../packages/stats/src/models/examples/scaled-gaussian";
import { sampleChainsInWorkers } from "../packages/stats/src/parallel/node-worker-pool";
import type { SamplerSettings } from "../packages/stats/src/sampler/sampler-settings";

const argv = process.argv.slice(2);
const option = (name: string): string | undefined => {
  const i = argv.indexOf(name);
  return i >= 0 ? argv[i + 1] : undefined;
};
const repeats = Number(option("--repeats") ?? 3);
const withStan = !argv.includes("--no-stan");
const outFile = option("--out");

const eightSchools = { y: [28, 8, -3, 7, -1, 1, 18, 12], sigma: [15, 10, 16, 11, 9, 11, 10, 18] };
const scales = logSpacedScales(100, 0.01, 100);
const targets = [
  { name: "eight-schools", kind: "eight-schools-noncentred", data: eightSchools, stanData: { J: 8, ...eightSchools } },
  { name: "scaled-gaussian", kind: "scaled-gaussian", data: { scales }, stanData: { N: 100, scales } },
];

interface Measurement {
  wallSeconds: number;
  /** Sum over chains of each chain's own run time (no thread or process start-up). */
  chainSecondsTotal: number;
  gradientEvaluations: number;
  minEssBulk: number;
  essPerSecond: number;
  essPerGradient: number;
  /** min bulk ESS per chain-second: speed without start-up, independent of the core count. */
  essPerChainSecond: number;
  divergences: number;
}

const median = (xs: number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 === 1 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};

function summariseRepeats(runs: Measurement[]): Measurement & { runs: Measurement[] } {
  return {
    wallSeconds: median(runs.map((r) => r.wallSeconds)),
    chainSecondsTotal: median(runs.map((r) => r.chainSecondsTotal)),
    gradientEvaluations: median(runs.map((r) => r.gradientEvaluations)),
    minEssBulk: median(runs.map((r) => r.minEssBulk)),
    essPerSecond: median(runs.map((r) => r.essPerSecond)),
    essPerGradient: median(runs.map((r) => r.essPerGradient)),
    essPerChainSecond: median(runs.map((r) => r.essPerChainSecond)),
    divergences: median(runs.map((r) => r.divergences)),
    runs,
  };
}

async function runTributary(kind: string, data: unknown, seed: number, warmup = 1000, draws = 1000): Promise<Measurement> {
  const settings: SamplerSettings = { chains: 4, warmup, draws, seed, maxTreeDepth: 10, targetAcceptance: 0.8 };
  const start = performance.now();
  const chains = await sampleChainsInWorkers({ kind, data }, settings);
  const wallSeconds = (performance.now() - start) / 1000;
  const summary = summariseRun(chains);
  const { minEssBulk, gradientEvaluations, divergences } = summary.diagnostics;
  const chainSecondsTotal = chains.reduce((a, c) => a + c.seconds, 0);
  return {
    wallSeconds,
    chainSecondsTotal,
    gradientEvaluations,
    minEssBulk,
    essPerSecond: minEssBulk / wallSeconds,
    essPerGradient: minEssBulk / gradientEvaluations,
    essPerChainSecond: minEssBulk / chainSecondsTotal,
    divergences,
  };
}

function runStan(target: string, data: unknown, seed: number): Measurement & { compileSeconds: number } {
  const script = fileURLToPath(new URL("./sampler-stan/run-stan.R", import.meta.url));
  const cores = String(Math.min(4, availableParallelism()));
  const text = execFileSync("Rscript", [script, target, JSON.stringify(data), "4", "1000", "1000", String(seed), cores], {
    encoding: "utf8",
    stdio: ["ignore", "pipe", "pipe"],
    env: { ...process.env, TRIBUTARY_STAN_CACHE: process.env["TRIBUTARY_STAN_CACHE"] ?? "/tmp" },
    maxBuffer: 16 * 1024 * 1024,
  });
  const r = JSON.parse(text.slice(text.indexOf("{"))) as {
    wallSeconds: number;
    chainSeconds: number[];
    gradientEvaluations: number;
    minEssBulk: number;
    divergences: number;
    compileSeconds: number;
  };
  const chainSecondsTotal = r.chainSeconds.reduce((a, b) => a + b, 0);
  return {
    wallSeconds: r.wallSeconds,
    chainSecondsTotal,
    essPerChainSecond: r.minEssBulk / chainSecondsTotal,
    gradientEvaluations: r.gradientEvaluations,
    minEssBulk: r.minEssBulk,
    essPerSecond: r.minEssBulk / r.wallSeconds,
    essPerGradient: r.minEssBulk / r.gradientEvaluations,
    divergences: r.divergences,
    compileSeconds: r.compileSeconds,
  };
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

const stanMissing = stanAvailable();
const results = [];
for (const t of targets) {
  const ours: Measurement[] = [];
  const theirs: Measurement[] = [];
  for (let rep = 0; rep < repeats; rep++) {
    ours.push(await runTributary(t.kind, t.data, 1000 + rep));
    if (stanMissing === null) theirs.push(runStan(t.name, t.stanData, 1000 + rep));
  }
  const tributary = summariseRepeats(ours);
  const stan = stanMissing === null ? summariseRepeats(theirs) : null;
  results.push({
    target: t.name,
    tributary,
    stan,
    ratio:
      stan === null
        ? null
        : {
            essPerGradient: tributary.essPerGradient / stan.essPerGradient,
            essPerSecond: tributary.essPerSecond / stan.essPerSecond,
            essPerChainSecond: tributary.essPerChainSecond / stan.essPerChainSecond,
          },
    targetsMet:
      stan === null
        ? null
        : {
            essPerGradientWithin20Percent: Math.abs(tributary.essPerGradient / stan.essPerGradient - 1) <= 0.2 || tributary.essPerGradient > stan.essPerGradient,
            essPerSecondAtLeastStan: tributary.essPerSecond >= stan.essPerSecond,
          },
  });
}

// The 100-d Gaussian, 4 chains × 2000 iterations (1000 warm-up + 1000 draws), wall clock
// including worker start-up; target under 3 s on a 2-core machine.
const gaussianRuns: number[] = [];
for (let rep = 0; rep < repeats; rep++) gaussianRuns.push((await runTributary("scaled-gaussian", { scales }, 7 + rep)).wallSeconds);

const report = {
  benchmark: "sampler",
  date: new Date().toISOString(),
  machine: { cpus: cpus().length, model: cpus()[0]?.model ?? "unknown", node: process.version },
  settings: { chains: 4, warmup: 1000, draws: 1000, maxTreeDepth: 10, targetAcceptance: 0.8, repeats, summary: "median over repeats (seeds 1000, 1001, …)" },
  notes: [
    "minEssBulk: smallest bulk ESS over all parameters (R's posterior::ess_bulk for Stan; ours matches it to 1e-6, see packages/stats/test/diagnostics).",
    "gradientEvaluations: ours counts every evaluation (initialisation, step-size heuristic, all leapfrog steps of warm-up and sampling); Stan's is the sum of n_leapfrog__ over warm-up and sampling.",
    "wallSeconds: ours includes starting the worker threads; Stan's is the sampling() call with cores = min(4, cores), excluding compilation but including rstan's start of its R worker processes.",
    "chainSecondsTotal: each chain's own run time summed (ours ChainResult.seconds, Stan's get_elapsed_time warm-up + sampling); essPerChainSecond compares speed without any start-up cost.",
    "Targets (from the tracker): ESS per gradient evaluation within 20 % of Stan's (or better), ESS per second at least Stan's, the 100-d run of 4 × 2000 iterations under 3 s.",
  ],
  stan: stanMissing ?? "rstan via Rscript",
  targets: results,
  gaussian4x2000: { wallSeconds: median(gaussianRuns), runs: gaussianRuns, target: "< 3 s" },
};
const json = JSON.stringify(report, null, 2);
console.log(json);
if (outFile !== undefined) writeFileSync(outFile, `${json}\n`);

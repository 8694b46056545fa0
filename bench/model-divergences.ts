// Where the portfolio model's divergent transitions happen: runs the pooled model (or one
// cell's no-pooling model) with divergence recording on, then compares the divergent
// transitions with the posterior draws, parameter by parameter (the numerical form of the
// usual pairs-plot reading), and names the unconstrained coordinates along which each
// diverging trajectory ran away. Prints JSON.
//   tsx bench/model-divergences.ts --portfolio example|demo|benchmark [--data-seed N]
//       [--seed N] [--target 0.8] [--warmup 1000] [--draws 1000] [--cell g] [--top 12]
import { buildModel } from "../packages/stats/src/models/registry";
import { summariseRun } from "../packages/stats/src/diagnostics/summarise-run";
import type { PortfolioDensity } from "../packages/stats/src/model/portfolio/portfolio-density";
import { portfolioPooledKind, portfolioUnpooledKind } from "../packages/stats/src/model/portfolio/portfolio-model-kinds";
import { sampleChainsInWorkers } from "../packages/stats/src/parallel/node-worker-pool";
import type { ChainResult, DivergenceRecord } from "../packages/stats/src/sampler/sampler-settings";
import { unpooledCellSeed } from "../packages/stats/src/fit/fit-portfolio";
import { buildPortfolioModel } from "../packages/stats/src/model/portfolio/build-portfolio-model";
import { cellEffectEstimates } from "../packages/stats/src/model/portfolio/cell-parametrisation";
import type { PoolingLevels, PortfolioModelOptions } from "../packages/stats/src/model/portfolio/portfolio-options";
import { portfolioByName, type PortfolioName } from "./model-portfolios";

const argv = process.argv.slice(2);
const option = (name: string, fallback: string): string => {
  const i = argv.indexOf(name);
  return i >= 0 && argv[i + 1] !== undefined ? argv[i + 1]! : fallback;
};
const portfolioName = option("--portfolio", "example") as PortfolioName;
const dataSeed = Number(option("--data-seed", "1"));
const seed = Number(option("--seed", "1"));
const target = Number(option("--target", "0.8"));
const warmup = Number(option("--warmup", "1000"));
const draws = Number(option("--draws", "1000"));
const cellOption = option("--cell", "");
const top = Number(option("--top", "12"));

/** Names of the unconstrained coordinates, from the model's layout. */
export function unconstrainedNames(model: PortfolioDensity): string[] {
  const k = model.constants;
  const lay = model.layout;
  const names = new Array<string>(model.dimension).fill("?");
  const ch = k.channels;
  const put = (at: number, base: string, rows: number, label: (r: number) => string): void => {
    if (at < 0) return;
    for (let r = 0; r < rows; r++) for (let c = 0; c < ch.length; c++) names[at + r * ch.length + c] = `${base}[${label(r)}${ch[c]}]`;
  };
  const none = (): string => "";
  put(lay.mu, lay.structure === "pooled" ? "u.mu" : "u.eta", 1, none);
  put(lay.tauBrand, "log.tauBrand", 1, none);
  put(lay.tauMarket, "log.tauMarket", 1, none);
  put(lay.tauCell, "log.tauCell", 1, none);
  put(lay.alpha, "logit.alpha", 1, none);
  put(lay.lambda, "u.lambda", 1, none);
  put(lay.hillShape, "u.hillShape", 1, none);
  put(lay.zBrand, "u.brand", k.brands.length, (b) => `${b},`);
  put(lay.zMarket, "u.market", k.markets.length, (m) => `${m},`);
  put(lay.zCell, "u.cell", k.cellCount, (g) => `${g},`);
  const J = k.seasonalityOrder;
  for (let g = 0; g < k.cellCount; g++) {
    const b = lay.cells + g * lay.cellStride;
    const G = g + model.cellIndexOffset;
    names[b] = `u.beta0[${G}]`;
    names[b + 1] = `u.beta1[${G}]`;
    for (let j = 0; j < J; j++) {
      names[b + 2 + 2 * j] = `u.gamma[${G},${j + 1}]`;
      names[b + 3 + 2 * j] = `u.delta[${G},${j + 1}]`;
    }
    names[b + 2 + 2 * J] = `log.sigma[${G}]`;
    for (let j = 0; j < k.controlCount; j++) names[b + 3 + 2 * J + j] = `u.control[${G},${j}]`;
  }
  if (lay.nu >= 0) names[lay.nu] = "log.nu";
  return names;
}

const data = portfolioByName(portfolioName, dataSeed);
// experiments: --guide none, or the least-squares guide at given α, λ (--alpha a,b,c --lambda a,b,c)
const guideOption = option("--guide", "");
const alphaOption = option("--alpha", "");
const lambdaOption = option("--lambda", "");
const poolingOption = option("--pooling", "crossed") as PoolingLevels;
let modelOptions: PortfolioModelOptions = {};
if (guideOption === "none") modelOptions = { cellEffectGuide: "none" };
else if (alphaOption !== "" || lambdaOption !== "") {
  const base = buildPortfolioModel(data);
  const C = data.channels.length;
  const alpha = alphaOption === "" ? new Array<number>(C).fill(0.5) : alphaOption.split(",").map(Number);
  const lambda = lambdaOption === "" ? new Array<number>(C).fill(2) : lambdaOption.split(",").map(Number);
  const est = cellEffectEstimates(base.constants, alpha, lambda);
  modelOptions = { cellEffectGuide: { mean: Array.from(est.mean), sd: Array.from(est.sd) } };
}
const cell = cellOption === "" ? null : Number(cellOption);
const spec =
  cell === null
    ? { kind: portfolioPooledKind, data: { portfolio: data, options: { ...modelOptions, pooling: poolingOption } } }
    : { kind: portfolioUnpooledKind, data: { portfolio: data, options: {}, cell } };
const model = buildModel(spec) as PortfolioDensity;
const settings = {
  chains: 4,
  warmup,
  draws,
  seed: cell === null ? seed : unpooledCellSeed(seed, cell),
  maxTreeDepth: 10,
  targetAcceptance: target,
  recordDivergences: true,
};
const started = performance.now();
const chains: ChainResult[] = await sampleChainsInWorkers(spec, settings);
const wallSeconds = (performance.now() - started) / 1000;
const summary = summariseRun(chains);
const names = chains[0]!.names;
const width = names.length;
const uNames = unconstrainedNames(model);

const records: (DivergenceRecord & { chain: number; inverseMetric: Float64Array })[] = chains.flatMap((c) =>
  (c.divergences ?? []).map((d) => ({ ...d, chain: c.chain, inverseMetric: c.inverseMetric })),
);
const sampling = records.filter((r) => r.phase === "sampling");

// posterior draws per column, sorted, for quantiles of the divergent starts
const sortedColumns = names.map((_, j) => {
  const values: number[] = [];
  for (const c of chains) for (let i = 0; i < c.draws.length / width; i++) values.push(c.draws[i * width + j]!);
  return Float64Array.from(values).sort();
});
const quantileOf = (j: number, x: number): number => {
  const s = sortedColumns[j]!;
  let lo = 0;
  let hi = s.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (s[mid]! < x) lo = mid + 1;
    else hi = mid;
  }
  return (lo + 0.5) / (s.length + 1);
};
const NAMED = /^(mu|tauBrand|tauMarket|tauCell|alpha|lambda|eta|beta|sigma|nu|brandDeviation|marketDeviation|cellDeviation|beta0|beta1|gamma|delta)(\[|$)/;
const extremeness = names
  .map((name, j) => {
    if (!NAMED.test(name) || sampling.length === 0) return null;
    const q = sampling.map((r) => quantileOf(j, r.startConstrained[j]!));
    const low = q.filter((v) => v < 0.05).length;
    const high = q.filter((v) => v > 0.95).length;
    const meanQ = q.reduce((a, b) => a + b, 0) / q.length;
    return { name, meanQuantile: meanQ, inLowest5: low, inHighest5: high, values: q.map((v) => Math.round(v * 1000) / 1000) };
  })
  .filter((x) => x !== null)
  .sort((a, b) => Math.abs(b.meanQuantile - 0.5) - Math.abs(a.meanQuantile - 0.5))
  .slice(0, top);

const round = (x: number, digits = 3): number => Math.round(x * 10 ** digits) / 10 ** digits;

// along which coordinates each divergent trajectory ran away, in units of the metric's sd
const runaway = sampling.map((r) => {
  const moves = uNames.map((name, i) => ({ name, move: (r.end[i]! - r.start[i]!) / Math.sqrt(r.inverseMetric[i]!) }));
  moves.sort((a, b) => Math.abs(b.move) - Math.abs(a.move));
  const fx: Record<string, number> = {};
  for (const n of ["tauBrand", "tauMarket", "tauCell", "alpha", "lambda"]) {
    names.forEach((name, j) => {
      if (name.startsWith(`${n}[`)) fx[name] = Math.round(r.startConstrained[j]! * 1e4) / 1e4;
    });
  }
  // the log density where the trajectory started and where its energy error blew up: a
  // non-finite value there points at arithmetic (overflow, log of 0), not at geometry
  const gradient = new Float64Array(model.dimension);
  const lpStart = model.logDensityGradient(Float64Array.from(r.start), gradient);
  const lpEnd = model.logDensityGradient(Float64Array.from(r.end), gradient);
  let gradientNormEnd = 0;
  for (let i = 0; i < gradient.length; i++) gradientNormEnd += gradient[i]! * gradient[i]! * r.inverseMetric[i]!;
  return {
    chain: r.chain,
    iteration: r.iteration,
    stepSize: r.stepSize,
    lpStart: round(lpStart, 2),
    lpEnd: Number.isFinite(lpEnd) ? round(lpEnd, 2) : String(lpEnd),
    metricGradientNormEnd: Number.isFinite(gradientNormEnd) ? round(Math.sqrt(gradientNormEnd), 1) : String(gradientNormEnd),
    largestMoves: moves.slice(0, 5).map((m) => `${m.name} ${m.move.toFixed(1)}`),
    start: fx,
  };
});
const runawayCounts: Record<string, number> = {};
for (const r of runaway) for (const m of r.largestMoves.slice(0, 2)) {
  const name = m.slice(0, m.lastIndexOf(" "));
  runawayCounts[name] = (runawayCounts[name] ?? 0) + 1;
}

// each cell effect's guide (ParameterLayout.guideMean) beside its posterior mean and sd of log β
const logBetaMoments = (j: number): { mean: number; sd: number } => {
  let sum = 0;
  let sumSq = 0;
  let n = 0;
  for (const c of chains) {
    for (let i = 0; i < c.draws.length / width; i++) {
      const v = Math.log(c.draws[i * width + j]!);
      sum += v;
      sumSq += v * v;
      n++;
    }
  }
  const mean = sum / n;
  return { mean, sd: Math.sqrt(Math.max(0, sumSq / n - mean * mean)) };
};
const cellEffects = model.constants.channels.flatMap((ch, c) =>
  Array.from({ length: model.constants.cellCount }, (_, g) => {
    const gc = g * model.constants.channelCount + c;
    if (model.constants.channelActive[gc] === 0) return [];
    const G = g + model.cellIndexOffset;
    const post = logBetaMoments(names.indexOf(`beta[${G},${ch}]`));
    const precision = model.layout.guidePrecision[gc]!;
    return [`logBeta[${G},${ch}] guide ${precision > 0 ? `${round(model.layout.guideMean[gc]!, 2)}±${round(1 / Math.sqrt(precision))}` : "none"}, posterior ${round(post.mean, 2)}±${round(post.sd)}`];
  }).flat(),
);
const channelLevel = summary.parameters.filter((p) => /^(mu|tau|alpha|lambda)/.test(p.name)).map((p) => `${p.name} ${round(p.mean)} (${round(p.q05)}–${round(p.q95)}) ess ${Math.round(p.essBulk)}`);

const depths: Record<number, number> = {};
for (const c of chains) for (const d of c.treeDepth) depths[d] = (depths[d] ?? 0) + 1;
console.log(
  JSON.stringify(
    {
      portfolio: portfolioName,
      dataSeed,
      cell,
      settings,
      wallSeconds,
      dimension: model.dimension,
      divergences: { sampling: sampling.length, warmup: records.length - sampling.length, perChain: chains.map((c) => (c.divergences ?? []).filter((d) => d.phase === "sampling").length) },
      maxRhat: summary.diagnostics.maxRhat,
      minEssBulk: summary.diagnostics.minEssBulk,
      worstEss: summary.parameters.reduce((a, b) => (b.essBulk < a.essBulk ? b : a)).name,
      stepSizes: chains.map((c) => c.stepSize),
      treeDepths: depths,
      ebfmi: summary.diagnostics.ebfmi,
      channelLevel,
      cellEffects,
      extremeAtDivergence: extremeness,
      runawayCoordinates: Object.entries(runawayCounts).sort((a, b) => b[1] - a[1]),
      divergentTransitions: runaway,
    },
    null,
    1,
  ),
);

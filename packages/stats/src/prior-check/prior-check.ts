import type { PortfolioData } from "../data/portfolio-data";
import { adstockGeometricUnchecked } from "../model/adstock";
import { buildPortfolioConstants } from "../model/portfolio/portfolio-constants";
import { resolvePortfolioOptions, type PortfolioModelOptions } from "../model/portfolio/portfolio-options";
import { saturationHill } from "../model/saturation";
import { createRandomSource } from "../rng/create-random-source";
import { drawBeta, drawGamma } from "../simulate/random-draws";
import type {
  CellPriorCheck,
  ChannelPriorCheck,
  PriorCheckResult,
  PriorCheckSettings,
  PriorQuantiles,
} from "./prior-check-types";
import { selectQuantiles } from "./select-quantiles";

/** The model options a prior check reads; lift tests inform the posterior only, so they play no part. */
export type PriorCheckModelOptions = Omit<PortfolioModelOptions, "liftTests">;

// Prior constants of the reference model (model.md, "Priors"); they match the density's.
const TAU_PRIOR_SCALE = 0.5;
const LAMBDA_PRIOR_LOG_MEAN = Math.LN2;
const LAMBDA_PRIOR_LOG_SD = 0.75;
const HILL_SHAPE_PRIOR_LOG_SD = 0.5;
const NU_PRIOR_SHAPE = 2;
const NU_PRIOR_RATE = 0.1;

export const DEFAULT_PRIOR_CHECK_DRAWS = 200;
/** Weeks gathered per pass when summarising (8 doubles = one 64-byte cache line). */
const GATHER_WEEKS = 8;
const MAX_PRIOR_CHECK_DRAWS = 100_000;

/**
 * A prior predictive check of the portfolio model: draws every parameter from its prior
 * (μ_c, the τ's and z's → β per cell → CAC0; α, λ; the baseline, seasonality, controls and
 * σ) and pushes the data's own spend through adstock and saturation, so an analyst sees
 * what the priors alone imply before any fit: the cost per new customer per channel and
 * the weekly outcome band per cell. Pure: the same data, options and seed give the same
 * result. Throws a RangeError naming the problem when the data or options are invalid.
 */
export function priorCheck(data: PortfolioData, options: PriorCheckModelOptions = {}, settings: PriorCheckSettings = {}): PriorCheckResult {
  const draws = settings.draws ?? DEFAULT_PRIOR_CHECK_DRAWS;
  if (!Number.isInteger(draws) || draws < 2 || draws > MAX_PRIOR_CHECK_DRAWS) {
    throw new RangeError(`draws must be an integer from 2 to ${MAX_PRIOR_CHECK_DRAWS}, got ${draws}`);
  }
  const seed = settings.seed ?? 1;
  const structure = settings.structure ?? "pooled";
  if (structure !== "pooled" && structure !== "unpooled") throw new RangeError(`structure must be "pooled" or "unpooled", got "${String(structure)}"`);
  const tauScale = settings.tauPriorScale ?? TAU_PRIOR_SCALE;
  if (!(Number.isFinite(tauScale) && tauScale >= 0)) throw new RangeError(`tauPriorScale must be a number ≥ 0, got ${tauScale}`);

  const resolved = resolvePortfolioOptions(data.channels, { ...options, liftTests: [] });
  const k = buildPortfolioConstants(data, resolved);
  const rng = createRandomSource(seed);

  const C = k.channelCount;
  const G = k.cellCount;
  const B = k.brands.length;
  const M = k.markets.length;
  const J = k.seasonalityOrder;
  const K = k.controlCount;
  const L = k.maxLag;
  const N = k.totalWeeks;
  const hill = resolved.saturation === "hill";
  const studentT = resolved.likelihood === "student-t";
  const pooled = structure === "pooled";
  const brandOn = pooled && (resolved.pooling === "crossed" || resolved.pooling === "brand");
  const marketOn = pooled && (resolved.pooling === "crossed" || resolved.pooling === "market");

  // Buffers, allocated once for the whole check.
  const mu = new Float64Array(C);
  const tauBrand = new Float64Array(C);
  const tauMarket = new Float64Array(C);
  const tauCell = new Float64Array(C);
  const zBrand = new Float64Array(B * C);
  const zMarket = new Float64Array(M * C);
  // α, λ and the Hill shape: one per channel pooled, one per cell × channel unpooled.
  const alpha = new Float64Array(G * C);
  const lambda = new Float64Array(G * C);
  const shape = new Float64Array(G * C);
  const cac0Draws = new Float64Array(draws * G * C);
  const replicated = new Float64Array(draws * N);
  const mediaShareDraws = new Float64Array(draws * G);
  let maxWeeks = 0;
  for (let g = 0; g < G; g++) maxWeeks = Math.max(maxWeeks, k.weeks[g]!);
  const adstock = new Float64Array(maxWeeks);
  const response = new Float64Array(maxWeeks);
  const mean = new Float64Array(maxWeeks);

  const observedTrainTotal = new Float64Array(G);
  for (let g = 0; g < G; g++) {
    let sum = 0;
    for (let t = 0; t < k.trainWeeks[g]!; t++) sum += k.outcome[k.weekStart[g]! + t]!;
    observedTrainTotal[g] = sum;
  }

  for (let d = 0; d < draws; d++) {
    // Channel level.
    for (let c = 0; c < C; c++) {
      mu[c] = k.muPriorMean[c]! + k.muPriorSd[c]! * rng.normal();
      tauBrand[c] = brandOn ? Math.abs(rng.normal()) * tauScale : 0;
      tauMarket[c] = marketOn ? Math.abs(rng.normal()) * tauScale : 0;
      tauCell[c] = pooled ? Math.abs(rng.normal()) * tauScale : 0;
    }
    for (let i = 0; i < B * C; i++) zBrand[i] = brandOn ? rng.normal() : 0;
    for (let i = 0; i < M * C; i++) zMarket[i] = marketOn ? rng.normal() : 0;
    if (pooled) {
      for (let c = 0; c < C; c++) {
        const a = drawBeta(rng, 2, 2);
        const l = Math.exp(LAMBDA_PRIOR_LOG_MEAN + LAMBDA_PRIOR_LOG_SD * rng.normal());
        const s = hill ? Math.exp(HILL_SHAPE_PRIOR_LOG_SD * rng.normal()) : 1;
        for (let g = 0; g < G; g++) {
          alpha[g * C + c] = a;
          lambda[g * C + c] = l;
          shape[g * C + c] = s;
        }
      }
    } else {
      for (let i = 0; i < G * C; i++) {
        alpha[i] = drawBeta(rng, 2, 2);
        lambda[i] = Math.exp(LAMBDA_PRIOR_LOG_MEAN + LAMBDA_PRIOR_LOG_SD * rng.normal());
        shape[i] = hill ? Math.exp(HILL_SHAPE_PRIOR_LOG_SD * rng.normal()) : 1;
      }
    }
    // One ν for the pooled model; the unpooled comparison has one per cell (drawn below).
    let nu = studentT ? drawGamma(rng, NU_PRIOR_SHAPE) / NU_PRIOR_RATE : 0;

    for (let g = 0; g < G; g++) {
      const T = k.weeks[g]!;
      const train = k.trainWeeks[g]!;
      const start = k.weekStart[g]!;
      const scale = k.outcomeScale[g]!;
      const b = k.cellBrand[g]!;
      const m = k.cellMarket[g]!;
      mean.fill(0, 0, T);
      let mediaShift = 0;
      let mediaTotal = 0;
      for (let c = 0; c < C; c++) {
        const gc = g * C + c;
        const logBeta = pooled
          ? mu[c]! + tauBrand[c]! * zBrand[b * C + c]! + tauMarket[c]! * zMarket[m * C + c]! + tauCell[c]! * rng.normal()
          : k.muPriorMean[c]! + k.muPriorSd[c]! * rng.normal();
        const beta = Math.exp(logBeta);
        cac0Draws[(d * G + g) * C + c] = 1 / beta;
        if (k.channelActive[gc] === 0) continue;
        const theta = lambda[gc]! * k.spendMean[gc]!;
        adstockGeometricUnchecked(k.spend, T, alpha[gc]!, L, adstock, undefined, k.mediaStart[gc]!, 0);
        let trainSum = 0;
        if (hill) {
          const s = shape[gc]!;
          for (let t = 0; t < T; t++) response[t] = saturationHill(adstock[t]!, theta, s);
        } else {
          // r(a; θ) = θ·(1 − exp(−a/θ)), written out as in the density's hot loop
          const invTheta = 1 / theta;
          for (let t = 0; t < T; t++) response[t] = theta - theta * Math.exp(-adstock[t]! * invTheta);
        }
        for (let t = 0; t < train; t++) trainSum += response[t]!;
        for (let t = 0; t < T; t++) mean[t] = mean[t]! + beta * response[t]!;
        mediaShift += (beta * trainSum) / train;
        mediaTotal += beta * trainSum;
      }
      // The media terms are centred on the training weeks, so β0 stays the mean weekly outcome.
      const intercept = k.outcomeMean[g]! + scale * rng.normal() - mediaShift;
      const slope = scale * rng.normal();
      for (let t = 0; t < T; t++) mean[t] = mean[t]! + intercept + slope * k.trend[start + t]!;
      const sBase = k.seasonalStart[g]!;
      for (let j = 0; j < 2 * J; j++) {
        const coef = 0.5 * scale * rng.normal();
        const col = sBase + j * T;
        for (let t = 0; t < T; t++) mean[t] = mean[t]! + coef * k.seasonal[col + t]!;
      }
      const sigma = Math.abs(rng.normal()) * scale;
      const cBase = k.controlStart[g]!;
      for (let j = 0; j < K; j++) {
        const coef = scale * rng.normal();
        const col = cBase + j * T;
        for (let t = 0; t < T; t++) mean[t] = mean[t]! + coef * k.controlDesign[col + t]!;
      }
      if (studentT && !pooled) nu = drawGamma(rng, NU_PRIOR_SHAPE) / NU_PRIOR_RATE;
      const row = d * N + start;
      for (let t = 0; t < T; t++) {
        let noise = rng.normal();
        // Student-t noise as a normal over the root of a scaled chi-square (χ²_ν = 2·Gamma(ν/2)).
        if (studentT) noise /= Math.sqrt((2 * drawGamma(rng, nu / 2)) / nu);
        replicated[row + t] = mean[t]! + sigma * noise;
      }
      const observed = observedTrainTotal[g]!;
      mediaShareDraws[d * G + g] = observed > 0 ? mediaTotal / observed : Number.NaN;
    }
  }

  // Summaries.
  const column = new Float64Array(draws);
  const channels: ChannelPriorCheck[] = k.channels.map((channel, c) => {
    let cellsWithSpend = 0;
    for (let g = 0; g < G; g++) cellsWithSpend += k.channelActive[g * C + c]!;
    const pool = new Float64Array(draws * (cellsWithSpend > 0 ? cellsWithSpend : G));
    let n = 0;
    for (let d = 0; d < draws; d++) {
      for (let g = 0; g < G; g++) {
        if (cellsWithSpend > 0 && k.channelActive[g * C + c] === 0) continue;
        pool[n++] = cac0Draws[(d * G + g) * C + c]!;
      }
    }
    return { channel, cacRange: [resolved.cacRange[c]![0], resolved.cacRange[c]![1]], cac0: selectQuantiles(pool), cellsWithSpend };
  });

  const cells: CellPriorCheck[] = data.cells.map((cell, g) => {
    const T = k.weeks[g]!;
    const start = k.weekStart[g]!;
    const bands = { q05: new Array<number>(T), q25: new Array<number>(T), q50: new Array<number>(T), q75: new Array<number>(T), q95: new Array<number>(T) };
    const all = new Float64Array(draws * T);
    let below = 0;
    // Gather a few weeks at a time, so each draw's row is read a cache line at a time.
    for (let t0 = 0; t0 < T; t0 += GATHER_WEEKS) {
      const width = Math.min(GATHER_WEEKS, T - t0);
      for (let d = 0; d < draws; d++) {
        const row = d * N + start + t0;
        for (let j = 0; j < width; j++) {
          const value = replicated[row + j]!;
          all[(t0 + j) * draws + d] = value;
          if (value < 0) below++;
        }
      }
      for (let t = t0; t < t0 + width; t++) {
        // Selection reorders only this week's slice, which the pooled quantiles below do not mind.
        const q = selectQuantiles(all.subarray(t * draws, (t + 1) * draws));
        bands.q05[t] = q.q05;
        bands.q25[t] = q.q25;
        bands.q50[t] = q.q50;
        bands.q75[t] = q.q75;
        bands.q95[t] = q.q95;
      }
    }
    const observed = Array.from(cell.outcome);
    let observedMin = Infinity;
    let observedMax = -Infinity;
    for (const value of observed) {
      observedMin = Math.min(observedMin, value);
      observedMax = Math.max(observedMax, value);
    }
    // A cell whose observed outcome sums to zero has no media share (NaN); none is reported then.
    let shares = 0;
    for (let d = 0; d < draws; d++) {
      const share = mediaShareDraws[d * G + g]!;
      if (!Number.isNaN(share)) column[shares++] = share;
    }
    const cac0: { channel: string; quantiles: PriorQuantiles }[] = [];
    for (let c = 0; c < C; c++) {
      if (k.channelActive[g * C + c] === 0) continue;
      const values = new Float64Array(draws);
      for (let d = 0; d < draws; d++) values[d] = cac0Draws[(d * G + g) * C + c]!;
      cac0.push({ channel: k.channels[c]!, quantiles: selectQuantiles(values) });
    }
    return {
      brand: cell.brand,
      market: cell.market,
      firstWeek: cell.firstWeek,
      weeks: T,
      trainWeeks: k.trainWeeks[g]!,
      observed,
      bands,
      outcome: selectQuantiles(all),
      observedMin,
      observedMax,
      belowZeroShare: below / (draws * T),
      mediaShare: selectQuantiles(column, shares),
      cac0,
    };
  });

  return { draws, seed, structure, channels, cells };
}

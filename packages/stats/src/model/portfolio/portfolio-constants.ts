import type { PortfolioData } from "../../data/portfolio-data";
import { absoluteWeekOf } from "../absolute-week";
import { seasonalSine, seasonalCosine, trendCentred } from "../baseline";
import { channelEffectPrior, type ResolvedPortfolioOptions } from "./portfolio-options";

/** A lift test resolved to indices: weeks are 0-based positions inside the cell. */
export interface ResolvedLiftTest {
  readonly cell: number;
  readonly channel: number;
  readonly firstWeek: number;
  readonly lastWeek: number;
  readonly spend: number;
  readonly incrementalOutcome: number;
  readonly standardError: number;
}

/**
 * Everything the density needs from the data, computed once before fitting. Week-level
 * arrays are flat: cell g occupies [weekStart[g], weekStart[g] + weeks[g]); per cell ×
 * channel series occupy [mediaStart[g·C + c], + weeks[g]) of the media arrays.
 * Centring and the data constants (ȳ, s, x̄) use the training weeks only (all weeks
 * without a holdout), so the fitted model is exactly the reference model on those weeks.
 */
export interface PortfolioConstants {
  readonly channels: readonly string[];
  readonly controls: readonly string[];
  readonly brands: readonly string[];
  readonly markets: readonly string[];
  readonly cellLabels: readonly { readonly brand: string; readonly market: string }[];
  readonly cellCount: number;
  readonly channelCount: number;
  readonly controlCount: number;
  readonly seasonalityOrder: number;
  readonly maxLag: number;
  readonly cellBrand: Int32Array;
  readonly cellMarket: Int32Array;
  /** All weeks of the cell (training + holdout). */
  readonly weeks: Int32Array;
  /** Weeks in the likelihood. */
  readonly trainWeeks: Int32Array;
  readonly weekStart: Int32Array;
  readonly totalWeeks: number;
  readonly firstAbsoluteWeek: Float64Array;
  readonly outcome: Float64Array;
  /** Per cell × channel: spend series, at mediaStart. */
  readonly spend: Float64Array;
  readonly mediaStart: Int32Array;
  /** ȳ_g and s_g over the training weeks (or as fixed by the baselinePriorScale option). */
  readonly outcomeMean: Float64Array;
  readonly outcomeScale: Float64Array;
  /** x̄[g,c]: mean spend over training weeks with spend (1 if none). */
  readonly spendMean: Float64Array;
  /** 1 when the channel has spend anywhere in the cell's series, else 0 (its media term is then 0). */
  readonly channelActive: Uint8Array;
  /** Centred trend ť per week (continues linearly into the holdout). */
  readonly trend: Float64Array;
  /** Per cell 2J columns (S_1, C_1, S_2, …) × weeks[g], centred with the training means; cell block at seasonalStart[g]. */
  readonly seasonal: Float64Array;
  readonly seasonalStart: Int32Array;
  /** Training-week means of the uncentred seasonal columns, per cell 2J values. */
  readonly seasonalMean: Float64Array;
  /** Per cell K control columns × weeks[g], centred and scaled by the training mean and sd; cell block at controlStart[g]. */
  readonly controlDesign: Float64Array;
  readonly controlStart: Int32Array;
  readonly controlMean: Float64Array;
  readonly controlScale: Float64Array;
  readonly muPriorMean: Float64Array;
  readonly muPriorSd: Float64Array;
  readonly liftTests: readonly ResolvedLiftTest[];
}

function fail(message: string): never {
  throw new RangeError(`portfolio data: ${message}`);
}

/** Validates the data against the options and computes the model's data constants. */
export function buildPortfolioConstants(data: PortfolioData, options: ResolvedPortfolioOptions): PortfolioConstants {
  const channels = data.channels;
  const C = channels.length;
  if (C === 0) fail("at least one channel is needed");
  if (new Set(channels).size !== C) fail("channel names must be unique");
  if (channels.some((c) => typeof c !== "string" || c.trim() === "")) fail("every channel needs a name");
  const K = data.controls.length;
  if (new Set(data.controls).size !== K) fail("control names must be unique");
  const G = data.cells.length;
  if (G === 0) fail("at least one cell is needed");
  const J = options.seasonalityOrder;
  const L = options.maxLag;

  const brands: string[] = [];
  const markets: string[] = [];
  const seen = new Set<string>();
  const cellBrand = new Int32Array(G);
  const cellMarket = new Int32Array(G);
  const weeks = new Int32Array(G);
  const trainWeeks = new Int32Array(G);
  const weekStart = new Int32Array(G);
  const firstAbsoluteWeek = new Float64Array(G);
  let total = 0;
  data.cells.forEach((cell, g) => {
    const where = `cell ${g} (${cell.brand} × ${cell.market})`;
    if (typeof cell.brand !== "string" || cell.brand.trim() === "") fail(`cell ${g} has no brand`);
    if (typeof cell.market !== "string" || cell.market.trim() === "") fail(`cell ${g} has no market`);
    const key = `${cell.brand}\u0000${cell.market}`;
    if (seen.has(key)) fail(`${where} appears twice`);
    seen.add(key);
    let b = brands.indexOf(cell.brand);
    if (b < 0) b = brands.push(cell.brand) - 1;
    let m = markets.indexOf(cell.market);
    if (m < 0) m = markets.push(cell.market) - 1;
    cellBrand[g] = b;
    cellMarket[g] = m;
    try {
      firstAbsoluteWeek[g] = absoluteWeekOf(cell.firstWeek);
    } catch (error) {
      fail(`${where}: first week ${(error as Error).message}`);
    }
    const T = cell.outcome.length;
    const train = T - options.holdoutWeeks;
    if (train < 8) fail(`${where} has ${T} weeks; at least 8 weeks are needed in the fit (after a holdout of ${options.holdoutWeeks})`);
    for (let t = 0; t < T; t++) if (!Number.isFinite(cell.outcome[t]!)) fail(`${where}: outcome in week ${t + 1} is not a finite number`);
    if (cell.spend.length !== C) fail(`${where} has ${cell.spend.length} spend series for ${C} channels`);
    cell.spend.forEach((series, c) => {
      if (series.length !== T) fail(`${where}: spend on ${channels[c]} has ${series.length} weeks, the outcome has ${T}`);
      for (let t = 0; t < T; t++) {
        const x = series[t]!;
        if (!(Number.isFinite(x) && x >= 0)) fail(`${where}: spend on ${channels[c]} in week ${t + 1} must be a number ≥ 0, got ${x}`);
      }
    });
    if (cell.controls.length !== K) fail(`${where} has ${cell.controls.length} control series for ${K} controls`);
    cell.controls.forEach((series, k) => {
      if (series.length !== T) fail(`${where}: control ${data.controls[k]} has ${series.length} weeks, the outcome has ${T}`);
      for (let t = 0; t < T; t++) if (!Number.isFinite(series[t]!)) fail(`${where}: control ${data.controls[k]} in week ${t + 1} is not a finite number`);
    });
    weeks[g] = T;
    trainWeeks[g] = train;
    weekStart[g] = total;
    total += T;
  });

  const outcome = new Float64Array(total);
  const spend = new Float64Array(C * total);
  const mediaStart = new Int32Array(G * C);
  const outcomeMean = new Float64Array(G);
  const outcomeScale = new Float64Array(G);
  const spendMean = new Float64Array(G * C);
  const channelActive = new Uint8Array(G * C);
  const trend = new Float64Array(total);
  const seasonalStart = new Int32Array(G);
  const seasonal = new Float64Array(2 * J * total);
  const seasonalMean = new Float64Array(2 * J * G);
  const controlStart = new Int32Array(G);
  const controlDesign = new Float64Array(K * total);
  const controlMean = new Float64Array(K * G);
  const controlScale = new Float64Array(K * G);

  data.cells.forEach((cell, g) => {
    const T = weeks[g]!;
    const train = trainWeeks[g]!;
    const start = weekStart[g]!;
    let sum = 0;
    for (let t = 0; t < T; t++) {
      outcome[start + t] = cell.outcome[t]!;
      if (t < train) sum += cell.outcome[t]!;
      trend[start + t] = trendCentred(t, train);
    }
    const yMean = sum / train;
    let ss = 0;
    for (let t = 0; t < train; t++) ss += (cell.outcome[t]! - yMean) ** 2;
    const ySd = Math.sqrt(ss / (train - 1));
    outcomeMean[g] = yMean;
    outcomeScale[g] = ySd > 0 ? ySd : 1;
    const fixed = options.baselinePriorScale;
    if (fixed !== undefined) {
      if (fixed.centre.length !== G) fail(`baselinePriorScale has ${fixed.centre.length} values for ${G} cells`);
      outcomeMean[g] = fixed.centre[g]!;
      outcomeScale[g] = fixed.scale[g]!;
    }

    for (let c = 0; c < C; c++) {
      const ms = C * start + c * T;
      mediaStart[g * C + c] = ms;
      const series = cell.spend[c]!;
      let positive = 0;
      let positiveSum = 0;
      let any = false;
      for (let t = 0; t < T; t++) {
        const x = series[t]!;
        spend[ms + t] = x;
        if (x > 0) any = true;
        if (t < train && x > 0) {
          positive++;
          positiveSum += x;
        }
      }
      spendMean[g * C + c] = positive > 0 ? positiveSum / positive : 1;
      channelActive[g * C + c] = any ? 1 : 0;
    }

    seasonalStart[g] = 2 * J * start;
    for (let j = 1; j <= J; j++) {
      const sCol = 2 * J * start + 2 * (j - 1) * T;
      const cCol = sCol + T;
      let sMean = 0;
      let cMean = 0;
      for (let t = 0; t < T; t++) {
        const w = firstAbsoluteWeek[g]! + t;
        seasonal[sCol + t] = seasonalSine(j, w);
        seasonal[cCol + t] = seasonalCosine(j, w);
        if (t < train) {
          sMean += seasonal[sCol + t]!;
          cMean += seasonal[cCol + t]!;
        }
      }
      sMean /= train;
      cMean /= train;
      seasonalMean[2 * J * g + 2 * (j - 1)] = sMean;
      seasonalMean[2 * J * g + 2 * (j - 1) + 1] = cMean;
      for (let t = 0; t < T; t++) {
        seasonal[sCol + t] = seasonal[sCol + t]! - sMean;
        seasonal[cCol + t] = seasonal[cCol + t]! - cMean;
      }
    }

    controlStart[g] = K * start;
    for (let k = 0; k < K; k++) {
      const series = cell.controls[k]!;
      let mean = 0;
      for (let t = 0; t < train; t++) mean += series[t]!;
      mean /= train;
      let sq = 0;
      for (let t = 0; t < train; t++) sq += (series[t]! - mean) ** 2;
      const sd = Math.sqrt(sq / (train - 1));
      const scale = sd > 0 ? sd : 1;
      controlMean[K * g + k] = mean;
      controlScale[K * g + k] = scale;
      const col = K * start + k * T;
      for (let t = 0; t < T; t++) controlDesign[col + t] = (series[t]! - mean) / scale;
    }
  });

  const muPriorMean = new Float64Array(C);
  const muPriorSd = new Float64Array(C);
  options.cacRange.forEach((range, c) => {
    const prior = channelEffectPrior(range);
    muPriorMean[c] = prior.mean;
    muPriorSd[c] = prior.sd;
  });

  const liftTests = options.liftTests.map((test, i): ResolvedLiftTest => {
    const where = `lift test ${i + 1} (${test.brand} × ${test.market}, ${test.channel})`;
    const g = data.cells.findIndex((cell) => cell.brand === test.brand && cell.market === test.market);
    if (g < 0) fail(`${where}: no cell ${test.brand} × ${test.market} in the data`);
    const c = channels.indexOf(test.channel);
    if (c < 0) fail(`${where}: channel "${test.channel}" is not in the data`);
    let first = 0;
    let last = 0;
    try {
      first = absoluteWeekOf(test.firstWeek) - firstAbsoluteWeek[g]!;
      last = absoluteWeekOf(test.lastWeek) - firstAbsoluteWeek[g]!;
    } catch (error) {
      fail(`${where}: ${(error as Error).message}`);
    }
    if (last < first) fail(`${where}: the last week is before the first week`);
    if (first < 0 || last >= weeks[g]!) fail(`${where}: the test weeks lie outside the cell's weeks`);
    if (!(Number.isFinite(test.spend) && test.spend > 0)) fail(`${where}: spend during the test must be positive`);
    if (!Number.isFinite(test.incrementalOutcome)) fail(`${where}: the measured incremental outcome must be a finite number`);
    if (!(Number.isFinite(test.standardError) && test.standardError > 0)) fail(`${where}: the standard error must be positive`);
    let windowSpend = 0;
    for (let t = first; t <= last; t++) windowSpend += spend[mediaStart[g * C + c]! + t]!;
    if (windowSpend <= 0) fail(`${where}: the data have no spend on ${test.channel} in the test weeks`);
    return { cell: g, channel: c, firstWeek: first, lastWeek: last, spend: test.spend, incrementalOutcome: test.incrementalOutcome, standardError: test.standardError };
  });

  return {
    channels: [...channels],
    controls: [...data.controls],
    brands,
    markets,
    cellLabels: data.cells.map((cell) => ({ brand: cell.brand, market: cell.market })),
    cellCount: G,
    channelCount: C,
    controlCount: K,
    seasonalityOrder: J,
    maxLag: L,
    cellBrand,
    cellMarket,
    weeks,
    trainWeeks,
    weekStart,
    totalWeeks: total,
    firstAbsoluteWeek,
    outcome,
    spend,
    mediaStart,
    outcomeMean,
    outcomeScale,
    spendMean,
    channelActive,
    trend,
    seasonal,
    seasonalStart,
    seasonalMean,
    controlDesign,
    controlStart,
    controlMean,
    controlScale,
    muPriorMean,
    muPriorSd,
    liftTests,
  };
}

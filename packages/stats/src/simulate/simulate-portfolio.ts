import type { CellSeries, PortfolioData } from "../data/portfolio-data";
import { absoluteWeekOf } from "../model/absolute-week";
import { adstockGeometric } from "../model/adstock";
import { seasonalDesignCentred, trendCentred } from "../model/baseline";
import { saturationExponential } from "../model/saturation";
import type { RandomSource } from "../rng/random-source";
import { drawBeta, drawHalfNormal, drawWithin } from "./random-draws";
import type { CellTruth, ChannelTruth, PortfolioTruth, SimulationDesign } from "./simulation-design";

/** Values to fix instead of drawing them; any field left out is drawn. */
export interface CellTruthOverride {
  /** Per channel: outcome per currency unit at low spend (replaces the pooled draw). */
  readonly beta?: readonly number[];
  readonly beta1?: number;
  readonly gamma?: readonly number[];
  readonly delta?: readonly number[];
  readonly sigma?: number;
}

export interface SimulationOverrides {
  /** Channel-level truths in the order of `design.channels`; drawn when left out. */
  readonly channels?: readonly ChannelTruth[];
  /** Per cell, in the order of `design.cells` (undefined entries are drawn). */
  readonly cells?: readonly (CellTruthOverride | undefined)[];
  /** 90 % range of the low-spend CAC from which μ is drawn; default [20, 400]. */
  readonly cacRange?: readonly [number, number];
  /** Noise standard deviation σ as a share of the cell's baseline; default 0.05. */
  readonly noiseShare?: number;
}

export interface SimulatedPortfolio {
  readonly data: PortfolioData;
  readonly truth: PortfolioTruth;
}

const DEFAULT_CAC_RANGE: readonly [number, number] = [20, 400];
const Z90 = 1.6448536269514722;

function validateDesign(design: SimulationDesign, overrides: SimulationOverrides | undefined): void {
  const channelCount = design.channels.length;
  if (channelCount === 0) throw new RangeError("simulation design: at least one channel is needed");
  if (new Set(design.channels).size !== channelCount) throw new RangeError("simulation design: channel names must be unique");
  if (design.cells.length === 0) throw new RangeError("simulation design: at least one cell is needed");
  const maxLag = design.maxLag ?? 8;
  if (!Number.isInteger(maxLag) || maxLag < 1) throw new RangeError(`simulation design: maxLag must be a positive integer, got ${maxLag}`);
  const order = design.seasonalityOrder ?? 2;
  if (!Number.isInteger(order) || order < 0) throw new RangeError(`simulation design: seasonalityOrder must be a non-negative integer, got ${order}`);
  const seen = new Set<string>();
  design.cells.forEach((cell, g) => {
    const where = `simulation design, cell ${g} (${cell.brand} × ${cell.market})`;
    if (cell.brand.trim() === "" || cell.market.trim() === "") throw new RangeError(`${where}: brand and market must be named`);
    const key = `${cell.brand}\u0000${cell.market}`;
    if (seen.has(key)) throw new RangeError(`${where}: the same brand × market appears twice`);
    seen.add(key);
    absoluteWeekOf(cell.firstWeek);
    if (!Number.isInteger(cell.weeks) || cell.weeks < 2) throw new RangeError(`${where}: weeks must be an integer ≥ 2, got ${cell.weeks}`);
    if (cell.typicalSpend.length !== channelCount) {
      throw new RangeError(`${where}: typicalSpend has ${cell.typicalSpend.length} entries for ${channelCount} channels`);
    }
    for (const s of cell.typicalSpend) if (!(Number.isFinite(s) && s >= 0)) throw new RangeError(`${where}: typical spend must be ≥ 0, got ${s}`);
    if (!(Number.isFinite(cell.baseline) && cell.baseline > 0)) throw new RangeError(`${where}: baseline must be positive, got ${cell.baseline}`);
  });
  if (overrides?.channels !== undefined) {
    if (overrides.channels.length !== channelCount) throw new RangeError("simulation overrides: one channel truth per channel is needed");
    overrides.channels.forEach((ch, c) => {
      if (ch.channel !== design.channels[c]) throw new RangeError(`simulation overrides: channel ${c} is "${ch.channel}", expected "${design.channels[c]}"`);
      if (!(ch.alpha >= 0 && ch.alpha < 1)) throw new RangeError(`simulation overrides: alpha of ${ch.channel} must be in [0, 1)`);
      if (!(ch.lambda > 0)) throw new RangeError(`simulation overrides: lambda of ${ch.channel} must be positive`);
      if (!(ch.tauBrand >= 0 && ch.tauMarket >= 0 && ch.tauCell >= 0)) throw new RangeError(`simulation overrides: scales of ${ch.channel} must be ≥ 0`);
      if (!Number.isFinite(ch.mu)) throw new RangeError(`simulation overrides: mu of ${ch.channel} must be finite`);
    });
  }
  if (overrides?.cells !== undefined) {
    if (overrides.cells.length > design.cells.length) throw new RangeError("simulation overrides: more cell overrides than cells");
    overrides.cells.forEach((cell, g) => {
      if (cell === undefined) return;
      if (cell.beta !== undefined) {
        if (cell.beta.length !== channelCount) throw new RangeError(`simulation overrides: cell ${g} needs one beta per channel`);
        for (const b of cell.beta) if (!(b > 0 && Number.isFinite(b))) throw new RangeError(`simulation overrides: cell ${g} beta must be positive`);
      }
      if (cell.gamma !== undefined && cell.gamma.length !== order) throw new RangeError(`simulation overrides: cell ${g} needs ${order} gamma values`);
      if (cell.delta !== undefined && cell.delta.length !== order) throw new RangeError(`simulation overrides: cell ${g} needs ${order} delta values`);
      if (cell.sigma !== undefined && !(cell.sigma > 0)) throw new RangeError(`simulation overrides: cell ${g} sigma must be positive`);
    });
  }
  const range = overrides?.cacRange;
  if (range !== undefined && !(range[0] > 0 && range[1] > range[0])) throw new RangeError("simulation overrides: cacRange must be [lo, hi] with 0 < lo < hi");
  const noise = overrides?.noiseShare;
  if (noise !== undefined && !(noise > 0 && Number.isFinite(noise))) throw new RangeError("simulation overrides: noiseShare must be positive");
}

/**
 * Channel truths drawn from the model's priors: μ from the CAC range read as a 90 %
 * interval; τ, α, λ from their priors restricted to the central 90 % so that every
 * channel has a visible, non-degenerate effect.
 */
function drawChannelTruths(design: SimulationDesign, rng: RandomSource, cacRange: readonly [number, number]): ChannelTruth[] {
  const [lo, hi] = cacRange;
  const muCentre = -Math.log(Math.sqrt(lo * hi));
  const muScale = (Math.log(hi) - Math.log(lo)) / (2 * Z90);
  const tauMax = 0.5 * Z90;
  const lambdaLo = 2 * Math.exp(-Z90 * 0.75);
  const lambdaHi = 2 * Math.exp(Z90 * 0.75);
  return design.channels.map((channel) => ({
    channel,
    mu: muCentre + muScale * rng.normal(),
    tauBrand: drawWithin(() => drawHalfNormal(rng, 0.5), 0, tauMax),
    tauMarket: drawWithin(() => drawHalfNormal(rng, 0.5), 0, tauMax),
    tauCell: drawWithin(() => drawHalfNormal(rng, 0.5), 0, tauMax),
    alpha: drawWithin(() => drawBeta(rng, 2, 2), 0.1, 0.9),
    lambda: drawWithin(() => 2 * Math.exp(0.75 * rng.normal()), lambdaLo, lambdaHi),
  }));
}

/**
 * Bursty flighting: a two-state on/off Markov chain (on → on 0.8, off → off 0.6), a
 * level per burst and week-to-week variation, rescaled so that the mean over weeks with
 * spend equals the typical spend.
 */
function simulateSpend(weeks: number, typical: number, rng: RandomSource): Float64Array {
  const spend = new Float64Array(weeks);
  if (typical === 0) return spend;
  let on = rng.uniform() < 0.7;
  let burstLevel = Math.exp(0.35 * rng.normal());
  let positive = 0;
  let total = 0;
  for (let t = 0; t < weeks; t++) {
    if (t > 0) {
      const wasOn = on;
      on = wasOn ? rng.uniform() < 0.8 : rng.uniform() >= 0.6;
      if (on && !wasOn) burstLevel = Math.exp(0.35 * rng.normal());
    }
    if (on) {
      const value = burstLevel * Math.exp(0.3 * rng.normal());
      spend[t] = value;
      positive++;
      total += value;
    }
  }
  if (positive === 0) {
    spend[0] = 1;
    positive = 1;
    total = 1;
  }
  const scale = typical / (total / positive);
  for (let t = 0; t < weeks; t++) spend[t] = Math.round(spend[t]! * scale * 100) / 100;
  return spend;
}

/**
 * Weekly data generated from the portfolio model (exponential saturation, Normal noise)
 * with known parameters: channel truths and pooled cell effects are drawn (or taken from
 * `overrides`), spend is simulated with realistic flighting, and outcomes follow
 *   y = baseline + β1·ť + Σ_j(γ_j·S̃_j + δ_j·C̃_j) + Σ_c β_c·r(a_c) + σ·ε.
 * The reported β0 is the model's centred intercept: the cell's mean of the noiseless outcome.
 */
export function simulatePortfolio(
  design: SimulationDesign,
  rng: RandomSource,
  overrides?: SimulationOverrides,
): SimulatedPortfolio {
  validateDesign(design, overrides);
  const maxLag = design.maxLag ?? 8;
  const order = design.seasonalityOrder ?? 2;
  const channelCount = design.channels.length;
  const channels = overrides?.channels ?? drawChannelTruths(design, rng, overrides?.cacRange ?? DEFAULT_CAC_RANGE);
  const noiseShare = overrides?.noiseShare ?? 0.05;

  const brands = [...new Set(design.cells.map((c) => c.brand))];
  const markets = [...new Set(design.cells.map((c) => c.market))];
  const zBrand = brands.map(() => design.channels.map(() => rng.normal()));
  const zMarket = markets.map(() => design.channels.map(() => rng.normal()));

  const cells: CellSeries[] = [];
  const cellTruths: CellTruth[] = [];
  design.cells.forEach((cellDesign, g) => {
    const override = overrides?.cells?.[g];
    const weeks = cellDesign.weeks;
    const base = cellDesign.baseline;
    const b = brands.indexOf(cellDesign.brand);
    const m = markets.indexOf(cellDesign.market);
    const beta = design.channels.map((_, c) => {
      const zCell = rng.normal();
      const given = override?.beta?.[c];
      if (given !== undefined) return given;
      const ch = channels[c]!;
      return Math.exp(ch.mu + ch.tauBrand * zBrand[b]![c]! + ch.tauMarket * zMarket[m]![c]! + ch.tauCell * zCell);
    });
    const beta1 = override?.beta1 ?? 0.1 * base * rng.normal();
    const gamma = override?.gamma ?? Array.from({ length: order }, (_, j) => ((0.1 * base) / (j + 1)) * rng.normal());
    const delta = override?.delta ?? Array.from({ length: order }, (_, j) => ((0.1 * base) / (j + 1)) * rng.normal());
    const sigma = override?.sigma ?? noiseShare * base;

    const spend = cellDesign.typicalSpend.map((typical) => simulateSpend(weeks, typical, rng));
    const firstWeek = absoluteWeekOf(cellDesign.firstWeek);
    const seasonal = seasonalDesignCentred(firstWeek, weeks, order);
    const noiseless = new Float64Array(weeks);
    for (let t = 0; t < weeks; t++) {
      let value = base + beta1 * trendCentred(t, weeks);
      for (let j = 0; j < order; j++) {
        value += gamma[j]! * seasonal[2 * j * weeks + t]! + delta[j]! * seasonal[(2 * j + 1) * weeks + t]!;
      }
      noiseless[t] = value;
    }
    const adstocked = new Float64Array(weeks);
    for (let c = 0; c < channelCount; c++) {
      const series = spend[c]!;
      let positive = 0;
      let total = 0;
      for (let t = 0; t < weeks; t++) if (series[t]! > 0) {
        positive++;
        total += series[t]!;
      }
      const meanPositive = positive > 0 ? total / positive : 1;
      const theta = channels[c]!.lambda * meanPositive;
      adstockGeometric(series, channels[c]!.alpha, maxLag, adstocked);
      for (let t = 0; t < weeks; t++) noiseless[t] = noiseless[t]! + beta[c]! * saturationExponential(adstocked[t]!, theta);
    }
    let beta0 = 0;
    for (let t = 0; t < weeks; t++) beta0 += noiseless[t]!;
    beta0 /= weeks;
    const outcome = new Float64Array(weeks);
    for (let t = 0; t < weeks; t++) outcome[t] = noiseless[t]! + sigma * rng.normal();

    cells.push({ brand: cellDesign.brand, market: cellDesign.market, firstWeek: cellDesign.firstWeek, outcome, spend, controls: [] });
    cellTruths.push({
      brand: cellDesign.brand,
      market: cellDesign.market,
      beta0,
      beta1,
      gamma,
      delta,
      sigma,
      beta,
      cac0: beta.map((v) => 1 / v),
    });
  });

  return {
    data: { channels: [...design.channels], controls: [], cells },
    truth: { channels: channels.map((ch) => ({ ...ch })), cells: cellTruths },
  };
}

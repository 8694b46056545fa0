import type { PortfolioData } from "../data/portfolio-data";
import { buildPortfolioConstants } from "../model/portfolio/portfolio-constants";
import { resolvePortfolioOptions, type LikelihoodKind, type PortfolioModelOptions } from "../model/portfolio/portfolio-options";
import type { SaturationKind } from "../model/saturation";

/** What a draw set keeps of one cell: its data and the constants its baseline was centred with. */
export interface DrawSetCell {
  readonly brand: string;
  readonly market: string;
  /** ISO Monday of the first week. */
  readonly firstWeek: string;
  readonly firstAbsoluteWeek: number;
  /** All weeks with data (training + holdout). */
  readonly weeks: number;
  /** Weeks the model was fitted on (the first `trainWeeks`). */
  readonly trainWeeks: number;
  readonly outcome: Float64Array;
  /** spend[c] per week, all weeks. */
  readonly spend: readonly Float64Array[];
  /** Training-week means of the uncentred seasonal columns [S_1, C_1, S_2, C_2, …]. */
  readonly seasonalMean: Float64Array;
  /** controls[k] per week, centred and scaled as in the fit; empty when there are none. */
  readonly controlsStandardised: readonly Float64Array[];
}

/**
 * The compact posterior a run stores for planning: per draw, the quantities that let
 * the browser recompute every decision quantity without the sampler. Arrays are
 * row-major by draw: per cell × channel values at (d·G + g)·C + c, per cell values at
 * d·G + g, per cell × j at (d·G + g)·J + j (j = 0 for harmonic 1).
 * `baselineLevel` is β0 − Σ_c β·mean_t r over the training weeks: the no-media intercept,
 * so that mean[t] = baselineLevel + β1·ť + seasonality + controls + Σ_c β·r(a[t]).
 */
export interface DrawSet {
  readonly version: 1;
  readonly model: "pooled" | "unpooled";
  readonly saturation: SaturationKind;
  readonly likelihood: LikelihoodKind;
  readonly maxLag: number;
  readonly seasonalityOrder: number;
  readonly channels: readonly string[];
  readonly controls: readonly string[];
  readonly cells: readonly DrawSetCell[];
  readonly drawCount: number;
  readonly beta: Float64Array;
  readonly theta: Float64Array;
  readonly alpha: Float64Array;
  /** Hill shape per cell × channel (all 1 for the exponential form). */
  readonly hillShape: Float64Array;
  readonly baselineLevel: Float64Array;
  readonly beta1: Float64Array;
  readonly gamma: Float64Array;
  readonly delta: Float64Array;
  readonly controlCoef: Float64Array;
  readonly sigma: Float64Array;
  /** Student-t degrees of freedom per draw × cell (Infinity for the Normal likelihood). */
  readonly nu: Float64Array;
}

/** Posterior draws as the sampler returns them: row-major, one column per name. */
export interface NamedDraws {
  readonly names: readonly string[];
  readonly draws: Float64Array;
}

/**
 * Builds the draw set of a pooled run, or of the combined unpooled runs, from the data
 * and options the model was built with and the draws under its parameter names.
 */
export function buildDrawSet(data: PortfolioData, options: PortfolioModelOptions, posterior: NamedDraws): DrawSet {
  const resolved = resolvePortfolioOptions(data.channels, options);
  const k = buildPortfolioConstants(data, resolved);
  const width = posterior.names.length;
  if (width === 0 || posterior.draws.length % width !== 0) throw new RangeError("draw set: the draws do not match the names");
  const D = posterior.draws.length / width;
  if (D === 0) throw new RangeError("draw set: there are no draws");
  const index = new Map(posterior.names.map((n, i) => [n, i]));
  const pooled = index.has(`mu[${data.channels[0]}]`);
  const column = (...candidates: string[]): number => {
    for (const c of candidates) {
      const i = index.get(c);
      if (i !== undefined) return i;
    }
    throw new RangeError(`draw set: the draws have no column ${candidates.join(" or ")}`);
  };
  const G = k.cellCount;
  const C = k.channelCount;
  const J = k.seasonalityOrder;
  const K = k.controlCount;
  const hill = resolved.saturation === "hill";
  const studentT = resolved.likelihood === "student-t";
  const beta = new Float64Array(D * G * C);
  const theta = new Float64Array(D * G * C);
  const alpha = new Float64Array(D * G * C);
  const hillShape = new Float64Array(D * G * C).fill(1);
  const baselineLevel = new Float64Array(D * G);
  const beta1 = new Float64Array(D * G);
  const sigma = new Float64Array(D * G);
  const nu = new Float64Array(D * G).fill(Infinity);
  const gamma = new Float64Array(D * G * J);
  const delta = new Float64Array(D * G * J);
  const controlCoef = new Float64Array(D * G * K);
  const src = posterior.draws;
  for (let g = 0; g < G; g++) {
    const cc = data.channels.map((ch) => ({
      beta: column(`beta[${g},${ch}]`),
      theta: column(`theta[${g},${ch}]`),
      alpha: column(`alpha[${g},${ch}]`, `alpha[${ch}]`),
      shape: hill ? column(`hillShape[${g},${ch}]`, `hillShape[${ch}]`) : -1,
    }));
    const level = column(`baselineLevel[${g}]`);
    const b1 = column(`beta1[${g}]`);
    const sg = column(`sigma[${g}]`);
    const nuCol = studentT ? column(`nu[${g}]`, "nu") : -1;
    const gm = Array.from({ length: J }, (_, j) => column(`gamma[${g},${j + 1}]`));
    const dl = Array.from({ length: J }, (_, j) => column(`delta[${g},${j + 1}]`));
    const ct = data.controls.map((name) => column(`controlCoef[${g},${name}]`));
    for (let d = 0; d < D; d++) {
      const row = d * width;
      for (let c = 0; c < C; c++) {
        const at = (d * G + g) * C + c;
        const col = cc[c]!;
        beta[at] = src[row + col.beta]!;
        theta[at] = src[row + col.theta]!;
        alpha[at] = src[row + col.alpha]!;
        if (col.shape >= 0) hillShape[at] = src[row + col.shape]!;
      }
      baselineLevel[d * G + g] = src[row + level]!;
      beta1[d * G + g] = src[row + b1]!;
      sigma[d * G + g] = src[row + sg]!;
      if (nuCol >= 0) nu[d * G + g] = src[row + nuCol]!;
      for (let j = 0; j < J; j++) {
        gamma[(d * G + g) * J + j] = src[row + gm[j]!]!;
        delta[(d * G + g) * J + j] = src[row + dl[j]!]!;
      }
      for (let j = 0; j < K; j++) controlCoef[(d * G + g) * K + j] = src[row + ct[j]!]!;
    }
  }
  const cells: DrawSetCell[] = data.cells.map((cell, g) => {
    const T = k.weeks[g]!;
    const cStart = k.controlStart[g]!;
    return {
      brand: cell.brand,
      market: cell.market,
      firstWeek: cell.firstWeek,
      firstAbsoluteWeek: k.firstAbsoluteWeek[g]!,
      weeks: T,
      trainWeeks: k.trainWeeks[g]!,
      outcome: Float64Array.from(cell.outcome),
      spend: cell.spend.map((s) => Float64Array.from(s)),
      seasonalMean: k.seasonalMean.slice(2 * J * g, 2 * J * (g + 1)),
      controlsStandardised: data.controls.map((_, j) => k.controlDesign.slice(cStart + j * T, cStart + (j + 1) * T)),
    };
  });
  return {
    version: 1,
    model: pooled ? "pooled" : "unpooled",
    saturation: resolved.saturation,
    likelihood: resolved.likelihood,
    maxLag: resolved.maxLag,
    seasonalityOrder: J,
    channels: [...data.channels],
    controls: [...data.controls],
    cells,
    drawCount: D,
    beta,
    theta,
    alpha,
    hillShape,
    baselineLevel,
    beta1,
    gamma,
    delta,
    controlCoef,
    sigma,
    nu,
  };
}

/** Position of cell × channel values of draw d. */
export function cellChannelAt(set: DrawSet, d: number, g: number, c: number): number {
  return (d * set.cells.length + g) * set.channels.length + c;
}

/** Index of a cell by brand and market, or a clear error. */
export function cellIndexOf(set: DrawSet, brand: string, market: string): number {
  const g = set.cells.findIndex((c) => c.brand === brand && c.market === market);
  if (g < 0) throw new RangeError(`no cell ${brand} × ${market} in this run`);
  return g;
}

/** Index of a channel, or a clear error. */
export function channelIndexOf(set: DrawSet, channel: string): number {
  const c = set.channels.indexOf(channel);
  if (c < 0) throw new RangeError(`no channel "${channel}" in this run`);
  return c;
}

export function checkCellChannel(set: DrawSet, g: number, c: number): void {
  if (!Number.isInteger(g) || g < 0 || g >= set.cells.length) throw new RangeError(`cell index ${g} is outside 0..${set.cells.length - 1}`);
  if (!Number.isInteger(c) || c < 0 || c >= set.channels.length) throw new RangeError(`channel index ${c} is outside 0..${set.channels.length - 1}`);
}

import { mediaSignalStrength } from "./cell-parametrisation";
import type { PortfolioConstants } from "./portfolio-constants";
import type { ResolvedPortfolioOptions } from "./portfolio-options";

/**
 * Positions in the unconstrained vector q. Every coordinate is scaled so that its prior
 * is a standard normal (or close to it), which gives the sampler similar scales at the start:
 *   μ_c = m0_c + s0_c·q,  log λ_c = log 2 + 0.75·q,  log k_c = 0.5·q (Hill shape),
 *   τ = exp(q),  α = logistic(q),  z = q,
 *   β0 = ȳ + s·q,  β1 = s·q,  γ, δ = (s/2)·q,  control coefficient = s·q,  σ = s·exp(q),  ν = exp(q).
 * A position of −1 means the block is absent.
 */
export interface ParameterLayout {
  /** "pooled": log β = μ + τB·zB + τM·zM + τG·zG; "unpooled": log β = η (= the μ block), one cell. */
  readonly structure: "pooled" | "unpooled";
  readonly mu: number;
  readonly tauBrand: number;
  readonly tauMarket: number;
  readonly tauCell: number;
  readonly alpha: number;
  readonly lambda: number;
  readonly hillShape: number;
  readonly zBrand: number;
  readonly zMarket: number;
  readonly zCell: number;
  /**
   * Per cell × channel: 1 when the cell effect is sampled centred (log β ~ Normal(group, τG),
   * coordinate u with log β = m0 + s0·u), 0 when non-centred (log β = group + τG·z). Both give
   * the same posterior; centred suits cell effects the data pin down, non-centred weak ones.
   */
  readonly cellCentred: Uint8Array;
  /** Start of the per-cell blocks: [β0, β1, γ_1..J, δ_1..J, log σ, controls_1..K]. */
  readonly cells: number;
  readonly cellStride: number;
  readonly nu: number;
  readonly dimension: number;
}

export function buildParameterLayout(
  constants: PortfolioConstants,
  options: ResolvedPortfolioOptions,
  structure: "pooled" | "unpooled",
): ParameterLayout {
  const C = constants.channelCount;
  const G = constants.cellCount;
  const B = constants.brands.length;
  const M = constants.markets.length;
  const pooled = structure === "pooled";
  const brandOn = pooled && (options.pooling === "crossed" || options.pooling === "brand");
  const marketOn = pooled && (options.pooling === "crossed" || options.pooling === "market");
  let next = 0;
  const take = (size: number, on = true): number => {
    if (!on) return -1;
    const at = next;
    next += size;
    return at;
  };
  const mu = take(C);
  const tauBrand = take(C, brandOn);
  const tauMarket = take(C, marketOn);
  const tauCell = take(C, pooled);
  const alpha = take(C);
  const lambda = take(C);
  const hillShape = take(C, options.saturation === "hill");
  const zBrand = take(B * C, brandOn);
  const zMarket = take(M * C, marketOn);
  const zCell = take(G * C, pooled);
  const cellCentred = new Uint8Array(G * C);
  if (pooled) {
    const strength = mediaSignalStrength(constants);
    for (let i = 0; i < G * C; i++) cellCentred[i] = strength[i]! >= options.centredCellMinSignal ? 1 : 0;
  }
  const cellStride = 3 + 2 * constants.seasonalityOrder + constants.controlCount;
  const cells = take(G * cellStride);
  const nu = take(1, options.likelihood === "student-t");
  return { structure, mu, tauBrand, tauMarket, tauCell, alpha, lambda, hillShape, zBrand, zMarket, zCell, cellCentred, cells, cellStride, nu, dimension: next };
}

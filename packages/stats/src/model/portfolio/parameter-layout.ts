import { cellEffectEstimates } from "./cell-parametrisation";
import type { PortfolioConstants } from "./portfolio-constants";
import type { ResolvedPortfolioOptions } from "./portfolio-options";

/**
 * Positions in the unconstrained vector q. Every coordinate is scaled so that its prior
 * is a standard normal (or close to it), which gives the sampler similar scales at the start:
 *   μ_c = m0_c + s0_c·q,  log λ_c = log 2 + 0.75·q,  log k_c = 0.5·q (Hill shape),
 *   τ = exp(q),  α = logistic(q),
 *   β0 = ȳ + s·q,  β1 = s·q,  γ, δ = (s/2)·q,  control coefficient = s·q,  σ = s·exp(q),  ν = exp(q).
 * The brand, market and cell deviations are built in that order, each as
 *   δ = v·S + √v·u,  v = 1/(1/τ² + P),
 * where P and S collect the guide (a least-squares estimate of each cell's log β and its
 * standard error) given the levels built before; without a guide (P = 0) this is exactly
 * the non-centred δ = τ·z of model.md. The map is triangular, its log-Jacobian Σ log(√v/τ)
 * is in the density, so the posterior of the named parameters does not depend on the guide.
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
   * Guide of the cell level, per cell × channel: a data estimate m̂ of log β and its sd ŝ.
   * The sampler's coordinate u maps to log β = m + √v·u with v = 1/(1/τG² + 1/ŝ²),
   * m = v·(group/τG² + m̂/ŝ²): the conditional posterior under a Normal approximation of
   * the data. τG ≪ ŝ gives the non-centred form, τG ≫ ŝ the centred one; ŝ = Infinity is
   * exactly non-centred. (Partial non-centring: Papaspiliopoulos, Roberts & Sköld 2007,
   * Statistical Science 22(1).) The Jacobian √v is part of the density, so the posterior
   * of the named parameters is the same for any guide.
   */
  readonly guideMean: Float64Array;
  readonly guidePrecision: Float64Array;
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
  const guideMean = new Float64Array(G * C);
  const guidePrecision = new Float64Array(G * C);
  if (pooled) {
    const guide = options.cellEffectGuide;
    if (guide === "least-squares") {
      const estimate = cellEffectEstimates(constants);
      guideMean.set(estimate.mean);
      for (let i = 0; i < G * C; i++) guidePrecision[i] = 1 / (estimate.sd[i]! * estimate.sd[i]!);
    } else if (guide !== "none") {
      if (guide.mean.length !== G * C) throw new RangeError(`cellEffectGuide needs ${G * C} values (cells × channels), got ${guide.mean.length}`);
      for (let i = 0; i < G * C; i++) {
        guideMean[i] = guide.mean[i]!;
        guidePrecision[i] = 1 / (guide.sd[i]! * guide.sd[i]!);
      }
    }
  }
  const cellStride = 3 + 2 * constants.seasonalityOrder + constants.controlCount;
  const cells = take(G * cellStride);
  const nu = take(1, options.likelihood === "student-t");
  return { structure, mu, tauBrand, tauMarket, tauCell, alpha, lambda, hillShape, zBrand, zMarket, zCell, guideMean, guidePrecision, cells, cellStride, nu, dimension: next };
}

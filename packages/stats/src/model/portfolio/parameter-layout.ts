import { fitCellEffectGuide } from "./cell-parametrisation";
import type { PortfolioConstants } from "./portfolio-constants";
import type { ResolvedPortfolioOptions } from "./portfolio-options";

/**
 * Positions in the unconstrained vector q. Every coordinate is scaled so that its prior
 * is a standard normal (or close to it), which gives the sampler similar scales at the start:
 *   log λ_c = log 2 + 0.75·q,  log k_c = 0.5·q (Hill shape),  τ = exp(q),  α = logistic(q),
 *   β0 = ȳ + s·q,  β1 = s·q,  γ, δ = (s/2)·q,  control coefficient = s·q,  σ = s·exp(q),  ν = exp(q);
 *   unpooled: η_c = m0_c + s0_c·q.
 * In the pooled model μ, the brand, market and cell deviations are built in that order,
 * each from its exact conditional given the τ's and the levels before it, when each guided
 * cell's data say log β ~ Normal(m̂, ŝ) (the guide: a least-squares estimate of each cell's
 * log β and its standard error): μ with the brands jointly as x = Λ⁻¹h + chol(Λ)⁻ᵀ·u
 * (GuidedChannelLevel: every cell loads on μ, brands in a shared market are coupled), then
 * each market and each cell as δ = v·S + √v·u, v = 1/(1/τ² + P). Without a guide this is
 * exactly μ = m0 + s0·u and the non-centred δ = τ·z of model.md. The map is triangular and
 * its log-Jacobian is in the density, so the posterior of the named parameters does not
 * depend on the guide.
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
  /**
   * The least-squares guide follows the sampler's α and λ to first order: at a position,
   * m̂[g,c′] = guideMean[g,c′] + Σ_c slopeAlpha[(g·C + c′)·C + c]·(logit α_c − guideLogitAlpha_c)
   *   + slopeLogLambda[(g·C + c′)·C + c]·(log λ_c − guideLogLambda_c).
   * α and λ come before the deviations in the triangular map, so the Jacobian is unchanged.
   * All zero (a fixed guide) for a guide given in the options.
   */
  readonly guideLogitAlpha: Float64Array;
  readonly guideLogLambda: Float64Array;
  readonly guideSlopeAlpha: Float64Array;
  readonly guideSlopeLogLambda: Float64Array;
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
  const guideLogitAlpha = new Float64Array(C);
  const guideLogLambda = new Float64Array(C);
  const guideSlopeAlpha = new Float64Array(G * C * C);
  const guideSlopeLogLambda = new Float64Array(G * C * C);
  if (pooled) {
    const guide = options.cellEffectGuide;
    if (guide === "least-squares") {
      const estimate = fitCellEffectGuide(constants);
      guideMean.set(estimate.mean);
      for (let i = 0; i < G * C; i++) guidePrecision[i] = 1 / (estimate.sd[i]! * estimate.sd[i]!);
      for (let c = 0; c < C; c++) {
        guideLogitAlpha[c] = Math.log(estimate.alpha[c]! / (1 - estimate.alpha[c]!));
        guideLogLambda[c] = Math.log(estimate.lambda[c]!);
      }
      // the slopes are those of the exponential form; the Hill form keeps a fixed guide
      if (options.saturation === "exponential") {
        guideSlopeAlpha.set(estimate.meanSlopeAlpha);
        guideSlopeLogLambda.set(estimate.meanSlopeLambda);
      }
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
  return { structure, mu, tauBrand, tauMarket, tauCell, alpha, lambda, hillShape, zBrand, zMarket, zCell, guideMean, guidePrecision, guideLogitAlpha, guideLogLambda, guideSlopeAlpha, guideSlopeLogLambda, cells, cellStride, nu, dimension: next };
}

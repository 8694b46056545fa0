import type { DensityModel } from "../../model/density-model";
import { requireFinite, requireFiniteArray, requireObject, requirePositive } from "./data-checks";

export const normalMeanKind = "normal-mean";

export interface NormalMeanData {
  y: number[];
  /** Known sampling standard deviation. */
  sigma: number;
  priorMean: number;
  priorSd: number;
}

/** y_i ~ N(μ, σ²) with σ known, μ ~ N(μ0, τ0²); the posterior is normal in closed form (BDA3 §2.5). */
export function normalMeanModel(input: unknown): DensityModel {
  const data = requireObject(input, normalMeanKind);
  const y = requireFiniteArray(data["y"], "y", normalMeanKind);
  const sigma = requirePositive(data["sigma"], "sigma", normalMeanKind);
  const priorMean = requireFinite(data["priorMean"], "priorMean", normalMeanKind);
  const priorSd = requirePositive(data["priorSd"], "priorSd", normalMeanKind);
  const count = y.length;
  const sum = y.reduce((a, b) => a + b, 0);
  let sumSquares = 0;
  for (const v of y) sumSquares += v * v;
  const dataPrecision = 1 / (sigma * sigma);
  const priorPrecision = 1 / (priorSd * priorSd);
  return {
    dimension: 1,
    constrainedNames: ["mu"],
    logDensityGradient(q: Float64Array, grad: Float64Array): number {
      const mu = q[0]!;
      const prior = mu - priorMean;
      // Σ (y_i − μ)² expanded, so a call costs O(1).
      const residualSquares = sumSquares - 2 * mu * sum + count * mu * mu;
      grad[0] = dataPrecision * (sum - count * mu) - priorPrecision * prior;
      return -0.5 * dataPrecision * residualSquares - 0.5 * priorPrecision * prior * prior;
    },
    constrain(q: Float64Array, out: Float64Array): void {
      out[0] = q[0]!;
    },
  };
}

/** Exact posterior of μ (BDA3 §2.5, eqs. 2.11–2.12). */
export function normalMeanPosterior(data: NormalMeanData): { mean: number; variance: number } {
  const n = data.y.length;
  const mean = data.y.reduce((a, b) => a + b, 0) / n;
  const precision = 1 / (data.priorSd * data.priorSd) + n / (data.sigma * data.sigma);
  return {
    mean: (data.priorMean / (data.priorSd * data.priorSd) + (n * mean) / (data.sigma * data.sigma)) / precision,
    variance: 1 / precision,
  };
}

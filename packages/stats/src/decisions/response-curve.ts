import { steadyStateResponse } from "../model/saturation";
import { cellChannelAt, checkCellChannel, type DrawSet } from "./draw-set";
import { summariseDraws, type DrawSummary } from "./draw-summary";

export interface ResponseCurvePoint {
  readonly weeklySpend: number;
  /** Weekly outcome from the channel at this constant weekly spend. */
  readonly response: DrawSummary;
  /** Marginal CAC at this spend. */
  readonly marginalCac: DrawSummary;
}

/**
 * Steady-state response R(s) = β·θ·(1 − exp(−s/θ)) to a constant weekly spend s (the
 * normalised adstock of a constant is the constant), with 50 % and 90 % bands.
 */
export function responseCurve(set: DrawSet, g: number, c: number, weeklySpends: readonly number[]): ResponseCurvePoint[] {
  checkCellChannel(set, g, c);
  const response = new Float64Array(set.drawCount);
  const marginal = new Float64Array(set.drawCount);
  return weeklySpends.map((s) => {
    if (!(Number.isFinite(s) && s >= 0)) throw new RangeError(`weekly spend must be ≥ 0, got ${s}`);
    for (let d = 0; d < set.drawCount; d++) {
      const at = cellChannelAt(set, d, g, c);
      const beta = set.beta[at]!;
      const theta = set.theta[at]!;
      const shape = set.hillShape[at]!;
      response[d] = steadyStateResponse(set.saturation, s, beta, theta, shape);
      if (set.saturation === "exponential") marginal[d] = Math.exp(s / theta) / beta;
      else {
        const h = Math.max(1e-6, s * 1e-6);
        const slope = (steadyStateResponse("hill", s + h, beta, theta, shape) - steadyStateResponse("hill", Math.max(0, s - h), beta, theta, shape)) / (s + h - Math.max(0, s - h));
        marginal[d] = 1 / slope;
      }
    }
    return { weeklySpend: s, response: summariseDraws(response), marginalCac: summariseDraws(marginal) };
  });
}

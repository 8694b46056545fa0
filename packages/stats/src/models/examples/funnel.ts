import type { DensityModel } from "../../model/density-model";
import { requireInteger, requireObject } from "./data-checks";

export const funnelKind = "funnel-centred";

export interface FunnelData {
  /** Number of x coordinates hanging below v. */
  dimension: number;
}

/**
 * Neal's funnel in centred form (Neal 2003, "Slice sampling", Ann. Statist. 31(3), §8):
 * v ~ N(0, 3²), x_i | v ~ N(0, exp(v)). Its neck defeats a single step size, so a sampler
 * should report divergent transitions.
 */
export function funnelModel(input: unknown): DensityModel {
  const data = requireObject(input, funnelKind);
  const k = requireInteger(data["dimension"], "dimension", funnelKind, 1, 10_000);
  return {
    dimension: k + 1,
    constrainedNames: ["v", ...Array.from({ length: k }, (_, i) => `x[${i + 1}]`)],
    logDensityGradient(q: Float64Array, grad: Float64Array): number {
      const v = q[0]!;
      const precision = Math.exp(-v);
      let sumSquares = 0;
      for (let i = 1; i <= k; i++) {
        const x = q[i]!;
        sumSquares += x * x;
        grad[i] = -x * precision;
      }
      grad[0] = -v / 9 - 0.5 * k + 0.5 * sumSquares * precision;
      return (-0.5 * v * v) / 9 - 0.5 * k * v - 0.5 * sumSquares * precision;
    },
    constrain(q: Float64Array, out: Float64Array): void {
      out.set(q);
    },
  };
}

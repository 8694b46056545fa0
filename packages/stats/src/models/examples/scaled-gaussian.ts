import type { DensityModel } from "../../model/density-model";
import { requireObject, requirePositiveArray } from "./data-checks";

export const scaledGaussianKind = "scaled-gaussian";

export interface ScaledGaussianData {
  /** Standard deviation of each independent coordinate. */
  scales: number[];
}

/** Independent x_i ~ N(0, s_i²): a test of mass-matrix adaptation when scales differ widely. */
export function scaledGaussianModel(input: unknown): DensityModel {
  const data = requireObject(input, scaledGaussianKind);
  const scales = requirePositiveArray(data["scales"], "scales", scaledGaussianKind);
  const precision = Float64Array.from(scales, (s) => 1 / (s * s));
  const n = scales.length;
  return {
    dimension: n,
    constrainedNames: scales.map((_, i) => `x[${i + 1}]`),
    logDensityGradient(q: Float64Array, grad: Float64Array): number {
      let lp = 0;
      for (let i = 0; i < n; i++) {
        const g = -q[i]! * precision[i]!;
        grad[i] = g;
        lp += 0.5 * q[i]! * g;
      }
      return lp;
    },
    constrain(q: Float64Array, out: Float64Array): void {
      out.set(q);
    },
  };
}

/** Scales spread log-uniformly from `smallest` to `largest`. */
export function logSpacedScales(dimension: number, smallest: number, largest: number): number[] {
  if (dimension === 1) return [smallest];
  const step = Math.log(largest / smallest) / (dimension - 1);
  return Array.from({ length: dimension }, (_, i) => smallest * Math.exp(i * step));
}

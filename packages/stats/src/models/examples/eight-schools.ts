import type { DensityModel } from "../../model/density-model";
import { requireObject, requireFiniteArray, requirePositiveArray } from "./data-checks";

export const eightSchoolsKind = "eight-schools-noncentred";

export interface EightSchoolsData {
  /** Estimated effect per group. */
  y: number[];
  /** Standard error of each estimate (known). */
  sigma: number[];
}

/**
 * Hierarchical normal model in non-centred form (Gelman et al., BDA3 §5.5; data Rubin 1981):
 * μ ~ N(0, 5), τ ~ half-Cauchy(0, 5), η_j ~ N(0, 1), θ_j = μ + τ η_j, y_j ~ N(θ_j, σ_j).
 * Unconstrained vector: (μ, log τ, η_1..η_J); the log-Jacobian of τ = exp(u) is u.
 */
export function eightSchoolsModel(input: unknown): DensityModel {
  const data = requireObject(input, eightSchoolsKind);
  const y = requireFiniteArray(data["y"], "y", eightSchoolsKind);
  const sigma = requirePositiveArray(data["sigma"], "sigma", eightSchoolsKind);
  if (sigma.length !== y.length) throw new Error(`${eightSchoolsKind}: y and sigma must have the same length (${y.length} vs ${sigma.length})`);
  const groups = y.length;
  const yv = Float64Array.from(y);
  const precision = Float64Array.from(sigma, (s) => 1 / (s * s));
  const names = ["mu", "tau", ...y.map((_, j) => `theta[${j + 1}]`), ...y.map((_, j) => `eta[${j + 1}]`)];

  return {
    dimension: groups + 2,
    constrainedNames: names,
    logDensityGradient(q: Float64Array, grad: Float64Array): number {
      const mu = q[0]!;
      const logTau = q[1]!;
      const tau = Math.exp(logTau);
      const tauOver5 = tau / 5;
      // μ ~ N(0, 5); τ ~ half-Cauchy(0, 5) plus log-Jacobian log τ.
      let lp = (-0.5 * mu * mu) / 25 - Math.log1p(tauOver5 * tauOver5) + logTau;
      let dMu = -mu / 25;
      let dLogTau = 1 - (2 * tauOver5 * tauOver5) / (1 + tauOver5 * tauOver5);
      for (let j = 0; j < groups; j++) {
        const eta = q[j + 2]!;
        const residual = yv[j]! - (mu + tau * eta);
        const w = residual * precision[j]!;
        lp += -0.5 * eta * eta - 0.5 * residual * w;
        dMu += w;
        dLogTau += w * tau * eta;
        grad[j + 2] = -eta + w * tau;
      }
      grad[0] = dMu;
      grad[1] = dLogTau;
      return lp;
    },
    constrain(q: Float64Array, out: Float64Array): void {
      const mu = q[0]!;
      const tau = Math.exp(q[1]!);
      out[0] = mu;
      out[1] = tau;
      for (let j = 0; j < groups; j++) {
        out[2 + j] = mu + tau * q[j + 2]!;
        out[2 + groups + j] = q[j + 2]!;
      }
    },
  };
}

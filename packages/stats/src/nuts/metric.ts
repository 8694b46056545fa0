import type { RandomSource } from "../rng/random-source";

// Diagonal Euclidean metric: kinetic energy K(p) = ½ Σ p_i² m⁻¹_i, with m⁻¹ the inverse
// mass matrix diagonal (Betancourt 2017, arXiv:1701.02434, §4.2).

export function kineticEnergy(p: Float64Array, inverseMetric: Float64Array): number {
  let sum = 0;
  for (let i = 0; i < p.length; i++) sum += p[i]! * p[i]! * inverseMetric[i]!;
  return 0.5 * sum;
}

/** Velocity p♯ = M⁻¹ p (Stan's dtau_dp), written into `out`. */
export function velocity(p: Float64Array, inverseMetric: Float64Array, out: Float64Array): void {
  for (let i = 0; i < p.length; i++) out[i] = inverseMetric[i]! * p[i]!;
}

/** Draws p ~ Normal(0, M) with M = diag(1 / inverseMetric). */
export function sampleMomentum(rng: RandomSource, inverseMetric: Float64Array, out: Float64Array): void {
  for (let i = 0; i < out.length; i++) out[i] = rng.normal() / Math.sqrt(inverseMetric[i]!);
}

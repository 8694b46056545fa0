import type { DensityModel } from "../model/density-model";
import type { PhasePoint } from "./phase-point";

/**
 * One leapfrog step of size `epsilon` (negative for backwards in time), in place:
 * half step in momentum, full step in position, half step in momentum
 * (Neal 2011, "MCMC using Hamiltonian dynamics", §2.3).
 */
export function leapfrog(model: DensityModel, z: PhasePoint, inverseMetric: Float64Array, epsilon: number): void {
  const { q, p, grad } = z;
  const n = q.length;
  const half = 0.5 * epsilon;
  for (let i = 0; i < n; i++) {
    const pi = p[i]! + half * grad[i]!;
    p[i] = pi;
    q[i] = q[i]! + epsilon * inverseMetric[i]! * pi;
  }
  z.logDensity = model.logDensityGradient(q, grad);
  for (let i = 0; i < n; i++) p[i] = p[i]! + half * grad[i]!;
}

import type { DensityModel } from "../model/density-model";
import type { PhasePoint } from "./phase-point";

/**
 * One leapfrog step of size `epsilon` (negative for backwards in time), in place:
 * half step in momentum, full step in position, half step in momentum
 * (Neal 2011, "MCMC using Hamiltonian dynamics", §2.3). Also refreshes the velocity
 * and kinetic energy of `z` in the same pass, so no extra sweep is needed.
 */
export function leapfrog(model: DensityModel, z: PhasePoint, inverseMetric: Float64Array, epsilon: number): void {
  const { q, p, v, grad } = z;
  const n = q.length;
  const half = 0.5 * epsilon;
  for (let i = 0; i < n; i++) {
    const pi = p[i]! + half * grad[i]!;
    p[i] = pi;
    q[i] = q[i]! + epsilon * inverseMetric[i]! * pi;
  }
  z.logDensity = model.logDensityGradient(q, grad);
  let twiceKinetic = 0;
  for (let i = 0; i < n; i++) {
    const pi = p[i]! + half * grad[i]!;
    const vi = inverseMetric[i]! * pi;
    p[i] = pi;
    v[i] = vi;
    twiceKinetic += pi * vi;
  }
  z.kinetic = 0.5 * twiceKinetic;
}

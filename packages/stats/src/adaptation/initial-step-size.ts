import type { DensityModel } from "../model/density-model";
import { leapfrog } from "../nuts/integrator";
import { kineticEnergy, sampleMomentum } from "../nuts/metric";
import { createPhasePoint, type PhasePoint } from "../nuts/phase-point";
import type { NutsState } from "../nuts/nuts-transition";
import type { RandomSource } from "../rng/random-source";

/**
 * Initial step-size heuristic (Hoffman & Gelman 2014, Algorithm 4, as in Stan's
 * base_hmc::init_stepsize): double or halve ε until the acceptance probability of one
 * leapfrog step from `state` with fresh momentum crosses 0.8.
 * Throws when ε runs away, which means the density is improper or broken.
 * Returns the tuned step size and the gradient evaluations it took.
 */
export function initialStepSize(
  model: DensityModel,
  state: NutsState,
  inverseMetric: Float64Array,
  stepSize: number,
  rng: RandomSource,
  scratch: PhasePoint = createPhasePoint(model.dimension),
): { stepSize: number; gradientEvaluations: number } {
  if (!(stepSize > 0) || !Number.isFinite(stepSize) || stepSize > 1e7) return { stepSize, gradientEvaluations: 0 };
  let gradientEvaluations = 0;
  const logTarget = Math.log(0.8);
  const energyChange = (epsilon: number): number => {
    scratch.q.set(state.position);
    scratch.grad.set(state.gradient);
    scratch.logDensity = state.logDensity;
    sampleMomentum(rng, inverseMetric, scratch.p);
    const h0 = kineticEnergy(scratch.p, inverseMetric) - scratch.logDensity;
    leapfrog(model, scratch, inverseMetric, epsilon);
    gradientEvaluations++;
    let h = kineticEnergy(scratch.p, inverseMetric) - scratch.logDensity;
    if (Number.isNaN(h)) h = Number.POSITIVE_INFINITY;
    return h0 - h;
  };

  const direction = energyChange(stepSize) > logTarget ? 1 : -1;
  let epsilon = stepSize;
  for (;;) {
    const deltaH = energyChange(epsilon);
    if (direction === 1 && !(deltaH > logTarget)) break;
    if (direction === -1 && !(deltaH < logTarget)) break;
    epsilon = direction === 1 ? 2 * epsilon : 0.5 * epsilon;
    if (epsilon > 1e7) throw new Error("step size grew beyond 1e7 while tuning: the posterior may be improper");
    if (epsilon === 0) throw new Error("step size fell to 0 while tuning: the model's log density or gradient may be wrong");
  }
  return { stepSize: epsilon, gradientEvaluations };
}

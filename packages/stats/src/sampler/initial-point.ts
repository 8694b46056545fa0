import type { DensityModel } from "../model/density-model";
import type { NutsState } from "../nuts/nuts-transition";
import type { RandomSource } from "../rng/random-source";

const maxAttempts = 100;

/**
 * Finds a starting point with finite log density and gradient: the model's own
 * `initialPoint` if it has one, else uniform(−radius, radius) per coordinate (as Stan),
 * retrying up to 100 times. Returns the gradient evaluations used.
 */
export function findInitialPoint(model: DensityModel, rng: RandomSource, radius: number, state: NutsState): number {
  const { position, gradient } = state;
  for (let attempt = 1; attempt <= maxAttempts; attempt++) {
    if (model.initialPoint) model.initialPoint(rng, position);
    else for (let i = 0; i < position.length; i++) position[i] = radius * (2 * rng.uniform() - 1);
    const logDensity = model.logDensityGradient(position, gradient);
    if (Number.isFinite(logDensity) && allFinite(gradient)) {
      state.logDensity = logDensity;
      return attempt;
    }
  }
  throw new Error(
    `no starting point with a finite log density and gradient after ${maxAttempts} attempts; check the model and its data`,
  );
}

function allFinite(values: Float64Array): boolean {
  for (let i = 0; i < values.length; i++) if (!Number.isFinite(values[i]!)) return false;
  return true;
}

/**
 * What the sampler needs from a model: a log density on an unconstrained vector and
 * its gradient, plus the map to named, constrained parameters.
 *
 * `logDensityGradient` writes the gradient into `grad` (length `dimension`) and returns
 * the log density (up to a constant, log-Jacobian of the constraining map included).
 * It must not allocate per call: hot loops run it hundreds of thousands of times.
 */
export interface DensityModel {
  /** Length of the unconstrained vector q. */
  readonly dimension: number;
  /** Names of the constrained quantities written by `constrain`, e.g. "mu", "theta[3]". */
  readonly constrainedNames: readonly string[];
  logDensityGradient(q: Float64Array, grad: Float64Array): number;
  /** Writes the constrained values of q into `out` (length constrainedNames.length). */
  constrain(q: Float64Array, out: Float64Array): void;
  /** Optional starting point for a chain; default is uniform(-2, 2) per coordinate. */
  initialPoint?(rng: import("../rng/random-source").RandomSource, out: Float64Array): void;
}

/**
 * A model described by plain data, so it can cross a thread boundary
 * (worker_threads or a browser Web Worker) and be rebuilt there by `buildModel`.
 */
export interface ModelSpec {
  readonly kind: string;
  readonly data: unknown;
}

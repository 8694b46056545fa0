/**
 * Log prior densities on the unconstrained scale the sampler moves on, each with the
 * log-Jacobian of its constraining map and its derivative. Additive constants are dropped.
 * Each function returns the log density and adds d/du into grad[index].
 */

/** u ~ Normal(mean, sd) on the real line. */
export function normalPrior(u: number, mean: number, sd: number, grad: Float64Array, index: number): number {
  const z = (u - mean) / sd;
  grad[index] = grad[index]! - z / sd;
  return -0.5 * z * z;
}

/** x = exp(u) ~ HalfNormal(scale): log p = −x²/(2 scale²) + u (Jacobian). */
export function halfNormalPriorOnLog(u: number, scale: number, grad: Float64Array, index: number): number {
  const x = Math.exp(u);
  const z = x / scale;
  grad[index] = grad[index]! - z * z + 1;
  return -0.5 * z * z + u;
}

/** x = logistic(u) ~ Beta(a, b): log p = a·log x + b·log(1 − x) (Jacobian x(1 − x) included). */
export function betaPriorOnLogit(u: number, a: number, b: number, grad: Float64Array, index: number): number {
  const x = 1 / (1 + Math.exp(-u));
  grad[index] = grad[index]! + a * (1 - x) - b * x;
  // log x = −log(1 + e^{−u}), log(1 − x) = −log(1 + e^{u}), written to stay finite for large |u|
  const logX = u >= 0 ? -Math.log1p(Math.exp(-u)) : u - Math.log1p(Math.exp(u));
  const log1mX = u >= 0 ? -u - Math.log1p(Math.exp(-u)) : -Math.log1p(Math.exp(u));
  return a * logX + b * log1mX;
}

/** x = exp(u) ~ Gamma(shape, rate): log p = shape·u − rate·x (Jacobian included). */
export function gammaPriorOnLog(u: number, shape: number, rate: number, grad: Float64Array, index: number): number {
  const x = Math.exp(u);
  grad[index] = grad[index]! + shape - rate * x;
  return shape * u - rate * x;
}

/** logistic(u) = 1 / (1 + e^{−u}). */
export function logistic(u: number): number {
  return 1 / (1 + Math.exp(-u));
}

/** logit(x) = log(x / (1 − x)). */
export function logit(x: number): number {
  return Math.log(x / (1 - x));
}

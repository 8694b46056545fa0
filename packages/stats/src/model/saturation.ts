/**
 * Saturation of adstocked spend a, in spend units, so that β·r(a) is a number of outcomes.
 *
 * Exponential (the default): r(a; θ) = θ·(1 − exp(−a/θ)), r′(0) = 1, so β is the
 * outcome per currency unit at low spend.
 * Hill (optional; Jin et al. 2017): r(a; θ, k) = θ · a^k / (a^k + θ^k), half-saturation
 * at a = θ; with k = 1 it also has r′(0) = 1.
 */

export type SaturationKind = "exponential" | "hill";

/** θ·(1 − exp(−a/θ)). */
export function saturationExponential(a: number, theta: number): number {
  return -theta * Math.expm1(-a / theta);
}

/** dr/da = exp(−a/θ). */
export function saturationExponentialSlope(a: number, theta: number): number {
  return Math.exp(-a / theta);
}

/** dr/dθ = 1 − exp(−a/θ) − (a/θ)·exp(−a/θ). */
export function saturationExponentialThetaDerivative(a: number, theta: number): number {
  const ratio = a / theta;
  const e = Math.exp(-ratio);
  return -Math.expm1(-ratio) - ratio * e;
}

/** The Hill share a^k / (a^k + h^k): exactly 0.5 at the half-saturation point a = h. */
export function hillShare(a: number, halfSaturation: number, shape: number): number {
  if (a <= 0) return 0;
  const u = Math.pow(a / halfSaturation, shape);
  return u / (1 + u);
}

/** θ·a^k/(a^k + θ^k). */
export function saturationHill(a: number, theta: number, shape: number): number {
  return theta * hillShare(a, theta, shape);
}

/** Value and partial derivatives of the Hill form, written into out = [r, dr/da, dr/dθ, dr/dk]. */
export function saturationHillWithDerivatives(a: number, theta: number, shape: number, out: Float64Array): void {
  if (a <= 0) {
    out[0] = 0;
    // The slope at 0 is 1 for k = 1, 0 for k > 1 and unbounded for k < 1; a ≤ 0 only
    // occurs when the adstock window holds no spend, where da/dα = 0 too.
    out[1] = shape === 1 ? 1 : 0;
    out[2] = 0;
    out[3] = 0;
    return;
  }
  const ratio = a / theta;
  const u = Math.pow(ratio, shape);
  const onePlusU = 1 + u;
  const inv2 = 1 / (onePlusU * onePlusU);
  out[0] = (theta * u) / onePlusU;
  out[1] = shape * Math.pow(ratio, shape - 1) * inv2;
  out[2] = u / onePlusU - shape * u * inv2;
  out[3] = theta * u * Math.log(ratio) * inv2;
}

/** Steady-state response of a constant weekly spend s (normalised adstock of a constant is s). */
export function steadyStateResponse(kind: SaturationKind, spend: number, beta: number, theta: number, shape = 1): number {
  return kind === "exponential" ? beta * saturationExponential(spend, theta) : beta * saturationHill(spend, theta, shape);
}

import type { PhasePoint } from "./phase-point";

/** A candidate draw: position, gradient, log density and the kinetic energy it had. */
export interface Proposal {
  q: Float64Array;
  grad: Float64Array;
  logDensity: number;
  kinetic: number;
}

export function createProposal(dimension: number): Proposal {
  return { q: new Float64Array(dimension), grad: new Float64Array(dimension), logDensity: Number.NEGATIVE_INFINITY, kinetic: 0 };
}

export function proposeFromPoint(z: PhasePoint, out: Proposal): void {
  out.q.set(z.q);
  out.grad.set(z.grad);
  out.logDensity = z.logDensity;
  out.kinetic = z.kinetic;
}

/** Makes `to` hold `from`'s draw by exchanging buffers (O(1)); `from` is left with stale contents. */
export function takeProposal(from: Proposal, to: Proposal): void {
  const q = to.q;
  const grad = to.grad;
  to.q = from.q;
  to.grad = from.grad;
  from.q = q;
  from.grad = grad;
  to.logDensity = from.logDensity;
  to.kinetic = from.kinetic;
}

/** log(exp(a) + exp(b)) without overflow; −∞ is the identity. */
export function logSumExp(a: number, b: number): number {
  if (a === Number.NEGATIVE_INFINITY) return b;
  if (b === Number.NEGATIVE_INFINITY) return a;
  return a > b ? a + Math.log1p(Math.exp(b - a)) : b + Math.log1p(Math.exp(a - b));
}

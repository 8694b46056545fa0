/** A point in phase space: position q, momentum p, gradient of log density at q. */
export interface PhasePoint {
  readonly q: Float64Array;
  readonly p: Float64Array;
  readonly grad: Float64Array;
  logDensity: number;
}

export function createPhasePoint(dimension: number): PhasePoint {
  return {
    q: new Float64Array(dimension),
    p: new Float64Array(dimension),
    grad: new Float64Array(dimension),
    logDensity: Number.NEGATIVE_INFINITY,
  };
}

export function copyPhasePoint(from: PhasePoint, to: PhasePoint): void {
  to.q.set(from.q);
  to.p.set(from.p);
  to.grad.set(from.grad);
  to.logDensity = from.logDensity;
}

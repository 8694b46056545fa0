/** A point in phase space: position q, momentum p, velocity v = M⁻¹p, gradient of log density at q. */
export interface PhasePoint {
  readonly q: Float64Array;
  readonly p: Float64Array;
  readonly v: Float64Array;
  readonly grad: Float64Array;
  logDensity: number;
  /** Kinetic energy ½ pᵀM⁻¹p at this point. */
  kinetic: number;
}

export function createPhasePoint(dimension: number): PhasePoint {
  return {
    q: new Float64Array(dimension),
    p: new Float64Array(dimension),
    v: new Float64Array(dimension),
    grad: new Float64Array(dimension),
    logDensity: Number.NEGATIVE_INFINITY,
    kinetic: 0,
  };
}

export function copyPhasePoint(from: PhasePoint, to: PhasePoint): void {
  to.q.set(from.q);
  to.p.set(from.p);
  to.v.set(from.v);
  to.grad.set(from.grad);
  to.logDensity = from.logDensity;
  to.kinetic = from.kinetic;
}

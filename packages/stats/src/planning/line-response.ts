import { cellChannelAt, type DrawSet } from "../decisions/draw-set";

/** A line of a budget: one channel in one cell. */
export interface BudgetLineRef {
  readonly cellIndex: number;
  readonly channelIndex: number;
}

/**
 * The steady-state weekly response of budget lines over posterior draws: for a constant
 * weekly spend s (whose normalised adstock is s), R_d(s) = β·θ·(1 − exp(−s/θ)), or
 * β·θ·s^k/(s^k + θ^k) for the Hill form, per draw d. Draws are copied per line so that
 * every evaluation is one pass over contiguous arrays.
 */
export class LineResponses {
  readonly lineCount: number;
  readonly drawCount: number;
  readonly hill: boolean;
  private readonly beta: Float64Array;
  private readonly theta: Float64Array;
  private readonly invTheta: Float64Array;
  private readonly logBeta: Float64Array;
  private readonly logTheta: Float64Array;
  private readonly shape: Float64Array;
  private readonly logDrawCount: number;

  constructor(set: DrawSet, lines: readonly BudgetLineRef[]) {
    const D = set.drawCount;
    const n = lines.length;
    this.lineCount = n;
    this.drawCount = D;
    this.hill = set.saturation === "hill";
    this.beta = new Float64Array(n * D);
    this.theta = new Float64Array(n * D);
    this.invTheta = new Float64Array(n * D);
    this.logBeta = new Float64Array(n * D);
    this.logTheta = new Float64Array(n * D);
    this.shape = new Float64Array(n * D);
    this.logDrawCount = Math.log(D);
    lines.forEach((line, l) => {
      for (let d = 0; d < D; d++) {
        const at = cellChannelAt(set, d, line.cellIndex, line.channelIndex);
        const beta = set.beta[at]!;
        const theta = set.theta[at]!;
        const shape = set.hillShape[at]!;
        if (!(beta > 0 && Number.isFinite(beta) && theta > 0 && Number.isFinite(theta) && shape > 0 && Number.isFinite(shape))) {
          throw new RangeError(`draw ${d} of ${set.cells[line.cellIndex]!.brand} × ${set.cells[line.cellIndex]!.market}, ${set.channels[line.channelIndex]} has β = ${beta}, θ = ${theta}, shape = ${shape}; all must be positive numbers`);
        }
        this.beta[l * D + d] = beta;
        this.theta[l * D + d] = theta;
        this.invTheta[l * D + d] = 1 / theta;
        this.logBeta[l * D + d] = Math.log(beta);
        this.logTheta[l * D + d] = Math.log(theta);
        this.shape[l * D + d] = shape;
      }
    });
  }

  /** E_d R_d(s). */
  meanResponse(l: number, s: number): number {
    const D = this.drawCount;
    const o = l * D;
    let sum = 0;
    if (!this.hill) {
      for (let d = 0; d < D; d++) sum -= this.beta[o + d]! * this.theta[o + d]! * Math.expm1(-s * this.invTheta[o + d]!);
    } else if (s > 0) {
      // (s/θ)^k as exp(k·(log s − log θ)): one exp per draw instead of a pow.
      const ls = Math.log(s);
      for (let d = 0; d < D; d++) {
        const u = Math.exp(this.shape[o + d]! * (ls - this.logTheta[o + d]!));
        sum += (this.beta[o + d]! * this.theta[o + d]! * u) / (1 + u);
      }
    }
    return sum / D;
  }

  /**
   * Writes log E_d R′_d(s) into out[0] and its derivative in s, E R″ / E R′, into out[1].
   * The exponential form is summed in log space, so a line far into saturation keeps a
   * finite log slope instead of underflowing to 0.
   */
  logSlope(l: number, s: number, out: Float64Array): void {
    const D = this.drawCount;
    const o = l * D;
    if (!this.hill) {
      let max = -Infinity;
      for (let d = 0; d < D; d++) {
        const a = this.logBeta[o + d]! - s * this.invTheta[o + d]!;
        if (a > max) max = a;
      }
      let s0 = 0;
      let s1 = 0;
      for (let d = 0; d < D; d++) {
        const e = Math.exp(this.logBeta[o + d]! - s * this.invTheta[o + d]! - max);
        s0 += e;
        s1 += e * this.invTheta[o + d]!;
      }
      out[0] = max + Math.log(s0) - this.logDrawCount;
      out[1] = -s1 / s0;
      return;
    }
    let slope = 0;
    let curvature = 0;
    const ls = Math.log(s);
    const invS = 1 / s;
    for (let d = 0; d < D; d++) {
      const beta = this.beta[o + d]!;
      const k = this.shape[o + d]!;
      const it = this.invTheta[o + d]!;
      if (s <= 0) {
        if (k < 1) slope = Infinity;
        else if (k === 1) {
          slope += beta;
          curvature -= 2 * beta * it;
        } else if (k < 2) curvature = Infinity;
        else if (k === 2) curvature += 2 * beta * it;
        continue;
      }
      const u = Math.exp(k * (ls - this.logTheta[o + d]!)); // r^k with r = s/θ
      const q = 1 / (1 + u);
      const p = beta * k * u * q * q * this.theta[o + d]! * invS; // β·k·r^{k−1}/(1+u)²
      slope += p;
      curvature += p * (k - 1 - (k + 1) * u) * q * invS;
    }
    out[0] = Math.log(slope / D);
    out[1] = slope === Infinity ? -Infinity : curvature / slope;
  }

  /** E_d R′_d(s) (0 when it underflows). */
  meanSlope(l: number, s: number, scratch: Float64Array): number {
    this.logSlope(l, s, scratch);
    return Math.exp(scratch[0]!);
  }

  /**
   * Adds scale·R_d(s) to out[d] for every draw and, when `slopes` is given, writes R′_d(s)
   * to slopes[slopeOffset + d] from the same exponentials.
   */
  addResponseDraws(l: number, s: number, scale: number, out: Float64Array, slopes?: Float64Array, slopeOffset = 0): void {
    const D = this.drawCount;
    const o = l * D;
    if (!this.hill) {
      for (let d = 0; d < D; d++) {
        const e = Math.exp(-s * this.invTheta[o + d]!);
        const beta = this.beta[o + d]!;
        out[d] = out[d]! + scale * beta * this.theta[o + d]! * (1 - e);
        if (slopes !== undefined) slopes[slopeOffset + d] = beta * e;
      }
      return;
    }
    const ls = Math.log(s);
    for (let d = 0; d < D; d++) {
      const k = this.shape[o + d]!;
      const beta = this.beta[o + d]!;
      const lr = ls - this.logTheta[o + d]!; // log(s/θ)
      const u = s > 0 ? Math.exp(k * lr) : 0;
      out[d] = out[d]! + (scale * beta * this.theta[o + d]! * u) / (1 + u);
      if (slopes === undefined) continue;
      // The slope β·k·r^{k−1}/(1+u)² is infinite at zero spend when k < 1: take r ≥ 1e-9.
      const lrSlope = Math.max(lr, -20.72326583694641);
      const uSlope = lrSlope === lr ? u : Math.exp(k * lrSlope);
      const q = 1 / (1 + uSlope);
      slopes[slopeOffset + d] = beta * k * uSlope * q * q * Math.exp(-lrSlope);
    }
  }

  /**
   * The largest inflection point over the line's draws: beyond it every draw's response is
   * concave. 0 for the exponential form; θ·((k−1)/(k+1))^{1/k} for a Hill draw with k > 1.
   */
  inflectionPoint(l: number): number {
    if (!this.hill) return 0;
    const D = this.drawCount;
    let max = 0;
    for (let d = l * D; d < (l + 1) * D; d++) {
      const k = this.shape[d]!;
      if (k > 1) max = Math.max(max, this.theta[d]! * Math.pow((k - 1) / (k + 1), 1 / k));
    }
    return max;
  }

  /** A spend scale of the line: the median of θ over draws. */
  typicalScale(l: number): number {
    const D = this.drawCount;
    const sorted = this.theta.slice(l * D, (l + 1) * D).sort();
    return sorted[D >> 1]!;
  }
}
